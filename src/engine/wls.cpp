#include "engine/wls.h"

#include <algorithm>
#include <cmath>

#include "core/error.h"
#include "engine/stats.h"

namespace sp {
namespace {

struct Linearisation {
  Eigen::VectorXd f;
  Eigen::MatrixXd J;
};

Linearisation evaluate(const WlsProblem& p, const Eigen::VectorXd& x) {
  Linearisation l;
  l.f.resize(p.y.size());
  l.J.resize(p.y.size(), x.size());
  p.model(x, l.f, l.J);
  return l;
}

double chi_square_of(const WlsProblem& p, const Eigen::VectorXd& f) {
  return ((p.y - f).array() / p.sigma.array()).square().sum();
}

// Column scale D so that each column of the weighted Jacobian has unit norm (zero columns: 1).
Eigen::VectorXd column_scale(const Eigen::MatrixXd& Jw) {
  Eigen::VectorXd d(Jw.cols());
  for (Eigen::Index k = 0; k < Jw.cols(); ++k) {
    const double n = Jw.col(k).norm();
    d(k) = n > 0 ? 1.0 / n : 1.0;
  }
  return d;
}

int numerical_rank(const Eigen::VectorXd& sv, double tol) {
  if (sv.size() == 0 || sv(0) <= 0) return 0;
  int r = 0;
  for (Eigen::Index k = 0; k < sv.size(); ++k)
    if (sv(k) > tol * sv(0)) ++r;
  return r;
}

}  // namespace

WlsSolution solve_wls(const WlsProblem& p, const WlsOptions& o) {
  const Eigen::Index m = p.y.size();
  const Eigen::Index n = p.x0.size();
  if (p.sigma.size() != m) throw Error(ExitCode::internal, "wls: sigma and y differ in size");
  for (Eigen::Index j = 0; j < m; ++j)
    if (!(p.sigma(j) > 0) || !std::isfinite(p.sigma(j)))
      throw Error(ExitCode::internal, "wls: every sigma must be finite and > 0");
  const Eigen::ArrayXd w = p.sigma.array().inverse();

  WlsSolution s;
  s.x = p.x0;
  Linearisation lin = evaluate(p, s.x);
  double chi = chi_square_of(p, lin.f);
  for (int it = 0; it < o.max_iterations; ++it) {
    s.iterations = it + 1;
    const Eigen::MatrixXd Jw = w.matrix().asDiagonal() * lin.J;
    const Eigen::VectorXd D = column_scale(Jw);
    const Eigen::MatrixXd Js = Jw * D.asDiagonal();
    Eigen::JacobiSVD<Eigen::MatrixXd> svd(Js, Eigen::ComputeThinU | Eigen::ComputeFullV);
    const int r = numerical_rank(svd.singularValues(), o.rank_tolerance);
    const Eigen::VectorXd rw = ((p.y - lin.f).array() * w).matrix();
    Eigen::VectorXd ds = Eigen::VectorXd::Zero(n);
    for (int k = 0; k < r; ++k)
      ds += svd.matrixV().col(k) * (svd.matrixU().col(k).dot(rw) / svd.singularValues()(k));
    // Step halving: accept the first fraction that does not raise chi-square.
    double t = 1.0;
    bool accepted = false;
    for (int h = 0; h < 40; ++h, t *= 0.5) {
      const Eigen::VectorXd xt = s.x + t * (D.asDiagonal() * ds);
      Linearisation lt = evaluate(p, xt);
      const double ct = chi_square_of(p, lt.f);
      if (std::isfinite(ct) && ct <= chi * (1 + 1e-12) + 1e-300) {
        s.x = xt;
        lin = std::move(lt);
        chi = ct;
        accepted = true;
        break;
      }
    }
    if (!accepted || t * ds.lpNorm<Eigen::Infinity>() < o.step_tolerance) {
      s.converged = true;
      break;
    }
  }

  // Statistics at the solution.
  const Eigen::MatrixXd Jw = w.matrix().asDiagonal() * lin.J;
  s.col_scale = column_scale(Jw);
  const Eigen::MatrixXd Js = Jw * s.col_scale.asDiagonal();
  Eigen::JacobiSVD<Eigen::MatrixXd> svd(Js, Eigen::ComputeThinU | Eigen::ComputeFullV);
  const Eigen::VectorXd& sv = svd.singularValues();
  s.rank = numerical_rank(sv, o.rank_tolerance);
  s.dof = static_cast<int>(m) - s.rank;
  Eigen::MatrixXd Cs = Eigen::MatrixXd::Zero(n, n);
  for (int k = 0; k < s.rank; ++k)
    Cs += svd.matrixV().col(k) * svd.matrixV().col(k).transpose() / (sv(k) * sv(k));
  s.cov = s.col_scale.asDiagonal() * Cs * s.col_scale.asDiagonal();
  s.null_basis = svd.matrixV().rightCols(n - s.rank);
  s.leverage = svd.matrixU().leftCols(s.rank).rowwise().squaredNorm();
  s.fitted = lin.f;
  s.residual = p.y - lin.f;
  s.chi_square = chi;
  return s;
}

bool WlsSolution::estimable(const Eigen::VectorXd& g, double tol) const {
  const Eigen::VectorXd gs = col_scale.asDiagonal() * g;  // df/dx_scaled
  const double norm = gs.norm();
  if (norm == 0 || null_basis.cols() == 0) return true;
  return (null_basis.transpose() * gs).norm() <= tol * norm;
}

double WlsSolution::variance(const Eigen::VectorXd& g) const {
  return std::max(0.0, g.dot(cov * g));
}

GlobalTestResult global_test(const WlsSolution& s, double alpha) {
  GlobalTestResult g;
  g.chi_square = s.chi_square;
  g.dof = s.dof;
  if (s.dof <= 0) {
    g.dof = 0;
    return g;  // no redundancy: nothing to test
  }
  g.critical = chi_square_critical(s.dof, alpha);
  g.p_value = chi_square_p_value(s.dof, s.chi_square);
  g.passed = s.chi_square <= g.critical;
  return g;
}

MeasurementTestResult measurement_test(const WlsProblem& p, const WlsSolution& s, double alpha,
                                       double uncheckable) {
  MeasurementTestResult t;
  const Eigen::Index m = p.y.size();
  t.z.assign(static_cast<size_t>(m), -1.0);
  for (Eigen::Index j = 0; j < m; ++j) {
    const double one_minus_h = 1.0 - s.leverage(j);
    if (one_minus_h <= uncheckable) continue;  // (V_r)_jj ~ 0: not checked by the others
    t.z[static_cast<size_t>(j)] = std::fabs(s.residual(j)) / (p.sigma(j) * std::sqrt(one_minus_h));
    ++t.checkable;
  }
  if (t.checkable == 0) return t;
  t.beta = sidak_level(alpha, t.checkable);
  t.z_critical = normal_two_sided_critical(t.beta);
  int best = -1;
  for (int j = 0; j < static_cast<int>(m); ++j)
    if (t.z[static_cast<size_t>(j)] >= 0 &&
        (best < 0 || t.z[static_cast<size_t>(j)] > t.z[static_cast<size_t>(best)] * (1 + 1e-9)))
      best = j;
  if (best < 0 || t.z[static_cast<size_t>(best)] <= t.z_critical) return t;
  t.worst = best;
  const double zb = t.z[static_cast<size_t>(best)];
  for (int j = 0; j < static_cast<int>(m); ++j)
    if (j != best && std::fabs(t.z[static_cast<size_t>(j)] - zb) <= 1e-6 * zb) t.tied.push_back(j);
  // Deleted residual (linearised; exact for a linear model): y_j - yhat_j(without j)
  // = r_j / (1 - h_jj), so the value that would fit is y_j - r_j / (1 - h_jj).
  t.needed = p.y(best) - s.residual(best) / (1.0 - s.leverage(best));
  return t;
}

}  // namespace sp
