#pragma once
// A small hand-written SVG writer for log–log charts (halfspin-stepstudy's and
// halfspin-gyro-noise's figures). No library: the document is plain SVG 1.1 text, UTF-8, one <svg>
// with the charts stacked vertically and one legend column on the right shared by all charts.
//
//   Figure { title, subtitle, charts, legend (one colour per entry), keys (line/marker styles) }
//   Chart  { title, axis labels with units, series, optional horizontal reference line }
//   Series { colour index, line style (solid / dashed / dotted / none), marker, points (x, y) }
//            (colour index reference_series_colour: a reference series' own ink)
//   ErrorBar { x, low, high, colour } (Chart::bars: vertical bars, e.g. confidence intervals)
//   ChartLabel { text at data coordinates, in a series colour } (Chart::labels)
//
// Both axes are logarithmic: points with a non-positive or non-finite coordinate cannot be drawn
// and are left out (render() counts them in the chart's note). Axis ranges are whole decades
// around the data (and the reference line); every decade gets a tick, a grid line and a label
// 10ⁿ (every second or third decade labelled when there are many), with minor ticks at 2..9 when
// the range is short enough to read them.
//
// Tool code (not part of the installed library).

#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <cstdio>
#include <limits>
#include <sstream>
#include <string>
#include <utility>
#include <vector>

namespace halfspin::tools::svg {

enum class LineStyle { solid, dashed, dotted, none };
enum class Marker { none, filled_circle, open_square };

struct Series {
  std::size_t colour = 0;
  LineStyle line = LineStyle::solid;
  Marker marker = Marker::none;
  std::vector<std::pair<double, double>> points;  // (x, y), drawn in this order
};

// A vertical bar from low to high at x (a confidence interval), in a series colour.
struct ErrorBar {
  double x = 0;
  double low = 0;
  double high = 0;
  std::size_t colour = 0;
};

// A text placed at data coordinates (x, y) inside a chart, in a series colour.
struct ChartLabel {
  double x = 0;
  double y = 0;
  std::string text;
  std::size_t colour = 0;
  bool below = false;  // under the point (else above it)
};

struct Chart {
  std::string title;
  std::string x_label;  // with units
  std::string y_label;  // with units
  std::vector<Series> series;
  bool has_reference = false;  // a horizontal line at y = reference_y
  double reference_y = 0;
  std::string reference_label;
  std::vector<ErrorBar> bars;  // drawn under the series
  std::vector<ChartLabel> labels;
};

struct LegendEntry {
  std::string label;
  std::size_t colour = 0;
};

struct StyleKey {  // how a line style / marker reads, drawn in neutral grey
  LineStyle line = LineStyle::solid;
  Marker marker = Marker::none;
  std::string label;
};

struct Figure {
  std::string title;
  std::string subtitle;
  std::vector<Chart> charts;
  std::vector<LegendEntry> legend;
  std::vector<StyleKey> keys;
  std::string reference_key;  // legend text for the charts' reference line ("" for none)
};

// Series colours: Paul Tol's "muted" qualitative scheme (P. Tol, "Colour Schemes", SRON technical
// note SRON/EPS/TN/09-002; hex values from memory), chosen because its nine colours stay apart
// under the common colour-vision deficiencies. The order is ours: the darker colours first, warm
// and cool alternating, so that the eight methods of a default study get the seven colours with a
// contrast near or above 3:1 on the white plot area (WCAG 2.1 relative luminance: indigo 12.2,
// rose 3.7, green 5.7, purple 5.3, olive 3.0, wine 8.7, teal 2.8) and one lighter (cyan 1.8).
// Sand (1.6) comes last; the scheme's pale grey (for missing data) is not used. Beyond nine
// series, hues spread by the golden angle, darker, and no longer chosen for colour-blind viewers.
// Colour is never the only cue between a measurement and a bound: line style and marker also
// differ (see the legend's keys).
inline constexpr std::array<const char*, 9> series_palette{
    "#332288",  // indigo
    "#cc6677",  // rose
    "#117733",  // green
    "#aa4499",  // purple
    "#999933",  // olive
    "#882255",  // wine
    "#44aa99",  // teal
    "#88ccee",  // cyan
    "#ddcc77",  // sand
};

// The budget (reference) line: neutral ink, apart from every series colour, with its own
// dash-dot pattern and an in-chart label.
inline constexpr const char* reference_ink = "#1f2a33";

// A series that is a reference, not one of the compared methods (halfspin-stepstudy's first-order
// firmware update): a dark brown of its own, outside the palette and apart from the budget line's
// ink (contrast on white about 10:1, WCAG 2.1 relative luminance), selected by this colour index.
inline constexpr std::size_t reference_series_colour = static_cast<std::size_t>(-1);
inline constexpr const char* reference_series_ink = "#6b3a10";

inline std::string colour(std::size_t index) {
  constexpr std::size_t count = series_palette.size();
  if (index == reference_series_colour) {
    return reference_series_ink;
  }
  if (index < count) {
    return series_palette[index];
  }
  const double hue = std::fmod(static_cast<double>(index - count) * 137.50776 + 20.0, 360.0);
  std::array<char, 40> buffer{};
  std::snprintf(buffer.data(), buffer.size(), "hsl(%.0f,62%%,38%%)", hue);
  return buffer.data();
}

inline std::string escape(const std::string& text) {
  std::string out;
  out.reserve(text.size());
  for (char c : text) {
    switch (c) {
      case '&':
        out += "&amp;";
        break;
      case '<':
        out += "&lt;";
        break;
      case '>':
        out += "&gt;";
        break;
      case '"':
        out += "&quot;";
        break;
      case '\'':
        out += "&apos;";
        break;
      default:
        out += c;
    }
  }
  return out;
}

namespace detail {

inline std::string num(double v) {
  std::array<char, 32> buffer{};
  std::snprintf(buffer.data(), buffer.size(), "%.2f", v);
  return buffer.data();
}

inline bool drawable(double x, double y) {
  return std::isfinite(x) && std::isfinite(y) && x > 0 && y > 0;
}

struct Range {
  int lo = 0;  // decade exponents: the axis spans [10^lo, 10^hi]
  int hi = 1;
};

inline Range decades(double min_value, double max_value) {
  Range r;
  if (!(min_value > 0) || !std::isfinite(min_value) || !std::isfinite(max_value)) {
    return r;
  }
  r.lo = static_cast<int>(std::floor(std::log10(min_value) + 1e-9));
  r.hi = static_cast<int>(std::ceil(std::log10(max_value) - 1e-9));
  if (r.hi <= r.lo) {
    r.hi = r.lo + 1;
  }
  return r;
}

inline std::string dash(LineStyle line) {
  switch (line) {
    case LineStyle::dashed:
      return " stroke-dasharray=\"7 4\"";
    case LineStyle::dotted:
      return " stroke-dasharray=\"1.5 3\" stroke-linecap=\"round\"";
    default:
      return "";
  }
}

inline void marker(std::ostringstream& out, Marker m, double x, double y, const std::string& c) {
  if (m == Marker::filled_circle) {
    out << "<circle cx=\"" << num(x) << "\" cy=\"" << num(y) << "\" r=\"3.4\" fill=\"" << c
        << "\" stroke=\"#ffffff\" stroke-width=\"0.8\"/>\n";
  } else if (m == Marker::open_square) {
    out << "<rect x=\"" << num(x - 3.2) << "\" y=\"" << num(y - 3.2)
        << "\" width=\"6.4\" height=\"6.4\" fill=\"#ffffff\" stroke=\"" << c
        << "\" stroke-width=\"1.4\"/>\n";
  }
}

// "10" with the exponent raised, minus as U+2212.
inline std::string decade_label(int exponent) {
  std::string e =
      exponent < 0 ? "\xE2\x88\x92" + std::to_string(-exponent) : std::to_string(exponent);
  return "10<tspan dy=\"-6\" font-size=\"8.5\">" + e + "</tspan>";
}

}  // namespace detail

// The SVG document for `figure`.
inline std::string render(const Figure& figure) {
  using detail::num;
  constexpr double width = 1160;
  constexpr double plot_left = 96;
  constexpr double plot_right = 790;
  constexpr double plot_height = 360;
  constexpr double chart_gap = 118;
  constexpr double top = 92;
  constexpr double legend_left = 826;
  const double charts = static_cast<double>(figure.charts.size());
  const double legend_height =
      40.0 +
      19.0 * static_cast<double>(figure.legend.size() + figure.keys.size() +
                                 (figure.reference_key.empty() ? 0 : 1)) +
      30.0;
  const double height =
      std::max(top + charts * (plot_height + chart_gap) + 10.0, top + legend_height + 20.0);

  std::ostringstream out;
  out << "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
      << "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" width=\"" << num(width)
      << "\" height=\"" << num(height) << "\" viewBox=\"0 0 " << num(width) << ' ' << num(height)
      << "\" font-family=\"system-ui, sans-serif\">\n"
      << "<title>" << escape(figure.title) << "</title>\n"
      << "<rect x=\"0\" y=\"0\" width=\"" << num(width) << "\" height=\"" << num(height)
      << "\" fill=\"#f7f5ef\"/>\n"
      << "<text x=\"" << num(plot_left)
      << "\" y=\"34\" font-size=\"19\" font-weight=\"bold\" fill=\"#22313f\">"
      << escape(figure.title) << "</text>\n"
      << "<text x=\"" << num(plot_left) << "\" y=\"56\" font-size=\"11.5\" fill=\"#4a5663\">"
      << escape(figure.subtitle) << "</text>\n";

  for (std::size_t c = 0; c < figure.charts.size(); ++c) {
    const Chart& chart = figure.charts[c];
    const double y_top = top + static_cast<double>(c) * (plot_height + chart_gap) + 22.0;
    const double y_bottom = y_top + plot_height;
    double x_min = std::numeric_limits<double>::infinity();
    double x_max = 0;
    double y_min = std::numeric_limits<double>::infinity();
    double y_max = 0;
    std::size_t left_out = 0;
    for (const Series& s : chart.series) {
      for (const auto& p : s.points) {
        if (!detail::drawable(p.first, p.second)) {
          ++left_out;
          continue;
        }
        x_min = std::min(x_min, p.first);
        x_max = std::max(x_max, p.first);
        y_min = std::min(y_min, p.second);
        y_max = std::max(y_max, p.second);
      }
    }
    for (const ErrorBar& b : chart.bars) {
      if (detail::drawable(b.x, b.low) && detail::drawable(b.x, b.high)) {
        y_min = std::min(y_min, b.low);
        y_max = std::max(y_max, b.high);
      }
    }
    if (chart.has_reference && chart.reference_y > 0 && std::isfinite(chart.reference_y)) {
      y_min = std::min(y_min, chart.reference_y);
      y_max = std::max(y_max, chart.reference_y);
    }
    const detail::Range xr = detail::decades(x_min, x_max);
    const detail::Range yr = detail::decades(y_min, y_max);
    auto px = [&](double x) {
      return plot_left + (std::log10(x) - xr.lo) / (xr.hi - xr.lo) * (plot_right - plot_left);
    };
    auto py = [&](double y) {
      return y_bottom - (std::log10(y) - yr.lo) / (yr.hi - yr.lo) * plot_height;
    };

    out << "<g class=\"chart\" id=\"chart-" << c + 1 << "\">\n"
        << "<text x=\"" << num(plot_left) << "\" y=\"" << num(y_top - 12) << "\" font-size=\"14\" "
        << "font-weight=\"bold\" fill=\"#22313f\">" << escape(chart.title) << "</text>\n"
        << "<rect x=\"" << num(plot_left) << "\" y=\"" << num(y_top) << "\" width=\""
        << num(plot_right - plot_left) << "\" height=\"" << num(plot_height)
        << "\" fill=\"#ffffff\" stroke=\"#8a96a3\" stroke-width=\"1\"/>\n";

    // Decade grid, ticks and labels; minor ticks when there are few decades.
    const int x_span = xr.hi - xr.lo;
    const int y_span = yr.hi - yr.lo;
    const int x_every = x_span > 16 ? 3 : (x_span > 9 ? 2 : 1);
    const int y_every = y_span > 16 ? 3 : (y_span > 9 ? 2 : 1);
    for (int e = xr.lo; e <= xr.hi; ++e) {
      const double x = px(std::pow(10.0, e));
      out << "<line x1=\"" << num(x) << "\" y1=\"" << num(y_top) << "\" x2=\"" << num(x)
          << "\" y2=\"" << num(y_bottom) << "\" stroke=\"#e3e0d6\" stroke-width=\"1\"/>\n"
          << "<line x1=\"" << num(x) << "\" y1=\"" << num(y_bottom) << "\" x2=\"" << num(x)
          << "\" y2=\"" << num(y_bottom + 6) << "\" stroke=\"#4a5663\" stroke-width=\"1\"/>\n";
      if ((e - xr.lo) % x_every == 0) {
        out << "<text x=\"" << num(x) << "\" y=\"" << num(y_bottom + 22)
            << "\" font-size=\"11.5\" text-anchor=\"middle\" fill=\"#33404d\">"
            << detail::decade_label(e) << "</text>\n";
      }
      if (x_span <= 8 && e < xr.hi) {
        for (int m = 2; m <= 9; ++m) {
          const double xm = px(m * std::pow(10.0, e));
          out << "<line x1=\"" << num(xm) << "\" y1=\"" << num(y_bottom) << "\" x2=\"" << num(xm)
              << "\" y2=\"" << num(y_bottom + 3)
              << "\" stroke=\"#4a5663\" stroke-width=\"0.8\"/>\n";
        }
      }
    }
    for (int e = yr.lo; e <= yr.hi; ++e) {
      const double y = py(std::pow(10.0, e));
      out << "<line x1=\"" << num(plot_left) << "\" y1=\"" << num(y) << "\" x2=\""
          << num(plot_right) << "\" y2=\"" << num(y)
          << "\" stroke=\"#e3e0d6\" stroke-width=\"1\"/>\n"
          << "<line x1=\"" << num(plot_left - 6) << "\" y1=\"" << num(y) << "\" x2=\""
          << num(plot_left) << "\" y2=\"" << num(y)
          << "\" stroke=\"#4a5663\" stroke-width=\"1\"/>\n";
      if ((e - yr.lo) % y_every == 0) {
        out << "<text x=\"" << num(plot_left - 10) << "\" y=\"" << num(y + 4)
            << "\" font-size=\"11.5\" text-anchor=\"end\" fill=\"#33404d\">"
            << detail::decade_label(e) << "</text>\n";
      }
      if (y_span <= 8 && e < yr.hi) {
        for (int m = 2; m <= 9; ++m) {
          const double ym = py(m * std::pow(10.0, e));
          out << "<line x1=\"" << num(plot_left - 3) << "\" y1=\"" << num(ym) << "\" x2=\""
              << num(plot_left) << "\" y2=\"" << num(ym)
              << "\" stroke=\"#4a5663\" stroke-width=\"0.8\"/>\n";
        }
      }
    }
    out << "<text x=\"" << num(0.5 * (plot_left + plot_right)) << "\" y=\"" << num(y_bottom + 44)
        << "\" font-size=\"12.5\" text-anchor=\"middle\" fill=\"#22313f\">" << escape(chart.x_label)
        << "</text>\n"
        << "<text transform=\"translate(" << num(plot_left - 62) << ' '
        << num(0.5 * (y_top + y_bottom))
        << ") rotate(-90)\" font-size=\"12.5\" text-anchor=\"middle\" fill=\"#22313f\">"
        << escape(chart.y_label) << "</text>\n";

    if (chart.has_reference && chart.reference_y > 0 && std::isfinite(chart.reference_y)) {
      const double y = py(chart.reference_y);
      out << "<g class=\"reference\">\n<line x1=\"" << num(plot_left) << "\" y1=\"" << num(y)
          << "\" x2=\"" << num(plot_right) << "\" y2=\"" << num(y) << "\" stroke=\""
          << reference_ink << "\" stroke-width=\"1.6\" stroke-dasharray=\"14 4 3 4\"/>\n"
          << "<rect x=\""
          << num(plot_right - 12 - 6.3 * static_cast<double>(chart.reference_label.size()))
          << "\" y=\"" << num(y - 19) << "\" width=\""
          << num(8 + 6.3 * static_cast<double>(chart.reference_label.size()))
          << "\" height=\"16\" rx=\"3\" fill=\"#ffffff\" fill-opacity=\"0.9\"/>\n"
          << "<text x=\"" << num(plot_right - 8) << "\" y=\"" << num(y - 7)
          << "\" font-size=\"11\" text-anchor=\"end\" fill=\"" << reference_ink << "\">"
          << escape(chart.reference_label) << "</text>\n</g>\n";
    }

    for (const ErrorBar& b : chart.bars) {
      if (!detail::drawable(b.x, b.low) || !detail::drawable(b.x, b.high)) continue;
      const double xp = px(b.x);
      out << "<path class=\"bar\" d=\"M" << num(xp - 3) << ',' << num(py(b.low)) << "H"
          << num(xp + 3) << "M" << num(xp) << ',' << num(py(b.low)) << "V" << num(py(b.high)) << "M"
          << num(xp - 3) << ',' << num(py(b.high)) << "H" << num(xp + 3) << "\" stroke=\""
          << colour(b.colour)
          << "\" stroke-width=\"1.1\" fill=\"none\" stroke-opacity=\"0.75\"/>\n";
    }
    for (const Series& s : chart.series) {
      const std::string c_str = colour(s.colour);
      std::vector<std::pair<double, double>> pts;
      for (const auto& p : s.points) {
        if (detail::drawable(p.first, p.second)) {
          pts.emplace_back(px(p.first), py(p.second));
        }
      }
      if (s.line != LineStyle::none && pts.size() >= 2) {
        out << "<polyline fill=\"none\" stroke=\"" << c_str << "\" stroke-width=\""
            << (s.line == LineStyle::solid ? "1.8" : "1.4") << "\"" << detail::dash(s.line)
            << " points=\"";
        for (const auto& p : pts) {
          out << num(p.first) << ',' << num(p.second) << ' ';
        }
        out << "\"/>\n";
      }
      for (const auto& p : pts) {
        detail::marker(out, s.marker, p.first, p.second, c_str);
      }
    }
    for (const ChartLabel& l : chart.labels) {
      if (!detail::drawable(l.x, l.y)) continue;
      out << "<text class=\"label\" x=\"" << num(px(l.x) + 6) << "\" y=\""
          << num(py(l.y) + (l.below ? 16 : -6)) << "\" font-size=\"11\" fill=\"" << colour(l.colour)
          << "\" stroke=\"#ffffff\" stroke-width=\"3\" paint-order=\"stroke\">" << escape(l.text)
          << "</text>\n";
    }
    if (left_out > 0) {
      out << "<text x=\"" << num(plot_left + 6) << "\" y=\"" << num(y_top + 14)
          << "\" font-size=\"10.5\" fill=\"#6b7682\">" << left_out
          << " point(s) at zero or not finite: not drawn on log axes</text>\n";
    }
    out << "</g>\n";
  }

  // Legend: one colour per entry, then the style keys.
  out << "<g class=\"legend\">\n"
      << "<rect x=\"" << num(legend_left - 10) << "\" y=\"" << num(top + 4) << "\" width=\""
      << num(width - legend_left - 4) << "\" height=\"" << num(legend_height)
      << "\" rx=\"6\" fill=\"#ffffff\" stroke=\"#c9c4b6\"/>\n"
      << "<text x=\"" << num(legend_left) << "\" y=\"" << num(top + 26)
      << "\" font-size=\"13\" font-weight=\"bold\" fill=\"#22313f\">Legend</text>\n";
  double y = top + 48;
  for (const LegendEntry& e : figure.legend) {
    const std::string c_str = colour(e.colour);
    out << "<line x1=\"" << num(legend_left) << "\" y1=\"" << num(y - 4) << "\" x2=\""
        << num(legend_left + 26) << "\" y2=\"" << num(y - 4) << "\" stroke=\"" << c_str
        << "\" stroke-width=\"3\"/>\n"
        << "<text x=\"" << num(legend_left + 34) << "\" y=\"" << num(y)
        << "\" font-size=\"11.5\" fill=\"#22313f\">" << escape(e.label) << "</text>\n";
    y += 19;
  }
  y += 8;
  for (const StyleKey& k : figure.keys) {
    if (k.line != LineStyle::none) {
      out << "<line x1=\"" << num(legend_left) << "\" y1=\"" << num(y - 4) << "\" x2=\""
          << num(legend_left + 26) << "\" y2=\"" << num(y - 4)
          << "\" stroke=\"#55606b\" stroke-width=\"1.6\"" << detail::dash(k.line) << "/>\n";
    }
    detail::marker(out, k.marker, legend_left + 13, y - 4, "#55606b");
    out << "<text x=\"" << num(legend_left + 34) << "\" y=\"" << num(y)
        << "\" font-size=\"11.5\" fill=\"#22313f\">" << escape(k.label) << "</text>\n";
    y += 19;
  }
  if (!figure.reference_key.empty()) {
    out << "<line x1=\"" << num(legend_left) << "\" y1=\"" << num(y - 4) << "\" x2=\""
        << num(legend_left + 26) << "\" y2=\"" << num(y - 4) << "\" stroke=\"" << reference_ink
        << "\" stroke-width=\"1.6\" stroke-dasharray=\"14 4 3 4\"/>\n"
        << "<text x=\"" << num(legend_left + 34) << "\" y=\"" << num(y)
        << "\" font-size=\"11.5\" fill=\"#22313f\">" << escape(figure.reference_key) << "</text>\n";
  }
  out << "</g>\n</svg>\n";
  return out.str();
}

}  // namespace halfspin::tools::svg
