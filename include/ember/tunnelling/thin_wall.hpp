// Thin-wall bubbles: a wall of tension sigma between a false vacuum (V = 0) and a true vacuum
// (V = -epsilon), for validating the numerical solvers and for users' own potentials.
//
// Units: sigma in GeV^3, epsilon in GeV^4, radii in GeV^-1, G in GeV^-2 (internal units).
//
// Flat space (Coleman, PRD 15 (1977) 2929): R0 = 3 sigma / epsilon, B0 = 27 pi^2 sigma^4 / (2 eps^3).
// With gravity, decay from zero to negative energy (Minkowski to anti-de Sitter; Coleman & De
// Luccia, PRD 21 (1980) 3305): with L^2 = 3 / (8 pi G epsilon) the curvature radius of the true
// vacuum,
//   B = B0 / [1 - (R0 / 2L)^2]^2,  R = R0 / [1 - (R0 / 2L)^2],
// so gravity raises the action, and for R0 >= 2L (sigma >= sigma_crit = 2 sqrt(eps/(6 pi G))/... )
// the decay is forbidden: no bubble forms. The sign is opposite to decays from positive to zero
// energy, where the denominator is 1 + (R0/2L)^2 (same paper).
// Around a black hole (Gregory, Moss & Withers, JHEP 03 (2014) 081; derived here from the Israel
// junction conditions): a static wall at radius R between an interior Schwarzschild-AdS region
// (mass M_-, f_- = 1 - 2 G M_-/R + R^2/L^2) and the exterior (mass M_+, f_+ = 1 - 2 G M_+/R) obeys,
// with k = 4 pi G sigma and b(R) = G (M_+ - M_-)/(k R^2) + R/(2 k L^2) - k R/2,
//   b = sqrt(f_+)          (the junction condition, sqrt(f_-) - sqrt(f_+) = k R), and
//   b b' = G M_+ / R^2     (force balance: the wall's R'' = 0, with M_- held fixed),
// and B = (A_+ - A_-)/(4G), the drop in horizon area. M_- here is the interior metric's mass
// parameter; the remnant hole's horizon r_- (from f_-(r_-) = 0) gives the remnant mass reported,
// r_- / (2G), and A_- = 4 pi r_-^2. For a given M_+ the first fixes M_- at each R and the second is
// a root in R; several roots are several branches, none means no static wall. In the probe limit
// (R >> r_h, G sigma R << 1) the static wall is the O(3) thermal bubble at T_H: R = 2 sigma/eps,
// E = 16 pi sigma^3 / (3 eps^2) and B = E / T_H = 8 pi G M E (derived).
#pragma once

#include <optional>
#include <vector>

namespace ember::tunnelling {

struct ThinWall {
  double sigma, epsilon;  // GeV^3, GeV^4
};

double thin_wall_radius(const ThinWall& w);  // R0 = 3 sigma / epsilon
double thin_wall_action(const ThinWall& w);  // B0 = 27 pi^2 sigma^4 / (2 epsilon^3)

struct GravitatingThinWall {
  double action, radius;
};
// Coleman-De Luccia, zero to negative energy; nullopt when gravity forbids the decay.
std::optional<GravitatingThinWall> coleman_de_luccia(const ThinWall& w, double newton_G);

// The flat-space static (O(3)) critical bubble: energy 16 pi sigma^3 / (3 eps^2) at R = 2 sigma / eps.
double static_bubble_energy(const ThinWall& w);

struct SeededWall {
  double radius;        // GeV^-1
  double remnant_mass;  // the remnant's horizon mass r_- / (2G) (GeV)
  double action;        // B = (A_+ - A_-)/(4G) = 4 pi G (M_+^2 - (r_-/2G)^2)
};
// Every static wall around a hole of mass `seed` (GeV), lowest action first; empty if none.
std::vector<SeededWall> seeded_thin_walls(const ThinWall& w, double seed, double newton_G);

}  // namespace ember::tunnelling
