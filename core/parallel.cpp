#include "core/parallel.hpp"

#include <algorithm>
#include <atomic>
#include <condition_variable>
#include <exception>
#include <mutex>
#include <thread>
#include <vector>

namespace dm {

int workerCount(int requested, int items) {
  const int hardware = int(std::max(1u, std::thread::hardware_concurrency()));
  return std::max(1, std::min(requested > 0 ? requested : hardware, items));
}

void parallelFor(int count, int threads, const std::function<void(int)>& body,
                 const std::function<void(int, int)>& progress) {
  if (count <= 0) return;
  std::atomic<int> next{0};
  int done = 0;
  std::mutex mutex;
  std::condition_variable finished;
  std::exception_ptr failure;
  // Each worker takes the next index until none is left.
  auto worker = [&] {
    for (int i = next++; i < count; i = next++) {
      try {
        body(i);
      } catch (...) {
        std::lock_guard<std::mutex> lock(mutex);
        if (!failure) failure = std::current_exception();
        next = count;  // the others stop after their current item
      }
      {
        std::lock_guard<std::mutex> lock(mutex);
        ++done;
      }
      finished.notify_one();
    }
  };
  std::vector<std::thread> pool;
  for (int t = 0; t < std::max(1, std::min(threads, count)); ++t) pool.emplace_back(worker);
  // Report progress from this thread while the workers run.
  {
    std::unique_lock<std::mutex> lock(mutex);
    for (int reported = 0; reported < count && !failure;) {
      finished.wait(lock, [&] { return done > reported || failure; });
      reported = done;
      if (progress && !failure) {
        lock.unlock();
        progress(reported, count);
        lock.lock();
      }
    }
  }
  for (std::thread& t : pool) t.join();
  if (failure) std::rethrow_exception(failure);
}

}  // namespace dm
