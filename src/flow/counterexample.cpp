// counterexample.cpp — from the proof's bit values to buses an engineer reads.
//
// Support: the inputs reachable backwards from the differing output's driver
// in either network (and in the first design's don't-care network). Bits of
// a shown bus outside the support keep the value the proof happened to
// choose; they do not matter for this output. A packed struct or union port
// is also shown member by member (the reader's port_members).
#include "kerf/flow/counterexample.h"

#include <fmt/format.h>

#include <algorithm>
#include <map>
#include <set>
#include <unordered_map>

namespace kerf::flow {

namespace {

using algebra::literalVar;

/// Names of the inputs the named output depends on structurally.
void supportOf(const net::Network& n, const std::string& output, std::set<std::string>& out) {
    std::vector<net::NodeId> work;
    for (const auto& o : n.outputs())
        if (o.name == output) work.push_back(literalVar(o.driver));
    std::vector<std::uint8_t> seen(n.nodeCount(), 0);
    while (!work.empty()) {
        net::NodeId id = work.back();
        work.pop_back();
        if (seen[id]) continue;
        seen[id] = 1;
        const net::Node& node = n.node(id);
        if (node.kind == net::NodeKind::Input) out.insert(node.name);
        if (!n.isLogic(id)) continue;
        for (const auto& c : node.cover.cubes)
            for (auto l : c.lits) work.push_back(literalVar(l));
    }
}

std::string literalOf(const std::string& bitsMsbFirst) {
    std::size_t w = bitsMsbFirst.size();
    if (w == 1) return "1'b" + bitsMsbFirst;
    std::string hex;
    for (std::size_t end = w; end > 0;) {
        std::size_t start = end >= 4 ? end - 4 : 0;
        int v = 0;
        for (std::size_t i = start; i < end; ++i) v = v * 2 + (bitsMsbFirst[i] == '1' ? 1 : 0);
        hex.insert(hex.begin(), "0123456789abcdef"[v]);
        end = start;
    }
    return fmt::format("{}'h{}", w, hex);
}

/// The whole value of `signal` as the network computes it for the pattern, or "".
std::string outputBus(const net::Network& n, const frontend::Lowered& low, const frontend::ModuleDesc& desc,
                      const std::string& signal, const std::map<std::string, bool>& values) {
    auto sit = desc.signals.find(signal);
    if (sit == desc.signals.end()) return {};
    std::vector<std::uint64_t> words(n.inputs().size(), 0);
    for (std::size_t k = 0; k < n.inputs().size(); ++k) {
        auto v = values.find(n.node(n.inputs()[k]).name);
        if (v != values.end() && v->second) words[k] = 1;
    }
    std::vector<std::uint64_t> sim = net::simulate(n, words);
    std::string bits(static_cast<std::size_t>(sit->second.width), '?');
    for (std::size_t i = 0; i < low.outputBits.size() && i < sim.size(); ++i) {
        const auto& b = low.outputBits[i];
        if (b.signal != signal || b.offset < 0 || b.offset >= sit->second.width) continue;
        bits[bits.size() - 1 - static_cast<std::size_t>(b.offset)] = (sim[i] & 1u) ? '1' : '0';
    }
    if (bits.find('?') != std::string::npos) return {};
    return literalOf(bits);
}

} // namespace

ShownCounterexample showCounterexample(const proof::Counterexample& cex, const frontend::ModuleDesc& descA,
                                       const frontend::Lowered& lowA, const frontend::ModuleDesc& descB,
                                       const frontend::Lowered& lowB) {
    ShownCounterexample s;
    s.output = cex.output;
    s.valueA = cex.valueA;
    s.valueB = cex.valueB;
    std::map<std::string, bool> values(cex.inputs.begin(), cex.inputs.end());

    std::set<std::string> support;
    supportOf(lowA.net, cex.output, support);
    supportOf(lowB.net, cex.output, support);
    supportOf(lowA.dontCares, cex.output, support);

    // Input bit name -> (signal, offset), from either side.
    std::map<std::string, frontend::BitRef> refs;
    auto addRefs = [&](const frontend::Lowered& low) {
        for (std::size_t k = 0; k < low.net.inputs().size() && k < low.inputBits.size(); ++k)
            refs.emplace(low.net.node(low.net.inputs()[k]).name, low.inputBits[k]);
    };
    addRefs(lowA);
    addRefs(lowB);
    for (std::size_t i = 0; i < lowA.outputBits.size(); ++i)
        if (lowA.net.outputs()[i].name == cex.output) s.signal = lowA.outputBits[i].signal;
    if (s.signal.empty()) s.signal = cex.output;
    s.busA = outputBus(lowA.net, lowA, descA, s.signal, values);
    s.busB = outputBus(lowB.net, lowB, descB, s.signal, values);

    std::set<std::string> signals;
    for (const auto& name : support) {
        auto r = refs.find(name);
        if (r != refs.end()) signals.insert(r->second.signal);
    }
    // Ports in declared order, then the other signals in declaration order.
    std::vector<std::string> order;
    for (const auto& p : descA.portOrder)
        if (signals.count(p)) order.push_back(p);
    std::vector<std::string> rest;
    for (const auto& n : signals)
        if (std::find(order.begin(), order.end(), n) == order.end()) rest.push_back(n);
    auto startOf = [&](const std::string& n) {
        for (const frontend::ModuleDesc* d : {&descA, &descB}) {
            auto it = d->signals.find(n);
            if (it != d->signals.end()) return it->second.src.start;
        }
        return std::size_t(-1);
    };
    std::stable_sort(rest.begin(), rest.end(), [&](const std::string& x, const std::string& y) {
        return std::make_pair(startOf(x), x) < std::make_pair(startOf(y), y);
    });
    order.insert(order.end(), rest.begin(), rest.end());

    for (const auto& name : order) {
        const frontend::ModuleDesc& d = descA.signals.count(name) ? descA : descB;
        auto it = d.signals.find(name);
        int width = it != d.signals.end() ? it->second.width : 1;
        BusValue b;
        b.name = name;
        b.width = width;
        b.port = it != d.signals.end() && it->second.dir == frontend::PortDir::Input;
        b.bits.assign(static_cast<std::size_t>(width), '0');
        for (int off = 0; off < width; ++off) {
            auto v = values.find(frontend::bitName(d, {name, off}));
            if (v != values.end() && v->second) b.bits[static_cast<std::size_t>(width - 1 - off)] = '1';
        }
        b.literal = literalOf(b.bits);
        if (auto pm = d.portMembers.find(name); pm != d.portMembers.end())
            for (const auto& f : pm->second) {
                if (f.offset < 0 || f.width < 1 || f.offset + f.width > width) continue;
                std::size_t from = static_cast<std::size_t>(width - f.offset - f.width);
                b.members.push_back(fmt::format("{} = {}", f.name,
                                                literalOf(b.bits.substr(from, static_cast<std::size_t>(f.width)))));
            }
        s.inputs.push_back(std::move(b));
    }
    return s;
}

std::string formatCounterexample(const ShownCounterexample& c, const std::string& indent) {
    std::string t;
    if (!c.busA.empty() && !c.busB.empty() && c.signal != c.output)
        t += fmt::format("{}{} = {} in the first design, {} in the second\n", indent, c.signal, c.busA, c.busB);
    t += fmt::format("{}for these values (only what '{}' depends on; buses in hex):\n", indent, c.output);
    for (const auto& b : c.inputs) {
        t += fmt::format("{}  {} = {}{}\n", indent, b.name, b.literal,
                         b.port ? "" : "   (driven by code kept as written: free in the proof)");
        for (const auto& m : b.members) t += fmt::format("{}    .{}\n", indent, m);
    }
    if (c.inputs.empty()) t += fmt::format("{}  (it depends on no input: the two designs give different constants)\n",
                                           indent);
    return t;
}

nlohmann::json counterexampleJson(const ShownCounterexample& c) {
    nlohmann::json in = nlohmann::json::array();
    for (const auto& b : c.inputs) {
        nlohmann::json e = {{"name", b.name}, {"width", b.width}, {"value", b.literal}, {"bits", b.bits},
                            {"port", b.port}};
        if (!b.members.empty()) {
            nlohmann::json ms = nlohmann::json::array();
            for (const auto& m : b.members) {
                std::size_t eq = m.find(" = ");
                ms.push_back({{"name", m.substr(0, eq)}, {"value", eq == std::string::npos ? "" : m.substr(eq + 3)}});
            }
            e["members"] = ms;
        }
        in.push_back(e);
    }
    nlohmann::json j = {{"output", c.output}, {"signal", c.signal}, {"a", c.valueA ? 1 : 0},
                        {"b", c.valueB ? 1 : 0}, {"inputs", in}};
    if (!c.busA.empty()) j["signal_a"] = c.busA;
    if (!c.busB.empty()) j["signal_b"] = c.busB;
    return j;
}

} // namespace kerf::flow
