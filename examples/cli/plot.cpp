// spinwright command-line program — SVG figures (see plot.hpp).
#include "plot.hpp"

#include "text.hpp"

#include <algorithm>  // std::sort, std::min, std::max
#include <cmath>      // std::floor, std::log10, std::pow, std::isfinite
#include <cstdio>     // std::snprintf
#include <limits>     // std::numeric_limits
#include <set>        // std::set

namespace spinwright_cli {

namespace {

constexpr double width = 760, panel_height = 280;
constexpr double left = 90, right = 170, top = 36, bottom = 52;
const char* const palette[] = {"#1f5fa8", "#c2452d", "#2f8f4e", "#8a4fb0", "#b8860b", "#4a4a4a", "#d0609a", "#2a9d9d"};

std::string num(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.2f", v);
  return buf;
}

std::string label_number(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.6g", v);
  return buf;
}

std::string escape(const std::string& s) {
  std::string out;
  for (const char c : s) {
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
      default:
        out += c;
    }
  }
  return out;
}

struct Range {
  double lo = 0, hi = 1;
};

Range padded(double lo, double hi) {
  if (!(lo <= hi)) return {0, 1};
  if (lo == hi) {
    const double d = lo == 0 ? 1 : 0.05 * std::fabs(lo);
    return {lo - d, hi + d};
  }
  const double d = 0.04 * (hi - lo);
  return {lo - d, hi + d};
}

// Linear ticks: 1, 2 or 5 times a power of ten, about five of them.
std::vector<double> ticks(Range r) {
  const double span = r.hi - r.lo;
  const double raw = span / 5;
  const double p = std::pow(10.0, std::floor(std::log10(raw)));
  double step = p;
  for (const double m : {1.0, 2.0, 5.0, 10.0}) {
    step = m * p;
    if (span / step <= 6) break;
  }
  std::vector<double> t;
  for (double v = std::ceil(r.lo / step) * step; v <= r.hi + 1e-9 * span; v += step) t.push_back(v == 0 ? 0 : v);
  return t;
}

struct Frame {
  double x0, y0, w, h;  // plot area in SVG units
  Range xr, yr;
  bool log_x = false;
  double sx(double x) const {
    if (log_x) {
      const double lx = std::log10(std::max(x, 1e-300));
      return x0 + (lx - xr.lo) / (xr.hi - xr.lo) * w;
    }
    return x0 + (x - xr.lo) / (xr.hi - xr.lo) * w;
  }
  double sy(double y) const { return y0 + h - (y - yr.lo) / (yr.hi - yr.lo) * h; }
};

void axes(std::string& out, const Frame& f, const std::string& title, const std::string& xl, const std::string& yl) {
  out += "<rect x=\"" + num(f.x0) + "\" y=\"" + num(f.y0) + "\" width=\"" + num(f.w) + "\" height=\"" + num(f.h) +
         "\" fill=\"#ffffff\" stroke=\"#333333\"/>\n";
  out += "<text x=\"" + num(f.x0) + "\" y=\"" + num(f.y0 - 10) + "\" font-size=\"14\" font-weight=\"bold\">" +
         escape(title) + "</text>\n";
  // y ticks
  for (const double v : ticks(f.yr)) {
    const double y = f.sy(v);
    out += "<line x1=\"" + num(f.x0) + "\" y1=\"" + num(y) + "\" x2=\"" + num(f.x0 + f.w) + "\" y2=\"" + num(y) +
           "\" stroke=\"#e4e4e4\"/>\n";
    out += "<text x=\"" + num(f.x0 - 6) + "\" y=\"" + num(y + 4) + "\" font-size=\"11\" text-anchor=\"end\">" +
           label_number(v) + "</text>\n";
  }
  // x ticks
  std::vector<double> xt;
  if (f.log_x) {
    for (double e = std::ceil(f.xr.lo); e <= f.xr.hi + 1e-9; e += 1) xt.push_back(std::pow(10.0, e));
  } else {
    xt = ticks(f.xr);
  }
  for (const double v : xt) {
    const double x = f.sx(v);
    out += "<line x1=\"" + num(x) + "\" y1=\"" + num(f.y0 + f.h) + "\" x2=\"" + num(x) + "\" y2=\"" +
           num(f.y0 + f.h + 5) + "\" stroke=\"#333333\"/>\n";
    out += "<text x=\"" + num(x) + "\" y=\"" + num(f.y0 + f.h + 18) + "\" font-size=\"11\" text-anchor=\"middle\">" +
           label_number(v) + "</text>\n";
  }
  out += "<text x=\"" + num(f.x0 + f.w / 2) + "\" y=\"" + num(f.y0 + f.h + 38) +
         "\" font-size=\"12\" text-anchor=\"middle\">" + escape(xl) + "</text>\n";
  out += "<text transform=\"translate(" + num(f.x0 - 62) + "," + num(f.y0 + f.h / 2) +
         ") rotate(-90)\" font-size=\"12\" text-anchor=\"middle\">" + escape(yl) + "</text>\n";
}

void histogram(std::string& out, const Histogram& hg, double y_top) {
  const std::vector<double>& v = hg.values;
  double lo = std::numeric_limits<double>::infinity(), hi = -lo;
  for (const double e : v) {
    lo = std::min(lo, e);
    hi = std::max(hi, e);
  }
  const std::set<double> distinct(v.begin(), v.end());
  const std::size_t bins = std::max<std::size_t>(1, std::min<std::size_t>(20, distinct.size()));
  const double bw = hi > lo ? (hi - lo) / static_cast<double>(bins) : 1.0;
  std::vector<std::uint64_t> count(bins, 0);
  for (const double e : v) {
    std::size_t b = hi > lo ? static_cast<std::size_t>((e - lo) / bw) : 0;
    if (b >= bins) b = bins - 1;
    ++count[b];
  }
  std::uint64_t most = 1;
  for (const auto c : count) most = std::max(most, c);
  Frame f{left, y_top + top, width - left - right, panel_height - top - bottom, {}, {}, false};
  f.xr = hi > lo ? Range{lo, hi} : Range{lo - 0.5, lo + 0.5};
  f.yr = {0, static_cast<double>(most) * 1.08};
  axes(out, f, hg.title, hg.x_label, "restarts");
  for (std::size_t b = 0; b < bins; ++b) {
    const double a = hi > lo ? lo + bw * static_cast<double>(b) : lo - 0.5;
    const double z = hi > lo ? a + bw : lo + 0.5;
    const double x = f.sx(a), x1 = f.sx(z);
    const double y = f.sy(static_cast<double>(count[b]));
    out += "<rect class=\"bar\" data-count=\"" + std::to_string(count[b]) + "\" data-lo=\"" + number_text(a) +
           "\" data-hi=\"" + number_text(z) + "\" x=\"" + num(x + 1) + "\" y=\"" + num(y) + "\" width=\"" +
           num(std::max(0.5, x1 - x - 2)) + "\" height=\"" + num(f.sy(0) - y) + "\" fill=\"" + palette[0] +
           "\" fill-opacity=\"0.8\"/>\n";
  }
}

void panel(std::string& out, const Panel& p, double y_top) {
  double xlo = std::numeric_limits<double>::infinity(), xhi = -xlo, ylo = xlo, yhi = -xlo;
  for (const Series& s : p.series) {
    for (std::size_t k = 0; k < s.x.size(); ++k) {
      if (!std::isfinite(s.y[k]) || (p.log_x && !(s.x[k] > 0))) continue;
      xlo = std::min(xlo, s.x[k]);
      xhi = std::max(xhi, s.x[k]);
      ylo = std::min(ylo, s.y[k]);
      yhi = std::max(yhi, s.y[k]);
    }
  }
  Frame f{left, y_top + top, width - left - right, panel_height - top - bottom, {}, {}, p.log_x};
  if (!(xlo <= xhi)) {
    xlo = p.log_x ? 1 : 0;
    xhi = p.log_x ? 10 : 1;
    ylo = 0;
    yhi = 1;
  }
  if (p.log_x) {
    const double a = std::floor(std::log10(xlo)), b = std::ceil(std::log10(xhi));
    f.xr = {a, b > a ? b : a + 1};
  } else {
    f.xr = xhi > xlo ? Range{xlo, xhi} : padded(xlo, xhi);
  }
  f.yr = p.unit_y ? Range{-0.02, 1.04} : padded(ylo, yhi);
  axes(out, f, p.title, p.x_label, p.y_label);
  std::size_t k = 0;
  for (const Series& s : p.series) {
    const char* colour = palette[k % (sizeof palette / sizeof palette[0])];
    std::string d;
    bool started = false;
    double last_y = 0;
    for (std::size_t i = 0; i < s.x.size(); ++i) {
      if (!std::isfinite(s.y[i]) || (p.log_x && !(s.x[i] > 0))) {
        started = false;
        continue;
      }
      const double x = f.sx(s.x[i]), y = f.sy(s.y[i]);
      if (!started) {
        d += "M" + num(x) + " " + num(y);
        started = true;
      } else {
        d += " H" + num(x) + " V" + num(y);
      }
      last_y = s.y[i];
    }
    if (started) d += " H" + num(f.x0 + f.w);
    out += "<path class=\"curve\" data-name=\"" + escape(s.name) + "\" data-points=\"" + std::to_string(s.x.size()) +
           "\" data-last=\"" + number_text(last_y) + "\" d=\"" + d + "\" fill=\"none\" stroke=\"" + colour +
           "\" stroke-width=\"2\"/>\n";
    const double ly = f.y0 + 14 + 18 * static_cast<double>(k);
    out += "<line x1=\"" + num(f.x0 + f.w + 12) + "\" y1=\"" + num(ly - 4) + "\" x2=\"" + num(f.x0 + f.w + 32) +
           "\" y2=\"" + num(ly - 4) + "\" stroke=\"" + colour + "\" stroke-width=\"2\"/>\n";
    out += "<text x=\"" + num(f.x0 + f.w + 36) + "\" y=\"" + num(ly) + "\" font-size=\"11\">" + escape(s.name) +
           "</text>\n";
    ++k;
  }
}

struct Event {
  double key;
  double energy;
};

Series running_min(std::vector<Event> ev, const std::string& name) {
  std::sort(ev.begin(), ev.end(), [](const Event& a, const Event& b) { return a.key < b.key; });
  Series s;
  s.name = name;
  double best = std::numeric_limits<double>::infinity();
  for (const Event& e : ev) {
    if (e.energy < best) {
      best = e.energy;
      s.x.push_back(e.key);
      s.y.push_back(best);
    }
  }
  return s;
}

}  // namespace

std::string svg_figure(const std::string& heading, const Histogram* hg, const std::vector<Panel>& panels) {
  const bool with_histogram = hg != nullptr && !hg->values.empty();
  const double height = 40 + panel_height * static_cast<double>(panels.size() + (with_histogram ? 1 : 0));
  std::string out = "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n";
  out += "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"" + num(width) + "\" height=\"" + num(height) +
         "\" viewBox=\"0 0 " + num(width) + " " + num(height) + "\" font-family=\"sans-serif\">\n";
  out += "<rect width=\"100%\" height=\"100%\" fill=\"#fafafa\"/>\n";
  out += "<text x=\"16\" y=\"26\" font-size=\"15\">" + escape(heading) + "</text>\n";
  double y = 40;
  if (with_histogram) {
    histogram(out, *hg, y);
    y += panel_height;
  }
  for (const Panel& p : panels) {
    panel(out, p, y);
    y += panel_height;
  }
  out += "</svg>\n";
  return out;
}

Series best_against_sweeps(const std::vector<Trace>& traces, const std::string& name) {
  std::vector<Event> ev;
  for (const Trace& t : traces) {
    for (const TracePoint& p : t) ev.push_back({static_cast<double>(p.sweep), p.energy});
  }
  return running_min(std::move(ev), name);
}

Series best_against_seconds(const std::vector<Trace>& traces, const std::string& name) {
  std::vector<Event> ev;
  for (const Trace& t : traces) {
    for (const TracePoint& p : t) ev.push_back({p.seconds, p.energy});
  }
  return running_min(std::move(ev), name);
}

Series success_against_sweeps(const std::vector<Trace>& traces, double target, double tol, const std::string& name) {
  std::vector<double> first;  // the sweep at which each trace first reached the target
  for (const Trace& t : traces) {
    for (const TracePoint& p : t) {
      if (p.energy <= target + tol) {
        first.push_back(static_cast<double>(p.sweep));
        break;
      }
    }
  }
  std::sort(first.begin(), first.end());
  Series s;
  s.name = name;
  const double n = traces.empty() ? 1.0 : static_cast<double>(traces.size());
  s.x.push_back(1);
  s.y.push_back(0);
  for (std::size_t k = 0; k < first.size(); ++k) {
    if (k + 1 < first.size() && first[k + 1] == first[k]) continue;
    s.x.push_back(std::max(1.0, first[k]));
    s.y.push_back(static_cast<double>(k + 1) / n);
  }
  return s;
}

}  // namespace spinwright_cli
