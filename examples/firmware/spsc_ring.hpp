#pragma once
// A single-producer/single-consumer ring buffer for one interrupt handler (the producer) and the
// main loop (the consumer) on one core. Each side writes only its own index; the release store of
// an index publishes the slot written before it, the acquire load on the other side sees it. On a
// single Cortex-M core this compiles to plain loads and stores with barriers, no locks, and no
// interrupt masking is needed. Capacity is a power of two; one slot stays empty to tell full
// from empty.
#include <array>
#include <atomic>
#include <cstddef>
#include <cstdint>

namespace firmware {

template <class Item, std::size_t Capacity>
class SpscRing {
  static_assert(Capacity >= 2 && (Capacity & (Capacity - 1)) == 0, "capacity: a power of two");
  static_assert(std::atomic<std::uint32_t>::is_always_lock_free, "needs lock-free 32-bit atomics");

 public:
  // Producer side (the interrupt). Returns false, leaving the ring as it was, when full.
  bool push(const Item& item) noexcept {
    const std::uint32_t head = head_.load(std::memory_order_relaxed);
    const std::uint32_t next = (head + 1) & mask;
    if (next == tail_.load(std::memory_order_acquire)) {
      return false;
    }
    slots_[head] = item;
    head_.store(next, std::memory_order_release);
    return true;
  }

  // Consumer side (the main loop). Returns false when empty.
  bool pop(Item& item) noexcept {
    const std::uint32_t tail = tail_.load(std::memory_order_relaxed);
    if (tail == head_.load(std::memory_order_acquire)) {
      return false;
    }
    item = slots_[tail];
    tail_.store((tail + 1) & mask, std::memory_order_release);
    return true;
  }

  bool empty() const noexcept {
    return tail_.load(std::memory_order_acquire) == head_.load(std::memory_order_acquire);
  }

 private:
  static constexpr std::uint32_t mask = static_cast<std::uint32_t>(Capacity - 1);
  std::array<Item, Capacity> slots_{};
  std::atomic<std::uint32_t> head_{0};  // next slot the producer writes
  std::atomic<std::uint32_t> tail_{0};  // next slot the consumer reads
};

}  // namespace firmware
