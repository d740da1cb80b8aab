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
  for (const char* args :
       {"--no-such-option", "--motion nowhere", "--methods rk9", "--step-min -1", "--steps 0",
        "--budget 1e-3", "--scalar half", "--motion coning --coning 1,5", "--envelope 1,2",
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
  CHECK(text.find("budget 1.000e-03 rad", budget) != std::string::npos);
  CHECK(text.find("stroke-dasharray=\"7 4\"") != std::string::npos);  // the dashed bounds
}

TEST_CASE("SVG series colours: distinct, visible on white; the fonts end in a generic family",
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
