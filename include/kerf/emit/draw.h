// kerf/emit/draw.h — a module's logic as a graph of its named signals (Graphviz DOT).
//
// `kerf draw` shows a small block's restructured logic for review: one node
// per named signal (input ports, the author's and kerf's wires, output ports,
// signals driven by code kept as written) and per kept word operation, and an
// edge from every signal to each signal whose logic reads it. The graph is
// taken from the network of the written file, so it shows what was proved.
#pragma once

#include "kerf/frontend/lower.h"
#include "kerf/frontend/module.h"

#include <set>
#include <string>
#include <utility>
#include <vector>

namespace kerf::emit {

/// Named signals and who reads whom.
struct SignalGraph {
    enum class Kind { Input, Wire, Output, Kept, WordOp };
    struct Vertex {
        std::string name;
        Kind kind = Kind::Wire;
        std::string label;      ///< what is shown ("a + b" for a word operation; else the name)
    };
    std::vector<Vertex> vertices;                           ///< sorted by kind, then name
    std::set<std::pair<std::string, std::string>> edges;    ///< (from, to) by vertex name
    /// Wires read by two or more signals (highlighted).
    std::set<std::string> shared() const;
};

/// The graph of `low` (lowered with every internal signal an output, see flows.cpp).
SignalGraph signalGraph(const frontend::ModuleDesc& m, const frontend::Lowered& low);

/// Graphviz DOT text of `g`; `added` are the wires kerf added (drawn dashed).
std::string toDot(const SignalGraph& g, const std::string& module, const std::set<std::string>& added);

} // namespace kerf::emit
