// Streaming reads for whole-store commands (store.h): queries whose result stays small however
// large the store grows.
#include "store/sqlite_store.h"

namespace sp::store {

std::vector<std::string> SqliteStore::shared_tickets() {
  // UNIQUE (session_id, ticket) makes count(*) the number of sessions holding the ticket.
  // SQLite sorts for the GROUP BY in its own bounded cache (spilling to temp files), so only
  // the shared tickets reach memory here.
  std::vector<std::string> out;
  Stmt& q = stmt("SELECT ticket FROM passes GROUP BY ticket HAVING count(*) > 1 ORDER BY ticket");
  while (q.step("listing shared tickets")) out.push_back(q.text(0));
  q.reset();
  return out;
}

}  // namespace sp::store
