// frontend_description_test.cpp — reading the reader's description into the typed IR.
//
// The shape is our own format (docs/reader-format.md, version 3). A
// description that breaks it is kerf's own bug: every check here expects an
// internal error (exit 5) naming what is wrong, never a crash or a silently
// different module.
#include "frontend_support.h"

using kerf::ExitCode;
using kerf::frontend::ExprKind;
using kerf::frontend::parseDescription;
using kerf::frontend::TypeKind;
using kerf::test::DescBuilder;
using json = nlohmann::json;

namespace {

json simple() {
    DescBuilder d;
    d.sig("a", 4, "input");
    d.sig("y", 1, "output");
    // Nodes made one statement at a time: the tests below name them by index, and the order in
    // which a compiler evaluates a call's arguments is unspecified (clang made `y` node 0).
    int a = d.ref("a");        // node 0
    int orA = d.un("|", a, 1); // node 1
    int y = d.ref("y");        // node 2
    d.assignMember(y, orA, 2, {"a"}, {"y"});
    return d.build();
}

/// The internal error a broken description gives (empty when none).
std::string internalError(const std::string& text) {
    try {
        parseDescription(text);
    } catch (const kerf::Error& e) {
        EXPECT_EQ(e.code(), ExitCode::Internal) << e.what();
        return e.what();
    }
    return "";
}

} // namespace

TEST(FrontendDescription, BuildsTheTypedIr) {
    auto m = parseDescription(simple());
    EXPECT_EQ(m.name, "t");
    ASSERT_EQ(m.members.size(), 1u);
    const auto& mem = m.members[0];
    const auto& rhs = m.ir.expr(mem.rhs);
    EXPECT_EQ(rhs.kind, ExprKind::Unary);
    EXPECT_EQ(rhs.width, 1u);
    const auto& operand = m.ir.expr(rhs.a);
    EXPECT_EQ(operand.kind, ExprKind::Ref);
    EXPECT_EQ(operand.width, 4u);
    EXPECT_EQ(m.ir.symbols.at(operand.a).name, "a");
    EXPECT_EQ(m.signals.at("a").type, operand.type);
    EXPECT_EQ(m.ir.type(operand.type).kind, TypeKind::Vector);
    EXPECT_EQ(m.signals.at("y").dir, kerf::frontend::PortDir::Output);
}

TEST(FrontendDescription, LocatesOffsetsWithTheLineTable) {
    auto m = parseDescription(simple());
    // line starts every 10 bytes in the test description
    auto loc = m.ir.locate("t.v", 37);
    EXPECT_EQ(loc.line, 4);
    EXPECT_EQ(loc.col, 8);
    EXPECT_TRUE(m.ir.locate("other.v", 3).file.empty());
}

TEST(FrontendDescription, RejectsAnotherVersion) {
    json d = simple();
    d["version"] = 1;
    EXPECT_NE(internalError(d.dump()).find("format version"), std::string::npos);
}

namespace {

/// `y = a[0] | a[1] | a[2] | a[3]` with byte ranges, its ORs as binary nodes (version 3) or the
/// outer two as links `[l, r, end]` (version 4, docs/reader-format.md "Links").
json orChain(bool links) {
    DescBuilder d;
    d.sig("a", 4, "input");
    d.sig("y", 1, "output");
    int a = d.ref("a");
    std::vector<int> bits;
    for (int k = 0; k < 4; ++k) {
        int idx = d.cnst(k == 0 ? "00" : k == 1 ? "01" : k == 2 ? "10" : "11");
        bits.push_back(d.index(a, idx, 3, 0, 1));
    }
    int y = d.ref("y");
    // the text `a[0] | a[1] | a[2] | a[3]` at byte 20: each OR ends after its right operand
    int o1 = d.add(json::array({"binary", d.vec(1), 20, 31, "|", bits[0], bits[1]}));
    int o2 = links ? d.add(json::array({o1, bits[2], 38})) : d.add(json::array({"binary", d.vec(1), 20, 38, "|", o1, bits[2]}));
    int o3 = links ? d.add(json::array({o2, bits[3], 45})) : d.add(json::array({"binary", d.vec(1), 20, 45, "|", o2, bits[3]}));
    d.assignMember(y, o3, 2, {"a"}, {"y"});
    json j = d.build();
    if (links) j["version"] = 4;
    return j;
}

} // namespace

TEST(FrontendDescription, LinksAreTheBinaryNodesTheyStandFor) {
    auto v3 = parseDescription(orChain(false));
    auto v4 = parseDescription(orChain(true));
    ASSERT_EQ(v3.ir.exprs.size(), v4.ir.exprs.size());
    for (std::size_t i = 0; i < v3.ir.exprs.size(); ++i) {
        const auto &x = v3.ir.exprs[i], &y = v4.ir.exprs[i];
        EXPECT_EQ(static_cast<int>(x.kind), static_cast<int>(y.kind)) << i;
        EXPECT_EQ(x.op, y.op) << i;
        EXPECT_EQ(x.type, y.type) << i;
        EXPECT_EQ(x.width, y.width) << i;
        EXPECT_EQ(x.start, y.start) << i;
        EXPECT_EQ(x.end, y.end) << i;
        EXPECT_EQ(x.a, y.a) << i;
        EXPECT_EQ(x.b, y.b) << i;
    }
    const auto& top = v4.ir.expr(v4.members.at(0).rhs);
    EXPECT_EQ(top.kind, ExprKind::Binary);
    EXPECT_EQ(top.binaryOp(), kerf::frontend::BinaryOp::Or);
    EXPECT_EQ(top.start, 20u);
    EXPECT_EQ(top.end, 45u);
    // y is a[0] | a[1] | a[2] | a[3]: 1 exactly when a bit of a is (evaluated on the lowering)
    auto low = kerf::frontend::lower(v4);
    for (int a = 0; a < 16; ++a) {
        std::map<std::string, bool> in;
        for (int k = 0; k < 4; ++k) in[fmt::format("a[{}]", k)] = (a >> k) & 1;
        EXPECT_EQ(kerf::test::evalOutput(low.net, "y", in), a != 0) << a;
    }
}

TEST(FrontendDescription, RejectsMalformedLinks) {
    json d = orChain(true);
    d["version"] = 3;   // version 3 has no links
    EXPECT_NE(internalError(d.dump()).find("no links"), std::string::npos);
    d = orChain(true);
    // nodes: a 0, its selects 2 4 6 8, y 9, the ORs 10 11 12 (11 and 12 links)
    d["exprs"][11] = json::array({11, 6, 38});   // continues itself
    EXPECT_NE(internalError(d.dump()).find("does not precede"), std::string::npos);
    d = orChain(true);
    d["exprs"][11] = json::array({0, 6, 38});    // continues a ref, not a binary node
    EXPECT_NE(internalError(d.dump()).find("not a binary node"), std::string::npos);
    d = orChain(true);
    d["exprs"][11] = json::array({10, 6, 3});    // ends before the chain starts
    EXPECT_NE(internalError(d.dump()).find("ends before"), std::string::npos);
    d = orChain(true);
    d["exprs"][11] = json::array({10, 6});       // a field short
    EXPECT_NE(internalError(d.dump()).find("expected 3"), std::string::npos);
}

TEST(FrontendDescription, RejectsTruncatedText) {
    std::string t = simple().dump();
    EXPECT_NE(internalError(t.substr(0, t.size() / 2)).find("not valid JSON"), std::string::npos);
    EXPECT_FALSE(internalError("").empty());
    EXPECT_FALSE(internalError("[1,2,3]").empty());
}

TEST(FrontendDescription, RejectsOperandsThatDoNotPrecede) {
    json d = simple();
    d["exprs"][1][5] = 1;   // the unary node names itself
    EXPECT_NE(internalError(d.dump()).find("does not precede"), std::string::npos);
    d = simple();
    d["exprs"][1][5] = 99;
    EXPECT_NE(internalError(d.dump()).find("does not precede"), std::string::npos);
}

TEST(FrontendDescription, RejectsUnknownSymbolsAndKinds) {
    json d = simple();
    d["exprs"][0][4] = 42;
    EXPECT_NE(internalError(d.dump()).find("unknown symbol"), std::string::npos);
    d = simple();
    d["exprs"][0][0] = "wibble";
    EXPECT_NE(internalError(d.dump()).find("unknown kind"), std::string::npos);
    d = simple();
    d["exprs"][1][4] = "**?";
    EXPECT_NE(internalError(d.dump()).find("unknown unary operator"), std::string::npos);
}

TEST(FrontendDescription, RejectsInconsistentWidths) {
    DescBuilder b;
    b.sig("a", 4, "input");
    b.sig("y", 8, "output");
    int a = b.ref("a");
    int cat = b.add(json::array({"concat", b.vec(8), -1, -1, json::array({a, a, a})}));   // 12 bits in an 8-bit node
    b.assignMember(b.ref("y"), cat, 2, {"a"}, {"y"});
    EXPECT_NE(internalError(b.build().dump()).find("do not add up"), std::string::npos);
    json d = simple();
    d["exprs"][1][1] = 0;   // the 1-bit reduction given the 4-bit type: fine by itself...
    d["types"][0]["width"] = 5;   // ...but a vector [3:0] of width 5 is not
    EXPECT_NE(internalError(d.dump()).find("range does not match"), std::string::npos);
}

TEST(FrontendDescription, RejectsMalformedCaseTables) {
    auto table = [](const std::string& labels, std::vector<int> counts, const std::string& values, bool fixed = true) {
        DescBuilder b;
        b.sig("s", 2, "input");
        b.sig("i", 2, "input");
        b.sig("y", 4, "output", true);
        int t = fixed ? b.ref("y") : b.index(b.ref("y"), b.ref("i"), 3, 0, 1);
        int c = b.caseTable(b.ref("s"), 2, labels, std::move(counts), {t}, {values});
        b.combMember(b.block({c}), 1, {"s", "i"}, {"y"});
        return b.build().dump();
    };
    EXPECT_EQ(internalError(table("0001", {}, "00011111")), "");
    EXPECT_EQ(internalError(table("000110", {1, 2}, "0001----")), "");
    EXPECT_NE(internalError(table("0001", {}, "0001111")).find("values"), std::string::npos);
    EXPECT_NE(internalError(table("0001", {}, "000111111111")).find("target's width"), std::string::npos);
    EXPECT_NE(internalError(table("0-01", {}, "00011111")).find("character"), std::string::npos);
    EXPECT_NE(internalError(table("000110", {1, 1}, "00011111")).find("do not add up"), std::string::npos);
    EXPECT_NE(internalError(table("000", {}, "00011111")).find("whole number"), std::string::npos);
    EXPECT_NE(internalError(table("00", {}, "0", false)).find("not a fixed part"), std::string::npos);
}

TEST(FrontendDescription, RejectsNodesSharedBetweenMembers) {
    DescBuilder b;
    b.sig("a", 1, "input");
    b.sig("y", 1, "output");
    b.sig("z", 1, "output");
    int a = b.ref("a");
    b.assignMember(b.ref("y"), a, 2, {"a"}, {"y"});
    b.assignMember(b.ref("z"), a, 3, {"a"}, {"z"});
    EXPECT_NE(internalError(b.build().dump()).find("shared by members"), std::string::npos);
}

TEST(FrontendDescription, RejectsLocalsOfAnotherBlock) {
    DescBuilder b;
    b.sig("y", 1, "output", true);
    b.sig("z", 1, "output", true);
    b.local("i", 1);
    int s1 = b.assign(b.ref("y"), b.ref("i"));
    b.combMember(b.block({s1}), 2, {}, {"y"});
    int s2 = b.assign(b.ref("z"), b.ref("i"));   // i belongs to the first block
    b.combMember(b.block({s2}), 3, {}, {"z"});
    EXPECT_NE(internalError(b.build().dump()).find("local of another block"), std::string::npos);
}

TEST(FrontendDescription, MalformedFieldsNeverCrash) {
    // Every field of every node replaced by values of the wrong kind: each parse either
    // succeeds or fails with an internal error (the robustness fuzzer covers this widely).
    json base = simple();
    const json odd[] = {nullptr, -7, 1e9, "x", json::array(), json::object(), true, 4294967295u};
    for (const char* table : {"exprs", "stmts", "signals", "members", "types", "ports"}) {
        for (std::size_t i = 0; i < base[table].size(); ++i) {
            json& node = base[table][i];
            std::vector<std::string> keys;
            if (node.is_object())
                for (auto& [k, v] : node.items()) keys.push_back(k);
            std::size_t n = node.is_array() ? node.size() : keys.size();
            for (std::size_t f = 0; f < n; ++f)
                for (const json& v : odd) {
                    json d = base;
                    if (node.is_array()) d[table][i][f] = v;
                    else d[table][i][keys[f]] = v;
                    try {
                        parseDescription(d.dump());
                    } catch (const kerf::Error& e) {
                        EXPECT_EQ(e.code(), ExitCode::Internal) << table << " " << i << " " << f << ": " << e.what();
                    }
                }
        }
    }
}
