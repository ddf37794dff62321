#pragma once
// Specific iron loss of electrical steel under a sinusoidal flux density of peak B at frequency
// f: p = k_h·f·B^α + k_c·(f·B)² + k_e·(f·B)^1.5 in W/kg (hysteresis, classical eddy current,
// excess; the Steinmetz/Bertotti separation).
namespace gapflux {

struct IronLossModel {
  double k_h = 0.0, alpha = 2.0, k_c = 0.0, k_e = 0.0;
  bool available() const { return k_h > 0.0 || k_c > 0.0 || k_e > 0.0; }
};

// Fitted to a grade's specific loss at 1.5 T, 50 Hz (the EN 10106 / IEC 60404-8-4 grade figure):
// k_c = π²·σ·d²/(6·ρ) is the classical eddy-current loss of a lamination of thickness d and
// conductivity σ (low-frequency limit; e.g. Bertotti, Hysteresis in Magnetism, 1998, ch. 12);
// the excess term takes 10 % of the figure and hysteresis the rest, with α = 2 (typical shares
// for non-oriented steel, from memory). Throws std::invalid_argument if the classical term alone
// exceeds 90 % of the figure.
IronLossModel fit_iron_loss(double loss_1p5t_50hz_w_per_kg, double thickness_m,
                            double conductivity_s_per_m, double density_kg_per_m3);

double specific_iron_loss_w_per_kg(const IronLossModel& m, double frequency_hz,
                                   double b_peak_tesla);

}  // namespace gapflux
