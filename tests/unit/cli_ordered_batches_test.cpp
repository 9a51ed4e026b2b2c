// OrderedBatches (cli/ordered_batches.h) against its reference: the plain one-thread loop
// over the same items. Whatever the worker count and batch size, the sink must see the same
// results in the same order, memory must stay within the stated bound, and a failing item
// must stop the output exactly where the loop would have stopped.
#include <doctest/doctest.h>

#include <algorithm>
#include <stdexcept>
#include <string>
#include <vector>

#include "cli/ordered_batches.h"

using sp::cli::OrderedBatches;

namespace {

struct Out {
  std::vector<long long> values;
};

long long f(int x) { return 3LL * x * x + 1; }  // any pure function of the item

// The reference: the one-thread loop, stopping (exclusive) at `fail_at` when it is >= 0.
std::vector<long long> reference(int count, int fail_at) {
  std::vector<long long> want;
  for (int i = 0; i < count && i != fail_at; ++i) want.push_back(f(i));
  return want;
}

struct Run {
  std::vector<long long> got;
  bool threw = false;
  std::string message;
  std::size_t threads = 0;
  std::size_t max_unsunk = 0;  // items pushed but not yet sunk, at most
};

Run run(unsigned workers, std::size_t batch, std::size_t in_flight, int count, int fail_at) {
  Run r;
  std::size_t sunk = 0;
  OrderedBatches<int, Out> pipe(
      workers, batch, in_flight,
      [fail_at](const std::vector<int>& items, Out& out) {
        for (int x : items) {
          if (x == fail_at) throw std::runtime_error("item " + std::to_string(x));
          out.values.push_back(f(x));
        }
      },
      [&](Out& out) {
        r.got.insert(r.got.end(), out.values.begin(), out.values.end());
        sunk += out.values.size();
      });
  try {
    for (int i = 0; i < count; ++i) {
      pipe.push(i);
      r.max_unsunk = std::max(r.max_unsunk, static_cast<std::size_t>(i + 1) - sunk);
    }
    pipe.finish();
  } catch (const std::runtime_error& e) {
    r.threw = true;
    r.message = e.what();
  }
  r.threads = pipe.threads_started();
  return r;
}

}  // namespace

TEST_CASE("ordered batches give the one-thread loop's results in order") {
  for (unsigned workers : {1u, 2u, 3u}) {
    for (std::size_t batch : {std::size_t{1}, std::size_t{7}, std::size_t{64}}) {
      for (int count : {0, 1, 6, 7, 8, 63, 64, 65, 1000}) {
        CAPTURE(workers);
        CAPTURE(batch);
        CAPTURE(count);
        Run r = run(workers, batch, 2 * workers, count, -1);
        CHECK_FALSE(r.threw);
        CHECK(r.got == reference(count, -1));
        // Bound from the contract: the batch being filled plus max_in_flight batches.
        CHECK(r.max_unsunk <= (2 * workers + 1) * batch);
      }
    }
  }
}

TEST_CASE("ordered batches start no thread for one thread or a run shorter than a batch") {
  CHECK(run(1, 64, 2, 1000, -1).threads == 0);
  CHECK(run(2, 64, 4, 63, -1).threads == 0);
  CHECK(run(2, 64, 4, 64, -1).threads == 2);
}

TEST_CASE("a failing item stops the output where the one-thread loop stops") {
  for (unsigned workers : {1u, 2u, 3u}) {
    for (std::size_t batch : {std::size_t{1}, std::size_t{7}}) {
      for (int fail_at : {0, 1, 6, 7, 13, 99, 499}) {
        CAPTURE(workers);
        CAPTURE(batch);
        CAPTURE(fail_at);
        Run r = run(workers, batch, 2 * workers, 500, fail_at);
        CHECK(r.threw);
        CHECK(r.message == "item " + std::to_string(fail_at));
        CHECK(r.got == reference(500, fail_at));
      }
    }
  }
}

TEST_CASE("finish after a failure sinks nothing more") {
  std::vector<int> sunk_batches;
  OrderedBatches<int, Out> pipe(
      2, 4, 4,
      [](const std::vector<int>& items, Out& out) {
        for (int x : items) {
          if (x == 5) throw std::runtime_error("five");
          out.values.push_back(x);
        }
      },
      [&](Out& out) { sunk_batches.push_back(static_cast<int>(out.values.size())); });
  bool threw = false;
  try {
    for (int i = 0; i < 100; ++i) pipe.push(i);
    pipe.finish();
  } catch (const std::runtime_error&) {
    threw = true;
  }
  CHECK(threw);
  pipe.finish();  // as the producer's cleanup path calls it
  // Batch [0..3] complete, then [4] of the batch holding the failure, then nothing.
  CHECK(sunk_batches == std::vector<int>{4, 1});
}

TEST_CASE("a throwing sink ends the run: nothing more is sunk") {
  for (unsigned workers : {1u, 2u}) {
    CAPTURE(workers);
    int sinks = 0;
    OrderedBatches<int, Out> pipe(
        workers, 4, 4, [](const std::vector<int>& items, Out& out) {
          for (int x : items) out.values.push_back(x);
        },
        [&](Out&) {
          if (++sinks == 2) throw std::runtime_error("output failed");
        });
    bool threw = false;
    try {
      for (int i = 0; i < 100; ++i) pipe.push(i);
      pipe.finish();
    } catch (const std::runtime_error&) {
      threw = true;
    }
    CHECK(threw);
    pipe.finish();
    CHECK(sinks == 2);
  }
}
