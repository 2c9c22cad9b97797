// emit_wire_vectors_test.cpp — families of new wires written as one vector wire
// (src/emit/wire_vectors.cpp, F181).
//
// Properties checked: wires whose definitions share one shape over consecutive bits of the
// same vectors are one family in bit order (the rising positions may be any subset of the
// vector leaves, the rest the same bit in every member); a gap, a different shape, a different
// group or a constant leaf ends a family; every wire is in at most one; and the family's
// vector-wide definition reads the slices the members read. The rule is ours; writing
// bit-parallel logic as one vector expression is common trade practice.
#include <gtest/gtest.h>

#include <deque>
#include <set>
#include <string>
#include <vector>

#include "../../src/emit/wire_vectors.h"

namespace {

using kerf::emit::PExpr;
using kerf::emit::VarRef;

struct Refs {
    std::deque<VarRef> store;   // stable addresses for PExpr::ref

    PExpr bit(const std::string& sig, int off, int width = 8) {
        VarRef r;
        r.text = sig + "[" + std::to_string(off) + "]";
        r.signal = sig;
        r.offset = off;
        r.width = width;
        r.msb = width - 1;
        r.lsb = 0;
        store.push_back(r);
        PExpr e;
        e.kind = PExpr::Kind::Ref;
        e.text = r.text;
        e.ref = &store.back();
        return e;
    }
    PExpr scalar(const std::string& name, bool neg = false) {
        VarRef r;
        r.text = name;
        store.push_back(r);
        PExpr e;
        e.kind = PExpr::Kind::Ref;
        e.text = name;
        e.neg = neg;
        e.ref = &store.back();
        return e;
    }
};

PExpr op(PExpr::Kind k, std::vector<PExpr> kids, bool neg = false) {
    PExpr e;
    e.kind = k;
    e.neg = neg;
    e.kids = std::move(kids);
    return e;
}

std::vector<std::size_t> members(const kerf::emit::WireRun& r) { return r.members; }

}  // namespace

TEST(EmitWireVectors, OneShapeOverConsecutiveBitsIsOneFamilyInBitOrder) {
    Refs R;
    std::vector<PExpr> defs;
    // Listed out of order: sel_is_8 & d3[k], k = 5, 0..4, 6, 7.
    for (int k : {5, 0, 1, 2, 3, 4, 6, 7})
        defs.push_back(op(PExpr::Kind::And, {R.scalar("sel_is_8"), R.bit("d3", k)}));
    auto runs = kerf::emit::findWireRuns(defs, std::vector<int>(defs.size(), 0), 2);
    ASSERT_EQ(runs.size(), 1u);
    EXPECT_EQ(members(runs[0]), (std::vector<std::size_t>{1, 2, 3, 4, 5, 0, 6, 7}));
    EXPECT_EQ(kerf::emit::flatText(runs[0].shape), "{8{sel_is_8}} & d3");
    EXPECT_EQ(kerf::emit::familyStem(runs[0].shape), "sel_is_8_d3");
}

TEST(EmitWireVectors, ABitTheSameInEveryMemberIsReplicatedWhileTheOthersRise) {
    Refs R;
    std::vector<PExpr> defs;
    // Two families in one shape, interleaved: sel[3] & d[k] and sel[2] & d[k], k = 0..3.
    for (int k = 0; k < 4; ++k)
        for (int s : {3, 2}) defs.push_back(op(PExpr::Kind::And, {R.bit("sel", s, 4), R.bit("d", k)}));
    auto runs = kerf::emit::findWireRuns(defs, std::vector<int>(defs.size(), 0), 2);
    ASSERT_EQ(runs.size(), 2u);
    std::set<std::string> shapes;
    std::set<std::size_t> seen;
    for (const auto& r : runs) {
        EXPECT_EQ(r.members.size(), 4u);
        shapes.insert(kerf::emit::flatText(r.shape));
        for (std::size_t m : r.members) EXPECT_TRUE(seen.insert(m).second) << "a wire in two families";
    }
    EXPECT_EQ(shapes, (std::set<std::string>{"{4{sel[3]}} & d[3:0]", "{4{sel[2]}} & d[3:0]"}));
}

TEST(EmitWireVectors, AGapAShapeAGroupOrAConstantEndsAFamily) {
    Refs R;
    auto andOf = [&](int k, const std::string& other, bool inv = false) {
        return op(PExpr::Kind::And, {R.scalar(other), R.bit("d", k)}, inv);
    };
    std::vector<PExpr> defs;
    std::vector<int> key;
    // Bits 0, 1 (a family), a gap at 2, bits 3, 4, 5 (a family).
    for (int k : {0, 1, 3, 4, 5}) defs.push_back(andOf(k, "en")), key.push_back(0);
    // Same bits, but inverted: another shape; and another group.
    defs.push_back(andOf(6, "en", true)), key.push_back(0);
    defs.push_back(andOf(7, "en")), key.push_back(1);
    // Kept out of every family.
    defs.push_back(andOf(6, "en")), key.push_back(-1);
    // A constant leaf: no template.
    for (int k = 0; k < 3; ++k) {
        PExpr one;
        one.kind = PExpr::Kind::One;
        defs.push_back(op(PExpr::Kind::Or, {one, R.bit("e", k)}));
        key.push_back(0);
    }
    auto runs = kerf::emit::findWireRuns(defs, key, 2);
    ASSERT_EQ(runs.size(), 2u);
    EXPECT_EQ(members(runs[0]), (std::vector<std::size_t>{0, 1}));
    EXPECT_EQ(members(runs[1]), (std::vector<std::size_t>{2, 3, 4}));
    EXPECT_EQ(kerf::emit::flatText(runs[1].shape), "{3{en}} & d[5:3]");
    // With a longer minimum the pair is no family.
    EXPECT_EQ(kerf::emit::findWireRuns(defs, key, 3).size(), 1u);
}

TEST(EmitWireVectors, BitsRisingTogetherInTwoVectors) {
    Refs R;
    std::vector<PExpr> defs;
    // a[k+4] ^ b[k], k = 0..3: both leaves rise.
    for (int k = 0; k < 4; ++k) defs.push_back(op(PExpr::Kind::Xor, {R.bit("a", k + 4), R.bit("b", k)}));
    auto runs = kerf::emit::findWireRuns(defs, std::vector<int>(4, 0), 2);
    ASSERT_EQ(runs.size(), 1u);
    EXPECT_EQ(kerf::emit::flatText(runs[0].shape), "a[7:4] ^ b[3:0]");
    EXPECT_EQ(kerf::emit::familyStem(runs[0].shape), "a_7_4_xor_b_3_0");
}
