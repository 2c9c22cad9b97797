// frontend_lower_test.cpp — lowering of hand-written module descriptions.
//
// Expected behaviour comes from the Verilog semantics in IEEE 1800-2017
// (clause 12.4 if-else, 12.5 case/casez, 10.3 continuous assignment,
// 9.2.2.2 always_comb): each test builds a description in the reader's
// format and compares the network's function with a direct evaluation.
#include "kerf/frontend/lower.h"

#include <fmt/format.h>
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

using kerf::frontend::lower;
using kerf::frontend::parseDescription;
using json = nlohmann::json;

namespace {

json sig(const std::string& name, int width, const std::string& dir = "", bool var = false) {
    json s = {{"name", name}, {"kind", var ? "variable" : "net"}, {"width", width}, {"signed", false},
              {"msb", width - 1}, {"lsb", 0}, {"vector", width > 1}, {"decl", nullptr},
              {"src", {{"file", "t.v"}, {"start", 0}, {"end", 1}, {"line", 1}, {"col", 1}}}};
    if (!dir.empty()) s["direction"] = dir;
    return s;
}
json ref(const std::string& n, int w) { return {{"op", "ref"}, {"name", n}, {"width", w}, {"signed", false}}; }
json cnst(const std::string& bits) { return {{"op", "const"}, {"bits", bits}, {"width", bits.size()}, {"signed", false}}; }
json bin(const std::string& o, json a, json b, int w) {
    return {{"op", "binary"}, {"operator", o}, {"lhs", a}, {"rhs", b}, {"width", w}, {"signed", false}};
}
json src(int line) { return {{"file", "t.v"}, {"start", line * 10}, {"end", line * 10 + 5}, {"line", line}, {"col", 3}}; }

json module(std::vector<json> ports, std::vector<json> members, std::vector<json> extra = {}) {
    json sigs = json::array();
    for (auto& p : ports) sigs.push_back(p);
    for (auto& e : extra) sigs.push_back(e);
    return {{"format", "kerf-module"}, {"version", 1},
            {"module", {{"name", "t"}, {"src", {{"file", "t.v"}, {"start", 0}, {"end", 999}, {"line", 1}, {"col", 1}}}}},
            {"ports", ports}, {"signals", sigs}, {"members", members}};
}

/// Evaluate output `o` of the lowered network for an assignment of inputs by name.
bool evalOut(const kerf::frontend::Lowered& l, const std::string& out, const std::map<std::string, bool>& in) {
    std::vector<std::uint64_t> words;
    for (auto id : l.net.inputs()) {
        auto it = in.find(l.net.node(id).name);
        words.push_back(it != in.end() && it->second ? ~0ull : 0ull);
    }
    auto vals = kerf::net::simulate(l.net, words);
    for (std::size_t i = 0; i < l.net.outputs().size(); ++i)
        if (l.net.outputs()[i].name == out) return vals[i] & 1;
    ADD_FAILURE() << "no output " << out;
    return false;
}

} // namespace

TEST(FrontendLower, ParallelCaseMatchesCaseSemantics) {
    // always_comb begin y = 0; case (s) 2'b00: y = a; 2'b01: y = b; 2'b10: y = a & b; endcase end
    json body = {{"stmt", "block"}, {"items", json::array({
        {{"stmt", "assign"}, {"lhs", ref("y", 1)}, {"rhs", cnst("0")}, {"src", src(2)}},
        {{"stmt", "case"}, {"kind", "case"}, {"check", "none"}, {"expr", ref("s", 2)}, {"src", src(3)},
         {"default", nullptr},
         {"items", json::array({
             {{"exprs", {cnst("00")}}, {"body", {{"stmt", "assign"}, {"lhs", ref("y", 1)}, {"rhs", ref("a", 1)}}}},
             {{"exprs", {cnst("01")}}, {"body", {{"stmt", "assign"}, {"lhs", ref("y", 1)}, {"rhs", ref("b", 1)}}}},
             {{"exprs", {cnst("10")}}, {"body", {{"stmt", "assign"}, {"lhs", ref("y", 1)},
                                                 {"rhs", bin("&", ref("a", 1), ref("b", 1), 1)}}}}})}}})}};
    json m = module({sig("s", 2, "input"), sig("a", 1, "input"), sig("b", 1, "input"), sig("y", 1, "output", true)},
                    {{{"kind", "comb"}, {"id", 0}, {"style", "always_comb"}, {"src", src(1)}, {"locals", json::array()},
                      {"body", body}, {"reads", {"s", "a", "b"}}, {"writes", {"y"}}}});
    auto l = lower(parseDescription(m));
    ASSERT_EQ(l.net.outputs().size(), 1u);
    for (int v = 0; v < 16; ++v) {
        bool s0 = v & 1, s1 = v & 2, a = v & 4, b = v & 8;
        int s = s0 + 2 * s1;
        bool want = s == 0 ? a : s == 1 ? b : s == 2 ? (a && b) : false;
        EXPECT_EQ(evalOut(l, "y", {{"s[0]", s0}, {"s[1]", s1}, {"a", a}, {"b", b}}), want) << v;
    }
}

TEST(FrontendLower, LatchIsReportedWithLocation) {
    // always @* if (en) q = d;   -- q keeps its value when en is 0 (IEEE 1800-2017 9.2.2.2)
    json body = {{"stmt", "if"}, {"cond", ref("en", 1)}, {"else", nullptr}, {"check", "none"}, {"src", src(2)},
                 {"then", {{"stmt", "assign"}, {"lhs", ref("q", 1)}, {"rhs", ref("d", 1)}}}};
    json m = module({sig("en", 1, "input"), sig("d", 1, "input"), sig("q", 1, "output", true)},
                    {{{"kind", "comb"}, {"id", 0}, {"style", "always_star"}, {"src", src(4)}, {"locals", json::array()},
                      {"body", body}, {"reads", {"en", "d"}}, {"writes", {"q"}}}});
    try {
        lower(parseDescription(m));
        FAIL() << "no error";
    } catch (const kerf::Error& e) {
        EXPECT_NE(std::string(e.what()).find("not assigned on every path"), std::string::npos);
        EXPECT_EQ(e.loc().line, 4);
        EXPECT_EQ(e.loc().file, "t.v");
    }
}

TEST(FrontendLower, LoopAndMultipleDriversAreErrors) {
    json loop = module({sig("a", 1, "input"), sig("y", 1, "output")},
                       {{{"kind", "assign"}, {"id", 0}, {"src", src(2)}, {"lhs", ref("p", 1)},
                         {"rhs", bin("&", ref("q", 1), ref("a", 1), 1)}, {"reads", {"q", "a"}}, {"writes", {"p"}}},
                        {{"kind", "assign"}, {"id", 1}, {"src", src(3)}, {"lhs", ref("q", 1)},
                         {"rhs", ref("p", 1)}, {"reads", {"p"}}, {"writes", {"q"}}},
                        {{"kind", "assign"}, {"id", 2}, {"src", src(4)}, {"lhs", ref("y", 1)},
                         {"rhs", ref("q", 1)}, {"reads", {"q"}}, {"writes", {"y"}}}},
                       {sig("p", 1), sig("q", 1)});
    EXPECT_THROW(lower(parseDescription(loop)), kerf::Error);
    json two = module({sig("a", 1, "input"), sig("y", 1, "output")},
                      {{{"kind", "assign"}, {"id", 0}, {"src", src(2)}, {"lhs", ref("y", 1)},
                        {"rhs", ref("a", 1)}, {"reads", {"a"}}, {"writes", {"y"}}},
                       {{"kind", "assign"}, {"id", 1}, {"src", src(3)}, {"lhs", ref("y", 1)},
                        {"rhs", cnst("1")}, {"reads", json::array()}, {"writes", {"y"}}}});
    try {
        lower(parseDescription(two));
        FAIL() << "no error";
    } catch (const kerf::Error& e) {
        EXPECT_NE(std::string(e.what()).find("more than one driver"), std::string::npos);
        EXPECT_GT(e.loc().line, 0);
    }
}

TEST(FrontendLower, ArithmeticStaysWordLevelUnlessBitBlasted) {
    // assign s = a + b;  (3-bit operands) — kept as a word operation; bit-blasted for the proof.
    json m = module({sig("a", 3, "input"), sig("b", 3, "input"), sig("s", 3, "output")},
                    {{{"kind", "assign"}, {"id", 0}, {"src", src(2)}, {"lhs", ref("s", 3)},
                      {"rhs", bin("+", ref("a", 3), ref("b", 3), 3)}, {"reads", {"a", "b"}}, {"writes", {"s"}}}});
    auto word = lower(parseDescription(m));
    ASSERT_EQ(word.wordOps.size(), 1u);
    EXPECT_EQ(word.wordOps[0].op, "+");
    EXPECT_FALSE(word.wordOps[0].operands[0].generated);   // the port is used by name
    kerf::frontend::LowerOptions o;
    o.bitBlastArithmetic = true;
    auto bits = lower(parseDescription(m), o);
    EXPECT_TRUE(bits.wordOps.empty());
    for (int a = 0; a < 8; ++a)
        for (int b = 0; b < 8; ++b) {
            std::map<std::string, bool> in;
            for (int i = 0; i < 3; ++i) {
                in[fmt::format("a[{}]", i)] = (a >> i) & 1;
                in[fmt::format("b[{}]", i)] = (b >> i) & 1;
            }
            for (int i = 0; i < 3; ++i)
                EXPECT_EQ(evalOut(bits, fmt::format("s[{}]", i), in), bool((((a + b) & 7) >> i) & 1));
        }
}
