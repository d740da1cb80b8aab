#pragma once
// The overlapping Allan deviation of a static gyro log, per axis, at octave-spaced averaging
// times, exact and in memory independent of the log's length. Tool code (standard library and
// POSIX: a temporary file, pread).
//
// Definition (IEEE Std 952-1997 Annex C, the overlapping estimator; our index convention): from
// N samples x_0 … x_{N−1} (rates in rad/s, or delta-angles in rad) at the sample interval τ0,
// the cumulative angle θ_0 = 0, θ_k = Σ_{i<k} (x_i − x̄) (N + 1 points; removing the mean x̄
// changes nothing in exact arithmetic, since the second difference of a ramp is zero, and keeps
// θ small so that its second differences lose no digits to cancellation), and for the cluster
// size m (τ = m·τ0), 2m ≤ N:
//     σ²(τ) = Σ_{k=0}^{N−2m} (θ_{k+2m} − 2θ_{k+m} + θ_k)² / (2 m² (N − 2m + 1))        (rates)
//     σ²(τ) = Σ_{k=0}^{N−2m} (θ_{k+2m} − 2θ_{k+m} + θ_k)² / (2 τ² (N − 2m + 1)) (delta-angles)
// (a rate sample stands for the mean rate over its interval: θ·τ0 is the angle).
//
// Memory. The exact estimator at cluster size m needs θ at k, k + m and k + 2m. With m = 2^j the
// positions needed for every octave at once are k + o for o in {0, 1, 2, 4, …, 2^{J}}: J + 2
// read cursors over one file, each with a fixed buffer and its own running θ (long double; every
// cursor sums the same samples in the same order, so θ_p is bitwise the same whichever cursor
// reached p). The first pass (the CSV reader, elsewhere) writes the samples to a temporary
// binary file (unlinked at once: nothing is left behind) and sums them for the mean; one second
// pass over k does every octave. Memory: (J + 2) buffers of cursor_samples samples, J ≤ 62, so a
// bound independent of N; time O(N·J).
#include <array>
#include <cerrno>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <functional>
#include <string>
#include <vector>

#include <unistd.h>

namespace halfspin::tools::noise {

using Sample = std::array<double, 3>;

// A temporary file of samples (three doubles each), removed from the directory as soon as it is
// created; written through a fixed buffer, then read by SampleCursor.
class SampleFile {
 public:
  SampleFile() = default;
  SampleFile(const SampleFile&) = delete;
  SampleFile& operator=(const SampleFile&) = delete;
  SampleFile(SampleFile&&) = delete;
  SampleFile& operator=(SampleFile&&) = delete;
  ~SampleFile() {
    if (fd_ >= 0) ::close(fd_);
  }

  // Creates the file in `directory`. False with the reason in `error`.
  bool create(const std::string& directory, std::string& error) {
    std::string pattern = directory + "/halfspin-gyro-noise-XXXXXX";
    fd_ = ::mkstemp(pattern.data());
    if (fd_ < 0) {
      error = "cannot create a temporary file in " + directory + ": " + std::strerror(errno);
      return false;
    }
    ::unlink(pattern.c_str());
    buffer_.reserve(3 * buffer_samples);
    return true;
  }

  // Appends one sample. False on a write failure (disk full).
  bool append(const Sample& s) {
    buffer_.insert(buffer_.end(), s.begin(), s.end());
    ++count_;
    return buffer_.size() < 3 * buffer_samples || flush();
  }

  // Writes what is buffered. False on a write failure.
  bool flush() {
    const char* data = reinterpret_cast<const char*>(buffer_.data());  // NOLINT: bytes of doubles
    std::size_t left = buffer_.size() * sizeof(double);
    while (left > 0) {
      const ssize_t n = ::write(fd_, data, left);
      if (n <= 0) return false;
      data += n;  // NOLINT(cppcoreguidelines-pro-bounds-pointer-arithmetic): within the buffer
      left -= static_cast<std::size_t>(n);
    }
    buffer_.clear();
    return true;
  }

  int descriptor() const noexcept { return fd_; }
  std::size_t count() const noexcept { return count_; }

 private:
  static constexpr std::size_t buffer_samples = 4096;
  int fd_ = -1;
  std::size_t count_ = 0;
  std::vector<double> buffer_;
};

// Reads the samples of a SampleFile forward from a position, keeping θ = Σ (x_i − mean) over
// the samples passed.
class SampleCursor {
 public:
  SampleCursor(int fd, std::size_t count, const std::array<long double, 3>& mean)
      : fd_(fd), count_(count), mean_(mean), buffer_(3 * cursor_samples) {}

  // θ at the current position (the sum over the samples before it).
  const std::array<long double, 3>& theta() const noexcept { return theta_; }
  std::size_t position() const noexcept { return position_; }

  // Passes the sample at the current position (which must be < count). False on a read failure.
  bool advance() {
    if (position_ >= first_ + filled_) {
      first_ = position_;
      const std::size_t want = std::min(cursor_samples, count_ - position_);
      const auto offset = static_cast<off_t>(position_ * 3 * sizeof(double));
      std::size_t got = 0;
      char* data = reinterpret_cast<char*>(buffer_.data());  // NOLINT: bytes of doubles
      while (got < want * 3 * sizeof(double)) {
        const ssize_t n =
            ::pread(fd_, data + got,  // NOLINT(cppcoreguidelines-pro-bounds-pointer-arithmetic)
                    want * 3 * sizeof(double) - got, offset + static_cast<off_t>(got));
        if (n <= 0) return false;
        got += static_cast<std::size_t>(n);
      }
      filled_ = want;
    }
    const std::size_t at = 3 * (position_ - first_);
    for (std::size_t a = 0; a < 3; ++a) {
      theta_[a] += static_cast<long double>(buffer_[at + a]) - mean_[a];
    }
    ++position_;
    return true;
  }

  static constexpr std::size_t cursor_samples = 2048;  // 48 KiB per cursor

 private:
  int fd_;
  std::size_t count_;
  std::array<long double, 3> mean_;
  std::vector<double> buffer_;
  std::size_t first_ = 0;   // sample index of buffer_[0]
  std::size_t filled_ = 0;  // samples in buffer_
  std::size_t position_ = 0;
  std::array<long double, 3> theta_{};
};

// One averaging time of the curve.
struct AllanPoint {
  std::size_t m = 0;                  // cluster size (samples)
  double tau = 0;                     // s, m·τ0
  std::size_t clusters = 0;           // n = ⌊N/m⌋, independent clusters
  std::size_t terms = 0;              // N − 2m + 1 overlapping second differences
  std::array<double, 3> variance{};   // σ², (rad/s)² per axis
  std::array<double, 3> deviation{};  // σ, rad/s
  std::array<double, 3> low{};        // confidence interval of σ, rad/s
  std::array<double, 3> high{};
};

// The overlapping Allan variance at m = 1, 2, 4, … (2m ≤ N) of the `count` samples in `fd`.
// `rates`: rate samples (else delta-angles). `progress(done, total)` is called now and then.
// False on a read failure.
inline bool overlapping_allan(int fd, std::size_t count, const std::array<long double, 3>& mean,
                              double tau0, bool rates, std::vector<AllanPoint>& out,
                              const std::function<void(std::size_t, std::size_t)>& progress) {
  out.clear();
  if (count < 2) return true;
  std::size_t octaves = 0;  // J + 1: m = 2^0 … 2^J
  while ((std::size_t{2} << octaves) <= count) ++octaves;
  // Cursor c sits at k + offset[c]: offset 0, then 1, 2, 4, …, 2^octaves (= 2 m_max).
  std::vector<SampleCursor> cursors;
  std::vector<std::size_t> offset;
  cursors.reserve(octaves + 2);
  for (std::size_t c = 0; c < octaves + 2; ++c) {
    offset.push_back(c == 0 ? 0 : std::size_t{1} << (c - 1));
    cursors.emplace_back(fd, count, mean);
    for (std::size_t i = 0; i < offset.back(); ++i) {
      if (!cursors.back().advance()) return false;
    }
  }
  std::vector<long double> sum(3 * octaves, 0.0L);
  for (std::size_t k = 0; k + 2 <= count; ++k) {
    const auto& t0 = cursors[0].theta();
    for (std::size_t j = 0; j < octaves; ++j) {
      const std::size_t m = std::size_t{1} << j;
      if (k + 2 * m > count) break;
      const auto& tm = cursors[j + 1].theta();
      const auto& t2m = cursors[j + 2].theta();
      for (std::size_t a = 0; a < 3; ++a) {
        const long double d = t2m[a] - 2 * tm[a] + t0[a];
        sum[3 * j + a] += d * d;
      }
    }
    for (SampleCursor& c : cursors) {
      if (c.position() < count && !c.advance()) return false;
    }
    if ((k & 0xFFFF) == 0) progress(k, count);
  }
  for (std::size_t j = 0; j < octaves; ++j) {
    AllanPoint p;
    p.m = std::size_t{1} << j;
    p.tau = static_cast<double>(p.m) * tau0;
    p.clusters = count / p.m;
    p.terms = count - 2 * p.m + 1;
    const long double scale =
        rates ? static_cast<long double>(p.m) : static_cast<long double>(p.tau);
    for (std::size_t a = 0; a < 3; ++a) {
      p.variance[a] = static_cast<double>(sum[3 * j + a] /
                                          (2 * scale * scale * static_cast<long double>(p.terms)));
      p.deviation[a] = std::sqrt(p.variance[a]);
    }
    out.push_back(p);
  }
  return true;
}

}  // namespace halfspin::tools::noise
