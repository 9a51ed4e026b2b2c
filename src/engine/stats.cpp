#include "engine/stats.h"

#include <boost/math/distributions/chi_squared.hpp>
#include <boost/math/distributions/normal.hpp>
#include <cmath>

namespace sp {

double chi_square_critical(int dof, double alpha) {
  boost::math::chi_squared d(dof);
  return boost::math::quantile(boost::math::complement(d, alpha));
}

double chi_square_p_value(int dof, double x) {
  boost::math::chi_squared d(dof);
  return boost::math::cdf(boost::math::complement(d, x < 0 ? 0.0 : x));
}

double sidak_level(double alpha, int n) {
  // 1 - (1-alpha)^(1/n), written with log1p/expm1 to keep precision for small alpha.
  return -std::expm1(std::log1p(-alpha) / n);
}

double normal_two_sided_critical(double level) {
  boost::math::normal z;
  return boost::math::quantile(boost::math::complement(z, level / 2));
}

}  // namespace sp
