#pragma once
// Closed 2-D outlines made of straight segments and circular arcs, in metres. An arc is the minor
// arc (sweep < π) from `start` to `end` about `center`; outlines run counter-clockwise.
#include <Eigen/Core>
#include <Eigen/Geometry>
#include <cmath>
#include <vector>

namespace gapflux {

using Vec2 = Eigen::Vector2d;

struct Segment {
  enum class Kind { line, arc };
  Kind kind = Kind::line;
  Vec2 start = Vec2::Zero();
  Vec2 end = Vec2::Zero();
  Vec2 center = Vec2::Zero();  // arcs only

  static Segment line(const Vec2& a, const Vec2& b) { return {Kind::line, a, b, Vec2::Zero()}; }
  static Segment arc(const Vec2& a, const Vec2& b, const Vec2& c) { return {Kind::arc, a, b, c}; }
};

using Outline = std::vector<Segment>;

// Signed sweep of an arc in radians, in (−π, π).
double arc_sweep(const Segment& arc);
// Area enclosed by a closed outline, positive when counter-clockwise (Green's theorem, exact for
// lines and arcs).
double signed_area(const Outline& outline);
// Outline rotated by `angle_rad` counter-clockwise about the origin.
Outline rotated(const Outline& outline, double angle_rad);
// Polyline through `points` closed back to the first point.
Outline polygon(const std::vector<Vec2>& points);
// The boundary of an annular sector r ∈ [r_inner, r_outer], θ ∈ [theta0, theta1] (r_inner may be
// 0: a disk sector). Arcs are split into pieces of at most π/2. theta1 − theta0 ≤ 2π; for a full
// turn, use ring() instead.
Outline annular_sector(double r_inner, double r_outer, double theta0, double theta1);
// A full circle as four quarter arcs, counter-clockwise, starting at angle 0.
Outline circle(const Vec2& center, double radius);
// Point at polar coordinates.
inline Vec2 polar(double r, double theta) {
  return {r * std::cos(theta), r * std::sin(theta)};
}

}  // namespace gapflux
