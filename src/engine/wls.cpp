#include "engine/wls.h"

#include <algorithm>
#include <cmath>

#include "core/error.h"
#include "engine/stats.h"

namespace sp {
namespace {

// The QR fast path is taken when a lower bound on sigma_min / sigma_max of the scaled Jacobian
// exceeds this multiple of rank_tolerance. The SVD path counts a singular value when it exceeds
// rank_tolerance times the largest; the bound used, 1 / (||R||_F ||R^-1||_F), understates the
// true ratio by at most a factor n (sqrt(n) from each Frobenius norm), so 10^3 leaves a margin
// of 10^3 / n for that and for the SVD's own rounding. Anything in between goes to the SVD.
constexpr double kCertifiedMargin = 1e3;

// Model value and Jacobian at one point; the buffers are sized once per solve.
struct Linearisation {
  Linearisation(Eigen::Index m, Eigen::Index n) : f(m), J(m, n) {}
  void evaluate(const WlsProblem& p, const Eigen::VectorXd& x) {
    f.resize(p.y.size());
    J.resize(p.y.size(), x.size());
    p.model(x, f, J);
  }
  Eigen::VectorXd f;
  Eigen::MatrixXd J;
};

double chi_square_of(const WlsProblem& p, const Eigen::VectorXd& f) {
  return ((p.y - f).array() / p.sigma.array()).square().sum();
}

// Js = diag(w) J D with the column scale D such that each column of the weighted Jacobian has
// unit norm (zero columns: 1).
void scaled_jacobian(const Eigen::MatrixXd& J, const Eigen::ArrayXd& w, Eigen::MatrixXd& Js,
                     Eigen::VectorXd& D) {
  Js.noalias() = w.matrix().asDiagonal() * J;
  for (Eigen::Index k = 0; k < Js.cols(); ++k) {
    const double n = Js.col(k).norm();
    D(k) = n > 0 ? 1.0 / n : 1.0;
    Js.col(k) *= D(k);
  }
}

int numerical_rank(const Eigen::VectorXd& sv, double tol) {
  if (sv.size() == 0 || sv(0) <= 0) return 0;
  int r = 0;
  for (Eigen::Index k = 0; k < sv.size(); ++k)
    if (sv(k) > tol * sv(0)) ++r;
  return r;
}

// Linear algebra of one solve. A Householder QR of the scaled Jacobian serves every problem
// that is certified full rank (the usual weigh session); the others take the rank-revealing
// SVD with minimum-norm steps, so rank, unsolved quantities and estimability are decided
// exactly as the SVD decides them. For a full-rank problem both give the same least-squares
// step and covariance (up to rounding). The QR is the textbook Householder QR (Golub & Van
// Loan, Matrix Computations, ch. 5; from memory), written out because the matrices are small
// (about 13 x 8) and Eigen's general blocked code costs more in set-up than in arithmetic.
class Solver {
 public:
  Solver(Eigen::Index m, Eigen::Index n) : a_(m, n), beta_(n), tau_(n), r_inv_(n, n), qtr_(m) {}

  // Gauss-Newton step in scaled coordinates: the minimum-norm least-squares solution of
  // Js ds = rw over the numerical rank.
  void step(const Eigen::MatrixXd& Js, const Eigen::VectorXd& rw, double tol,
            Eigen::VectorXd& ds) {
    const Eigen::Index n = Js.cols();
    if (full_rank(Js, tol)) {
      qtr_ = rw;
      apply_qt(qtr_);
      for (Eigen::Index k = n - 1; k >= 0; --k) {  // back substitution R ds = (Q^T rw)(0:n)
        double v = qtr_(k);
        for (Eigen::Index j = k + 1; j < n; ++j) v -= a_(k, j) * ds(j);
        ds(k) = v / beta_(k);
      }
      return;
    }
    const Eigen::JacobiSVD<Eigen::MatrixXd> svd(Js, Eigen::ComputeThinU | Eigen::ComputeFullV);
    const int r = numerical_rank(svd.singularValues(), tol);
    ds.setZero();
    for (int k = 0; k < r; ++k)
      ds += svd.matrixV().col(k) * (svd.matrixU().col(k).dot(rw) / svd.singularValues()(k));
  }

  // rank, cov (still in scaled coordinates: the caller applies D), null_basis and leverage.
  void statistics(const Eigen::MatrixXd& Js, double tol, WlsSolution& s) {
    const Eigen::Index n = Js.cols();
    if (full_rank(Js, tol)) {
      s.rank = static_cast<int>(n);
      s.cov.noalias() = r_inv_ * r_inv_.transpose();
      s.null_basis.resize(n, 0);
      s.leverage = (Js * r_inv_).rowwise().squaredNorm();  // rows of the thin Q
      return;
    }
    const Eigen::JacobiSVD<Eigen::MatrixXd> svd(Js, Eigen::ComputeThinU | Eigen::ComputeFullV);
    const Eigen::VectorXd& sv = svd.singularValues();
    s.rank = numerical_rank(sv, tol);
    s.cov = Eigen::MatrixXd::Zero(n, n);
    for (int k = 0; k < s.rank; ++k)
      s.cov += svd.matrixV().col(k) * svd.matrixV().col(k).transpose() / (sv(k) * sv(k));
    s.null_basis = svd.matrixV().rightCols(n - s.rank);
    s.leverage = svd.matrixU().leftCols(s.rank).rowwise().squaredNorm();
  }

 private:
  // Factors Js = Q R (R: beta_ on the diagonal, a_ above it; reflector k in a_(k:m, k)) and
  // certifies full column rank by sigma_min/sigma_max >= 1/(||R||_F ||R^-1||_F) (R has the
  // singular values of Js). Fills r_inv_ when it returns true.
  bool full_rank(const Eigen::MatrixXd& Js, double tol) {
    const Eigen::Index m = Js.rows(), n = Js.cols();
    if (n == 0 || m < n) return false;
    a_ = Js;
    double r_sq = 0;  // ||R||_F^2
    // Plain loops over the columns (contiguous, column-major): for these sizes they beat
    // Eigen's segment expressions, whose alignment set-up costs more than the arithmetic.
    double* const a = a_.data();
    for (Eigen::Index k = 0; k < n; ++k) {
      double* const v = a + k * m + k;  // a_(k:m, k)
      const Eigen::Index len = m - k;
      double alpha_sq = 0;
      for (Eigen::Index i = 0; i < len; ++i) alpha_sq += v[i] * v[i];
      const double alpha = std::sqrt(alpha_sq);
      if (!(alpha > 0) || !std::isfinite(alpha)) return false;  // dependent column: SVD decides
      const double x0 = v[0];
      const double beta = x0 > 0 ? -alpha : alpha;  // sign avoids cancellation in v(0)
      v[0] = x0 - beta;                             // reflector v = x - beta e1
      const double tau = 1.0 / (alpha * (alpha + std::fabs(x0)));  // 2 / (v^T v)
      for (Eigen::Index j = k + 1; j < n; ++j) {
        double* const c = a + j * m + k;  // a_(k:m, j)
        double dot = 0;
        for (Eigen::Index i = 0; i < len; ++i) dot += v[i] * c[i];
        const double f = tau * dot;
        for (Eigen::Index i = 0; i < len; ++i) c[i] -= f * v[i];
        r_sq += c[0] * c[0];
      }
      tau_(k) = tau;
      beta_(k) = beta;
      r_sq += beta * beta;
    }
    // R^-1 column by column (upper triangular).
    r_inv_.setZero();
    for (Eigen::Index c = 0; c < n; ++c) {
      for (Eigen::Index i = c; i >= 0; --i) {
        double v = i == c ? 1.0 : 0.0;
        for (Eigen::Index j = i + 1; j <= c; ++j) v -= a_(i, j) * r_inv_(j, c);
        r_inv_(i, c) = v / beta_(i);
      }
    }
    const double bound = 1.0 / (std::sqrt(r_sq) * r_inv_.norm());
    return std::isfinite(bound) && bound > kCertifiedMargin * tol;
  }

  // b <- Q^T b with the reflectors of the last full_rank().
  void apply_qt(Eigen::VectorXd& b) const {
    const Eigen::Index m = a_.rows(), n = a_.cols();
    for (Eigen::Index k = 0; k < n; ++k) {
      const double* const v = a_.data() + k * m + k;
      double* const t = b.data() + k;
      double dot = 0;
      for (Eigen::Index i = 0; i < m - k; ++i) dot += v[i] * t[i];
      const double f = tau_(k) * dot;
      for (Eigen::Index i = 0; i < m - k; ++i) t[i] -= f * v[i];
    }
  }

  Eigen::MatrixXd a_;
  Eigen::VectorXd beta_, tau_;
  Eigen::MatrixXd r_inv_;
  Eigen::VectorXd qtr_;
};

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
  // Every buffer is allocated once per solve; the iterations only write into them.
  Linearisation lin(m, n), trial(m, n);
  lin.evaluate(p, s.x);
  double chi = chi_square_of(p, lin.f);
  Eigen::MatrixXd Js(m, n);
  Eigen::VectorXd D(n), ds(n), rw(m), xt(n);
  Solver solver(m, n);
  for (int it = 0; it < o.max_iterations; ++it) {
    s.iterations = it + 1;
    scaled_jacobian(lin.J, w, Js, D);
    rw = ((p.y - lin.f).array() * w).matrix();
    solver.step(Js, rw, o.rank_tolerance, ds);
    // Step halving: accept the first fraction that does not raise chi-square.
    double t = 1.0;
    bool accepted = false;
    for (int h = 0; h < 40; ++h, t *= 0.5) {
      xt = s.x + t * (D.asDiagonal() * ds);
      trial.evaluate(p, xt);
      const double ct = chi_square_of(p, trial.f);
      if (std::isfinite(ct) && ct <= chi * (1 + 1e-12) + 1e-300) {
        s.x = xt;
        std::swap(lin, trial);
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
  scaled_jacobian(lin.J, w, Js, D);
  s.col_scale = D;
  solver.statistics(Js, o.rank_tolerance, s);
  s.dof = static_cast<int>(m) - s.rank;
  s.cov = s.col_scale.asDiagonal() * s.cov * s.col_scale.asDiagonal();
  s.fitted = lin.f;
  s.residual = p.y - lin.f;
  s.chi_square = chi;
  return s;
}

bool WlsSolution::estimable(const Eigen::VectorXd& g, double tol) const {
  if (null_basis.cols() == 0) return true;  // full rank: everything is determined
  const Eigen::VectorXd gs = col_scale.asDiagonal() * g;  // df/dx_scaled
  const double norm = gs.norm();
  if (norm == 0) return true;
  return (null_basis.transpose() * gs).norm() <= tol * norm;
}

double WlsSolution::variance(const Eigen::VectorXd& g) const {
  // g^T C g written out: the vectors are short and mostly zero (a derived quantity depends
  // on a few parameters), where a general matrix-vector product costs more in set-up.
  const Eigen::Index n = g.size();
  double v = 0;
  for (Eigen::Index j = 0; j < n; ++j) {
    if (g(j) == 0) continue;
    double cg = 0;
    for (Eigen::Index i = 0; i < n; ++i) cg += cov(i, j) * g(i);
    v += g(j) * cg;
  }
  return std::max(0.0, v);
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
