#pragma once
// Shared by the harnesses: reading typed values from the fuzzer's bytes, and a property check that
// stops the process (libFuzzer then saves the input as a crash) with a message saying what failed.
// Fuzz code, not part of the library: it may print and abort.
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <limits>
#include <type_traits>

namespace halfspin::fuzz {

// Stops with a message when a promised property does not hold.
inline void require(bool ok, const char* what, const char* file, int line) {
  if (!ok) {
    std::fprintf(stderr, "%s:%d: property violated: %s\n", file, line, what);
    std::fflush(stderr);
    std::abort();
  }
}

#define HALFSPIN_FUZZ_REQUIRE(cond) ::halfspin::fuzz::require((cond), #cond, __FILE__, __LINE__)

// Reads the input front to back; past its end every read returns zeros (so any prefix is a
// complete program, and libFuzzer's shrinking keeps working).
class ByteReader {
 public:
  ByteReader(const std::uint8_t* data, std::size_t size) noexcept : data_(data), size_(size) {}

  bool empty() const noexcept { return pos_ >= size_; }
  std::size_t remaining() const noexcept { return pos_ < size_ ? size_ - pos_ : 0; }

  std::uint8_t u8() noexcept { return pos_ < size_ ? data_[pos_++] : std::uint8_t{0}; }
  std::uint16_t u16() noexcept {
    const auto lo = static_cast<std::uint16_t>(u8());
    return static_cast<std::uint16_t>(lo | static_cast<std::uint16_t>(u8() << 8));
  }
  std::uint32_t u32() noexcept {
    const std::uint32_t lo = u16();
    return lo | (static_cast<std::uint32_t>(u16()) << 16);
  }
  std::uint64_t u64() noexcept {
    const std::uint64_t lo = u32();
    return lo | (static_cast<std::uint64_t>(u32()) << 32);
  }

  // Any bit pattern of T: NaNs, infinities, subnormals, everything.
  template <class T>
  T raw() noexcept {
    static_assert(std::is_same<T, float>::value || std::is_same<T, double>::value,
                  "float or double");
    T v;
    if constexpr (std::is_same<T, float>::value) {
      const std::uint32_t bits = u32();
      std::memcpy(&v, &bits, sizeof v);
    } else {
      const std::uint64_t bits = u64();
      std::memcpy(&v, &bits, sizeof v);
    }
    return v;
  }

  // A fraction in [−1, 1] from 16 bits (both ends reachable).
  template <class T>
  T signed_fraction() noexcept {
    return T(2) * static_cast<T>(u16()) / T(65535) - T(1);
  }

  // 10^e with e uniform in [lo, hi] (1/255 steps).
  template <class T>
  T log_uniform(T lo_exponent, T hi_exponent) noexcept {
    const T u = static_cast<T>(u8()) / T(255);
    return std::pow(T(10), lo_exponent + (hi_exponent - lo_exponent) * u);
  }

  // A value that is usually `scale`·[−1, 1] (so most inputs are valid), sometimes a special value
  // or any bit pattern (so every rejection class is reached).
  template <class T>
  T mostly_scaled(T scale) noexcept {
    const std::uint8_t kind = u8();
    if (kind < 224) return scale * signed_fraction<T>();
    switch (kind % 8) {
      case 0:
        return std::numeric_limits<T>::quiet_NaN();
      case 1:
        return std::numeric_limits<T>::infinity();
      case 2:
        return -std::numeric_limits<T>::infinity();
      case 3:
        return T(0);
      case 4:
        return -std::numeric_limits<T>::denorm_min();
      case 5:
        return std::numeric_limits<T>::max();
      case 6:
        return scale * (T(1) + std::numeric_limits<T>::epsilon());  // just over a limit
      default:
        return raw<T>();
    }
  }

 private:
  const std::uint8_t* data_;
  std::size_t size_;
  std::size_t pos_ = 0;
};

}  // namespace halfspin::fuzz
