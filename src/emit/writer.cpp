// writer.cpp — readable Verilog for the network, spliced into the original file.
//
// Each logic node is printed as its factored form. A node used by more than
// one consumer (or by another node) becomes a named wire; a node used by a
// single output is written straight into that output's assignment. Targets
// that are variables (reg/logic) are assigned in one combinational block,
// nets by continuous assignments. The output is deterministic.
#include "kerf/emit/writer.h"

#include "kerf/algebra/cover.h"
#include "kerf/io/files.h"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cstdio>
#include <map>
#include <set>
#include <sstream>

namespace kerf::emit {

using algebra::literalNegated;
using algebra::literalVar;
using frontend::BitRef;
using frontend::verilogName;
using net::Literal;
using net::NodeId;

namespace {

struct Edit {
    std::size_t start, end;
    std::string text;
};

bool blank(const std::string& s, std::size_t a, std::size_t b) {
    for (std::size_t i = a; i < b; ++i)
        if (s[i] != ' ' && s[i] != '\t' && s[i] != '\r') return false;
    return true;
}

/// Widen a deletion to its whole line when nothing else is on it.
Edit lineDeletion(const std::string& src, std::size_t s, std::size_t e) {
    std::size_t ls = src.rfind('\n', s == 0 ? 0 : s - 1);
    ls = (ls == std::string::npos || s == 0) ? 0 : ls + 1;
    if (s > 0 && src[s - 1] == '\n') ls = s;
    std::size_t le = src.find('\n', e);
    if (le == std::string::npos) le = src.size();
    if (blank(src, ls, s) && blank(src, e, le)) return {ls, std::min(le + 1, src.size()), ""};
    return {s, e, ""};
}

std::string indentOf(const std::string& src, std::size_t pos) {
    std::size_t ls = src.rfind('\n', pos == 0 ? 0 : pos - 1);
    ls = (ls == std::string::npos || pos == 0) ? 0 : ls + 1;
    std::size_t i = ls;
    while (i < src.size() && (src[i] == ' ' || src[i] == '\t')) ++i;
    return src.substr(ls, i - ls);
}

/// De Morgan: the complement of a factored form with the same literal count.
algebra::Factored complementForm(const algebra::Factored& f) {
    using K = algebra::Factored::Kind;
    algebra::Factored r;
    switch (f.kind) {
    case K::Zero: r.kind = K::One; break;
    case K::One: r.kind = K::Zero; break;
    case K::Lit: r.kind = K::Lit; r.lit = algebra::negateLiteral(f.lit); break;
    case K::And:
    case K::Or:
        r.kind = f.kind == K::And ? K::Or : K::And;
        for (const auto& k : f.kids) r.kids.push_back(complementForm(k));
        break;
    }
    return r;
}

/// Whole-line deletions separated only by blank space merge into one, and a
/// deletion between two blank lines takes one of them along.
std::vector<Edit> tidyDeletions(const std::string& src, std::vector<Edit> edits, const std::string& ind) {
    std::sort(edits.begin(), edits.end(), [](const Edit& a, const Edit& b) {
        return a.start != b.start ? a.start < b.start : a.end > b.end;
    });
    auto lineStart = [&](std::size_t p) { return p == 0 || src[p - 1] == '\n'; };
    auto wsOnly = [&](std::size_t a, std::size_t b) {
        for (std::size_t i = a; i < b; ++i)
            if (!std::isspace(static_cast<unsigned char>(src[i]))) return false;
        return true;
    };
    std::vector<Edit> out;
    for (Edit e : edits) {
        if (!out.empty() && e.start >= out.back().start && e.end <= out.back().end && e.text.empty())
            continue;   // inside a deletion already made
        if (!out.empty()) {
            Edit& prev = out.back();
            bool prevWholeLines = prev.text.empty() && lineStart(prev.start) && lineStart(prev.end);
            if (e.start >= prev.end && prevWholeLines && wsOnly(prev.end, e.start)) {
                if (e.text.empty()) {
                    prev.end = std::max(prev.end, e.end);
                    continue;
                }
                // A replacement right after deleted lines takes their place (with the indentation).
                std::size_t ls = e.start;
                while (ls > 0 && src[ls - 1] != '\n') --ls;
                if (wsOnly(ls, e.start)) {
                    prev.end = e.end;
                    prev.text = ind + e.text;
                    continue;
                }
            }
        }
        out.push_back(std::move(e));
    }
    for (Edit& e : out) {
        if (!e.text.empty() || !lineStart(e.start) || !lineStart(e.end) || e.start == 0) continue;
        std::size_t prevLine = src.rfind('\n', e.start - 1 == 0 ? 0 : e.start - 2);
        prevLine = prevLine == std::string::npos ? 0 : prevLine + 1;
        bool blankBefore = wsOnly(prevLine, e.start);
        std::size_t nextEnd = src.find('\n', e.end);
        if (nextEnd == std::string::npos) continue;
        if (blankBefore && wsOnly(e.end, nextEnd)) e.end = nextEnd + 1;
    }
    return out;
}

std::string bitText(const frontend::ModuleDesc& m, const BitRef& b) {
    auto it = m.signals.find(b.signal);
    if (it == m.signals.end()) return fmt::format("{}[{}]", verilogName(b.signal), b.offset);
    if (!it->second.vector && it->second.width == 1) return verilogName(b.signal);
    return fmt::format("{}[{}]", verilogName(b.signal), it->second.indexOf(b.offset));
}

} // namespace

WriteResult writeModule(const frontend::ModuleDesc& m, const frontend::Lowered& low,
                        const net::Network& network, const WriteOptions& opts) {
    WriteResult res;
    res.file = m.src.file;
    const std::string src = io::readFile(m.src.file);
    if (low.replaced.empty()) {
        res.text = src;
        return res;
    }
    res.changed = true;

    // ---- names of network variables
    std::vector<std::string> names(network.nodeCount());
    for (std::size_t i = 0; i < network.inputs().size(); ++i) names[network.inputs()[i]] = bitText(m, low.inputBits[i]);

    std::vector<NodeId> order = network.topoOrder();
    std::vector<std::uint32_t> logicRefs(network.nodeCount(), 0);
    for (NodeId id : order)
        for (const auto& c : network.node(id).cover.cubes)
            for (Literal l : c.lits) ++logicRefs[literalVar(l)];
    std::vector<std::uint32_t> outRefs = network.outputRefs();
    // Reachable nodes only.
    std::vector<std::uint8_t> live(network.nodeCount(), 0);
    {
        std::vector<NodeId> work;
        for (const auto& o : network.outputs()) work.push_back(literalVar(o.driver));
        while (!work.empty()) {
            NodeId id = work.back();
            work.pop_back();
            if (live[id]) continue;
            live[id] = 1;
            if (!network.isLogic(id)) continue;
            for (const auto& c : network.node(id).cover.cubes)
                for (Literal l : c.lits) work.push_back(literalVar(l));
        }
    }
    std::set<std::string> taken;
    for (const auto& [n, s] : m.signals) taken.insert(n);
    for (const auto& w : low.wordOps) {
        taken.insert(w.result);
        for (const auto& o : w.operands) taken.insert(o.name);
    }
    std::vector<NodeId> wired;
    std::size_t counter = 0;
    for (NodeId id : order) {
        if (!live[id]) continue;
        bool inlineIntoOutput = logicRefs[id] == 0 && outRefs[id] == 1;
        if (inlineIntoOutput) continue;
        std::string n;
        do n = fmt::format("{}{}", opts.prefix, counter++);
        while (taken.count(n));
        taken.insert(n);
        names[id] = n;
        wired.push_back(id);
    }

    auto factored = [&](NodeId id) {
        if (opts.forms && id < opts.forms->size()) return algebra::toString((*opts.forms)[id], names);
        algebra::Factored f = algebra::factor(network.node(id).cover, algebra::FactorMethod::Best);
        return algebra::toString(f, names);
    };
    auto literalText = [&](Literal l) -> std::string {
        NodeId v = literalVar(l);
        if (v == 0) return literalNegated(l) ? "1'b1" : "1'b0";
        if (!names[v].empty()) return (literalNegated(l) ? "~" : "") + names[v];
        if (!literalNegated(l)) return factored(v);
        // A complemented node inlined into an output: push the inverter to the literals.
        algebra::Factored f = opts.forms && v < opts.forms->size()
                                  ? (*opts.forms)[v]
                                  : algebra::factor(network.node(v).cover, algebra::FactorMethod::Best);
        return algebra::toString(complementForm(f), names);
    };

    // ---- the generated block
    // Anchor: the last replaced statement that is not a declaration initializer.
    std::map<int, const frontend::Member*> byId;
    for (const auto& mem : m.members) byId[mem.id] = &mem;
    const frontend::Member* anchor = nullptr;
    for (int id : low.replaced) {
        const auto* mem = byId.at(id);
        if (mem->netDecl) continue;
        if (!anchor || mem->src.start > anchor->src.start) anchor = mem;
    }
    std::size_t anchorPos;
    if (anchor) anchorPos = anchor->src.start;
    else {
        anchorPos = src.rfind("endmodule", m.src.end);
        if (anchorPos == std::string::npos || anchorPos < m.src.start) anchorPos = m.src.end;
    }
    std::string ind = indentOf(src, anchorPos);
    if (ind.empty()) ind = "  ";
    bool sv = m.src.file.size() > 3 && m.src.file.substr(m.src.file.size() - 3) == ".sv";

    std::string out;
    out += fmt::format("// kerf: restructured logic ({} statement{} replaced)\n", low.replaced.size(),
                       low.replaced.size() == 1 ? "" : "s");
    if (!opts.banner.empty()) out += ind + "// kerf: " + opts.banner + "\n";
    // Declarations: word-operation vectors, then intermediate wires.
    for (const auto& w : low.wordOps) {
        for (const auto& o : w.operands)
            if (o.generated)
                out += o.width > 1 ? fmt::format("{}wire [{}:0] {};\n", ind, o.width - 1, o.name)
                                   : fmt::format("{}wire {};\n", ind, o.name);
        out += w.resultWidth > 1 ? fmt::format("{}wire [{}:0] {};\n", ind, w.resultWidth - 1, w.result)
                                 : fmt::format("{}wire {};\n", ind, w.result);
    }
    if (!wired.empty()) {
        std::string line = ind + "wire ";
        std::string decl;
        for (std::size_t i = 0; i < wired.size(); ++i) {
            std::string piece = names[wired[i]] + (i + 1 < wired.size() ? "," : ";");
            if (line.size() + piece.size() + 1 > 96 && line != ind + "wire ") {
                decl += line + "\n";
                line = ind + "     ";
            }
            line += (line.back() == ' ' ? "" : " ") + piece;
        }
        decl += line + "\n";
        out += decl;
    }
    res.wires = wired.size();
    for (NodeId id : wired) {
        out += fmt::format("{}assign {} = {};\n", ind, names[id], factored(id));
        ++res.assignments;
    }
    // Word-level operations, as written in the source.
    auto operandText = [&](const frontend::WordOp& w, std::size_t i) {
        std::string n = verilogName(w.operands[i].name);
        bool sign = w.isSigned && !(i == 1 && (w.op == "<<" || w.op == ">>" || w.op == "<<<" || w.op == ">>>"));
        return sign ? fmt::format("$signed({})", n) : n;
    };
    // Outputs: nets by continuous assignment, variables in one combinational block.
    std::vector<std::string> rhsOf(network.outputs().size());
    std::vector<std::uint8_t> isVar(network.outputs().size(), 0);
    std::set<std::string> operandNames;
    for (const auto& w : low.wordOps)
        for (const auto& o : w.operands)
            if (o.generated) operandNames.insert(o.name);
    for (std::size_t i = 0; i < network.outputs().size(); ++i) {
        const BitRef& b = low.outputBits[i];
        auto sit = m.signals.find(b.signal);
        isVar[i] = sit != m.signals.end() && sit->second.isVariable;
        rhsOf[i] = literalText(network.outputs()[i].driver);
    }
    // Operand vectors first (they feed the word operations), then the operations, then the rest.
    for (std::size_t i = 0; i < network.outputs().size(); ++i)
        if (operandNames.count(low.outputBits[i].signal)) {
            out += fmt::format("{}assign {} = {};\n", ind, bitText(m, low.outputBits[i]), rhsOf[i]);
            ++res.assignments;
        }
    for (const auto& w : low.wordOps) {
        std::string rhs = w.unary ? fmt::format("{}{}", w.op, operandText(w, 0))
                                  : fmt::format("{} {} {}", operandText(w, 0), w.op, operandText(w, 1));
        out += fmt::format("{}assign {} = {};\n", ind, w.result, rhs);
        ++res.assignments;
    }
    std::vector<std::string> varLines;
    for (std::size_t i = 0; i < network.outputs().size(); ++i) {
        const BitRef& b = low.outputBits[i];
        if (operandNames.count(b.signal)) continue;
        if (isVar[i]) {
            varLines.push_back(fmt::format("{}  {} = {};\n", ind, bitText(m, b), rhsOf[i]));
        } else {
            out += fmt::format("{}assign {} = {};\n", ind, bitText(m, b), rhsOf[i]);
            ++res.assignments;
        }
    }
    if (!varLines.empty()) {
        out += ind + (sv ? "always_comb begin\n" : "always @* begin\n");
        for (const auto& l : varLines) out += l, ++res.assignments;
        out += ind + "end\n";
    }
    out += ind + "// kerf: end of restructured logic";

    // ---- edits
    std::vector<Edit> edits;
    std::set<std::pair<std::size_t, std::size_t>> seen;
    for (int id : low.replaced) {
        const auto* mem = byId.at(id);
        if (!seen.insert({mem->src.start, mem->src.end}).second) continue;
        if (mem == anchor) {
            edits.push_back({mem->src.start, mem->src.end, out});
            continue;
        }
        if (mem->netDecl) edits.push_back({mem->src.start, mem->src.end, ""});
        else edits.push_back(lineDeletion(src, mem->src.start, mem->src.end));
    }
    if (!anchor) {
        std::size_t ls = src.rfind('\n', anchorPos == 0 ? 0 : anchorPos - 1);
        ls = ls == std::string::npos ? 0 : ls + 1;
        edits.push_back({ls, ls, ind + out + "\n"});
    }
    // Dissolved declarations, grouped by statement.
    std::map<std::pair<std::size_t, std::size_t>, std::vector<const frontend::Declarator*>> stmts;
    std::set<const frontend::Declarator*> gone;
    for (const auto& name : low.dissolved) {
        const auto& s = m.signals.at(name);
        if (!s.decl || s.decl->file != m.src.file) continue;
        gone.insert(&*s.decl);
    }
    for (const auto& [name, s] : m.signals)
        if (s.decl && s.decl->file == m.src.file && gone.count(&*s.decl))
            stmts[{s.decl->stmtStart, s.decl->stmtEnd}].push_back(&*s.decl);
    // All declarators of a touched statement, to know which remain.
    std::map<std::pair<std::size_t, std::size_t>, std::vector<const frontend::Declarator*>> allDecls;
    for (const auto& [name, s] : m.signals)
        if (s.decl && s.decl->file == m.src.file && stmts.count({s.decl->stmtStart, s.decl->stmtEnd}))
            allDecls[{s.decl->stmtStart, s.decl->stmtEnd}].push_back(&*s.decl);
    for (auto& [key, decls] : allDecls) {
        std::sort(decls.begin(), decls.end(), [](auto* a, auto* b) { return a->start < b->start; });
        bool allGone = std::all_of(decls.begin(), decls.end(), [&](auto* d) { return gone.count(d) > 0; });
        if (allGone && static_cast<int>(decls.size()) >= decls.front()->count) {
            edits.push_back(lineDeletion(src, key.first, key.second));
            continue;
        }
        for (std::size_t i = 0; i < decls.size();) {
            if (!gone.count(decls[i])) { ++i; continue; }
            std::size_t j = i;
            while (j < decls.size() && gone.count(decls[j])) ++j;
            if (j < decls.size()) edits.push_back({decls[i]->start, decls[j]->start, ""});
            else if (i > 0) edits.push_back({decls[i - 1]->end, decls[j - 1]->end, ""});
            i = j;
        }
    }
    edits = tidyDeletions(src, std::move(edits), ind);
    std::string text;
    std::size_t pos = 0;
    for (const Edit& e : edits) {
        if (e.start < pos) {
            if (e.end <= pos) continue;   // inside an edit already applied
        }
        std::size_t s = std::max(e.start, pos);
        text.append(src, pos, s - pos);
        text += e.text;
        pos = std::max(pos, e.end);
    }
    text.append(src, pos, std::string::npos);
    res.text = std::move(text);
    return res;
}

} // namespace kerf::emit
