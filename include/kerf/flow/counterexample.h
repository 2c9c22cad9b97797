// kerf/flow/counterexample.h — a counterexample as an engineer reads it.
//
// The proof finds one value per input bit. Shown are only the signals the
// differing output depends on (its structural support in either design),
// each as a whole bus in hex, ports in their declared order and then the
// signals kept code drives (free inputs of the proof), and the whole
// output signal in both designs.
#pragma once

#include "kerf/frontend/lower.h"
#include "kerf/frontend/module.h"
#include "kerf/proof/equivalence.h"

#include <nlohmann/json.hpp>

#include <string>
#include <vector>

namespace kerf::flow {

/// A signal's value in a counterexample.
struct BusValue {
    std::string name;
    int width = 1;
    std::string literal;   ///< e.g. 8'h3c, 1'b1
    std::string bits;      ///< most significant bit first
    bool port = false;     ///< an input port (otherwise a signal kept code drives)
    /// Packed struct members, when the front end knows the type: "name = literal".
    std::vector<std::string> members;
};

struct ShownCounterexample {
    std::string output;            ///< the differing bit, as the proof names it ("y[2]")
    bool valueA = false, valueB = false;
    std::string signal;            ///< the signal that bit belongs to
    std::string busA, busB;        ///< the whole signal in each design ("" when not all of it is logic)
    std::vector<BusValue> inputs;  ///< only what the differing output depends on
};

ShownCounterexample showCounterexample(const proof::Counterexample& cex, const frontend::ModuleDesc& descA,
                                       const frontend::Lowered& lowA, const frontend::ModuleDesc& descB,
                                       const frontend::Lowered& lowB);

/// Indented text lines, one per signal.
std::string formatCounterexample(const ShownCounterexample& c, const std::string& indent = "  ");

nlohmann::json counterexampleJson(const ShownCounterexample& c);

} // namespace kerf::flow
