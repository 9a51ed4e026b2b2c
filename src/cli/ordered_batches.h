// OrderedBatches: a bounded, order-keeping pipeline for whole-store commands. The calling
// thread produces items (e.g. sessions streamed off its SQLite connection) and consumes the
// results; worker threads only run `work`. Used by `reconcile --all` (cli/reconcile_store.cpp).
//
// Contract:
//  - push(item) groups items into batches of `batch_size`. A full batch goes to a worker; the
//    calling thread then hands every finished batch, strictly in push order, to `sink`. When
//    `max_in_flight` batches are unfinished, push blocks until the oldest is done and sunk, so
//    memory is bounded by max_in_flight * batch_size items and results, whatever the count.
//  - Threads start only when the first batch is full: a run shorter than one batch, or
//    workers <= 1, runs `work` on the calling thread and starts no thread at all.
//  - finish() hands over the last partial batch, waits for all batches and sinks them in order.
//  - `work(items, result)` runs on a worker (or the calling thread); it must touch nothing but
//    its arguments and thread-safe, pure code. It fills `result` incrementally; if it throws,
//    the batch's `result` as filled so far is still sunk, then the exception is rethrown on the
//    calling thread from push()/finish(), and no later batch is sunk: the same output as a
//    one-thread loop that stopped at that item. After that, finish() sinks nothing more.
//  - `sink(result)` runs on the calling thread only (the one owner of the output streams). If
//    it throws, the exception leaves push()/finish() and nothing more is sunk, as for `work`.
//  - The destructor stops and joins the workers (a batch being worked on is completed first);
//    batches not yet sunk are dropped, which is what an exception leaving the producer wants.
#pragma once
#include <condition_variable>
#include <cstddef>
#include <deque>
#include <exception>
#include <functional>
#include <memory>
#include <mutex>
#include <thread>
#include <utility>
#include <vector>

namespace sp::cli {

template <class Item, class Result>
class OrderedBatches {
 public:
  using Work = std::function<void(const std::vector<Item>&, Result&)>;
  using Sink = std::function<void(Result&)>;

  OrderedBatches(unsigned workers, std::size_t batch_size, std::size_t max_in_flight, Work work,
                 Sink sink)
      : workers_(workers),
        batch_size_(batch_size == 0 ? 1 : batch_size),
        max_in_flight_(max_in_flight == 0 ? 1 : max_in_flight),
        work_(std::move(work)),
        sink_(std::move(sink)) {
    filling_.reserve(batch_size_);
  }
  OrderedBatches(const OrderedBatches&) = delete;
  OrderedBatches& operator=(const OrderedBatches&) = delete;

  ~OrderedBatches() {
    {
      std::lock_guard<std::mutex> lock(mu_);
      stop_ = true;
    }
    todo_cv_.notify_all();
    for (std::thread& t : threads_) t.join();
  }

  void push(Item item) {
    if (failed_) return;
    filling_.push_back(std::move(item));
    if (filling_.size() >= batch_size_) dispatch(/*last=*/false);
  }

  void finish() {
    if (failed_) return;
    if (!filling_.empty()) dispatch(/*last=*/true);
    while (!in_flight_.empty()) sink_oldest(/*wait=*/true);
  }

  // How many worker threads were started (0 when everything ran on the calling thread).
  std::size_t threads_started() const { return threads_.size(); }

 private:
  struct Slot {
    std::vector<Item> items;
    Result result{};
    std::exception_ptr error;
    bool done = false;
  };

  void dispatch(bool last) {
    if (failed_) return;
    auto slot = std::make_unique<Slot>();
    slot->items.swap(filling_);
    filling_.reserve(batch_size_);
    if (workers_ <= 1 || (last && threads_.empty())) {  // no thread for a lone batch
      run(*slot);
      in_flight_.push_back(std::move(slot));
      sink_oldest(/*wait=*/false);
      return;
    }
    if (threads_.empty()) {
      for (unsigned i = 0; i < workers_; ++i) threads_.emplace_back([this] { worker(); });
    }
    {
      std::lock_guard<std::mutex> lock(mu_);
      todo_.push_back(slot.get());
    }
    todo_cv_.notify_one();
    in_flight_.push_back(std::move(slot));
    // Sink what is already finished, then block only while the bound is reached.
    while (!in_flight_.empty() && sink_oldest(/*wait=*/in_flight_.size() >= max_in_flight_)) {
    }
  }

  void run(Slot& slot) {
    try {
      work_(slot.items, slot.result);
    } catch (...) {
      slot.error = std::current_exception();
    }
    slot.items.clear();
    slot.items.shrink_to_fit();  // the items are not needed once worked on
    slot.done = true;
  }

  void worker() {
    for (;;) {
      Slot* slot = nullptr;
      {
        std::unique_lock<std::mutex> lock(mu_);
        todo_cv_.wait(lock, [this] { return stop_ || !todo_.empty(); });
        if (stop_) return;
        slot = todo_.front();
        todo_.pop_front();
      }
      // Only this thread touches the slot's items and result until `done` is set.
      std::exception_ptr error;
      try {
        work_(slot->items, slot->result);
      } catch (...) {
        error = std::current_exception();
      }
      slot->items.clear();
      slot->items.shrink_to_fit();
      {
        std::lock_guard<std::mutex> lock(mu_);
        slot->error = error;
        slot->done = true;
      }
      done_cv_.notify_all();
    }
  }

  // Sinks the oldest batch if it is done (waiting for it when `wait`); returns whether it did.
  bool sink_oldest(bool wait) {
    Slot& slot = *in_flight_.front();
    {
      std::unique_lock<std::mutex> lock(mu_);
      if (wait) {
        done_cv_.wait(lock, [&slot] { return slot.done; });
      } else if (!slot.done) {
        return false;
      }
    }
    std::unique_ptr<Slot> owned = std::move(in_flight_.front());
    in_flight_.pop_front();
    failed_ = true;  // until the sink returns: a throwing sink also ends the run
    sink_(owned->result);
    if (owned->error) std::rethrow_exception(owned->error);
    failed_ = false;
    return true;
  }

  const unsigned workers_;
  const std::size_t batch_size_;
  const std::size_t max_in_flight_;
  const Work work_;
  const Sink sink_;

  std::vector<Item> filling_;                    // calling thread only
  std::deque<std::unique_ptr<Slot>> in_flight_;  // calling thread only, push order
  bool failed_ = false;                          // calling thread only
  std::vector<std::thread> threads_;

  std::mutex mu_;  // guards todo_, stop_, and each dispatched Slot's error and done
  std::condition_variable todo_cv_;
  std::condition_variable done_cv_;
  std::deque<Slot*> todo_;
  bool stop_ = false;
};

}  // namespace sp::cli
