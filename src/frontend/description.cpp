// description.cpp — the reader's description (docs/reader-format.md) into
// ModuleDesc and the typed IR, validated once.
//
// The text is parsed with a SAX handler: the small parts (module, types,
// signals, members) become a JSON DOM, while the two big tables (`exprs`,
// `stmts`), which reach millions of nodes on generated logic, are converted
// one element at a time straight into the arenas. Every index, width and
// name is then checked; a description that fails a check is kerf's own bug
// (the reader wrote it), reported as an internal error with the location of
// the offending node where it has one.
#include "kerf/frontend/module.h"

#include <fmt/format.h>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <functional>
#include <unordered_map>

namespace kerf::frontend {

namespace {

using json = nlohmann::json;

// Version 4 added links (`[l, r, end]` in `exprs`); version 3 is read as well (descriptions
// kept from an older reader, the fuzz seeds, the unit tests' samples).
constexpr int kFormatVersion = 4;
constexpr int kOldFormatVersion = 3;
// Widths beyond this are refused as malformed (no packed type in real RTL comes near).
constexpr std::uint32_t kMaxWidth = 1u << 24;

[[noreturn]] void invalid(const std::string& what, SourceLoc loc = {}) {
    throw Error(fmt::format("the reader's description is invalid: {}; this is a kerf bug, please report it", what),
                std::move(loc), ExitCode::Internal);
}

// ---- SAX: a DOM for the small parts, streaming for the node tables ----------

class Sax {
public:
    using Element = std::function<void(int table, json& element)>;
    explicit Sax(Element onElement) : onElement_(std::move(onElement)) {}

    json root;

    bool null() { return value(json(nullptr)); }
    bool boolean(bool v) { return value(json(v)); }
    bool number_integer(json::number_integer_t v) { return value(json(v)); }
    bool number_unsigned(json::number_unsigned_t v) { return value(json(v)); }
    bool number_float(json::number_float_t v, const json::string_t&) { return value(json(v)); }
    bool string(json::string_t& v) { return value(json(std::move(v))); }
    bool binary(json::binary_t&) { return value(json(nullptr)); }
    bool key(json::string_t& k) {
        key_ = std::move(k);
        return true;
    }
    bool start_object(std::size_t) { return open(json::object()); }
    bool start_array(std::size_t) {
        if (stack_.size() == 1 && table_ < 0 && (key_ == "exprs" || key_ == "stmts")) {
            table_ = key_ == "exprs" ? 0 : 1;
            (*stack_.back())[key_] = json::array();   // the table itself stays empty here
            streamDepth_ = stack_.size();
            stack_.push_back(nullptr);                 // marks the streamed array
            return true;
        }
        return open(json::array());
    }
    bool end_object() { return close(); }
    bool end_array() {
        if (table_ >= 0 && stack_.size() == streamDepth_ + 1 && stack_.back() == nullptr) {
            stack_.pop_back();
            table_ = -1;
            return true;
        }
        return close();
    }
    bool parse_error(std::size_t pos, const std::string&, const nlohmann::detail::exception& e) {
        invalid(fmt::format("not valid JSON at byte {} ({})", pos, e.what()));
    }

private:
    bool value(json v) {
        if (stack_.empty()) {
            root = std::move(v);
            return true;
        }
        if (stack_.back() == nullptr) {   // a scalar directly in a streamed table
            onElement_(table_, v);
            return true;
        }
        json& top = *stack_.back();
        if (top.is_object()) top[key_] = std::move(v);
        else top.push_back(std::move(v));
        return true;
    }
    bool open(json container) {
        if (stack_.empty()) {
            root = std::move(container);
            stack_.push_back(&root);
            return true;
        }
        if (stack_.back() == nullptr) {   // a new element of a streamed table
            // The last element's array, emptied, keeps its room: a node of a generated
            // design's table no longer grows a new one field by field (F276).
            if (!(container.is_array() && element_.is_array() && element_.empty())) element_ = std::move(container);
            stack_.push_back(&element_);
            return true;
        }
        json& top = *stack_.back();
        json* child;
        if (top.is_object()) {
            top[key_] = std::move(container);
            child = &top[key_];
        } else {
            top.push_back(std::move(container));
            child = &top.back();
        }
        stack_.push_back(child);
        return true;
    }
    bool close() {
        stack_.pop_back();
        if (!stack_.empty() && stack_.back() == nullptr) {
            onElement_(table_, element_);
            if (element_.is_array()) element_.get_ref<json::array_t&>().clear();
            else element_ = json();
        }
        return true;
    }

    Element onElement_;
    std::vector<json*> stack_;
    std::string key_;
    int table_ = -1;
    std::size_t streamDepth_ = 0;
    json element_;
};

// ---- small helpers ------------------------------------------------------------

const json& field(const json& j, const char* k, const std::string& where) {
    if (j.is_object()) {
        auto it = j.find(k);   // one look-up (contains and [] were two)
        if (it != j.end()) return *it;
    }
    invalid(fmt::format("{} has no '{}'", where, k));
}

std::string str(const json& j, const char* k, const std::string& where) {
    const json& v = field(j, k, where);
    if (!v.is_string()) invalid(fmt::format("'{}' of {} is not a string", k, where));
    return v.get<std::string>();
}

std::int64_t num(const json& j, const char* k, const std::string& where) {
    const json& v = field(j, k, where);
    if (!v.is_number_integer()) invalid(fmt::format("'{}' of {} is not an integer", k, where));
    return v.get<std::int64_t>();
}

bool flag(const json& j, const char* k, const std::string& where) {
    const json& v = field(j, k, where);
    if (!v.is_boolean()) invalid(fmt::format("'{}' of {} is not true/false", k, where));
    return v.get<bool>();
}

std::int64_t asInt(const json& v, const std::string& where) {
    if (!v.is_number_integer()) invalid(fmt::format("{} is not an integer", where));
    return v.get<std::int64_t>();
}

std::uint32_t asIndex(const json& v, const std::string& where) {
    std::int64_t i = asInt(v, where);
    if (i < -1 || i >= static_cast<std::int64_t>(kNoId)) invalid(fmt::format("{} is out of range", where));
    return i < 0 ? kNoId : static_cast<std::uint32_t>(i);
}

SourceRange parseRange(const json& j, const std::string& where) {
    SourceRange r;
    r.file = str(j, "file", where);
    r.start = static_cast<std::size_t>(std::max<std::int64_t>(0, num(j, "start", where)));
    r.end = static_cast<std::size_t>(std::max<std::int64_t>(0, num(j, "end", where)));
    r.line = static_cast<int>(num(j, "line", where));
    r.col = static_cast<int>(num(j, "col", where));
    if (r.end < r.start) invalid(fmt::format("{} ends before it starts", where));
    return r;
}

std::vector<std::string> names(const json& j, const std::string& where) {
    std::vector<std::string> v;
    if (!j.is_array()) invalid(fmt::format("{} is not a list", where));
    for (const auto& x : j) {
        if (!x.is_string()) invalid(fmt::format("{} holds a non-string", where));
        v.push_back(x.get<std::string>());
    }
    return v;
}

std::vector<std::pair<std::size_t, std::size_t>> ranges(const json& j, const std::string& where) {
    std::vector<std::pair<std::size_t, std::size_t>> v;
    if (!j.is_array()) invalid(fmt::format("{} is not a list", where));
    for (const auto& r : j) {
        if (!r.is_array() || r.size() != 2) invalid(fmt::format("{} holds a malformed range", where));
        std::int64_t s = asInt(r[0], where), e = asInt(r[1], where);
        if (s < 0 || e < s) invalid(fmt::format("{} holds a malformed range", where));
        v.emplace_back(static_cast<std::size_t>(s), static_cast<std::size_t>(e));
    }
    return v;
}

// ---- operators --------------------------------------------------------------

const std::unordered_map<std::string, UnaryOp>& unaryOps() {
    static const std::unordered_map<std::string, UnaryOp> m{
        {"+", UnaryOp::Plus},     {"-", UnaryOp::Minus},     {"~", UnaryOp::BitNot},  {"&", UnaryOp::RedAnd},
        {"~&", UnaryOp::RedNand}, {"|", UnaryOp::RedOr},     {"~|", UnaryOp::RedNor}, {"^", UnaryOp::RedXor},
        {"~^", UnaryOp::RedXnor}, {"^~", UnaryOp::RedXnor},  {"!", UnaryOp::LogicNot}};
    return m;
}

const std::unordered_map<std::string, BinaryOp>& binaryOps() {
    static const std::unordered_map<std::string, BinaryOp> m{
        {"+", BinaryOp::Add},     {"-", BinaryOp::Sub},       {"*", BinaryOp::Mul},      {"/", BinaryOp::Div},
        {"%", BinaryOp::Mod},     {"**", BinaryOp::Pow},      {"&", BinaryOp::And},      {"|", BinaryOp::Or},
        {"^", BinaryOp::Xor},     {"~^", BinaryOp::Xnor},     {"^~", BinaryOp::Xnor},    {"==", BinaryOp::Eq},
        {"!=", BinaryOp::Ne},     {"===", BinaryOp::CaseEq},  {"!==", BinaryOp::CaseNe}, {"==?", BinaryOp::WildEq},
        {"!=?", BinaryOp::WildNe},{"<", BinaryOp::Lt},        {"<=", BinaryOp::Le},      {">", BinaryOp::Gt},
        {">=", BinaryOp::Ge},     {"&&", BinaryOp::LogicAnd}, {"||", BinaryOp::LogicOr}, {"->", BinaryOp::Implies},
        {"<->", BinaryOp::Equiv}, {"<<", BinaryOp::Shl},      {">>", BinaryOp::Shr},     {"<<<", BinaryOp::AShl},
        {">>>", BinaryOp::AShr}};
    return m;
}

CheckKind checkKind(const json& v, const std::string& where) {
    if (!v.is_string()) invalid(fmt::format("{}: check is not a string", where));
    std::string s = v.get<std::string>();
    if (s == "none") return CheckKind::None;
    if (s == "unique") return CheckKind::Unique;
    if (s == "unique0") return CheckKind::Unique0;
    if (s == "priority") return CheckKind::Priority;
    invalid(fmt::format("{}: unknown check '{}'", where, s));
}

CaseKind caseKind(const json& v, const std::string& where) {
    if (!v.is_string()) invalid(where + ": case kind is not a string");
    std::string k = v.get<std::string>();
    if (k == "case") return CaseKind::Normal;
    if (k == "casez") return CaseKind::Z;
    if (k == "casex") return CaseKind::X;
    if (k == "inside") return CaseKind::Inside;
    invalid(where + ": unknown case kind " + k);
}

std::uint8_t caseAttrs(const json& v, const std::string& where) {
    std::uint8_t attrs = 0;
    for (const auto& a : names(v, where + " attributes")) {
        if (a == "full_case") attrs |= kFullCase;
        if (a == "parallel_case") attrs |= kParallelCase;
    }
    return attrs;
}

// ---- the builder --------------------------------------------------------------

class DescriptionBuilder {
public:
    ModuleDesc m;

    void element(int table, json& e) {
        if (table == 0) addExpr(e);
        else addStmt(e);
    }
    void finish(const json& root);

private:
    Ir& ir() { return m.ir; }
    std::uint32_t listOf(const json& v, const std::string& where) {
        if (!v.is_array()) invalid(fmt::format("{} is not a list", where));
        std::uint32_t off = static_cast<std::uint32_t>(ir().lists.size());
        for (const auto& x : v) ir().lists.push_back(asIndex(x, where));
        return off;
    }
    void addExpr(const json& e);
    void addStmt(const json& s);
    /// The columns of a `case_table` statement; bit strings go to Ir::constBits, LSB first.
    CaseTable caseTable(const json& t, const std::string& where);
    /// `run` runs of `width` characters of `text` (MSB first each) appended to Ir::constBits
    /// LSB first; returns their offset.
    std::uint32_t bitRuns(const std::string& text, std::uint32_t width, std::uint32_t runs, bool unset,
                          const std::string& where);
    void parseTypes(const json& j);
    void parseSignals(const json& root);
    void parseParameters(const json& root);
    void parseMembers(const json& root);
    void parseFunctions(const json& root);
    /// The "locals" list of a member or function: each placed as a local symbol, `owner` marking
    /// whose it is.
    std::vector<SymbolId> parseLocals(const json& j, const std::string& where,
                                      const std::function<void(Symbol&)>& owner);
    void validateExprs();
    void validateStmts();
    void checkOwnership();
    SourceLoc exprLoc(ExprId id) const;
    int exprMember(ExprId id) const { return id < exprOwner_.size() ? exprOwner_[id] : -1; }

    std::vector<int> exprOwner_, stmtOwner_;
    std::size_t links_ = 0;   ///< expressions written as links (version 4 only)
};

void DescriptionBuilder::addExpr(const json& e) {
    std::size_t id = ir().exprs.size();
    // The place named in a message, made only when there is one to give: formatted for every
    // node, it was a tenth of reading a generated design's description (F276).
    auto where = [&] { return fmt::format("expression {}", id); };
    auto index = [&](const json& v, const char* what) -> std::uint32_t {
        if (v.is_number_unsigned()) {
            std::uint64_t u = v.get<std::uint64_t>();
            if (u < kNoId) return static_cast<std::uint32_t>(u);
        }
        return asIndex(v, where() + what);   // -1, or a message
    };
    auto integer = [&](const json& v) -> std::int64_t {
        if (v.is_number_integer()) return v.get<std::int64_t>();
        return asInt(v, where());            // a message
    };
    if (e.is_array() && !e.empty() && e[0].is_number()) {
        // Version 4: a link `[l, r, end]`, the binary node `l op r` whose operator, type and start
        // are those of its left operand `l`, itself a binary node (a long chain `t1 | t2 | ...`
        // costs three numbers a term; docs/reader-format.md, "Links").
        if (e.size() != 3) invalid(fmt::format("{} (link) has {} fields, expected 3", where(), e.size()));
        std::uint32_t l = index(e[0], " (link)");
        if (l == kNoId || l >= id) invalid(fmt::format("{} (link) names operand {} that does not precede it", where(), e[0].dump()));
        Expr x = ir().exprs[l];
        if (x.kind != ExprKind::Binary || x.start == kNoId)
            invalid(fmt::format("{} (link) continues expression {}, which is not a binary node with a known range", where(), l));
        std::uint32_t r = index(e[1], " (link)");
        if (r == kNoId || r >= id) invalid(fmt::format("{} (link) names operand {} that does not precede it", where(), e[1].dump()));
        std::int64_t en = integer(e[2]);
        if (en < static_cast<std::int64_t>(x.start) || en >= static_cast<std::int64_t>(kNoId))
            invalid(fmt::format("{} (link) ends before it starts", where()));
        x.a = l;
        x.b = r;
        x.end = static_cast<std::uint32_t>(en);
        ++links_;
        ir().exprs.push_back(x);
        return;
    }
    if (!e.is_array() || e.size() < 4 || !e[0].is_string()) invalid(where() + " is malformed");
    Expr x;
    const std::string& kind = e[0].get_ref<const std::string&>();
    x.type = index(e[1], " type");
    std::int64_t s = integer(e[2]), en = integer(e[3]);
    if (s >= 0 && en >= s && en < static_cast<std::int64_t>(kNoId)) {
        x.start = static_cast<std::uint32_t>(s);
        x.end = static_cast<std::uint32_t>(en);
    }
    auto need = [&](std::size_t n) {
        if (e.size() != n) invalid(fmt::format("{} ({}) has {} fields, expected {}", where(), kind, e.size(), n));
    };
    auto operand = [&](std::size_t k) {
        std::uint32_t o = index(e[k], "");
        if (o == kNoId || o >= id) invalid(fmt::format("{} names operand {} that does not precede it", where(), e[k].dump()));
        return o;
    };
    auto int32 = [&](std::size_t k) {
        std::int64_t v = integer(e[k]);
        if (v < INT32_MIN || v > INT32_MAX) invalid(where() + " has a bound out of range");
        return static_cast<std::int32_t>(v);
    };
    if (kind == "const") {
        need(5);
        if (!e[4].is_string()) invalid(where() + ": constant bits are not a string");
        const std::string& bits = e[4].get_ref<const std::string&>();
        x.kind = ExprKind::Const;
        x.a = static_cast<std::uint32_t>(ir().constBits.size());
        for (auto it = bits.rbegin(); it != bits.rend(); ++it) {
            char c = *it;
            if (c == 'X') c = 'x';
            if (c == 'Z' || c == '?') c = 'z';
            if (c != '0' && c != '1' && c != 'x' && c != 'z') invalid(where() + ": constant holds '" + std::string(1, *it) + "'");
            ir().constBits.push_back(c);
        }
        x.b = static_cast<std::uint32_t>(bits.size());
    } else if (kind == "ref") {
        need(5);
        x.kind = ExprKind::Ref;
        x.a = index(e[4], " symbol");
        if (x.a == kNoId) invalid(where() + " names no symbol");
    } else if (kind == "unary") {
        need(6);
        x.kind = ExprKind::Unary;
        if (!e[4].is_string()) invalid(where() + ": operator is not a string");
        auto it = unaryOps().find(e[4].get_ref<const std::string&>());
        if (it == unaryOps().end()) invalid(where() + ": unknown unary operator " + e[4].dump());
        x.op = static_cast<std::uint8_t>(it->second);
        x.a = operand(5);
    } else if (kind == "binary") {
        need(7);
        x.kind = ExprKind::Binary;
        if (!e[4].is_string()) invalid(where() + ": operator is not a string");
        auto it = binaryOps().find(e[4].get_ref<const std::string&>());
        if (it == binaryOps().end()) invalid(where() + ": unknown binary operator " + e[4].dump());
        x.op = static_cast<std::uint8_t>(it->second);
        x.a = operand(5);
        x.b = operand(6);
    } else if (kind == "cond") {
        need(7);
        x.kind = ExprKind::Cond;
        x.a = operand(4);
        x.b = operand(5);
        x.c = operand(6);
    } else if (kind == "concat") {
        need(5);
        x.kind = ExprKind::Concat;
        if (!e[4].is_array() || e[4].empty()) invalid(where() + ": concatenation without parts");
        x.a = static_cast<std::uint32_t>(ir().lists.size());
        for (std::size_t k = 0; k < e[4].size(); ++k) {
            std::uint32_t o = index(e[4][k], "");
            if (o == kNoId || o >= id) invalid(where() + " names a part that does not precede it");
            ir().lists.push_back(o);
        }
        x.b = static_cast<std::uint32_t>(e[4].size());
    } else if (kind == "replicate") {
        need(6);
        x.kind = ExprKind::Replicate;
        std::int64_t n = integer(e[4]);
        if (n < 1 || n > kMaxWidth) invalid(where() + ": replication count out of range");
        x.b = static_cast<std::uint32_t>(n);
        x.a = operand(5);
    } else if (kind == "index") {
        need(8);
        x.kind = ExprKind::Index;
        x.a = operand(4);
        x.b = operand(5);
        x.msb = int32(6);
        x.lsb = int32(7);
    } else if (kind == "range") {
        need(9);
        x.kind = ExprKind::Range;
        x.a = operand(4);
        x.b = static_cast<std::uint32_t>(int32(5));
        x.c = static_cast<std::uint32_t>(int32(6));
        x.msb = int32(7);
        x.lsb = int32(8);
    } else if (kind == "indexed") {
        need(9);
        x.kind = ExprKind::Indexed;
        x.a = operand(4);
        x.b = operand(5);
        if (!e[6].is_string() || (e[6] != "+" && e[6] != "-")) invalid(where() + ": direction is not + or -");
        x.up = e[6] == "+";
        x.msb = int32(7);
        x.lsb = int32(8);
    } else if (kind == "convert") {
        need(5);
        x.kind = ExprKind::Convert;
        x.a = operand(4);
    } else if (kind == "call") {
        need(6);
        x.kind = ExprKind::Call;
        x.a = index(e[4], " function");
        if (x.a == kNoId) invalid(where() + " names no function");
        if (!e[5].is_array()) invalid(where() + ": call arguments are not a list");
        x.b = static_cast<std::uint32_t>(ir().lists.size());
        for (std::size_t k = 0; k < e[5].size(); ++k) {
            std::uint32_t o = index(e[5][k], "");
            if (o == kNoId || o >= id) invalid(where() + " names an argument that does not precede it");
            ir().lists.push_back(o);
        }
        x.c = static_cast<std::uint32_t>(e[5].size());
    } else {
        invalid(fmt::format("{} has the unknown kind '{}'", where(), kind));
    }
    ir().exprs.push_back(x);
}

void DescriptionBuilder::addStmt(const json& s) {
    std::size_t id = ir().stmts.size();
    std::string where = fmt::format("statement {}", id);
    if (!s.is_array() || s.size() < 3 || !s[0].is_string()) invalid(where + " is malformed");
    Stmt x;
    std::string kind = s[0].get<std::string>();
    std::int64_t st = asInt(s[1], where), en = asInt(s[2], where);
    if (st >= 0 && en >= st && en < static_cast<std::int64_t>(kNoId)) {
        x.start = static_cast<std::uint32_t>(st);
        x.end = static_cast<std::uint32_t>(en);
    }
    auto need = [&](std::size_t n) {
        if (s.size() != n) invalid(fmt::format("{} ({}) has {} fields, expected {}", where, kind, s.size(), n));
    };
    auto child = [&](const json& v, bool optional) {
        std::uint32_t c = asIndex(v, where);
        if (c == kNoId && optional) return c;
        if (c == kNoId || c >= id) invalid(where + " names a statement that does not precede it");
        return c;
    };
    auto childList = [&](const json& v) {
        if (!v.is_array()) invalid(where + ": not a list of statements");
        std::uint32_t off = static_cast<std::uint32_t>(ir().lists.size());
        for (const auto& c : v) ir().lists.push_back(child(c, false));
        return off;
    };
    if (kind == "block") {
        need(4);
        x.kind = StmtKind::Block;
        x.a = childList(s[3]);
        x.b = static_cast<std::uint32_t>(s[3].size());
    } else if (kind == "assign") {
        need(5);
        x.kind = StmtKind::Assign;
        x.a = asIndex(s[3], where);
        x.b = asIndex(s[4], where);
    } else if (kind == "if") {
        need(7);
        x.kind = StmtKind::If;
        x.a = asIndex(s[3], where);
        x.b = child(s[4], false);
        x.c = child(s[5], true);
        x.check = checkKind(s[6], where);
    } else if (kind == "case") {
        need(9);
        x.kind = StmtKind::Case;
        x.caseKind = caseKind(s[3], where);
        x.check = checkKind(s[4], where);
        x.a = asIndex(s[5], where);
        if (!s[6].is_array()) invalid(where + ": case items are not a list");
        x.b = static_cast<std::uint32_t>(ir().caseItems.size());
        for (const auto& it : s[6]) {
            if (!it.is_array() || (it.size() != 2 && it.size() != 3)) invalid(where + ": malformed case item");
            CaseItem ci;
            ci.exprs = listOf(it[0], where + " item");
            ci.count = static_cast<std::uint32_t>(it[0].size());
            ci.body = child(it[1], false);
            if (it.size() == 3) {
                if (!it[2].is_array() || it[2].size() != it[0].size()) invalid(where + ": malformed item conditions");
                ci.conditions = static_cast<std::uint32_t>(ir().itemIsCondition.size());
                for (const auto& f : it[2]) ir().itemIsCondition.push_back(asInt(f, where) != 0);
            }
            ir().caseItems.push_back(ci);
        }
        x.c = static_cast<std::uint32_t>(s[6].size());
        x.d = child(s[7], true);
        x.attrs = caseAttrs(s[8], where);
    } else if (kind == "case_table") {
        need(9);
        x.kind = StmtKind::CaseTable;
        x.caseKind = caseKind(s[3], where);
        x.check = checkKind(s[4], where);
        x.a = asIndex(s[5], where);
        x.b = static_cast<std::uint32_t>(ir().caseTables.size());
        ir().caseTables.push_back(caseTable(s[6], where));
        x.d = child(s[7], true);
        x.attrs = caseAttrs(s[8], where);
    } else if (kind == "for") {
        need(7);
        x.kind = StmtKind::For;
        if (!s[3].is_array()) invalid(where + ": loop initializers are not a list");
        x.a = static_cast<std::uint32_t>(ir().forInits.size());
        for (const auto& in : s[3]) {
            if (!in.is_array() || in.size() != 2) invalid(where + ": malformed loop initializer");
            ir().forInits.push_back({asIndex(in[0], where), asIndex(in[1], where)});
        }
        x.b = static_cast<std::uint32_t>(s[3].size());
        x.c = asIndex(s[4], where);
        x.d = childList(s[5]);
        x.e = static_cast<std::uint32_t>(s[5].size());
        x.f = child(s[6], false);
    } else if (kind == "empty") {
        need(3);
        x.kind = StmtKind::Empty;
    } else {
        invalid(fmt::format("{} has the unknown kind '{}'", where, kind));
    }
    ir().stmts.push_back(x);
}

std::uint32_t DescriptionBuilder::bitRuns(const std::string& text, std::uint32_t width, std::uint32_t runs,
                                          bool unset, const std::string& where) {
    if (static_cast<std::uint64_t>(width) * runs != text.size()) invalid(where + " has the wrong length");
    std::string& out = ir().constBits;
    if (out.size() + text.size() >= kNoId) invalid(where + ": too many constant bits");
    std::uint32_t off = static_cast<std::uint32_t>(out.size());
    out.reserve(out.size() + text.size());
    for (std::uint32_t r = 0; r < runs; ++r) {
        const char* run = text.data() + static_cast<std::size_t>(r) * width;
        for (std::uint32_t i = width; i-- > 0;) {
            char c = run[i];
            if (c != '0' && c != '1' && c != 'x' && c != 'z' && !(unset && c == '-'))
                invalid(fmt::format("{} holds the character '{}'", where, c));
            out.push_back(c);
        }
    }
    return off;
}

CaseTable DescriptionBuilder::caseTable(const json& t, const std::string& where) {
    CaseTable ct;
    std::int64_t w = num(t, "width", where + " table");
    if (w < 1 || w > kMaxWidth) invalid(where + ": label width out of range");
    ct.width = static_cast<std::uint32_t>(w);
    ct.labelsSigned = flag(t, "signed", where + " table");
    const std::string labels = str(t, "labels", where + " table");
    if (labels.size() % ct.width != 0) invalid(where + ": labels are not a whole number of labels");
    ct.labelCount = static_cast<std::uint32_t>(labels.size() / ct.width);
    if (ct.labelCount == 0) invalid(where + ": a case table without labels");
    ct.labels = bitRuns(labels, ct.width, ct.labelCount, false, where + " labels");
    if (t.contains("counts")) {
        const json& c = t["counts"];
        if (!c.is_array()) invalid(where + ": label counts are not a list");
        ct.firstLabel.push_back(0);
        std::uint64_t sum = 0;
        for (const auto& n : c) {
            std::int64_t k = asInt(n, where + " label count");
            if (k < 1) invalid(where + ": an item without labels");
            sum += static_cast<std::uint64_t>(k);
            if (sum > ct.labelCount) invalid(where + ": label counts exceed the labels");
            ct.firstLabel.push_back(static_cast<std::uint32_t>(sum));
        }
        if (sum != ct.labelCount) invalid(where + ": label counts do not add up to the labels");
        ct.items = static_cast<std::uint32_t>(c.size());
    } else {
        ct.items = ct.labelCount;
    }
    const json& targets = field(t, "targets", where + " table");
    const json& values = field(t, "values", where + " table");
    if (!targets.is_array() || !values.is_array() || targets.size() != values.size())
        invalid(where + ": targets and values do not pair up");
    for (std::size_t k = 0; k < targets.size(); ++k) {
        ExprId e = asIndex(targets[k], where + " target");
        if (e == kNoId) invalid(where + " names no target");
        ct.targets.push_back(e);
        if (!values[k].is_string()) invalid(where + ": values are not a string");
        const std::string& v = values[k].get_ref<const std::string&>();
        // The target's width is known once the expressions are read: checked in validateStmts.
        if (v.size() % ct.items != 0) invalid(where + ": values are not a whole number per item");
        ct.columnWidths.push_back(static_cast<std::uint32_t>(v.size() / ct.items));
        ct.columns.push_back(bitRuns(v, ct.columnWidths.back(), ct.items, true, where + " values"));
    }
    return ct;
}

void DescriptionBuilder::parseTypes(const json& j) {
    if (!j.is_array()) invalid("'types' is not a list");
    for (std::size_t i = 0; i < j.size(); ++i) {
        const json& t = j[i];
        std::string where = fmt::format("type {}", i);
        Type ty;
        std::string kind = str(t, "kind", where);
        std::int64_t w = num(t, "width", where);
        if (w < 0 || w > kMaxWidth) invalid(where + ": width out of range");
        ty.width = static_cast<int>(w);
        ty.isSigned = flag(t, "signed", where);
        ty.fourState = flag(t, "four_state", where);
        if (t.contains("name") && t["name"].is_string()) ty.name = t["name"].get<std::string>();
        if (t.contains("ref") && t["ref"].is_string()) ty.ref = t["ref"].get<std::string>();
        auto sub = [&](const char* k) {
            std::int64_t s = num(t, k, where);
            if (s < 0 || static_cast<std::size_t>(s) >= i) invalid(fmt::format("{}: '{}' names a later type", where, k));
            return static_cast<TypeId>(s);
        };
        auto range = [&] {
            std::int64_t msb = num(t, "msb", where), lsb = num(t, "lsb", where);
            if (msb < INT32_MIN || msb > INT32_MAX || lsb < INT32_MIN || lsb > INT32_MAX) invalid(where + ": range out of bounds");
            ty.msb = static_cast<int>(msb);
            ty.lsb = static_cast<int>(lsb);
            return static_cast<std::int64_t>(std::abs(msb - lsb)) + 1;
        };
        if (kind == "logic") {
            ty.kind = TypeKind::Logic;
            if (ty.width != 1) invalid(where + ": a single bit with width other than 1");
        } else if (kind == "vector") {
            ty.kind = TypeKind::Vector;
            if (range() != w) invalid(where + ": range does not match the width");
        } else if (kind == "array") {
            ty.kind = TypeKind::Array;
            std::int64_t n = range();
            ty.element = sub("element");
            if (n * j[ty.element].value("width", 0) != w) invalid(where + ": elements do not add up to the width");
        } else if (kind == "struct" || kind == "union") {
            ty.kind = kind == "struct" ? TypeKind::Struct : TypeKind::Union;
            for (const auto& f : field(t, "fields", where)) {
                TypeField tf;
                tf.name = str(f, "name", where);
                std::int64_t off = num(f, "offset", where);
                tf.type = static_cast<TypeId>(num(f, "type", where));
                if (tf.type >= i) invalid(where + ": a field names a later type");
                if (off < 0 || off + ty.width < 0 || off + m.ir.types[tf.type].width > w) invalid(where + ": a field lies outside the type");
                tf.offset = static_cast<int>(off);
                ty.fields.push_back(std::move(tf));
            }
        } else if (kind == "enum") {
            ty.kind = TypeKind::Enum;
            ty.base = sub("base");
            for (const auto& v : field(t, "values", where)) {
                EnumMember em;
                em.name = str(v, "name", where);
                if (v.contains("bits") && v["bits"].is_string()) em.bits = v["bits"].get<std::string>();
                if (v.contains("ref") && v["ref"].is_string()) em.ref = v["ref"].get<std::string>();
                ty.values.push_back(std::move(em));
            }
        } else if (kind == "other") {
            ty.kind = TypeKind::Other;
            if (t.contains("text") && t["text"].is_string()) ty.text = t["text"].get<std::string>();
        } else {
            invalid(fmt::format("{} has the unknown kind '{}'", where, kind));
        }
        m.ir.types.push_back(std::move(ty));
    }
}

Signal parseSignal(const json& j, const std::string& where) {
    Signal s;
    s.name = str(j, "name", where);
    s.isVariable = j.contains("kind") && j["kind"] == "variable";
    s.width = static_cast<int>(num(j, "width", where));
    if (s.width < 0 || static_cast<std::uint32_t>(s.width) > kMaxWidth) invalid(where + ": width out of range");
    s.isSigned = flag(j, "signed", where);
    s.msb = static_cast<int>(num(j, "msb", where));
    s.lsb = static_cast<int>(num(j, "lsb", where));
    s.vector = j.value("vector", s.width > 1);
    s.packed = j.value("packed", true);
    s.type = static_cast<TypeId>(num(j, "type", where));
    s.src = parseRange(field(j, "src", where), where);
    if (j.contains("direction")) {
        std::string d = str(j, "direction", where);
        s.dir = d == "input" ? PortDir::Input : d == "output" ? PortDir::Output : PortDir::Inout;
    }
    if (j.contains("decl") && j["decl"].is_object()) {
        const auto& d = j["decl"];
        Declarator dc;
        dc.file = str(d, "file", where);
        dc.start = static_cast<std::size_t>(num(d, "start", where));
        dc.end = static_cast<std::size_t>(num(d, "end", where));
        dc.stmtStart = static_cast<std::size_t>(num(d, "stmt_start", where));
        dc.stmtEnd = static_cast<std::size_t>(num(d, "stmt_end", where));
        dc.count = static_cast<int>(num(d, "count", where));
        if (dc.end < dc.start || dc.stmtEnd < dc.stmtStart || dc.count < 1) invalid(where + ": malformed declaration range");
        s.decl = dc;
    }
    if (j.contains("attributes")) s.attributes = names(j["attributes"], where + " attributes");
    return s;
}

Symbol symbolOf(const Signal& s, const Ir& ir, const std::string& where) {
    if (s.type >= ir.types.size()) invalid(where + " names an unknown type");
    Symbol y;
    y.name = s.name;
    y.type = s.type;
    y.width = s.width;
    y.isSigned = s.isSigned;
    y.msb = s.msb;
    y.lsb = s.lsb;
    if (s.packed && ir.types[s.type].width != s.width) invalid(where + ": width differs from its type");
    return y;
}

void placeSymbol(Ir& ir, std::int64_t id, Symbol y, const std::string& where) {
    if (id < 0 || id >= static_cast<std::int64_t>(kNoId) - 1) invalid(where + ": symbol id out of range");
    auto i = static_cast<std::size_t>(id);
    if (i >= ir.symbols.size()) {
        if (i > ir.symbols.size() + 10000000) invalid(where + ": symbol id out of range");
        ir.symbols.resize(i + 1);
    }
    if (!ir.symbols[i].name.empty()) invalid(fmt::format("{}: symbol id {} is used twice", where, id));
    if (y.name.empty()) invalid(where + ": empty name");
    ir.symbols[i] = std::move(y);
}

void DescriptionBuilder::parseSignals(const json& root) {
    const json& sigs = field(root, "signals", "the description");
    if (!sigs.is_array()) invalid("'signals' is not a list");
    int pos = 0;
    for (const auto& s : sigs) {
        std::string where = fmt::format("signal {}", pos);
        Signal sig = parseSignal(s, where);
        Symbol y = symbolOf(sig, m.ir, where);
        y.signal = pos++;
        std::int64_t id = num(s, "id", where);
        sig.symbol = static_cast<SymbolId>(id);
        placeSymbol(m.ir, id, std::move(y), where);
        if (m.signals.count(sig.name)) invalid(where + ": signal '" + sig.name + "' listed twice");
        m.signals[sig.name] = std::move(sig);
    }
    const json& ports = field(root, "ports", "the description");
    if (!ports.is_array()) invalid("'ports' is not a list");
    for (const auto& p : ports) {
        std::string name = str(p, "name", "a port");
        std::string d = str(p, "direction", "port " + name);
        PortDir dir = d == "input" ? PortDir::Input : d == "output" ? PortDir::Output : PortDir::Inout;
        m.portOrder.push_back(name);
        auto it = m.signals.find(name);
        if (it != m.signals.end()) {
            it->second.dir = dir;
        } else {
            // A port without a signal of its own (e.g. an interface or a port expression)
            Signal sig = parseSignal(p, "port " + name);
            sig.dir = dir;
            sig.symbol = kNoId;
            m.signals[name] = std::move(sig);
        }
    }
}

void DescriptionBuilder::parseParameters(const json& root) {
    if (root.contains("parameters")) {
        const json& ps = root["parameters"];
        if (!ps.is_array()) invalid("'parameters' is not a list");
        for (const auto& pj : ps) {
            Parameter p;
            p.name = str(pj, "name", "a parameter");
            std::string where = "parameter '" + p.name + "'";
            if (!pj.is_object()) invalid(where + " is not an object");
            p.isType = pj.value("kind", "value") == "type";
            p.pinned = pj.value("pinned", false);
            if (pj.contains("value")) p.value = str(pj, "value", where);
            if (pj.contains("literal")) p.literal = str(pj, "literal", where);
            p.implicitType = pj.value("implicit_type", false);
            if (pj.contains("members")) p.keptMembers = static_cast<int>(num(pj, "members", where));
            if (pj.contains("src")) p.src = parseRange(pj["src"], where + " src");
            m.parameters.push_back(std::move(p));
        }
    }
    if (root.contains("constants")) {
        const json& cs = root["constants"];
        if (!cs.is_array()) invalid("'constants' is not a list");
        for (const auto& cj : cs) {
            if (!cj.is_object()) invalid("a named constant is not an object");
            NamedConstant c;
            c.name = str(cj, "name", "a named constant");
            std::string where = "named constant '" + c.name + "'";
            c.ref = str(cj, "ref", where);
            c.bits = str(cj, "bits", where);
            if (c.bits.empty() || c.bits.find_first_not_of("01") != std::string::npos) invalid(where + ": its bits are not 0/1");
            c.msb = static_cast<int>(num(cj, "msb", where));
            c.lsb = static_cast<int>(num(cj, "lsb", where));
            c.sliceable = cj.value("sliceable", false);
            c.elsewhere = cj.value("elsewhere", false);
            if (cj.contains("compared")) {
                const json& cmp = cj["compared"];
                if (!cmp.is_array()) invalid(where + ": compared is not a list");
                for (const auto& e : cmp) {
                    if (!e.is_array() || e.size() != 4 || !e[0].is_string() || !e[1].is_number_integer() ||
                        !e[2].is_number_integer() || !e[3].is_number_integer())
                        invalid(where + ": a comparison is not [signal, lo, hi, constant lo]");
                    NamedConstant::Compare k{e[0].get<std::string>(), e[1].get<int>(), e[2].get<int>(), e[3].get<int>()};
                    if (k.lo < 0 || k.hi < k.lo || k.constLo < 0 || k.constLo + (k.hi - k.lo) >= c.width())
                        invalid(where + ": a comparison outside the constant");
                    c.compared.push_back(std::move(k));
                }
            }
            m.constants.push_back(std::move(c));
        }
    }
    if (root.contains("port_members")) {
        const json& pm = root["port_members"];
        if (!pm.is_object()) invalid("'port_members' is not an object");
        for (const auto& [port, list] : pm.items()) {
            std::string where = "port members of '" + port + "'";
            if (!list.is_array()) invalid(where + " are not a list");
            for (const auto& e : list) {
                ModuleDesc::PortMember pmem;
                pmem.name = str(e, "name", where);
                pmem.offset = static_cast<int>(num(e, "offset", where));
                pmem.width = static_cast<int>(num(e, "width", where));
                if (pmem.offset < 0 || pmem.width < 1) invalid(where + ": a member outside the port");
                m.portMembers[port].push_back(std::move(pmem));
            }
        }
    }
    if (root.contains("conditionals")) {
        const json& cs = root["conditionals"];
        if (!cs.is_array()) invalid("'conditionals' is not a list");
        for (const auto& cj : cs) {
            if (!cj.is_object()) invalid("a conditional is not an object");
            m.conditionals.push_back(fmt::format("{}:{}: {}", cj.value("file", "?"), cj.value("line", 0),
                                                 cj.value("text", "")));
        }
    }
}

void DescriptionBuilder::parseMembers(const json& root) {
    const json& mems = field(root, "members", "the description");
    if (!mems.is_array()) invalid("'members' is not a list");
    for (std::size_t i = 0; i < mems.size(); ++i) {
        const json& mj = mems[i];
        std::string where = fmt::format("member {}", i);
        Member mem;
        mem.id = static_cast<int>(num(mj, "id", where));
        if (mem.id != static_cast<int>(i)) invalid(where + ": its id is not its position");
        std::string kind = str(mj, "kind", where);
        mem.kind = kind == "assign" ? MemberKind::Assign : kind == "comb" ? MemberKind::Comb
                 : kind == "kept" ? MemberKind::Kept : (invalid(where + ": unknown kind " + kind), MemberKind::Kept);
        mem.src = parseRange(field(mj, "src", where), where + " src");
        mem.reads = names(field(mj, "reads", where), where + " reads");
        mem.writes = names(field(mj, "writes", where), where + " writes");
        mem.netDecl = mj.value("net_decl", false);
        if (mj.contains("match_key")) mem.matchKey = str(mj, "match_key", where);
        if (mj.contains("parameters")) mem.params = names(mj["parameters"], where + " parameters");
        if (mj.contains("constants")) {
            const json& cs = mj["constants"];
            if (!cs.is_array()) invalid(where + ": constants are not a list");
            for (const auto& c : cs) {
                if (!c.is_number_integer()) invalid(where + ": a constant is not an index");
                mem.constants.push_back(c.get<int>());
            }
        }
        if (mem.kind == MemberKind::Kept) {
            mem.what = str(mj, "what", where);
            mem.reason = str(mj, "reason", where);
            if (mj.contains("write_ranges")) {
                const json& wr = mj["write_ranges"];
                if (!wr.is_object()) invalid(where + ": write_ranges is not an object");
                for (const auto& [name, rs] : wr.items()) {
                    auto& v = mem.writeRanges[name];
                    for (auto [a, b] : ranges(rs, where + " write_ranges")) v.emplace_back(static_cast<int>(a), static_cast<int>(b));
                }
            }
            if (mj.contains("read_ranges")) {
                const json& rr = mj["read_ranges"];
                if (!rr.is_object()) invalid(where + ": read_ranges is not an object");
                for (const auto& [name, rs] : rr.items()) {
                    auto& v = mem.readRanges[name];
                    for (auto [a, b] : ranges(rs, where + " read_ranges")) v.emplace_back(static_cast<int>(a), static_cast<int>(b));
                }
            }
            if (mj.contains("mentions")) mem.mentions = names(mj["mentions"], where + " mentions");
            mem.mayBeX = mj.value("may_be_x", false);
            mem.clocked = mj.value("clocked", false);
            if (mj.contains("x_writes")) mem.xWrites = names(mj["x_writes"], where + " x_writes");
        } else {
            if (mj.contains("comments")) {
                const json& c = mj["comments"];
                mem.comments.above = ranges(field(c, "above", where), where + " comments");
                mem.comments.inside = ranges(field(c, "inside", where), where + " comments");
                mem.comments.trailing = ranges(field(c, "trailing", where), where + " comments");
            }
        }
        if (mem.kind == MemberKind::Assign) {
            mem.lhs = asIndex(field(mj, "lhs", where), where + " lhs");
            mem.rhs = asIndex(field(mj, "rhs", where), where + " rhs");
            if (mem.lhs >= m.ir.exprs.size() || mem.rhs >= m.ir.exprs.size()) invalid(where + " names an unknown expression");
        } else if (mem.kind == MemberKind::Comb) {
            mem.style = str(mj, "style", where);
            if (mj.contains("label")) {
                mem.label = str(mj, "label", where);
                mem.endLabel = mj.contains("end_label");
            }
            mem.body = asIndex(field(mj, "body", where), where + " body");
            if (mem.body >= m.ir.stmts.size()) invalid(where + " names an unknown statement");
            mem.locals = parseLocals(mj, where, [&](Symbol& y) { y.member = static_cast<int>(i); });
        }
        m.members.push_back(std::move(mem));
    }
}

std::vector<SymbolId> DescriptionBuilder::parseLocals(const json& j, const std::string& where,
                                                      const std::function<void(Symbol&)>& owner) {
    const json& locals = field(j, "locals", where);
    if (!locals.is_array()) invalid(where + ": locals are not a list");
    std::vector<SymbolId> ids;
    for (const auto& l : locals) {
        std::string lw = where + " local";
        Symbol y = symbolOf(parseSignal(l, lw), m.ir, lw);
        y.local = true;
        owner(y);
        std::int64_t id = num(l, "id", lw);
        placeSymbol(m.ir, id, std::move(y), lw);
        ids.push_back(static_cast<SymbolId>(id));
    }
    return ids;
}

void DescriptionBuilder::parseFunctions(const json& root) {
    if (!root.contains("functions")) return;
    const json& fns = root["functions"];
    if (!fns.is_array()) invalid("'functions' is not a list");
    for (std::size_t i = 0; i < fns.size(); ++i) {
        const json& fj = fns[i];
        std::string where = fmt::format("function {}", i);
        Function f;
        f.name = str(fj, "name", where);
        f.automatic = flag(fj, "automatic", where);
        SourceRange src = parseRange(field(fj, "src", where), where);
        f.file = src.file;
        f.loc = src.loc();
        f.body = asIndex(field(fj, "body", where), where + " body");
        if (f.body >= m.ir.stmts.size()) invalid(where + " names an unknown statement");
        f.locals = parseLocals(fj, where, [&](Symbol& y) { y.function = static_cast<int>(i); });
        auto ownLocal = [&](std::int64_t id, const std::string& what) {
            if (std::find(f.locals.begin(), f.locals.end(), static_cast<SymbolId>(id)) == f.locals.end())
                invalid(fmt::format("{}: its {} is not one of its locals", where, what));
            return static_cast<SymbolId>(id);
        };
        f.result = ownLocal(num(fj, "result", where), "result");
        const json& args = field(fj, "args", where);
        if (!args.is_array()) invalid(where + ": arguments are not a list");
        for (const auto& a : args) f.args.push_back(ownLocal(asInt(a, where), "argument"));
        m.ir.functions.push_back(std::move(f));
    }
}

SourceLoc DescriptionBuilder::exprLoc(ExprId id) const {
    int owner = exprMember(id);
    if (owner < 0) return {};
    const Expr& e = m.ir.exprs[id];
    std::size_t o = static_cast<std::size_t>(owner);
    if (o < m.members.size()) return m.locate(m.members[o], e.start);
    o -= m.members.size();
    if (o >= m.ir.functions.size()) return {};
    SourceLoc l = m.ir.locate(m.ir.functions[o].file, e.start);
    return l.file.empty() ? m.ir.functions[o].loc : l;
}

void DescriptionBuilder::validateExprs() {
    Ir& r = m.ir;
    for (std::size_t i = 0; i < r.exprs.size(); ++i) {
        Expr& e = r.exprs[i];
        auto fail = [&](const std::string& what) { invalid(fmt::format("expression {}: {}", i, what), exprLoc(static_cast<ExprId>(i))); };
        if (e.type >= r.types.size()) fail("unknown type");
        const Type& t = r.types[e.type];
        if (t.kind == TypeKind::Other || t.width < 1) fail("a value of a type that is not a packed integral type");
        e.width = static_cast<std::uint32_t>(t.width);
        e.isSigned = t.isSigned;
        auto w = [&](std::uint32_t id) { return r.exprs[id].width; };
        switch (e.kind) {
        case ExprKind::Const:
            if (e.b != e.width) fail("constant bits do not match the width");
            break;
        case ExprKind::Ref:
            break;   // checked per member (checkOwnership)
        case ExprKind::Concat: {
            std::uint64_t sum = 0;
            for (std::uint32_t k = 0; k < e.b; ++k) sum += w(r.lists[e.a + k]);
            if (sum != e.width) fail("concatenation parts do not add up to its width");
            break;
        }
        case ExprKind::Replicate:
            if (static_cast<std::uint64_t>(w(e.a)) * e.b != e.width) fail("replication does not match its width");
            break;
        case ExprKind::Index:
        case ExprKind::Range:
        case ExprKind::Indexed: {
            std::int64_t n = std::abs(static_cast<std::int64_t>(e.msb) - e.lsb) + 1;
            if (n > kMaxWidth || w(e.a) % static_cast<std::uint64_t>(n) != 0)
                fail("the selected dimension does not divide the value's width");
            std::uint64_t ew = w(e.a) / static_cast<std::uint64_t>(n);
            if (e.kind == ExprKind::Index && ew != e.width) fail("element select of the wrong width");
            if (e.kind != ExprKind::Index && (ew == 0 || e.width % ew != 0)) fail("part select is not a whole number of elements");
            if (e.kind == ExprKind::Range) {
                std::int64_t span = std::abs(static_cast<std::int64_t>(e.left()) - e.right()) + 1;
                if (static_cast<std::uint64_t>(span) * ew != e.width) fail("part select bounds do not match its width");
            }
            break;
        }
        case ExprKind::Call: {
            if (e.a >= r.functions.size()) fail("calls an unknown function");
            const Function& fn = r.functions[e.a];
            if (e.c != fn.args.size()) fail("calls a function with the wrong number of arguments");
            if (r.symbols[fn.result].width != static_cast<int>(e.width)) fail("call width differs from the function's");
            break;
        }
        default:
            break;
        }
    }
}

void DescriptionBuilder::validateStmts() {
    Ir& r = m.ir;
    auto expr = [&](std::uint32_t id, std::size_t s) {
        if (id >= r.exprs.size()) invalid(fmt::format("statement {} names an unknown expression", s));
    };
    for (std::size_t i = 0; i < r.stmts.size(); ++i) {
        const Stmt& s = r.stmts[i];
        switch (s.kind) {
        case StmtKind::Assign: expr(s.a, i); expr(s.b, i); break;
        case StmtKind::If: expr(s.a, i); break;
        case StmtKind::Case:
            expr(s.a, i);
            for (std::uint32_t k = 0; k < s.c; ++k) {
                const CaseItem& ci = r.caseItems[s.b + k];
                for (std::uint32_t j = 0; j < ci.count; ++j) expr(r.lists[ci.exprs + j], i);
            }
            break;
        case StmtKind::CaseTable: {
            expr(s.a, i);
            const CaseTable& ct = r.caseTables[s.b];
            for (std::size_t k = 0; k < ct.targets.size(); ++k) {
                ExprId t = ct.targets[k];
                expr(t, i);
                const Expr& e = r.exprs[t];
                bool ok = e.kind == ExprKind::Ref;
                if ((e.kind == ExprKind::Range || e.kind == ExprKind::Index) && r.exprs[e.a].kind == ExprKind::Ref)
                    ok = e.kind == ExprKind::Range || r.exprs[e.b].kind == ExprKind::Const;
                if (!ok) invalid(fmt::format("statement {}: a case table target that is not a fixed part of a signal", i));
                if (ct.columnWidths[k] != e.width)
                    invalid(fmt::format("statement {}: case table values do not match the target's width", i));
            }
            break;
        }
        case StmtKind::For:
            expr(s.c, i);
            for (std::uint32_t k = 0; k < s.b; ++k) {
                const ForInit& fi = r.forInits[s.a + k];
                expr(fi.value, i);   // the loop variable: checked per member (checkOwnership)
            }
            break;
        default:
            break;
        }
    }
}

// Every statement and expression belongs to one member: the reader never shares
// nodes between members, and a block local is only named inside its block.
void DescriptionBuilder::checkOwnership() {
    Ir& r = m.ir;
    exprOwner_.assign(r.exprs.size(), -1);
    stmtOwner_.assign(r.stmts.size(), -1);
    auto own = [](std::vector<int>& owner, std::uint32_t id, int member, const char* what) {
        if (owner[id] >= 0 && owner[id] != member)
            invalid(fmt::format("{} {} is shared by members {} and {}", what, id, owner[id], member));
        owner[id] = member;
    };
    for (const Member& mem : m.members) {
        if (mem.kind == MemberKind::Assign) {
            own(exprOwner_, mem.lhs, mem.id, "expression");
            own(exprOwner_, mem.rhs, mem.id, "expression");
        } else if (mem.kind == MemberKind::Comb) {
            own(stmtOwner_, mem.body, mem.id, "statement");
        }
    }
    // A function's body is its own owner, after the members.
    const int firstFunction = static_cast<int>(m.members.size());
    for (std::size_t f = 0; f < r.functions.size(); ++f)
        own(stmtOwner_, r.functions[f].body, firstFunction + static_cast<int>(f), "statement");
    for (std::size_t i = r.stmts.size(); i-- > 0;) {
        int o = stmtOwner_[i];
        if (o < 0) continue;
        const Stmt& s = r.stmts[i];
        auto sub = [&](std::uint32_t c) { if (c != kNoId) own(stmtOwner_, c, o, "statement"); };
        auto ex = [&](std::uint32_t c) { if (c != kNoId) own(exprOwner_, c, o, "expression"); };
        switch (s.kind) {
        case StmtKind::Block:
            for (std::uint32_t k = 0; k < s.b; ++k) sub(r.lists[s.a + k]);
            break;
        case StmtKind::Assign: ex(s.a); ex(s.b); break;
        case StmtKind::If: ex(s.a); sub(s.b); sub(s.c); break;
        case StmtKind::Case:
            ex(s.a);
            for (std::uint32_t k = 0; k < s.c; ++k) {
                const CaseItem& ci = r.caseItems[s.b + k];
                for (std::uint32_t j = 0; j < ci.count; ++j) ex(r.lists[ci.exprs + j]);
                sub(ci.body);
            }
            sub(s.d);
            break;
        case StmtKind::CaseTable:
            ex(s.a);
            for (ExprId t : r.caseTables[s.b].targets) ex(t);
            sub(s.d);
            break;
        case StmtKind::For:
            for (std::uint32_t k = 0; k < s.b; ++k) ex(r.forInits[s.a + k].value);
            ex(s.c);
            for (std::uint32_t k = 0; k < s.e; ++k) sub(r.lists[s.d + k]);
            sub(s.f);
            break;
        case StmtKind::Empty: break;
        }
        if (s.kind == StmtKind::For)
            for (std::uint32_t k = 0; k < s.b; ++k) {
                // Nodes of a member the reader kept after describing it belong to no member
                // and are never read: their symbols are not checked.
                SymbolId v = r.forInits[s.a + k].var;
                if (v >= r.symbols.size() || r.symbols[v].name.empty())
                    invalid(fmt::format("statement {}: loop variable is not a symbol", i));
                const Symbol& y = r.symbols[v];
                bool mine = y.function >= 0 ? o == firstFunction + y.function : y.member == o;
                if (!y.local || !mine) invalid(fmt::format("statement {}: loop variable of another block", i));
            }
    }
    for (std::size_t i = r.exprs.size(); i-- > 0;) {
        int o = exprOwner_[i];
        if (o < 0) continue;
        const Expr& e = r.exprs[i];
        auto ex = [&](std::uint32_t c) { own(exprOwner_, c, o, "expression"); };
        switch (e.kind) {
        case ExprKind::Const: break;
        case ExprKind::Ref: {
            if (e.a >= r.symbols.size() || r.symbols[e.a].name.empty())
                invalid(fmt::format("expression {} names an unknown symbol", i), exprLoc(static_cast<ExprId>(i)));
            const Symbol& y = r.symbols[e.a];
            bool mine = y.function >= 0 ? o == firstFunction + y.function : y.member == o;
            if (y.local && !mine)
                invalid(fmt::format("expression {} names a local of another block", i), exprLoc(static_cast<ExprId>(i)));
            break;
        }
        case ExprKind::Call:
            for (std::uint32_t k = 0; k < e.c; ++k) ex(r.lists[e.b + k]);
            break;
        case ExprKind::Unary: case ExprKind::Convert: ex(e.a); break;
        case ExprKind::Replicate: ex(e.a); break;
        case ExprKind::Binary: case ExprKind::Index: case ExprKind::Indexed: ex(e.a); ex(e.b); break;
        case ExprKind::Range: ex(e.a); break;
        case ExprKind::Cond: ex(e.a); ex(e.b); ex(e.c); break;
        case ExprKind::Concat:
            for (std::uint32_t k = 0; k < e.b; ++k) ex(r.lists[e.a + k]);
            break;
        }
    }
}

void DescriptionBuilder::finish(const json& root) {
    if (!root.is_object()) invalid("it is not a JSON object");
    if (root.value("format", "") != "kerf-module") invalid("it is not a kerf module description");
    if (!root.contains("version") || !root["version"].is_number_integer() ||
        (root["version"] != kFormatVersion && root["version"] != kOldFormatVersion))
        throw Error(fmt::format("the reader wrote format version {}, this kerf reads versions {} and {}; "
                                "the reader and kerf come from different versions",
                                root.contains("version") ? root["version"].dump() : "none", kOldFormatVersion,
                                kFormatVersion),
                    {}, ExitCode::Internal);
    if (root["version"] == kOldFormatVersion && links_ > 0)
        invalid(fmt::format("version {} has no links, yet {} expressions are written as links", kOldFormatVersion, links_));
    const json& mod = field(root, "module", "the description");
    m.name = str(mod, "name", "the module");
    m.src = parseRange(field(mod, "src", "the module"), "the module's src");
    const json& files = field(root, "files", "the description");
    if (!files.is_array()) invalid("'files' is not a list");
    for (const auto& f : files) {
        FileLines fl;
        fl.path = str(f, "path", "a file");
        const json& ls = field(f, "line_starts", "file " + fl.path);
        if (!ls.is_array()) invalid("line starts of " + fl.path + " are not a list");
        for (const auto& x : ls) {
            std::int64_t v = asInt(x, "a line start");
            if (v < 0 || v >= static_cast<std::int64_t>(kNoId) || (!fl.starts.empty() && v <= fl.starts.back()))
                invalid("line starts of " + fl.path + " are not increasing");
            fl.starts.push_back(static_cast<std::uint32_t>(v));
        }
        m.ir.files.push_back(std::move(fl));
    }
    parseTypes(field(root, "types", "the description"));
    parseSignals(root);
    for (const auto& [name, s] : m.signals)
        if (s.type != kNoId && s.type >= m.ir.types.size()) invalid("signal '" + name + "' names an unknown type");
    parseMembers(root);
    parseParameters(root);
    for (const auto& mem : m.members)
        for (int c : mem.constants)
            if (c < 0 || c >= static_cast<int>(m.constants.size()))
                invalid(fmt::format("member {} names an unknown constant", mem.id));
    parseFunctions(root);
    validateExprs();
    validateStmts();
    checkOwnership();
    nameSelectedBits(m);
    // Statements name only expressions of their own kind of slot; a target must be assignable.
}

} // namespace

std::string_view opText(UnaryOp op) {
    static constexpr std::string_view t[] = {"+", "-", "~", "&", "~&", "|", "~|", "^", "~^", "!"};
    return t[static_cast<int>(op)];
}

std::string_view opText(BinaryOp op) {
    static constexpr std::string_view t[] = {"+", "-", "*", "/", "%", "**", "&", "|", "^", "~^",
                                             "==", "!=", "===", "!==", "==?", "!=?", "<", "<=", ">", ">=",
                                             "&&", "||", "->", "<->", "<<", ">>", "<<<", ">>>"};
    return t[static_cast<int>(op)];
}

SourceLoc FileLines::loc(std::uint32_t offset) const {
    auto it = std::upper_bound(starts.begin(), starts.end(), offset);
    if (it == starts.begin()) return SourceLoc{path, 1, static_cast<int>(offset) + 1};
    --it;
    return SourceLoc{path, static_cast<int>(it - starts.begin()) + 1, static_cast<int>(offset - *it) + 1};
}

SourceLoc Ir::locate(const std::string& file, std::uint32_t offset) const {
    if (offset == kNoId) return {};
    for (const auto& f : files)
        if (f.path == file) return f.loc(offset);
    return {};
}

const Signal* ModuleDesc::signalOf(SymbolId s) const {
    if (s >= ir.symbols.size() || ir.symbols[s].local) return nullptr;
    auto it = signals.find(ir.symbols[s].name);
    return it == signals.end() ? nullptr : &it->second;
}

SourceLoc ModuleDesc::locate(const Member& mem, std::uint32_t start) const {
    if (start == kNoId) return mem.src.loc();
    SourceLoc l = ir.locate(mem.src.file, start);
    return l.file.empty() ? mem.src.loc() : l;
}

ModuleDesc parseDescription(std::string_view text) {
    DescriptionBuilder b;
    // The JSON parser takes a NUL byte for the end of its input and would read a description
    // followed by a NUL and anything at all as whole (F147); JSON allows a NUL nowhere.
    if (auto nul = text.find('\0'); nul != std::string_view::npos)
        invalid(fmt::format("not valid JSON at byte {} (a NUL byte, which JSON allows nowhere)", nul + 1));
    try {
        Sax sax([&](int table, json& e) { b.element(table, e); });
        json::sax_parse(text.begin(), text.end(), &sax);
        b.finish(sax.root);
    } catch (const json::exception& e) {
        invalid(fmt::format("a field has the wrong kind of value ({})", e.what()));
    }
    return std::move(b.m);
}

ModuleDesc parseDescription(const std::string& text) {
    return parseDescription(std::string_view(text));
}

ModuleDesc parseDescription(const json& j) {
    return parseDescription(std::string_view(j.dump()));
}

} // namespace kerf::frontend
