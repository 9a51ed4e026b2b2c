// The generic WLS + gross-error tests on textbook data-reconciliation cases
// (Narasimhan & Jordache 2000, ch. 3 and 7; worked values in references.md, computed from the
// book's formulas) and the chi-square table of the NIST/SEMATECH e-Handbook §1.3.6.7.4.
#include <doctest/doctest.h>

#include "engine/stats.h"
#include "engine/wls.h"

using namespace sp;

TEST_CASE("chi-square critical values match NIST/SEMATECH e-Handbook 1.3.6.7.4") {
  struct Row {
    int dof;
    double a05, a01;
  };
  const Row rows[] = {{1, 3.841, 6.635},   {2, 5.991, 9.210},   {3, 7.815, 11.345},
                      {4, 9.488, 13.277},  {5, 11.070, 15.086}, {6, 12.592, 16.812},
                      {7, 14.067, 18.475}, {8, 15.507, 20.090}, {9, 16.919, 21.666},
                      {10, 18.307, 23.209}};
  for (const Row& r : rows) {
    CAPTURE(r.dof);
    CHECK(chi_square_critical(r.dof, 0.05) == doctest::Approx(r.a05).epsilon(2e-4));
    CHECK(chi_square_critical(r.dof, 0.01) == doctest::Approx(r.a01).epsilon(2e-4));
    // p-value at the critical value is alpha.
    CHECK(chi_square_p_value(r.dof, chi_square_critical(r.dof, 0.05)) == doctest::Approx(0.05));
  }
}

TEST_CASE("Šidák level and critical z for n = 3, alpha = 0.05") {
  // references.md (Narasimhan & Jordache ch. 7 formula): beta = 0.016952, z = 2.3877.
  const double beta = sidak_level(0.05, 3);
  CHECK(beta == doctest::Approx(0.016952).epsilon(1e-4));
  CHECK(normal_two_sided_critical(beta) == doctest::Approx(2.3877).epsilon(1e-4));
  CHECK(normal_two_sided_critical(0.05) == doctest::Approx(1.959964).epsilon(1e-6));
}

namespace {
WlsProblem linear_problem(const Eigen::MatrixXd& A, const Eigen::VectorXd& y) {
  WlsProblem p;
  p.y = y;
  p.sigma = Eigen::VectorXd::Ones(y.size());
  p.x0 = Eigen::VectorXd::Zero(A.cols());
  p.model = [A](const Eigen::VectorXd& x, Eigen::VectorXd& f, Eigen::MatrixXd& J) {
    f = A * x;
    J = A;
  };
  return p;
}
}  // namespace

TEST_CASE("three streams in series: stream 3 is named") {
  // references.md worked case: x1 = x2 = x3, y = (100, 101, 110), sigma = 1 ->
  // xhat = 103.667, gamma = 60.667 > 5.991 (dof 2), (V_r)_jj = 2/3, z = (4.491, 3.266, 7.757).
  Eigen::MatrixXd A(3, 1);
  A << 1, 1, 1;
  const WlsProblem p = linear_problem(A, Eigen::Vector3d(100, 101, 110));
  const WlsSolution s = solve_wls(p);
  CHECK(s.x(0) == doctest::Approx(103.667).epsilon(1e-5));
  CHECK(s.dof == 2);
  const auto g = global_test(s, 0.05);
  CHECK(g.chi_square == doctest::Approx(60.667).epsilon(1e-5));
  CHECK(g.critical == doctest::Approx(5.991).epsilon(1e-4));
  CHECK_FALSE(g.passed);
  const auto t = measurement_test(p, s, 0.05);
  const double want[] = {4.491, 3.266, 7.757};
  for (int j = 0; j < 3; ++j) {
    CAPTURE(j);
    CHECK(1 - s.leverage(j) == doctest::Approx(2.0 / 3));
    CHECK(t.z[static_cast<size_t>(j)] == doctest::Approx(want[j]).epsilon(1e-3));
  }
  CHECK(t.z_critical == doctest::Approx(2.3877).epsilon(1e-4));
  REQUIRE(t.worst.has_value());
  CHECK(*t.worst == 2);
  CHECK(t.tied.empty());
  // Without stream 3 the others give 100.5: the value it would need.
  CHECK(*t.needed == doctest::Approx(100.5));
}

TEST_CASE("splitter A = B + C: the test cannot locate the error") {
  // references.md: y = (50, 21, 32), sigma = 1 -> xhat = (51, 20, 31), gamma = 3.000 < 3.841,
  // every z = 1.732.
  Eigen::MatrixXd A(3, 2);
  A << 1, 1, 1, 0, 0, 1;  // unknowns B, C
  const WlsProblem p = linear_problem(A, Eigen::Vector3d(50, 21, 32));
  const WlsSolution s = solve_wls(p);
  CHECK(s.x(0) + s.x(1) == doctest::Approx(51));
  CHECK(s.x(0) == doctest::Approx(20));
  CHECK(s.x(1) == doctest::Approx(31));
  const auto g = global_test(s, 0.05);
  CHECK(g.dof == 1);
  CHECK(g.chi_square == doctest::Approx(3.0));
  CHECK(g.critical == doctest::Approx(3.841).epsilon(1e-4));
  CHECK(g.passed);
  const auto t = measurement_test(p, s, 0.05);
  for (double z : t.z) CHECK(z == doctest::Approx(1.732).epsilon(1e-3));
}

TEST_CASE("rank-deficient problem: rank, dof and estimability") {
  // y1 = a + b, y2 = a + b: only a + b is determined (common practice: identifiability).
  Eigen::MatrixXd A(2, 2);
  A << 1, 1, 1, 1;
  const WlsProblem p = linear_problem(A, Eigen::Vector2d(10, 12));
  const WlsSolution s = solve_wls(p);
  CHECK(s.rank == 1);
  CHECK(s.dof == 1);
  CHECK(s.x(0) + s.x(1) == doctest::Approx(11));
  CHECK(s.estimable(Eigen::Vector2d(1, 1)));
  CHECK_FALSE(s.estimable(Eigen::Vector2d(1, 0)));
  CHECK(s.variance(Eigen::Vector2d(1, 1)) == doctest::Approx(0.5));
  // A measurement nobody else checks: y3 = c alone is uncheckable (leverage 1).
  Eigen::MatrixXd B(3, 2);
  B << 1, 0, 1, 0, 0, 1;
  const WlsProblem q = linear_problem(B, Eigen::Vector3d(1, 3, 7));
  const WlsSolution sq = solve_wls(q);
  const auto t = measurement_test(q, sq, 0.05);
  CHECK(t.checkable == 2);
  CHECK(t.z[2] < 0);
}

TEST_CASE("QR fast path and SVD path agree on full-rank problems; near-rank cases go to the SVD") {
  // The solver takes a Householder QR when it can certify full rank and the SVD otherwise
  // (wls.cpp). A rank_tolerance of 1e-3 makes certification impossible (the bound would have to
  // exceed 1), so the same problem solved twice compares the two paths (common practice:
  // cross-check two factorizations of one least-squares problem).
  Eigen::MatrixXd A(6, 3);
  A << 1, 0, 0, 0, 1, 0, 0, 0, 1, 1, 1, 0, 0, 1, 1, 1, 0.5, 2;
  Eigen::VectorXd y(6);
  y << 10.2, 20.1, 29.7, 30.4, 49.6, 80.9;
  WlsProblem p = linear_problem(A, y);
  p.sigma << 1, 2, 1, 0.5, 1, 3;
  WlsOptions svd_only;
  svd_only.rank_tolerance = 1e-3;
  const WlsSolution q = solve_wls(p), s = solve_wls(p, svd_only);
  CHECK(q.rank == 3);
  CHECK(s.rank == 3);
  CHECK(q.null_basis.cols() == 0);
  CHECK((q.x - s.x).norm() <= 1e-12 * s.x.norm());
  CHECK((q.cov - s.cov).norm() <= 1e-12 * s.cov.norm());
  CHECK((q.leverage - s.leverage).norm() <= 1e-12);
  CHECK(q.chi_square == doctest::Approx(s.chi_square).epsilon(1e-12));
  CHECK(q.leverage.sum() == doctest::Approx(3));  // trace of the hat matrix = rank

  // Two nearly parallel columns: sigma ratio ~1e-8 is still rank 2 by the SVD's 1e-9
  // cut-off, ~1e-12 is rank 1; neither is certified by the QR bound, so both go to the SVD.
  for (const double eps : {1e-8, 1e-12}) {
    CAPTURE(eps);
    Eigen::MatrixXd B(3, 2);
    B << 1, 1, 1, 1 + eps, 1, 1 - eps;
    const WlsSolution n = solve_wls(linear_problem(B, Eigen::Vector3d(2, 2, 2)));
    CHECK(n.rank == (eps > 1e-10 ? 2 : 1));
  }
}
