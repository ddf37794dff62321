// Rotor bar outlines in the bar's local frame (+x along the bar centre line).
#include <fmt/format.h>

#include <cmath>
#include <numbers>

#include "slot_builders.hpp"

namespace gapflux {
namespace {

constexpr double mm = 1e-3;

// Circle about `center` as arcs through the given angles (ascending, spanning 2π, each gap < π).
void add_circle_arcs(Outline& o, const Vec2& center, double radius,
                     const std::vector<double>& angles) {
  for (std::size_t i = 0; i + 1 < angles.size(); ++i)
    o.push_back(Segment::arc(center + polar(radius, angles[i]),
                             center + polar(radius, angles[i + 1]), center));
}

// Narrowest rotor tooth between neighbouring bars: twice the least distance from the bar outline
// to the tooth centre line at angle π/R, sampled densely along the outline.
double tooth_width(const Outline& bar, int bars) {
  const double half_pitch = std::numbers::pi / bars;
  const Vec2 normal{-std::sin(half_pitch), std::cos(half_pitch)};  // of the tooth centre line
  double least = 1e300;
  for (const Segment& s : bar) {
    for (int i = 0; i <= 64; ++i) {
      const double u = i / 64.0;
      Vec2 p;
      if (s.kind == Segment::Kind::line) {
        p = s.start + u * (s.end - s.start);
      } else {
        const Vec2 a = s.start - s.center;
        p = s.center + Eigen::Rotation2Dd(u * arc_sweep(s)) * a;
      }
      least = std::min(least, -p.dot(normal));
    }
  }
  return 2.0 * least;
}

}  // namespace

BarShapes build_rotor_bar(const Case& c) {
  const auto& r = c.rotor;
  const auto& b = r.bar;
  const auto& src = c.sources;
  const std::string key = "rotor.bar.";
  const double r_rotor = 0.5 * r.outer_diameter_m;
  const double x_top = b.closure == BarClosure::closed ? r_rotor - b.bridge_thickness_m
                                                       : r_rotor - b.opening_height_m;
  const std::string top_key =
      key + (b.closure == BarClosure::closed ? "bridge_thickness_mm" : "opening_height_mm");
  const double w_o = b.closure == BarClosure::semi_open ? b.opening_width_m : 0.0;
  const double half_o = 0.5 * w_o;

  BarShapes out;
  double x_bottom = 0.0;
  double top_width = 0.0;  // width of the bar where the slit meets it
  // The part of the bar outline under a slit of half-width half_o, shared with the opening.
  Segment slit_bottom;
  const double pi = std::numbers::pi;
  switch (b.shape) {
    case BarShape::round: {
      const double radius = 0.5 * b.diameter_m;
      const Vec2 center{x_top - radius, 0.0};
      x_bottom = x_top - b.diameter_m;
      top_width = b.diameter_m;
      if (w_o > 0.0 && w_o < top_width) {
        const double phi = std::asin(half_o / radius);
        add_circle_arcs(out.bar, center, radius, {phi, pi / 2, pi, 1.5 * pi, 2 * pi - phi});
        slit_bottom =
            Segment::arc(center + polar(radius, 2 * pi - phi), center + polar(radius, phi), center);
        out.bar.push_back(slit_bottom);
      } else {
        add_circle_arcs(out.bar, center, radius, {0, pi / 2, pi, 1.5 * pi, 2 * pi});
      }
      break;
    }
    case BarShape::teardrop: {
      const double r1 = b.top_radius_m, r2 = b.bottom_radius_m;
      const Vec2 c1{x_top - r1, 0.0}, c2{x_top - b.height_m + r2, 0.0};
      x_bottom = x_top - b.height_m;
      top_width = 2.0 * r1;
      // Common outer tangents: the tangent points c_i + r_i·n share the outward normal n, and
      // the tangent line n·x = n·c1 + r1 = n·c2 + r2 gives n·(c1 − c2) = r2 − r1. The case
      // reader's height > 2·max(r1, r2) keeps |r2 − r1| < d, so the tangent exists.
      const double d = c1.x() - c2.x();
      const double nx = (r2 - r1) / d;
      const double tangent_angle = std::acos(nx);  // of the upper tangent point, on both circles
      const double a = tangent_angle;
      std::vector<double> top_angles = {-a, 0.0, a};
      if (w_o > 0.0 && w_o < top_width) {
        const double phi = std::asin(half_o / r1);
        if (phi >= a)
          throw src.error(key + "opening_width_mm",
                          fmt::format("the slit ({:.3f} mm) is wider than the rounded bar top "
                                      "({:.3f} mm)",
                                      w_o / mm, 2.0 * r1 * std::sin(a) / mm));
        top_angles = {-a, -phi, phi, a};
      }
      // Bottom circle from the upper tangent point round through −x to the lower one.
      out.bar.push_back(Segment::line(c2 + polar(r2, -a), c1 + polar(r1, -a)));
      for (std::size_t i = 0; i + 1 < top_angles.size(); ++i) {
        const Segment arc =
            Segment::arc(c1 + polar(r1, top_angles[i]), c1 + polar(r1, top_angles[i + 1]), c1);
        out.bar.push_back(arc);
        if (top_angles.size() == 4 && i == 1) slit_bottom = arc;
      }
      out.bar.push_back(Segment::line(c1 + polar(r1, a), c2 + polar(r2, a)));
      add_circle_arcs(out.bar, c2, r2, {a, pi, 2 * pi - a});
      break;
    }
    case BarShape::rectangular: {
      const double h = b.height_m, w = b.width_m;
      x_bottom = x_top - h;
      top_width = w;
      std::vector<Vec2> pts = {{x_bottom, -0.5 * w}, {x_top, -0.5 * w}};
      if (w_o > 0.0 && w_o < w) {
        pts.push_back({x_top, -half_o});
        pts.push_back({x_top, half_o});
        slit_bottom = Segment::line({x_top, -half_o}, {x_top, half_o});
      }
      pts.push_back({x_top, 0.5 * w});
      pts.push_back({x_bottom, 0.5 * w});
      out.bar = polygon(pts);
      break;
    }
  }

  if (x_top <= 0.0 || x_bottom <= 0.0)
    throw src.error(top_key, fmt::format("the bar does not fit between the rotor surface and "
                                         "the centre (its bottom would lie at radius {:.3f} mm)",
                                         x_bottom / mm));
  if (b.closure == BarClosure::semi_open && w_o >= top_width)
    throw src.error(key + "opening_width_mm",
                    fmt::format("the slit ({:.3f} mm) must be narrower than the bar top "
                                "({:.3f} mm)",
                                w_o / mm, top_width / mm));
  const double r_shaft = 0.5 * r.shaft_diameter_m;
  if (x_bottom <= r_shaft)
    throw src.error("rotor.shaft_diameter_mm",
                    fmt::format("the shaft (radius {:.3f} mm) cuts the bars (bar bottom at "
                                "radius {:.3f} mm); the shaft diameter must be below {:.3f} mm",
                                r_shaft / mm, x_bottom / mm, 2.0 * x_bottom / mm));
  const double tooth = tooth_width(out.bar, r.bars);
  if (tooth <= 0.0)
    throw src.error(key + "shape",
                    fmt::format("neighbouring bars overlap: the rotor teeth would have no width "
                                "({:.3f} mm); make the bars narrower or fewer",
                                tooth / mm));

  if (b.closure == BarClosure::semi_open) {
    // Slit from the bar top to the rotor surface, closed on the surface by an arc.
    const double x_surface = std::sqrt(r_rotor * r_rotor - half_o * half_o);
    // slit_bottom runs as the bar outline does, from (·, −half_o) to (·, +half_o).
    const Vec2 p_low = slit_bottom.start, p_high = slit_bottom.end;
    Outline o;
    o.push_back(Segment::line(p_low, {x_surface, -half_o}));
    o.push_back(Segment::arc({x_surface, -half_o}, {x_surface, half_o}, Vec2::Zero()));
    o.push_back(Segment::line({x_surface, half_o}, p_high));
    Segment back = slit_bottom;
    std::swap(back.start, back.end);
    o.push_back(back);
    out.opening = o;
  }

  out.dims.bar_pitch_at_surface_m = 2.0 * pi * r_rotor / r.bars;
  out.dims.bar_area_m2 = signed_area(out.bar);
  out.dims.rotor_tooth_width_min_m = tooth;
  out.dims.bar_top_radius_m = x_top;
  out.dims.bar_bottom_radius_m = x_bottom;
  return out;
}

}  // namespace gapflux
