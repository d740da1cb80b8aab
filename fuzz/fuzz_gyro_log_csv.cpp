// libFuzzer harness: the tools' gyro-log CSV reader (examples/tools/common/gyro_log.hpp) on
// arbitrary bytes, as halfspin-propagate uses it (read_header, resolve_gyro_log_layout,
// select_columns, then next() until end). The bytes are split into lines here independently of
// the reader, and every promise of its header comment is checked against that split:
//   - one call of next() per line after the header, line() counting them 1-based; `end` exactly
//     when the lines are exhausted; a UTF-8 byte-order mark is removed from the header only;
//   - a line (its trailing CR removed) longer than max_line_length is `bad`/too_long;
//   - a line whose comma count is not (field count) − 1 is `bad`/wrong_field_count;
//   - `row` ⇒ every value is finite (the reader's promise: NaN, ±infinity and overflow are
//     `non_finite`) and equals strtod of its selected field with spaces and tabs trimmed;
//   - a header the layout accepts names distinct columns for t, x, y, z, each with the name
//     looked for, the others listed as ignored; the rows are then read with that selection;
//   - `bad` ⇒ a problem class and a message; for non_finite, the values still hold the parsed
//     numbers, at least one of them not finite.
// Whether a value fits a float is not the reader's business: halfspin-propagate checks
// |v| ≤ FLT_MAX before converting (--scalar float); the harness repeats that check and the
// conversion, so that UBSan would report an out-of-range double → float conversion.
#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <limits>
#include <optional>
#include <sstream>
#include <string>
#include <string_view>
#include <vector>

#include "fuzz_support.hpp"
#include "gyro_log.hpp"

namespace {

using namespace halfspin::tools;

// Lines as the format defines them: split at '\n', a last line without newline counts, a
// trailing '\r' is not part of the line.
std::vector<std::string> split_lines(std::string_view text) {
  std::vector<std::string> lines;
  std::size_t start = 0;
  while (start < text.size()) {
    std::size_t end = text.find('\n', start);
    if (end == std::string_view::npos) end = text.size();
    std::string line(text.substr(start, end - start));
    if (!line.empty() && line.back() == '\r') line.pop_back();
    lines.push_back(std::move(line));
    start = end + 1;
  }
  return lines;
}

std::string_view trim(std::string_view s) {
  while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
  while (!s.empty() && (s.back() == ' ' || s.back() == '\t')) s.remove_suffix(1);
  return s;
}

// The N-th field of `line` (0-based), whole (untrimmed); "" past the end.
std::string field_of(const std::string& line, std::size_t n) {
  std::size_t start = 0;
  for (std::size_t f = 0; f < n; ++f) {
    const std::size_t comma = line.find(',', start);
    if (comma == std::string::npos) return "";
    start = comma + 1;
  }
  const std::size_t comma = line.find(',', start);
  return line.substr(start, comma == std::string::npos ? std::string::npos : comma - start);
}

template <std::size_t N>
void check_reader(std::string_view text, const std::vector<std::string>& lines,
                  const std::array<const char*, N>& names,
                  const std::array<std::size_t, N>& columns = detail::identity_columns<N>(),
                  std::size_t field_count = N) {
  std::istringstream in{std::string(text)};
  NumericCsvReader<N> reader(in);
  if (field_count != N || columns != detail::identity_columns<N>()) {
    reader.select_columns(columns, field_count);
  }
  std::string header;
  const bool header_ok = reader.read_header(header);
  if (lines.empty()) {
    HALFSPIN_FUZZ_REQUIRE(!header_ok && reader.line() == 0);
    std::array<double, N> v{};
    HALFSPIN_FUZZ_REQUIRE(reader.next(v, names) == ReadOutcome::end);
    return;
  }
  HALFSPIN_FUZZ_REQUIRE(reader.line() == 1);
  HALFSPIN_FUZZ_REQUIRE(header_ok == (lines[0].size() <= max_line_length));
  if (header_ok) {
    const bool bom = lines[0].compare(0, 3, "\xEF\xBB\xBF") == 0;
    HALFSPIN_FUZZ_REQUIRE(header == (bom ? lines[0].substr(3) : lines[0]));
  }
  for (std::size_t i = 1; i < lines.size(); ++i) {
    std::array<double, N> v{};
    const ReadOutcome r = reader.next(v, names);
    HALFSPIN_FUZZ_REQUIRE(r != ReadOutcome::end);
    HALFSPIN_FUZZ_REQUIRE(reader.line() == i + 1);
    const std::string& line = lines[i];
    const std::size_t commas = static_cast<std::size_t>(std::count(line.begin(), line.end(), ','));
    if (line.size() > max_line_length) {
      HALFSPIN_FUZZ_REQUIRE(r == ReadOutcome::bad && reader.problem() == LineProblem::too_long);
    } else if (commas + 1 != field_count) {
      HALFSPIN_FUZZ_REQUIRE(r == ReadOutcome::bad &&
                            reader.problem() == LineProblem::wrong_field_count);
    }
    if (r == ReadOutcome::row) {
      HALFSPIN_FUZZ_REQUIRE(reader.problem() == LineProblem::none);
      HALFSPIN_FUZZ_REQUIRE(commas + 1 == field_count);
      // Every selected field re-parsed here must give the same finite number.
      for (std::size_t f = 0; f < N; ++f) {
        const std::string field(trim(field_of(line, columns[f])));
        HALFSPIN_FUZZ_REQUIRE(!field.empty());
        char* end = nullptr;
        const double expected = std::strtod(field.c_str(), &end);
        HALFSPIN_FUZZ_REQUIRE(end == field.c_str() + field.size());
        HALFSPIN_FUZZ_REQUIRE(std::isfinite(v[f]));
        HALFSPIN_FUZZ_REQUIRE(v[f] == expected || (v[f] == 0.0 && expected == 0.0));
        // The tool's conversion for --scalar float: checked against the float range first.
        if (std::fabs(v[f]) <= static_cast<double>(std::numeric_limits<float>::max())) {
          const float as_float = static_cast<float>(v[f]);
          HALFSPIN_FUZZ_REQUIRE(std::isfinite(as_float));
        }
      }
    } else {
      HALFSPIN_FUZZ_REQUIRE(r == ReadOutcome::bad);
      HALFSPIN_FUZZ_REQUIRE(reader.problem() != LineProblem::none);
      HALFSPIN_FUZZ_REQUIRE(!reader.message().empty());
      if (reader.problem() == LineProblem::non_finite) {
        bool any_non_finite = false;
        for (const double x : v) any_non_finite = any_non_finite || !std::isfinite(x);
        HALFSPIN_FUZZ_REQUIRE(any_non_finite);
      }
    }
  }
  std::array<double, N> v{};
  HALFSPIN_FUZZ_REQUIRE(reader.next(v, names) == ReadOutcome::end);
  HALFSPIN_FUZZ_REQUIRE(reader.line() == lines.size());
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  const std::vector<std::string> lines = split_lines(text);
  // The gyro log (4 fields) and the attitude file (5 fields), as the tools read them.
  check_reader<4>(text, lines, default_column_names(GyroLogForm::rate));
  check_reader<5>(text, lines, attitude_field_names);
  // The gyro log through the layout its header gives: by the default names, and with the form
  // and the time column's name given (--form rate --columns t=<first name>).
  if (lines.empty() || lines[0].size() > max_line_length) return 0;
  const std::string header =
      lines[0].compare(0, 3, "\xEF\xBB\xBF") == 0 ? lines[0].substr(3) : lines[0];
  const std::string first_name(trim(field_of(header, 0)));
  for (const bool mapped : {false, true}) {
    std::array<std::string, 4> names{};
    if (mapped && !first_name.empty()) names[0] = first_name;
    GyroLogLayout layout;
    const std::string reason = resolve_gyro_log_layout(
        header, mapped ? std::optional<GyroLogForm>(GyroLogForm::rate) : std::nullopt, names,
        layout);
    if (!reason.empty()) continue;
    HALFSPIN_FUZZ_REQUIRE(layout.field_count ==
                          static_cast<std::size_t>(std::count(header.begin(), header.end(), ',')) +
                              1);
    HALFSPIN_FUZZ_REQUIRE(layout.ignored.size() + 4 == layout.field_count);
    for (std::size_t r = 0; r < 4; ++r) {
      HALFSPIN_FUZZ_REQUIRE(layout.column[r] < layout.field_count);
      for (std::size_t q = 0; q < r; ++q)
        HALFSPIN_FUZZ_REQUIRE(layout.column[q] != layout.column[r]);
      HALFSPIN_FUZZ_REQUIRE(std::string(trim(field_of(header, layout.column[r]))) ==
                            layout.name[r]);
      const std::string wanted = names[r].empty() ? default_column_names(layout.form)[r] : names[r];
      HALFSPIN_FUZZ_REQUIRE(layout.name[r] == wanted);
    }
    const std::array<const char*, 4> column_names{{layout.name[0].c_str(), layout.name[1].c_str(),
                                                   layout.name[2].c_str(), layout.name[3].c_str()}};
    check_reader<4>(text, lines, column_names, layout.column, layout.field_count);
  }
  return 0;
}
