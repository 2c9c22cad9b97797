// frontend_lower_test.cpp — lowering of hand-built module descriptions.
//
// Expected behaviour comes from the Verilog semantics in IEEE 1800-2017
// (recalled from memory: 12.4 if-else, 12.5 case, 10.3 continuous
// assignment, 9.2.2.2 always_comb, 11.5.1 selects): each test builds a
// description in the reader's format and compares the network's function,
// by simulation, with a direct evaluation written in the test.
#include "frontend_support.h"
#include "kerf/passes/factored.h"

#include <random>

using kerf::frontend::lower;
using kerf::frontend::LowerOptions;
using kerf::frontend::OutputKind;
using kerf::frontend::parseDescription;
using kerf::test::DescBuilder;
using kerf::test::evalOutput;
using kerf::test::hasOutput;
using json = nlohmann::json;

namespace {

std::map<std::string, bool> bits(const std::string& name, int width, std::uint64_t v) {
    std::map<std::string, bool> m;
    for (int i = 0; i < width; ++i) m[fmt::format("{}[{}]", name, i)] = (v >> i) & 1;
    return m;
}

std::string errorOf(const json& d, const LowerOptions& o = {}) {
    try {
        lower(parseDescription(d), o);
    } catch (const kerf::Error& e) {
        return e.render();
    }
    return "";
}

} // namespace

TEST(FrontendLower, ParallelCaseMatchesCaseSemantics) {
    // always_comb begin y = 0; case (s) 2'b00: y = a; 2'b01: y = b; 2'b10: y = a & b; endcase end
    DescBuilder d;
    d.sig("s", 2, "input");
    d.sig("a", 1, "input");
    d.sig("b", 1, "input");
    d.sig("y", 1, "output", true);
    int s0 = d.assign(d.ref("y"), d.cnst("0"), 2);
    int i0 = d.assign(d.ref("y"), d.ref("a"));
    int i1 = d.assign(d.ref("y"), d.ref("b"));
    int i2 = d.assign(d.ref("y"), d.bin("&", d.ref("a"), d.ref("b"), 1));
    int c = d.caseStmt(d.ref("s"), {{{d.cnst("00")}, i0}, {{d.cnst("01")}, i1}, {{d.cnst("10")}, i2}});
    d.combMember(d.block({s0, c}), 1, {"s", "a", "b"}, {"y"});
    auto l = lower(parseDescription(d.build()));
    ASSERT_EQ(l.net.outputs().size(), 1u);
    for (int v = 0; v < 16; ++v) {
        bool s0b = v & 1, s1b = v & 2, a = v & 4, b = v & 8;
        int s = s0b + 2 * s1b;
        bool want = s == 0 ? a : s == 1 ? b : s == 2 ? (a && b) : false;
        EXPECT_EQ(evalOutput(l.net, "y", {{"s[0]", s0b}, {"s[1]", s1b}, {"a", a}, {"b", b}}), want) << v;
    }
}

TEST(FrontendLower, CaseTableMatchesCaseSemantics) {
    // always_comb begin y = 2'b11; z = 4'b0; q = a;
    //   case (s)
    //     3'd0:       begin y = 2'b01; z[3:2] = 2'b10; end
    //     3'd3, 3'd5: y = 2'b10;
    //     3'd6:       begin z = 4'b1001; q = 1'b0; end
    //     3'd7:       ;
    //     default:    z[1] = 1'b1;
    //   endcase end
    // An item that does not assign a target leaves the value from before the case (12.5);
    // `z` and `z[3:2]` share bits but no item assigns both.
    DescBuilder d;
    d.sig("s", 3, "input");
    d.sig("a", 1, "input");
    d.sig("y", 2, "output", true);
    d.sig("z", 4, "output", true);
    d.sig("q", 1, "output", true);
    int s0 = d.assign(d.ref("y"), d.cnst("11"));
    int s1 = d.assign(d.ref("z"), d.cnst("0000"));
    int s2 = d.assign(d.ref("q"), d.ref("a"));
    int z32 = d.range(d.ref("z"), 3, 2, 3, 0, 2);
    int dflt = d.assign(d.index(d.ref("z"), d.cnst("01"), 3, 0, 1), d.cnst("1"));
    int c = d.caseTable(d.ref("s"), 3, "000011101110111", {1, 2, 1, 1}, {d.ref("y"), z32, d.ref("z"), d.ref("q")},
                        {"0110----", "10------", "--------1001----", "--0-"}, dflt);
    d.combMember(d.block({s0, s1, s2, c}), 1, {"s", "a"}, {"y", "z", "q"});
    auto l = lower(parseDescription(d.build()));
    for (int v = 0; v < 16; ++v) {
        int s = v & 7;
        bool a = v & 8;
        int y = 3, z = 0;
        bool q = a;
        switch (s) {
        case 0: y = 1; z = 0b1000; break;
        case 3: case 5: y = 2; break;
        case 6: z = 0b1001; q = false; break;
        case 7: break;
        default: z = 0b0010; break;
        }
        auto in = bits("s", 3, static_cast<std::uint64_t>(s));
        in["a"] = a;
        for (int i = 0; i < 2; ++i) EXPECT_EQ(evalOutput(l.net, fmt::format("y[{}]", i), in), ((y >> i) & 1) != 0) << v;
        for (int i = 0; i < 4; ++i) EXPECT_EQ(evalOutput(l.net, fmt::format("z[{}]", i), in), ((z >> i) & 1) != 0) << v;
        EXPECT_EQ(evalOutput(l.net, "q", in), q) << v;
    }
}

TEST(FrontendLower, CaseTableWildcardsAndUnknownLabels) {
    // casez (s) 3'b1??: y = 1; 3'b01?: y = 0; 3'b00x: y = 1; endcase, y = a before: the z bits are
    // wildcards; an x bit in a casez label matches only an x selector bit, never a 0/1 (12.5.1).
    DescBuilder d;
    d.sig("s", 3, "input");
    d.sig("a", 1, "input");
    d.sig("y", 1, "output", true);
    int s0 = d.assign(d.ref("y"), d.ref("a"));
    int c = d.caseTable(d.ref("s"), 3, "1zz01z00x", {}, {d.ref("y")}, {"101"}, -1, "casez");
    d.combMember(d.block({s0, c}), 1, {"s", "a"}, {"y"});
    auto l = lower(parseDescription(d.build()));
    for (int v = 0; v < 16; ++v) {
        int s = v & 7;
        bool a = v & 8;
        bool want = (s & 4) ? true : (s & 2) ? false : a;
        auto in = bits("s", 3, static_cast<std::uint64_t>(s));
        in["a"] = a;
        EXPECT_EQ(evalOutput(l.net, "y", in), want) << v;
    }
}

TEST(FrontendLower, CaseTableItemAssigningSharedBitsIsAnInternalError) {
    DescBuilder d;
    d.sig("s", 1, "input");
    d.sig("z", 2, "output", true);
    int s0 = d.assign(d.ref("z"), d.cnst("00"));
    int z0 = d.range(d.ref("z"), 0, 0, 1, 0, 1);
    int c = d.caseTable(d.ref("s"), 1, "01", {}, {d.ref("z"), z0}, {"1010", "-1"});
    d.combMember(d.block({s0, c}), 1, {"s"}, {"z"});
    EXPECT_NE(errorOf(d.build()).find("two targets that share a bit"), std::string::npos);
}

TEST(FrontendLower, LatchIsReportedWithLocation) {
    // always @* if (en) q = d;   -- q keeps its value when en is 0 (9.2.2.2)
    DescBuilder d;
    d.sig("en", 1, "input");
    d.sig("dd", 1, "input");
    d.sig("q", 1, "output", true);
    int body = d.ifs(d.ref("en"), d.assign(d.ref("q"), d.ref("dd")));
    d.combMember(d.block({body}), 4, {"en", "dd"}, {"q"});
    try {
        lower(parseDescription(d.build()));
        FAIL() << "no error";
    } catch (const kerf::Error& e) {
        EXPECT_NE(std::string(e.what()).find("not assigned on every path"), std::string::npos);
        EXPECT_EQ(e.loc().line, 4);
        EXPECT_EQ(e.loc().file, "t.v");
    }
}

TEST(FrontendLower, CombinationalLoopIsAnError) {
    DescBuilder d;
    d.sig("a", 1, "input");
    d.sig("y", 1, "output");
    d.sig("p", 1);
    d.sig("q", 1);
    d.assignMember(d.ref("p"), d.bin("&", d.ref("q"), d.ref("a"), 1), 2, {"q", "a"}, {"p"});
    d.assignMember(d.ref("q"), d.ref("p"), 3, {"p"}, {"q"});
    d.assignMember(d.ref("y"), d.ref("q"), 4, {"q"}, {"y"});
    EXPECT_NE(errorOf(d.build()).find("combinational loop"), std::string::npos);
}

TEST(FrontendLower, MultipleDriversNameBothPlaces) {
    DescBuilder d;
    d.sig("a", 1, "input");
    d.sig("y", 1, "output");
    d.assignMember(d.ref("y"), d.ref("a"), 2, {"a"}, {"y"});
    d.assignMember(d.ref("y"), d.cnst("1"), 3, {}, {"y"});
    std::string err = errorOf(d.build());
    EXPECT_NE(err.find("more than one driver"), std::string::npos) << err;
    EXPECT_EQ(err.rfind("t.v:3:3:", 0), 0u) << err;              // reported at the second statement
    EXPECT_NE(err.find("also driven at t.v:2:3"), std::string::npos) << err;  // naming the first
}

TEST(FrontendLower, KeptCodeAndRestructuredCodeConflictNamesBoth) {
    DescBuilder d;
    d.sig("a", 4, "input");
    d.sig("y", 4, "output", true);
    d.keptMember(2, {"a"}, {"y"}, {{"y", json::array({json::array({0, 1})})}});
    d.assignMember(d.range(d.ref("y"), 1, 0, 3, 0, 2), d.range(d.ref("a"), 1, 0, 3, 0, 2), 5, {"a"}, {"y"});
    std::string err = errorOf(d.build());
    EXPECT_NE(err.find("more than one driver"), std::string::npos) << err;
    EXPECT_NE(err.find("t.v:2:3"), std::string::npos) << err;
    EXPECT_NE(err.find("t.v:5:3"), std::string::npos) << err;
}

TEST(FrontendLower, KeptCodeDrivesOnlyTheBitsItWrites) {
    // A kept block writes y[1:0]; an assignment drives y[3:2]: no conflict, and y[3:2] are outputs.
    DescBuilder d;
    d.sig("a", 4, "input");
    d.sig("y", 4, "output", true);
    d.keptMember(2, {"a"}, {"y"}, {{"y", json::array({json::array({0, 1})})}});
    d.assignMember(d.range(d.ref("y"), 3, 2, 3, 0, 2), d.un("~", d.range(d.ref("a"), 3, 2, 3, 0, 2), 2), 5, {"a"},
                   {"y"});
    auto l = lower(parseDescription(d.build()));
    EXPECT_TRUE(hasOutput(l.net, "y[2]"));
    EXPECT_TRUE(hasOutput(l.net, "y[3]"));
    EXPECT_FALSE(hasOutput(l.net, "y[0]"));
    for (std::uint64_t v = 0; v < 16; ++v) {
        EXPECT_EQ(evalOutput(l.net, "y[2]", bits("a", 4, v)), !((v >> 2) & 1));
        EXPECT_EQ(evalOutput(l.net, "y[3]", bits("a", 4, v)), !((v >> 3) & 1));
    }
}

TEST(FrontendLower, ArithmeticStaysWordLevelUnlessBitBlasted) {
    // assign s = a + b;  (3-bit operands) — kept as a word operation; bit-blasted for the proof.
    DescBuilder d;
    d.sig("a", 3, "input");
    d.sig("b", 3, "input");
    d.sig("s", 3, "output");
    d.assignMember(d.ref("s"), d.bin("+", d.ref("a"), d.ref("b"), 3), 2, {"a", "b"}, {"s"});
    json m = d.build();
    auto word = lower(parseDescription(m));
    ASSERT_EQ(word.wordOps.size(), 1u);
    EXPECT_EQ(word.wordOps[0].op, "+");
    EXPECT_FALSE(word.wordOps[0].operands[0].generated);   // the port is used by name
    LowerOptions o;
    o.bitBlastArithmetic = true;
    auto g = lower(parseDescription(m), o);
    EXPECT_TRUE(g.wordOps.empty());
    for (int a = 0; a < 8; ++a)
        for (int b = 0; b < 8; ++b) {
            auto in = bits("a", 3, a);
            for (auto& [k, v] : bits("b", 3, b)) in[k] = v;
            for (int i = 0; i < 3; ++i)
                EXPECT_EQ(evalOutput(g.net, fmt::format("s[{}]", i), in), bool((((a + b) & 7) >> i) & 1));
        }
}

TEST(FrontendLower, ArithmeticWithAConstantZeroLeavesNoWordOperation) {
    // p = a * 3'b000;  s = a + 3'b000;  d = 3'b000 - a;  (3-bit): the product is 0 and the sum
    // is a, wires only; a difference from 0 stays a word operation. Reference: the definitions
    // of *, + and - (IEEE 1800-2017 11.4.3), checked on every input.
    DescBuilder d;
    d.sig("a", 3, "input");
    d.sig("p", 3, "output");
    d.sig("s", 3, "output");
    d.sig("d", 3, "output");
    d.assignMember(d.ref("p"), d.bin("*", d.ref("a"), d.cnst("000"), 3), 2, {"a"}, {"p"});
    d.assignMember(d.ref("s"), d.bin("+", d.ref("a"), d.cnst("000"), 3), 3, {"a"}, {"s"});
    d.assignMember(d.ref("d"), d.bin("-", d.cnst("000"), d.ref("a"), 3), 4, {"a"}, {"d"});
    auto l = lower(parseDescription(d.build()));
    ASSERT_EQ(l.wordOps.size(), 1u);
    EXPECT_EQ(l.wordOps[0].op, "-");
    for (int a = 0; a < 8; ++a)
        for (int i = 0; i < 3; ++i) {
            EXPECT_FALSE(evalOutput(l.net, fmt::format("p[{}]", i), bits("a", 3, a)));
            EXPECT_EQ(evalOutput(l.net, fmt::format("s[{}]", i), bits("a", 3, a)), bool((a >> i) & 1));
        }
}

TEST(FrontendLower, DeepXorChainIsLoweredIteratively) {
    // y = a[0] ^ a[1] ^ ... ^ a[19999]: a left-deep chain 20,000 operators deep.
    // Reference: the parity of the selected bits (the definition of ^).
    const int n = 20000;
    DescBuilder d;
    d.sig("a", n, "input");
    d.sig("y", 1, "output");
    int a = d.ref("a");
    int acc = d.index(a, d.cnst(std::string(15, '0') + "0"), n - 1, 0, 1);
    for (int i = 1; i < n; ++i) {
        std::string idx;
        for (int b = 14; b >= 0; --b) idx.push_back(((i >> b) & 1) ? '1' : '0');
        acc = d.bin("^", acc, d.index(a, d.cnst(idx), n - 1, 0, 1), 1);
    }
    d.assignMember(d.ref("y"), acc, 2, {"a"}, {"y"});
    auto l = lower(parseDescription(d.build()));
    std::mt19937_64 rng(7);
    std::vector<std::uint64_t> words;
    std::uint64_t parity = 0;
    for (auto id : l.net.inputs()) {
        (void)id;
        words.push_back(rng());
        parity ^= words.back();
    }
    ASSERT_EQ(l.net.inputs().size(), static_cast<std::size_t>(n));
    auto out = kerf::net::simulate(l.net, words);
    ASSERT_EQ(out.size(), 1u);
    EXPECT_EQ(out[0], parity);
}

TEST(FrontendLower, LongChainOfAssignmentsIsLoweredInOrder) {
    // assign w1 = ~w0; assign w2 = ~w1; ... 30,001 statements, written last to first:
    // the lowering orders them itself (no recursion along the chain). y = ~a.
    const int n = 30001;
    DescBuilder d;
    d.sig("a", 1, "input");
    d.sig("y", 1, "output");
    for (int i = 1; i <= n; ++i) d.sig(fmt::format("w{}", i), 1);
    for (int i = n; i >= 1; --i) {
        std::string prev = i == 1 ? "a" : fmt::format("w{}", i - 1);
        d.assignMember(d.ref(fmt::format("w{}", i)), d.un("~", d.ref(prev), 1), 2, {prev}, {fmt::format("w{}", i)});
    }
    d.assignMember(d.ref("y"), d.ref(fmt::format("w{}", n)), 3, {fmt::format("w{}", n)}, {"y"});
    LowerOptions o;
    o.dissolveInternal = true;
    auto l = lower(parseDescription(d.build()), o);
    ASSERT_EQ(l.net.outputs().size(), 1u);
    EXPECT_FALSE(evalOutput(l.net, "y", {{"a", true}}));
    EXPECT_TRUE(evalOutput(l.net, "y", {{"a", false}}));
}

TEST(FrontendLower, ElseIfChainKeepsPriority) {
    // if (s == 0) y = a[0]; else if (s == 1) y = a[1]; ... else y = 0 — 4,000 arms (12.4.1).
    const int n = 4000;
    DescBuilder d;
    d.sig("s", 12, "input");
    d.sig("a", n, "input");
    d.sig("y", 1, "output", true);
    int tail = d.assign(d.ref("y"), d.cnst("0"));
    auto idx = [](int v, int w) {
        std::string s;
        for (int b = w - 1; b >= 0; --b) s.push_back(((v >> b) & 1) ? '1' : '0');
        return s;
    };
    int chain = tail;
    for (int i = n - 1; i >= 0; --i) {
        int c = d.bin("==", d.ref("s"), d.cnst(idx(i, 12)), 1);
        int body = d.assign(d.ref("y"), d.index(d.ref("a"), d.cnst(idx(i, 12)), n - 1, 0, 1));
        chain = d.ifs(c, body, chain);
    }
    d.combMember(d.block({chain}), 1, {"s", "a"}, {"y"});
    auto l = lower(parseDescription(d.build()));
    for (int s : {0, 1, 77, 3999, 4000, 4095}) {
        auto in = bits("s", 12, static_cast<std::uint64_t>(s));
        if (s < n) in[fmt::format("a[{}]", s)] = true;
        EXPECT_EQ(evalOutput(l.net, "y", in), s < n) << s;
    }
}

TEST(FrontendLower, InternalSignalsStayOutputsUnlessDissolved) {
    // assign t = a & b; assign y = t | c;  — t is declared in the module.
    DescBuilder d;
    d.sig("a", 1, "input");
    d.sig("b", 1, "input");
    d.sig("c", 1, "input");
    d.sig("y", 1, "output");
    d.sig("t", 1);
    d.assignMember(d.ref("t"), d.bin("&", d.ref("a"), d.ref("b"), 1), 2, {"a", "b"}, {"t"});
    d.assignMember(d.ref("y"), d.bin("|", d.ref("t"), d.ref("c"), 1), 3, {"t", "c"}, {"y"});
    json m = d.build();
    auto kept = lower(parseDescription(m));
    ASSERT_TRUE(hasOutput(kept.net, "t"));
    EXPECT_TRUE(kept.dissolved.empty());
    for (std::size_t i = 0; i < kept.outputBits.size(); ++i) {
        const auto& src = kept.outputSources.at(i);
        if (kept.outputBits[i].signal == "t") {
            EXPECT_EQ(src.kind, OutputKind::Internal);
            EXPECT_EQ(src.member, 0);
        } else {
            EXPECT_EQ(src.kind, OutputKind::Port);
            EXPECT_EQ(src.member, 1);
        }
    }
    EXPECT_TRUE(evalOutput(kept.net, "t", {{"a", true}, {"b", true}}));
    LowerOptions o;
    o.dissolveInternal = true;
    auto gone = lower(parseDescription(m), o);
    EXPECT_FALSE(hasOutput(gone.net, "t"));
    ASSERT_EQ(gone.dissolved, std::vector<std::string>{"t"});
    EXPECT_TRUE(evalOutput(gone.net, "y", {{"a", true}, {"b", true}}));
    EXPECT_FALSE(evalOutput(gone.net, "y", {{"a", true}}));
}

TEST(FrontendLower, KeepAttributeMakesACutPoint) {
    // (* keep *) wire t = a & b; assign y = t | c;  — y reads t as an input, t stays an output.
    DescBuilder d;
    d.sig("a", 1, "input");
    d.sig("b", 1, "input");
    d.sig("c", 1, "input");
    d.sig("y", 1, "output");
    d.sig("t", 1, "", false, {"keep"});
    d.assignMember(d.ref("t"), d.bin("&", d.ref("a"), d.ref("b"), 1), 2, {"a", "b"}, {"t"});
    d.assignMember(d.ref("y"), d.bin("|", d.ref("t"), d.ref("c"), 1), 3, {"t", "c"}, {"y"});
    LowerOptions o;
    o.dissolveInternal = true;   // even when dissolving, a cut point stays
    auto l = lower(parseDescription(d.build()), o);
    ASSERT_TRUE(hasOutput(l.net, "t"));
    bool tIsInput = false;
    for (auto id : l.net.inputs()) tIsInput = tIsInput || l.net.node(id).name == "t";
    EXPECT_TRUE(tIsInput);
    EXPECT_TRUE(evalOutput(l.net, "y", {{"t", true}}));          // through the cut, not through a & b
    EXPECT_FALSE(evalOutput(l.net, "y", {{"a", true}, {"b", true}}));
    // --keep NAME does the same for a signal without the attribute.
    DescBuilder e;
    e.sig("a", 1, "input");
    e.sig("y", 1, "output");
    e.sig("u", 1);
    e.assignMember(e.ref("u"), e.un("~", e.ref("a"), 1), 2, {"a"}, {"u"});
    e.assignMember(e.ref("y"), e.ref("u"), 3, {"u"}, {"y"});
    LowerOptions k;
    k.keep = {"u"};
    auto lk = lower(parseDescription(e.build()), k);
    EXPECT_TRUE(evalOutput(lk.net, "y", {{"u", true}}));
    k.keep = {"nosuch"};
    EXPECT_THROW(lower(parseDescription(e.build()), k), kerf::Error);
}

TEST(FrontendLower, NarrowIndexWritesOnlyPositionsItCanName) {
    // y = a; y[s] = 1'b0;  with a 1-bit s and a 4-bit y: only y[0] and y[1] can be written
    // (11.5.1: the index value selects the bit; a 1-bit index takes the values 0 and 1).
    DescBuilder d;
    d.sig("a", 4, "input");
    d.sig("s", 1, "input");
    d.sig("y", 4, "output", true);
    int s1 = d.assign(d.ref("y"), d.ref("a"));
    int s2 = d.assign(d.index(d.ref("y"), d.ref("s"), 3, 0, 1), d.cnst("0"));
    d.combMember(d.block({s1, s2}), 1, {"a", "s"}, {"y"});
    auto l = lower(parseDescription(d.build()));
    for (std::uint64_t a = 0; a < 16; ++a)
        for (int s = 0; s < 2; ++s) {
            auto in = bits("a", 4, a);
            in["s"] = s;
            for (int i = 0; i < 4; ++i) {
                bool want = i == s ? false : bool((a >> i) & 1);
                EXPECT_EQ(evalOutput(l.net, fmt::format("y[{}]", i), in), want) << a << " " << s << " " << i;
            }
        }
}

TEST(FrontendLower, ConstantIndexTargetsWriteTheBitTheyName) {
    // assign y[k] = a[k] ^ c; for k = 7..0, in that order, each index a 4-bit constant (signed for
    // odd k, unsigned for even: both name position k, 11.5.1), and assign z = y[3] & c; first. Each
    // statement writes only the bit its constant names, and a reader of a bit another statement
    // writes gets that statement's value whatever the order in the file (10.3).
    DescBuilder d;
    d.sig("a", 8, "input");
    d.sig("c", 1, "input");
    d.sig("y", 8, "output");
    d.sig("z", 1, "output");
    auto pos = [](int k) { return fmt::format("{:04b}", k); };
    d.assignMember(d.ref("z"), d.bin("&", d.index(d.ref("y"), d.cnst(pos(3)), 7, 0, 1), d.ref("c"), 1), 1, {"y", "c"},
                   {"z"});
    for (int k = 7; k >= 0; --k) {
        int lhs = d.index(d.ref("y"), d.cnst(pos(k), k % 2 == 1), 7, 0, 1);
        int rhs = d.bin("^", d.index(d.ref("a"), d.cnst(pos(k)), 7, 0, 1), d.ref("c"), 1);
        d.assignMember(lhs, rhs, 2 + k, {"a", "c"}, {"y"});
    }
    auto l = lower(parseDescription(d.build()));
    for (std::uint64_t a = 0; a < 256; ++a)
        for (int c = 0; c < 2; ++c) {
            auto in = bits("a", 8, a);
            in["c"] = c;
            for (int k = 0; k < 8; ++k)
                EXPECT_EQ(evalOutput(l.net, fmt::format("y[{}]", k), in), bool(((a >> k) & 1) ^ c)) << a << " " << k;
            EXPECT_EQ(evalOutput(l.net, "z", in), bool((((a >> 3) & 1) ^ c) & c)) << a;
        }
}

TEST(FrontendLower, BitSelectReadersFollowTheBitsTheyReadNotTheWholeVector) {
    // A prefix chain over one vector written bit by bit, last bit first in the file:
    // assign y[k] = y[k-1] ^ a[k] for k = n-1 .. 1, then assign y[0] = a[0], so y[k] is the
    // XOR of a[0..k] (the prefix-XOR of IEEE 1800 11.4.7's ^ taken bit by bit). Beside it
    // z = y[n-1:n-4] (a constant part select) and p = ^y (the whole vector). The chain is longer
    // than the on-demand lowering's depth limit (20,000): ordered by whole signals, every writer
    // of y would depend on every other and be lowered from the first in the file, recursively,
    // and kerf refused it; ordered by the bits each statement reads it is a chain of n steps.
    const int n = 25000;
    DescBuilder d;
    d.sig("a", n, "input");
    d.sig("y", n, "output");
    d.sig("z", 4, "output");
    d.sig("p", 1, "output");
    auto pos = [](int k) { return fmt::format("{:015b}", k); };
    d.assignMember(d.ref("z"), d.range(d.ref("y"), n - 1, n - 4, n - 1, 0, 4), 1, {"y"}, {"z"});
    d.assignMember(d.ref("p"), d.un("^", d.ref("y"), 1), 2, {"y"}, {"p"});
    for (int k = n - 1; k >= 1; --k) {
        int lhs = d.index(d.ref("y"), d.cnst(pos(k)), n - 1, 0, 1);
        int rhs = d.bin("^", d.index(d.ref("y"), d.cnst(pos(k - 1)), n - 1, 0, 1),
                        d.index(d.ref("a"), d.cnst(pos(k)), n - 1, 0, 1), 1);
        d.assignMember(lhs, rhs, 3 + (n - k), {"y", "a"}, {"y"});
    }
    d.assignMember(d.index(d.ref("y"), d.cnst(pos(0)), n - 1, 0, 1), d.index(d.ref("a"), d.cnst(pos(0)), n - 1, 0, 1),
                   3 + n, {"a"}, {"y"});
    auto l = lower(parseDescription(d.build()));
    // 64 random patterns at once, one word per input bit.
    std::mt19937_64 rng(7);
    std::vector<std::uint64_t> words;
    std::map<std::string, std::uint64_t> byName;
    for (auto id : l.net.inputs()) {
        words.push_back(rng());
        byName[l.net.node(id).name] = words.back();
    }
    auto vals = kerf::net::simulate(l.net, words);
    std::map<std::string, std::uint64_t> out;
    for (std::size_t i = 0; i < l.net.outputs().size(); ++i) out[l.net.outputs()[i].name] = vals[i];
    std::vector<std::uint64_t> prefix(n);
    std::uint64_t acc = 0, all = 0;
    for (int k = 0; k < n; ++k) {
        auto it = byName.find(fmt::format("a[{}]", k));
        ASSERT_NE(it, byName.end()) << k;
        acc ^= it->second;
        prefix[k] = acc;
        all ^= acc;
    }
    for (int k = 0; k < n; k += 997) EXPECT_EQ(out.at(fmt::format("y[{}]", k)), prefix[k]) << k;
    EXPECT_EQ(out.at(fmt::format("y[{}]", n - 1)), prefix[n - 1]);
    for (int i = 0; i < 4; ++i) EXPECT_EQ(out.at(fmt::format("z[{}]", i)), prefix[n - 4 + i]) << i;
    EXPECT_EQ(out.at("p"), all);
}

// The expression-node merge (statement_nodes.cpp) on a long written sum: above
// ExpressionMergeLimits::factorCubes a merge is decided from cube and literal counts. Node
// elimination must keep the function (MIS, Brayton et al. 1987, from memory); a sum of products
// read by a sum becomes one node, while a product over a long sum is not multiplied out there.
TEST(FrontendLower, LongSumMergesWithoutFactoringAndKeepsItsFunction) {
    using kerf::algebra::Cover;
    using kerf::algebra::Cube;
    using kerf::algebra::makeLiteral;
    std::mt19937 rng(12);
    kerf::net::Network net;
    std::vector<kerf::net::NodeId> in;
    for (int i = 0; i < 16; ++i) in.push_back(net.addInput(fmt::format("x[{}]", i)));
    auto products = [&](int count) {
        Cover sum;
        for (int k = 0; k < count; ++k) {
            std::vector<kerf::algebra::Literal> lits;
            for (int i = 0; i < 16; ++i)
                if (rng() % 4 == 0) lits.push_back(makeLiteral(in[i], rng() % 2));
            if (lits.size() < 2) lits = {makeLiteral(in[k % 16], false), makeLiteral(in[(k + 7) % 16], true)};
            auto t = net.addLogic(Cover({Cube(lits)}));
            sum.cubes.push_back(Cube({makeLiteral(t, false)}));
        }
        sum.normalize();
        return net.addLogic(sum);
    };
    auto y = products(40);                  // y = t1 | ... | t40
    auto s = products(30);                  // z = x[0] & (u1 | ... | u30)
    auto z = net.addLogic(Cover({Cube({makeLiteral(in[0], false), makeLiteral(s, false)})}));
    net.addOutput("y", makeLiteral(y, false));
    net.addOutput("z", makeLiteral(z, false));
    const kerf::net::Network before = net;
    kerf::net::Network factored = net;

    kerf::frontend::ExpressionMergeLimits limits;
    limits.factorCubes = 24;
    limits.multiplyCubes = 24;
    auto counts = kerf::frontend::collapseExpressionNodes(net, limits);
    EXPECT_GE(counts.unfactored, 40u + 30u);   // every operand of both sums
    EXPECT_EQ(counts.keptApart, 1u);           // x[0] & (30 products) is not multiplied out above 24
    // Each sum is one node reading only inputs; z's node still reads the sum's node.
    auto driver = [&](const std::string& name) {
        for (const auto& o : net.outputs())
            if (o.name == name) return kerf::algebra::literalVar(o.driver);
        ADD_FAILURE() << name;
        return 0u;
    };
    for (const auto& c : net.node(driver("y")).cover.cubes)
        for (auto l : c.lits) EXPECT_FALSE(net.isLogic(kerf::algebra::literalVar(l)));
    const auto& zc = net.node(driver("z")).cover;
    ASSERT_EQ(zc.cubes.size(), 1u);
    EXPECT_EQ(zc.cubes[0].lits.size(), 2u);

    // Deciding every merge by the factored figures gives the same function.
    limits.factorCubes = limits.multiplyCubes = 4096;
    auto all = kerf::frontend::collapseExpressionNodes(factored, limits);
    EXPECT_EQ(all.unfactored, 0u);
    for (int round = 0; round < 4; ++round) {
        std::vector<std::uint64_t> words;
        for (int i = 0; i < 16; ++i) words.push_back((std::uint64_t(rng()) << 32) ^ rng());
        EXPECT_EQ(kerf::net::simulate(net, words), kerf::net::simulate(before, words));
        EXPECT_EQ(kerf::net::simulate(factored, words), kerf::net::simulate(before, words));
    }
}

// F85: the writer prints a node read inverted as its De Morgan dual, a product of sums. The
// merge multiplied two of those sums into the product at equal gates, and the factoring of
// that product arrived one level later than the sums apart: the written file read back one
// level deeper than the engine's result. A merge now never makes its node arrive later.
// (The shape is kerf's own output of tests/rtl/min_block_self_read.sv; expected depths by hand.)
TEST(FrontendLower, MergeNeverMakesItsNodeArriveLater) {
    using kerf::algebra::Cover;
    using kerf::algebra::Cube;
    using kerf::algebra::makeLiteral;
    kerf::net::Network net;
    auto k0 = net.addInput("k0"), k1 = net.addInput("k1"), i20 = net.addInput("i20"),
         i40 = net.addInput("i40"), i24 = net.addInput("i24");
    auto lit = [](kerf::net::NodeId v, bool neg = false) { return makeLiteral(v, neg); };
    auto sum = [&](std::vector<kerf::algebra::Literal> ls) {
        Cover c;
        for (auto l : ls) c.cubes.push_back(Cube({l}));
        c.normalize();
        return net.addLogic(c);
    };
    auto a = net.addLogic(Cover({Cube({lit(i20), lit(i40)})}));      // wire a = i20 & i40
    auto n24 = net.addLogic(Cover({Cube({lit(k0), lit(i24, true)})}));  // wire n24 = k0 & ~i24
    auto s1 = sum({lit(k0), lit(k1), lit(a, true)});
    auto s2 = sum({lit(k0), lit(k1, true), lit(a)});
    auto s3 = sum({lit(n24, true), lit(i20)});
    auto y = net.addLogic(Cover({Cube({lit(s1), lit(s2), lit(s3)})}));  // y = s1 & s2 & s3
    net.addOutput("a", lit(a));
    net.addOutput("n24", lit(n24));
    net.addOutput("y", lit(y));
    const kerf::net::Network before = net;
    const auto mBefore = kerf::passes::measureFactored(before);
    ASSERT_EQ(mBefore.depth, 4u);   // a at 1, each sum at 2, the 3-input AND at 4
    kerf::frontend::collapseExpressionNodes(net);
    const auto mAfter = kerf::passes::measureFactored(net);
    EXPECT_LE(mAfter.depth, mBefore.depth);
    EXPECT_LE(mAfter.gates, mBefore.gates);
    std::mt19937 rng(85);
    for (int round = 0; round < 4; ++round) {
        std::vector<std::uint64_t> words;
        for (int i = 0; i < 5; ++i) words.push_back((std::uint64_t(rng()) << 32) ^ rng());
        EXPECT_EQ(kerf::net::simulate(net, words), kerf::net::simulate(before, words));
    }
}
