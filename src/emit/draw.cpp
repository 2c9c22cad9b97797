// draw.cpp — the named-signal graph of a lowered module and its Graphviz DOT text.
//
// Every network output is a bit of a named signal; the logic node driving it
// belongs to that signal. Walking back from a signal's nodes through
// anonymous nodes to the next named signal or input gives the edges. DOT is
// the open graph language of Graphviz (graphviz.org); the layout is left to it.
#include "kerf/emit/draw.h"
#include "kerf/emit/guard.h"

#include <fmt/format.h>

#include <algorithm>
#include <iterator>
#include <map>

namespace kerf::emit {

std::set<std::string> SignalGraph::shared() const {
    std::map<std::string, std::set<std::string>> readers;
    for (const auto& [from, to] : edges) readers[from].insert(to);
    std::set<std::string> out;
    for (const auto& v : vertices)
        if (v.kind == Kind::Wire && readers[v.name].size() >= 2) out.insert(v.name);
    return out;
}

SignalGraph signalGraph(const frontend::ModuleDesc& m, const frontend::Lowered& low) {
    const net::Network& net = low.net;
    // Word operations: generated operand vectors stand for the operation they feed.
    std::map<std::string, std::string> alias;       // generated name -> operation vertex
    std::map<std::string, std::string> opLabel;     // operation vertex -> label
    for (const auto& w : low.wordOps) {
        std::string label;
        for (std::size_t i = 0; i < w.operands.size(); ++i) {
            const auto& o = w.operands[i];
            std::string shown = o.generated ? "." : o.name;
            if (w.unary) label = w.op + shown;
            else label += (i ? " " + w.op + " " : "") + shown;
        }
        opLabel[w.result] = label;
        for (const auto& o : w.operands)
            if (o.generated) alias[o.name] = w.result;
    }
    auto vertexOf = [&](const std::string& sig) {
        auto it = alias.find(sig);
        return it == alias.end() ? sig : it->second;
    };

    std::vector<std::string> owner(net.nodeCount());
    std::vector<std::string> inputSig(net.nodeCount());
    std::set<std::string> netInputs;
    for (std::size_t i = 0; i < net.inputs().size() && i < low.inputBits.size(); ++i) {
        inputSig[net.inputs()[i]] = vertexOf(low.inputBits[i].signal);
        netInputs.insert(low.inputBits[i].signal);
    }
    auto isPort = [&](const std::string& s) {
        auto it = m.signals.find(s);
        return it != m.signals.end() && it->second.dir != frontend::PortDir::None;
    };
    // A node computed by an internal wire and read by an output belongs to the
    // wire: wires first, then ports.
    for (int pass = 0; pass < 2; ++pass)
        for (std::size_t i = 0; i < net.outputs().size() && i < low.outputBits.size(); ++i) {
            const std::string& sig = low.outputBits[i].signal;
            if (isPort(sig) != (pass == 1)) continue;
            net::NodeId d = algebra::literalVar(net.outputs()[i].driver);
            if (net.isLogic(d) && owner[d].empty()) owner[d] = vertexOf(sig);
            // A wire holding a word operation's result (or kept code's) is what its readers read.
            // (An operation's generated operand only copies it: the operation reads the wire.)
            if (net.node(d).kind == net::NodeKind::Input && owner[d].empty() && !isPort(inputSig[d]) &&
                !alias.count(sig))
                owner[d] = vertexOf(sig);
        }
    auto source = [&](net::NodeId f, const std::string& reader) {
        return !owner[f].empty() && owner[f] != reader ? owner[f] : inputSig[f];
    };

    SignalGraph g;
    std::set<std::string> named;
    auto edge = [&](const std::string& from, const std::string& to) {
        if (!from.empty() && !to.empty() && from != to) g.edges.insert({from, to});
    };
    for (std::size_t i = 0; i < net.outputs().size() && i < low.outputBits.size(); ++i) {
        std::string sig = vertexOf(low.outputBits[i].signal);
        named.insert(sig);
        net::NodeId d = algebra::literalVar(net.outputs()[i].driver);
        if (net.node(d).kind == net::NodeKind::Input) edge(source(d, sig), sig);
        else if (net.isLogic(d) && owner[d] != sig) edge(owner[d], sig);
    }
    // Each owned node: back through anonymous nodes to named ones.
    for (net::NodeId n = 0; n < net.nodeCount(); ++n) {
        if (!net.isLogic(n) || owner[n].empty()) continue;
        const std::string& sig = owner[n];
        std::vector<net::NodeId> stack{n};
        std::set<net::NodeId> seen{n};
        while (!stack.empty()) {
            net::NodeId x = stack.back();
            stack.pop_back();
            for (const auto& cube : net.node(x).cover.cubes)
                for (algebra::Literal l : cube.lits) {
                    net::NodeId f = algebra::literalVar(l);
                    if (!seen.insert(f).second) continue;
                    const net::Node& fn = net.node(f);
                    if (fn.kind == net::NodeKind::Input) edge(source(f, sig), sig);
                    else if (fn.kind != net::NodeKind::Logic || fn.dead) continue;
                    else if (!owner[f].empty()) edge(owner[f], sig);
                    else stack.push_back(f);
                }
        }
    }

    // Operands that are the author's signals feed their operation directly.
    for (const auto& w : low.wordOps)
        for (const auto& o : w.operands)
            if (!o.generated) edge(o.name, w.result);
    // Other generated names (not a signal of the module, not an operation) pass straight through.
    std::set<std::string> ends = named;
    for (const auto& [a, b] : g.edges) ends.insert(a), ends.insert(b);
    for (const auto& x : ends) {
        if (m.signals.count(x) || opLabel.count(x)) continue;
        std::vector<std::string> preds, succs;
        for (const auto& [a, b] : g.edges) {
            if (b == x) preds.push_back(a);
            if (a == x) succs.push_back(b);
        }
        for (auto it = g.edges.begin(); it != g.edges.end();)
            it = (it->first == x || it->second == x) ? g.edges.erase(it) : std::next(it);
        for (const auto& a : preds)
            for (const auto& b : succs) edge(a, b);
        named.erase(x);
        netInputs.erase(x);
    }

    std::set<std::string> all = named;
    for (const auto& s : netInputs) all.insert(vertexOf(s));
    for (const auto& [name, s] : m.signals)
        if (s.dir != frontend::PortDir::None) all.insert(name);
    for (const auto& name : all) {
        SignalGraph::Vertex v{name, SignalGraph::Kind::Wire, name};
        auto it = m.signals.find(name);
        if (opLabel.count(name)) {
            v.kind = SignalGraph::Kind::WordOp;
            v.label = opLabel[name];
        } else if (it != m.signals.end() && it->second.dir == frontend::PortDir::Output) {
            v.kind = SignalGraph::Kind::Output;
        } else if (it != m.signals.end() && it->second.dir != frontend::PortDir::None) {
            v.kind = SignalGraph::Kind::Input;
        } else if (netInputs.count(name)) {
            v.kind = SignalGraph::Kind::Kept;
        }
        g.vertices.push_back(v);
    }
    std::stable_sort(g.vertices.begin(), g.vertices.end(), [](const auto& a, const auto& b) {
        return static_cast<int>(a.kind) < static_cast<int>(b.kind);
    });
    return g;
}

std::string toDot(const SignalGraph& g, const std::string& module, const std::set<std::string>& added) {
    using K = SignalGraph::Kind;
    std::set<std::string> shared = g.shared();
    std::string out = fmt::format("// kerf draw: module {} as restructured and proved; inputs left, outputs right,\n"
                                  "// shared wires filled, wires kerf added dashed.\n", module);
    out += fmt::format("digraph {} {{\n  rankdir=LR;\n  node [fontname=\"Helvetica\"];\n", doubleQuoted(module));
    for (const auto& v : g.vertices) {
        std::string attrs;
        switch (v.kind) {
        case K::Input: attrs = "shape=box, style=rounded"; break;
        case K::Output: attrs = "shape=box, style=bold"; break;
        case K::Kept: attrs = "shape=box, style=dotted"; break;
        case K::WordOp: attrs = "shape=hexagon"; break;
        case K::Wire:
            attrs = "shape=ellipse";
            if (shared.count(v.name)) attrs += ", style=\"filled" + std::string(added.count(v.name) ? ",dashed" : "") +
                                               "\", fillcolor=\"#ffd27f\"";
            else if (added.count(v.name)) attrs += ", style=dashed";
            break;
        }
        if (v.label != v.name) attrs += ", label=" + doubleQuoted(v.label);
        out += fmt::format("  {} [{}];\n", doubleQuoted(v.name), attrs);
    }
    for (const auto& [from, to] : g.edges) out += fmt::format("  {} -> {};\n", doubleQuoted(from), doubleQuoted(to));
    out += "}\n";
    return out;
}

} // namespace kerf::emit
