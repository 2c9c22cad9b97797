// boundary.cpp — pairing kept statements of two designs and proving the rest.
//
// The pairing is a multiset match on the reader's match keys; the proof runs
// on the outputs both networks compute (proveEquivalent), and the verdict
// accounts for everything outside them: kept statements without a partner,
// outputs one side computes and the other leaves to such statements, and
// output ports one side does not drive at all.
#include "kerf/proof/boundary.h"

#include <fmt/format.h>

#include <algorithm>
#include <fstream>
#include <map>
#include <optional>
#include <set>
#include <sstream>
#include <unordered_map>

namespace kerf::proof {

namespace {

std::string fileBytes(const std::string& path, std::map<std::string, std::string>& cache) {
    auto it = cache.find(path);
    if (it != cache.end()) return it->second;
    std::ifstream in(path, std::ios::binary);
    std::ostringstream ss;
    if (in) ss << in.rdbuf();
    return cache[path] = ss.str();
}

std::string slice(const std::string& bytes, const frontend::SourceRange& r) {
    if (r.start > r.end || r.end > bytes.size()) return {};
    return bytes.substr(r.start, r.end - r.start);
}

/// Writers of each signal among kept statements.
std::unordered_map<std::string, std::vector<const KeptStatement*>> writersOf(const std::vector<KeptStatement>& all) {
    std::unordered_map<std::string, std::vector<const KeptStatement*>> w;
    for (const auto& k : all)
        for (const auto& s : k.writes) w[s].push_back(&k);
    return w;
}

} // namespace

std::string describeKept(const KeptStatement& k) {
    return fmt::format("{}: {}, kept as written: {}", k.src.loc().str(), k.what, k.reason);
}

std::vector<KeptStatement> keptStatements(const frontend::ModuleDesc& m, const frontend::Lowered& low) {
    std::set<int> replaced(low.replaced.begin(), low.replaced.end());
    std::vector<KeptStatement> out;
    for (const auto& mem : m.members) {
        if (replaced.count(mem.id)) continue;
        KeptStatement k;
        k.member = mem.id;
        k.src = mem.src;
        k.what = mem.what.empty() ? (mem.kind == frontend::MemberKind::Assign ? "assign" : "always_comb") : mem.what;
        k.reason = mem.reason;
        if (k.reason.empty()) {
            // The lowering's own reason, from its note "file:line:col: left as written: why".
            std::string prefix = mem.src.loc().str() + ": left as written: ";
            for (const auto& n : low.notes)
                if (n.rfind(prefix, 0) == 0) k.reason = n.substr(prefix.size());
        }
        if (k.reason.empty()) k.reason = "kerf does not lower it";
        k.key = mem.matchKey;   // the reader keys every member (src/reader/kerf_variants.py)
        // A member without a key matches nothing: never assume two are alike.
        if (k.key.empty()) k.key = fmt::format("<no key: {}>", mem.src.loc().str());
        k.writes = mem.writes;
        out.push_back(std::move(k));
    }
    return out;
}

KeptMatch matchKept(const frontend::ModuleDesc& a, const frontend::Lowered& lowA, const frontend::ModuleDesc& b,
                    const frontend::Lowered& lowB) {
    std::vector<KeptStatement> ka = keptStatements(a, lowA), kb = keptStatements(b, lowB);
    std::map<std::string, std::vector<std::size_t>> byKey;   // B's statements per key, source order
    for (std::size_t j = 0; j < kb.size(); ++j) byKey[kb[j].key].push_back(j);
    std::map<std::string, std::size_t> next;
    std::vector<std::uint8_t> usedB(kb.size(), 0);
    KeptMatch r;
    for (auto& k : ka) {
        auto it = byKey.find(k.key);
        std::size_t& n = next[k.key];
        if (it != byKey.end() && n < it->second.size()) {
            std::size_t j = it->second[n++];
            usedB[j] = 1;
            r.matched.emplace_back(k, kb[j]);
        } else {
            r.onlyA.push_back(k);
        }
    }
    for (std::size_t j = 0; j < kb.size(); ++j)
        if (!usedB[j]) r.onlyB.push_back(kb[j]);
    return r;
}

std::vector<std::string> keptTextDiffers(const KeptMatch& match) {
    std::map<std::string, std::string> cache;
    std::vector<std::string> out;
    for (const auto& [x, y] : match.matched) {
        std::string bx = slice(fileBytes(x.src.file, cache), x.src);
        std::string by = slice(fileBytes(y.src.file, cache), y.src);
        bool whole = bx.size() == x.src.end - x.src.start && by.size() == y.src.end - y.src.start;
        if (!whole || bx != by) out.push_back(x.src.loc().str());
    }
    return out;
}

BoundedResult proveBounded(const ProofSide& a, const ProofSide& b, const ProofOptions& opts) {
    // Ports first: two modules with different interfaces are not two versions of one module.
    std::vector<std::string> portDiffs;
    auto portLine = [](const frontend::ModuleDesc& m, const std::string& n) {
        const auto& s = m.signals.at(n);
        const char* dir = s.dir == frontend::PortDir::Input    ? "input"
                          : s.dir == frontend::PortDir::Output ? "output"
                                                               : "inout";
        return fmt::format("{} {}{} [{}:{}]", dir, s.isSigned ? "signed " : "", n, s.msb, s.lsb);
    };
    {
        std::set<std::string> pa(a.desc.portOrder.begin(), a.desc.portOrder.end());
        std::set<std::string> pb(b.desc.portOrder.begin(), b.desc.portOrder.end());
        for (const auto& n : a.desc.portOrder) {
            if (!pb.count(n)) portDiffs.push_back(fmt::format("'{}' only in the first", n));
            else if (portLine(a.desc, n) != portLine(b.desc, n))
                portDiffs.push_back(fmt::format("'{}' is '{}' in the first and '{}' in the second", n,
                                                portLine(a.desc, n), portLine(b.desc, n)));
        }
        for (const auto& n : b.desc.portOrder)
            if (!pa.count(n)) portDiffs.push_back(fmt::format("'{}' only in the second", n));
    }
    if (!portDiffs.empty()) {
        std::string msg = "cannot compare: the two modules have different ports: " + portDiffs.front();
        for (std::size_t i = 1; i < portDiffs.size() && i < 6; ++i) msg += "; " + portDiffs[i];
        if (portDiffs.size() > 6) msg += fmt::format("; and {} more", portDiffs.size() - 6);
        throw Error(msg, a.desc.src.loc());
    }

    BoundedResult r;
    r.kept = matchKept(a.desc, a.low, b.desc, b.low);

    // Outputs both sides compute are compared; the others are accounted for.
    std::vector<KeptStatement> allA = keptStatements(a.desc, a.low), allB = keptStatements(b.desc, b.low);
    auto writersA = writersOf(allA), writersB = writersOf(allB);
    std::set<std::string> outA, outB;
    for (const auto& o : a.low.net.outputs()) outA.insert(o.name);
    for (const auto& o : b.low.net.outputs()) outB.insert(o.name);
    auto account = [&](const ProofSide& mine, const std::set<std::string>& other,
                       std::unordered_map<std::string, std::vector<const KeptStatement*>>& otherWriters,
                       const char* side, const char* otherSide) {
        for (std::size_t i = 0; i < mine.low.net.outputs().size(); ++i) {
            const std::string& name = mine.low.net.outputs()[i].name;
            if (other.count(name)) continue;
            const frontend::BitRef& bit = mine.low.outputBits.at(i);
            auto sit = mine.desc.signals.find(bit.signal);
            bool port = sit != mine.desc.signals.end() && sit->second.dir != frontend::PortDir::None &&
                        sit->second.dir != frontend::PortDir::Input;
            if (port && !otherWriters.count(bit.signal))
                r.undrivenOnOneSide.push_back(fmt::format("'{}' is driven in the {} design and by nothing in the {}",
                                                          name, side, otherSide));
            else
                r.oneSided.push_back(fmt::format("{} ({} design only)", name, side));
        }
    };
    account(a, outB, writersB, "first", "second");
    account(b, outA, writersA, "second", "first");

    // The outputs both sides compute; a side with no others is compared as it is (a copy of a
    // generated design's network costs as much as building its graph).
    std::optional<net::Network> copyA, copyB;
    auto common = [&](const net::Network& n, const std::set<std::string>& keep,
                      std::optional<net::Network>& copy) -> const net::Network& {
        if (n.outputs().size() == keep.size()) return n;   // names are unique (checked by the proof)
        copy.emplace(n);
        auto& outs = copy->outputs();
        outs.erase(std::remove_if(outs.begin(), outs.end(), [&](const net::Output& o) { return !keep.count(o.name); }),
                   outs.end());
        return *copy;
    };
    std::set<std::string> both;
    std::set_intersection(outA.begin(), outA.end(), outB.begin(), outB.end(), std::inserter(both, both.end()));
    const net::Network& na = common(a.low.net, both, copyA);
    const net::Network& nb = common(b.low.net, both, copyB);
    const net::Network* dc = a.low.dontCares.outputs().empty() ? nullptr : &a.low.dontCares;
    r.proof = proveEquivalent(na, nb, opts, dc);
    r.comparedOutputs = both.size();

    // An elaboration-time construct without a partner that drives no signal (a generate
    // block holding only checks, such as kerf's --param guard; an elaboration task) cannot
    // change an output. Anything else without a partner leaves something uncompared.
    auto inert = [](const KeptStatement& k) {
        return k.writes.empty() && (k.what == "generate" || k.what == "elaboration_task");
    };
    // Text the defines leave out inside such a construct (the Icarus Verilog branch of kerf's
    // SystemVerilog guard) names nothing and goes with it.
    auto inside = [](const KeptStatement& k, const std::vector<KeptStatement>& side, const auto& isInert) {
        if (k.what != "excluded_text" || !k.writes.empty()) return false;
        for (const auto& g : side)
            if (&g != &k && isInert(g) && g.src.file == k.src.file && g.src.start <= k.src.start &&
                k.src.end <= g.src.end)
                return true;
        return false;
    };
    bool uncompared = !r.oneSided.empty();
    for (const auto* side : {&r.kept.onlyA, &r.kept.onlyB})
        for (const auto& k : *side) {
            if (inert(k) || inside(k, *side, inert)) r.inert.push_back(k);
            else uncompared = true;
        }
    if (r.proof.verdict == Verdict::Different || !r.undrivenOnOneSide.empty()) r.verdict = Verdict::Different;
    else if (uncompared || r.proof.verdict == Verdict::Undecided) r.verdict = Verdict::Undecided;
    else r.verdict = Verdict::Equivalent;
    return r;
}

} // namespace kerf::proof
