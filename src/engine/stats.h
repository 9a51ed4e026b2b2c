// Small statistics helpers over Boost.Math for the tests of fit.
// Sources: NIST/SEMATECH e-Handbook §1.3.6.7.4 (chi-square critical values); Šidák level per
// Narasimhan & Jordache (2000) ch. 7: beta = 1 - (1 - alpha)^(1/n).
#pragma once

namespace sp {

// Upper critical value of chi-square(dof) at level alpha. Precondition: dof >= 1, 0<alpha<1.
double chi_square_critical(int dof, double alpha);
// Upper-tail probability P(X >= x) of chi-square(dof). Precondition: dof >= 1, x >= 0.
double chi_square_p_value(int dof, double x);
// Šidák-adjusted per-test level for n simultaneous tests at family level alpha (n >= 1).
double sidak_level(double alpha, int n);
// Two-sided standard-normal critical value: z with P(|Z| > z) = level.
double normal_two_sided_critical(double level);

}  // namespace sp
