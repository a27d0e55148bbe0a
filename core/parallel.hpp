// Work split over threads without changing the result: item i is computed
// by whichever worker takes it, and its result goes to slot i, so the
// output is the same at any thread count as long as each item depends on
// its index alone (seed per item, never per thread).
#pragma once
#include <functional>

namespace dm {

/// Runs body(i) for i in [0, count) on `threads` workers (at least one,
/// at most count). `progress`, when set, is called on the calling thread
/// with (items done, count) after each item finishes. The first exception an
/// item throws stops the remaining items from starting and is rethrown here.
void parallelFor(int count, int threads, const std::function<void(int)>& body,
                 const std::function<void(int, int)>& progress = {});

/// The worker count for a requested number: 0 means one per hardware
/// thread; never more than `items`, never fewer than one.
int workerCount(int requested, int items);

}  // namespace dm
