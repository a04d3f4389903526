#pragma once
// A standard normal variate for the tests' synthetic noise: Box–Muller on two uniforms from
// std::mt19937 (G. E. P. Box, M. E. Muller, Ann. Math. Statist. 29, 1958), spelled out so that
// the draws are the same on every standard library (std::normal_distribution's are not).
#include <cmath>
#include <numbers>
#include <random>

namespace sortie::test {

inline double normal(std::mt19937& g) {
  const double u1 = (static_cast<double>(g()) + 0.5) / 4294967296.0;
  const double u2 = (static_cast<double>(g()) + 0.5) / 4294967296.0;
  return std::sqrt(-2.0 * std::log(u1)) * std::cos(2.0 * std::numbers::pi * u2);
}

}  // namespace sortie::test
