#include "cli/reconcile_output.h"

#include <ostream>

#include "core/error.h"
#include "engine/reconcile.h"
#include "format/result_json.h"
#include "format/result_text.h"
#include "format/result_units.h"

namespace sp::cli {

namespace {

// --units solves the session converted to the target system, so every number, also those in
// flag messages and the verdict reason, is in the units asked for (format/result_units.h).
ReconcileResult solve(const Session& session, const ReconcileOutputOptions& options) {
  if (auto system = parse_unit_system(options.units))
    return reconcile(convert_session_units(session, *system));
  return reconcile(session);
}

}  // namespace

nlohmann::ordered_json reconciled_json(const Session& session,
                                       const ReconcileOutputOptions& options) {
  return result_to_json(solve(session, options));
}

std::string render_reconciled(const Session& session, const std::string& source,
                              const ReconcileOutputOptions& options) {
  if (options.json) return reconciled_json(session, options).dump(2) + "\n";
  return render_result_text(session, solve(session, options), TextOptions{source, options.colour});
}

int print_reconciled(const std::vector<SessionInput>& inputs, const ReconcileOutputOptions& options,
                     std::ostream& out, std::ostream& err) {
  int worst = 0;
  const bool array = options.json && inputs.size() > 1;
  nlohmann::ordered_json items = nlohmann::ordered_json::array();
  bool first_text = true;
  for (const SessionInput& in : inputs) {
    // A batch reports every input: one bad file must not hide the others' results. This is
    // the one place besides main() that catches sp::Error; it prints it exactly as main would.
    try {
      const Session s = in.load();
      if (array) {
        nlohmann::ordered_json item;
        item["source"] = in.source;
        item["result"] = reconciled_json(s, options);
        items.push_back(std::move(item));
      } else {
        const std::string text = render_reconciled(s, in.source, options);
        if (!options.json && !first_text) out << "\n" << std::string(96, '=') << "\n\n";
        out << text;
        first_text = false;
      }
    } catch (const Error& e) {
      err << "scaleproof: " << e.what() << "\n";
      worst = std::max(worst, static_cast<int>(e.code()));
    }
  }
  if (array) out << items.dump(2) << "\n";
  return worst;
}

}  // namespace sp::cli
