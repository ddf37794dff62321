#include "geometry/outline.hpp"

#include <cmath>
#include <numbers>

namespace gapflux {

double arc_sweep(const Segment& arc) {
  const Vec2 a = arc.start - arc.center;
  const Vec2 b = arc.end - arc.center;
  return std::atan2(a.x() * b.y() - a.y() * b.x(), a.dot(b));
}

double signed_area(const Outline& outline) {
  // ½∮(x dy − y dx); for an arc x = cx + r cos t, y = cy + r sin t this integrates to
  // ½[r cx (sin t1 − sin t0) − r cy (cos t1 − cos t0) + r² (t1 − t0)].
  double twice_area = 0.0;
  for (const Segment& s : outline) {
    if (s.kind == Segment::Kind::line) {
      twice_area += s.start.x() * s.end.y() - s.end.x() * s.start.y();
    } else {
      const Vec2 a = s.start - s.center;
      const double r = a.norm();
      const double t0 = std::atan2(a.y(), a.x());
      const double t1 = t0 + arc_sweep(s);
      twice_area += r * s.center.x() * (std::sin(t1) - std::sin(t0)) -
                    r * s.center.y() * (std::cos(t1) - std::cos(t0)) + r * r * (t1 - t0);
    }
  }
  return 0.5 * twice_area;
}

Outline rotated(const Outline& outline, double angle_rad) {
  const Eigen::Rotation2Dd rot(angle_rad);
  Outline out = outline;
  for (Segment& s : out) {
    s.start = rot * s.start;
    s.end = rot * s.end;
    s.center = rot * s.center;
  }
  return out;
}

Outline polygon(const std::vector<Vec2>& points) {
  Outline out;
  for (std::size_t i = 0; i < points.size(); ++i)
    out.push_back(Segment::line(points[i], points[(i + 1) % points.size()]));
  return out;
}

namespace {

// Arc pieces of at most π/2 from theta0 to theta1 (either direction) at radius r about the origin.
void append_arc(Outline& out, double r, double theta0, double theta1) {
  const double span = theta1 - theta0;
  const int pieces =
      std::max(1, static_cast<int>(std::ceil(std::abs(span) / (std::numbers::pi / 2) - 1e-9)));
  for (int i = 0; i < pieces; ++i) {
    const double a = theta0 + span * i / pieces;
    const double b = theta0 + span * (i + 1) / pieces;
    out.push_back(Segment::arc(polar(r, a), polar(r, b), Vec2::Zero()));
  }
}

}  // namespace

Outline annular_sector(double r_inner, double r_outer, double theta0, double theta1) {
  Outline out;
  if (r_inner > 0.0) {
    out.push_back(Segment::line(polar(r_inner, theta0), polar(r_outer, theta0)));
    append_arc(out, r_outer, theta0, theta1);
    out.push_back(Segment::line(polar(r_outer, theta1), polar(r_inner, theta1)));
    append_arc(out, r_inner, theta1, theta0);
  } else {
    out.push_back(Segment::line(Vec2::Zero(), polar(r_outer, theta0)));
    append_arc(out, r_outer, theta0, theta1);
    out.push_back(Segment::line(polar(r_outer, theta1), Vec2::Zero()));
  }
  return out;
}

Outline circle(const Vec2& center, double radius) {
  Outline out;
  for (int i = 0; i < 4; ++i) {
    const double a = i * std::numbers::pi / 2;
    const double b = (i + 1) * std::numbers::pi / 2;
    out.push_back(Segment::arc(center + polar(radius, a), center + polar(radius, b), center));
  }
  return out;
}

}  // namespace gapflux
