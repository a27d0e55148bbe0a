// A background worker for long computations (full forecasts, exposures):
// one thread, the latest request wins, progress and cancellation through a
// shared control block, results picked up by the UI thread without blocking.
#pragma once
#include <atomic>
#include <condition_variable>
#include <functional>
#include <memory>
#include <mutex>
#include <optional>
#include <stdexcept>
#include <string>
#include <thread>

#include <sys/resource.h>
#include <sys/syscall.h>
#include <unistd.h>

namespace dm::gui {

/// Thrown inside a task by JobControl::check() when a newer request or
/// shutdown cancelled it.
struct JobCancelled {};

/// Shared between a running task and the UI: progress (0..1) and the cancel flag.
struct JobControl {
  std::atomic<double> progress{0};
  std::atomic<bool> cancelled{false};
  void check() const {
    if (cancelled.load(std::memory_order_relaxed)) throw JobCancelled{};
  }
};

/// Runs tasks returning `Result` one at a time on its own thread.
template <class Result>
class Worker {
 public:
  using Task = std::function<Result(JobControl&)>;

  /// `niceIncrement` > 0 lowers the thread's priority by that much (Linux
  /// nice values are per thread), so that background work yields the cores
  /// to the window's frame loop and software GL threads; 0 leaves it as is.
  explicit Worker(int niceIncrement = 0)
      : thread_([this, niceIncrement](std::stop_token stop) {
          if (niceIncrement > 0) lowerPriority(niceIncrement);
          loop(stop);
        }) {}
  ~Worker() {
    {
      std::lock_guard lock(mutex_);
      if (running_) running_->cancelled = true;
      pending_ = nullptr;
    }
    thread_.request_stop();
  }
  Worker(const Worker&) = delete;
  Worker& operator=(const Worker&) = delete;

  /// Queues `task`, replacing any queued one and cancelling the running one.
  void submit(Task task) {
    std::lock_guard lock(mutex_);
    pending_ = std::move(task);
    ++submitted_;
    if (running_) running_->cancelled = true;
    wake_.notify_one();
  }

  /// The result of the latest request, once, when it has finished.
  std::optional<Result> take() {
    std::lock_guard lock(mutex_);
    std::optional<Result> r = std::move(ready_);
    ready_.reset();
    return r;
  }
  /// The error message of the latest request, once, if it threw.
  std::optional<std::string> takeError() {
    std::lock_guard lock(mutex_);
    std::optional<std::string> e = std::move(error_);
    error_.reset();
    return e;
  }
  /// True while a request is queued or running.
  bool busy() const {
    std::lock_guard lock(mutex_);
    return pending_ != nullptr || finished_ != submitted_;
  }
  /// Progress of the running request, 0..1 (0 when idle).
  double progress() const {
    std::lock_guard lock(mutex_);
    return running_ ? running_->progress.load() : 0.0;
  }
  /// Blocks until every request so far has finished (for scripted runs and tests).
  void wait() {
    std::unique_lock lock(mutex_);
    done_.wait(lock, [this] { return pending_ == nullptr && finished_ == submitted_; });
  }

 private:
  // Raises this thread's nice value; failing to is harmless (the work is the same).
  static void lowerPriority(int increment) {
    const id_t self = id_t(syscall(SYS_gettid));
    setpriority(PRIO_PROCESS, self, getpriority(PRIO_PROCESS, self) + increment);
  }

  // Takes the newest request, runs it unlocked, keeps its result unless a
  // newer request arrived meanwhile.
  void loop(std::stop_token stop) {
    std::unique_lock lock(mutex_);
    while (!stop.stop_requested()) {
      // The stop-token overload wakes on request_stop() without a lost wake-up.
      if (!wake_.wait(lock, stop, [&] { return pending_ != nullptr; })) break;
      Task task = std::move(pending_);
      pending_ = nullptr;
      const unsigned long generation = submitted_;
      running_ = std::make_shared<JobControl>();
      auto control = running_;
      lock.unlock();
      std::optional<Result> result;
      std::optional<std::string> error;
      try {
        result = task(*control);
      } catch (const JobCancelled&) {
      } catch (const std::exception& e) {
        error = e.what();
      }
      lock.lock();
      running_.reset();
      if (generation == submitted_) {
        ready_ = std::move(result);
        error_ = std::move(error);
      }
      finished_ = generation;
      done_.notify_all();
    }
  }

  mutable std::mutex mutex_;
  std::condition_variable_any wake_;
  std::condition_variable done_;
  Task pending_;
  std::shared_ptr<JobControl> running_;
  std::optional<Result> ready_;
  std::optional<std::string> error_;
  unsigned long submitted_ = 0, finished_ = 0;
  std::jthread thread_;  // last: starts after, and joins before, the members it uses
};

}  // namespace dm::gui
