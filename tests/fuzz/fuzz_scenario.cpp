// libFuzzer target: any bytes through the scenario parser and validator
// (tests/fuzz/scenario_input.hpp says what must hold). A crash, a sanitizer
// report or an uncaught exception is a finding; save the input under
// tests/fuzz/regressions/ so test_scenario replays it.
#include <cstddef>
#include <cstdint>
#include <string>

#include "tests/fuzz/scenario_input.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  dm::fuzz::checkScenarioInput(std::string(reinterpret_cast<const char*>(data), size));
  return 0;
}
