// passes_support.h — helpers shared by the restructuring-pass tests and the
// pass benchmark: building small networks by hand, seeded random networks,
// functional comparison of two networks by simulation, and a loader for the
// EPFL and-inverter netlists used only for benchmarking and tests.
#pragma once

#include "kerf/network/network.h"

#include <cstdint>
#include <fstream>
#include <functional>
#include <stdexcept>
#include <random>
#include <regex>
#include <sstream>
#include <string>
#include <unordered_map>
#include <vector>

namespace kerf::passes::testing {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using algebra::makeLiteral;
using net::Network;
using net::NodeId;

inline Literal pos(NodeId v) { return makeLiteral(v, false); }
inline Literal neg(NodeId v) { return makeLiteral(v, true); }

/// A cover from cubes given as literal lists.
inline Cover cover(std::initializer_list<std::initializer_list<Literal>> cubes) {
    Cover f;
    for (const auto& c : cubes) f.cubes.push_back(Cube(std::vector<Literal>(c)));
    f.normalize();
    return f;
}

/// Input patterns: exhaustive for at most 16 inputs (2^n patterns spread
/// over words of 64), otherwise `randomWords` words of seeded random bits.
inline std::vector<std::vector<std::uint64_t>> patterns(std::size_t inputs, std::size_t randomWords = 64,
                                                        std::uint32_t seed = 1) {
    std::vector<std::vector<std::uint64_t>> batches;
    if (inputs <= 16) {
        const std::uint64_t masks[6] = {0xAAAAAAAAAAAAAAAAull, 0xCCCCCCCCCCCCCCCCull, 0xF0F0F0F0F0F0F0F0ull,
                                        0xFF00FF00FF00FF00ull, 0xFFFF0000FFFF0000ull, 0xFFFFFFFF00000000ull};
        std::size_t words = inputs <= 6 ? 1 : std::size_t{1} << (inputs - 6);
        for (std::size_t w = 0; w < words; ++w) {
            std::vector<std::uint64_t> b(inputs);
            for (std::size_t i = 0; i < inputs; ++i)
                b[i] = i < 6 ? masks[i] : (((w >> (i - 6)) & 1) ? ~0ull : 0ull);
            batches.push_back(std::move(b));
        }
        return batches;
    }
    std::mt19937_64 rng(seed);
    for (std::size_t w = 0; w < randomWords; ++w) {
        std::vector<std::uint64_t> b(inputs);
        for (auto& x : b) x = rng();
        batches.push_back(std::move(b));
    }
    return batches;
}

/// "" when every output of `b` equals the same-position output of `a` on
/// the patterns (exhaustive up to 16 inputs); otherwise a description.
inline std::string sameFunctions(const Network& a, const Network& b, std::size_t randomWords = 64) {
    if (a.inputs().size() != b.inputs().size()) return "input counts differ";
    if (a.outputs().size() != b.outputs().size()) return "output counts differ";
    for (std::size_t i = 0; i < a.outputs().size(); ++i)
        if (a.outputs()[i].name != b.outputs()[i].name) return "output names differ at " + std::to_string(i);
    for (const auto& words : patterns(a.inputs().size(), randomWords)) {
        auto va = net::simulate(a, words), vb = net::simulate(b, words);
        for (std::size_t i = 0; i < va.size(); ++i)
            if (va[i] != vb[i]) return "output " + a.outputs()[i].name + " differs";
    }
    return "";
}

/// A seeded random network: `inputs` inputs, `nodes` logic nodes, each a
/// cover of 1..maxCubes cubes of 1..maxLits literals over earlier nodes
/// (recent ones more likely, so the network gets deep), and `outputs`
/// outputs on random nodes of the last half, some complemented.
inline Network randomNetwork(std::uint32_t seed, std::size_t inputs, std::size_t nodes, std::size_t outputs,
                             std::size_t maxCubes = 3, std::size_t maxLits = 3) {
    std::mt19937 rng(seed);
    Network n;
    std::vector<NodeId> ids;
    for (std::size_t i = 0; i < inputs; ++i) ids.push_back(n.addInput("i" + std::to_string(i)));
    for (std::size_t k = 0; k < nodes; ++k) {
        std::uniform_int_distribution<std::size_t> nc(1, maxCubes), nl(1, maxLits);
        Cover f;
        std::size_t cubes = nc(rng);
        for (std::size_t c = 0; c < cubes; ++c) {
            std::vector<Literal> ls;
            std::size_t len = nl(rng);
            for (std::size_t j = 0; j < len; ++j) {
                std::size_t span = std::min<std::size_t>(ids.size(), 12);
                std::size_t pick = (rng() % 3 == 0) ? rng() % ids.size() : ids.size() - 1 - rng() % span;
                ls.push_back(makeLiteral(ids[pick], rng() % 3 == 0));
            }
            Cube cube(std::move(ls));
            if (!cube.isContradictory()) f.cubes.push_back(std::move(cube));
        }
        if (f.cubes.empty()) f.cubes.push_back(Cube({makeLiteral(ids[rng() % ids.size()], false)}));
        f.normalize();
        ids.push_back(n.addLogic(std::move(f)));
    }
    for (std::size_t o = 0; o < outputs; ++o) {
        std::size_t lo = inputs + nodes / 2;
        NodeId v = ids[lo + rng() % (ids.size() - lo)];
        n.addOutput("o" + std::to_string(o), makeLiteral(v, rng() % 4 == 0));
    }
    return n;
}

/// A seeded random and-inverter network: every node is a two-literal AND
/// (like the EPFL netlists); outputs are complemented at random.
inline Network randomAig(std::uint32_t seed, std::size_t inputs, std::size_t ands, std::size_t outputs) {
    std::mt19937 rng(seed);
    Network n;
    std::vector<NodeId> ids;
    for (std::size_t i = 0; i < inputs; ++i) ids.push_back(n.addInput("x" + std::to_string(i)));
    for (std::size_t k = 0; k < ands; ++k) {
        std::size_t span = std::min<std::size_t>(ids.size(), 16);
        NodeId a = ids[ids.size() - 1 - rng() % span];
        NodeId b = ids[rng() % ids.size()];
        if (a == b) b = ids[rng() % inputs];
        if (a == b) continue;
        ids.push_back(n.addLogic(Cover{{Cube({makeLiteral(a, rng() & 1), makeLiteral(b, rng() & 1)})}}));
    }
    for (std::size_t o = 0; o < outputs; ++o) {
        NodeId v = ids[ids.size() - 1 - rng() % std::min<std::size_t>(ids.size() - inputs, 3 * outputs)];
        n.addOutput("y" + std::to_string(o), makeLiteral(v, rng() & 1));
    }
    return n;
}

/// FOR BENCHMARKS AND TESTS ONLY — not a Verilog reader. Reads the EPFL
/// and-inverter netlist files (shared/benchmarks/epfl) line by line with
/// regular expressions: `input`/`output` lists, `assign X = [~]A & [~]B;`,
/// `assign X = [~]A | [~]B;`, `assign X = [~]A;` and `assign X = 1'b0/1;`.
/// Anything else is ignored. The product reads Verilog only through slang.
inline Network loadEpflAigForBench(const std::string& path) {
    std::ifstream in(path);
    if (!in) throw std::runtime_error("cannot open " + path);
    std::stringstream ss;
    ss << in.rdbuf();
    std::string text = ss.str();
    auto clean = [](std::string s) {
        std::string o;
        for (char c : s)
            if (c != '\\' && c != ' ' && c != '\t' && c != '\n' && c != '\r') o += c;
        return o;
    };
    std::vector<std::string> ins, outs;
    // Declarations end at ';' and may span lines.
    std::regex decl(R"((^|\n)\s*(input|output)\s+([^;]*);)");
    for (auto it = std::sregex_iterator(text.begin(), text.end(), decl); it != std::sregex_iterator(); ++it) {
        std::string kind = (*it)[2], list = (*it)[3];
        std::stringstream ls(list);
        std::string item;
        while (std::getline(ls, item, ',')) {
            std::string name = clean(item);
            if (name.empty()) continue;
            (kind == "input" ? ins : outs).push_back(name);
        }
    }
    struct Rhs { std::string a, b; bool na = false, nb = false; char op = 0; };
    std::unordered_map<std::string, Rhs> assigns;
    std::vector<std::string> order;
    std::regex asg(R"(assign\s+(\\?\S+)\s*=\s*(~?)\s*(\\?[^\s;&|~]+)\s*(?:([&|])\s*(~?)\s*(\\?[^\s;&|~]+))?\s*;)");
    for (auto it = std::sregex_iterator(text.begin(), text.end(), asg); it != std::sregex_iterator(); ++it) {
        Rhs r;
        r.na = (*it)[2].length() > 0;
        r.a = clean((*it)[3]);
        if ((*it)[4].matched) {
            r.op = std::string((*it)[4])[0];
            r.nb = (*it)[5].length() > 0;
            r.b = clean((*it)[6]);
        }
        std::string x = clean((*it)[1]);
        assigns[x] = r;
        order.push_back(x);
    }
    Network n;
    std::unordered_map<std::string, Literal> lit;
    for (const auto& s : ins) lit[s] = makeLiteral(n.addInput(s), false);
    lit["1'b0"] = net::kFalse;
    lit["1'b1"] = net::kTrue;
    // Assignments are in dependency order in these files; resolve recursively anyway.
    std::function<Literal(const std::string&)> get = [&](const std::string& name) -> Literal {
        auto f = lit.find(name);
        if (f != lit.end()) return f->second;
        auto a = assigns.find(name);
        if (a == assigns.end()) throw std::runtime_error("undriven signal " + name + " in " + path);
        const Rhs r = a->second;
        Literal la = get(r.a) ^ (r.na ? 1u : 0u);
        Literal result;
        if (!r.op) {
            result = la;
        } else {
            Literal lb = get(r.b) ^ (r.nb ? 1u : 0u);
            Cover c = r.op == '&' ? Cover{{Cube({la, lb})}} : Cover{{Cube({la}), Cube({lb})}};
            result = makeLiteral(n.addLogic(std::move(c)), false);
        }
        lit[name] = result;
        return result;
    };
    for (const auto& x : order) get(x);
    for (const auto& o : outs) n.addOutput(o, get(o));
    return n;
}

} // namespace kerf::passes::testing
