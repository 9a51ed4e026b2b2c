// Engine-internal pieces of reconcile(): each fills its part of the result from a solved RigFit.
#pragma once
#include <optional>

#include "engine/reconcile.h"
#include "engine/result.h"
#include "engine/rig_fit.h"

namespace sp {

// The configuration the rig travels in: the last non-voided tensioned pass in the order given
// (slot = its index in RigFit::tensioned), else the last hitched pass (slot = -1).
struct TravelConfig {
  int pass = -1;
  int slot = -1;
};
std::optional<TravelConfig> travel_config(const RigFit& fit);

struct Linearized;
// The Estimate of a derived quantity (engine/derived.h): RigFit::propagate of its gradient.
std::optional<Estimate> estimate(const RigFit& fit, const Linearized& q);

// Fitted (steer, drive, trailer) of a hitched configuration at moment slot (-1: bars slack).
std::optional<Estimate> fitted_load(const RigFit& fit, int slot, int platform /*0,1,2*/);

// Text helpers for messages: "1234 lb", "1234 ± 12 lb".
std::string fmt_weight(double v, WeightUnit u);
std::string fmt_estimate(const Estimate& e, std::string_view unit);

// Fit statistics, per-measurement table, inconsistent-reading / geometry-mismatch. Returns
// the measurement a failed fit names when it is the only one named (no tie): the candidate for
// the if_excluded re-solve, with its entered value.
std::optional<ExcludedMeasurement> add_fit_results(const RigFit& fit, const ReconcileOptions& opt,
                                                   ReconcileResult& out);
// off-division, gross-mismatch (need only the entered readings).
void add_reading_flags(const Session& s, ReconcileResult& out);
// over-restored, under-restored, rear-unloaded, tongue-percent. Needs out.tensioned, out.target.
void add_load_flags(const RigFit& fit, const ReconcileOptions& opt, ReconcileResult& out);
// Ratings of the travel configuration. Returns how many ratings the session gives whose value
// the passes do not solve (each also gets an `unsolved` line).
int add_compliance(const RigFit& fit, ReconcileResult& out);
// FALR target, its bar moment, predicted loads, and the setting fit.
void add_target(const RigFit& fit, ReconcileResult& out);

}  // namespace sp
