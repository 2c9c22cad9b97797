// naming_cost.cpp — named forms only where they cost no more than the goal allows.
//
// A register the source only names can be written by its names (named_values.cpp): its
// functions as comparisons with named values, a next-state vector as one choice among them.
// Both read better and both can cost: a whole comparison is a w-input AND where the bit form
// shares a two-bit product between values, and a choice adds its conditions and a `?:` chain
// per bit on top of the bit functions the conditions read (samples/dma_fsm.sv: 24 gates,
// depth 6 as bits; 26 with comparisons; 33 and depth 8 with the choice as well). kerf's
// default goal promises the smallest result that is no deeper than the input, and
// `--min-gain` states what a change of text must be worth; a named form must keep both.
//
// The idea is the usual one of choosing among alternative implementations by a cost model
// (unit-delay depth, two-input gates; common trade practice): each named form is measured on
// the forms the writer prints, with each AND/OR balanced by arrival as the written file is
// measured (passes/factored.cpp), and a greedy pass over the items — a domain's comparisons,
// a target's choice — keeps an item only when the whole network with it stays within the
// depth bound and within the margin of the bitwise form's gates. The flow measures the file
// actually written and falls back to the bitwise form when that is over the bound anyway
// (flows.cpp), so the figures it reports are always those of the written text.
#include "expression.h"
#include "named_values.h"

#include <algorithm>
#include <functional>

namespace kerf::emit {

using algebra::Factored;
using algebra::Literal;
using algebra::literalNegated;
using algebra::literalVar;
using algebra::makeLiteral;

namespace {

Factored lit(std::uint32_t var, bool neg) {
    Factored f;
    f.kind = Factored::Kind::Lit;
    f.lit = makeLiteral(var, neg);
    return f;
}

/// `a op b`, flattening a kid of the same kind.
Factored join(Factored::Kind op, Factored a, Factored b) {
    Factored f;
    f.kind = op;
    for (Factored* x : {&a, &b}) {
        if (x->kind == op) for (auto& k : x->kids) f.kids.push_back(std::move(k));
        else f.kids.push_back(std::move(*x));
    }
    return f;
}

/// Bit k of a choice as a form over its conditions (variable i + 1 is link i's condition):
/// from the last value back, `c ? 1 : e` is `c | e` and `c ? 0 : e` is `~c & e`.
Factored chainBit(const ValueChoice& vc, int k, int width) {
    using K = Factored::Kind;
    auto bitOf = [&](const ValueChoice::Link& l) {
        return l.bits[static_cast<std::size_t>(width - 1 - k)] == '1';
    };
    Factored e;
    e.kind = bitOf(vc.links.back()) ? K::One : K::Zero;
    for (std::size_t i = vc.links.size() - 1; i-- > 0;) {
        bool one = bitOf(vc.links[i]);
        auto c = static_cast<std::uint32_t>(i + 1);
        if (e.kind == (one ? K::One : K::Zero)) continue;
        if (e.kind == K::One || e.kind == K::Zero) e = lit(c, !one);
        else e = join(one ? K::Or : K::And, lit(c, !one), std::move(e));
    }
    return e;
}

std::size_t condGates(const ValueChoice::Link& l) { return l.cube.empty() ? 0 : l.cube.size() - 1; }

} // namespace

std::vector<std::size_t> targetBits(const frontend::Lowered& low, const std::string& signal, int width) {
    std::vector<std::size_t> bits(static_cast<std::size_t>(std::max(width, 0)), low.outputBits.size());
    for (std::size_t i = 0; i < low.outputBits.size(); ++i) {
        const auto& b = low.outputBits[i];
        if (b.signal != signal) continue;
        if (b.offset < 0 || b.offset >= width || bits[static_cast<std::size_t>(b.offset)] != low.outputBits.size())
            return {};
        bits[static_cast<std::size_t>(b.offset)] = i;
    }
    for (std::size_t i : bits)
        if (i >= low.outputBits.size()) return {};
    return bits;
}

std::size_t choiceGates(const ValueChoice& vc, int width) {
    std::size_t g = 0;
    for (const auto& l : vc.links) g += condGates(l);
    for (int k = 0; k < width; ++k) g += chainBit(vc, k, width).gateCount();
    return g;
}

WrittenFigures writtenFigures(const net::Network& net, const std::vector<Factored>& forms,
                              const std::vector<PlannedChoice>& choices) {
    const std::size_t n = net.nodeCount();
    std::vector<std::size_t> at(n, 0);
    auto atOf = [&](std::uint32_t x) { return x < n ? at[x] : std::size_t{0}; };
    for (net::NodeId v : net.topoOrder())
        if (v < forms.size()) at[v] = forms[v].arrival(atOf);
    std::vector<std::uint8_t> byChoice(net.outputs().size(), 0);
    for (const auto& c : choices)
        for (std::size_t i : c.bits)
            if (i < byChoice.size()) byChoice[i] = 1;
    WrittenFigures f;
    std::vector<net::NodeId> roots;
    for (std::size_t i = 0; i < net.outputs().size(); ++i) {
        if (byChoice[i]) continue;
        net::NodeId v = literalVar(net.outputs()[i].driver);
        roots.push_back(v);
        f.depth = std::max(f.depth, atOf(v));
    }
    for (const auto& c : choices) {
        const int w = static_cast<int>(c.bits.size());
        std::vector<std::size_t> condAt(c.choice.links.size() + 1, 0);
        for (std::size_t i = 0; i < c.choice.links.size(); ++i) {
            Factored cond;
            cond.kind = Factored::Kind::And;
            for (const auto& [k, val] : c.choice.links[i].cube) {
                Literal d = net.outputs()[c.bits[static_cast<std::size_t>(k)]].driver;
                roots.push_back(literalVar(d));
                cond.kids.push_back(lit(literalVar(d), false));
            }
            condAt[i + 1] = cond.arrival(atOf);
            f.gates += condGates(c.choice.links[i]);
        }
        for (int k = 0; k < w; ++k) {
            Factored e = chainBit(c.choice, k, w);
            f.gates += e.gateCount();
            f.depth = std::max(f.depth, e.arrival([&](std::uint32_t x) { return condAt[x]; }));
        }
    }
    for (net::NodeId v : net.postOrderFrom(roots))
        if (v < forms.size()) f.gates += forms[v].gateCount();
    return f;
}

NamedResult applyNaming(const NamingPlan& plan, const std::vector<NamedDomain>& domains, const frontend::ModuleDesc& m,
                        const frontend::Lowered& low, const net::Network& net, const std::vector<Factored>& forms) {
    NamedResult r;
    r.net = net;
    r.forms = forms;
    std::vector<NamedDomain> compared = domains;
    for (auto& d : compared) d.compared = d.compared && plan.compared.count(d.signal) > 0;
    if (!plan.compared.empty())
        nameDomainFunctions(compared, m, low, r.net, r.forms, {}, &plan.unnamed, &r.items);
    for (const auto& d : domains) {
        if (!d.assignedNamed || !plan.chosen.count(d.signal)) continue;
        std::vector<std::size_t> bits = targetBits(low, d.signal, d.width);
        if (bits.empty()) continue;
        std::vector<Literal> drivers;
        for (std::size_t i : bits) drivers.push_back(r.net.outputs()[i].driver);
        if (auto vc = valueChoice(d, r.net, drivers)) r.choices.push_back({d.signal, std::move(*vc), std::move(bits)});
    }
    r.figures = writtenFigures(r.net, r.forms, r.choices);
    return r;
}

NamingPlan chooseNaming(const std::vector<NamedDomain>& domains, const frontend::ModuleDesc& m,
                        const frontend::Lowered& low, const net::Network& net, const std::vector<Factored>& forms,
                        const NamingBudget& budget, std::string* log, NamingRecord* record) {
    const WrittenFigures base = writtenFigures(net, forms, {});
    const std::size_t depthLimit = std::max(budget.depthBound, base.depth);
    const double gateLimit = static_cast<double>(base.gates) + budget.gateMargin;
    NamingRecord scratch;
    NamingRecord& rec = record ? *record : scratch;
    rec.weighed = true;
    rec.bitwiseGates = base.gates;
    rec.bitwiseDepth = base.depth;
    rec.depthBound = depthLimit;
    rec.gateLimit = gateLimit;
    // Why figures are within the bounds or not, in words a reviewer can check.
    auto why = [&](const WrittenFigures& f) {
        std::string r;
        if (f.depth > depthLimit)
            r += "depth " + std::to_string(f.depth) + " over the bound " + std::to_string(depthLimit);
        if (static_cast<double>(f.gates) > gateLimit)
            r += std::string(r.empty() ? "" : "; ") + std::to_string(f.gates) + " gates over the bitwise " +
                 std::to_string(base.gates) + " plus the --min-gain margin";
        if (r.empty())
            r = "within the depth bound " + std::to_string(depthLimit) + " and the bitwise " +
                std::to_string(base.gates) + " gates plus the --min-gain margin";
        return r;
    };
    if (log)
        *log += "naming: bitwise form " + std::to_string(base.gates) + " gates, depth " + std::to_string(base.depth) +
                "; a named form may reach depth " + std::to_string(depthLimit) + " and " +
                std::to_string(static_cast<long long>(gateLimit)) + " gates\n";
    std::vector<std::pair<bool, std::string>> items;   // (is a choice, signal)
    std::vector<const NamedDomain*> sorted;
    for (const auto& d : domains) sorted.push_back(&d);
    std::sort(sorted.begin(), sorted.end(), [](const NamedDomain* a, const NamedDomain* b) { return a->signal < b->signal; });
    for (const NamedDomain* d : sorted)
        if (d->compared) items.push_back({false, d->signal});
    for (const NamedDomain* d : sorted)
        if (d->assignedNamed && !targetBits(low, d->signal, d->width).empty()) items.push_back({true, d->signal});
    NamingPlan plan;
    NamedResult current = applyNaming(plan, domains, m, low, net, forms);
    auto within = [&](const WrittenFigures& f) {
        return f.depth <= depthLimit && static_cast<double>(f.gates) <= gateLimit;
    };
    int trials = 0;
    for (const auto& [choice, signal] : items) {
        if (trials++ >= budget.maxTrials) {
            if (log) *log += "naming: trial limit reached; " + signal + " and later items keep their bits\n";
            NamingDecision d;
            d.form = choice ? "choice" : "comparisons";
            d.signal = signal;
            d.made = false;
            d.reason = "not weighed: the limit of " + std::to_string(budget.maxTrials) + " forms measured was reached";
            rec.decisions.push_back(std::move(d));
            break;
        }
        NamingPlan trial = plan;
        (choice ? trial.chosen : trial.compared).insert(signal);
        NamedResult r = applyNaming(trial, domains, m, low, net, forms);
        bool made = !choice || std::any_of(r.choices.begin(), r.choices.end(),
                                           [&signal = signal](const PlannedChoice& c) { return c.signal == signal; });
        bool ok = made && within(r.figures);
        if (log)
            *log += "naming: " + std::string(choice ? "choice for " : "comparisons of ") + signal + ": " +
                    (made ? std::to_string(r.figures.gates) + " gates, depth " + std::to_string(r.figures.depth)
                          : std::string("no choice among names")) +
                    (ok ? ", kept" : ", bits kept") + "\n";
        {
            NamingDecision d;
            d.form = choice ? "choice" : "comparisons";
            d.signal = signal;
            d.made = made;
            d.kept = ok;
            d.gates = r.figures.gates;
            d.depth = r.figures.depth;
            d.reason = made ? why(r.figures) : "no choice among the names covers every value its bits take";
            rec.decisions.push_back(std::move(d));
        }
        if (ok) {
            plan = std::move(trial);
            current = std::move(r);
            continue;
        }
        if (choice) continue;
        // Over the budget as a whole: the domain's rewrites one by one (a comparison that costs
        // no more than the bits it replaces), in the order they are made.
        std::set<std::uint64_t> before(current.items.begin(), current.items.end());
        std::vector<std::uint64_t> mine;
        for (std::uint64_t k : r.items)
            if (!before.count(k)) mine.push_back(k);
        trial.unnamed.insert(mine.begin(), mine.end());
        std::size_t kept = 0;
        for (std::uint64_t k : mine) {
            if (trials++ >= budget.maxTrials) break;
            NamingPlan one = trial;
            one.unnamed.erase(k);
            NamedResult q = applyNaming(one, domains, m, low, net, forms);
            if (!within(q.figures)) continue;
            trial = std::move(one);
            current = std::move(q);
            ++kept;
        }
        if (log)
            *log += "naming: comparisons of " + signal + " one by one: " + std::to_string(kept) + " of " +
                    std::to_string(mine.size()) + " kept, " + std::to_string(current.figures.gates) + " gates, depth " +
                    std::to_string(current.figures.depth) + "\n";
        {
            NamingDecision d;
            d.form = "comparisons one by one";
            d.signal = signal;
            d.kept = kept > 0;
            d.gates = current.figures.gates;
            d.depth = current.figures.depth;
            d.rewritesKept = kept;
            d.rewritesTried = mine.size();
            d.reason = std::to_string(kept) + " of " + std::to_string(mine.size()) +
                       " comparisons kept, each only where the module stays " + why(current.figures);
            rec.decisions.push_back(std::move(d));
        }
        if (kept > 0) plan = std::move(trial);
        continue;
    }
    return plan;
}

} // namespace kerf::emit
