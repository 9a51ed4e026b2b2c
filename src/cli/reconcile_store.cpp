#include "cli/reconcile_store.h"

#include <ostream>
#include <string>

#include <fmt/format.h>

#include "cli/reconcile_output.h"
#include "cli/store_cli.h"
#include "core/error.h"
#include "engine/reconcile.h"
#include "format/result_json.h"

namespace sp::cli {

namespace {

std::string summary_line(long long id, const ReconcileResult& r) {
  auto wu = to_string(r.units.weight);
  std::string line = fmt::format("session {}:", id);
  if (r.tongue_load) {
    line += fmt::format(" tongue {:.0f} ± {:.0f} {}", r.tongue_load->value, 2 * r.tongue_load->u, wu);
    if (r.tongue_percent) line += fmt::format(" ({:.1f} %)", r.tongue_percent->value);
  } else {
    line += " tongue unsolved";
  }
  if (r.target && r.target->bar_moment) {
    line += fmt::format(", moment for FALR {:.0f} %: {:.0f} {}", r.target->falr,
                        r.target->bar_moment->value, r.moment_unit);
  }
  if (r.fit) line += r.fit->passed ? ", fit ok" : ", fit FAILED";
  line += fmt::format(", {} flag{}", r.flags.size(), r.flags.size() == 1 ? "" : "s");
  return line + "\n";
}

}  // namespace

int reconcile_from_store(const Context& ctx, const std::vector<long long>& sessions, bool all,
                         bool json, std::ostream& out, std::ostream& err) {
  std::shared_ptr<store::Store> st = open_store(ctx);
  store::Txn txn(*st, store::Txn::read);  // one consistent snapshot for the whole run
  int worst = 0;
  if (!all) {
    std::vector<SessionInput> inputs;
    for (long long id : sessions) {
      inputs.push_back({fmt::format("session {}", id), [st, id] { return st->load_session(id); }});
    }
    worst = print_reconciled(inputs, ReconcileOutputOptions{json, ctx.colour}, out, err);
  } else {
    std::string buf;  // one JSON line, reused: no JSON tree per session
    st->for_each_session([&](const Session& s) {
      long long id = s.session_id.value_or(0);
      // A bulk audit reports every session: one the engine refuses must not hide the rest.
      // Like print_reconciled, this is a batch boundary that catches sp::Error and goes on.
      try {
        ReconcileResult r = reconcile(s);
        if (json) {
          // Same bytes as {"session": id, "result": result_to_json(r)}.dump().
          buf.assign("{\"session\":");
          buf += std::to_string(id);
          buf += ",\"result\":";
          append_result_json(buf, r);
          buf += "}\n";
          out << buf;
        } else {
          out << summary_line(id, r);
        }
      } catch (const Error& e) {
        if (json) {
          nlohmann::ordered_json line;
          line["session"] = id;
          line["error"] = e.what();
          out << line.dump() << "\n";
        }
        err << "scaleproof: session " << id << ": " << e.what() << "\n";
        worst = std::max(worst, static_cast<int>(e.code()));
      }
    });
  }
  txn.commit();
  return worst;
}

}  // namespace sp::cli
