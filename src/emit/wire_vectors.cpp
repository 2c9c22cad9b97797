// wire_vectors.cpp — new wires that share one shape over consecutive bits are one vector wire.
//
// The engine shares logic bit by bit: in a one-hot multiplexer feeding two outputs, the term
// `sel == 4'b1000 & d3[k]` of every bit k is shared, and the writer declares one scalar wire
// per bit (`sel_is_8_d30` .. `sel_is_8_d37`). Each bit of the outputs then reads a different
// scalar name, so no vector template fits them (expression.cpp, vectorTemplate) and each
// output comes back as one long statement per bit, where the same logic with those terms
// written as one vector reads `q = ({8{sel[0]}} & d0) | ... | sel_is_8_d3;`.
//
// The rule: wires of one statement group whose printed definitions have one shape and differ
// only in reading consecutive bits of the same vectors (or the same scalar in every bit) are
// one family, declared as one vector wire whose bit k is member k
// (`wire [7:0] sel_is_8_d3 = {8{sel_is_8}} & d3;`) and read by bit (`sel_is_8_d3[3]`), so
// the readers' bits share one shape again. Finding the families is a search for arithmetic
// progressions among the wires' bit offsets: per shape, a chain steps every rising position
// by one. Writing bit-parallel logic as one vector expression is common trade practice
// (IEEE 1800-2017 11.4.12 replication, 11.4.2 bitwise operators).
#include "wire_vectors.h"

#include <algorithm>
#include <cctype>
#include <map>
#include <optional>
#include <span>

namespace kerf::emit {

namespace {

/// How many rising-position subsets are tried per shape: all of them for at most this many
/// vector leaves, else only "every leaf rises".
constexpr std::size_t kMaxSubsetLeaves = 6;

/// The shape of a printed expression with the vector bits it reads abstracted: the text of
/// everything else (operators, polarity, scalars, constants, comparisons) and, per vector
/// leaf, its vector's name; the leaves' offsets go to `offsets` in printed order. A select of
/// a choice keeps its text (vectorTemplate keeps one scalar select).
void shapeOf(const PExpr& e, bool inSelect, std::string& shape, std::vector<int>& offsets) {
    shape += static_cast<char>('A' + static_cast<int>(e.kind));
    if (e.neg) shape += '~';
    if (e.kind == PExpr::Kind::Ref) {
        if (!inSelect && e.ref && !e.ref->signal.empty()) {
            shape += "V" + e.ref->signal + ";";
            offsets.push_back(e.ref->offset);
        } else {
            shape += "S" + e.text + ";";
        }
        return;
    }
    if (e.kind == PExpr::Kind::Compare) shape += e.text + ";";
    shape += '(';
    for (std::size_t i = 0; i < e.kids.size(); ++i)
        shapeOf(e.kids[i], inSelect || (e.kind == PExpr::Kind::Mux && i == 0), shape, offsets);
    shape += ')';
}

/// A name part for a leaf of a family's shape: `{8{sel_is_8}}` -> "sel_is_8", `d3[7:4]` ->
/// "d3_7_4", `~en` -> "nen".
std::string leafPart(const PExpr& p) {
    if (p.kind != PExpr::Kind::Ref || p.text.empty() || p.text[0] == '$') return "";
    std::string t = p.text;
    if (t[0] == '{') {   // a replication {N{x}}
        std::size_t open = t.find('{', 1);
        if (open == std::string::npos || t.size() < open + 3 || t.compare(t.size() - 2, 2, "}}") != 0) return "";
        t = t.substr(open + 1, t.size() - open - 3);
    }
    std::string f;
    for (char c : t) {
        if (std::isalnum(static_cast<unsigned char>(c)) || c == '_') f += c;
        else if (c == '[' || c == ':' || c == '.') f += '_';
        else if (c != ']') return "";   // an escaped name, a constant: no short part
    }
    if (f.empty() || std::isdigit(static_cast<unsigned char>(f[0]))) return "";
    return (p.neg ? "n" : "") + f;
}

} // namespace

std::vector<WireRun> findWireRuns(const std::vector<PExpr>& defs, const std::vector<int>& key, std::size_t minRun) {
    std::vector<WireRun> out;
    minRun = std::max<std::size_t>(minRun, 2);
    // Buckets of one shape within one key; the offsets of each member.
    std::map<std::pair<int, std::string>, std::vector<std::size_t>> buckets;
    std::vector<std::vector<int>> offs(defs.size());
    for (std::size_t k = 0; k < defs.size(); ++k) {
        if (key[k] < 0) continue;
        std::string shape;
        shapeOf(defs[k], false, shape, offs[k]);
        if (offs[k].empty()) continue;   // no vector bit read: nothing can rise
        buckets[{key[k], shape}].push_back(k);
    }
    std::vector<std::uint8_t> used(defs.size(), 0);
    std::vector<std::pair<std::size_t, WireRun>> found;   // (first member, run)
    for (auto& [bk, members] : buckets) {
        if (members.size() < minRun) continue;
        std::sort(members.begin(), members.end(), [&](std::size_t a, std::size_t b) {
            return offs[a] != offs[b] ? offs[a] < offs[b] : a < b;
        });
        const std::size_t leaves = offs[members[0]].size();
        // Rising subsets, most positions first (a wider progression is the likelier intent).
        std::vector<std::uint32_t> subsets;
        if (leaves <= kMaxSubsetLeaves) {
            for (std::uint32_t s = 1; s < (1u << leaves); ++s) subsets.push_back(s);
            std::stable_sort(subsets.begin(), subsets.end(), [](std::uint32_t a, std::uint32_t b) {
                return __builtin_popcount(a) > __builtin_popcount(b);
            });
        } else {
            subsets.push_back(0xffffffffu);
        }
        // Chains of every rising subset among the wires left, the longest taken first (two
        // interleaved families `sel[3] & d[k]`, `sel[2] & d[k]` are not cut into pairs that
        // rise in both leaves); again over what is left until nothing more is taken.
        for (bool took = true; took;) {
            took = false;
            struct Chain {
                std::size_t order;   // the subset's place in `subsets`
                std::vector<std::size_t> wires;
            };
            std::vector<Chain> chains;
            std::map<std::vector<int>, std::size_t> at;
            for (std::size_t k : members)
                if (!used[k]) at.emplace(offs[k], k);
            if (at.size() < minRun) break;
            for (std::size_t so = 0; so < subsets.size(); ++so) {
                const std::uint32_t s = subsets[so];
                auto step = [&](const std::vector<int>& t, int by) {
                    std::vector<int> n = t;
                    for (std::size_t p = 0; p < n.size(); ++p)
                        if (s & (1u << std::min<std::size_t>(p, 31))) n[p] += by;
                    return n;
                };
                for (const auto& [t0, k] : at) {
                    if (at.count(step(t0, -1))) continue;   // not a chain's start
                    Chain c{so, {k}};
                    for (auto t = step(t0, 1);; t = step(t, 1)) {
                        auto next = at.find(t);
                        if (next == at.end()) break;
                        c.wires.push_back(next->second);
                    }
                    if (c.wires.size() >= minRun) chains.push_back(std::move(c));
                }
            }
            std::stable_sort(chains.begin(), chains.end(), [](const Chain& a, const Chain& b) {
                return a.wires.size() > b.wires.size();
            });
            for (auto& c : chains) {
                if (std::any_of(c.wires.begin(), c.wires.end(), [&](std::size_t k) { return used[k] != 0; })) continue;
                // The template decides (it also refuses constants and comparisons inside); a
                // run with one is closed under shortening: the longest prefix by bisection.
                std::vector<PExpr> bits;
                for (std::size_t k : c.wires) bits.push_back(defs[k]);
                auto runOf = [&](std::size_t n) { return std::span<const PExpr>(bits.data(), n); };
                std::optional<PExpr> T = vectorTemplate(runOf(minRun));
                if (!T) continue;
                std::size_t lo = minRun, hi = c.wires.size();
                while (lo < hi) {
                    std::size_t mid = lo + (hi - lo + 1) / 2;
                    if (auto M = vectorTemplate(runOf(mid))) lo = mid, T = std::move(M);
                    else hi = mid - 1;
                }
                c.wires.resize(lo);
                for (std::size_t k : c.wires) used[k] = 1;
                WireRun r;
                r.members = c.wires;
                r.shape = std::move(*T);
                found.emplace_back(c.wires.front(), std::move(r));
                took = true;
            }
        }
    }
    std::sort(found.begin(), found.end(), [](const auto& a, const auto& b) { return a.first < b.first; });
    for (auto& [first, r] : found) out.push_back(std::move(r));
    return out;
}

std::string familyStem(const PExpr& shape) {
    PExpr e = shape;
    if (e.kind == PExpr::Kind::Ref) return leafPart(e);
    // An inverted sum or product is named as its dual, as a scalar wire is (`~(a | b)`: na_nb).
    if ((e.kind == PExpr::Kind::And || e.kind == PExpr::Kind::Or) && e.kids.size() <= 3) {
        const bool conj = (e.kind == PExpr::Kind::And) != e.neg;
        std::string name;
        for (std::size_t j = 0; j < e.kids.size(); ++j) {
            PExpr k = e.kids[j];
            if (e.neg) k.neg = !k.neg;
            std::string p = leafPart(k);
            if (p.empty()) return "";
            name += (j ? (conj ? "_" : "_or_") : "") + p;
        }
        return name;
    }
    if (e.kind == PExpr::Kind::Xor && e.kids.size() == 2) {
        std::string a = leafPart(e.kids[0]), b = leafPart(e.kids[1]);
        if (a.empty() || b.empty()) return "";
        return e.neg ? "same_" + a + "_" + b : a + "_xor_" + b;
    }
    return "";
}

} // namespace kerf::emit
