// Renders reconciled sessions for `scaleproof reconcile`: shared by the file inputs
// (cmd_reconcile.cpp) and any other source of sessions (the store's --session / --all).
//
// Contract:
//  - render_reconciled: reconciles one session (engine defaults) and renders it as the text
//    summary or as the --json object. Throws sp::Error from the engine.
//  - print_reconciled: loads and prints each input in order; text summaries are separated by a
//    rule line; with json, one input prints one object and several print one array whose items
//    are {"source": ..., "result": {...}}. A failing input (its loader or the engine throws
//    sp::Error) prints "scaleproof: <message>" on `err` and the batch goes on; nothing of a
//    failed input reaches `out`. Returns the worst (highest) exit code seen, 0 when all solved.
#pragma once
#include <functional>
#include <iosfwd>
#include <string>
#include <utility>
#include <vector>

#include <nlohmann/json.hpp>

#include "core/model.h"

namespace sp::cli {

struct ReconcileOutputOptions {
  // A constructor, so callers may give a prefix ({json, colour}) without a missing-field warning.
  ReconcileOutputOptions(bool as_json = false, bool in_colour = false, std::string unit_system = {})
      : json(as_json), colour(in_colour), units(std::move(unit_system)) {}
  bool json;
  bool colour;
  std::string units;  // "us" | "metric" converts the solution (Context::units); "" keeps it
};

struct SessionInput {
  std::string source;              // shown in headings and messages ("-" for stdin)
  std::function<Session()> load;   // throws sp::Error naming the source on bad input
};

std::string render_reconciled(const Session& session, const std::string& source,
                              const ReconcileOutputOptions& options);
nlohmann::ordered_json reconciled_json(const Session& session,
                                       const ReconcileOutputOptions& options);

int print_reconciled(const std::vector<SessionInput>& inputs,
                     const ReconcileOutputOptions& options, std::ostream& out, std::ostream& err);

}  // namespace sp::cli
