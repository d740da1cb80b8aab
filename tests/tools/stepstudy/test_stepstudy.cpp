// halfspin-stepstudy run as a user would run it: the built tool is spawned with arguments, and its
// exit code, stdout, CSV, SVG and recommendation file are checked. Paths come from CMake
// (HALFSPIN_STEPSTUDY_EXE, HALFSPIN_XMLLINT_EXE, HALFSPIN_RSVG_CONVERT_EXE, a scratch directory).
// Every check names its source: Debian tools (xmllint from libxml2-utils, rsvg-convert from
// librsvg2-bin), the PNG specification, closed forms, published orders (../shared/REFERENCES.md),
// or facts of the trade marked "common practice, no source".
#include <catch2/catch.hpp>

#include <sys/wait.h>

#include <algorithm>
#include <cmath>
#include <complex>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <map>
#include <set>
#include <sstream>
#include <string>
#include <tuple>
#include <vector>

#include "halfspin/bounds/bound_report.hpp"
#include "halfspin/bounds/fix_interval.hpp"
#include "halfspin/bounds/motion_description.hpp"
#include "halfspin/bounds/sensor_error.hpp"
#include "halfspin/propagation/compensated_accumulation.hpp"
#include "halfspin/propagation/stepper_catalogue.hpp"

namespace {

const std::string tool = HALFSPIN_STEPSTUDY_EXE;
const std::string scratch = HALFSPIN_STEPSTUDY_SCRATCH;

struct Result {
  int exit_code = -1;
  std::string out;
  std::string err;
};

std::string read_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

bool file_exists(const std::string& path) { return static_cast<bool>(std::ifstream(path)); }

// Runs `program args` with stdout and stderr captured to files named after `tag`.
Result run_program(const std::string& program, const std::string& args, const std::string& tag) {
  const std::string out = scratch + "/" + tag + ".stdout";
  const std::string err = scratch + "/" + tag + ".stderr";
  const std::string command = "'" + program + "' " + args + " >'" + out + "' 2>'" + err + "'";
  const int status = std::system(command.c_str());
  Result r;
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  r.out = read_file(out);
  r.err = read_file(err);
  return r;
}

Result run_tool(const std::string& args, const std::string& tag) {
  return run_program(tool, args, tag);
}

std::string path(const std::string& name) { return scratch + "/" + name; }

std::vector<std::string> split(const std::string& line, char sep) {
  std::vector<std::string> parts;
  std::string part;
  std::istringstream in(line);
  while (std::getline(in, part, sep)) {
    parts.push_back(part);
  }
  if (!line.empty() && line.back() == sep) {
    parts.emplace_back();
  }
  return parts;
}

std::vector<std::string> lines_of(const std::string& text) {
  std::vector<std::string> lines;
  std::istringstream in(text);
  std::string line;
  while (std::getline(in, line)) {
    lines.push_back(line);
  }
  return lines;
}

struct CsvRow {
  std::string method;
  std::string scalar;
  double step_s = 0;
  std::string max_error;  // as written (may be empty)
  double max_error_rad = 0;
  double bound_rad = 0;
  std::string ns;
};

const char* const csv_header = "method,scalar,step_s,max_error_rad,bound_rad,ns_per_step";

double number(const std::string& text) {
  char* end = nullptr;
  const double v = std::strtod(text.c_str(), &end);
  INFO("field '" << text << "'");
  REQUIRE(!text.empty());
  REQUIRE(end == text.c_str() + text.size());
  return v;
}

// Reads a CSV written by the tool; checks the header is exactly the documented one.
std::vector<CsvRow> read_csv(const std::string& file, bool measured) {
  const std::vector<std::string> lines = lines_of(read_file(file));
  REQUIRE(!lines.empty());
  REQUIRE(lines[0] == csv_header);
  std::vector<CsvRow> rows;
  for (std::size_t i = 1; i < lines.size(); ++i) {
    const std::vector<std::string> f = split(lines[i], ',');
    INFO("CSV line " << i << ": " << lines[i]);
    REQUIRE(f.size() == 6);
    CsvRow r;
    r.method = f[0];
    r.scalar = f[1];
    r.step_s = number(f[2]);
    r.max_error = f[3];
    r.bound_rad = number(f[4]);
    r.ns = f[5];
    if (measured) {
      r.max_error_rad = number(f[3]);
      CHECK(number(f[5]) > 0);
    } else {
      CHECK(f[3].empty());
      CHECK(f[5].empty());
    }
    rows.push_back(r);
  }
  return rows;
}

// key=value lines of a recommendation file.
std::map<std::string, std::string> read_keys(const std::string& file) {
  std::map<std::string, std::string> keys;
  for (const std::string& line : lines_of(read_file(file))) {
    const std::size_t eq = line.find('=');
    REQUIRE(eq != std::string::npos);
    keys[line.substr(0, eq)] = line.substr(eq + 1);
  }
  return keys;
}

// The table row of stdout for (method, scalar, step index): the printed observed order.
std::vector<std::vector<std::string>> table_rows(const std::string& out, const std::string& method,
                                                 const std::string& scalar) {
  std::vector<std::vector<std::string>> rows;
  for (const std::string& line : lines_of(out)) {
    std::istringstream in(line);
    std::vector<std::string> words;
    std::string w;
    while (in >> w) {
      words.push_back(w);
    }
    if (words.size() == 8 && words[0] == method && words[1] == scalar) {
      rows.push_back(words);
    }
  }
  return rows;
}

// An sRGB colour as the chart writes it: "#rrggbb" or "hsl(H,S%,L%)" (the fallback beyond the
// palette). HSL to RGB by the algorithm of CSS Color Module Level 3, section 4.2.4 (W3C; from
// memory). Channels in [0, 1].
struct Rgb {
  double r = 0;
  double g = 0;
  double b = 0;
};

double hsl_channel(double m1, double m2, double h) {
  if (h < 0) h += 1;
  if (h > 1) h -= 1;
  if (h * 6 < 1) return m1 + (m2 - m1) * h * 6;
  if (h * 2 < 1) return m2;
  if (h * 3 < 2) return m1 + (m2 - m1) * (2.0 / 3.0 - h) * 6;
  return m1;
}

Rgb parse_colour(const std::string& text) {
  INFO("colour '" << text << "'");
  Rgb c;
  if (text.size() == 7 && text[0] == '#') {
    const auto channel = [&](std::size_t at) {
      return static_cast<double>(std::stoi(text.substr(at, 2), nullptr, 16)) / 255.0;
    };
    c = {channel(1), channel(3), channel(5)};
    return c;
  }
  double h = 0;
  double sat = 0;
  double light = 0;
  REQUIRE(std::sscanf(text.c_str(), "hsl(%lf,%lf%%,%lf%%)", &h, &sat, &light) == 3);
  h /= 360.0;
  sat /= 100.0;
  light /= 100.0;
  const double m2 = light <= 0.5 ? light * (sat + 1) : light + sat - light * sat;
  const double m1 = light * 2 - m2;
  c = {hsl_channel(m1, m2, h + 1.0 / 3.0), hsl_channel(m1, m2, h),
       hsl_channel(m1, m2, h - 1.0 / 3.0)};
  return c;
}

// Relative luminance and contrast ratio as defined by WCAG 2.1 (W3C, "relative luminance" and
// "contrast ratio" in its glossary; from memory): sRGB channels linearized, weighted 0.2126,
// 0.7152, 0.0722; ratio (L1 + 0.05) / (L2 + 0.05) with L1 the lighter.
double relative_luminance(const Rgb& c) {
  const auto linear = [](double v) {
    return v <= 0.03928 ? v / 12.92 : std::pow((v + 0.055) / 1.055, 2.4);
  };
  return 0.2126 * linear(c.r) + 0.7152 * linear(c.g) + 0.0722 * linear(c.b);
}

double contrast_ratio(const Rgb& a, const Rgb& b) {
  const double la = relative_luminance(a);
  const double lb = relative_luminance(b);
  return (std::max(la, lb) + 0.05) / (std::min(la, lb) + 0.05);
}

// The value of attribute `name` in the first tag at or after `from` that has it.
std::string attribute(const std::string& text, const std::string& name, std::size_t from) {
  const std::size_t at = text.find(" " + name + "=\"", from);
  if (at == std::string::npos) return "";
  const std::size_t start = at + name.size() + 3;
  return text.substr(start, text.find('"', start) - start);
}

constexpr double eps_double = 2.220446049250313e-16;  // 2^-52 (IEEE 754 binary64)
constexpr double eps_float = 1.1920928955078125e-07;  // 2^-23 (IEEE 754 binary32)

}  // namespace

TEST_CASE("help documents units, exit codes and the caution, and bad usage exits 1", "[tools]") {
  const Result help = run_tool("--help", "help");
  CHECK(help.exit_code == 0);
  for (const char* needle : {"--motion",
                             "--envelope",
                             "--coning",
                             "--methods",
                             "--step-min",
                             "--step-max",
                             "--steps",
                             "--scalar",
                             "--duration",
                             "--csv",
                             "--svg",
                             "--budget",
                             "--horizon",
                             "--gyro-rate",
                             "--recommendation-file",
                             "--max-rate",
                             "--max-rate-deg",
                             "--axis-rates",
                             "--axis-rates-deg",
                             "--bandwidth",
                             "--vibration HZ:X,Y,Z:UNIT[:PX,PY,PZ]",
                             "rad or deg (angle amplitude",
                             "rad/s or deg/s (rate amplitude)",
                             "--fixes",
                             "needs Dk",
                             "unknown",
                             "(rad/s^2)",
                             "(s)",
                             "(rad)",
                             "(Hz)",
                             "Exit codes: 0 ok; 1 bad usage",
                             "hardware-in-the-loop",
                             "airworthiness",
                             "licensed"}) {
    INFO(needle);
    CHECK(help.out.find(needle) != std::string::npos);
  }
  // Bad usage, each on its own: exit code 1 and a message on stderr.
  int n = 0;
  for (const char* args : {"--no-such-option", "--motion nowhere", "--methods rk9", "--step-min -1",
                           "--steps 0", "--budget 1e-3", "--scalar half",
                           "--motion coning --coning 1,5", "--envelope 1,2,3,4,5,6,7",
                           "--step-min 1e-2 --step-max 1e-3", "--recommendation-file x.txt"}) {
    INFO(args);
    const Result r = run_tool(args, "bad" + std::to_string(n++));
    CHECK(r.exit_code == 1);
    CHECK(!r.err.empty());
  }
}

TEST_CASE("the SVG is well formed, renders, and has both charts, the legend and the budget line",
          "[tools][reference]") {
  const std::string svg = path("coning.svg");
  const std::string png = path("coning.png");
  std::remove(svg.c_str());
  std::remove(png.c_str());
  const Result r = run_tool(
      "--motion coning --methods magnus_4,coning_2_sample,runge_kutta_4_rate_function "
      "--duration 1 --svg '" +
          svg + "' --budget 1e-3 --horizon 60",
      "svg");
  REQUIRE(r.exit_code == 0);
  // Well-formed XML: xmllint --noout exits 0 (Debian libxml2-utils).
  CHECK(run_program(HALFSPIN_XMLLINT_EXE, "--noout '" + svg + "'", "xmllint").exit_code == 0);
  // Renders: rsvg-convert (Debian librsvg2-bin) writes a PNG, which starts with the 8-byte PNG
  // signature 89 50 4E 47 0D 0A 1A 0A (PNG specification, ISO/IEC 15948 / W3C).
  CHECK(
      run_program(HALFSPIN_RSVG_CONVERT_EXE, "-o '" + png + "' '" + svg + "'", "rsvg").exit_code ==
      0);
  REQUIRE(file_exists(png));
  const std::string image = read_file(png);
  REQUIRE(image.size() > 1000);
  CHECK(image.compare(0, 8, std::string("\x89PNG\r\n\x1a\n", 8)) == 0);
  // Content: two charts, axis labels with units, legend entries for every method, the budget line.
  const std::string text = read_file(svg);
  CHECK(text.find("id=\"chart-1\"") != std::string::npos);
  CHECK(text.find("id=\"chart-2\"") != std::string::npos);
  CHECK(text.find("Max attitude error against step") != std::string::npos);
  CHECK(text.find("Max attitude error against cost") != std::string::npos);
  CHECK(text.find(">step (s)<") != std::string::npos);
  CHECK(text.find("attitude error (rad)") != std::string::npos);
  CHECK(text.find("ns per step") != std::string::npos);
  const std::size_t legend = text.find("class=\"legend\"");
  REQUIRE(legend != std::string::npos);
  for (const char* method : {"magnus_4", "coning_2_sample", "runge_kutta_4_rate_function"}) {
    INFO(method);
    CHECK(text.find(std::string(">") + method + "<", legend) != std::string::npos);
  }
  CHECK(text.find("float, a-priori bound", legend) != std::string::npos);
  CHECK(text.find("double, measured", legend) != std::string::npos);
  const std::size_t budget = text.find("class=\"reference\"");
  REQUIRE(budget != std::string::npos);
  // Like with like: the runs cover 1 s and the budget 60 s, so the line is the budget scaled to
  // the run (1e-3 x 1/60), labelled as such.
  CHECK(text.find("budget x 1 s / 60 s = 1.667e-05 rad (linear growth assumed)", budget) !=
        std::string::npos);
  CHECK(text.find("errors and bounds over runs of 1 s") != std::string::npos);
  CHECK(text.find("stroke-dasharray=\"7 4\"") != std::string::npos);  // the dashed bounds
  // Bounds only: the bounds cover --horizon, and the budget line is the budget itself.
  const std::string svg2 = path("bounds_only.svg");
  REQUIRE(run_tool("--coning 0.5,40 --methods coning_2_sample --svg '" + svg2 +
                       "' --budget 1e-3 --horizon 60",
                   "svg_bounds_only")
              .exit_code == 0);
  const std::string text2 = read_file(svg2);
  CHECK(text2.find("budget 1.000e-03 rad over 60 s") != std::string::npos);
  CHECK(text2.find("bounds over 60 s") != std::string::npos);
}

// No ';' in a test name: catch_discover_tests splits the name there, and the halves match no test.
TEST_CASE("SVG series colours: distinct, visible on white, and the fonts end in a generic family",
          "[tools][reference]") {
  // Bounds only and every sample-driven stepper: more series than the nine palette colours, so the
  // fallback colours are checked too.
  const std::string svg = path("colours.svg");
  std::remove(svg.c_str());
  const std::string sweep = "--envelope 0.6,1,5 --methods all --step-min 1e-4 --step-max 1e-2";
  const Result r = run_tool(sweep + " --steps 3 --svg '" + svg + "'", "colours");
  REQUIRE(r.exit_code == 0);
  const std::string text = read_file(svg);
  const std::size_t legend = text.find("class=\"legend\"");
  REQUIRE(legend != std::string::npos);
  // The legend draws one 3-wide line in each method's colour.
  std::vector<std::string> colours;
  for (std::size_t at = text.find("<line", legend); at != std::string::npos;
       at = text.find("<line", at + 1)) {
    if (attribute(text, "stroke-width", at) == "3") {
      colours.push_back(attribute(text, "stroke", at));
    }
  }
  REQUIRE(colours.size() >= 10);
  // The contrast formula reproduces WCAG 2.1's own end point: black on white is 21:1 (WCAG 2.1,
  // "contrast ratio": ratios range from 1 to 21).
  CHECK(contrast_ratio({0, 0, 0}, {1, 1, 1}) == Approx(21.0).epsilon(1e-12));
  const Rgb white{1, 1, 1};
  for (const std::string& c : colours) {
    INFO("series colour " << c << ", contrast on white " << contrast_ratio(parse_colour(c), white));
    // Visible as a thin line on the white plot area: at least 1.5:1 (pale grey #dddddd or a pale
    // yellow fall below it; common practice, no source).
    CHECK(contrast_ratio(parse_colour(c), white) >= 1.5);
  }
  // One colour per method.
  CHECK(std::set<std::string>(colours.begin(), colours.end()).size() == colours.size());
  // The font list ends in a generic family, so the text renders on any system (CSS Fonts Module
  // Level 4, "generic font families"; from memory).
  const std::string fonts = attribute(text, "font-family", text.find("<svg"));
  REQUIRE(!fonts.empty());
  const std::size_t comma = fonts.rfind(',');
  std::string last = fonts.substr(comma == std::string::npos ? 0 : comma + 1);
  last.erase(0, last.find_first_not_of(' '));
  const std::set<std::string> generic{"serif",        "sans-serif", "monospace", "cursive",
                                      "fantasy",      "system-ui",  "ui-serif",  "ui-sans-serif",
                                      "ui-monospace", "ui-rounded"};
  INFO("font-family \"" << fonts << "\"");
  CHECK(generic.count(last) == 1);
}

TEST_CASE(
    "CSV: exact header, one row per (method, scalar, step), error within the bound in every "
    "row, on every motion",
    "[tools]") {
  // The bounds themselves are proven safe in tests/bounds; this checks that the tool hands each
  // stepper, scalar and step the right description, step and horizon.
  for (const char* motion : {"constant", "oscillation", "coning", "body", "demo"}) {
    const std::string csv = path(std::string(motion) + "_all.csv");
    const Result r = run_tool(std::string("--motion ") + motion +
                                  " --methods all --steps 8 --duration 0.5 "
                                  "--csv '" +
                                  csv + "'",
                              std::string(motion) + "_all");
    INFO(motion << "\n" << r.err);
    REQUIRE(r.exit_code == 0);
    const std::vector<CsvRow> rows = read_csv(csv, true);
    // every catalogued stepper, in both scalars, at each of the 8 steps
    CHECK(rows.size() == halfspin::StepperCatalogue::size * 2u * 8u);
    std::set<std::tuple<std::string, std::string, double>> seen;
    for (const CsvRow& row : rows) {
      INFO(row.method << " " << row.scalar << " step " << row.step_s << ": error "
                      << row.max_error_rad << " bound " << row.bound_rad);
      CHECK(seen.insert({row.method, row.scalar, row.step_s}).second);
      CHECK(row.max_error_rad >= 0);
      CHECK(row.max_error_rad <= row.bound_rad);
    }
    std::set<double> steps;
    for (const CsvRow& row : rows) {
      steps.insert(row.step_s);
    }
    CHECK(steps.size() == 8u);
  }
}

TEST_CASE("bounds only: --coning gives the coning motion's bounds, no measured columns",
          "[tools]") {
  // 0.04 rad = 2.2918311805232928 deg (0.04·180/π).
  const std::string a = path("coning_bounds.csv");
  const std::string b = path("coning_measured.csv");
  REQUIRE(run_tool("--coning 2.2918311805232928,5 --methods "
                   "magnus_4,coning_2_sample,runge_kutta_4_rate_function "
                   "--step-min 1e-3 --step-max 2e-2 --duration 1 --csv '" +
                       a + "'",
                   "bounds_only")
              .exit_code == 0);
  REQUIRE(
      run_tool("--motion coning --methods magnus_4,coning_2_sample --step-min 1e-3 --step-max 2e-2 "
               "--duration 1 --csv '" +
                   b + "'",
               "bounds_measured")
          .exit_code == 0);
  const std::vector<CsvRow> bounds = read_csv(a, false);
  const std::vector<CsvRow> measured = read_csv(b, true);
  REQUIRE(bounds.size() == 2u * 2u * 8u);  // the rate-function stepper is left out
  REQUIRE(measured.size() == bounds.size());
  for (std::size_t i = 0; i < bounds.size(); ++i) {
    INFO(bounds[i].method << " " << bounds[i].scalar << " " << bounds[i].step_s);
    CHECK(bounds[i].method == measured[i].method);
    CHECK(bounds[i].step_s == Approx(measured[i].step_s).epsilon(1e-9));
    // The horizons differ by at most a step (ceil vs round of duration/step), and the description
    // by the rounding of the degrees: bounds agree closely where the step divides the run evenly.
    CHECK(bounds[i].bound_rad == Approx(measured[i].bound_rad).epsilon(0.05));
  }
  // Envelope mode runs too, and only bounds are shown.
  const std::string c = path("envelope.csv");
  REQUIRE(
      run_tool("--envelope 0.6,1,5,40,400,4000 --methods magnus_4,coning_2_sample --scalar double "
               "--csv '" +
                   c + "'",
               "envelope")
          .exit_code == 0);
  CHECK(read_csv(c, false).size() == 2u * 8u);
}

TEST_CASE("constant rate: exact methods at rounding level, RK4 at its closed-form truncation",
          "[tools][reference]") {
  const std::string csv = path("constant.csv");
  const double duration = 2.0;
  const Result r = run_tool(
      "--motion constant --methods exponential_map_hold_end,exponential_map_midpoint_mean,magnus_4,"
      "coning_1_sample,coning_2_sample,coning_4_sample,runge_kutta_4_sampled --step-min 2e-3 "
      "--step-max 1e-1 --steps 8 --duration 2 --csv '" +
          csv + "'",
      "constant");
  REQUIRE(r.exit_code == 0);
  // The tool's constant motion (its --help): ω = (0.9, −0.6, 1.3) rad/s.
  const double w = std::sqrt(0.81 + 0.36 + 1.69);
  int closed_form_checks = 0;
  for (const CsvRow& row : read_csv(csv, true)) {
    const double steps = std::round(duration / row.step_s);
    const double eps = row.scalar == "float" ? eps_float : eps_double;
    INFO(row.method << " " << row.scalar << " step " << row.step_s << ": error "
                    << row.max_error_rad);
    if (row.method != "runge_kutta_4_sampled") {
      // Exponential-map, Magnus and coning steps integrate a constant rate exactly (the rotation
      // vector is ω·dt and every correction term is a cross product of parallel vectors: common
      // practice, no source); what remains is rounding, a few ε per step at worst (Higham's
      // model of linear accumulation). Measured worst: 0.16 ε per step in float and in double
      // (g++ 12 and clang); the check allows 0.6 ε.
      CHECK(row.max_error_rad <= 0.6 * eps * (steps + 1.0));
    } else {
      // Classic RK4 on q̇ = ½ q ⊗ (0, ω) multiplies q by its stability polynomial
      // P(z) = 1 + z + z²/2 + z³/6 + z⁴/24 at z = ½ω dt (Butcher: the RK4 stability function is
      // the degree-4 Taylor polynomial of exp). (0, ω/|ω|) squares to −1, so that factor behaves
      // as the complex number P(iθ/2), θ = |ω|dt: after exact renormalization each step turns by
      // 2·arg P(iθ/2) instead of θ, and the errors add along the fixed axis: N·|2 arg P − θ|.
      const double theta = w * row.step_s;
      const std::complex<double> z(0.0, 0.5 * theta);
      const std::complex<double> p = 1.0 + z + z * z / 2.0 + z * z * z / 6.0 + z * z * z * z / 24.0;
      const double expected = steps * std::fabs(2.0 * std::arg(p) - theta);
      if (expected > 1e3 * eps * steps) {  // truncation far above rounding: double, 5 steps
        CHECK(row.max_error_rad == Approx(expected).epsilon(0.02));  // measured within 0.002 %
        ++closed_form_checks;
      }
    }
  }
  CHECK(closed_form_checks >= 4);
}

// --local-errors: the CSV gains local_error_sum_rad, the sum over the run of each step's own error.
struct LocalRow {
  std::string method;
  double step_s = 0;
  double steps = 0;
  double max_error_rad = 0;
  double local_sum_rad = 0;
};

std::vector<LocalRow> read_local_csv(const std::string& file, double duration) {
  const std::vector<std::string> lines = lines_of(read_file(file));
  REQUIRE(!lines.empty());
  REQUIRE(lines[0] == std::string(csv_header) + ",local_error_sum_rad");
  std::vector<LocalRow> rows;
  for (std::size_t i = 1; i < lines.size(); ++i) {
    const std::vector<std::string> f = split(lines[i], ',');
    INFO("CSV line " << i << ": " << lines[i]);
    REQUIRE(f.size() == 7);
    LocalRow r;
    r.method = f[0];
    r.step_s = number(f[2]);
    r.steps = std::max(1.0, std::round(duration / r.step_s));
    r.max_error_rad = number(f[3]);
    r.local_sum_rad = number(f[6]);
    rows.push_back(r);
  }
  return rows;
}

TEST_CASE(
    "stepstudy local errors: the sum of the steps' own errors, closed form at constant rate, and "
    "never below the measured error",
    "[tools][reference]") {
  // Constant rate: RK4's step error is |2 arg P(iθ/2) − θ| (the closed form of the constant-rate
  // test above) and every step makes the same one, so the sum is N times it; the exact methods'
  // steps are exact up to rounding.
  const std::string constant_csv = path("local_constant.csv");
  REQUIRE(run_tool("--motion constant --methods exponential_map_hold_end,coning_2_sample,"
                   "coning_1_sample_plus_previous,runge_kutta_4_sampled,runge_kutta_2_midpoint_"
                   "sampled --scalar double --step-min 2e-2 --step-max 1e-1 --steps 3 "
                   "--duration 2 --local-errors --csv '" +
                       constant_csv + "'",
                   "local_constant")
              .exit_code == 0);
  const double w = std::sqrt(0.81 + 0.36 + 1.69);
  int closed_form = 0;
  for (const LocalRow& row : read_local_csv(constant_csv, 2.0)) {
    INFO(row.method << " step " << row.step_s << ": sum " << row.local_sum_rad);
    if (row.method == "runge_kutta_4_sampled") {
      const std::complex<double> z(0.0, 0.5 * w * row.step_s);
      const std::complex<double> p = 1.0 + z + z * z / 2.0 + z * z * z / 6.0 + z * z * z * z / 24.0;
      CHECK(row.local_sum_rad ==
            Approx(row.steps * std::fabs(2.0 * std::arg(p) - w * row.step_s)).epsilon(1e-6));
      ++closed_form;
    } else if (row.method != "runge_kutta_2_midpoint_sampled") {
      CHECK(row.local_sum_rad <= 4.0 * eps_double * row.steps);  // rounding only
    } else {
      CHECK(row.local_sum_rad > 1e-6);  // a second-order method's truncation shows
    }
  }
  CHECK(closed_form == 3);
  // Rotations compose isometrically (the angle between unit quaternions is bi-invariant), so the
  // error after N steps is at most the sum of the N steps' own errors, by the triangle inequality
  // (common practice, no source); the propagator's rounding adds a few ε per step.
  for (const char* motion : {"coning", "body", "demo"}) {
    const std::string csv = path(std::string("local_") + motion + ".csv");
    REQUIRE(run_tool(std::string("--motion ") + motion +
                         " --methods exponential_map_midpoint_sample,coning_2_sample,"
                         "coning_1_sample_plus_previous,runge_kutta_3_kutta_sampled,"
                         "dormand_prince_54_rate_function,magnus_4 --scalar double --steps 3 "
                         "--duration 1 --local-errors --csv '" +
                         csv + "'",
                     std::string("local_") + motion)
                .exit_code == 0);
    for (const LocalRow& row : read_local_csv(csv, 1.0)) {
      INFO(motion << " " << row.method << " step " << row.step_s << ": error " << row.max_error_rad
                  << ", sum " << row.local_sum_rad);
      CHECK(row.max_error_rad <= row.local_sum_rad + 8.0 * eps_double * row.steps);
    }
  }
}

TEST_CASE("coning: observed orders match the declared orders in the truncation-dominated range",
          "[tools][reference][order]") {
  // Declared orders (README table) and where they come from: the midpoint exponential map and the
  // one-sample delta-angle update are second order (common practice, no source), Magnus 4 fourth
  // (Iserles and Nørsett 1999), the two-sample coning algorithm fourth also under pure coning
  // (Ignagni 1990; Miller 1983), classic RK4 fourth (Butcher) with its stages at samples.
  const std::vector<std::pair<std::string, double>> declared{{"exponential_map_midpoint_mean", 2},
                                                             {"coning_1_sample", 2},
                                                             {"magnus_4", 4},
                                                             {"coning_2_sample", 4},
                                                             {"runge_kutta_4_sampled", 4}};
  std::string methods;
  for (const auto& d : declared) {
    methods += (methods.empty() ? "" : ",") + d.first;
  }
  const std::string csv = path("coning_orders.csv");
  const Result r =
      run_tool("--motion coning --methods " + methods +
                   " --scalar double --step-min 2e-3 --step-max 2e-2 --steps 8 --duration 2 "
                   "--csv '" +
                   csv + "'",
               "coning_orders");
  REQUIRE(r.exit_code == 0);
  const std::vector<CsvRow> rows = read_csv(csv, true);
  for (const auto& d : declared) {
    const std::vector<std::vector<std::string>> table = table_rows(r.out, d.first, "double");
    REQUIRE(table.size() == 8u);
    std::vector<CsvRow> mine;
    for (const CsvRow& row : rows) {
      if (row.method == d.first) {
        mine.push_back(row);
      }
    }
    REQUIRE(mine.size() == 8u);
    CHECK(table[0][6] == "-");
    int checked = 0;
    for (std::size_t i = 1; i < mine.size(); ++i) {
      // Truncation-dominated: both errors far above the double roundoff of these runs (≤ 1e-12).
      if (mine[i - 1].max_error_rad < 1e-10) {
        continue;
      }
      const double slope = std::log(mine[i].max_error_rad / mine[i - 1].max_error_rad) /
                           std::log(mine[i].step_s / mine[i - 1].step_s);
      INFO(d.first << " between " << mine[i - 1].step_s << " and " << mine[i].step_s << " s: slope "
                   << slope << ", printed " << table[i][6]);
      CHECK(std::fabs(slope - d.second) <= 0.3);
      CHECK(number(table[i][6]) == Approx(slope).margin(0.006));  // the table prints 2 decimals
      ++checked;
    }
    CHECK(checked >= 5);
  }
}

// In double and in float (the compensated accumulation, the tool's and the library's float
// default): the float recommendation is certified by the worst-case bound with the compensated
// roundoff term, so the float re-run must meet it too.
TEST_CASE("re-running at the recommended step meets the budget on the truth motion", "[tools]") {
  struct Case {
    const char* motion;
    double budget_rad;
    double horizon_s;
  };
  // The tool's coning motion over a minute, and the demo scenario (budget 0.1° over 10 minutes).
  for (const Case& c :
       {Case{"coning", 1e-3, 60.0}, Case{"demo", 0.1 * 3.14159265358979323846 / 180.0, 600.0}})
    for (const std::string scalar : {"double", "float"}) {
      INFO(c.motion << " " << scalar);
      const std::string name = std::string(c.motion) + "_" + scalar;
      const std::string file = path(name + ".recommendation");
      std::remove(file.c_str());
      char budget[64];
      std::snprintf(budget, sizeof budget, "%.17g", c.budget_rad);
      const Result r = run_tool(std::string("--motion ") + c.motion + " --scalar " + scalar +
                                    " --steps 8 --duration 0.5 --budget " + budget + " --horizon " +
                                    std::to_string(c.horizon_s) +
                                    " --gyro-rate 1000 --recommendation-file '" + file + "'",
                                name + "_recommend");
      INFO(r.err);
      REQUIRE(r.exit_code == 0);
      REQUIRE(file_exists(file));
      const std::map<std::string, std::string> keys = read_keys(file);
      CHECK(keys.size() == 5u);
      for (const char* key : {"method", "form", "step_s", "gyro_rate_hz", "bound_rad"}) {
        INFO(key);
        REQUIRE(keys.count(key) == 1u);
      }
      const std::string method = keys.at("method");
      const double step = number(keys.at("step_s"));
      const double bound = number(keys.at("bound_rad"));
      CHECK(number(keys.at("gyro_rate_hz")) == 1000.0);
      CHECK(bound <= c.budget_rad);
      // The form follows the method's input: coning algorithms take delta-angles, the rest rates
      // (common practice, no source).
      CHECK(keys.at("form") == (method.rfind("coning_", 0) == 0 ? "delta" : "rate"));
      // A step spans a whole number of gyro periods.
      const double periods = step * 1000.0;
      CHECK(std::fabs(periods - std::round(periods)) < 1e-9);
      CHECK(r.out.find("recommended: " + method) != std::string::npos);

      // Run that method at that step over the whole horizon against the truth.
      const std::string csv = path(name + "_rerun.csv");
      char step_text[64];
      std::snprintf(step_text, sizeof step_text, "%.17g", step);
      const Result again =
          run_tool("--motion " + std::string(c.motion) + " --methods " + method + " --scalar " +
                       scalar + " --step " + step_text + " --duration " +
                       std::to_string(c.horizon_s) + " --csv '" + csv + "'",
                   name + "_rerun");
      REQUIRE(again.exit_code == 0);
      const std::vector<CsvRow> rows = read_csv(csv, true);
      REQUIRE(rows.size() == 1u);
      INFO("measured " << rows[0].max_error_rad << " rad, bound " << bound << " rad, budget "
                       << c.budget_rad << " rad");
      CHECK(rows[0].max_error_rad <= c.budget_rad);
      CHECK(rows[0].max_error_rad <= bound);
      CHECK(rows[0].max_error_rad > 0);
    }
}

// ---- Describing a vehicle (issue 15): the description options, the printed description, the
// table's reasons, the longest time between fixes. ----

namespace {

constexpr double pi_value = 3.14159265358979323846;

// A bounds-only run of one method at one step (s), double, whose output is inspected.
std::string describe_args(const std::string& description) {
  return description + " --methods magnus_4 --scalar double --step 1e-3 --duration 1";
}

// The line of `out` that starts (after leading blanks) with `prefix`; "" if none.
std::string line_starting(const std::string& out, const std::string& prefix) {
  for (const std::string& line : lines_of(out)) {
    const std::size_t first = line.find_first_not_of(' ');
    if (first != std::string::npos && line.compare(first, prefix.size(), prefix) == 0) {
      return line.substr(first);
    }
  }
  return "";
}

// The numbers of a printed triple "(a, b, c)" after `label` in `line`.
std::vector<double> triple_after(const std::string& line, const std::string& label) {
  const std::size_t at = line.find(label);
  REQUIRE(at != std::string::npos);
  const std::size_t open = line.find('(', at + label.size());
  const std::size_t close = line.find(')', open);
  REQUIRE(open != std::string::npos);
  REQUIRE(close != std::string::npos);
  std::vector<double> values;
  for (std::string part : split(line.substr(open + 1, close - open - 1), ',')) {
    part.erase(0, part.find_first_not_of(' '));
    values.push_back(number(part));
  }
  REQUIRE(values.size() == 3u);
  return values;
}

// D_k as printed in "Dk = <value> <unit> ..." of the description; NaN when printed as unknown.
double printed_derivative(const std::string& out, int k, const std::string& unit) {
  const std::string line = line_starting(out, "D" + std::to_string(k) + " = ");
  INFO("D" << k << " line: '" << line << "'");
  REQUIRE(!line.empty());
  std::istringstream in(line);
  std::string name;
  std::string eq;
  std::string value;
  std::string printed_unit;
  in >> name >> eq >> value >> printed_unit;
  if (value == "unknown") {
    CHECK(printed_unit == "(" + unit + "):");
    return std::nan("");
  }
  CHECK(printed_unit == unit);
  return number(value);
}

}  // namespace

TEST_CASE("description options: valid values run, malformed ones exit 1 with a message naming it",
          "[tools]") {
  int n = 0;
  for (const char* args :
       {"--envelope 1", "--envelope 1,2,unknown,inf", "--envelope 1,2,3,4,5,6", "--max-rate 3",
        "--max-rate-deg 170 --bandwidth 4", "--axis-rates 1,2,0.5 --bandwidth 2",
        "--axis-rates-deg 100,100,40", "--vibration 120:0,0,0.01:rad",
        "--vibration 85:0.02,0.02,0:deg:0,90,0", "--vibration 30:0.1,0,0:rad/s",
        "--vibration 30:1,2,3:deg/s:10,-20,370 --coning 0.5,40",
        "--max-rate 2 --bandwidth 3 --vibration 120:0,0,0.01:rad --vibration 240:0,0,0.002:rad "
        "--vibration 50:0.1,0.1,0:deg/s --vibration 7:0,0.001,0:rad --coning 0.01,85"}) {
    INFO(args);
    const Result r = run_tool(describe_args(args), "describe_ok" + std::to_string(n++));
    INFO(r.err);
    CHECK(r.exit_code == 0);
    CHECK(r.out.find("Description as understood") != std::string::npos);
  }
  struct Bad {
    const char* args;
    const char* names;  // the message names the option
  };
  for (const Bad& b :
       {Bad{"--envelope 1,x", "--envelope"},
        Bad{"--envelope 1,,3", "--envelope"},
        Bad{"--envelope -1", "--envelope"},
        Bad{"--envelope 1,nan", "--envelope"},
        Bad{"--envelope 1,2,3,4,5,6,7", "--envelope"},
        Bad{"--max-rate fast", "--max-rate"},
        Bad{"--max-rate -2", "--max-rate"},
        Bad{"--max-rate-deg inf", "--max-rate-deg"},
        Bad{"--axis-rates 1,2", "--axis-rates"},
        Bad{"--axis-rates-deg 1,2,-3", "--axis-rates-deg"},
        Bad{"--max-rate 1 --axis-rates 1,1,1", "--axis-rates"},
        Bad{"--max-rate 1 --envelope 1,2", "--envelope"},
        Bad{"--bandwidth 5", "--bandwidth"},
        Bad{"--max-rate 1 --bandwidth 0", "--bandwidth"},
        Bad{"--vibration 120", "--vibration"},
        Bad{"--vibration 120:0,0,0.01", "--vibration"},
        Bad{"--vibration 120:0,0,0.01:mrad", "--vibration"},
        Bad{"--vibration -5:0,0,0.01:rad", "--vibration"},
        Bad{"--vibration 120:0,0,-0.01:rad", "--vibration"},
        Bad{"--vibration 120:0,0,0:rad", "--vibration"},
        Bad{"--vibration 120:0,0,0.01:rad:0,90", "--vibration"},
        Bad{"--vibration 120:0,0,0.01:rad:0,90,0:1", "--vibration"},
        Bad{"--vibration 1:1,0,0:rad --vibration 2:1,0,0:rad --vibration 3:1,0,0:rad "
            "--vibration 4:1,0,0:rad --vibration 5:1,0,0:rad",
            "--vibration"},
        Bad{"--motion demo --vibration 120:0,0,0.01:rad", "--motion"},
        Bad{"--max-rate 1 --fixes", "--fixes"}}) {
    INFO(b.args);
    const Result r = run_tool(std::string(b.args) + " --methods magnus_4 --step 1e-3",
                              "describe_bad" + std::to_string(n++));
    CHECK(r.exit_code == 1);
    CHECK(r.err.find(b.names) != std::string::npos);
    CHECK(r.out.empty());
  }
}

TEST_CASE("the printed description: units, unknowns, and a line's rate and angle amplitudes",
          "[tools][reference]") {
  // Partial envelope with an explicit unknown: D2 given as unknown, D3..D5 not given.
  const Result e = run_tool(describe_args("--envelope 1.5,2,unknown"), "describe_envelope");
  REQUIRE(e.exit_code == 0);
  CHECK(printed_derivative(e.out, 0, "rad/s") == 1.5);
  CHECK(printed_derivative(e.out, 1, "rad/s^2") == 2.0);
  CHECK(std::isnan(printed_derivative(e.out, 2, "rad/s^3")));
  CHECK(line_starting(e.out, "D2 = ").find("given as unknown") != std::string::npos);
  for (int k = 3; k <= 5; ++k) {
    CHECK(std::isnan(printed_derivative(e.out, k, "rad/s^" + std::to_string(k + 1))));
    CHECK(line_starting(e.out, "D" + std::to_string(k) + " = ").find("not given") !=
          std::string::npos);
  }
  CHECK(e.out.find(" inf") == std::string::npos);

  // 0.5 deg at 100 Hz about x: an oscillation θ(t) = θ0 sin(2πft) has rate amplitude 2πf·θ0
  // (closed form), 2π·100·0.5·π/180 = 5.4831… rad/s; phases not given: unknown.
  const Result v = run_tool(describe_args("--vibration 100:0.5,0,0:deg"), "describe_deg");
  REQUIRE(v.exit_code == 0);
  const std::string rate = line_starting(v.out, "rate amplitude");
  const std::vector<double> a = triple_after(rate, "rate amplitude");
  CHECK(rate.find(") rad/s") != std::string::npos);
  CHECK(a[0] == Approx(2 * pi_value * 100 * 0.5 * pi_value / 180).epsilon(2e-6));
  CHECK(a[1] == 0.0);
  CHECK(a[2] == 0.0);
  const std::string angle = line_starting(v.out, "angle amplitude");
  CHECK(triple_after(angle, "angle amplitude")[0] == Approx(0.5 * pi_value / 180).epsilon(2e-6));
  CHECK(triple_after(angle, " rad = ")[0] == Approx(0.5).epsilon(2e-6));
  CHECK(line_starting(v.out, "phases") == "phases          unknown (bounds hold for every phase)");
  // No manoeuvre given: the description says so (D_k = 0 for the manoeuvre part).
  CHECK(v.out.find("manoeuvre: none described") != std::string::npos);

  // A rate amplitude in deg/s with known phases: 10 deg/s at 50 Hz about z is 10π/180 rad/s and
  // an angle amplitude of 10/(2π·50) deg (the same closed form read backwards).
  const Result w =
      run_tool(describe_args("--vibration 50:0,0,10:deg/s:0,90,-45"), "describe_deg_s");
  REQUIRE(w.exit_code == 0);
  CHECK(triple_after(line_starting(w.out, "rate amplitude"), "rate amplitude")[2] ==
        Approx(10 * pi_value / 180).epsilon(2e-6));
  CHECK(triple_after(line_starting(w.out, "angle amplitude"), " rad = ")[2] ==
        Approx(10 / (2 * pi_value * 50)).epsilon(2e-6));
  CHECK(line_starting(w.out, "phases") == "phases          (0, 90, -45) deg (known)");

  // A max rate in deg/s without a bandwidth: D0 = 30π/180 rad/s, the rest unknown.
  const Result m = run_tool(describe_args("--max-rate-deg 30"), "describe_max_rate_deg");
  REQUIRE(m.exit_code == 0);
  CHECK(printed_derivative(m.out, 0, "rad/s") == Approx(30 * pi_value / 180).epsilon(2e-6));
  CHECK(line_starting(m.out, "D0 = ").find("(30 deg/s)") != std::string::npos);
  CHECK(std::isnan(printed_derivative(m.out, 1, "rad/s^2")));
  CHECK(line_starting(m.out, "D1 = ").find("no --bandwidth") != std::string::npos);

  // Per-axis maxima (1, 2, 2) rad/s: D0 = |(1, 2, 2)| = 3 rad/s (closed form).
  const Result x = run_tool(describe_args("--axis-rates 1,2,2"), "describe_axis_rates");
  REQUIRE(x.exit_code == 0);
  CHECK(printed_derivative(x.out, 0, "rad/s") == Approx(3.0).epsilon(2e-6));

  // Coning is listed with its half-angle in deg and rad.
  const Result c = run_tool(describe_args("--coning 0.5,40"), "describe_coning");
  REQUIRE(c.exit_code == 0);
  const std::string cone = line_starting(c.out, "coning: half-angle 0.5 deg (");
  REQUIRE(!cone.empty());
  CHECK(number(cone.substr(std::string("coning: half-angle 0.5 deg (").size(), 12)) ==
        Approx(0.5 * pi_value / 180).epsilon(2e-6));
  CHECK(cone.find("at 40 Hz") != std::string::npos);
}

TEST_CASE("max rate and bandwidth give D_k = (2 pi B)^k D0, the assumption stated once",
          "[tools][reference]") {
  // Bernstein's inequality: a bounded function band-limited to B has sup|f'| <= 2πB sup|f|, hence
  // sup|f^(k)| <= (2πB)^k sup|f| (R. P. Boas, Entire Functions, Academic Press 1954; cited from
  // memory).
  const double d0 = 3.0;
  const double bandwidth = 5.0;
  const Result r = run_tool(describe_args("--max-rate 3 --bandwidth 5"), "bernstein");
  REQUIRE(r.exit_code == 0);
  double expected = d0;
  for (int k = 0; k <= 5; ++k) {
    const std::string unit = k == 0 ? "rad/s" : "rad/s^" + std::to_string(k + 1);
    INFO("D" << k);
    CHECK(printed_derivative(r.out, k, unit) == Approx(expected).epsilon(2e-6));
    if (k > 0) {
      CHECK(line_starting(r.out, "D" + std::to_string(k) + " = ").find("Bernstein") !=
            std::string::npos);
    }
    expected *= 2 * pi_value * bandwidth;
  }
  std::size_t stated = 0;
  for (std::size_t at = r.out.find("band-limited to 5 Hz"); at != std::string::npos;
       at = r.out.find("band-limited to 5 Hz", at + 1)) {
    ++stated;
  }
  CHECK(stated == 1u);
}

TEST_CASE("a bound the description cannot give says why: needs Dk, step too large", "[tools]") {
  // RK4 with D0..D2 only. The library's report (bounds/bound_report.hpp) says RK4's bound needs
  // D0..D5; the table must say the same instead of inf.
  using Description = halfspin::MotionDescription<double>;
  Description d{};
  d.maneuver = halfspin::RateEnvelope<double>::from_derivatives(1.0, 2.0, 3.0);
  const auto report =
      halfspin::horizon_error_report<halfspin::RungeKutta4Sampled, double>(d, 1e-3, 1.0);
  REQUIRE(report.status == halfspin::BoundStatus::needs_derivative);
  CHECK(report.needed_derivative == 5u);
  const Result r = run_tool(
      "--envelope 1,2,3 --methods runge_kutta_4_sampled --scalar double --step 1e-3 --duration 1",
      "needs_d5");
  REQUIRE(r.exit_code == 0);
  const std::string row = line_starting(r.out, "runge_kutta_4_sampled ");
  INFO(row);
  CHECK(row.find("needs D5") != std::string::npos);
  CHECK(row.find("inf") == std::string::npos);
  // Supplying D3..D5 gives a finite bound, the library's (printed to 4 digits).
  d.maneuver = halfspin::RateEnvelope<double>::from_derivatives(1.0, 2.0, 3.0, 4.0, 5.0, 6.0);
  const double bound =
      halfspin::horizon_error_bound<halfspin::RungeKutta4Sampled, double>(d, 1e-3, 1.0);
  REQUIRE(std::isfinite(bound));
  const Result full = run_tool(
      "--envelope 1,2,3,4,5,6 --methods runge_kutta_4_sampled --scalar double --step 1e-3 "
      "--duration 1",
      "needs_none");
  REQUIRE(full.exit_code == 0);
  const std::vector<std::string> words =
      table_rows(full.out, "runge_kutta_4_sampled", "double").at(0);
  CHECK(number(words[5]) == Approx(bound).epsilon(1e-3));
  // D0·dt = 10 rad/s × 0.5 s = 5 rad > 1 rad: outside every bound's range whatever the other
  // derivatives (bound_report.hpp).
  const Result big = run_tool(
      "--envelope 10 --methods magnus_4 --scalar double --step 0.5 --duration 5", "too_large");
  REQUIRE(big.exit_code == 0);
  CHECK(line_starting(big.out, "magnus_4 ").find("step too large") != std::string::npos);
}

namespace {

// The longest time between fixes printed for `method`: {interval (s), steps}; REQUIREs the line.
std::pair<double, long long> printed_fix_interval(const std::string& out, const std::string& method,
                                                  std::size_t from) {
  const std::string marker = "longest time between fixes ";
  for (std::size_t at = out.find(method + " ", from); at != std::string::npos;
       at = out.find(method + " ", at + 1)) {
    const std::size_t end = out.find('\n', at);
    const std::string line = out.substr(at, end - at);
    const std::size_t m = line.find(marker);
    if (m == std::string::npos) {
      continue;
    }
    double interval = 0;
    long long steps = 0;
    REQUIRE(std::sscanf(line.c_str() + m + marker.size(), "%lf s (%lld steps", &interval, &steps) ==
            2);
    return {interval, steps};
  }
  FAIL("no fix-interval line for " << method);
  return {0, 0};
}

// The worked example of the tool's README: 2 kHz gyro, manoeuvres up to 3 rad/s with a 5 Hz
// bandwidth, a 120 Hz vibration of 0.01 rad about z, budget 0.05 deg over 10 s between fixes.
halfspin::MotionDescription<double> worked_example() {
  halfspin::MotionDescription<double> d{};
  d.maneuver = halfspin::RateEnvelope<double>::from_bandwidth(3.0, 5.0);
  d.vibration.add(halfspin::VibrationLine<double>::from_angle_amplitude(120.0, {0.0, 0.0, 0.01}));
  return d;
}

template <class Stepper, class T, class Accumulation>
void check_fix_interval(const std::string& out, std::size_t from, double budget_rad) {
  const auto d = worked_example().template converted<T>();
  // The step the 2 kHz gyro gives the stepper (recommendation.hpp: periods / sample rate, in T).
  const T dt = static_cast<T>(halfspin::periods_per_step(Stepper::layout, Stepper::window)) /
               static_cast<T>(2000.0);
  const halfspin::FixInterval<T> f =
      halfspin::longest_fix_interval<Stepper, T, Accumulation>(d, dt, static_cast<T>(budget_rad));
  INFO(Stepper::name << " in " << (sizeof(T) == 4 ? "float" : "double"));
  REQUIRE(f.status == halfspin::FixIntervalStatus::ok);
  const auto printed = printed_fix_interval(out, Stepper::name, from);
  CHECK(printed.second == f.steps);
  CHECK(printed.first == Approx(static_cast<double>(f.interval_s)).epsilon(1e-6));
}

}  // namespace

TEST_CASE("the fix-interval lines (--fixes) agree with the library's longest_fix_interval",
          "[tools]") {
  const double budget = 0.05 * pi_value / 180;  // 0.05 deg
  char budget_text[64];
  std::snprintf(budget_text, sizeof budget_text, "%.17g", budget);
  const Result r = run_tool(std::string("--max-rate 3 --bandwidth 5 --vibration 120:0,0,0.01:rad "
                                        "--budget ") +
                                budget_text +
                                " --horizon 10 --duration 10 --gyro-rate 2000 --fixes --methods "
                                "magnus_4,coning_2_sample,coning_3_sample --step-min 5e-4 "
                                "--step-max 2e-3 --steps 3",
                            "fixes");
  INFO(r.out << r.err);
  REQUIRE(r.exit_code == 0);
  // The envelopes add (triangle inequality): D0 = 3 + 2π·120·0.01 rad/s (closed form).
  CHECK(r.out.find("band-limited to 5 Hz") != std::string::npos);
  const std::size_t whole = r.out.find("whole motion, sum of the parts");
  REQUIRE(whole != std::string::npos);
  double whole_d0 = 0;
  REQUIRE(std::sscanf(r.out.c_str() + r.out.find('\n', whole), " D0 %lf", &whole_d0) == 1);
  CHECK(whole_d0 == Approx(3.0 + 2 * pi_value * 120 * 0.01).epsilon(1e-3));
  // One section per scalar: float first (compensated accumulation), then double (plain).
  const std::size_t in_float = r.out.find("Recommendation in float, compensated");
  const std::size_t in_double = r.out.find("Recommendation in double, plain");
  REQUIRE(in_float != std::string::npos);
  REQUIRE(in_double != std::string::npos);
  REQUIRE(in_float < in_double);
  CHECK(r.out.find("longest time between external attitude fixes", in_float) < in_double);
  check_fix_interval<halfspin::Magnus4, float, halfspin::CompensatedAccumulation>(r.out, in_float,
                                                                                  budget);
  check_fix_interval<halfspin::Coning2Sample, float, halfspin::CompensatedAccumulation>(
      r.out, in_float, budget);
  check_fix_interval<halfspin::Coning3Sample, float, halfspin::CompensatedAccumulation>(
      r.out, in_float, budget);
  check_fix_interval<halfspin::Magnus4, double, halfspin::PlainAccumulation>(r.out, in_double,
                                                                             budget);
  check_fix_interval<halfspin::Coning2Sample, double, halfspin::PlainAccumulation>(r.out, in_double,
                                                                                   budget);
}

TEST_CASE("a vibration line with unknown phases bounds at least as much as with any known phases",
          "[tools]") {
  // With unknown phases the library bounds the worst case over every phase
  // (bounds/motion_description.hpp: each pair of axes in quadrature); a known phase is one case.
  const std::string sweep =
      " --max-rate 1 --bandwidth 2 --methods exponential_map_midpoint_mean,magnus_4,"
      "coning_2_sample,coning_3_sample,runge_kutta_4_sampled --scalar double --step-min 2.5e-4 "
      "--step-max 2e-3 --steps 4 --duration 10 --csv ";
  const std::string unknown_csv = path("phases_unknown.csv");
  REQUIRE(run_tool("--vibration 120:0.01,0.008,0.004:rad" + sweep + "'" + unknown_csv + "'",
                   "phases_unknown")
              .exit_code == 0);
  const std::vector<CsvRow> unknown = read_csv(unknown_csv, false);
  REQUIRE(unknown.size() == 5u * 4u);
  int strictly_smaller = 0;
  int n = 0;
  for (const char* phases : {"0,0,0", "0,90,0", "0,90,180", "30,200,75", "-90,0,90"}) {
    const std::string csv = path("phases_" + std::to_string(n) + ".csv");
    REQUIRE(run_tool(std::string("--vibration 120:0.01,0.008,0.004:rad:") + phases + sweep + "'" +
                         csv + "'",
                     "phases_" + std::to_string(n++))
                .exit_code == 0);
    const std::vector<CsvRow> known = read_csv(csv, false);
    REQUIRE(known.size() == unknown.size());
    for (std::size_t i = 0; i < known.size(); ++i) {
      INFO(known[i].method << " step " << known[i].step_s << " phases " << phases << ": known "
                           << known[i].bound_rad << ", unknown " << unknown[i].bound_rad);
      REQUIRE(known[i].method == unknown[i].method);
      REQUIRE(known[i].step_s == unknown[i].step_s);
      CHECK(known[i].bound_rad <= unknown[i].bound_rad);
      strictly_smaller += known[i].bound_rad < unknown[i].bound_rad ? 1 : 0;
    }
  }
  // The phases matter somewhere (otherwise the comparison would check nothing).
  CHECK(strictly_smaller > 0);
}

namespace {

// The number after `key` on the first line of `text` that contains `line_key` (NaN if none).
double number_after(const std::string& text, const std::string& line_key, const std::string& key) {
  for (const std::string& line : lines_of(text)) {
    if (line.find(line_key) == std::string::npos) {
      continue;
    }
    const std::size_t at = line.find(key);
    if (at == std::string::npos) {
      continue;
    }
    return std::strtod(line.c_str() + at + key.size(), nullptr);
  }
  return std::nan("");
}

// The word after `key` on the first line of `text` that contains `line_key`.
std::string word_after(const std::string& text, const std::string& line_key,
                       const std::string& key) {
  for (const std::string& line : lines_of(text)) {
    const std::size_t at = line.find(key);
    if (line.find(line_key) == std::string::npos || at == std::string::npos) {
      continue;
    }
    std::istringstream in(line.substr(at + key.size()));
    std::string w;
    in >> w;
    while (!w.empty() && (w.back() == ',' || w.back() == ';')) {
      w.pop_back();
    }
    return w;
  }
  return "";
}

}  // namespace

TEST_CASE("nothing meets the budget: the limiting term, and alternatives that do meet it",
          "[tools]") {
  // The engineer's question (invented numbers): 2 kHz gyro, manoeuvres to 3 rad/s at 4 Hz, a
  // 120 Hz 0.01 rad line on one axis, 0.05 deg over 20 minutes.
  const std::string vehicle =
      "--max-rate 3 --bandwidth 4 --vibration 120:0,0,0.01:rad --budget 8.7266e-4 ";
  const Result r =
      run_tool(vehicle + "--horizon 1200 --gyro-rate 2000 --methods coning_2_sample", "advice");
  REQUIRE(r.exit_code == 0);
  INFO(r.out);
  // The table covers the horizon the budget is for.
  CHECK(r.out.find("Bounds over 1200 s:") != std::string::npos);
  CHECK(r.out.find("the table's bounds cover 1200 s (--horizon)") != std::string::npos);
  CHECK(r.out.find("first-order renormalization") != std::string::npos);
  const std::size_t why = r.out.find("why nothing meets it:");
  REQUIRE(why != std::string::npos);
  // Float: both terms exceed the budget alone (rounding over 1.3e4 rad of rotation).
  CHECK(r.out.find("both truncation and float's rounding alone exceed the budget") !=
        std::string::npos);
  // Double: truncation limits.
  CHECK(r.out.find("the limit is truncation") != std::string::npos);
  // The parts add up to the least bound (three printed digits).
  const double total = number_after(r.out, "the least bound at 2000 Hz", "is ");
  const double truncation = number_after(r.out, "truncation ", "truncation ");
  const double startup = number_after(r.out, "start-up ", "start-up ");
  const double rounding = number_after(r.out, "float rounding", "accumulation) ");
  CHECK(truncation + startup + rounding == Approx(total).epsilon(2e-3));
  // Double from the advised gyro rate: the tool, re-run there, recommends a method.
  const double gyro = number_after(r.out, "    double: yes", "from a ");
  REQUIRE(std::isfinite(gyro));
  CHECK(gyro > 2000);
  const Result again = run_tool(vehicle + "--horizon 1200 --scalar double --gyro-rate " +
                                    std::to_string(gyro) + " --methods coning_2_sample",
                                "advice_gyro");
  CHECK(again.out.find("  recommended: ") != std::string::npos);
  // Fixes: the advised interval, asked as the horizon at 2 kHz in float, is met by that method.
  const double fixes =
      number_after(r.out, "external attitude fixes at 2000 Hz gyro, float", "at most ");
  const std::string method =
      word_after(r.out, "external attitude fixes at 2000 Hz gyro, float", "apart (");
  REQUIRE(std::isfinite(fixes));
  REQUIRE(!method.empty());
  const Result fixed = run_tool(vehicle + "--horizon " + std::to_string(fixes * 0.999) +
                                    " --scalar float --gyro-rate 2000 --methods " + method,
                                "advice_fixes");
  CHECK(fixed.out.find("  recommended: ") != std::string::npos);
}

TEST_CASE("the gyro's own error beside the integration error, and the fraction criterion",
          "[tools]") {
  // A gyro with datasheet figures of our own invention: angle random walk 0.25 deg/sqrt(h),
  // bias instability 3.5 deg/h, rate random walk 9 deg/h/sqrt(h), residual bias 2 deg/h after
  // calibration; a vehicle to 2 rad/s at 3 Hz; 10 minutes between fixes.
  const std::string gyro =
      "--angle-random-walk-deg 0.25 --bias-instability-deg 3.5 --rate-random-walk-deg 9 "
      "--residual-bias-deg -2 ";
  const std::string vehicle =
      "--max-rate 2 --bandwidth 3 --gyro-rate 1000 --horizon 600 "
      "--methods coning_2_sample,runge_kutta_4_sampled ";
  const std::string csv = path("sensor.csv");
  const Result r = run_tool(gyro + vehicle + "--csv '" + csv + "'", "sensor");
  REQUIRE(r.exit_code == 0);
  INFO(r.out);
  // The terms, converted from datasheet units (common practice, no source: 1 deg = pi/180 rad,
  // 1 h = 3600 s, sqrt(h) = 60 sqrt(s)), and the error each causes over 600 s (IEEE Std 952-1997
  // Annex C's terms; the formulas in include/halfspin/bounds/sensor_error.hpp, derived and
  // checked there): N sqrt(t), K t^1.5/sqrt(3), B t, |b| t, root-sum-square.
  const double deg = std::acos(-1.0) / 180;
  const double t = 600;
  const double n = 0.25 * deg / 60, b_i = 3.5 * deg / 3600, k = 9 * deg / 3600 / 60,
               b = 2 * deg / 3600;
  const double arw = n * std::sqrt(t), rrw = k * std::pow(t, 1.5) / std::sqrt(3.0), bi = b_i * t,
               bias = b * t;
  CHECK(number_after(r.out, "angle random walk N", "N ") == Approx(n).epsilon(1e-3));
  CHECK(number_after(r.out, "angle random walk N", "N*sqrt(t)") == Approx(arw).epsilon(1e-3));
  CHECK(number_after(r.out, "rate random walk K", "K*t^1.5/sqrt(3)") == Approx(rrw).epsilon(1e-3));
  CHECK(number_after(r.out, "bias instability B", "B*t") == Approx(bi).epsilon(1e-3));
  CHECK(number_after(r.out, "residual bias b", "|b|*t") == Approx(bias).epsilon(1e-3));
  const double combined = std::sqrt(arw * arw + rrw * rrw + bi * bi + bias * bias);
  CHECK(number_after(r.out, "combined (root-sum-square)", "square)") ==
        Approx(combined).epsilon(1e-3));
  // The criterion: 10 % of it is the budget, and the recommendation meets it.
  const double criterion = number_after(r.out, "criterion: the integration error", "): ");
  CHECK(criterion == Approx(0.1 * combined).epsilon(1e-3));
  CHECK(r.out.find("the study's budget: the criterion's") != std::string::npos);
  CHECK(r.out.find("over 600 s (10 % of the sensor-driven error)") != std::string::npos);
  const double recommended = number_after(r.out, "  recommended: ", "bound ");
  REQUIRE(std::isfinite(recommended));
  CHECK(recommended <= criterion * (1 + 1e-3));
  // Side by side: each bound over 600 s as a fraction of the sensor error over the same 600 s,
  // in the table and (the sensor figure) in the CSV.
  CHECK(r.out.find("bound/sensor") != std::string::npos);
  const std::vector<std::string> lines = lines_of(read_file(csv));
  REQUIRE(lines.size() > 1);
  CHECK(lines[0] == std::string(csv_header) + ",sensor_error_rad");
  for (std::size_t i = 1; i < lines.size(); ++i) {
    const std::vector<std::string> f = split(lines[i], ',');
    REQUIRE(f.size() == 7u);
    CHECK(std::stod(f[6]) == Approx(combined).epsilon(1e-12));
  }
  // The criterion acts exactly as an absolute budget of the same size: the same choice.
  const Result same = run_tool(vehicle + "--budget " + std::to_string(criterion), "sensor_same");
  REQUIRE(same.exit_code == 0);
  CHECK(word_after(same.out, "  recommended: ", "recommended: ") ==
        word_after(r.out, "  recommended: ", "recommended: "));
  // With --budget too, the stricter one is used and the output says which.
  const Result tight = run_tool(gyro + vehicle + "--budget 1e-4", "sensor_tight");
  REQUIRE(tight.exit_code == 0);
  CHECK(tight.out.find("(--budget, stricter than 10 % of the sensor-driven error)") !=
        std::string::npos);
  CHECK(number_after(tight.out, "Recommendation in double", "budget ") == Approx(1e-4));
  const Result loose = run_tool(gyro + vehicle + "--budget 1", "sensor_loose");
  REQUIRE(loose.exit_code == 0);
  CHECK(loose.out.find("(10 % of the sensor-driven error, stricter than --budget)") !=
        std::string::npos);
  CHECK(number_after(loose.out, "Recommendation in double", "budget ") ==
        Approx(criterion).epsilon(1e-3));
  // Another fraction scales the criterion.
  const Result half = run_tool(gyro + vehicle + "--sensor-fraction 0.5", "sensor_half");
  REQUIRE(half.exit_code == 0);
  CHECK(number_after(half.out, "criterion: the integration error", "): ") ==
        Approx(5 * criterion).epsilon(1e-3));
}

TEST_CASE("noise-term options: bad values and missing companions exit 1 with a message",
          "[tools]") {
  const std::string base = "--max-rate 2 --bandwidth 3 ";
  const std::vector<std::pair<std::string, std::string>> cases{
      {"--angle-random-walk 1e-4", "need --horizon"},
      {"--angle-random-walk -1e-4 --horizon 60", "non-negative"},
      {"--rate-random-walk-deg nan --horizon 60", "finite"},
      {"--angle-random-walk 1e-4 --horizon 60 --sensor-fraction 2", "at most 1"},
      {"--angle-random-walk 0 --horizon 60", "all zero"},
  };
  for (const auto& c : cases) {
    const Result r = run_tool(base + c.first, "sensor_bad");
    INFO(c.first << "\n" << r.err);
    CHECK(r.exit_code == 1);
    CHECK(r.err.find(c.second) != std::string::npos);
  }
  // A negative residual bias is a bias like any other; zero terms with --budget run.
  CHECK(run_tool(base + "--residual-bias -1e-5 --horizon 60", "sensor_signed").exit_code == 0);
  CHECK(run_tool(base + "--angle-random-walk 0 --horizon 60 --budget 1e-3", "sensor_zero")
            .exit_code == 0);
}

template <class Stepper, class T, class Accumulation>
void check_sensor_fix_interval(const std::string& out, std::size_t from, double horizon_s,
                               const halfspin::GyroNoiseTerms<double>& gyro) {
  const auto d = worked_example().template converted<T>();
  const T dt = static_cast<T>(halfspin::periods_per_step(Stepper::layout, Stepper::window)) /
               static_cast<T>(2000.0);
  const auto criterion = [&](long long k) {
    return 0.1 *
           halfspin::sensor_attitude_error(gyro, static_cast<double>(k) * static_cast<double>(dt))
               .combined_rad;
  };
  const auto bound = [&](long long k) {
    return static_cast<double>(
        halfspin::error_bound_after_steps<Stepper, T, Accumulation>(d, dt, k));
  };
  INFO(Stepper::name << " in " << (sizeof(T) == 4 ? "float" : "double"));
  const auto printed = printed_fix_interval(out, Stepper::name, from);
  const long long k = printed.second;
  const auto last = static_cast<long long>(std::floor(horizon_s / static_cast<double>(dt)));
  REQUIRE(k >= 1);
  REQUIRE(k <= last);
  // It meets the criterion over itself, and no longer interval up to the horizon does: the
  // search is checked by scanning every longer count (k + 1 .. the horizon's count).
  CHECK(bound(k) <= criterion(k));
  long long longer_meeting = 0;
  for (long long j = k + 1; j <= last; ++j) {
    if (bound(j) <= criterion(j)) {
      longer_meeting = j;
      break;
    }
  }
  CHECK(longer_meeting == 0);
}

TEST_CASE("fix intervals under the sensor criterion meet it over themselves, and are the longest",
          "[tools]") {
  // The worked example's vehicle (README), a 2 kHz gyro with invented datasheet figures, and
  // --horizon 60 s between fixes. With the criterion the budget shrinks with the interval (the
  // sensor error grows as sqrt(t) .. t^1.5), so the longest interval is no longer
  // longest_fix_interval at the horizon's budget: each printed interval is checked against the
  // library's bound (error_bound_after_steps) and the criterion (sensor_error.hpp) at every count.
  const halfspin::GyroNoiseTerms<double> gyro{
      halfspin::angle_random_walk_from_degrees_per_root_hour(0.25), 0,
      halfspin::rate_random_walk_from_degrees_per_hour_root_hour(9.0), 0};
  const Result r = run_tool(
      "--max-rate 3 --bandwidth 5 --vibration 120:0,0,0.01:rad --horizon 60 --gyro-rate 2000 "
      "--angle-random-walk-deg 0.25 --rate-random-walk-deg 9 --fixes "
      "--methods coning_2_sample,magnus_4",
      "sensor_fixes");
  INFO(r.out << r.err);
  REQUIRE(r.exit_code == 0);
  CHECK(r.out.find("with the sensor criterion over each interval itself") != std::string::npos);
  const std::size_t in_float = r.out.find("Recommendation in float, compensated");
  const std::size_t in_double = r.out.find("Recommendation in double, plain");
  REQUIRE(in_float != std::string::npos);
  REQUIRE(in_double != std::string::npos);
  check_sensor_fix_interval<halfspin::Coning2Sample, float, halfspin::CompensatedAccumulation>(
      r.out, in_float, 60, gyro);
  // Magnus 4's first step alone is over the criterion for one step (2 kHz: dt = 1 ms).
  const auto d = worked_example().converted<float>();
  const auto one_step = static_cast<double>(
      halfspin::error_bound_after_steps<halfspin::Magnus4, float,
                                        halfspin::CompensatedAccumulation>(d, 1e-3F, 1));
  CHECK(one_step > 0.1 * halfspin::sensor_attitude_error(gyro, 1e-3).combined_rad);
  CHECK(r.out.find("magnus_4                           step 1.0000e-03 s: no time between fixes",
                   in_float) < in_double);
  check_sensor_fix_interval<halfspin::Coning2Sample, double, halfspin::PlainAccumulation>(
      r.out, in_double, 60, gyro);
}

// --baseline: the first-order firmware update q ← q + ½·dt·q ⊗ (0, ω), then q/‖q‖, with the
// latest rate sample (common practice, no source), as a reference series beside the methods.
struct ReferenceCsvRow {
  std::string method;
  std::string scalar;
  double step_s = 0;
  double max_error_rad = 0;
  std::string bound;
  std::string series;
};

std::vector<ReferenceCsvRow> read_reference_csv(const std::string& file) {
  const std::vector<std::string> lines = lines_of(read_file(file));
  REQUIRE(!lines.empty());
  // The one documented change of the header: the column series after ns_per_step.
  REQUIRE(lines[0] == std::string(csv_header) + ",series");
  std::vector<ReferenceCsvRow> rows;
  for (std::size_t i = 1; i < lines.size(); ++i) {
    const std::vector<std::string> f = split(lines[i], ',');
    INFO("CSV line " << i << ": " << lines[i]);
    REQUIRE(f.size() == 7u);
    ReferenceCsvRow r;
    r.method = f[0];
    r.scalar = f[1];
    r.step_s = number(f[2]);
    r.max_error_rad = number(f[3]);
    r.bound = f[4];
    r.series = f[6];
    CHECK(number(f[5]) > 0);
    rows.push_back(r);
  }
  return rows;
}

TEST_CASE(
    "baseline: the first-order firmware update is a marked reference series without a bound, and "
    "its error halves with the step on a motion with exact truth",
    "[tools][reference][order]") {
  const std::string csv = path("baseline_oscillation.csv");
  const std::string svg = path("baseline_oscillation.svg");
  std::remove(csv.c_str());
  std::remove(svg.c_str());
  const Result r = run_tool(
      "--motion oscillation --methods exponential_map_hold_end --baseline --scalar float,double "
      "--step-min 1e-3 --step-max 8e-3 --steps 4 --duration 2 --csv '" +
          csv + "' --svg '" + svg + "'",
      "baseline_oscillation");
  INFO(r.err);
  REQUIRE(r.exit_code == 0);
  std::map<std::string, std::vector<ReferenceCsvRow>> reference;  // by scalar, steps ascending
  int method_rows = 0;
  for (const ReferenceCsvRow& row : read_reference_csv(csv)) {
    INFO(row.method << " " << row.scalar << " step " << row.step_s);
    if (row.method == "first_order_normalized") {
      CHECK(row.series == "reference");
      CHECK(row.bound.empty());  // no a-priori bound exists for it
      reference[row.scalar].push_back(row);
    } else {
      CHECK(row.method == "exponential_map_hold_end");
      CHECK(row.series == "method");
      CHECK(number(row.bound) >= row.max_error_rad);
      ++method_rows;
    }
  }
  CHECK(method_rows == 8);
  for (const char* scalar : {"float", "double"}) {
    const std::vector<ReferenceCsvRow>& rows = reference[scalar];
    REQUIRE(rows.size() == 4u);
    // First order: the held latest sample misses the rate's change over each step, ½·dt·ω̇ per
    // step, which on the single-axis oscillation adds up along the axis to ½·dt·Δω (common
    // practice, no source). The steps double (1, 2, 4, 8 ms), so the error must double: measured
    // ratios 2.00 (g++ 12), checked within 1.8..2.2. The truncation (above 10⁻³ rad here) is far
    // above float rounding (N·ε ≈ 2.4·10⁻⁴ at 2000 steps at the very worst).
    for (std::size_t i = 1; i < rows.size(); ++i) {
      INFO(scalar << " steps " << rows[i - 1].step_s << " and " << rows[i].step_s << ": errors "
                  << rows[i - 1].max_error_rad << " and " << rows[i].max_error_rad);
      CHECK(rows[i].step_s == Approx(2.0 * rows[i - 1].step_s).epsilon(1e-12));
      const double ratio = rows[i].max_error_rad / rows[i - 1].max_error_rad;
      CHECK(ratio >= 1.8);
      CHECK(ratio <= 2.2);
    }
    // The table prints the rows, 'none' in the bound column.
    const std::vector<std::vector<std::string>> table =
        table_rows(r.out, "first_order_normalized", scalar);
    REQUIRE(table.size() == 4u);
    for (const auto& words : table) {
      CHECK(words[5] == "none");
    }
  }
  CHECK(r.out.find("a reference, not a halfspin method") != std::string::npos);
  // The chart: well formed (xmllint, Debian libxml2-utils), the series in its own ink and its own
  // legend words on both charts.
  CHECK(run_program(HALFSPIN_XMLLINT_EXE, "--noout '" + svg + "'", "baseline_xmllint").exit_code ==
        0);
  const std::string text = read_file(svg);
  const std::size_t legend = text.find("class=\"legend\"");
  REQUIRE(legend != std::string::npos);
  CHECK(text.find("reference: first-order firmware update", legend) != std::string::npos);
  CHECK(text.find("brown: a reference, not a halfspin method") < legend);
  const std::size_t chart2 = text.find("id=\"chart-2\"");
  REQUIRE(chart2 != std::string::npos);
  CHECK(text.find(">first-order firmware update (reference)<") < chart2);
  CHECK(text.find(">first-order firmware update (reference)<", chart2) < legend);
  CHECK(text.find("stroke=\"#6b3a10\"", chart2) != std::string::npos);
  // The same-cost line: one, in float; the baseline's error in it is the reference row's at one
  // gyro period (1 ms at the default 1000 Hz): the same run.
  const std::string head = "Same-cost factor (float, 1000 Hz gyro, 2 s of oscillation";
  const std::size_t at = r.out.find(head);
  REQUIRE(at != std::string::npos);
  CHECK(r.out.find(head, at + 1) == std::string::npos);
  const std::string line = r.out.substr(at, r.out.find('\n', at) - at);
  INFO(line);
  const std::size_t named = line.find("first_order_normalized ");
  REQUIRE(named != std::string::npos);
  const double baseline_error =
      number(line.substr(named + 23, line.find(' ', named + 23) - named - 23));
  CHECK(baseline_error == Approx(reference["float"][0].max_error_rad).epsilon(2e-3));
  CHECK((line.find("; factor ") != std::string::npos ||
         line.find("no halfspin method of") != std::string::npos));
}

TEST_CASE("baseline: closed form at constant rate, and only with a truth motion",
          "[tools][reference]") {
  const std::string csv = path("baseline_constant.csv");
  const double duration = 2.0;
  const Result r = run_tool(
      "--motion constant --methods exponential_map_hold_end --baseline --scalar double "
      "--step-min 2e-3 --step-max 1e-1 --steps 8 --duration 2 --csv '" +
          csv + "'",
      "baseline_constant");
  REQUIRE(r.exit_code == 0);
  // At constant rate the held sample is exact, and the step q ⊗ (1, ½θ·n)/√(1 + θ²/4), θ = |ω|dt,
  // turns by 2·atan(θ/2) about the fixed axis n instead of θ; the errors add along that axis:
  // N·(θ − 2·atan(θ/2)), second order (derived here from the update; common practice, no source).
  const double w = std::sqrt(0.81 + 0.36 + 1.69);  // the tool's constant ω = (0.9, −0.6, 1.3) rad/s
  int checked = 0;
  for (const ReferenceCsvRow& row : read_reference_csv(csv)) {
    if (row.series != "reference") {
      continue;
    }
    const double steps = std::round(duration / row.step_s);
    const double theta = w * row.step_s;
    const double expected = steps * (theta - 2.0 * std::atan(0.5 * theta));
    INFO("step " << row.step_s << ": error " << row.max_error_rad << ", closed form " << expected);
    if (expected > 1e3 * eps_double * steps) {
      CHECK(row.max_error_rad == Approx(expected).epsilon(0.01));
      ++checked;
    }
  }
  CHECK(checked == 8);
  // A description has no truth to run it on, nor has a gyro log.
  const Result d = run_tool("--envelope 0.6,1,5 --baseline", "baseline_description");
  CHECK(d.exit_code == 1);
  CHECK(d.err.find("--baseline") != std::string::npos);
  const Result l = run_tool("--log '" + path("no_such_log.csv") + "' --baseline", "baseline_log");
  CHECK(l.exit_code == 1);
  CHECK(l.err.find("--baseline") != std::string::npos);
}
