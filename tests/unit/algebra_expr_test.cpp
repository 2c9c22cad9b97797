// Tests for the `kerf algebra` expression parser and subcommand
// (src/algebra_cli/). Operator precedence follows IEEE 1364-2005, 5.1.2
// (from memory): unary ~ binds tightest, then &, then |. The other expected
// values are computed by hand.

#include "algebra_support.h"

#include "kerf/algebra/algebra_command.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <sstream>

namespace kerf::algebra {
namespace {

using testing::Vars;

TEST(AlgebraExpr, PrecedenceAndExpansion) {
    Vars v;
    EXPECT_EQ(v.str(v("a & b | ~c")), "a & b | ~c");
    EXPECT_EQ(v.str(v("a | b & c")), "a | b & c");   // & before |
    EXPECT_EQ(v.str(v("(a | b) & c")), "a & c | b & c");
    EXPECT_EQ(v.str(v("(a | b) & (c | d)")), "a & c | a & d | b & c | b & d");
    EXPECT_EQ(v("(a | b) & (c | d)").size(), 4u);
}

TEST(AlgebraExpr, NamesGetIdsInFirstAppearanceOrder) {
    Vars v;
    Cover f = v("zeta & alpha | m[3] & bus_1[12]");
    EXPECT_EQ(v.table.names(), (std::vector<std::string>{"zeta", "alpha", "m[3]", "bus_1[12]"}));
    EXPECT_EQ(v.str(f), "zeta & alpha | m[3] & bus_1[12]");
}

TEST(AlgebraExpr, ConstantsAndComplements) {
    Vars v;
    EXPECT_TRUE(v("a & 0").isZero());
    EXPECT_TRUE(v("0").isZero());
    EXPECT_TRUE(v("1'b1").isOne());
    EXPECT_TRUE(v("1'b0 | 0").isZero());
    EXPECT_EQ(v.str(v("1 | a")), "1 | a");       // the algebraic model keeps both cubes
    EXPECT_TRUE(v("~0").isOne());
    EXPECT_TRUE(v("~1'b1").isZero());
    EXPECT_EQ(v.str(v("~~a")), "a");
    EXPECT_EQ(v.str(v("~(b)")), "~b");
    EXPECT_TRUE(v("a & ~a").isZero());              // a contradictory cube is dropped
    EXPECT_EQ(v.str(v("a & a | a")), "a");          // repeated literals and cubes merge
}

struct BadInput {
    const char* text;
    std::size_t offset;
    const char* message;
};

TEST(AlgebraExpr, ErrorsPointAtTheOffendingCharacter) {
    const BadInput cases[] = {
        {"", 0, "empty expression"},
        {"   ", 3, "empty expression"},
        {"a & | b", 4, "expected a name, 0, 1, '~' or '(' but found '|'"},
        {"a &", 3, "but the expression ends here"},
        {"a b", 2, "expected '&', '|' before this operand"},
        {"(a b)", 3, "expected '&', '|' or ')' before this operand"},
        {"a & (b | c", 10, "missing ')' to close the '(' at column 5"},
        {"(a | (b & c)", 12, "missing ')' to close the '(' at column 1"},
        {"a)", 1, "unexpected ')' without a matching '('"},
        {"()", 1, "empty parentheses"},
        {"x & ~(a & b)", 4, "not a sum of products"},
        {"~(a | b)", 0, "not a sum of products"},
        {"a ^ b", 2, "exclusive or"},
        {"a && b", 2, "'&&' is the logical and"},
        {"a || b", 2, "'||' is the logical or"},
        {"a + b", 2, "write '|'"},
        {"!a", 0, "write '~'"},
        {"a'", 1, "write ~x"},
        {"2 & a", 0, "only the constants 0, 1, 1'b0 and 1'b1"},
        {"a | 4'b1010", 4, "only the constants"},
        {"3a", 0, "cannot start with a digit"},
        {"a[3:0]", 3, "single bit select"},
        {"a[x]", 2, "expected a bit number"},
        {"a[3", 3, "expected ']'"},
        {"a | #", 4, "unexpected '#'"},
        {"a | \\b ", 4, "escaped names"},
    };
    for (const BadInput& c : cases) {
        VarTable vars;
        try {
            parseExpression(c.text, vars);
            ADD_FAILURE() << "accepted: " << c.text;
        } catch (const ExprError& e) {
            EXPECT_EQ(e.offset(), c.offset) << c.text << ": " << e.what();
            EXPECT_NE(std::string(e.what()).find(c.message), std::string::npos) << c.text << ": " << e.what();
        }
    }
}

TEST(AlgebraExpr, ErrorMessageShowsACaret) {
    const std::string text = "a & | b";
    VarTable vars;
    try {
        parseExpression(text, vars);
        FAIL();
    } catch (const ExprError& e) {
        EXPECT_EQ(describeExprError(text, e, "F"),
                  "error: F, column 5: expected a name, 0, 1, '~' or '(' but found '|'\n"
                  "  a & | b\n"
                  "      ^\n");
    }
    // Non-ASCII text before the error counts as one column per character.
    const std::string utf = "\xc3\xa9 | a & ?";   // "é | a & ?"
    try {
        parseExpression(utf, vars);
        FAIL();
    } catch (const ExprError& e) {
        EXPECT_EQ(e.offset(), 0u);   // é itself is the offending character
    }
    const std::string later = "a | \xc3\xa9";
    try {
        parseExpression(later, vars);
        FAIL();
    } catch (const ExprError& e) {
        EXPECT_EQ(e.offset(), 4u);
        std::string msg = describeExprError(later, e);
        EXPECT_NE(msg.find("non-ASCII"), std::string::npos) << msg;
        EXPECT_NE(msg.find("\n      ^\n"), std::string::npos) << msg;   // caret under column 5
    }
}

TEST(AlgebraExpr, ExpansionIsBounded) {
    VarTable vars;
    std::string text = "(a | b)";
    for (char c = 'c'; c <= 't'; c += 2) text += std::string(" & (") + c + " | " + char(c + 1) + ")";
    // 2^10 = 1024 cubes.
    EXPECT_EQ(parseExpression(text, vars).size(), 1024u);
    try {
        parseExpression(text, vars, 1000);
        FAIL();
    } catch (const ExprError& e) {
        EXPECT_NE(std::string(e.what()).find("more than 1000 cubes"), std::string::npos);
        EXPECT_EQ(text.at(e.offset()), '&');
    }
    std::string deep(2000, '(');
    try {
        parseExpression(deep + "a" + std::string(2000, ')'), vars);
        FAIL();
    } catch (const ExprError& e) {
        EXPECT_NE(std::string(e.what()).find("nested too deeply"), std::string::npos);
    }
}

// --- The subcommand --------------------------------------------------------

struct CmdResult {
    int code;
    std::string out, err;
};

CmdResult run(std::vector<std::string> args) {
    std::ostringstream out, err;
    int code = runAlgebraCommand(args, out, err);
    return {code, out.str(), err.str()};
}

TEST(AlgebraCommand, DivideJson) {
    CmdResult r = run({"divide", "p & x | p & y | q & x | q & y | z", "p | q", "--json"});
    ASSERT_EQ(r.code, 0) << r.err;
    auto j = nlohmann::json::parse(r.out);
    EXPECT_EQ(j["quotient"], "x | y");
    EXPECT_EQ(j["remainder"], "z");
    CmdResult none = run({"--json", "divide", "a & b", "c"});
    ASSERT_EQ(none.code, 0);
    EXPECT_EQ(nlohmann::json::parse(none.out)["quotient"], "0");
    EXPECT_EQ(nlohmann::json::parse(none.out)["remainder"], "a & b");
}

TEST(AlgebraCommand, DivideText) {
    CmdResult r = run({"divide", "a & c | b & c | d", "a | b"});
    ASSERT_EQ(r.code, 0);
    EXPECT_EQ(r.out, "quotient:  c\nremainder: d\n");
}

TEST(AlgebraCommand, DivideSharesNamesBetweenOperands) {
    // D names b first, but F named a first: output keeps F's order.
    CmdResult r = run({"divide", "a & c | b & c", "b | a", "--json"});
    ASSERT_EQ(r.code, 0);
    EXPECT_EQ(nlohmann::json::parse(r.out)["quotient"], "c");
    CmdResult bad = run({"divide", "a", "0"});
    EXPECT_EQ(bad.code, 2);
    EXPECT_NE(bad.err.find("division by 0"), std::string::npos);
}

TEST(AlgebraCommand, KernelsJson) {
    CmdResult r = run({"kernels", "p & r & t | q & r & t | s & t | u", "--json"});
    ASSERT_EQ(r.code, 0) << r.err;
    auto j = nlohmann::json::parse(r.out);
    ASSERT_EQ(j["kernels"].size(), 3u);
    // Sorted by co-kernel size: the cover itself (co-kernel 1) first.
    EXPECT_EQ(j["kernels"][0]["cokernel"], "1");
    EXPECT_EQ(j["kernels"][0]["level"], 2);
    EXPECT_EQ(j["kernels"][1]["cokernel"], "t");
    EXPECT_EQ(j["kernels"][1]["kernel"], "p & r | r & q | s");
    EXPECT_EQ(j["kernels"][2]["cokernel"], "r & t");
    EXPECT_EQ(j["kernels"][2]["kernel"], "p | q");
    CmdResult l0 = run({"kernels", "--level0", "p & r & t | q & r & t | s & t | u", "--json"});
    ASSERT_EQ(l0.code, 0);
    auto k = nlohmann::json::parse(l0.out);
    ASSERT_EQ(k["kernels"].size(), 1u);
    EXPECT_EQ(k["kernels"][0]["kernel"], "p | q");
}

TEST(AlgebraCommand, KernelsText) {
    CmdResult r = run({"kernels", "a & c | a & d | b"});
    ASSERT_EQ(r.code, 0);
    EXPECT_EQ(r.out,
              "co-kernel  level  kernel\n"
              "1          1      a & c | a & d | b\n"
              "a          0      c | d\n");
    CmdResult none = run({"kernels", "a & b"});
    ASSERT_EQ(none.code, 0);
    EXPECT_NE(none.out.find("no kernels"), std::string::npos);
    EXPECT_EQ(nlohmann::json::parse(run({"kernels", "a & b", "--json"}).out)["kernels"].size(), 0u);
}

TEST(AlgebraCommand, FactorJsonAndText) {
    CmdResult r = run({"factor", "p & x | p & y | q & x | q & y | z", "--json"});
    ASSERT_EQ(r.code, 0);
    auto j = nlohmann::json::parse(r.out);
    EXPECT_EQ(j["factored"], "(p | q) & (x | y) | z");
    EXPECT_EQ(j["literals"], 5);
    CmdResult q = run({"factor", "--method", "quick", "x & y & a | x & y & b | x & c | x & d | x & e | w & c | w & d | w & e",
                 "--json"});
    ASSERT_EQ(q.code, 0);
    EXPECT_EQ(nlohmann::json::parse(q.out)["literals"], 11);
    CmdResult b = run({"factor", "--method=best", "x & y & a | x & y & b | x & c | x & d | x & e | w & c | w & d | w & e"});
    ASSERT_EQ(b.code, 0);
    EXPECT_EQ(b.out, "(x | w) & (c | d | e) | x & y & (a | b)\nliterals: 9 (sum of products: 18)\n");
}

TEST(AlgebraCommand, HelpAndUsageErrors) {
    CmdResult h = run({"--help"});
    EXPECT_EQ(h.code, 0);
    EXPECT_NE(h.out.find("usage: kerf algebra divide F D"), std::string::npos);
    EXPECT_EQ(run({"factor", "-h"}).code, 0);
    CmdResult none = run({});
    EXPECT_EQ(none.code, 2);
    EXPECT_NE(none.err.find("usage:"), std::string::npos);
    const std::vector<std::vector<std::string>> bad = {
        {"multiply", "a", "b"},
        {"divide", "a"},
        {"kernels", "a", "b"},
        {"factor"},
        {"factor", "a", "--method", "fast"},
        {"factor", "a", "--method"},
        {"kernels", "a", "--method", "best"},
        {"factor", "a", "--level0"},
        {"factor", "a", "--verbose"},
        {"factor", "a", "-x"},
    };
    for (const auto& args : bad) {
        CmdResult r = run(args);
        EXPECT_EQ(r.code, 2) << args[0];
        EXPECT_NE(r.err.find("error: "), std::string::npos) << args[0];
        EXPECT_TRUE(r.out.empty());
    }
}

TEST(AlgebraCommand, BadExpressionGetsACaretAndExitCode2) {
    CmdResult r = run({"divide", "a & b", "a | ~(b & c)"});
    EXPECT_EQ(r.code, 2);
    EXPECT_TRUE(r.out.empty());
    EXPECT_EQ(r.err,
              "error: D, column 5: not a sum of products: '~' may complement only a name or a constant, not a "
              "product or a sum\n"
              "  a | ~(b & c)\n"
              "      ^\n");
}

} // namespace
} // namespace kerf::algebra
