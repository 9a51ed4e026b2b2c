// The rig model as a weighted least-squares problem (engine-internal; used by reconcile.cpp,
// flags.cpp, compliance.cpp, target.cpp).
//
// Parameter vector x: [S0, D0, A0, T, o, L, M_1 .. M_k] in session units (bar moments in
// weight·length, e.g. lb·in), one M per non-voided tensioned pass in the order given.
// Measurements: each platform reading of each non-voided pass (unhitched: steer, drive;
// hitched/tensioned: steer, drive and trailer when present), then o and L as entered.
// WB is held fixed. Which parameters are identifiable depends on the passes present; the
// solver finds out (rank) and `derive` returns nullopt for anything not determined.
#pragma once
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "core/model.h"
#include "engine/reconcile.h"
#include "engine/result.h"
#include "engine/statics.h"
#include "engine/wls.h"

namespace sp {

enum RigIndex : int { xS0 = 0, xD0, xA0, xT, xO, xL, xM0 };

struct RigMeasurement {
  int pass = -1;         // index into session.passes; -1 for a tape length
  std::string platform;  // "steer" | "drive" | "trailer" (readings)
  std::string field;     // "rear_axle_to_ball" | "ball_to_axle" (tape lengths)
};

struct RigFit {
  const Session* session = nullptr;
  double wheelbase = 0;
  std::vector<int> tensioned;  // session pass indices of non-voided tensioned passes
  std::vector<int> hitched, unhitched;
  std::vector<RigMeasurement> meas;
  WlsProblem problem;
  WlsSolution sol;

  RigParams params(const Eigen::VectorXd& x) const;
  // Bar moment of the i-th tensioned pass (weight·length).
  static double moment(const Eigen::VectorXd& x, size_t i) {
    return x(xM0 + static_cast<Eigen::Index>(i));
  }
  // Value and standard uncertainty of f(x) at the solution by linear propagation (numeric
  // central-difference gradient); nullopt when f is not determined by the data or not finite.
  // The engine's own quantities use propagate with analytic gradients (engine/derived.h,
  // target.cpp for the bar setting); this stays as the reference the tests check them with.
  std::optional<Estimate> derive(const std::function<double(const Eigen::VectorXd&)>& f) const;
  // The same propagation from the value and gradient g = df/dx at the solution (analytic);
  // nullopt when either is not finite or f is not determined by the data.
  std::optional<Estimate> propagate(double value, const Eigen::VectorXd& g) const;
};

// Validates the session's preconditions (throws sp::Error(data_error) naming the field) and
// solves. The returned object refers to `session`, which must outlive it.
RigFit fit_rig(const Session& session, const ReconcileOptions& options);

}  // namespace sp
