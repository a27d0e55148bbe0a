// Work split over threads: every item runs once, results land in their own
// slots, progress ends at the total, and an item's exception comes back.
#include <catch2/catch.hpp>

#include <algorithm>
#include <stdexcept>
#include <vector>

#include "core/parallel.hpp"
#include "core/random.hpp"

using namespace dm;

TEST_CASE("items seeded by index give the same results at any thread count", "[parallel]") {
  auto run = [](int threads) {
    std::vector<std::uint64_t> out(257);
    parallelFor(int(out.size()), threads, [&](int i) { out[std::size_t(i)] = SplitMix64{itemSeed(3, std::uint64_t(i))}.next(); });
    return out;
  };
  const auto one = run(1);
  CHECK(run(2) == one);
  CHECK(run(7) == one);
  CHECK(one[0] != one[1]);
}

TEST_CASE("progress is reported on the calling thread up to the total", "[parallel]") {
  std::vector<int> seen;
  parallelFor(20, 3, [](int) {}, [&](int done, int total) {
    CHECK(total == 20);
    seen.push_back(done);
  });
  REQUIRE(!seen.empty());
  CHECK(seen.back() == 20);
  CHECK(std::is_sorted(seen.begin(), seen.end()));
}

TEST_CASE("an item's exception reaches the caller", "[parallel]") {
  CHECK_THROWS_AS(parallelFor(50, 2, [](int i) {
                    if (i == 17) throw std::runtime_error("item 17");
                  }),
                  std::runtime_error);
}

TEST_CASE("the worker count follows the request and the item count", "[parallel]") {
  CHECK(workerCount(3, 10) == 3);
  CHECK(workerCount(8, 2) == 2);
  CHECK(workerCount(0, 1) == 1);
  CHECK(workerCount(0, 1000) >= 1);
}
