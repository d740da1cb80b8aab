#pragma once
// halfspin-propagate's --truth file (t,qw,qx,qy,qz, as halfspin-gyro-log --truth writes it), read
// in step with the output: each step end time is looked up once, in increasing order. Tool code.

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdio>
#include <fstream>
#include <optional>
#include <string>

#include "gyro_log.hpp"
#include "halfspin/core/quaternion.hpp"

namespace halfspin::tools::propagate {

class TruthTrack {
 public:
  // False if the file cannot be opened (errno tells why).
  bool open(const std::string& path) {
    path_ = path;
    in_.open(path, std::ios::binary);
    if (!in_) return false;
    reader_.emplace(in_);
    return true;
  }
  // Checks the header; false with a message on stderr.
  bool header() {
    std::string h;
    if (!reader_->read_header(h) || h != attitude_csv_header) {
      std::fprintf(stderr, "%s:1: truth header must be '%s'\n", path_.c_str(), attitude_csv_header);
      return false;
    }
    return true;
  }
  // The truth attitude at time t (rows before it are passed over). False with a message if the
  // file has no row at t.
  bool at(double t, Quaternion<double>& q) {
    while (true) {
      if (have_ && close_to(row_[0], t)) {
        q = Quaternion<double>{row_[1], row_[2], row_[3], row_[4]};
        return true;
      }
      if (have_ && row_[0] > t) {
        std::fprintf(stderr, "%s:%zu: truth has no row at t = %.17g (next row t = %.17g)\n",
                     path_.c_str(), reader_->line(), t, row_[0]);
        return false;
      }
      if (!read_row(t)) return false;
    }
  }

 private:
  // The next row; false with a message at the end of the file or on a bad line.
  bool read_row(double t) {
    const ReadOutcome r = reader_->next(row_, attitude_field_names);
    if (r == ReadOutcome::end) {
      std::fprintf(stderr, "%s:%zu: truth ends before t = %.17g\n", path_.c_str(), reader_->line(),
                   t);
      return false;
    }
    if (r == ReadOutcome::bad) {
      std::fprintf(stderr, "%s:%zu: %s\n", path_.c_str(), reader_->line(),
                   reader_->message().c_str());
      return false;
    }
    have_ = true;
    return true;
  }
  static bool close_to(double a, double b) noexcept {
    return std::fabs(a - b) <= 1e-9 * std::fmax(1.0, std::fabs(b));
  }
  std::string path_;
  std::ifstream in_;
  std::optional<NumericCsvReader<5>> reader_;
  std::array<double, 5> row_{};
  bool have_ = false;
};

}  // namespace halfspin::tools::propagate
