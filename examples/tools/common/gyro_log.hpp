#pragma once
// The tools' gyro-log CSV format, a streaming reader for it and a writer. Tool code (not part of
// the installed library): it uses the standard library and POSIX freely.
//
// Format (our own; CSV per RFC 4180 without quoting, since every used field is a number):
//   line 1:  a header naming the columns: `t,wx,wy,wz` (rate form) or `t,dx,dy,dz` (delta-angle
//            form), in any order, among other columns (a temperature, a counter, ...), which are
//            ignored; or any names, mapped to time and gyro columns by the user (--columns)
//   then one sample per line, as many fields as the header has columns; the used ones
//   comma-separated decimal numbers (anything strtod reads in the "C"
//   locale; spaces around a field are allowed, a trailing CR is ignored, so CRLF files read the
//   same as LF files; a UTF-8 byte-order mark before the header is skipped; the last line may
//   lack its newline):
//     rate form:   t (s), body rate wx, wy, wz (rad/s) at time t
//     delta form:  t (s), delta-angle dx, dy, dz (rad): the integral of the body rate over the
//                  interval that ends at t (the previous row's t, or the log's start time)
//   The attitude CSV the tools also read and write has the header `t,qw,qx,qy,qz` (s, unit
//   quaternion body → reference, scalar first).
//
// Interface (all in halfspin::tools):
//   LineProblem, line_problem_name(p)    what can be wrong with one line (the reader's classes)
//   NumericCsvReader<N>                  one line at a time, constant memory, 1-based line numbers:
//       read_header(text) → bool           the first line, a UTF-8 byte-order mark removed (false:
//                                          empty file, i.e. line() == 0, or over-long line)
//       next(values)      → ReadOutcome    row / end / bad; after `bad`, problem(), message(),
//                                          and the parsed values (non_finite: values hold the
//                                          parsed numbers, non-finite ones included)
//       line()                             line number of the line last read
//       select_columns(columns, count)     read only these columns of lines with `count` fields
//   GyroLogForm, gyro_log_header(form)
//   GyroLogLayout, resolve_gyro_log_layout(header, form, mapped, layout) → reason or ""
//                                        which columns of a header hold t, x, y, z and the form
//   read_gyro_log_layout(reader, log, form, mapped) → layout or nothing (reported on stderr)
//   StagedOutputFile                     writes to a temporary file beside the destination and
//                                        renames it over the destination on commit(); removes the
//                                        temporary on destruction if not committed (no partial
//                                        output ever appears under the destination's name); a
//                                        destination that is not a regular file (/dev/null, a
//                                        pipe) is written in place
//   write_csv_row(file, values, digits)  one row of numbers, %.<digits>g
#include <array>
#include <cerrno>
#include <cstddef>
#include <cstdio>
#include <cstdlib>
#include <istream>
#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include <sys/stat.h>
#include <unistd.h>

namespace halfspin::tools {

// Lines longer than this are rejected (the reader then never holds more than this many bytes).
inline constexpr std::size_t max_line_length = 1024;

enum class LineProblem {
  none,
  too_long,           // more than max_line_length characters
  wrong_field_count,  // not the expected number of comma-separated fields (an empty line too)
  non_numeric,        // a field that is not a number (empty, or text)
  non_finite          // a field that is a number but NaN or ±infinity (or overflows a double)
};

// Stable short names of the classes ("malformed", "non_numeric", ...), used in summaries.
inline const char* line_problem_name(LineProblem p) noexcept {
  switch (p) {
    case LineProblem::none:
      return "none";
    case LineProblem::too_long:
    case LineProblem::wrong_field_count:
      return "malformed";
    case LineProblem::non_numeric:
      return "non_numeric";
    case LineProblem::non_finite:
      return "non_finite";
  }
  return "unknown";
}

enum class ReadOutcome { row, end, bad };

namespace detail {

// 0, 1, ..., N − 1: every field read, in order.
template <std::size_t N>
constexpr std::array<std::size_t, N> identity_columns() noexcept {
  std::array<std::size_t, N> c{};
  for (std::size_t i = 0; i < N; ++i) c[i] = i;
  return c;
}

}  // namespace detail

// Reads CSV lines of N numeric fields from a stream, one at a time.
template <std::size_t N>
class NumericCsvReader {
 public:
  explicit NumericCsvReader(std::istream& in) : in_(in) {}

  // Reads the first line into `text` (without line end or a leading UTF-8 byte-order mark, which
  // editors on Windows write). False at end of input (line() stays 0) or if too long.
  bool read_header(std::string& text) {
    if (!read_line()) {
      return false;
    }
    text = line_;
    if (text.compare(0, 3, "\xEF\xBB\xBF") == 0) {
      text.erase(0, 3);
    }
    return !too_long_;
  }

  // From now on lines have `field_count` fields and values[i] is read from field columns[i]
  // (0-based, distinct, each < field_count); the other fields are not looked at. Until called:
  // N fields, values[i] from field i.
  void select_columns(const std::array<std::size_t, N>& columns, std::size_t field_count) {
    columns_ = columns;
    field_count_ = field_count;
  }

  // Reads the next line into `values`. Field names (for messages) are given by `names`.
  ReadOutcome next(std::array<double, N>& values, const std::array<const char*, N>& names) {
    if (!read_line()) {
      return ReadOutcome::end;
    }
    problem_ = LineProblem::none;
    message_.clear();
    if (too_long_) {
      return fail(LineProblem::too_long,
                  "line longer than " + std::to_string(max_line_length) + " characters");
    }
    std::size_t field = 0;
    std::size_t start = 0;
    std::optional<std::pair<LineProblem, std::string>> first_problem;
    while (true) {
      const std::size_t comma = line_.find(',', start);
      const std::size_t stop = comma == std::string::npos ? line_.size() : comma;
      const std::size_t slot = slot_of(field);
      if (slot < N) {
        const std::string_view text = trim(std::string_view(line_).substr(start, stop - start));
        const std::string owned(text);
        char* end = nullptr;
        errno = 0;
        const double v = owned.empty() ? 0.0 : std::strtod(owned.c_str(), &end);
        if (owned.empty() || end - owned.c_str() != static_cast<std::ptrdiff_t>(owned.size())) {
          if (!first_problem) {
            first_problem.emplace(LineProblem::non_numeric,
                                  "field " + std::to_string(field + 1) + " (" + names[slot] +
                                      ") is not a number: '" + owned + "'");
          }
          values[slot] = 0.0;
        } else {
          values[slot] = v;
          if (!(v - v == 0.0) && !first_problem) {
            first_problem.emplace(LineProblem::non_finite, "field " + std::to_string(field + 1) +
                                                               " (" + names[slot] +
                                                               ") is not finite: '" + owned + "'");
          }
        }
      }
      ++field;
      if (comma == std::string::npos) {
        break;
      }
      start = comma + 1;
    }
    if (field != field_count_) {
      return fail(LineProblem::wrong_field_count,
                  "malformed line: expected " + std::to_string(field_count_) +
                      " comma-separated fields, found " + std::to_string(field));
    }
    if (first_problem) {
      return fail(first_problem->first, first_problem->second);
    }
    return ReadOutcome::row;
  }

  // 1-based number of the line last read.
  std::size_t line() const noexcept { return line_number_; }
  LineProblem problem() const noexcept { return problem_; }
  const std::string& message() const noexcept { return message_; }

 private:
  static std::string_view trim(std::string_view s) noexcept {
    while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
    while (!s.empty() && (s.back() == ' ' || s.back() == '\t')) s.remove_suffix(1);
    return s;
  }

  // The slot read from field `field`, N if none.
  std::size_t slot_of(std::size_t field) const noexcept {
    for (std::size_t i = 0; i < N; ++i) {
      if (columns_[i] == field) return i;
    }
    return N;
  }

  ReadOutcome fail(LineProblem p, std::string m) {
    problem_ = p;
    message_ = std::move(m);
    return ReadOutcome::bad;
  }

  // Reads up to '\n', keeping at most max_line_length characters (the rest is consumed).
  bool read_line() {
    line_.clear();
    too_long_ = false;
    int c = in_.get();
    if (c == std::char_traits<char>::eof()) {
      return false;
    }
    bool cut = false;  // characters beyond max_line_length + 1 were dropped
    while (c != std::char_traits<char>::eof() && c != '\n') {
      if (line_.size() < max_line_length + 1) {
        line_.push_back(static_cast<char>(c));
      } else {
        cut = true;
      }
      c = in_.get();
    }
    // Only a CR that ends the line is a line end: one kept at the cut is inside an over-long line
    // (found by fuzzing: such a line was accepted as its first max_line_length characters).
    if (!cut && !line_.empty() && line_.back() == '\r') {
      line_.pop_back();
    }
    if (cut || line_.size() > max_line_length) {
      too_long_ = true;
    }
    ++line_number_;
    return true;
  }

  std::istream& in_;
  std::array<std::size_t, N> columns_ = detail::identity_columns<N>();
  std::size_t field_count_ = N;
  std::string line_;
  bool too_long_ = false;
  std::size_t line_number_ = 0;
  LineProblem problem_ = LineProblem::none;
  std::string message_;
};

enum class GyroLogForm { rate, delta_angle };

inline const char* gyro_log_header(GyroLogForm form) noexcept {
  return form == GyroLogForm::rate ? "t,wx,wy,wz" : "t,dx,dy,dz";
}

// Which columns of a gyro log hold time and the three gyro axes, and what the gyro columns hold.
struct GyroLogLayout {
  GyroLogForm form = GyroLogForm::rate;
  std::array<std::size_t, 4> column{{0, 1, 2, 3}};  // 0-based columns of t, x, y, z
  std::size_t field_count = 4;                      // columns in the header (and in every row)
  std::array<std::string, 4> name;                  // the header's names of t, x, y, z
  std::vector<std::size_t> ignored;                 // the other columns, 0-based
  std::vector<std::string> header;                  // every column name, trimmed
};

// The default header names of the roles t, x, y, z in a form.
inline std::array<const char*, 4> default_column_names(GyroLogForm form) noexcept {
  return form == GyroLogForm::rate ? std::array<const char*, 4>{{"t", "wx", "wy", "wz"}}
                                   : std::array<const char*, 4>{{"t", "dx", "dy", "dz"}};
}

namespace detail {

// The header's column names, split at commas, spaces and tabs around each trimmed.
inline std::vector<std::string> header_names(std::string_view header) {
  std::vector<std::string> names;
  std::size_t start = 0;
  while (true) {
    const std::size_t comma = header.find(',', start);
    std::string_view n = header.substr(
        start, comma == std::string_view::npos ? std::string_view::npos : comma - start);
    while (!n.empty() && (n.front() == ' ' || n.front() == '\t')) n.remove_prefix(1);
    while (!n.empty() && (n.back() == ' ' || n.back() == '\t')) n.remove_suffix(1);
    names.emplace_back(n);
    if (comma == std::string_view::npos) return names;
    start = comma + 1;
  }
}

// Columns named `name` (0-based).
inline std::vector<std::size_t> columns_named(const std::vector<std::string>& names,
                                              const std::string& name) {
  std::vector<std::size_t> found;
  for (std::size_t i = 0; i < names.size(); ++i) {
    if (names[i] == name) found.push_back(i);
  }
  return found;
}

// Whether every gyro role (x, y, z) has a column in `form`: its mapped name or the form's
// default name.
inline bool form_fits(const std::vector<std::string>& names, GyroLogForm form,
                      const std::array<std::string, 4>& mapped) {
  for (std::size_t r = 1; r < 4; ++r) {
    const std::string n = mapped[r].empty() ? default_column_names(form)[r] : mapped[r];
    if (columns_named(names, n).empty()) return false;
  }
  return true;
}

inline constexpr std::array<const char*, 4> role_names{{"t", "x", "y", "z"}};

// Messages of resolve_gyro_log_layout (built here, out of its loop).
inline std::string role_text(std::size_t r, const std::string& name, bool by_option) {
  std::string text = role_names[r];
  if (by_option) text.append(" (--columns ").append(role_names[r]).append("=").append(name) += ")";
  return text;
}
inline std::string missing_column(const std::string& name, const std::string& what, bool by_option,
                                  GyroLogForm form, std::size_t r) {
  std::string text = "header has no column '";
  text.append(name).append("' for ").append(what);
  if (!by_option) {
    text.append(" of the ")
        .append(form == GyroLogForm::rate ? "rate" : "delta-angle")
        .append(" form (--columns ")
        .append(role_names[r])
        .append("=NAME maps another)");
  }
  return text + ": ";
}
inline std::string repeated_column(const std::string& name, const std::string& what,
                                   std::size_t first, std::size_t second) {
  std::string text = "header names column '";
  text.append(name).append("' (for ").append(what).append(") more than once (columns ");
  text.append(std::to_string(first + 1)).append(" and ").append(std::to_string(second + 1));
  return text + "): ";
}
inline std::string same_column(std::size_t q, std::size_t r, const std::string& name) {
  std::string text = "--columns maps ";
  text.append(role_names[q]).append(" and ").append(role_names[r]);
  return text.append(" to the same column '").append(name) + "'";
}

}  // namespace detail

// Resolves `header` into `layout`: the form is `form` if given, else the one whose gyro column
// names (wx,wy,wz or dx,dy,dz; or the names `mapped`, where all three are mapped, if they are one
// of those sets) the header has. mapped[r] (r = t, x, y, z) names the column of role r, "" for the
// default name. Returns "" or the reason the header does not fit, naming what was looked for.
inline std::string resolve_gyro_log_layout(std::string_view header, std::optional<GyroLogForm> form,
                                           const std::array<std::string, 4>& mapped,
                                           GyroLogLayout& layout) {
  const std::vector<std::string> names = detail::header_names(header);
  const std::string found = "found '" + std::string(header) + "'";
  if (!form) {
    const bool all_mapped = !mapped[1].empty() && !mapped[2].empty() && !mapped[3].empty();
    const auto is_set = [&mapped](GyroLogForm f) {
      const auto d = default_column_names(f);
      return mapped[1] == d[1] && mapped[2] == d[2] && mapped[3] == d[3];
    };
    if (all_mapped) {
      if (is_set(GyroLogForm::rate)) form = GyroLogForm::rate;
      if (is_set(GyroLogForm::delta_angle)) form = GyroLogForm::delta_angle;
      if (!form) {
        return "--columns maps the gyro columns to '" + mapped[1] + "', '" + mapped[2] + "', '" +
               mapped[3] + "', names that do not say rates or delta-angles: give --form rate or " +
               "--form delta";
      }
    } else {
      const bool rate = detail::form_fits(names, GyroLogForm::rate, mapped);
      const bool delta = detail::form_fits(names, GyroLogForm::delta_angle, mapped);
      if (rate && delta) {
        return "header has both rate columns wx,wy,wz and delta-angle columns dx,dy,dz: choose "
               "with --form rate or --form delta (" +
               found + ")";
      }
      if (!rate && !delta) {
        return "header must name t and wx,wy,wz (rates) or dx,dy,dz (delta-angles), in any "
               "order among other columns, or map its columns with --columns: " +
               found;
      }
      form = rate ? GyroLogForm::rate : GyroLogForm::delta_angle;
    }
  }
  GyroLogLayout l;
  l.form = *form;
  l.field_count = names.size();
  l.header = names;
  for (std::size_t r = 0; r < 4; ++r) {
    const bool by_option = !mapped[r].empty();
    const std::string n = by_option ? mapped[r] : default_column_names(*form)[r];
    const std::vector<std::size_t> at = detail::columns_named(names, n);
    const std::string what = detail::role_text(r, n, by_option);
    if (at.empty()) return detail::missing_column(n, what, by_option, *form, r) + found;
    if (at.size() > 1) return detail::repeated_column(n, what, at[0], at[1]) + found;
    for (std::size_t q = 0; q < r; ++q) {
      if (l.column[q] == at[0]) return detail::same_column(q, r, n);
    }
    l.column[r] = at[0];
    l.name[r] = n;
  }
  for (std::size_t i = 0; i < names.size(); ++i) {
    if (i != l.column[0] && i != l.column[1] && i != l.column[2] && i != l.column[3]) {
      l.ignored.push_back(i);
    }
  }
  layout = std::move(l);
  return "";
}

// Reads the header of the gyro log `log` from `reader` and resolves its layout with --form and
// --columns (`form`, `columns`); nothing if the header is missing or does not fit, reported on
// stderr as LOG:1: reason. Ignored columns are noted. The reader then reads the used columns.
inline std::optional<GyroLogLayout> read_gyro_log_layout(
    NumericCsvReader<4>& reader, const std::string& log, std::optional<GyroLogForm> form,
    const std::array<std::string, 4>& columns) {
  std::string header;
  if (!reader.read_header(header)) {
    if (reader.line() == 0) {
      std::fprintf(stderr,
                   "%s:1: empty file: no header line (expected 't,wx,wy,wz' or 't,dx,dy,dz')\n",
                   log.c_str());
    } else {
      std::fprintf(stderr, "%s:1: header line longer than %zu characters\n", log.c_str(),
                   max_line_length);
    }
    return std::nullopt;
  }
  GyroLogLayout layout;
  const std::string reason = resolve_gyro_log_layout(header, form, columns, layout);
  if (!reason.empty()) {
    std::fprintf(stderr, "%s:1: %s\n", log.c_str(), reason.c_str());
    return std::nullopt;
  }
  if (!layout.ignored.empty()) {
    std::string list;
    for (const std::size_t c : layout.ignored) {
      list += (list.empty() ? "" : ", ") + std::to_string(c + 1) + " '" + layout.header[c] + "'";
    }
    std::fprintf(stderr, "%s:1: note: column%s %s not used (ignored in every row)\n", log.c_str(),
                 layout.ignored.size() > 1 ? "s" : "", list.c_str());
  }
  reader.select_columns(layout.column, layout.field_count);
  return layout;
}

inline constexpr const char* attitude_csv_header = "t,qw,qx,qy,qz";

inline constexpr std::array<const char*, 5> attitude_field_names{{"t", "qw", "qx", "qy", "qz"}};

// A destination file written through a temporary beside it (same directory, so the final rename
// is atomic on POSIX file systems).
class StagedOutputFile {
 public:
  StagedOutputFile() = default;
  StagedOutputFile(const StagedOutputFile&) = delete;
  StagedOutputFile& operator=(const StagedOutputFile&) = delete;
  StagedOutputFile(StagedOutputFile&&) = delete;
  StagedOutputFile& operator=(StagedOutputFile&&) = delete;
  ~StagedOutputFile() { discard(); }

  // Creates the temporary `<destination>.tmp-XXXXXX`. False (with errno) if it cannot. A
  // destination that exists and is not a regular file (/dev/null, a named pipe, a terminal) is
  // opened and written directly instead: renaming over it would replace the device or pipe with
  // a regular file (and needs write access to its directory).
  bool open(const std::string& destination) {
    destination_ = destination;
    struct stat st {};
    if (::stat(destination.c_str(), &st) == 0 && !S_ISREG(st.st_mode)) {
      file_ = std::fopen(destination.c_str(), "w");
      direct_ = file_ != nullptr;
      return direct_;
    }
    std::string pattern = destination + ".tmp-XXXXXX";
    const int fd = mkstemp(pattern.data());
    if (fd < 0) {
      return false;
    }
    temporary_ = pattern;
    file_ = fdopen(fd, "w");
    if (file_ == nullptr) {
      close(fd);
      std::remove(temporary_.c_str());
      temporary_.clear();
      return false;
    }
    return true;
  }

  std::FILE* get() const noexcept { return file_; }

  // Flushes, closes and renames over the destination. False if any write or the rename failed
  // (the temporary is then removed).
  bool commit() {
    if (file_ == nullptr) return false;
    const bool write_ok = std::ferror(file_) == 0;
    const bool close_ok = std::fclose(file_) == 0;
    file_ = nullptr;
    if (direct_) {
      return write_ok && close_ok;
    }
    if (!write_ok || !close_ok || std::rename(temporary_.c_str(), destination_.c_str()) != 0) {
      std::remove(temporary_.c_str());
      temporary_.clear();
      return false;
    }
    temporary_.clear();
    return true;
  }

  // Closes and removes the temporary (nothing under the destination's name is touched).
  void discard() noexcept {
    if (file_ != nullptr) {
      std::fclose(file_);
      file_ = nullptr;
    }
    if (!temporary_.empty()) {
      std::remove(temporary_.c_str());
      temporary_.clear();
    }
  }

 private:
  std::string destination_;
  std::string temporary_;
  std::FILE* file_ = nullptr;
  bool direct_ = false;  // the destination is not a regular file: written in place
};

// Writes `values` as one CSV row with `digits` significant digits (17 round-trips a double,
// 9 a float).
template <std::size_t N>
void write_csv_row(std::FILE* f, const std::array<double, N>& values, int digits) {
  for (std::size_t i = 0; i < N; ++i) {
    std::fprintf(f, i == 0 ? "%.*g" : ",%.*g", digits, values[i]);
  }
  std::fputc('\n', f);
}

}  // namespace halfspin::tools
