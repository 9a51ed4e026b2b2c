#include "cli/reconcile_store.h"

#include <algorithm>
#include <ostream>
#include <string>
#include <thread>
#include <utility>

#include <fmt/format.h>

#include "cli/ordered_batches.h"
#include "cli/reconcile_output.h"
#include "cli/store_cli.h"
#include "core/error.h"
#include "engine/reconcile.h"
#include "format/result_json.h"

namespace sp::cli {

namespace {

// Sessions per batch handed to a worker: large enough that the hand-over (a lock, a wake-up)
// is noise beside ~250 engine solves, small enough that a batch's sessions and rendered
// lines stay well under a MiB. Chosen, not tuned.
constexpr std::size_t kBatchSessions = 256;
// Batches alive at once per worker (queued, being solved, or waiting to be written): two keeps
// each worker busy while the reader fills the next one, and bounds memory to a few MiB.
constexpr std::size_t kInFlightPerWorker = 2;
// More workers than this gains nothing here: the one reader thread becomes the limit.
constexpr unsigned kMaxWorkers = 8;
// Bytes reserved per session in a batch's output, so the buffer is not regrown line by line:
// about one JSON line of a four-pass session (~2.4 KB in the bench data), one summary line.
constexpr std::size_t kJsonLineBytes = 2560;
constexpr std::size_t kTextLineBytes = 128;

std::string summary_line(long long id, const ReconcileResult& r) {
  auto wu = to_string(r.units.weight);
  // The verdict leads, as on every surface (engine/result.h).
  std::string line = fmt::format("session {}: {};", id, to_string(r.verdict));
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

// What a batch of sessions prints: `out` in order, with each refused session's message due on
// the error stream after the first `at` bytes of `out` (where the one-thread loop wrote it).
struct Rendered {
  struct Message {
    std::size_t at;
    std::string text;
  };
  std::string out;
  std::vector<Message> err;
  int worst = 0;
};

// Appends one session's line (and message) to `into`. A session the engine refuses
// (sp::Error) is reported and the run goes on; anything else propagates, leaving `into`
// exactly as it was before this session.
void render_session(const Session& s, bool json, Rendered& into) {
  const long long id = s.session_id.value_or(0);
  const std::size_t mark = into.out.size();
  struct Rollback {  // a session's half-written line never reaches the output
    std::string& out;
    std::size_t mark;
    bool keep = false;
    ~Rollback() {
      if (!keep) out.resize(mark);
    }
  } rollback{into.out, mark};
  // A bulk run reports every session: one the engine refuses must not hide the rest. Like
  // print_reconciled, this is a batch boundary that catches sp::Error and goes on.
  try {
    ReconcileResult r = reconcile(s);
    if (json) {
      // Same bytes as {"session": id, "result": result_to_json(r)}.dump().
      into.out += "{\"session\":";
      into.out += std::to_string(id);
      into.out += ",\"result\":";
      append_result_json(into.out, r);
      into.out += "}\n";
    } else {
      into.out += summary_line(id, r);
    }
  } catch (const Error& e) {
    into.out.resize(mark);
    if (json) {
      nlohmann::ordered_json line;
      line["session"] = id;
      line["error"] = e.what();
      into.out += line.dump();
      into.out += "\n";
    }
    into.err.push_back(
        {into.out.size(), fmt::format("scaleproof: session {}: {}\n", id, e.what())});
    into.worst = std::max(into.worst, static_cast<int>(e.code()));
  }
  rollback.keep = true;
}

// Writes a batch as the one-thread loop would have: each message right after the lines before
// it (std::cerr is tied to std::cout, so a terminal sees them interleaved the same way).
void write_rendered(const Rendered& r, std::ostream& out, std::ostream& err) {
  std::size_t from = 0;
  for (const Rendered::Message& m : r.err) {
    out.write(r.out.data() + from, static_cast<std::streamsize>(m.at - from));
    err << m.text;
    from = m.at;
  }
  out.write(r.out.data() + from, static_cast<std::streamsize>(r.out.size() - from));
}

unsigned worker_count(unsigned jobs) {
  if (jobs == 0) jobs = std::thread::hardware_concurrency();  // 0 when unknown: one thread
  return std::clamp(jobs, 1u, kMaxWorkers);
}

int reconcile_all(store::Store& st, bool json, unsigned jobs, std::ostream& out,
                  std::ostream& err) {
  const unsigned workers = worker_count(jobs);
  int worst = 0;
  // One thread: a batch of one session, written as soon as it is solved (a person watching
  // sees each line at once). Several: the store is read on this thread (its connection is
  // not shared), batches are solved and rendered on the workers and written here in order.
  OrderedBatches<Session, Rendered> pipe(
      workers, workers == 1 ? 1 : kBatchSessions, kInFlightPerWorker * workers,
      [json](const std::vector<Session>& batch, Rendered& r) {
        r.out.reserve(batch.size() * (json ? kJsonLineBytes : kTextLineBytes));
        for (const Session& s : batch) render_session(s, json, r);
      },
      [&](Rendered& r) {
        write_rendered(r, out, err);
        worst = std::max(worst, r.worst);
      });
  try {
    st.for_each_session([&pipe](const Session& s) { pipe.push(s); });
  } catch (...) {
    // The store failed after the sessions already read: print those first, as the one-thread
    // loop had, then let the error go on to main (an earlier session's failure wins).
    pipe.finish();
    throw;
  }
  pipe.finish();
  return worst;
}

}  // namespace

int reconcile_from_store(const Context& ctx, const std::vector<long long>& sessions, bool all,
                         bool json, unsigned jobs, std::ostream& out, std::ostream& err) {
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
    worst = reconcile_all(*st, json, jobs, out, err);
  }
  txn.commit();
  return worst;
}

}  // namespace sp::cli
