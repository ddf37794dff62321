// Stator slot outlines in the slot's local frame (+x along the slot centre line).
#include <fmt/format.h>

#include <cmath>
#include <numbers>

#include "slot_builders.hpp"

namespace gapflux {
namespace {

constexpr double mm = 1e-3;

// The part of the slot with straight side walls, between the top of the winding area x_w and the
// start of the bottom x_e; half-width y(x) is linear in x.
struct Walls {
  double x_w = 0.0, y_w = 0.0;
  double x_e = 0.0, y_e = 0.0;
  double half_width(double x) const { return y_w + (y_e - y_w) * (x - x_w) / (x_e - x_w); }
};

// Where to cut the winding area into two layers of equal area: a chord at x_s on the walls.
// Area above the chord: (x_s − x_w)·(y_w + y(x_s)), a trapezoid. Falls back to the wall end
// when the walls hold less than half the area (a deep round bottom).
double equal_area_split(const Walls& w, double winding_area_m2) {
  const auto area_above = [&](double x) { return (x - w.x_w) * (w.y_w + w.half_width(x)); };
  if (area_above(w.x_e) <= 0.5 * winding_area_m2) return w.x_e;
  double lo = w.x_w, hi = w.x_e;
  for (int i = 0; i < 200; ++i) {
    const double mid = 0.5 * (lo + hi);
    (area_above(mid) < 0.5 * winding_area_m2 ? lo : hi) = mid;
  }
  return 0.5 * (lo + hi);
}

void add_line(Outline& o, const Vec2& a, const Vec2& b) {
  if ((b - a).norm() > 1e-15) o.push_back(Segment::line(a, b));
}

// Slots whose walls are straight lines: semi_closed and open.
SlotShapes build_walled_slot(const Case& c) {
  const auto& st = c.stator;
  const auto& s = st.slot;
  const auto& src = c.sources;
  const double r_bore = 0.5 * st.bore_diameter_m;
  const double r_outer = 0.5 * st.outer_diameter_m;
  const double alpha = std::numbers::pi / st.slots;  // half the slot pitch angle
  const double x_max = r_bore + s.slot_depth_m;
  const double w_o = s.opening_width_m;
  const std::string key = "stator.slot.";

  // Opening at the bore.
  const double chord_pitch = 2.0 * r_bore * std::sin(alpha);
  if (w_o >= chord_pitch)
    throw src.error(key + (s.shape == SlotShape::open ? "slot_width_mm" : "opening_width_mm"),
                    fmt::format("the slot opening ({:.3f} mm) must be narrower than the slot "
                                "pitch at the bore ({:.3f} mm chord)",
                                w_o / mm, chord_pitch / mm));
  const double x_b = std::sqrt(r_bore * r_bore - 0.25 * w_o * w_o);

  // Half-width of the body, y(x) = y0 + y1·x.
  double y0 = 0.0, y1 = 0.0;
  if (s.body == SlotBody::constant_tooth_width) {
    y0 = -0.5 * s.tooth_width_m / std::cos(alpha);
    y1 = std::tan(alpha);
  } else {
    y0 = 0.5 * s.slot_width_m;
  }
  const auto y_of = [&](double x) { return y0 + y1 * x; };

  // Top of the winding area.
  double x_t = x_b, x_w = x_b;
  if (s.shape == SlotShape::semi_closed) {
    x_t = x_b + s.tip_height_m;
    const double tan_w = std::tan(s.wedge_angle_rad);
    // The tip underside rises from (x_t, w_o/2) at slope tan_w until it meets the wall:
    // x_w = x_t + (y(x_w) − w_o/2)·tan_w.
    const double denominator = 1.0 - tan_w * y1;
    if (denominator <= 1e-9)
      throw src.error(key + "wedge_angle_deg",
                      fmt::format("the tip underside never meets the tooth side: wedge angle plus "
                                  "half the slot pitch angle ({:.2f}°) must be below 90°",
                                  alpha * 180.0 / std::numbers::pi));
    x_w = (x_t + (y0 - 0.5 * w_o) * tan_w) / denominator;
  } else {
    x_t = x_w = x_b + s.wedge_height_m;
  }
  const double y_w = y_of(x_w);
  if (s.shape == SlotShape::semi_closed && y_w <= 0.5 * w_o * (1.0 + 1e-9))
    throw src.error(key + "opening_width_mm",
                    fmt::format("the opening ({:.3f} mm) must be narrower than the slot body under "
                                "the tooth tips ({:.3f} mm); widen the slot or narrow the opening",
                                w_o / mm, 2.0 * y_w / mm));

  // Tooth width.
  const double tooth_min =
      s.body == SlotBody::constant_tooth_width
          ? s.tooth_width_m
          : 2.0 * (x_w * std::sin(alpha) - 0.5 * s.slot_width_m * std::cos(alpha));
  if (tooth_min <= 0.0)
    throw src.error(key + "slot_width_mm",
                    fmt::format("the teeth would have no width ({:.3f} mm) at the top of the slot "
                                "body; the slot must be narrower than {:.3f} mm there",
                                tooth_min / mm, 2.0 * x_w * std::tan(alpha) / mm));

  // Bottom.
  Walls walls;
  walls.x_w = x_w;
  walls.y_w = y_w;
  double bottom_center = 0.0;
  if (s.bottom == SlotBottom::flat) {
    walls.x_e = x_max;
    walls.y_e = y_of(x_max);
  } else if (s.body == SlotBody::constant_tooth_width) {
    // Arc tangent to both walls with its deepest point at x_max: centre c, radius c·sin α − t/2.
    const double sin_a = std::sin(alpha);
    bottom_center = (x_max + 0.5 * s.tooth_width_m) / (1.0 + sin_a);
    const double radius = bottom_center * sin_a - 0.5 * s.tooth_width_m;
    walls.x_e = bottom_center - radius * sin_a;
    walls.y_e = radius * std::cos(alpha);
  } else {
    const double radius = 0.5 * s.slot_width_m;
    bottom_center = x_max - radius;
    walls.x_e = bottom_center;
    walls.y_e = radius;
  }
  if (walls.x_e <= x_w + 1e-6 * r_bore || walls.y_e <= 0.0)
    throw src.error(key + "slot_depth_mm",
                    fmt::format("the slot is too shallow ({:.3f} mm) for its tooth tips: the "
                                "winding area would start {:.3f} mm from the bore",
                                s.slot_depth_m / mm, (x_w - r_bore) / mm));
  const double outermost = s.bottom == SlotBottom::flat ? std::hypot(x_max, walls.y_e) : x_max;
  if (outermost >= r_outer)
    throw src.error(
        key + "slot_depth_mm",
        fmt::format("the slot ({:.3f} mm deep) reaches through the yoke: it must end "
                    "inside the outer diameter (depth < {:.3f} mm here)",
                    s.slot_depth_m / mm, (s.slot_depth_m - (outermost - r_outer)) / mm));

  SlotShapes out;
  // Opening: from the bore up to the top of the winding area.
  const bool flat_tip = s.shape == SlotShape::semi_closed && x_w - x_t < 1e-9 * r_bore;
  if (x_w > x_b + 1e-12) {
    Outline o;
    add_line(o, {x_b, -0.5 * w_o}, {x_t, -0.5 * w_o});
    if (flat_tip) {
      add_line(o, {x_t, -0.5 * w_o}, {x_t, 0.5 * w_o});
    } else {
      add_line(o, {x_t, -0.5 * w_o}, {x_w, -y_w});
      add_line(o, {x_w, -y_w}, {x_w, y_w});
      add_line(o, {x_w, y_w}, {x_t, 0.5 * w_o});
    }
    add_line(o, {x_t, 0.5 * w_o}, {x_b, 0.5 * w_o});
    o.push_back(Segment::arc({x_b, 0.5 * w_o}, {x_b, -0.5 * w_o}, Vec2::Zero()));
    out.opening = o;
  }

  // The top edge of the winding area, from (x_w, y_w) back to (x_w, −y_w).
  const auto top_edge = [&](Outline& o) {
    if (x_w <= x_b + 1e-12) {
      o.push_back(Segment::arc({x_b, y_w}, {x_b, -y_w}, Vec2::Zero()));
    } else if (flat_tip) {
      add_line(o, {x_w, y_w}, {x_w, 0.5 * w_o});
      add_line(o, {x_w, 0.5 * w_o}, {x_w, -0.5 * w_o});
      add_line(o, {x_w, -0.5 * w_o}, {x_w, -y_w});
    } else {
      add_line(o, {x_w, y_w}, {x_w, -y_w});
    }
  };
  // Walls from x_a down to the bottom and back up, counter-clockwise.
  const auto lower_part = [&](Outline& o, double x_a) {
    const double y_a = walls.half_width(x_a);
    add_line(o, {x_a, -y_a}, {walls.x_e, -walls.y_e});
    if (s.bottom == SlotBottom::flat) {
      add_line(o, {walls.x_e, -walls.y_e}, {walls.x_e, walls.y_e});
    } else {
      const Vec2 center{bottom_center, 0.0};
      o.push_back(Segment::arc({walls.x_e, -walls.y_e}, {x_max, 0.0}, center));
      o.push_back(Segment::arc({x_max, 0.0}, {walls.x_e, walls.y_e}, center));
    }
    add_line(o, {walls.x_e, walls.y_e}, {x_a, y_a});
  };

  Outline whole;
  lower_part(whole, x_w);
  top_edge(whole);
  const double winding_area = signed_area(whole);
  if (c.winding.layers == 1) {
    out.coil_sides.push_back(whole);
  } else {
    const double x_s = equal_area_split(walls, winding_area);
    const double y_s = walls.half_width(x_s);
    Outline top;
    add_line(top, {x_w, -y_w}, {x_s, -y_s});
    add_line(top, {x_s, -y_s}, {x_s, y_s});
    add_line(top, {x_s, y_s}, {x_w, y_w});
    top_edge(top);
    Outline bottom;
    lower_part(bottom, x_s);
    add_line(bottom, {x_s, y_s}, {x_s, -y_s});
    out.coil_sides = {top, bottom};
  }

  out.dims.slot_pitch_at_bore_m = 2.0 * alpha * r_bore;
  out.dims.tooth_width_min_m = tooth_min;
  out.dims.winding_area_m2 = winding_area;
  out.dims.slot_area_m2 = winding_area + (out.opening.empty() ? 0.0 : signed_area(out.opening));
  for (std::size_t i = 0; i < out.coil_sides.size(); ++i)
    out.dims.coil_side_area_m2[i] = signed_area(out.coil_sides[i]);
  out.dims.yoke_height_m = r_outer - outermost;
  out.dims.tip_depth_m = x_w - r_bore;
  return out;
}

// An annular sector of constant angular width: the slot of the exact subdomain airgap models.
SlotShapes build_radial_slot(const Case& c) {
  const auto& st = c.stator;
  const auto& s = st.slot;
  const double r_bore = 0.5 * st.bore_diameter_m;
  const double r_outer = 0.5 * st.outer_diameter_m;
  const double pitch = 2.0 * std::numbers::pi / st.slots;
  const double half = 0.5 * s.slot_angle_rad;
  if (s.slot_angle_rad >= pitch)
    throw c.sources.error(
        "stator.slot.slot_angle_deg",
        fmt::format("the slot ({:.3f}°) must be narrower than the slot pitch "
                    "({:.3f}°)",
                    s.slot_angle_rad * 180 / std::numbers::pi, pitch * 180 / std::numbers::pi));
  const double r_bottom = r_bore + s.slot_depth_m;
  if (r_bottom >= r_outer)
    throw c.sources.error("stator.slot.slot_depth_mm",
                          fmt::format("the slot ({:.3f} mm deep) reaches through the yoke (depth "
                                      "must be < {:.3f} mm)",
                                      s.slot_depth_m / mm, (r_outer - r_bore) / mm));
  const double r_wedge = r_bore + s.wedge_height_m;
  if (r_wedge >= r_bottom)
    throw c.sources.error("stator.slot.wedge_height_mm",
                          fmt::format("the wedge ({:.3f} mm) must be shallower than the slot "
                                      "({:.3f} mm)",
                                      s.wedge_height_m / mm, s.slot_depth_m / mm));
  SlotShapes out;
  if (s.wedge_height_m > 0.0) out.opening = annular_sector(r_bore, r_wedge, -half, half);
  if (c.winding.layers == 1) {
    out.coil_sides.push_back(annular_sector(r_wedge, r_bottom, -half, half));
  } else {
    const double r_split = std::sqrt(0.5 * (r_wedge * r_wedge + r_bottom * r_bottom));
    out.coil_sides.push_back(annular_sector(r_wedge, r_split, -half, half));
    out.coil_sides.push_back(annular_sector(r_split, r_bottom, -half, half));
  }
  out.dims.slot_pitch_at_bore_m = pitch * r_bore;
  out.dims.tooth_width_min_m = (pitch - s.slot_angle_rad) * r_bore;
  out.dims.winding_area_m2 = half * (r_bottom * r_bottom - r_wedge * r_wedge);
  out.dims.slot_area_m2 = half * (r_bottom * r_bottom - r_bore * r_bore);
  for (std::size_t i = 0; i < out.coil_sides.size(); ++i)
    out.dims.coil_side_area_m2[i] = signed_area(out.coil_sides[i]);
  out.dims.yoke_height_m = r_outer - r_bottom;
  out.dims.tip_depth_m = s.wedge_height_m;
  return out;
}

}  // namespace

SlotShapes build_stator_slot(const Case& c) {
  return c.stator.slot.shape == SlotShape::open_radial ? build_radial_slot(c)
                                                       : build_walled_slot(c);
}

}  // namespace gapflux
