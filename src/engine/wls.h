// Generic weighted (nonlinear) least squares with gross-error tests, independent of the rig.
//
// Problem: measurements y_j with standard uncertainties sigma_j (independent), a model
// f(x) with analytic Jacobian J = df/dx. Minimises sum((y - f(x))_j / sigma_j)^2 by
// Gauss-Newton with step halving. Rank-deficient problems are allowed: the solver works on the
// column-scaled weighted Jacobian through an SVD, takes minimum-norm steps, reports the numerical
// rank, and `estimable` tells whether a function of x (by its gradient) is determined by the data.
// When a Householder QR certifies full rank well inside rank_tolerance (the usual case), the
// step and covariance come from the QR instead: the same least-squares answer, much cheaper;
// anything not certified takes the SVD, so rank decisions are the SVD's.
// Tests (Narasimhan & Jordache 2000, ch. 3 and 7): global chi-square test with
// dof = m - rank; measurement test z_j = |r_j| / sqrt((V_r)_jj), V_r = V - J C J^T, against the
// Šidák-adjusted two-sided normal critical value.
// Pure and deterministic.
#pragma once
#include <Eigen/Dense>
#include <functional>
#include <optional>
#include <vector>

namespace sp {

struct WlsProblem {
  Eigen::VectorXd y;      // measurements
  Eigen::VectorXd sigma;  // standard uncertainties, all > 0
  Eigen::VectorXd x0;     // starting point
  // Fills f (size m) and J (m x n) at x.
  std::function<void(const Eigen::VectorXd& x, Eigen::VectorXd& f, Eigen::MatrixXd& J)> model;
};

struct WlsOptions {
  int max_iterations = 100;
  // Relative singular-value cut-off of the column-scaled weighted Jacobian: well above double
  // rounding (1e-16) and well below any physically meaningful weak direction of a weigh session.
  double rank_tolerance = 1e-9;
  // Convergence: largest step component in column-scaled units (fractions of the parameter's
  // own standard uncertainty scale).
  double step_tolerance = 1e-10;
};

struct WlsSolution {
  Eigen::VectorXd x, fitted, residual;  // residual = y - fitted
  Eigen::MatrixXd cov;                  // generalized inverse of J^T W J (original units)
  Eigen::VectorXd leverage;             // h_jj; (V_r)_jj = sigma_j^2 (1 - h_jj)
  double chi_square = 0;
  int rank = 0;
  int dof = 0;  // m - rank
  int iterations = 0;
  bool converged = false;
  // Internal: for estimability tests.
  Eigen::VectorXd col_scale;   // D: x = D * x_scaled
  Eigen::MatrixXd null_basis;  // n x (n - rank), in scaled coordinates (orthonormal)

  // True when the function with gradient g (df/dx at x) is determined by the data.
  bool estimable(const Eigen::VectorXd& g, double tol = 1e-7) const;
  // Variance g^T C g (meaningful only when estimable).
  double variance(const Eigen::VectorXd& g) const;
};

WlsSolution solve_wls(const WlsProblem& problem, const WlsOptions& options = {});

struct GlobalTestResult {
  double chi_square = 0;
  int dof = 0;
  double critical = 0;  // 0 when dof == 0
  double p_value = 1;
  bool passed = true;  // dof == 0: no test, reported as passed
};
GlobalTestResult global_test(const WlsSolution& s, double alpha);

struct MeasurementTestResult {
  std::vector<double> z;  // per measurement; nullopt-like: negative when uncheckable
  int checkable = 0;      // measurements with (V_r)_jj well above zero
  double beta = 0;        // Šidák level
  double z_critical = 0;
  std::optional<int> worst;  // index of the largest z, when it exceeds z_critical
  std::vector<int> tied;     // other measurements with the same z as the worst (cannot tell apart)
  std::optional<double> needed;  // value the worst measurement would need to fit
};
// (V_r)_jj below `uncheckable` * sigma_j^2 means the measurement is not checked by the others.
MeasurementTestResult measurement_test(const WlsProblem& p, const WlsSolution& s, double alpha,
                                       double uncheckable = 1e-8);

}  // namespace sp
