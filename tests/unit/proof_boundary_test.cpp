// proof_boundary_test.cpp — the proof boundary (kerf/proof/boundary.h) and
// counterexample presentation (kerf/flow/counterexample.h) on hand-built
// module descriptions and networks.
//
// The rules checked are the ones issue 8 of the project states for an honest
// `kerf equiv`: kept statements are paired by their text; any kept statement
// without a partner makes the result undecided unless a compared output
// already differs; an output one side leaves to such a statement is not
// compared. Every "different" verdict is checked against the networks'
// exhaustive truth tables (proof_support.h).
#include "kerf/flow/counterexample.h"
#include "kerf/proof/boundary.h"
#include "proof_support.h"

#include <fmt/format.h>
#include <gtest/gtest.h>

using namespace kerf;
using namespace kerf::proof;
using namespace kerf::prooftest;

namespace {

struct Side {
    frontend::ModuleDesc desc;
    frontend::Lowered low;

    Side() {
        desc.name = "unit";
        desc.src.file = "unit.sv";
        addSignal("a", 2, frontend::PortDir::Input);
        addSignal("b", 4, frontend::PortDir::Input);
        addSignal("y", 1, frontend::PortDir::Output);
        addSignal("z", 1, frontend::PortDir::Output);
        addSignal("q", 1, frontend::PortDir::None);
    }
    void addSignal(const std::string& name, int width, frontend::PortDir dir) {
        frontend::Signal s;
        s.name = name;
        s.width = width;
        s.msb = width - 1;
        s.vector = width > 1;
        s.dir = dir;
        s.src.start = desc.signals.size() * 10;
        desc.signals[name] = s;
        if (dir != frontend::PortDir::None) desc.portOrder.push_back(name);
    }
    Literal in(const std::string& signal, int offset) {
        std::string name = frontend::bitName(desc, {signal, offset});
        for (std::size_t k = 0; k < low.net.inputs().size(); ++k)
            if (low.net.node(low.net.inputs()[k]).name == name) return pos(low.net.inputs()[k]);
        low.inputBits.push_back({signal, offset});
        return pos(low.net.addInput(name));
    }
    void out(const std::string& signal, int offset, Literal l) {
        low.net.addOutput(frontend::bitName(desc, {signal, offset}), l);
        low.outputBits.push_back({signal, offset});
    }
    void kept(const std::string& key, std::vector<std::string> writes, const std::string& what = "always_ff") {
        frontend::Member m;
        m.id = static_cast<int>(desc.members.size());
        m.kind = frontend::MemberKind::Kept;
        m.src.file = desc.src.file;
        m.src.line = m.id + 1;
        m.what = what;
        m.reason = "it is kept for the test";
        m.matchKey = key;
        m.writes = std::move(writes);
        desc.members.push_back(m);
    }
};

/// y = a[0] & a[1] (or |), z = a[0].
void logic(Side& s, bool useOr) {
    Literal a0 = s.in("a", 0), a1 = s.in("a", 1);
    s.out("y", 0, useOr ? or2(s.low.net, a0, a1) : and2(s.low.net, a0, a1));
    s.out("z", 0, a0);
}

} // namespace

TEST(ProofBoundary, PairedKeptStatementsGiveEquivalent) {
    Side a, b;
    logic(a, false);
    logic(b, false);
    a.kept("K", {"q"});
    b.kept("K", {"q"});
    BoundedResult r = proveBounded({a.desc, a.low}, {b.desc, b.low}, {});
    EXPECT_EQ(r.verdict, Verdict::Equivalent);
    EXPECT_EQ(r.kept.matched.size(), 1u);
    EXPECT_EQ(r.comparedOutputs, 2u);
}

TEST(ProofBoundary, UnpairedKeptStatementLeavesEqualOutputsUndecided) {
    Side a, b;
    logic(a, false);
    logic(b, false);
    a.kept("K1", {"q"});
    b.kept("K2", {"q"});
    BoundedResult r = proveBounded({a.desc, a.low}, {b.desc, b.low}, {});
    EXPECT_EQ(r.verdict, Verdict::Undecided);
    ASSERT_EQ(r.kept.onlyA.size(), 1u);
    ASSERT_EQ(r.kept.onlyB.size(), 1u);
    EXPECT_EQ(r.proof.verdict, Verdict::Equivalent);   // what was compared is equal, yet not the whole design
}

TEST(ProofBoundary, DifferingOutputWinsOverUnpairedStatement) {
    Side a, b;
    logic(a, false);
    logic(b, true);
    a.kept("K1", {"q"});
    BoundedResult r = proveBounded({a.desc, a.low}, {b.desc, b.low}, {});
    ASSERT_EQ(r.verdict, Verdict::Different);
    ASSERT_TRUE(r.proof.cex.has_value());
    // The truth tables agree that y differs for the counterexample's inputs.
    EXPECT_NE(evalOutput(a.low.net, "y", r.proof.cex->inputs), evalOutput(b.low.net, "y", r.proof.cex->inputs));
}

TEST(ProofBoundary, PairingIsByMultisetOfKeys) {
    Side a, b;
    logic(a, false);
    logic(b, false);
    for (const char* k : {"K", "K", "L"}) a.kept(k, {"q"});
    for (const char* k : {"L", "K"}) b.kept(k, {"q"});
    KeptMatch m = matchKept(a.desc, a.low, b.desc, b.low);
    EXPECT_EQ(m.matched.size(), 2u);
    ASSERT_EQ(m.onlyA.size(), 1u);
    EXPECT_EQ(m.onlyA[0].key, "K");
    EXPECT_TRUE(m.onlyB.empty());
}

TEST(ProofBoundary, OutputLeftToUnpairedKeptCodeIsNotCompared) {
    Side a, b;
    logic(a, false);
    logic(b, false);
    // First design computes q; the second leaves q to a statement the first does not have.
    a.out("q", 0, a.in("a", 1));
    b.kept("K", {"q"});
    BoundedResult r = proveBounded({a.desc, a.low}, {b.desc, b.low}, {});
    EXPECT_EQ(r.verdict, Verdict::Undecided);
    ASSERT_EQ(r.oneSided.size(), 1u);
    EXPECT_NE(r.oneSided[0].find("q"), std::string::npos);
}

TEST(ProofBoundary, OutputPortDrivenByNothingIsADifference) {
    Side a, b;
    Literal a0 = a.in("a", 0);
    a.out("y", 0, a0);
    a.out("z", 0, a0);
    b.out("y", 0, b.in("a", 0));
    BoundedResult r = proveBounded({a.desc, a.low}, {b.desc, b.low}, {});
    EXPECT_EQ(r.verdict, Verdict::Different);
    ASSERT_EQ(r.undrivenOnOneSide.size(), 1u);
}

TEST(ProofBoundary, CheckThatDrivesNothingDoesNotBlockTheProof) {
    Side a, b;
    logic(a, false);
    logic(b, false);
    b.kept("G", {}, "generate");         // e.g. kerf's --param guard
    BoundedResult r = proveBounded({a.desc, a.low}, {b.desc, b.low}, {});
    EXPECT_EQ(r.verdict, Verdict::Equivalent);
    EXPECT_EQ(r.inert.size(), 1u);
    // A statement that drives something never counts as inert.
    Side c;
    logic(c, false);
    c.kept("H", {"q"}, "generate");
    EXPECT_EQ(proveBounded({a.desc, a.low}, {c.desc, c.low}, {}).verdict, Verdict::Undecided);
}

TEST(ProofBoundary, DifferentPortsAreAnError) {
    Side a, b;
    logic(a, false);
    logic(b, false);
    b.addSignal("extra", 1, frontend::PortDir::Input);
    EXPECT_THROW(proveBounded({a.desc, a.low}, {b.desc, b.low}, {}), Error);
}

TEST(Counterexample, ShowsOnlyTheSupportAsWholeBusesInPortOrder) {
    // y = b[3] & a[1]; z = b[0]. The failing output y depends on a and b only through
    // a[1] and b[3]; a wrong copy computes y = b[3] | a[1].
    Side a, b;
    for (Side* s : {&a, &b}) {
        Literal a1 = s->in("a", 1), b3 = s->in("b", 3), b0 = s->in("b", 0);
        s->out("y", 0, s == &a ? and2(s->low.net, b3, a1) : or2(s->low.net, b3, a1));
        s->out("z", 0, b0);
    }
    BoundedResult r = proveBounded({a.desc, a.low}, {b.desc, b.low}, {});
    ASSERT_EQ(r.verdict, Verdict::Different);
    ASSERT_TRUE(r.proof.cex.has_value());
    flow::ShownCounterexample c = flow::showCounterexample(*r.proof.cex, a.desc, a.low, b.desc, b.low);
    ASSERT_EQ(c.inputs.size(), 2u);
    EXPECT_EQ(c.inputs[0].name, "a");   // port order: a before b
    EXPECT_EQ(c.inputs[1].name, "b");
    EXPECT_EQ(c.inputs[0].width, 2);
    EXPECT_EQ(c.inputs[1].width, 4);
    // The literal is the bus value in hex, consistent with the bits the proof chose.
    for (const auto& bus : c.inputs) {
        unsigned v = 0;
        for (char ch : bus.bits) v = v * 2 + (ch == '1');
        EXPECT_EQ(bus.literal, fmt::format("{}'h{:x}", bus.width, v));
        for (int off = 0; off < bus.width; ++off) {
            std::string name = frontend::bitName(a.desc, {bus.name, off});
            for (const auto& [n, val] : r.proof.cex->inputs)
                if (n == name) EXPECT_EQ(bus.bits[static_cast<std::size_t>(bus.width - 1 - off)], val ? '1' : '0');
        }
    }
    // The values shown make y differ (checked on both networks).
    EXPECT_NE(evalOutput(a.low.net, "y", r.proof.cex->inputs), evalOutput(b.low.net, "y", r.proof.cex->inputs));
}

TEST(Counterexample, StructPortsAreShownByMember) {
    // b is a packed struct {mode[3:2], flag[1], low[0]} (leaf members, MSB first);
    // y = b[3] & ~b[1] in one design, b[3] | ~b[1] in the other.
    Side a, b;
    for (Side* s : {&a, &b}) {
        s->desc.portMembers["b"] = {{"mode", 2, 2}, {"flag", 1, 1}, {"low", 0, 1}};
        Literal b3 = s->in("b", 3), b1 = s->in("b", 1);
        s->out("y", 0, s == &a ? and2(s->low.net, b3, negateLiteral(b1)) : or2(s->low.net, b3, negateLiteral(b1)));
        s->out("z", 0, s->in("b", 0));
    }
    BoundedResult r = proveBounded({a.desc, a.low}, {b.desc, b.low}, {});
    ASSERT_EQ(r.verdict, Verdict::Different);
    ASSERT_TRUE(r.proof.cex.has_value());
    flow::ShownCounterexample c = flow::showCounterexample(*r.proof.cex, a.desc, a.low, b.desc, b.low);
    ASSERT_EQ(c.inputs.size(), 1u);
    const flow::BusValue& bus = c.inputs[0];
    ASSERT_EQ(bus.name, "b");
    ASSERT_EQ(bus.members.size(), 3u);
    // Each member's literal is the slice of the bus the proof chose, in declaration order.
    auto bits = [&](int hi, int lo) {
        unsigned v = 0;
        for (int i = hi; i >= lo; --i) v = v * 2 + (bus.bits[static_cast<std::size_t>(bus.width - 1 - i)] == '1');
        return v;
    };
    EXPECT_EQ(bus.members[0], fmt::format("mode = 2'h{:x}", bits(3, 2)));
    EXPECT_EQ(bus.members[1], fmt::format("flag = 1'b{}", bits(1, 1)));
    EXPECT_EQ(bus.members[2], fmt::format("low = 1'b{}", bits(0, 0)));
    std::string text = flow::formatCounterexample(c);
    EXPECT_NE(text.find(".mode = "), std::string::npos) << text;
    nlohmann::json j = flow::counterexampleJson(c);
    ASSERT_EQ(j["inputs"][0]["members"].size(), 3u);
    EXPECT_EQ(j["inputs"][0]["members"][1]["name"], "flag");
}
