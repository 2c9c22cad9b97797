// expr.cpp — parser for the expression syntax of `kerf algebra`.
//
// A hand-written recursive-descent parser (the textbook technique, e.g.
// A. V. Aho, M. S. Lam, R. Sethi and J. D. Ullman, "Compilers: Principles,
// Techniques, and Tools", 2nd ed., 2006, ch. 4) for the Verilog bitwise
// operators with their IEEE 1364/1800 precedence: `~` binds tightest, then
// `&`, then `|`. Grammar:
//
//   expr    := term ('|' term)*
//   term    := unary ('&' unary)*
//   unary   := '~' unary | primary
//   primary := name | name '[' digits ']' | '0' | '1' | "1'b0" | "1'b1" | '(' expr ')'
//
// Each subexpression evaluates straight to a cover in the algebraic model:
// `|` is the union of cube sets and `&` the algebraic product (every cube
// times every cube), so products of sums are multiplied out. `~` is only
// defined on a single literal or a constant; complementing anything else is
// not expressible as a sum of products without Boolean (non-algebraic)
// reasoning, so it is rejected. Errors carry the byte offset of the
// offending character so the caller can print a caret under it.

#include "kerf/algebra/expr.h"

#include <cctype>

namespace kerf::algebra {

std::uint32_t VarTable::intern(const std::string& name) {
    auto [it, fresh] = ids_.emplace(name, static_cast<std::uint32_t>(names_.size()));
    if (fresh) names_.push_back(name);
    return it->second;
}

std::optional<std::uint32_t> VarTable::find(const std::string& name) const {
    auto it = ids_.find(name);
    if (it == ids_.end()) return std::nullopt;
    return it->second;
}

namespace {

constexpr int kMaxDepth = 500;

bool isNameStart(char c) { return std::isalpha(static_cast<unsigned char>(c)) || c == '_'; }
bool isNameChar(char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '$'; }
bool isDigit(char c) { return c >= '0' && c <= '9'; }

std::string quoteChar(char c) {
    if (static_cast<unsigned char>(c) < 0x20 || c == 0x7f) return "control character";
    if (static_cast<unsigned char>(c) >= 0x80) return "non-ASCII character";
    return std::string("'") + c + "'";
}

class Parser {
public:
    Parser(std::string_view text, VarTable& vars, std::size_t maxCubes) : s_(text), vars_(vars), max_(maxCubes) {}

    Cover parseAll() {
        skipWs();
        if (atEnd()) fail("empty expression", pos_);
        Cover f = parseOr();
        skipWs();
        if (!atEnd()) failAfterOperand(false, 0);
        f.normalize();
        return f;
    }

private:
    [[noreturn]] void fail(const std::string& msg, std::size_t at) { throw ExprError(msg, at); }

    bool atEnd() const { return pos_ >= s_.size(); }
    char peek(std::size_t k = 0) const { return pos_ + k < s_.size() ? s_[pos_ + k] : '\0'; }
    void skipWs() {
        while (!atEnd() && std::isspace(static_cast<unsigned char>(s_[pos_]))) ++pos_;
    }

    // Something other than an operator follows a complete operand.
    [[noreturn]] void failAfterOperand(bool inParens, std::size_t openAt) {
        if (atEnd()) fail("missing ')' to close the '(' at column " + std::to_string(openAt + 1), pos_);
        const char c = peek();
        switch (c) {
        case ')': fail("unexpected ')' without a matching '('", pos_);
        case '^': fail("'^' (exclusive or) is not allowed: write a sum of products with '&', '|' and '~'", pos_);
        case '+': fail("'+' is not allowed: write '|' for or", pos_);
        case '*': fail("'*' is not allowed: write '&' for and", pos_);
        case '\'': fail("a postfix ' is not a complement: write ~x", pos_);
        case '!': fail("'!' is not allowed: write '~' for not", pos_);
        default: break;
        }
        if (isNameStart(c) || isDigit(c) || c == '(' || c == '~')
            fail(std::string("expected '&', '|'") + (inParens ? " or ')'" : "") + " before this operand", pos_);
        fail("unexpected " + quoteChar(c), pos_);
    }

    void checkSize(std::size_t cubes, std::size_t at) {
        if (cubes > max_)
            fail("the expression multiplies out to more than " + std::to_string(max_) + " cubes", at);
    }

    Cover parseOr() {
        Cover f = parseAnd();
        for (;;) {
            skipWs();
            if (peek() != '|') return f;
            const std::size_t at = pos_;
            if (peek(1) == '|') fail("'||' is the logical or: write '|'", at);
            ++pos_;
            Cover g = parseAnd();
            checkSize(f.size() + g.size(), at);
            f.cubes.insert(f.cubes.end(), std::make_move_iterator(g.cubes.begin()),
                           std::make_move_iterator(g.cubes.end()));
        }
    }

    Cover parseAnd() {
        Cover f = parseUnary();
        for (;;) {
            skipWs();
            if (peek() != '&') return f;
            const std::size_t at = pos_;
            if (peek(1) == '&') fail("'&&' is the logical and: write '&'", at);
            ++pos_;
            Cover g = parseUnary();
            checkSize(f.size() * g.size(), at);
            f = multiply(f, g);
        }
    }

    Cover parseUnary() {
        skipWs();
        if (peek() != '~') return parsePrimary();
        const std::size_t at = pos_;
        ++pos_;
        if (++depth_ > kMaxDepth) fail("expression nested too deeply", at);
        Cover x = parseUnary();
        --depth_;
        if (x.isZero()) return Cover::one();
        if (x.isOne()) return Cover::zero();
        if (x.size() == 1 && x.cubes[0].size() == 1) return Cover::literal(negateLiteral(x.cubes[0].lits[0]));
        fail("not a sum of products: '~' may complement only a name or a constant, not a product or a sum", at);
    }

    Cover parsePrimary() {
        skipWs();
        if (atEnd()) fail("expected a name, 0, 1, '~' or '(' but the expression ends here", pos_);
        const char c = peek();
        const std::size_t start = pos_;
        if (c == '(') {
            ++pos_;
            if (++depth_ > kMaxDepth) fail("expression nested too deeply", start);
            skipWs();
            if (peek() == ')') fail("empty parentheses", pos_);
            Cover f = parseOr();
            skipWs();
            if (peek() != ')') failAfterOperand(true, start);
            ++pos_;
            --depth_;
            f.normalize();
            return f;
        }
        if (isDigit(c)) return parseConstant();
        if (isNameStart(c)) return parseName();
        if (c == '\\') fail("escaped names are not supported here: use a plain name such as a_b or a[3]", pos_);
        if (c == '!') fail("'!' is not allowed: write '~' for not", pos_);
        if (c == '&' || c == '|' || c == ')')
            fail(std::string("expected a name, 0, 1, '~' or '(' but found '") + c + "'", pos_);
        fail("unexpected " + quoteChar(c) + ": expected a name, 0, 1, '~' or '('", pos_);
    }

    Cover parseConstant() {
        const std::size_t start = pos_;
        while (isDigit(peek())) ++pos_;
        std::string_view num = s_.substr(start, pos_ - start);
        if (peek() == '\'') {
            // Sized binary literal: only 1'b0 and 1'b1.
            if (num == "1" && (peek(1) == 'b' || peek(1) == 'B') && (peek(2) == '0' || peek(2) == '1') &&
                !isNameChar(peek(3))) {
                const bool one = peek(2) == '1';
                pos_ += 3;
                return one ? Cover::one() : Cover::zero();
            }
            fail("only the constants 0, 1, 1'b0 and 1'b1 are allowed", start);
        }
        if (isNameChar(peek())) fail("a name cannot start with a digit", start);
        if (num == "0") return Cover::zero();
        if (num == "1") return Cover::one();
        fail("only the constants 0, 1, 1'b0 and 1'b1 are allowed", start);
    }

    Cover parseName() {
        const std::size_t start = pos_;
        while (isNameChar(peek())) ++pos_;
        if (peek() == '[') {
            const std::size_t open = pos_;
            ++pos_;
            const std::size_t digits = pos_;
            while (isDigit(peek())) ++pos_;
            if (pos_ == digits) fail("expected a bit number in the select, as in a[3]", pos_);
            if (peek() != ']') {
                if (peek() == ':' || peek() == '+' || peek() == '-')
                    fail("only a single bit select such as a[3] is allowed", pos_);
                fail("expected ']' to close the '[' at column " + std::to_string(open + 1), pos_);
            }
            ++pos_;
        }
        std::string name(s_.substr(start, pos_ - start));
        return Cover::literal(makeLiteral(vars_.intern(name), false));
    }

    std::string_view s_;
    VarTable& vars_;
    std::size_t max_;
    std::size_t pos_ = 0;
    int depth_ = 0;
};

} // namespace

Cover parseExpression(std::string_view text, VarTable& vars, std::size_t maxCubes) {
    return Parser(text, vars, maxCubes).parseAll();
}

std::string describeExprError(std::string_view text, const ExprError& e, std::string_view label) {
    // Column in characters (UTF-8 continuation bytes do not advance it).
    const std::size_t off = std::min(e.offset(), text.size());
    std::size_t col = 0;
    for (std::size_t i = 0; i < off; ++i)
        if ((static_cast<unsigned char>(text[i]) & 0xC0) != 0x80) ++col;
    std::string shown(text);
    for (char& ch : shown)
        if (static_cast<unsigned char>(ch) < 0x20) ch = ' ';
    std::string msg = "error: ";
    if (!label.empty()) {
        msg += label;
        msg += ", ";
    }
    msg += "column " + std::to_string(col + 1) + ": ";
    msg += e.what();
    msg += "\n";
    msg += "  " + shown + "\n";
    msg += "  " + std::string(col, ' ') + "^\n";
    return msg;
}

} // namespace kerf::algebra
