// writer.cpp — restructured logic written back in place, only where it pays.
//
// Plan, in order:
//  1. Names. An output of the network is an author's signal; the node that
//     drives it takes the signal's name, and every other use of that node
//     refers to the name (a signal that is a plain copy of an input names that
//     input). Nodes used more than once otherwise become new wires, named from
//     what they compute (`paddr_5_2_is_0`, `psel_penable`) or from the first
//     output they feed plus an index counted within that output's logic, so a
//     change elsewhere never renumbers them. Each wire is stored in the
//     polarity its uses need least inverted. Wires whose definitions share
//     one shape over consecutive bits are one vector wire (wire_vectors.cpp).
//  2. Groups. Statements whose new logic shares a wire are one group; a group
//     is rewritten only when its new logic saves at least --min-gain two-input
//     gates (or percent) against its logic as written; otherwise every byte of
//     it stays. Nothing to gain: the file comes back unchanged.
//  3. Text. Each replaced statement is replaced where it stands and in its own
//     kind (`assign`, net declaration, `always_comb`, `always @(*)`); new wires
//     are declared just before the first statement of their group that uses
//     them; a header comment goes above the first change (one per module: an
//     earlier run's header goes). Indentation, tabs and line endings follow
//     the file. Names the file declares after a point are never used before it.
#include "kerf/emit/writer.h"

#include "kerf/emit/guard.h"

#include "comments.h"
#include "expression.h"
#include "named_values.h"
#include "reductions.h"
#include "wire_vectors.h"
#include "word_choice.h"
#include "kerf/frontend/references.h"
#include "kerf/io/files.h"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cstdio>
#include <functional>
#include <map>
#include <numeric>
#include <optional>
#include <set>
#include <sstream>

namespace kerf::emit {

using algebra::Factored;
using algebra::literalNegated;
using algebra::literalVar;
using frontend::BitRef;
using frontend::verilogName;
using net::Literal;
using net::NodeId;

MinGain MinGain::parse(const std::string& text) {
    MinGain g;
    std::string t = text;
    if (!t.empty() && t.back() == '%') {
        g.percent = true;
        t.pop_back();
    }
    std::size_t used = 0;
    try {
        g.value = std::stod(t, &used);
    } catch (const std::exception&) {
        used = 0;
    }
    if (t.empty() || used != t.size() || !(g.value >= 0) || (g.percent && g.value > 100))
        throw Error(fmt::format("--min-gain: '{}' is not a number of gates (e.g. 2) or a percentage (e.g. 5%)",
                                text));
    return g;
}

std::string MinGain::str() const {
    return percent ? fmt::format("{:g}%", value) : fmt::format("{:g} gate{}", value, value == 1 ? "" : "s");
}

bool validIdentifierPrefix(const std::string& p) {
    if (p.empty()) return true;
    if (!(std::isalpha(static_cast<unsigned char>(p[0])) || p[0] == '_')) return false;
    for (char c : p)
        if (!(std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '$')) return false;
    return true;
}

void setHeader(WriteResult& r, const std::string& line) {
    if (r.headerLen == 0) return;
    std::size_t start = r.text.find("//", r.headerPos);
    std::string text = "// kerf: " + line;
    if (!r.unusedWire.empty()) {
        // Say what the wire holds: bits the logic no longer reads, named constants it no longer
        // names, or both.
        const std::size_t constants = r.constantsNotNamed.size();
        const bool bits = r.notRead.size() > constants;
        std::string more = std::string(bits && constants ? "bits and named constants no longer read"
                                       : bits            ? "bits no longer read"
                                                         : "named constants no longer named") +
                           ": see " + r.unusedWire;
        std::string indent = r.text.substr(r.headerPos, start - r.headerPos);
        // Within 100 columns: the note goes on a comment line of its own when the figures are long.
        if (indent.size() + text.size() + 2 + more.size() > 100) text += ";" + r.newline + indent + "// " + more;
        else text += "; " + more;
    }
    r.text.replace(start, r.headerPos + r.headerLen - start, text);
    r.headerLen = start - r.headerPos + text.size();
}

namespace {

constexpr int kRankInternal = 0, kRankWire = 1 << 20, kRankPort = 2 << 20;
/// Rounds of Writer::formFamilies: the depth of a chain of families read by families.
constexpr int kMaxFamilyRounds = 64;

/// Bits of module signals a member's text reads: a constant select chain (`a[3]`, `m[1][7:4]`,
/// `req.hdr.tag`) reads its bits, any other reference the whole signal (`whole`). Targets'
/// roots are written, not read; their indices are read. What functions read inside their
/// bodies is not followed: a signal the member reads by name and no walked reference names
/// counts whole (so a bit is never taken for unread by the original when it might be read).
void originalReads(const frontend::ModuleDesc& m, const frontend::Member& mem,
                   std::set<std::pair<std::string, int>>& bits, std::set<std::string>& whole) {
    using frontend::ExprKind;
    using frontend::StmtKind;
    const auto& ir = m.ir;
    std::set<std::string> named;
    auto signalName = [&](frontend::SymbolId y) -> const std::string* {
        if (y >= ir.symbols.size()) return nullptr;
        const auto& sym = ir.symbols[y];
        if (sym.local || sym.function >= 0 || !m.signals.count(sym.name)) return nullptr;
        return &sym.name;
    };
    auto constValue = [&](frontend::ExprId id, long& v) {
        const auto& e = ir.expr(id);
        if (e.kind != ExprKind::Const || e.width > 62) return false;
        v = 0;
        for (std::uint32_t i = e.width; i-- > 0;) {
            char c = ir.constBit(e, i);
            if (c != '0' && c != '1') return false;
            v = v * 2 + (c == '1');
        }
        if (e.isSigned && e.width > 0 && ir.constBit(e, e.width - 1) == '1') v -= 1L << e.width;
        return true;
    };
    // (symbol, lowest offset) of a constant select chain on a module signal; width is the node's.
    struct Span { frontend::SymbolId sym; long lo; };
    std::function<std::optional<Span>(frontend::ExprId)> chain = [&](frontend::ExprId id) -> std::optional<Span> {
        const auto& e = ir.expr(id);
        auto off = [&](long i) { return e.msb >= e.lsb ? i - e.lsb : e.lsb - i; };
        auto inDim = [&](long i) { return e.msb >= e.lsb ? (i >= e.lsb && i <= e.msb) : (i >= e.msb && i <= e.lsb); };
        if (e.kind == ExprKind::Ref) {
            if (!signalName(e.a)) return std::nullopt;
            return Span{e.a, 0};
        }
        if (e.kind == ExprKind::Index) {
            long i = 0;
            if (!constValue(e.b, i) || !inDim(i)) return std::nullopt;
            auto p = chain(e.a);
            if (!p) return std::nullopt;
            return Span{p->sym, p->lo + off(i) * static_cast<long>(e.width)};
        }
        if (e.kind == ExprKind::Range) {
            long l = e.left(), r = e.right();
            if (!inDim(l) || !inDim(r)) return std::nullopt;
            long count = std::labs(l - r) + 1;
            if (count <= 0 || e.width % count != 0) return std::nullopt;
            auto p = chain(e.a);
            if (!p) return std::nullopt;
            return Span{p->sym, p->lo + std::min(off(l), off(r)) * static_cast<long>(e.width / count)};
        }
        return std::nullopt;
    };
    std::vector<frontend::ExprId> reads, targets;
    auto read = [&](frontend::ExprId id) { if (id != frontend::kNoId) reads.push_back(id); };
    // Statements.
    std::vector<frontend::StmtId> stmts;
    if (mem.body != frontend::kNoId) stmts.push_back(mem.body);
    if (mem.lhs != frontend::kNoId) targets.push_back(mem.lhs);
    read(mem.rhs);
    while (!stmts.empty()) {
        frontend::StmtId sid = stmts.back();
        stmts.pop_back();
        if (sid == frontend::kNoId) continue;
        const auto& st = ir.stmt(sid);
        switch (st.kind) {
        case StmtKind::Block:
            for (std::uint32_t k = 0; k < st.b; ++k) stmts.push_back(ir.list(st.a)[k]);
            break;
        case StmtKind::Assign: targets.push_back(st.a); read(st.b); break;
        case StmtKind::If: read(st.a); stmts.push_back(st.b); stmts.push_back(st.c); break;
        case StmtKind::Case:
            read(st.a);
            for (std::uint32_t k = 0; k < st.c; ++k) {
                const auto& item = ir.caseItems[st.b + k];
                for (std::uint32_t q = 0; q < item.count; ++q) read(ir.list(item.exprs)[q]);
                stmts.push_back(item.body);
            }
            stmts.push_back(st.d);
            break;
        case StmtKind::CaseTable:
            read(st.a);
            for (frontend::ExprId t : ir.caseTables[st.b].targets) targets.push_back(t);
            stmts.push_back(st.d);
            break;
        case StmtKind::For:
            for (std::uint32_t k = 0; k < st.b; ++k) read(ir.forInits[st.a + k].value);
            read(st.c);
            for (std::uint32_t k = 0; k < st.e; ++k) stmts.push_back(ir.list(st.d)[k]);
            stmts.push_back(st.f);
            break;
        case StmtKind::Empty: break;
        }
    }
    while (!targets.empty()) {
        frontend::ExprId id = targets.back();
        targets.pop_back();
        const auto& e = ir.expr(id);
        switch (e.kind) {
        case ExprKind::Index: case ExprKind::Indexed: targets.push_back(e.a); read(e.b); break;
        case ExprKind::Range: targets.push_back(e.a); break;
        case ExprKind::Concat:
            for (std::uint32_t k = 0; k < e.b; ++k) targets.push_back(ir.list(e.a)[k]);
            break;
        default: break;
        }
    }
    while (!reads.empty()) {
        frontend::ExprId id = reads.back();
        reads.pop_back();
        const auto& e = ir.expr(id);
        // A truncation of a whole signal reads only the low bits it keeps (so does Verilator's
        // unused-signal check: `w1 = in3` with a 1-bit `w1` reads `in3[0]`); of a select it
        // reads the selected bits (`w1 = in3[2:0]` reads three, F116).
        // Casts that keep the width (`$unsigned(in1)` passed to a narrower function argument)
        // pass the bits through: the truncation still keeps only the low bits (F187).
        frontend::ExprId kept = e.kind == ExprKind::Convert ? e.a : frontend::kNoId;
        while (kept != frontend::kNoId && ir.expr(kept).kind == ExprKind::Convert &&
               ir.expr(ir.expr(kept).a).width == ir.expr(kept).width)
            kept = ir.expr(kept).a;
        if (kept != frontend::kNoId && e.width < ir.expr(kept).width && ir.expr(kept).kind == ExprKind::Ref)
            if (auto c = chain(kept)) {
                const std::string& name = *signalName(c->sym);
                named.insert(name);
                for (long k = 0; k < static_cast<long>(e.width); ++k) bits.insert({name, static_cast<int>(c->lo + k)});
                continue;
            }
        if (auto c = chain(id)) {
            const std::string& name = *signalName(c->sym);
            named.insert(name);
            for (long k = 0; k < static_cast<long>(e.width); ++k) bits.insert({name, static_cast<int>(c->lo + k)});
            continue;
        }
        switch (e.kind) {
        case ExprKind::Const: break;
        case ExprKind::Ref:
            if (const std::string* n = signalName(e.a)) whole.insert(*n), named.insert(*n);
            break;
        case ExprKind::Unary: case ExprKind::Convert: case ExprKind::Replicate: case ExprKind::Range: read(e.a); break;
        case ExprKind::Binary: case ExprKind::Index: case ExprKind::Indexed: read(e.a); read(e.b); break;
        case ExprKind::Cond: read(e.a); read(e.b); read(e.c); break;
        case ExprKind::Concat:
            for (std::uint32_t k = 0; k < e.b; ++k) read(ir.list(e.a)[k]);
            break;
        case ExprKind::Call:
            for (std::uint32_t k = 0; k < e.c; ++k) read(ir.list(e.b)[k]);
            break;
        }
    }
    // Names the IR does not show (kept members have none): by the reader's static read ranges
    // where it has them, else the whole signal.
    for (const auto& n : mem.reads) {
        if (named.count(n)) continue;
        auto rr = mem.readRanges.find(n);
        if (rr == mem.readRanges.end()) {
            whole.insert(n);
            continue;
        }
        for (auto [a, b] : rr->second)
            for (int k = a; k <= b; ++k) bits.insert({n, k});
    }
}

std::string indentOf(const std::string& src, std::size_t pos) {
    std::size_t ls = pos;
    while (ls > 0 && src[ls - 1] != '\n') --ls;
    std::size_t i = ls;
    while (i < src.size() && (src[i] == ' ' || src[i] == '\t')) ++i;
    return src.substr(ls, i - ls);
}

std::size_t lineStart(const std::string& src, std::size_t pos) {
    while (pos > 0 && src[pos - 1] != '\n') --pos;
    return pos;
}

/// A header comment kerf wrote (`// kerf: 2 of 5 groups rewritten, ...`, with its note line when it
/// ends in ';') on the line [ls, le): the end of its lines; nothing for any other line.
std::optional<std::size_t> oldHeaderLines(const std::string& s, std::size_t ls, std::size_t le) {
    std::size_t p = ls;
    while (p < le && (s[p] == ' ' || s[p] == '\t')) ++p;
    const std::string tag = "// kerf: ";
    if (s.compare(p, tag.size(), tag) != 0) return std::nullopt;
    p += tag.size();
    // The header as the writer first writes it, before the flow fills in the figures: what a
    // run on the text about to be written sees (F235).
    const std::string placeholder = "restructured logic";
    if (s.compare(p, placeholder.size(), placeholder) == 0) {
        std::size_t q = p + placeholder.size();
        while (q < le && (s[q] == '\r' || s[q] == '\n')) ++q;
        if (q == le) return le;
    }
    auto digits = [&]() {
        std::size_t q = p;
        while (q < le && std::isdigit(static_cast<unsigned char>(s[q]))) ++q;
        bool any = q > p;
        p = q;
        return any;
    };
    if (!digits() || s.compare(p, 4, " of ") != 0) return std::nullopt;
    p += 4;
    if (!digits() || s.compare(p, 6, " group") != 0) return std::nullopt;
    std::size_t textEnd = le;
    while (textEnd > ls && (s[textEnd - 1] == '\n' || s[textEnd - 1] == '\r' || s[textEnd - 1] == ' ')) --textEnd;
    if (textEnd > ls && s[textEnd - 1] == ';' && le < s.size()) {
        // The note line: `// bits no longer read: see kf_unused` and its kinds.
        std::size_t ne = s.find('\n', le);
        ne = ne == std::string::npos ? s.size() : ne + 1;
        std::size_t q = le;
        while (q < ne && (s[q] == ' ' || s[q] == '\t')) ++q;
        std::string note = s.substr(q, ne - q);
        if (note.compare(0, 3, "// ") == 0 && note.find(" no longer ") != std::string::npos &&
            note.find(": see ") != std::string::npos)
            return ne;
    }
    return le;
}

bool blankBetween(const std::string& s, std::size_t a, std::size_t b) {
    for (std::size_t i = a; i < b; ++i)
        if (s[i] != ' ' && s[i] != '\t' && s[i] != '\r') return false;
    return true;
}

/// Widths of the vectors kerf generates for word operations (operands and results).
std::map<std::string, int>& generatedWidths() {
    static thread_local std::map<std::string, int> w;
    return w;
}

std::string bitText(const frontend::ModuleDesc& m, const BitRef& b) {
    auto it = m.signals.find(b.signal);
    if (it == m.signals.end()) {
        auto g = generatedWidths().find(b.signal);
        if (g != generatedWidths().end() && g->second == 1) return verilogName(b.signal);
        return fmt::format("{}[{}]", verilogName(b.signal), b.offset);
    }
    // As the declared type names the bit: `m[1][3]`, `req.hdr.tag[0]`, never a flat offset.
    return frontend::referenceText(m, b);
}

/// A name fragment from a reference: `paddr[3]` -> `paddr3`.
std::string fragment(const std::string& text) {
    std::string s;
    for (std::size_t i = 0; i < text.size(); ++i) {
        char c = text[i];
        if (std::isalnum(static_cast<unsigned char>(c)) || c == '_') s += c;
        else if (c == '.') s += '_';   // req.hdr.tag[0] -> req_hdr_tag0
        // A bit selected by name: `state[IDLE]` -> state_IDLE.
        else if (c == '[' && i + 1 < text.size() && std::isalpha(static_cast<unsigned char>(text[i + 1]))) s += '_';
    }
    return s;
}

struct UnionFind {
    std::vector<int> p;
    explicit UnionFind(std::size_t n) : p(n) { std::iota(p.begin(), p.end(), 0); }
    int find(int x) { return p[x] == x ? x : p[x] = find(p[x]); }
    void unite(int a, int b) {
        a = find(a), b = find(b);
        if (a != b) p[std::max(a, b)] = std::min(a, b);
    }
};

struct Edit {
    std::size_t start, end;
    std::string text;
    int group = -1;   ///< the statement group whose rewrite it is (-1: none)
};

class Writer {
public:
    Writer(const WriteInput& in, const WriteOptions& o)
        : m_(*in.module), low_(*in.lowered), orig_(*in.original), net_(*in.network), forms_(*in.forms), opts_(o),
          origForms_(in.originalForms) {
        oneGroup_ = in.oneGroup;
    }
    WriteResult run();

private:
    // ---- set-up
    void indexMembers();
    void indexOutputs();
    std::size_t declPos(const std::string& signal) const;
    bool isPort(const std::string& s) const {
        auto it = m_.signals.find(s);
        return it != m_.signals.end() && it->second.dir != frontend::PortDir::None;
    }
    int signalRank(const std::string& s) const;
    VarRef refFor(const BitRef& b, int rankBase) const;

    // ---- one planning round; returns false when a name had to be withdrawn
    bool plan();
    void chooseNames();
    void chooseWires();
    void refinePolarity(const std::vector<std::uint8_t>& live);
    void nameWires();
    void formGroups();
    void formFamilies();
    bool orderFamilies();
    bool checkDeclarationOrder();
    bool checkCycles();
    void decide();
    /// Marks the replaced groups whose text is long for the gates they save (WriteOptions::
    /// maxTextPerGate) to stay as written; true when it marked one not marked before.
    bool textHeavy();
    std::map<int, std::string> textKept_;   ///< statement -> why the text rule keeps it
    void keepReaders();
    /// Whether output i's statement reads, by name, an author's signal of another group whose
    /// logic as read is i's own (node r): a copy, whose logic is that group's.
    bool copiesOtherGroup(std::size_t i, NodeId r, const std::vector<int>& groupOfOutput);
    /// Whether statement `stmt` is kerf's own unused-bits wire of an earlier run (a `wire` named
    /// *unused* below kerf's note): it is kept as written.
    bool ownUnusedWire(int stmt) const;
    std::vector<std::vector<std::size_t>> origDriven_;   ///< per original node: the author's outputs it drives

    // ---- text
    PExpr outputExpr(std::size_t i);
    std::string statementsFor(int unitMember, const std::string& ind, std::set<std::string>* refsOut);
    std::string wireBlock(int group, const std::string& ind);
    /// A generated word operand whose bits (offset -> output index) are all names or constants,
    /// as one concatenation text; nothing when some bit is logic.
    std::optional<std::string> inlineOperand(const std::map<int, std::size_t>& bits, int width);
    /// Wire v's name part when its function (inverted when `inverted`) is a comparison of one
    /// vector or slice with a constant, or its complement: "opcode_is_33", "addr_7_4_not_0".
    /// A comparison name's parts: `opcode_is_33` is {"opcode", "33", true}.
    struct ComparisonParts {
        std::string lhs, value;
        bool equal = true;
        bool pattern = false;   ///< the value is a bit pattern with `x` (bits apart)
    };
    /// `taken`: names already given; a name after a constant (`like_CSR_MCYCLE`) taken by another
    /// wire gives way to the next constant that has the pattern (no `_2` suffix, F347), among
    /// the constants the statements it feeds compare with where it feeds any (F383).
    std::optional<std::string> sliceComparison(NodeId v, bool inverted, ComparisonParts* parts = nullptr,
                                               const std::set<std::string>* taken = nullptr) const;
    /// Wire v's name (inverted when `inverted`) as the set of values of one vector's bits for
    /// which it is true, or false (`digit_is_3_or_5_or_6_or_9`, `hit_vec_1_0_not_00`): when its
    /// function reads the bits of one vector only, at most kValueSetBits of them, and the smaller
    /// set has at most kValueSetValues values (F384).
    std::optional<std::string> valueSetName(NodeId v, bool inverted) const;
    static constexpr int kValueSetBits = 6;
    static constexpr std::size_t kValueSetValues = 4;
    /// Per wire: the named constants (indices into the module's) that the statements of the
    /// outputs it feeds, directly or through other wires, compare with (nameWires; F383).
    std::map<NodeId, std::set<int>> fedConstants_;
    std::string statement(const std::string& ind, const std::string& lead, const PExpr& e) const;

    /// Every name output i's text reads: an author's copy of an input reads that input;
    /// otherwise the node's name (when output i does not define it) and its definition's names.
    void namesRead(std::size_t i, const std::function<void(const std::string&)>& onName);
    void collectRefs(const PExpr& e, std::set<std::string>& out) const;
    /// Bits the replaced statements read that the written text no longer reads.
    std::vector<std::string> unreadBits();
    void coneOf(NodeId v, bool viaDefinition, const std::function<void(NodeId)>& onWire,
                const std::function<void(NodeId)>& onNode, const std::function<void(const std::string&)>& onName);
    // coneOf's marks: node v was seen by the walk with stamp coneStamp_ (one counter per
    // walk instead of a set per walk: the walks of a big network are many and short).
    std::vector<std::uint32_t> coneSeen_;
    std::uint32_t coneStamp_ = 0;
    std::vector<NodeId> coneWork_;
    std::vector<const Factored*> coneForms_;

    const frontend::ModuleDesc& m_;
    const frontend::Lowered& low_;
    const net::Network& orig_;
    const net::Network& net_;
    const std::vector<Factored>& forms_;
    WriteOptions opts_;
    std::string src_;

    // members
    std::map<int, const frontend::Member*> byId_;
    std::vector<int> stmts_;                   ///< replaced members, one per statement (shared src merged)
    std::map<int, int> stmtOf_;                ///< member id -> representative member id
    std::map<std::string, int> unitOfSignal_;  ///< signal -> its first writing statement
    std::map<std::string, std::vector<int>> writersOf_;   ///< signal -> every statement writing bits of it
    std::map<int, std::vector<int>> membersOfStmt_;
    // outputs
    struct Out {
        BitRef bit;
        bool generated = false;   ///< word-operation operand
        int stmt = -1;            ///< representative statement (member id); -1 for generated
    };
    std::vector<Out> outs_;
    std::vector<std::uint8_t> allowed_;        ///< per output: may lend its name to its node
    std::set<std::string> taken_;
    bool oneGroup_ = false;
    /// Generated operand -> the word operation (index in low_.wordOps) it is an operand of.
    std::map<std::string, std::size_t> opOfOperand_;

    // per planning round
    std::vector<std::optional<VarRef>> refs_;  ///< per variable
    std::vector<int> definer_;                 ///< per node: the output that defines it (-1)
    std::vector<std::uint8_t> isWire_;
    std::vector<NodeId> wires_;                ///< topological order
    std::vector<int> wireGroup_;
    std::map<int, int> groupOfStmt_;
    /// Per word operation: its statement group (-1: nothing reads it; it is not written).
    std::vector<int> opGroup_;
    /// The group of output i (a generated operand: its operation's group), -1 for none.
    int groupOfOut(std::size_t i) const {
        if (!outs_[i].generated) return groupOfStmt_.at(outs_[i].stmt);
        auto it = opOfOperand_.find(outs_[i].bit.signal);
        return it == opOfOperand_.end() ? -1 : opGroup_[it->second];
    }
    /// Whether word operation k is written: its group is replaced.
    bool opWritten(std::size_t k) const {
        return opGroup_[k] >= 0 && groups_[static_cast<std::size_t>(opGroup_[k])].replaced;
    }
    std::vector<StatementGroup> groups_;
    std::vector<std::vector<int>> groupStmts_;
    std::vector<std::vector<NodeId>> groupWires_;
    /// New wires written as one vector wire (wire_vectors.cpp): its name and members, bit 0 first.
    struct Family {
        std::string name;
        std::vector<NodeId> members;
    };
    std::vector<Family> families_;
    std::vector<int> familyOf_;               ///< per node: its family (-1: a scalar wire)
    std::set<NodeId> noFamily_;               ///< wires whose family closed a loop (checkCycles)
    std::size_t familiesBroken_ = 0;
    /// Family f's declaration: one vector wire, or (should its bits no longer share a shape)
    /// the vector declared and its bits assigned one by one.
    std::string familyText(std::size_t f, const std::string& ind, ExprBuilder& eb);
    std::vector<std::size_t> groupPos_;        ///< where the group's wires go (line start)
    std::vector<std::string> namesKept_;
    std::vector<VarRef> inputRefs_;            ///< per input variable: its own name
    std::vector<int> aliasOf_;                 ///< per input variable: the output that lends it a name
    const std::vector<Factored>* origForms_ = nullptr;
    int notReadWidth_ = 0;                     ///< total width of unreadBits()
    mutable std::set<int> constantsNamed_;     ///< named constants the written statements name
    std::map<std::string, std::string> sameAs_; ///< result of a repeated word operation -> the first one's
    std::map<std::string, std::string> resultName_;   ///< word result -> the author's signal that is exactly it
    std::set<std::string> lateResultNames_;   ///< of those, signals declared below a statement kerf may rewrite
    std::map<std::string, std::string> inlined_;      ///< generated operand -> its inline concatenation
    bool inlinedDone_ = false;
    std::set<std::string> reduced_;   ///< signals the source reduces (reductions.cpp), written `|v`
    bool ownOutput_ = false;     ///< the module carries the header of an earlier run of kerf
    bool unorderable_ = false;   ///< no name left to withdraw to break a loop between statements
    /// Per member: the bits of module signals its text reads, and the signals it reads whole
    /// (originalReads); filled on first use.
    using Reads = std::pair<std::set<std::pair<std::string, int>>, std::set<std::string>>;
    std::map<int, Reads> memberReads_;
    const Reads& readsOf(const frontend::Member& mem) {
        auto r = memberReads_.find(mem.id);
        if (r == memberReads_.end()) {
            r = memberReads_.emplace(mem.id, Reads{}).first;
            originalReads(m_, mem, r->second.first, r->second.second);
        }
        return r->second;
    }
    /// Whether the written file reads every bit of `signal` whatever the rewritten statements
    /// read: a port, a signal a word operation reads whole, or one that a statement staying as
    /// written (`replacedNow`: the members rewritten) reads whole. Reading some of its bits
    /// then changes no lint warning.
    bool readWhole(const std::string& signal, const std::set<int>& replacedNow) {
        if (isPort(signal)) return true;
        for (const auto& w : low_.wordOps)
            for (const auto& o : w.operands)
                if (!o.generated && o.name == signal) return true;
        auto it = m_.signals.find(signal);
        if (it == m_.signals.end()) return false;
        std::set<int> bits;
        for (const auto& mem : m_.members) {
            if (replacedNow.count(mem.id)) continue;
            const Reads& r = readsOf(mem);
            if (r.second.count(signal)) return true;
            for (auto b = r.first.lower_bound({signal, 0}); b != r.first.end() && b->first == signal; ++b)
                bits.insert(b->second);
        }
        return static_cast<int>(bits.size()) >= it->second.width;
    }
    /// The operation as Verilog; with `breakCol` (the column its text starts at) a binary one too
    /// long for the line limit continues on a second line, the operator leading it.
    std::string operationText(const frontend::WordOp& w, std::size_t breakCol = 0);
    void inlineOperands();

public:
    /// Registers of named values (named_values.cpp): targets assigned only names are written
    /// as one choice among them.
    void setDomains(std::vector<NamedDomain> d, std::set<std::string> chosen) {
        domains_ = std::move(d);
        chosen_ = std::move(chosen);
    }
    /// Targets written as a choice (after run()).
    std::vector<std::string> choicesWritten() const {
        std::vector<std::string> out;
        for (const auto& [sig, plan] : choices_) out.push_back(sig);
        return out;
    }

private:
    std::vector<NamedDomain> domains_;
    std::set<std::string> chosen_;   ///< targets the naming plan writes as a choice
    /// Per target written as a choice: the choice, and its outputs by bit offset.
    std::map<std::string, std::pair<ValueChoice, std::vector<std::size_t>>> choices_;
    void planChoices();
    PExpr choiceExpr(const std::string& signal);
    bool enumTyped(const std::string& signal) const {
        auto it = m_.signals.find(signal);
        if (it == m_.signals.end()) return false;
        frontend::TypeId t = it->second.type;
        return t != frontend::kNoId && t < m_.ir.types.size() && m_.ir.types[t].kind == frontend::TypeKind::Enum;
    }
};

namespace {
/// Hexadecimal digits of the binary digits `bits` (MSB first; the first digit takes the rest).
std::string hexDigits(const std::string& bits) {
    std::string hex;
    std::size_t first = bits.size() % 4 == 0 ? 4 : bits.size() % 4;
    for (std::size_t i = 0; i < bits.size();) {
        std::size_t n = i == 0 ? first : 4;
        int d = 0;
        for (std::size_t j = 0; j < n; ++j) d = d * 2 + (bits[i + j] == '1');
        hex += "0123456789abcdef"[d];
        i += n;
    }
    return hex;
}

/// A sized literal of `bits` (MSB first): binary up to 16 bits, hexadecimal beyond.
std::string sizedBinary(const std::string& bits) {
    if (bits.size() <= 16) return fmt::format("{}'b{}", bits.size(), bits);
    return fmt::format("{}'h{}", bits.size(), hexDigits(bits));
}
} // namespace

// ------------------------------------------------------------------ set-up

void Writer::indexMembers() {
    for (const auto& mem : m_.members) byId_[mem.id] = &mem;
    std::map<std::pair<std::size_t, std::size_t>, int> bySrc;
    std::vector<int> ids = low_.replaced;
    std::sort(ids.begin(), ids.end(), [&](int a, int b) { return byId_.at(a)->src.start < byId_.at(b)->src.start; });
    for (int id : ids) {
        const auto* mem = byId_.at(id);
        auto key = std::make_pair(mem->src.start, mem->src.end);
        auto it = bySrc.find(key);
        if (it == bySrc.end()) {
            bySrc[key] = id;
            stmts_.push_back(id);
            stmtOf_[id] = id;
        } else {
            stmtOf_[id] = it->second;
        }
        membersOfStmt_[stmtOf_[id]].push_back(id);
    }
    // Statements writing bits of one signal stay apart, as the source kept them (issue 10:
    // logic the source kept in separate blocks is not merged); each output bit is written by
    // the statement whose logic computes it (indexOutputs).
    std::map<std::string, int> firstWriter;
    for (int id : ids)
        for (const auto& w : byId_.at(id)->writes) {
            firstWriter.emplace(w, stmtOf_[id]);
            auto& ws = writersOf_[w];
            if (std::find(ws.begin(), ws.end(), stmtOf_[id]) == ws.end()) ws.push_back(stmtOf_[id]);
        }
    for (auto& [w, s] : firstWriter) unitOfSignal_[w] = s;
}

void Writer::indexOutputs() {
    std::set<std::string> generated;
    for (const auto& w : low_.wordOps)
        for (const auto& o : w.operands)
            if (o.generated) generated.insert(o.name);
    outs_.resize(net_.outputs().size());
    for (std::size_t i = 0; i < outs_.size(); ++i) {
        outs_[i].bit = low_.outputBits[i];
        outs_[i].generated = generated.count(outs_[i].bit.signal) > 0;
        auto it = unitOfSignal_.find(outs_[i].bit.signal);
        outs_[i].stmt = it == unitOfSignal_.end() ? -1 : it->second;
        // The statement whose logic computes this bit, where the signal's bits are split.
        if (i < low_.outputSources.size() && low_.outputSources[i].member >= 0)
            if (auto st = stmtOf_.find(low_.outputSources[i].member); st != stmtOf_.end()) outs_[i].stmt = st->second;
        if (!outs_[i].generated && outs_[i].stmt < 0)
            throw Error(fmt::format("writer: no statement writes output '{}'", outs_[i].bit.signal), {},
                        ExitCode::Internal);
    }
    allowed_.assign(outs_.size(), 1);
    for (std::size_t i = 0; i < outs_.size(); ++i) allowed_[i] = !outs_[i].generated;
    for (const auto& [n, s] : m_.signals) taken_.insert(n);
    generatedWidths().clear();
    for (const auto& w : low_.wordOps) {
        taken_.insert(w.result);
        generatedWidths()[w.result] = w.resultWidth;
        for (const auto& o : w.operands) {
            taken_.insert(o.name);
            if (o.generated) generatedWidths()[o.name] = o.width;
        }
    }
    for (std::size_t k = 0; k < low_.wordOps.size(); ++k)
        for (const auto& o : low_.wordOps[k].operands)
            if (o.generated) opOfOperand_.emplace(o.name, k);
    // A word operation computed twice (the same operator on operands of the same function) is
    // written once: later copies' results are read under the first one's name.
    std::map<std::string, std::vector<Literal>> operandBits;
    for (std::size_t i = 0; i < outs_.size(); ++i)
        if (outs_[i].generated) {
            auto& v = operandBits[outs_[i].bit.signal];
            if (static_cast<int>(v.size()) <= outs_[i].bit.offset) v.resize(static_cast<std::size_t>(outs_[i].bit.offset) + 1, ~Literal{0});
            v[static_cast<std::size_t>(outs_[i].bit.offset)] = net_.outputs()[i].driver;
        }
    std::map<std::string, std::string> firstOf;
    std::map<NodeId, std::size_t> inputOf;
    for (std::size_t k = 0; k < net_.inputs().size(); ++k) inputOf[net_.inputs()[k]] = k;
    for (const auto& w : low_.wordOps) {
        std::string key = fmt::format("{}|{}|{}|{}", w.op, w.unary, w.isSigned, w.resultWidth);
        for (const auto& o : w.operands) {
            if (!o.generated) {
                key += "|n:" + o.name;
                continue;
            }
            key += fmt::format("|g{}:", o.width);
            for (Literal l : operandBits[o.name]) {
                // A bit that is a result of another operation compares under that result's first name.
                auto in = inputOf.find(literalVar(l));
                if (in == inputOf.end()) {
                    key += fmt::format("{},", l);
                    continue;
                }
                BitRef b = low_.inputBits[in->second];
                if (auto same = sameAs_.find(b.signal); same != sameAs_.end()) b.signal = same->second;
                key += fmt::format("{}:{}:{},", b.signal, b.offset, literalNegated(l) ? 1 : 0);
            }
        }
        auto [it, fresh] = firstOf.emplace(key, w.result);
        if (!fresh) sameAs_[w.result] = it->second;
    }
    // An author's signal that is exactly a word operation's result (`assign shifted = word >> n;`)
    // is written as that operation, and its name names the result: no generated wire it copies.
    std::size_t firstStmt = std::string::npos;
    for (int st : stmts_) firstStmt = std::min(firstStmt, byId_.at(st)->src.start);
    std::map<std::string, std::vector<std::size_t>> outsOfSignal;
    for (std::size_t i = 0; i < outs_.size(); ++i)
        if (!outs_[i].generated) outsOfSignal[outs_[i].bit.signal].push_back(i);
    std::set<std::string> claimed;
    // Whether the low bits of w's result depend on the low bits of its operands only.
    // Its operands are the author's signals, so the statement reads as the source's own (`a + b`):
    // an operation kerf spells out at its context width (`{24'hffffff, ~a} + 32'h1` for
    // `~a + 1`) assigned to fewer bits draws a width warning the source did not (Verilator).
    auto lowBitsOnly = [](const frontend::WordOp& w) {
        static const std::set<std::string> binary = {"+", "-", "*", "<<", "<<<", "&", "|", "^", "^~", "~^"};
        for (const auto& o : w.operands)
            if (o.generated) return false;
        return w.unary ? (w.op == "-" || w.op == "~") : binary.count(w.op) > 0;
    };
    // Whether anything reads bits of w's result from `from` up (logic, or an output as a copy).
    std::vector<std::uint8_t> readNode;
    auto upperRead = [&](const frontend::WordOp& w, const std::vector<NodeId>& resultNode, int from) {
        if (readNode.empty()) {
            readNode.assign(net_.nodeCount(), 0);
            for (NodeId v = 0; v < net_.nodeCount(); ++v)
                if (net_.isLogic(v))
                    for (const auto& c : net_.node(v).cover.cubes)
                        for (Literal l : c.lits) readNode[literalVar(l)] = 1;
            for (const auto& o : net_.outputs()) readNode[literalVar(o.driver)] = 1;
        }
        for (int k = from; k < w.resultWidth; ++k)
            if (NodeId u = resultNode[static_cast<std::size_t>(k)]; u != 0 && readNode[u]) return true;
        return false;
    };
    std::set<std::string> readAsOperand;   // results another operation reads whole (under its first name)
    for (const auto& w : low_.wordOps)
        for (const auto& o : w.operands)
            if (!o.generated) {
                auto same = sameAs_.find(o.name);
                readAsOperand.insert(same != sameAs_.end() ? same->second : o.name);
            }
    for (const auto& w : low_.wordOps) {
        if (sameAs_.count(w.result)) continue;
        std::vector<NodeId> resultNode(static_cast<std::size_t>(w.resultWidth), 0);
        for (std::size_t k = 0; k < net_.inputs().size(); ++k)
            if (low_.inputBits[k].signal == w.result && low_.inputBits[k].offset < w.resultWidth)
                resultNode[static_cast<std::size_t>(low_.inputBits[k].offset)] = net_.inputs()[k];
        for (const auto& [sig, idx] : outsOfSignal) {
            const auto& S = m_.signals.at(sig);
            // A signal narrower than the result takes its low bits when nothing else reads the
            // upper ones and the operation's low bits depend on its operands' low bits only: an
            // assignment truncates (IEEE 1800-2017 10.7), and the operation, evaluated at the
            // width of its operands either way, gives the same low bits
            // (`wire [3:0] narrow = a + b;` of 8-bit a and b stays so; F289).
            const bool narrower = S.width < w.resultWidth && lowBitsOnly(w) && !readAsOperand.count(w.result) &&
                                  !upperRead(w, resultNode, S.width);
            if ((S.width != w.resultWidth && !narrower) || static_cast<int>(idx.size()) != S.width || claimed.count(sig))
                continue;
            if (S.type != frontend::kNoId && S.type < m_.ir.types.size()) {
                auto kind = m_.ir.types[S.type].kind;
                if (kind != frontend::TypeKind::Vector && kind != frontend::TypeKind::Logic) continue;
            }
            // Declared above every statement kerf may rewrite, its name can be read anywhere.
            // Declared lower (kerf's own output declares a result's signal in its wire block,
            // below the statements before it), the name is still fine where the operation is
            // written, the signal's own statement: readers of the result by gates are held to
            // the declaration by checkDeclarationOrder; another operation reading the result
            // would name it in a wire block, so then not (F339: a second run wrote such a
            // signal as a copy of a new wire, `assign x_2 = a == b; assign x = x_2;`).
            if (!isPort(sig) && declPos(sig) > firstStmt) {
                auto own = unitOfSignal_.find(sig);
                if (own == unitOfSignal_.end() || declPos(sig) > byId_.at(own->second)->src.start ||
                    readAsOperand.count(w.result))
                    continue;
            }
            bool all = true;
            for (std::size_t i : idx) {
                Literal d = net_.outputs()[i].driver;
                int k = outs_[i].bit.offset;
                all = all && !literalNegated(d) && k >= 0 && k < w.resultWidth &&
                      resultNode[static_cast<std::size_t>(k)] != 0 && literalVar(d) == resultNode[static_cast<std::size_t>(k)];
            }
            if (!all) continue;
            if (!isPort(sig) && declPos(sig) > firstStmt) lateResultNames_.insert(sig);
            resultName_[w.result] = sig;
            claimed.insert(sig);
            break;
        }
    }
}

std::size_t Writer::declPos(const std::string& signal) const {
    auto it = m_.signals.find(signal);
    if (it == m_.signals.end()) return 0;   // generated by kerf: declared in the group's wire block
    const auto& s = it->second;
    if (s.decl && s.decl->file == m_.src.file) return s.decl->stmtStart;
    if (s.dir != frontend::PortDir::None) return 0;
    return s.src.file == m_.src.file ? s.src.start : 0;
}

int Writer::signalRank(const std::string& s) const {
    for (std::size_t i = 0; i < m_.portOrder.size(); ++i)
        if (m_.portOrder[i] == s) return kRankPort + static_cast<int>(i) * 4096;
    return kRankInternal + static_cast<int>(std::min<std::size_t>(declPos(s), 255)) * 4096;
}

VarRef Writer::refFor(const BitRef& bitIn, int rankBase) const {
    BitRef b = bitIn;
    if (auto same = sameAs_.find(b.signal); same != sameAs_.end()) b.signal = same->second;
    if (auto named = resultName_.find(b.signal); named != resultName_.end()) b.signal = named->second;
    VarRef r;
    r.text = bitText(m_, b);
    auto it = m_.signals.find(b.signal);
    int width = it == m_.signals.end() ? 0 : it->second.width;
    if (it != m_.signals.end() && (it->second.vector || it->second.width > 1)) {
        r.signal = b.signal;
        // A bit the source names (`state[IDLE]`, frontend::nameSelectedBits) is written alone:
        // never grouped with other bits into a slice of raw positions.
        r.byName = !it->second.bitNames.empty();
        r.offset = b.offset;
        r.width = width;
        r.msb = it->second.msb;
        r.lsb = it->second.lsb;
        r.module = &m_;
    } else if (it == m_.signals.end() && generatedWidths().count(b.signal) && generatedWidths()[b.signal] > 1) {
        // A generated vector (a word operation's result, declared `wire [W-1:0]` by the writer):
        // all its bits read by its name alone, as an author's vector is; as a slice of every bit
        // (`gnt_w0[1:0] == 2'b00`) a second run, reading the wire as the author's, wrote it
        // differently (F339).
        r.signal = b.signal;
        r.offset = b.offset;
        r.width = generatedWidths()[b.signal];
        r.msb = r.width - 1;
        r.lsb = 0;
    }
    r.rank = rankBase + (4095 - std::min(b.offset, 4095));
    return r;
}

// ------------------------------------------------------------------ planning

void Writer::chooseNames() {
    const std::size_t n = net_.nodeCount();
    refs_.assign(n, std::nullopt);
    definer_.assign(n, -1);
    aliasOf_.assign(n, -1);
    namesKept_.clear();
    // Inputs by their own names, or by an author's signal that is a plain copy of them.
    std::map<std::string, std::size_t> inputIndex;
    for (std::size_t k = 0; k < net_.inputs().size(); ++k) {
        const BitRef& b = low_.inputBits[k];
        refs_[net_.inputs()[k]] = refFor(b, isPort(b.signal) ? kRankPort + signalRank(b.signal) - kRankPort
                                                              : signalRank(b.signal));
    }
    // Candidate outputs per node: positive first, internal signals before ports, then output order.
    std::vector<int> best(n, -1);
    auto better = [&](std::size_t i, int j) {
        if (j < 0) return true;
        Literal di = net_.outputs()[i].driver, dj = net_.outputs()[static_cast<std::size_t>(j)].driver;
        if (literalNegated(di) != literalNegated(dj)) return !literalNegated(di);
        bool pi = isPort(outs_[i].bit.signal), pj = isPort(outs_[static_cast<std::size_t>(j)].bit.signal);
        if (pi != pj) return !pi;
        return false;
    };
    for (std::size_t i = 0; i < outs_.size(); ++i) {
        if (!allowed_[i]) continue;
        Literal d = net_.outputs()[i].driver;
        NodeId v = literalVar(d);
        if (v == 0) continue;
        if (!net_.isLogic(v)) {
            // An internal copy of an input names that input.
            if (literalNegated(d) || isPort(outs_[i].bit.signal)) continue;
            if (net_.node(v).kind != net::NodeKind::Input) continue;
        }
        if (better(i, best[v])) best[v] = static_cast<int>(i);
    }
    for (NodeId v = 1; v < n; ++v) {
        if (best[v] < 0) continue;
        std::size_t i = static_cast<std::size_t>(best[v]);
        VarRef r = refFor(outs_[i].bit, signalRank(outs_[i].bit.signal));
        r.inverted = literalNegated(net_.outputs()[i].driver);
        refs_[v] = r;
        if (net_.isLogic(v)) definer_[v] = static_cast<int>(i);
        else aliasOf_[v] = static_cast<int>(i);
    }
}

void Writer::chooseWires() {
    const std::size_t n = net_.nodeCount();
    isWire_.assign(n, 0);
    wires_.clear();
    std::vector<std::uint8_t> live(n, 0);
    std::vector<NodeId> work;
    for (const auto& o : net_.outputs()) work.push_back(literalVar(o.driver));
    while (!work.empty()) {
        NodeId v = work.back();
        work.pop_back();
        if (live[v]) continue;
        live[v] = 1;
        if (!net_.isLogic(v)) continue;
        for (const auto& c : net_.node(v).cover.cubes)
            for (Literal l : c.lits) work.push_back(literalVar(l));
    }
    // Consumers: distinct logic nodes reading v, plus outputs that refer to v without defining it.
    std::vector<std::uint32_t> users(n, 0), logicUsers(n, 0), posUses(n, 0), negUses(n, 0);
    std::vector<NodeId> order = net_.topoOrder();
    std::vector<NodeId> countedFor(n, static_cast<NodeId>(-1));   // v was last counted as read by this node
    for (NodeId u : order) {
        if (!live[u]) continue;
        for (const auto& c : net_.node(u).cover.cubes)
            for (Literal l : c.lits) {
                NodeId v = literalVar(l);
                if (countedFor[v] != u) countedFor[v] = u, ++users[v], ++logicUsers[v];
            }
        std::function<void(const Factored&)> walk = [&](const Factored& f) {
            if (f.kind == Factored::Kind::Lit) (literalNegated(f.lit) ? negUses : posUses)[literalVar(f.lit)]++;
            for (const auto& k : f.kids) walk(k);
        };
        walk(forms_[u]);
    }
    for (std::size_t i = 0; i < outs_.size(); ++i) {
        Literal d = net_.outputs()[i].driver;
        NodeId v = literalVar(d);
        if (definer_[v] == static_cast<int>(i)) continue;
        ++users[v];
        (literalNegated(d) ? negUses : posUses)[v]++;
    }
    // A target bit that several conditions of a choice read is a wire of its own.
    std::vector<std::uint32_t> choiceUses(n, 0);
    for (const auto& [sig, plan] : choices_)
        for (const auto& link : plan.first.links)
            for (const auto& [k, val] : link.cube)
                ++choiceUses[literalVar(net_.outputs()[plan.second[static_cast<std::size_t>(k)]].driver)];
    // An exclusive or read once, by another exclusive or, is written inside it (`a ^ b ^ c`,
    // `^data`: expression.cpp): the reader reads a chain of `^` back as the same gates.
    std::vector<std::uint8_t> inXor(n, 0);
    for (NodeId u : order) {
        Literal a, b;
        bool inv = false;
        if (!live[u] || !net_.isLogic(u) || !xorForm(forms_[u], a, b, inv)) continue;
        for (Literal l : {a, b}) {
            NodeId x = literalVar(l);
            Literal c, d;
            if (x != 0 && net_.isLogic(x) && !refs_[x] && users[x] == 1 && logicUsers[x] == 1 && choiceUses[x] < 2 &&
                xorForm(forms_[x], c, d, inv))
                inXor[x] = 1;
        }
    }
    for (NodeId v : order) {
        if (!live[v] || refs_[v] || inXor[v]) continue;
        // A node read by another node keeps its own statement even when read once: the reader
        // flattens a statement into a sum of products, and nesting a node into another's text
        // could count larger when the written file is read back.
        if (users[v] <= 1 && logicUsers[v] == 0 && choiceUses[v] < 2) continue;
        isWire_[v] = 1;
        wires_.push_back(v);
        VarRef r;
        r.text = fmt::format("$w{}", v);   // placeholder until named
        r.rank = kRankWire + static_cast<int>(wires_.size());
        refs_[v] = r;
    }
    // Polarity: a wire used mostly inverted is stored inverted.
    ExprBuilder eb(refs_, forms_, &reduced_);
    for (NodeId v : wires_) {
        int asIs = eb.inversions(v, false) + static_cast<int>(negUses[v]);
        int inverted = eb.inversions(v, true) + static_cast<int>(posUses[v]);
        if (inverted < asIs) refs_[v]->inverted = true;
    }
    refinePolarity(live);
}

void Writer::refinePolarity(const std::vector<std::uint8_t>& live) {
    // The count above reads each use by its literal's sign, but a use inside a form printed under
    // a complement (an output driven inverted, or a sub-expression De Morgan's rule turns round)
    // reads the other way: `y = ~(~a & ~w)` prints as `a | w`. So each wire is valued again by the
    // text as printed: the inversions of its own definition and of every statement whose text
    // holds it (through forms written inline), with the wire stored either way; the way with
    // fewer is kept, ties as decided above. Bounded: the statements are valued twice per wire.
    constexpr std::size_t kMaxWires = 4000, kMaxLiteralsPerWire = 4000, kMaxLiterals = 1000000;
    if (wires_.empty() || wires_.size() > kMaxWires) return;
    std::size_t budget = kMaxLiterals;
    auto literals = [&](NodeId u) {
        std::size_t k = 0;
        for (const auto& c : net_.node(u).cover.cubes) k += c.lits.size();
        return k;
    };
    const std::size_t n = net_.nodeCount();
    // Statements: wires and the nodes outputs are defined by; other logic nodes are inline.
    std::vector<std::uint8_t> root(n, 0);
    for (NodeId w : wires_) root[w] = 1;
    for (NodeId v = 1; v < n; ++v)
        if (definer_[v] >= 0 && live[v]) root[v] = 1;
    std::vector<std::vector<NodeId>> readers(n);
    for (NodeId u = 1; u < n; ++u) {
        if (!live[u] || !net_.isLogic(u)) continue;
        for (const auto& c : net_.node(u).cover.cubes)
            for (Literal l : c.lits) {
                NodeId x = literalVar(l);
                if (x != 0 && (readers[x].empty() || readers[x].back() != u)) readers[x].push_back(u);
            }
    }
    // Outputs that name a node without being defined by it (`assign y = ~w;`).
    std::vector<std::vector<std::size_t>> aliases(n);
    for (std::size_t i = 0; i < outs_.size(); ++i) {
        NodeId v = literalVar(net_.outputs()[i].driver);
        if (v != 0 && definer_[v] != static_cast<int>(i)) aliases[v].push_back(i);
    }
    std::vector<NodeId> stmts, work;
    std::vector<NodeId> seen(n, 0);
    NodeId stamp = 0;
    for (NodeId v : wires_) {
        stmts.assign(1, v);
        work.assign(readers[v].begin(), readers[v].end());
        ++stamp;
        seen[v] = stamp;
        std::size_t size = literals(v);
        while (!work.empty() && size <= kMaxLiteralsPerWire) {
            NodeId u = work.back();
            work.pop_back();
            if (seen[u] == stamp) continue;
            seen[u] = stamp;
            size += literals(u);
            if (root[u]) stmts.push_back(u);
            else work.insert(work.end(), readers[u].begin(), readers[u].end());
        }
        if (size > kMaxLiteralsPerWire || 2 * size > budget) continue;
        budget -= 2 * size;
        auto total = [&]() {
            ExprBuilder eb(refs_, forms_, &reduced_);
            int t = 0;
            for (NodeId u : stmts) t += eb.inversions(u, refs_[u] ? refs_[u]->inverted : false);
            for (std::size_t i : aliases[v]) t += literalNegated(net_.outputs()[i].driver) != refs_[v]->inverted ? 1 : 0;
            return t;
        };
        int kept = total();
        refs_[v]->inverted = !refs_[v]->inverted;
        if (total() >= kept) refs_[v]->inverted = !refs_[v]->inverted;
    }
}

void Writer::coneOf(NodeId root, bool viaDefinition, const std::function<void(NodeId)>& onWire,
                    const std::function<void(NodeId)>& onNode, const std::function<void(const std::string&)>& onName) {
    if (coneSeen_.size() != net_.nodeCount() || ++coneStamp_ == 0) {
        coneSeen_.assign(net_.nodeCount(), 0);
        coneStamp_ = 1;
    }
    const std::uint32_t stamp = coneStamp_;
    // The callbacks must not start a walk of their own (the marks are shared); the
    // stacks are reused from walk to walk.
    std::vector<NodeId>& work = coneWork_;
    std::vector<const Factored*>& forms = coneForms_;
    work.clear();
    work.push_back(root);
    bool first = viaDefinition;
    while (!work.empty()) {
        NodeId v = work.back();
        work.pop_back();
        if (v == 0) continue;
        bool expand = first;
        first = false;
        if (!expand) {
            if (coneSeen_[v] == stamp) continue;
            coneSeen_[v] = stamp;
            if (refs_[v] && !isWire_[v]) {
                onName(refs_[v]->signal.empty() ? refs_[v]->text : refs_[v]->signal);
                continue;
            }
            if (!net_.isLogic(v)) continue;
            if (isWire_[v]) {
                onWire(v);
                continue;
            }
        }
        onNode(v);
        // The form's literals in written order (a pre-order walk without recursion).
        forms.clear();
        forms.push_back(&forms_[v]);
        while (!forms.empty()) {
            const Factored* f = forms.back();
            forms.pop_back();
            if (f->kind == Factored::Kind::Lit) work.push_back(literalVar(f->lit));
            for (auto k = f->kids.rbegin(); k != f->kids.rend(); ++k) forms.push_back(&*k);
        }
    }
}

/// Whether a wire name is the output-and-index form (`y_t3`, `t0`, `kf_t2`).
static bool indexedName(const std::string& n) {
    std::size_t d = n.size();
    while (d > 0 && std::isdigit(static_cast<unsigned char>(n[d - 1]))) --d;
    return d < n.size() && d > 0 && n[d - 1] == 't' && (d == 1 || n[d - 2] == '_');
}

/// The value of a comparison as a name part: `4'h0` -> "0", `2'b11` -> "11", a binary constant
/// of five bits or more in hex (`7'b0110011` -> "33"), a named constant by its name.
std::string valueFragment(const std::string& compareText) {
    std::size_t tick = compareText.find('\'');
    if (tick == std::string::npos) {
        // A slice of a named constant (`CSR_MSTATUS[11:4]`) by the constant's name: the compared
        // side's name carries the range.
        std::string value = compareText.substr(compareText.rfind(' ') + 1);
        return fragment(value.substr(0, value.find('[')));
    }
    std::string digits = compareText.substr(tick + 2);
    if (compareText[tick + 1] != 'b' || digits.size() < 5 || digits.find_first_not_of("01") != std::string::npos)
        return digits;
    return hexDigits(digits);
}

std::optional<std::string> Writer::sliceComparison(NodeId v, bool inverted, ComparisonParts* parts,
                                                    const std::set<std::string>* taken) const {
    // Seen through the forms (ANDs, and ORs under an inversion), is literal l's function one
    // product of the bits of one vector? Leaves are network inputs, and nodes named as bits of a
    // vector that are not new wires (an author's signal computed by logic).
    constexpr std::size_t kMaxLeaves = 64;
    std::map<int, int> bits;   // offset -> value
    const VarRef* vec = nullptr;
    std::size_t steps = 0;
    std::function<bool(Literal)> lit;
    std::function<bool(const Factored&, bool)> form = [&](const Factored& f, bool neg) -> bool {
        if (++steps > 4 * kMaxLeaves) return false;
        switch (f.kind) {
        case Factored::Kind::Lit: return lit(neg ? algebra::negateLiteral(f.lit) : f.lit);
        case Factored::Kind::And:
        case Factored::Kind::Or:
            if (f.kids.size() != 1 && (f.kind == Factored::Kind::And) == neg) return false;
            for (const auto& k : f.kids)
                if (!form(k, neg)) return false;
            return !f.kids.empty();
        default: return false;
        }
    };
    lit = [&](Literal l) -> bool {
        NodeId x = literalVar(l);
        if (x == 0) return false;
        const std::optional<VarRef>& r = refs_[x];
        bool leaf = r && !isWire_[x] && !r->signal.empty() && r->width >= 2 && !r->byName;
        if (!leaf) {
            if (!net_.isLogic(x)) return false;
            return form(forms_[x], literalNegated(l));
        }
        if (vec && vec->signal != r->signal) return false;
        vec = &*r;
        int value = literalNegated(l) == r->inverted ? 1 : 0;
        auto [it, fresh] = bits.emplace(r->offset, value);
        return (fresh || it->second == value) && bits.size() <= kMaxLeaves;
    };
    for (bool complemented : {false, true}) {
        bits.clear();
        vec = nullptr;
        steps = 0;
        if (!lit(algebra::makeLiteral(v, inverted != complemented)) || bits.size() < 2) continue;
        const int lo = bits.begin()->first, hi = bits.rbegin()->first;
        if (hi - lo + 1 != static_cast<int>(bits.size())) {
            // Bits of one vector apart (`~opcode[6] & opcode[4] & ... & opcode[0]`): named by the
            // span they lie in and its pattern in binary, MSB first, `x` where a bit is not read
            // (`opcode_is_0x10111`; never hexadecimal, so `0x` never starts a number). Not for an
            // enum-typed signal, whose values the source names; nor for two bits, which read as
            // well by their names (`nopcode6_nopcode2`, not `opcode_6_2_is_0xxx0`).
            if (vectorIsEnum(*vec) || bits.size() < 3) return std::nullopt;
            std::string slice = sliceTextOf(*vec, lo, hi);
            if (slice.front() == '{') return std::nullopt;
            std::string out, pattern;
            for (char c : slice)
                if (c != ']') out += (c == '[' || c == ':' || c == '.') ? '_' : c;
            for (int o = hi; o >= lo; --o) {
                auto it = bits.find(o);
                pattern += it == bits.end() ? 'x' : it->second ? '1' : '0';
            }
            if (parts) *parts = {out, pattern, !complemented, true};
            // Bits of addresses the source compared with named constants (a `case (csr_addr)` over
            // package constants): named after the first such constant (in the order the source
            // names them) that has the pattern, with the range it is like in (F285):
            // `like_CSR_MSTATUS_11_3`, true for CSR_MSTATUS and every value sharing those bits, or
            // its complement `not_like_CSR_CYCLE`. Only a span from the top of the compared bits
            // down (an address prefix with gaps), as for slices of a constant (expression.cpp).
            std::optional<std::string> firstLike;   // when every constant's name is taken
            if (vec->module)
            {
                // The range as the source's text indexes it (`req_i.address[15:4]`: 15 and 4, the
                // member's own indices, never the struct's flat positions, F382).
                std::string range;
                if (std::size_t open = slice.rfind('['); open != std::string::npos && slice.back() == ']') {
                    const std::string idx = slice.substr(open + 1, slice.size() - open - 2);
                    if (!idx.empty() && idx.find_first_not_of("0123456789:") == std::string::npos) {
                        range = "_" + idx;
                        std::replace(range.begin(), range.end(), ':', '_');
                    }
                }
                // The constants the statements this wire feeds compare with come first; where it
                // feeds any, no other constant names it (a wire gating `we_ctrl`, whose statement
                // compares with RegCtrl, is not named after RegStat, F383).
                const std::set<int>* fed = nullptr;
                if (auto f = fedConstants_.find(v); f != fedConstants_.end() && !f->second.empty()) fed = &f->second;
                const auto& constants = vec->module->constants;
                for (std::size_t ci = 0; ci < constants.size(); ++ci) {
                    const auto& c = constants[ci];
                    if (fed && !fed->count(static_cast<int>(ci))) continue;
                    bool like = false, whole = false;
                    for (const auto& k : c.compared) {
                        if (like || k.signal != vec->signal || lo < k.lo || hi != k.hi) continue;
                        like = k.constLo == 0 && k.hi - k.lo + 1 == c.width() && c.width() >= 6;
                        whole = lo == k.lo;
                        for (const auto& [o, val] : bits)
                            like = like && c.bit(o - k.lo) == (val != 0);
                    }
                    if (!like || (!whole && range.empty())) continue;
                    std::string name = (complemented ? "not_like_" : "like_") + c.name + (whole ? "" : range);
                    if (name.size() > std::max<std::size_t>(opts_.maxNameLength, 8)) continue;
                    if (taken && taken->count(opts_.prefix + name)) {
                        if (!firstLike) firstLike = name;
                        continue;
                    }
                    if (parts) parts->pattern = false;   // a name of its own, not the pattern's
                    return name;
                }
            }
            if (firstLike) {
                if (parts) parts->pattern = false;
                return firstLike;
            }
            return out + (complemented ? "_not_" : "_is_") + pattern;
        }
        std::vector<int> msbFirst;
        for (auto it = bits.rbegin(); it != bits.rend(); ++it) msbFirst.push_back(it->second);
        int constant = -1;
        std::string text = comparisonText(*vec, lo, hi, msbFirst, constant);
        if (text.front() == '{') return std::nullopt;   // bits the declared type splits
        std::string lhs = text.substr(0, text.find(' ')), out;
        for (char c : lhs)
            if (c != ']') out += (c == '[' || c == ':' || c == '.') ? '_' : c;
        // Bits of a vector the source reduces, all 0 or all 1: named as the reduction the
        // printer writes (`~|live[1:0]`: "no_live_1_0", `|live[3:2]`: "any_live_3_2").
        const bool ones = std::all_of(msbFirst.begin(), msbFirst.end(), [](int b) { return b == 1; });
        const bool zeros = std::all_of(msbFirst.begin(), msbFirst.end(), [](int b) { return b == 0; });
        if (reduced_.count(vec->signal) && (ones || zeros))
            return std::string(zeros ? (complemented ? "any_" : "no_") : (complemented ? "not_all_" : "all_")) + out;
        if (parts) *parts = {out, valueFragment(text), !complemented, false};
        std::string name = out + (complemented ? "_not_" : "_is_") + valueFragment(text);
        // Bits compared with a slice of a named constant (F285): `csr_addr_11_4_is_CSR_MIE`,
        // or where that is over the cap the constant and the range, `is_CSR_MSTATUS_11_4`.
        if (const std::string value = text.substr(text.rfind(' ') + 1);
            constant >= 0 && value.find('[') != std::string::npos &&
            name.size() > std::max<std::size_t>(opts_.maxNameLength, 8)) {
            std::string range;
            for (char c : value.substr(value.find('[')))
                if (c != ']') range += (c == '[' || c == ':') ? '_' : c;
            name = (complemented ? "not_" : "is_") + valueFragment(text) + range;
        }
        return name;
    }
    return std::nullopt;
}

std::optional<std::string> Writer::valueSetName(NodeId v, bool inverted) const {
    // The leaves, as sliceComparison takes them: bits of one vector that are not new wires.
    std::map<int, NodeId> leafOf;   // offset -> node
    const VarRef* vec = nullptr;
    std::size_t steps = 0;
    std::function<bool(Literal)> lit;
    std::function<bool(const Factored&)> form = [&](const Factored& f) -> bool {
        if (++steps > 256) return false;
        switch (f.kind) {
        case Factored::Kind::Lit: return lit(f.lit);
        case Factored::Kind::And:
        case Factored::Kind::Or:
            for (const auto& k : f.kids)
                if (!form(k)) return false;
            return !f.kids.empty();
        default: return false;
        }
    };
    lit = [&](Literal l) -> bool {
        NodeId x = literalVar(l);
        if (x == 0) return false;
        const std::optional<VarRef>& r = refs_[x];
        const bool leaf = r && !isWire_[x] && !r->signal.empty() && r->width >= 2 && !r->byName;
        if (!leaf) return net_.isLogic(x) && form(forms_[x]);
        if (vec && vec->signal != r->signal) return false;
        vec = &*r;
        leafOf.emplace(r->offset, x);
        return leafOf.size() <= static_cast<std::size_t>(kValueSetBits);
    };
    if (!lit(algebra::makeLiteral(v, inverted)) || leafOf.size() < 2 || !vec) return std::nullopt;
    const int lo = leafOf.begin()->first, hi = leafOf.rbegin()->first, n = hi - lo + 1;
    if (n > kValueSetBits) return std::nullopt;
    // The function at each value of bits lo..hi (bit k of `value` is bit lo + k).
    std::function<bool(Literal, unsigned)> at;
    std::function<bool(const Factored&, unsigned)> formAt = [&](const Factored& f, unsigned value) -> bool {
        if (f.kind == Factored::Kind::Lit) return at(f.lit, value);
        const bool conj = f.kind == Factored::Kind::And;
        for (const auto& k : f.kids)
            if (formAt(k, value) != conj) return !conj;
        return conj;
    };
    at = [&](Literal l, unsigned value) -> bool {
        NodeId x = literalVar(l);
        const std::optional<VarRef>& r = refs_[x];
        bool b;
        if (r && !isWire_[x] && !r->signal.empty() && r->width >= 2 && !r->byName)
            b = ((value >> (r->offset - lo)) & 1U) != 0;
        else
            b = formAt(forms_[x], value);
        return b != literalNegated(l);
    };
    std::vector<unsigned> on, off;
    for (unsigned value = 0; value < (1U << n); ++value)
        (at(algebra::makeLiteral(v, inverted), value) ? on : off).push_back(value);
    if (on.empty() || off.empty()) return std::nullopt;
    const bool equal = on.size() <= off.size();
    const std::vector<unsigned>& set = equal ? on : off;
    if (set.size() > kValueSetValues || set.size() < 2) return std::nullopt;   // one value: a comparison
    std::string lhs, name;
    for (unsigned value : set) {
        std::vector<int> msbFirst;
        for (int k = n - 1; k >= 0; --k) msbFirst.push_back(static_cast<int>((value >> k) & 1U));
        int constant = -1;
        const std::string text = comparisonText(*vec, lo, hi, msbFirst, constant);
        if (text.empty() || text.front() == '{') return std::nullopt;   // bits the declared type splits
        if (lhs.empty()) {
            for (char c : text.substr(0, text.find(' ')))
                if (c != ']') lhs += (c == '[' || c == ':' || c == '.') ? '_' : c;
            name = lhs + (equal ? "_is_" : "_not_");
        } else {
            name += "_or_";
        }
        name += valueFragment(text);
    }
    return name;
}

void Writer::nameWires() {
    if (wires_.empty()) return;
    // Longest name a new wire takes (the prefix not counted): a longer descriptive name gives
    // way to the output's name and an index, and that is shortened to fit.
    const std::size_t cap = std::max<std::size_t>(opts_.maxNameLength, 8);
    ExprBuilder eb(refs_, forms_, &reduced_);
    std::set<std::string> used = taken_;
    std::vector<std::string> names(wires_.size());
    std::map<NodeId, std::size_t> wireIndex;
    for (std::size_t k = 0; k < wires_.size(); ++k) wireIndex[wires_[k]] = k;
    // stem + tail, with "_2", "_3"... on a collision; the stem is cut to keep the cap.
    auto claim = [&](const std::string& stem, const std::string& tail = "") {
        auto fit = [&](const std::string& suffix) {
            std::size_t room = cap > tail.size() + suffix.size() ? cap - tail.size() - suffix.size() : 1;
            std::string t = stem.substr(0, std::max<std::size_t>(room, 1));
            while (t.size() > 1 && t.back() == '_') t.pop_back();
            return opts_.prefix + t + tail + suffix;
        };
        std::string n = fit("");
        for (int k = 2; used.count(n); ++k) n = fit(fmt::format("_{}", k));
        used.insert(n);
        return n;
    };
    // The named constants each wire's readers compare with: from the statements of the outputs
    // it feeds, through the wires that read it (wires are in topological order; F383).
    fedConstants_.clear();
    if (std::any_of(m_.constants.begin(), m_.constants.end(), [](const auto& c) { return !c.compared.empty(); })) {
        for (std::size_t i = 0; i < outs_.size(); ++i) {
            if (outs_[i].stmt < 0) continue;
            auto mem = byId_.find(outs_[i].stmt);
            if (mem == byId_.end()) continue;
            std::set<int> compared;
            for (int c : mem->second->constants)
                if (c >= 0 && static_cast<std::size_t>(c) < m_.constants.size() &&
                    !m_.constants[static_cast<std::size_t>(c)].compared.empty())
                    compared.insert(c);
            if (compared.empty()) continue;
            NodeId v = literalVar(net_.outputs()[i].driver);
            coneOf(v, definer_[v] == static_cast<int>(i),
                   [&](NodeId w) { fedConstants_[w].insert(compared.begin(), compared.end()); }, [](NodeId) {},
                   [](const std::string&) {});
        }
        for (auto it = wires_.rbegin(); it != wires_.rend(); ++it) {
            auto f = fedConstants_.find(*it);
            if (f == fedConstants_.end()) continue;
            const std::set<int> mine = f->second;
            coneOf(*it, true, [&](NodeId w) { fedConstants_[w].insert(mine.begin(), mine.end()); }, [](NodeId) {},
                   [](const std::string&) {});
        }
    }
    // Wires named as a comparison, by name: an OR of them over one vector is named as the set of
    // values (`opcode_is_67_or_6f`).
    std::map<std::string, ComparisonParts> comparisonOf;
    // Names this run made of several parts: products (`a_nb`) and sums (`a_or_b`). Such a name
    // read inverted, or a sum read inside a product, would be misread without brackets
    // (`nfunct32_funct30_funct31` for `~(funct3[2] & funct3[0]) & funct3[1]`): a wire reading
    // one that way is named by the output it feeds instead.
    std::set<std::string> productNames, sumNames;
    auto misread = [&](const PExpr& k, bool inProduct) {
        if (k.kind != PExpr::Kind::Ref) return false;
        bool sum = sumNames.count(k.text) > 0, product = productNames.count(k.text) > 0;
        return (k.neg && (sum || product)) || (inProduct && sum);
    };
    // Descriptive names where the wire is a comparison or a small AND/OR of names.
    for (std::size_t k = 0; k < wires_.size(); ++k) {
        NodeId v = wires_[k];
        // A comparison of one vector or slice with a constant, however the logic spells it
        // (`opcode[5:4] == 2'b11 & ~opcode[3] & ...`): named as the comparison.
        ComparisonParts cp;
        cp.lhs.clear();
        auto cmp = sliceComparison(v, refs_[v]->inverted, &cp, &used);
        // The complement of bits apart (`paddr[5] | paddr[1] | paddr[0]`) reads better by its
        // bits' names (`paddr5_or_paddr1_or_paddr0`) than as `paddr_not_0xxx00`: the pattern
        // name only when there is no other.
        std::optional<std::string> fallback;
        if (cmp && cp.pattern && !cp.equal) fallback = std::move(cmp), cmp.reset();
        if (cmp && cmp->size() <= cap) {
            names[k] = claim(*cmp);
            refs_[v]->text = names[k];
            if (!cp.lhs.empty()) comparisonOf[names[k]] = cp;
            continue;
        }
        PExpr e = eb.definition(v, refs_[v]->inverted);
        std::string name;
        std::optional<ComparisonParts> setParts;
        std::set<std::string>* compound = nullptr;   // where the name goes when made of parts
        auto part = [&](const PExpr& p) -> std::string {
            if (p.kind == PExpr::Kind::Ref && p.text[0] != '$') return (p.neg ? "n" : "") + fragment(p.text);
            if (p.kind == PExpr::Kind::Compare && !p.text.empty() && p.text.find(' ') == std::string::npos) {
                // A reduction: "|live[3:2]" -> "any_live_3_2", "~|v" -> "no_v", "&v" -> "all_v",
                // "~&v" -> "not_all_v".
                std::string t = p.neg ? complementedCompare(p.text) : p.text;
                bool neg = t[0] == '~';
                if (neg) t.erase(0, 1);
                if (t.empty() || (t[0] != '|' && t[0] != '&' && t[0] != '^')) return "";
                const char op = t[0];
                std::string f;
                for (char c : t.substr(1)) {
                    if (c == '{') return "";
                    if (c != ']') f += (c == '[' || c == ':' || c == '.') ? '_' : c;
                }
                // "^v" -> "xor_v" (odd parity), "~^v" -> "xnor_v".
                if (op == '^') return std::string(neg ? "xnor_" : "xor_") + f;
                return std::string(op == '|' ? (neg ? "no_" : "any_") : (neg ? "not_all_" : "all_")) + f;
            }
            if (p.kind == PExpr::Kind::Compare) {
                // "paddr[5:2] == 4'h0" -> "paddr_5_2_is_0"
                std::string lhs = p.text.substr(0, p.text.find(' '));
                if (lhs.empty() || lhs[0] == '{') return "";   // a concatenation: no short name
                bool eq = (p.text.find("==") != std::string::npos) != p.neg;
                // A named value (`state_q == ST_IDLE`): the name.
                std::string value = valueFragment(p.text);
                std::string f;
                for (char c : lhs) f += (c == '[' || c == ':' || c == '.') ? '_' : c;
                if (!f.empty() && f.back() == ']') f.pop_back();
                std::string out;
                for (char c : f)
                    if (c != ']') out += c;
                return out + (eq ? "_is_" : "_not_") + value;
            }
            return "";
        };
        // A comparison the printer writes (`funct3 == 3'b101`), or a wire named as one, as parts.
        auto comparisonParts = [&](const PExpr& p) -> std::optional<ComparisonParts> {
            if (p.kind == PExpr::Kind::Ref) {
                auto it = comparisonOf.find(p.text);
                if (it == comparisonOf.end()) return std::nullopt;
                ComparisonParts c = it->second;
                c.equal = c.equal != p.neg;
                return c;
            }
            if (p.kind != PExpr::Kind::Compare || p.text.find(' ') == std::string::npos) return std::nullopt;
            std::string lhs = p.text.substr(0, p.text.find(' '));
            if (lhs.empty() || lhs[0] == '{') return std::nullopt;
            ComparisonParts c;
            for (char ch : lhs)
                if (ch != ']') c.lhs += (ch == '[' || ch == ':' || ch == '.') ? '_' : ch;
            c.value = valueFragment(p.text);
            c.equal = (p.text.find("==") != std::string::npos) != p.neg;
            return c;
        };
        if (e.kind == PExpr::Kind::Compare) {
            name = part(e);
            if (auto c = comparisonParts(e); c && !name.empty() && name.size() <= cap) {
                names[k] = claim(name);
                refs_[v]->text = names[k];
                comparisonOf[names[k]] = *c;
                continue;
            }
        } else if ((e.kind == PExpr::Kind::And || e.kind == PExpr::Kind::Or) && e.kids.size() <= 4 && [&] {
                       // Comparisons of one vector with several values: an OR of equalities
                       // (`opcode_is_67_or_6f`), or an AND of inequalities, its complement
                       // (`opcode_not_33_or_13`); values all bit patterns with `x` or none.
                       const bool conj = (e.kind == PExpr::Kind::And) != e.neg;
                       std::vector<ComparisonParts> cs;
                       for (const auto& kid : e.kids) {
                           PExpr kk = kid;
                           if (e.neg) kk.neg = !kk.neg;
                           auto c = comparisonParts(kk);
                           if (!c || c->equal == conj || (!cs.empty() && (c->lhs != cs[0].lhs || c->pattern != cs[0].pattern)))
                               return false;
                           cs.push_back(*c);
                       }
                       std::string n = cs[0].lhs + (conj ? "_not_" : "_is_");
                       for (std::size_t j = 0; j < cs.size(); ++j) n += (j ? "_or_" : "") + cs[j].value;
                       if (cs.size() < 2 || n.size() > cap) return false;
                       name = n;
                       // A set of values is a comparison too, for a wider set built on it.
                       setParts = cs[0];
                       setParts->equal = !conj;
                       for (std::size_t j = 1; j < cs.size(); ++j) setParts->value += "_or_" + cs[j].value;
                       return true;
                   }()) {
            // named above
        } else if ((e.kind == PExpr::Kind::And || e.kind == PExpr::Kind::Or) && e.kids.size() <= 3) {
            // An inverted sum or product is named as its dual (`~(a | b)`: `na_nb`).
            bool conj = (e.kind == PExpr::Kind::And) != e.neg;
            std::vector<std::string> ps;
            for (const auto& kid : e.kids) {
                PExpr k = kid;
                if (e.neg) k.neg = !k.neg;
                ps.push_back(k.kind == PExpr::Kind::Ref || k.kind == PExpr::Kind::Compare ? part(k) : "");
            }
            for (const auto& kid : e.kids) {
                PExpr k = kid;
                if (e.neg) k.neg = !k.neg;
                if (misread(k, conj)) ps.assign(1, "");
            }
            if (std::none_of(ps.begin(), ps.end(), [](const std::string& s) { return s.empty(); })) {
                for (std::size_t j = 0; j < ps.size(); ++j) name += (j ? (conj ? "_" : "_or_") : "") + ps[j];
                if (ps.size() > 1) compound = conj ? &productNames : &sumNames;
            }
        } else if (e.kind == PExpr::Kind::Xor && e.kids.size() == 2) {
            std::string a = part(e.kids[0]), b = part(e.kids[1]);
            if (misread(e.kids[0], true) || misread(e.kids[1], true)) a.clear();
            if (!a.empty() && !b.empty()) name = (e.neg ? "same_" : "") + a + (e.neg ? "_" : "_xor_") + b;
            compound = &productNames;
        }
        if (name.size() > cap) name.clear();
        if (name.empty() && fallback && fallback->size() <= cap) {
            name = *fallback, setParts = cp;
            compound = name.find("_or_") != std::string::npos ? &sumNames : nullptr;
        }
        // A tree over a few bits of one vector: the values it holds for (F384), where short.
        if (name.empty())
            if (auto set = valueSetName(v, refs_[v]->inverted); set && set->size() <= cap)
                name = *set, compound = &sumNames;
        if (!name.empty()) {
            // Wires are in topological order: a later wire that combines this one reads its
            // name (`state_q_is_ARB_ncancel`), not a placeholder.
            names[k] = claim(name);
            refs_[v]->text = names[k];
            if (compound && !setParts) compound->insert(names[k]);
            if (setParts) comparisonOf[names[k]] = *setParts;
        }
    }
    // The rest: the first output they feed, with an index counted within that output's logic.
    std::map<std::string, int> counter;
    // A wire an earlier output reached is named, and so is every wire behind it: later
    // outputs neither list nor walk it again (linear in the logic, not outputs x wires).
    std::vector<std::uint8_t> reached(net_.nodeCount(), 0);
    for (std::size_t i = 0; i < outs_.size(); ++i) {
        Literal d = net_.outputs()[i].driver;
        NodeId v = literalVar(d);
        std::string base = fragment(bitText(m_, outs_[i].bit));
        std::vector<NodeId> found;
        auto reach = [&](NodeId w) {
            if (!reached[w]) reached[w] = 1, found.push_back(w);
        };
        coneOf(v, definer_[v] == static_cast<int>(i), reach, [](NodeId) {}, [](const std::string&) {});
        // Wires reached through other wires: breadth by discovery, deterministic.
        for (std::size_t q = 0; q < found.size(); ++q)
            coneOf(found[q], true, reach, [](NodeId) {}, [](const std::string&) {});
        for (NodeId w : found) {
            std::size_t k = wireIndex.at(w);
            if (!names[k].empty()) continue;
            // A choice whose select has a name (`b[2] ? op_2_1_is_01 : op_is_OP_XOR`) is named by
            // the output and the select (`y2_sel_b2`, F348) where that fits; a select named by an
            // index itself says nothing, and keeps the index form.
            PExpr e = eb.definition(w, refs_[w]->inverted);
            if (e.kind == PExpr::Kind::Mux && !e.kids.empty()) {
                const PExpr& sel = e.kids[0];
                if (sel.kind == PExpr::Kind::Ref && !sel.text.empty() && sel.text[0] != '$' &&
                    !indexedName(sel.text)) {
                    const std::string n = base + "_sel_" + (sel.neg ? "n" : "") + fragment(sel.text);
                    if (n.size() <= cap) {
                        names[k] = claim(n);
                        continue;
                    }
                }
            }
            names[k] = claim(base, fmt::format("_t{}", counter[base]++));
        }
    }
    for (std::size_t k = 0; k < wires_.size(); ++k) {
        if (names[k].empty()) names[k] = claim(fmt::format("t{}", counter["$"]++));
        refs_[wires_[k]]->text = names[k];
    }
}

void Writer::formGroups() {
    std::map<int, int> index;
    for (std::size_t s = 0; s < stmts_.size(); ++s) index[stmts_[s]] = static_cast<int>(s);
    // Units: the statements, then the word operations (each with its generated operands).
    const std::size_t S = stmts_.size(), O = low_.wordOps.size();
    UnionFind uf(S + O);
    auto opUnit = [&](std::size_t k) { return static_cast<int>(S + k); };
    auto unitOf = [&](std::size_t i) {
        if (!outs_[i].generated) return index.at(outs_[i].stmt);
        auto it = opOfOperand_.find(outs_[i].bit.signal);
        return it == opOfOperand_.end() ? -1 : opUnit(it->second);
    };
    std::vector<int> wireOwner(net_.nodeCount(), -1);   // per wire: the first unit found reading it
    for (std::size_t i = 0; i < outs_.size(); ++i) {
        int unit = unitOf(i);
        if (unit < 0) continue;
        NodeId v = literalVar(net_.outputs()[i].driver);
        coneOf(v, definer_[v] == static_cast<int>(i), [&](NodeId w) {
            if (wireOwner[w] < 0) wireOwner[w] = unit;
            else uf.unite(wireOwner[w], unit);
        }, [](NodeId) {}, [](const std::string&) {});
    }
    // Wires used by wires belong with their users.
    for (auto it = wires_.rbegin(); it != wires_.rend(); ++it) {
        NodeId w = *it;
        const int own = wireOwner[w];
        if (own < 0) continue;
        coneOf(w, true, [&](NodeId x) {
            if (wireOwner[x] < 0) wireOwner[x] = own;
            else uf.unite(wireOwner[x], own);
        }, [](NodeId) {}, [](const std::string&) {});
    }
    // A word operation is written in its group's wire block (or as the statement of the
    // author's signal that is exactly its result), so it joins the units that read its result:
    // statements and wires naming the result, operations taking it as an operand. A repeated
    // operation is read under the first one's name. Statements that only feed an operation
    // (write a signal it reads by name) stay apart: they keep their names either way.
    if (O > 0) {
        std::map<std::string, std::size_t> opOfResult;   // result as written -> operation
        for (std::size_t k = 0; k < O; ++k) {
            const auto& w = low_.wordOps[k];
            opOfResult.emplace(w.result, k);
            opOfResult.emplace(verilogName(w.result), k);
        }
        for (std::size_t k = 0; k < O; ++k) {
            const auto& w = low_.wordOps[k];
            if (auto same = sameAs_.find(w.result); same != sameAs_.end())
                if (auto f = opOfResult.find(same->second); f != opOfResult.end()) uf.unite(opUnit(k), opUnit(f->second));
            for (const auto& o : w.operands)
                if (!o.generated)
                    if (auto f = opOfResult.find(o.name); f != opOfResult.end()) uf.unite(opUnit(k), opUnit(f->second));
            if (auto named = resultName_.find(w.result); named != resultName_.end())
                for (std::size_t i = 0; i < outs_.size(); ++i)
                    if (!outs_[i].generated && outs_[i].bit.signal == named->second) uf.unite(opUnit(k), unitOf(i));
        }
        std::vector<std::string> names;
        auto uniteReaders = [&](int unit) {
            for (const auto& n : names)
                if (auto f = opOfResult.find(n); f != opOfResult.end()) uf.unite(unit, opUnit(f->second));
        };
        for (std::size_t i = 0; i < outs_.size(); ++i) {
            int unit = unitOf(i);
            if (unit < 0) continue;
            names.clear();
            namesRead(i, [&](const std::string& n) { names.push_back(n); });
            uniteReaders(unit);
        }
        for (NodeId w : wires_) {
            if (wireOwner[w] < 0) continue;
            names.clear();
            coneOf(w, true, [](NodeId) {}, [](NodeId) {}, [&](const std::string& n) { names.push_back(n); });
            uniteReaders(wireOwner[w]);
        }
    }
    if (oneGroup_)
        for (std::size_t u = 1; u < S + O; ++u) uf.unite(static_cast<int>(u), 0);
    // Groups in source order of their first statement.
    std::map<int, int> groupOfRoot;
    groups_.clear();
    groupStmts_.clear();
    groupOfStmt_.clear();
    for (std::size_t s = 0; s < S; ++s) {
        int r = uf.find(static_cast<int>(s));
        auto [it, fresh] = groupOfRoot.emplace(r, static_cast<int>(groups_.size()));
        if (fresh) {
            groups_.emplace_back();
            groupStmts_.emplace_back();
        }
        groupStmts_[it->second].push_back(stmts_[s]);
        groupOfStmt_[stmts_[s]] = it->second;
    }
    auto groupOfUnit = [&](int unit) {
        auto it = groupOfRoot.find(uf.find(unit));
        return it == groupOfRoot.end() ? -1 : it->second;
    };
    opGroup_.assign(O, -1);
    std::vector<std::uint8_t> hasOps(groups_.size(), 0);
    for (std::size_t k = 0; k < O; ++k) {
        opGroup_[k] = groupOfUnit(opUnit(k));
        if (opGroup_[k] >= 0) hasOps[static_cast<std::size_t>(opGroup_[k])] = 1;
    }
    wireGroup_.assign(net_.nodeCount(), -1);
    groupWires_.assign(groups_.size(), {});
    for (NodeId w : wires_) {
        if (wireOwner[w] < 0) continue;
        int g = groupOfUnit(wireOwner[w]);
        if (g < 0) continue;
        wireGroup_[w] = g;
        groupWires_[static_cast<std::size_t>(g)].push_back(w);
    }
    // Where each group's wires go: before its first statement that needs them.
    groupPos_.assign(groups_.size(), std::string::npos);
    for (std::size_t g = 0; g < groups_.size(); ++g) {
        for (int s : groupStmts_[g]) {
            // A group with word operations: they are declared before its first statement.
            bool uses = oneGroup_ || hasOps[g];
            if (!uses)
                for (std::size_t i = 0; i < outs_.size() && !uses; ++i) {
                    if (outs_[i].stmt != s) continue;
                    NodeId v = literalVar(net_.outputs()[i].driver);
                    coneOf(v, definer_[v] == static_cast<int>(i), [&](NodeId) { uses = true; }, [](NodeId) {},
                           [](const std::string&) {});
                }
            if (!uses) continue;
            const auto* mem = byId_.at(s);
            std::size_t at = mem->netDecl ? mem->src.start : mem->src.start;
            if (mem->netDecl) {
                const auto& sig = m_.signals.at(mem->writes.at(0));
                if (sig.decl) at = sig.decl->stmtStart;
            } else if (mem->src.file == m_.src.file) {
                // Above the author's comment lines on the statement, so they stay with it
                // (kerf's own header of an earlier run aside: it is replaced where it stands).
                const auto& above = mem->comments.above;
                for (auto k = above.size(); k-- > 0;) {
                    if (above[k].second > at || src_.compare(above[k].first, 8, "// kerf:") == 0) break;
                    at = above[k].first;
                }
            }
            groupPos_[g] = lineStart(src_, at);
            break;
        }
    }
}

void Writer::formFamilies() {
    families_.clear();
    familyOf_.assign(net_.nodeCount(), -1);
    if (wires_.size() < std::max<std::size_t>(opts_.minWireFamily, 2)) return;
    std::map<NodeId, VarRef> before;   // the members' scalar references, should a loop undo them
    const std::size_t cap = std::max<std::size_t>(opts_.maxNameLength, 8);
    std::set<std::string> used = taken_;
    for (NodeId w : wires_) used.insert(refs_[w]->text);
    // Rounds: a family whose bits read another family's bits is found once that one is a
    // vector (its bits then rise together): a chain of families of any depth, each round
    // taking at least one family (kMaxFamilyRounds bounds the work on a huge module).
    for (int round = 0; round < kMaxFamilyRounds; ++round) {
        ExprBuilder eb(refs_, forms_, &reduced_);
        std::vector<NodeId> ids;
        std::vector<PExpr> defs;
        std::vector<int> key;
        for (NodeId w : wires_) {
            if (familyOf_[w] >= 0 || noFamily_.count(w) || wireGroup_[w] < 0) continue;
            ids.push_back(w);
            defs.push_back(eb.definition(w, refs_[w]->inverted));
            key.push_back(wireGroup_[w]);
        }
        std::vector<WireRun> runs = findWireRuns(defs, key, opts_.minWireFamily);
        if (runs.empty()) break;
        for (const auto& run : runs) {
            const int n = static_cast<int>(run.members.size());
            std::string stem = familyStem(run.shape);
            if (stem.empty() || stem.size() > cap) {
                // The members' names without their bit index (`q_t3` .. `q_t5`: `q_t`).
                std::string common = refs_[ids[run.members[0]]]->text;
                for (std::size_t j : run.members) {
                    const std::string& t = refs_[ids[j]]->text;
                    std::size_t l = 0;
                    while (l < common.size() && l < t.size() && common[l] == t[l]) ++l;
                    common.resize(l);
                }
                if (!opts_.prefix.empty() && common.compare(0, opts_.prefix.size(), opts_.prefix) == 0)
                    common.erase(0, opts_.prefix.size());
                while (!common.empty() && (std::isdigit(static_cast<unsigned char>(common.back())) || common.back() == '_'))
                    common.pop_back();
                // Their terms of one output, as a scalar wire's `_tN` says (`oe0_t0` .. `oe3_t0`: `oe_t`).
                // A one-letter output (`y`, `q`) is a stem too: `y_t`, not a name that says nothing.
                if (!common.empty() && (common.size() < 2 || common.compare(common.size() - 2, 2, "_t") != 0))
                    common += "_t";
                stem = common.size() >= 2 ? common : "bits";
            }
            if (stem.size() > cap) stem.resize(cap);
            while (stem.size() > 1 && stem.back() == '_') stem.pop_back();
            std::string name = opts_.prefix + stem;
            for (int k = 2; used.count(name); ++k) {
                // The suffix fits within the cap too, as a scalar wire's does (nameWires).
                const std::string suffix = fmt::format("_{}", k);
                std::string t = stem.substr(0, cap > suffix.size() ? cap - suffix.size() : 1);
                while (t.size() > 1 && t.back() == '_') t.pop_back();
                name = opts_.prefix + t + suffix;
            }
            used.insert(name);
            Family f;
            f.name = name;
            for (int b = 0; b < n; ++b) {
                NodeId w = ids[run.members[static_cast<std::size_t>(b)]];
                before.emplace(w, *refs_[w]);
                VarRef& r = *refs_[w];
                r.text = fmt::format("{}[{}]", name, b);
                r.signal = name;
                r.offset = b;
                r.width = n;
                r.msb = n - 1;
                r.lsb = 0;
                r.module = nullptr;
                familyOf_[w] = static_cast<int>(families_.size());
                f.members.push_back(w);
            }
            families_.push_back(std::move(f));
        }
    }
    if (families_.empty() || orderFamilies()) return;
    // A family that reads, through other wires, a wire that reads it cannot be declared in
    // one place: its wires stay scalars (and the search runs again without them).
    for (const auto& [w, r] : before) {
        *refs_[w] = r;
        if (familyOf_[w] >= 0) noFamily_.insert(w);
    }
    formFamilies();
}

bool Writer::orderFamilies() {
    // Wires are declared in topological order; a family is declared where its first member
    // stands, so its members move together: a topological order of families and wires,
    // ties broken by the original order. False when the families close a loop.
    const std::size_t W = wires_.size();
    std::map<NodeId, std::size_t> index;
    for (std::size_t k = 0; k < W; ++k) index[wires_[k]] = k;
    auto unitOf = [&](NodeId w) {
        return familyOf_[w] >= 0 ? W + static_cast<std::size_t>(familyOf_[w]) : index.at(w);
    };
    const std::size_t U = W + families_.size();
    std::vector<std::vector<std::size_t>> readers(U);
    std::vector<std::size_t> pending(U, 0), rank(U, SIZE_MAX);
    std::vector<NodeId> deps;
    for (std::size_t k = 0; k < W; ++k) {
        const std::size_t u = unitOf(wires_[k]);
        rank[u] = std::min(rank[u], k);
        deps.clear();
        coneOf(wires_[k], true, [&](NodeId x) { deps.push_back(x); }, [](NodeId) {}, [](const std::string&) {});
        for (NodeId x : deps) {
            const std::size_t d = unitOf(x);
            if (d == u) return false;   // a member reading its own family
            readers[d].push_back(u);
            ++pending[u];
        }
    }
    std::set<std::pair<std::size_t, std::size_t>> ready;   // (rank, unit)
    for (std::size_t u = 0; u < U; ++u)
        if (rank[u] != SIZE_MAX && pending[u] == 0) ready.insert({rank[u], u});
    std::vector<NodeId> order;
    while (!ready.empty()) {
        const std::size_t u = ready.begin()->second;
        ready.erase(ready.begin());
        if (u < W) order.push_back(wires_[u]);
        else
            for (NodeId m : families_[u - W].members) order.push_back(m);
        for (std::size_t r : readers[u])
            if (--pending[r] == 0) ready.insert({rank[r], r});
    }
    if (order.size() != W) return false;
    wires_ = std::move(order);
    return true;
}

std::string Writer::familyText(std::size_t f, const std::string& ind, ExprBuilder& eb) {
    const Family& fam = families_[f];
    const int n = static_cast<int>(fam.members.size());
    std::vector<PExpr> bits;
    for (NodeId w : fam.members) bits.push_back(eb.definition(w, refs_[w]->inverted));
    if (auto T = vectorTemplate(bits))
        return ind + statement(ind, fmt::format("wire [{}:0] {} = ", n - 1, fam.name), *T) + "\n";
    std::string out = ind + fmt::format("wire [{}:0] {};\n", n - 1, fam.name);
    for (int b = 0; b < n; ++b)
        out += ind + statement(ind, fmt::format("assign {}[{}] = ", fam.name, b), bits[static_cast<std::size_t>(b)]) + "\n";
    return out;
}

bool Writer::checkDeclarationOrder() {
    // A name may be used only after its declaration: by wires at their group's
    // position, by a statement at its own position.
    auto withdraw = [&](const std::string& signal) {
        bool any = false;
        for (std::size_t i = 0; i < outs_.size(); ++i)
            if (allowed_[i] && outs_[i].bit.signal == signal) allowed_[i] = 0, any = true;
        return any;
    };
    for (std::size_t g = 0; g < groups_.size(); ++g) {
        if (groupPos_[g] == std::string::npos) continue;
        for (NodeId w : groupWires_[g]) {
            std::string bad;
            coneOf(w, true, [](NodeId) {}, [](NodeId) {}, [&](const std::string& s) {
                if (bad.empty() && m_.signals.count(s) && !isPort(s) && declPos(s) >= groupPos_[g]) bad = s;
            });
            if (!bad.empty() && withdraw(bad)) return false;
        }
    }
    for (std::size_t i = 0; i < outs_.size(); ++i) {
        // An operand's bits are assigned in its group's wire block: they may read a result's
        // signal declared below it (resultName_, F339).
        std::size_t here = std::string::npos;
        if (!outs_[i].generated) here = byId_.at(outs_[i].stmt)->src.start;
        else if (int g = groupOfOut(i); g >= 0 && !lateResultNames_.empty()) here = groupPos_[static_cast<std::size_t>(g)];
        if (here == std::string::npos) continue;
        std::string bad;
        auto check = [&](const std::string& s) {
            if (s == outs_[i].bit.signal) return;
            if (outs_[i].generated && !lateResultNames_.count(s)) return;
            if (bad.empty() && m_.signals.count(s) && !isPort(s) && declPos(s) >= here) bad = s;
        };
        namesRead(i, check);
        if (!bad.empty() && withdraw(bad)) return false;
    }
    return true;
}


bool Writer::checkCycles() {
    // Statements and wires as a graph: a reference to a name points at the
    // statement that writes it. A cycle through statements (a block reading a
    // wire that reads the block's own result) is a loop in the text even when
    // every bit is acyclic; withdraw the name that closes it. Code kept as written is in the
    // graph too (a block kept for an `ifdef` that reads the rewrite's signal closes a loop
    // just the same, F136), except where no path runs from what it reads to what it writes
    // within one evaluation (clocked blocks, initial and final blocks, assertions) and
    // instances, whose paths are not known here. A generate construct counts as a path from
    // everything it reads to everything it writes (F292: a loop through two generate loops
    // drew Verilator's UNOPTFLAT, Verilator flattening them as it does). A loop made only of
    // what the source already had (edges from statements written as they were) is the
    // source's own and is left alone.
    std::map<int, std::size_t> idx;
    for (std::size_t s = 0; s < stmts_.size(); ++s) idx[stmts_[s]] = s;
    const std::size_t S = stmts_.size();
    std::map<NodeId, std::size_t> wid;
    // A family of wires is one vector wire: one node (a loop through two of its bits is a
    // loop in the text, and a lint warning on the vector).
    std::map<int, std::size_t> familyNode;
    std::map<std::size_t, int> familyAt;
    for (NodeId w : wires_) {
        std::size_t id = S + wid.size();
        if (familyOf_[w] >= 0) {
            auto [it, fresh] = familyNode.emplace(familyOf_[w], id);
            id = it->second;
            if (fresh) familyAt[id] = familyOf_[w];
        }
        wid[w] = id;
    }
    // Word operations written in the word block are nodes too: reading a result reads the
    // operation's operands (F26: a block reading `kf_w0 = {out1} >= {out1}` reads out1).
    std::map<std::string, std::size_t> wordNode;   // result name as written -> node
    std::vector<const frontend::WordOp*> wordOfNode;
    for (const auto& w : low_.wordOps) {
        if (sameAs_.count(w.result) || resultName_.count(w.result)) continue;
        wordNode[w.result] = S + wires_.size() + wordOfNode.size();
        wordOfNode.push_back(&w);
    }
    std::map<std::string, std::vector<std::size_t>> keptWriters;   // signal -> kept members writing it
    std::vector<const frontend::Member*> keptOfNode;
    const std::size_t keptBase = S + wires_.size() + wordOfNode.size();
    for (const auto& mem : m_.members) {
        if (mem.kind != frontend::MemberKind::Kept || mem.clocked) continue;
        static const std::set<std::string> noPath = {"initial", "final", "assertion", "instance",
                                                     "excluded_text", "specify", "elaboration_task"};
        if (noPath.count(mem.what)) continue;
        for (const auto& w : mem.writes) keptWriters[w].push_back(keptBase + keptOfNode.size());
        keptOfNode.push_back(&mem);
    }
    struct Edge {
        std::size_t to;
        std::string name;   ///< the name read, where withdrawing it could break the loop
        bool fresh;         ///< a read of the rewrite (false: of a statement written as it was)
    };
    std::vector<std::vector<Edge>> adj(keptBase + keptOfNode.size());
    std::set<std::string> selfRefs;
    std::set<std::string> operandSelfRefs;   // names read by an operand's assignment, written with the operation
    std::set<int> replacedNow;   // members of the groups rewritten this round (filled when needed)
    auto writerOf = [&](const std::string& name) -> long {
        if (auto w = wordNode.find(name); w != wordNode.end()) return static_cast<long>(w->second);
        auto it = unitOfSignal_.find(name);
        return it == unitOfSignal_.end() ? -1 : static_cast<long>(idx.at(it->second));
    };
    // Every statement writing bits of `name` (a signal split between blocks has several).
    auto writersOf = [&](const std::string& name) -> std::vector<long> {
        std::vector<long> out;
        auto it = writersOf_.find(name);
        if (it == writersOf_.end() || wordNode.count(name)) {
            long t = writerOf(name);
            if (t >= 0) out.push_back(t);
        } else {
            for (int st : it->second) out.push_back(static_cast<long>(idx.at(st)));
        }
        if (auto k = keptWriters.find(name); k != keptWriters.end())
            for (std::size_t t : k->second) out.push_back(static_cast<long>(t));
        return out;
    };
    // What an operation reads: its named operands, and the names and wires its generated
    // operands' logic reads. The operation's node is its result's (an author's signal that is
    // exactly the result: that signal's statement).
    for (const auto& w : low_.wordOps) {
        if (sameAs_.count(w.result)) continue;
        long from = resultName_.count(w.result) ? writerOf(resultName_.at(w.result)) : writerOf(w.result);
        if (from < 0) continue;
        // `viaWire`: the name is read by a generated operand's own assignment, a statement apart
        // from the one computing the operation; reading what that statement writes is a loop
        // between the two (F138: `assign kf_w11_b = {3'b000, w2[0] & q0};` beside a block that
        // writes w2 and computes `w2b = ... * kf_w11_b`).
        bool viaWire = false;
        auto edge = [&](const std::string& n) {
            std::string name = n;
            if (auto same = sameAs_.find(name); same != sameAs_.end()) name = same->second;
            if (auto named = resultName_.find(name); named != resultName_.end()) name = named->second;
            for (long t : writersOf(name)) {
                if (t != from) adj[static_cast<std::size_t>(from)].push_back({static_cast<std::size_t>(t), name, true});
                else if (viaWire) operandSelfRefs.insert(name);
            }
        };
        for (const auto& o : w.operands) {
            viaWire = o.generated;
            if (!o.generated) {
                edge(o.name);
                continue;
            }
            for (std::size_t i = 0; i < outs_.size(); ++i) {
                if (!outs_[i].generated || outs_[i].bit.signal != o.name) continue;
                NodeId v = literalVar(net_.outputs()[i].driver);
                namesRead(i, edge);
                coneOf(v, definer_[v] == static_cast<int>(i),
                       [&](NodeId x) { adj[static_cast<std::size_t>(from)].push_back({wid.at(x), "", true}); }, [](NodeId) {},
                       [](const std::string&) {});
            }
        }
    }
    for (std::size_t g = 0; g < groups_.size(); ++g) {
        for (int st : groupStmts_[g]) {
            std::size_t from = idx.at(st);
            if (!groups_[g].replaced) {
                for (int mid : membersOfStmt_.at(st))
                    for (const auto& r : byId_.at(mid)->reads) {
                        for (long t : writersOf(r))
                            if (static_cast<std::size_t>(t) != from) adj[from].push_back({static_cast<std::size_t>(t), "", false});
                    }
                continue;
            }
            // A block orders its assignments so that each bit is assigned before it is read
            // (statementsFor); separate statements (`assign`) reading their own vector's bits
            // would be a loop through the signal.
            // A block reads its own bits only where that changes no lint warning: the signal
            // is a port or the original reads every bit of it (a partly read vector would
            // be reported with other bits unused).
            const bool ordered = byId_.at(st)->kind == frontend::MemberKind::Comb;
            if (ordered && replacedNow.empty())
                for (std::size_t h = 0; h < groups_.size(); ++h)
                    if (groups_[h].replaced)
                        for (int s2 : groupStmts_[h])
                            for (int mid : membersOfStmt_.at(s2)) replacedNow.insert(mid);
            for (std::size_t i = 0; i < outs_.size(); ++i) {
                if (outs_[i].stmt != st) continue;
                NodeId v = literalVar(net_.outputs()[i].driver);
                auto onName = [&](const std::string& n) {
                    if (n == outs_[i].bit.signal && !(ordered && readWhole(n, replacedNow)))
                        selfRefs.insert(n);   // a vector reading its own bits
                    for (long t : writersOf(n))
                        if (static_cast<std::size_t>(t) != from) adj[from].push_back({static_cast<std::size_t>(t), n, true});
                };
                namesRead(i, onName);
                coneOf(v, definer_[v] == static_cast<int>(i), [&](NodeId w) { adj[from].push_back({wid.at(w), "", true}); },
                       [](NodeId) {}, [](const std::string&) {});
            }
        }
    }
    for (NodeId w : wires_) {
        std::size_t from = wid.at(w);
        coneOf(w, true, [&](NodeId x) { adj[from].push_back({wid.at(x), "", true}); }, [](NodeId) {},
               [&](const std::string& n) {
                   for (long t : writersOf(n)) adj[from].push_back({static_cast<std::size_t>(t), n, true});
               });
    }
    for (std::size_t k = 0; k < keptOfNode.size(); ++k) {
        const std::size_t from = keptBase + k;
        for (const auto& r : keptOfNode[k]->reads)
            for (long t : writersOf(r))
                if (static_cast<std::size_t>(t) != from) adj[from].push_back({static_cast<std::size_t>(t), "", false});
    }
    selfRefs.insert(operandSelfRefs.begin(), operandSelfRefs.end());
    if (!selfRefs.empty()) {
        bool any = false;
        for (std::size_t i = 0; i < outs_.size(); ++i)
            if (allowed_[i] && selfRefs.count(outs_[i].bit.signal)) allowed_[i] = 0, any = true;
        if (!any) unorderable_ = true;   // nothing left to withdraw: the groups stay as written (run)
        return !any;
    }
    // Depth-first search for a cycle; remember the edges on the path.
    std::vector<int> state(adj.size(), 0);
    std::vector<std::pair<std::size_t, const Edge*>> path;   // (from, edge) from the root
    std::string culprit;
    bool familyLoop = false;
    std::function<bool(std::size_t)> dfs = [&](std::size_t u) {
        state[u] = 1;
        for (const Edge& e : adj[u]) {
            path.push_back({u, &e});
            if (state[e.to] == 1) {
                // The cycle is the path's tail from e.to. The latest name on it whose
                // statement kerf may still keep as written (a word operation's result is not
                // one: the statement reading it is).
                std::size_t first = path.size();
                while (first > 0 && path[first - 1].first != e.to) --first;
                if (first > 0) --first;
                bool fresh = false;
                for (std::size_t j = first; j < path.size(); ++j) fresh = fresh || path[j].second->fresh;
                if (!fresh) {   // the source's own loop
                    path.pop_back();
                    continue;
                }
                // A loop through a family: its wires are written as scalars again (the names
                // stay; only the vector goes).
                for (std::size_t j = first; j < path.size(); ++j)
                    if (auto f = familyAt.find(path[j].first); f != familyAt.end()) {
                        for (NodeId x : families_[static_cast<std::size_t>(f->second)].members) noFamily_.insert(x);
                        culprit.clear();
                        familyLoop = true;
                        return true;
                    }
                auto withdrawable = [&](const std::string& n) {
                    for (std::size_t i = 0; i < outs_.size(); ++i)
                        if (allowed_[i] && outs_[i].bit.signal == n) return true;
                    return false;
                };
                for (std::size_t j = path.size(); j > first; --j) {
                    const std::string& n = path[j - 1].second->name;
                    if (!n.empty() && withdrawable(n)) { culprit = n; break; }
                }
                return true;
            }
            if (state[e.to] == 0 && dfs(e.to)) return true;
            path.pop_back();
        }
        state[u] = 2;
        return false;
    };
    for (std::size_t u = 0; u < adj.size(); ++u)
        if (state[u] == 0 && dfs(u)) {
            if (familyLoop) {
                ++familiesBroken_;
                return false;
            }
            bool any = false;
            for (std::size_t i = 0; i < outs_.size(); ++i)
                if (allowed_[i] && outs_[i].bit.signal == culprit) allowed_[i] = 0, any = true;
            if (!any) unorderable_ = true;   // nothing left to withdraw: the groups stay as written (run)
            return !any;
        }
    return true;
}

void Writer::decide() {
    const auto& origForms = *origForms_;
    std::vector<std::vector<std::size_t>> outsOf(groups_.size());
    for (std::size_t i = 0; i < outs_.size(); ++i) {
        int g = groupOfOut(i);
        if (g >= 0) outsOf[static_cast<std::size_t>(g)].push_back(i);
    }
    std::vector<int> groupOfOutput(outs_.size(), -1);
    for (std::size_t g = 0; g < groups_.size(); ++g)
        for (std::size_t i : outsOf[g]) groupOfOutput[i] = static_cast<int>(g);
    std::vector<std::uint32_t> wireStamp(net_.nodeCount(), 0);   // wires listed for group g carry g + 1
    std::vector<std::uint32_t> nodeStamp(net_.nodeCount(), 0);   // nodes counted for group g carry g + 1
    // The original's nodes walked for group g, the other groups' outputs and g's own, marked g + 1.
    std::vector<std::uint32_t> origSeen(orig_.nodeCount(), 0), origStop(orig_.nodeCount(), 0),
        origRoot(orig_.nodeCount(), 0), origNamed(orig_.nodeCount(), 0);
    for (std::size_t g = 0; g < groups_.size(); ++g) {
        StatementGroup& G = groups_[g];
        G.members.clear();
        G.lines.clear();
        G.outputs.clear();
        for (int s : groupStmts_[g])
            for (int mid : membersOfStmt_.at(s)) G.members.push_back(mid);
        std::sort(G.members.begin(), G.members.end());
        for (int s : groupStmts_[g]) {
            const auto* mem = byId_.at(s);
            int last = mem->src.line + static_cast<int>(std::count(src_.begin() + static_cast<std::ptrdiff_t>(mem->src.start),
                                                                  src_.begin() + static_cast<std::ptrdiff_t>(mem->src.end), '\n'));
            G.lines.emplace_back(mem->src.line, last);
        }
        std::set<std::string> outNames;
        for (std::size_t i : outsOf[g])
            if (!outs_[i].generated && outNames.insert(outs_[i].bit.signal).second) G.outputs.push_back(outs_[i].bit.signal);
        // After: every node the group's text computes.
        std::vector<NodeId> wires;
        const auto stamp = static_cast<std::uint32_t>(g + 1);
        auto addWire = [&](NodeId w) {
            if (wireStamp[w] != stamp) wireStamp[w] = stamp, wires.push_back(w);
        };
        G.gatesAfter = 0;
        std::size_t litsAfter = 0, litsBefore = 0;
        auto addNode = [&](NodeId x) {
            if (nodeStamp[x] != stamp)
                nodeStamp[x] = stamp, G.gatesAfter += forms_[x].gateCount(), litsAfter += forms_[x].literalCount();
        };
        for (std::size_t i : outsOf[g]) {
            NodeId v = literalVar(net_.outputs()[i].driver);
            coneOf(v, definer_[v] == static_cast<int>(i), addWire, addNode, [](const std::string&) {});
        }
        for (std::size_t q = 0; q < wires.size(); ++q)
            coneOf(wires[q], true, addWire, addNode, [](const std::string&) {});
        // A target written as a choice adds its conditions and each bit's ?: chain.
        for (const auto& [sig, plan] : choices_)
            if (!plan.second.empty() && groupOfOutput[plan.second[0]] == static_cast<int>(g))
                G.gatesAfter += choiceGates(plan.first, static_cast<int>(plan.second.size()));
        // Before: the logic of the group's outputs as read, up to signals other statements compute.
        for (std::size_t i = 0; i < outs_.size(); ++i)
            if (groupOfOutput[i] != static_cast<int>(g)) {
                origStop[literalVar(orig_.outputs()[i].driver)] = stamp;
                if (!outs_[i].generated) origNamed[literalVar(orig_.outputs()[i].driver)] = stamp;
            }
        std::vector<NodeId> work;
        for (std::size_t i : outsOf[g]) work.push_back(literalVar(orig_.outputs()[i].driver));
        // A group's own output counts its logic even where another group computes the same
        // (its text computes it too), except a word operation's operand that is an author's
        // signal of another group: the operation as read names that signal (`a >= sel_b`), and
        // the rewrite names it too, so the logic is that group's, not a gain of this one. So is
        // a plain copy (`assign q[0] = q0_t0;`): its text reads the other group's signal.
        for (std::size_t i : outsOf[g]) {
            NodeId r = literalVar(orig_.outputs()[i].driver);
            if (outs_[i].generated ? origNamed[r] != stamp : !copiesOtherGroup(i, r, groupOfOutput)) origRoot[r] = stamp;
        }
        G.gatesBefore = 0;
        while (!work.empty()) {
            NodeId v = work.back();
            work.pop_back();
            if (!orig_.isLogic(v) || origSeen[v] == stamp) continue;
            origSeen[v] = stamp;
            if (origStop[v] == stamp && origRoot[v] != stamp) continue;
            G.gatesBefore += origForms[v].gateCount();
            litsBefore += origForms[v].literalCount();
            for (const auto& c : orig_.node(v).cover.cubes)
                for (Literal l : c.lits) work.push_back(literalVar(l));
        }
        double gain = static_cast<double>(G.gatesBefore) - static_cast<double>(G.gatesAfter);
        bool enough = opts_.minGain.percent
                          ? gain * 100.0 >= opts_.minGain.value * static_cast<double>(G.gatesBefore)
                          : gain >= opts_.minGain.value;
        // --min-gain 0 rewrites every group that does not grow (for reviewing kerf's output): as
        // many gates in more literals is growing. Such a rewrite only reshuffles (`w = a & (b | c)`
        // split into `w_t0 = b | c; w = a & w_t0;`), and a second run over kerf's own output made
        // such changes (F154). As many literals still counts as not growing: keeping such a group
        // while the others are rewritten can cost the shared logic (foreach_union, 27 -> 36).
        const bool reshuffle = gain == 0 && G.gatesBefore > 0 && litsAfter > litsBefore;
        G.replaced = enough && (gain > 0 || (opts_.minGain.value == 0 && gain >= 0 && !reshuffle));
        const bool noGainRewrite = G.replaced && gain <= 0;   // by --min-gain 0 alone (F340 below)
        // A signal whose statement reads others but whose every bit is a constant
        // (`assign sel = acc & (a[7:3] == 0) & a[3];`, always 0) costs no gates already when
        // read (constants fold as the network is built), so the gain is 0; its text still
        // computes logic that does nothing, which a reviewer wants shown as the constant it is
        // (issue 10: nothing redundant left). The rules below may still keep it (a block of
        // constants, a constant that kept code reads).
        if (!G.replaced && gain >= 0 && !reshuffle) {
            std::map<std::string, bool> folds;   // signal -> every bit the group writes is constant
            for (std::size_t i : outsOf[g]) {
                if (outs_[i].generated || outs_[i].stmt < 0) continue;
                if (byId_.at(outs_[i].stmt)->reads.empty()) continue;
                bool c = literalVar(net_.outputs()[i].driver) == 0;
                auto [it, fresh] = folds.emplace(outs_[i].bit.signal, c);
                if (!fresh) it->second = it->second && c;
            }
            G.replaced = G.foldsToConstant =
                std::any_of(folds.begin(), folds.end(), [](const auto& f) { return f.second; });
        }
        // kerf's own wire reading what an earlier run's rewrite no longer reads (`kf_unused`,
        // below its `// kerf: the restructured logic ...` note) is part of that rewrite: a second
        // run keeps it as written (under --min-gain 0 it came back as a literal beside a new one).
        if (G.replaced && gain <= 0 &&
            std::all_of(groupStmts_[g].begin(), groupStmts_[g].end(), [&](int s) { return ownUnusedWire(s); })) {
            G.replaced = false;
            G.reason = "kerf's own wire reading what an earlier rewrite no longer reads";
        } else if (noGainRewrite && ownOutput_) {
            // --min-gain 0 shows every rewrite that does not grow, for review. On kerf's own
            // output (the module carries an earlier run's header) a rewrite that saves no gate
            // only writes the same logic again in another order or other wires: 34 of 140
            // corpus cases changed on a second run that way (F339, F340). Kept as written, so that
            // kerf on its own output changes nothing unless it finds a gate to save.
            G.replaced = false;
            G.reason = fmt::format("no saving ({} -> {} gates) in text an earlier run of kerf wrote", G.gatesBefore,
                                   G.gatesAfter);
        } else if (G.replaced) G.reason.clear();
        else if (reshuffle && opts_.minGain.value == 0)
            G.reason = fmt::format("no saving ({} -> {} gates, {} -> {} literals)", G.gatesBefore, G.gatesAfter,
                                   litsBefore, litsAfter);
        else if (gain <= 0) G.reason = fmt::format("no saving ({} -> {} gates)", G.gatesBefore, G.gatesAfter);
        else G.reason = fmt::format("saves {:g} gate{} ({} -> {}), less than --min-gain {}", gain, gain == 1 ? "" : "s",
                                    G.gatesBefore, G.gatesAfter, opts_.minGain.str());
        // A block whose rewrite is only constants reads nothing: an `always @(*)` block then
        // never runs (IEEE 1364-2005 9.7.5: it waits for a change of what it reads) and its
        // variables stay x; simulators that run always_comb alike do the same. Kept as written.
        if (G.replaced) {
            std::map<int, bool> constantOnly;   // block statement -> every bit it writes is a constant
            for (std::size_t i : outsOf[g]) {
                int st = outs_[i].stmt;
                if (st < 0 || byId_.at(st)->kind != frontend::MemberKind::Comb) continue;
                bool c = literalVar(net_.outputs()[i].driver) == 0;
                auto [it, fresh] = constantOnly.emplace(st, c);
                if (!fresh) it->second = it->second && c;
            }
            for (const auto& [st, c] : constantOnly)
                if (c) {
                    G.replaced = false;
                    G.reason = "its rewrite would be a block of constants, which reads nothing and so never runs "
                               "as always @(*) (IEEE 1364-2005 9.7.5)";
                    break;
                }
        }
        // A signal the rewrite finds constant (`assign w0 = 2'b00;`, was `assign w0 = &m1[1];`)
        // that code kept as written reads: Verilator then sees that code's comparisons of it as
        // constant (UNSIGNED, CMPCONST), warnings the input did not draw, and a team whose lint
        // is clean would have to explain them in a file kerf only made smaller. The statement
        // stays as written (F169, F184, F323).
        if (G.replaced) {
            std::map<std::string, bool> allConstant;   // signal -> every bit the group writes is constant
            for (std::size_t i : outsOf[g]) {
                if (outs_[i].generated) continue;
                // Constant as written too (`assign w = 2'b00;`): lint saw the same already.
                if (byId_.at(outs_[i].stmt)->reads.empty()) continue;
                bool c = literalVar(net_.outputs()[i].driver) == 0;
                auto [it, fresh] = allConstant.emplace(outs_[i].bit.signal, c);
                if (!fresh) it->second = it->second && c;
            }
            for (const auto& [sig, constant] : allConstant) {
                if (!constant) continue;
                // (A member's id is its position, checked when the description is read.)
                // (Named here: a lambda cannot capture a structured binding before clang 16.)
                const std::string& signal = sig;
                const auto reader = std::find_if(low_.kept.begin(), low_.kept.end(), [&](const auto& k) {
                    if (k.member < 0 || static_cast<std::size_t>(k.member) >= m_.members.size()) return false;
                    const auto& reads = m_.members[static_cast<std::size_t>(k.member)].reads;
                    return std::find(reads.begin(), reads.end(), signal) != reads.end();
                });
                if (reader == low_.kept.end()) continue;
                G.replaced = false;
                G.reason = fmt::format("its rewrite would make '{}' a constant, and code kept as written reads it "
                                       "(line {}): lint would then find that code's comparisons constant",
                                       sig, reader->loc.line);
                break;
            }
        }
        // A loop variable declared in the module (`integer p;` for `for (p = 0; ...)`) that only
        // the replaced block uses would be left declared and unused (Verilator UNUSEDSIGNAL), and
        // its declaration is never deleted: the block stays as written.
        if (G.replaced)
            for (int st : groupStmts_[g]) {
                const auto* mem = byId_.at(st);
                for (frontend::SymbolId l : mem->locals) {
                    if (l >= m_.ir.symbols.size()) continue;
                    const std::string& name = m_.ir.symbols[l].name;
                    auto sit = m_.signals.find(name);
                    if (sit == m_.signals.end() || !sit->second.decl || sit->second.dir != frontend::PortDir::None)
                        continue;
                    bool usedElsewhere = false;
                    for (const auto& other : m_.members) {
                        if (other.id == mem->id) continue;
                        auto names = [&](const std::vector<std::string>& v) {
                            return std::find(v.begin(), v.end(), name) != v.end();
                        };
                        usedElsewhere = usedElsewhere || names(other.reads) || names(other.writes) ||
                                        names(other.mentions);
                    }
                    if (usedElsewhere) continue;
                    G.replaced = false;
                    G.reason = fmt::format("its loop variable '{}' is declared in the module and would be left unused",
                                           name);
                }
            }
    }
    // Groups the text rule keeps (textHeavy) stay as written whatever they save.
    for (std::size_t g = 0; g < groups_.size(); ++g) {
        StatementGroup& G = groups_[g];
        if (!G.replaced) continue;
        for (int s : groupStmts_[g])
            if (auto it = textKept_.find(s); it != textKept_.end()) {
                G.replaced = false;
                G.reason = it->second;
                break;
            }
    }
    keepReaders();
}

constexpr std::string_view kLongText = "its rewrite is long text for what it saves";

bool Writer::textHeavy() {
    if (opts_.maxTextPerGate == 0 || opts_.minGain.value <= 0) return false;
    auto solid = [](std::string_view t) {
        return static_cast<std::size_t>(std::count_if(t.begin(), t.end(), [](char c) {
            return c != ' ' && c != '\t' && c != '\n' && c != '\r';
        }));
    };
    const auto savedConstants = constantsNamed_;
    bool more = false;
    for (std::size_t g = 0; g < groups_.size(); ++g) {
        const StatementGroup& G = groups_[g];
        if (!G.replaced || G.gatesAfter >= G.gatesBefore) continue;
        std::size_t before = 0, after = 0;
        std::set<std::pair<std::size_t, std::size_t>> seen;
        for (int s : groupStmts_[g])
            for (int mid : membersOfStmt_.at(s)) {
                const auto* mem = byId_.at(mid);
                if (mem->src.file != m_.src.file || !seen.insert({mem->src.start, mem->src.end}).second) continue;
                before += solid(std::string_view(src_).substr(mem->src.start, mem->src.end - mem->src.start));
            }
        if (groupPos_[g] != std::string::npos) after += solid(wireBlock(static_cast<int>(g), ""));
        for (int s : groupStmts_[g]) after += solid(statementsFor(s, "", nullptr));
        const std::size_t saved = G.gatesBefore - G.gatesAfter;
        if (before == 0 || after <= 2 * before) continue;
        if (after - before <= opts_.maxTextPerGate * saved) {
            // A choice among bitwise word operations (word_choice.h) stays a choice: kept at any
            // saving.
            std::string choice;
            for (int s : groupStmts_[g])
                for (int mid : membersOfStmt_.at(s))
                    if (choice.empty()) choice = wordChoiceTarget(m_, *byId_.at(mid));
            if (choice.empty()) continue;
            const std::string why = fmt::format(
                "it chooses '{}' among bitwise word operations, and its rewrite is more than twice its "
                "text ({} -> {} characters; docs/guide.md \"Text for gates\")", choice, before, after);
            for (int s : groupStmts_[g]) more = textKept_.emplace(s, why).second || more;
            continue;
        }
        const std::string why = fmt::format(
            "{} ({} -> {} characters for {} gate{}, over {} characters a gate; "
            "docs/guide.md \"Text for gates\")", kLongText,
            before, after, saved, saved == 1 ? "" : "s", opts_.maxTextPerGate);
        for (int s : groupStmts_[g]) more = textKept_.emplace(s, why).second || more;
    }
    constantsNamed_ = savedConstants;
    return more;
}

bool Writer::ownUnusedWire(int stmt) const {
    for (int mid : membersOfStmt_.at(stmt)) {
        const auto* mem = byId_.at(mid);
        if (!mem->netDecl || mem->writes.size() != 1 || mem->writes[0].find("unused") == std::string::npos)
            return false;
        // The note is the comment lines right above the declaration (`wire [95:0] kf_unused = ...`).
        auto sig = m_.signals.find(mem->writes[0]);
        if (sig == m_.signals.end() || !sig->second.decl || mem->src.file != m_.src.file) return false;
        bool noted = false;
        for (std::size_t ls = lineStart(src_, sig->second.decl->stmtStart); ls > 0 && !noted;) {
            std::size_t prev = lineStart(src_, ls - 1), p = prev;
            while (p < ls && (src_[p] == ' ' || src_[p] == '\t')) ++p;
            if (src_.compare(p, 2, "//") != 0) break;
            noted = src_.compare(p, 31, "// kerf: the restructured logic") == 0;
            ls = prev;
        }
        if (!noted) return false;
    }
    return !membersOfStmt_.at(stmt).empty();
}

bool Writer::copiesOtherGroup(std::size_t i, NodeId r, const std::vector<int>& groupOfOutput) {
    if (origDriven_.empty()) {
        origDriven_.resize(orig_.nodeCount());
        for (std::size_t j = 0; j < outs_.size(); ++j)
            if (!outs_[j].generated) origDriven_[literalVar(orig_.outputs()[j].driver)].push_back(j);
    }
    for (std::size_t j : origDriven_[r]) {
        if (j == i || groupOfOutput[j] == groupOfOutput[i]) continue;
        const auto key = std::make_pair(outs_[j].bit.signal, outs_[j].bit.offset);
        for (int mid : membersOfStmt_.at(outs_[i].stmt)) {
            const Reads& m = readsOf(*byId_.at(mid));
            if (m.first.count(key) || m.second.count(key.first)) return true;
        }
    }
    return false;
}

void Writer::keepReaders() {
    // An internal signal that something read before stays read: a rewrite that
    // would leave it declared, driven and unread is kept as written instead.
    std::map<std::string, std::vector<int>> readersOf;   // signal -> groups whose statements read it
    for (std::size_t g = 0; g < groups_.size(); ++g)
        for (int st : groupStmts_[g])
            for (int mid : membersOfStmt_.at(st))
                for (const auto& r : byId_.at(mid)->reads) readersOf[r].push_back(static_cast<int>(g));
    std::set<std::string> keptReads;
    std::set<int> replacedIds(low_.replaced.begin(), low_.replaced.end());
    for (const auto& mem : m_.members)
        if (!replacedIds.count(mem.id)) keptReads.insert(mem.reads.begin(), mem.reads.end());
    // Only signals that stay driven matter (dissolved ones go with their declarations).
    std::set<std::string> driven;
    for (const auto& o : outs_)
        if (!o.generated) driven.insert(o.bit.signal);
    for (bool changed = true; changed;) {
        changed = false;
        std::set<std::string> read = keptReads;
        for (std::size_t g = 0; g < groups_.size(); ++g) {
            if (!groups_[g].replaced) {
                for (int st : groupStmts_[g])
                    for (int mid : membersOfStmt_.at(st))
                        read.insert(byId_.at(mid)->reads.begin(), byId_.at(mid)->reads.end());
                continue;
            }
            auto onName = [&](const std::string& n) { read.insert(n); };
            // The group's statements and its word operations' generated operands (their logic is
            // written in the group's wire block, or inline in the operation).
            for (std::size_t i = 0; i < outs_.size(); ++i) {
                if (groupOfOut(i) != static_cast<int>(g)) continue;
                namesRead(i, onName);
            }
            for (NodeId w : groupWires_[g]) coneOf(w, true, [](NodeId) {}, [](NodeId) {}, onName);
            for (std::size_t k = 0; k < low_.wordOps.size(); ++k)
                if (opGroup_[k] == static_cast<int>(g))
                    for (const auto& o : low_.wordOps[k].operands)
                        if (!o.generated) read.insert(o.name);
        }
        // One reader at a time, the one whose rewrite saves least: kept as written it reads the
        // signal again, and the others may then be rewritten (a table block rewritten while the
        // 0-gain slice `assign rd_en = cw[3];` stays, rather than both kept; F190).
        for (const auto& [sig, groups] : readersOf) {
            if (read.count(sig) || isPort(sig) || !m_.signals.count(sig) || !driven.count(sig)) continue;
            int keep = -1;
            long keepSaving = 0;
            for (int g : groups) {
                const auto& G = groups_[static_cast<std::size_t>(g)];
                if (!G.replaced) continue;
                const long saving = static_cast<long>(G.gatesBefore) - static_cast<long>(G.gatesAfter);
                if (keep < 0 || saving < keepSaving) keep = g, keepSaving = saving;
            }
            if (keep < 0) continue;
            groups_[static_cast<std::size_t>(keep)].replaced = false;
            groups_[static_cast<std::size_t>(keep)].reason = fmt::format("its rewrite would leave '{}' unread", sig);
            changed = true;
            break;
        }
    }
}

// ------------------------------------------------------------------ text

void Writer::namesRead(std::size_t i, const std::function<void(const std::string&)>& onName) {
    NodeId v = literalVar(net_.outputs()[i].driver);
    if (v != 0 && !net_.isLogic(v) && aliasOf_[v] == static_cast<int>(i)) {
        const VarRef& r = inputRefs_[v];
        std::string n = r.signal.empty() ? r.text : r.signal;
        // A signal written as a word operation reads that operation's operands (word block).
        if (n != outs_[i].bit.signal && n != verilogName(outs_[i].bit.signal)) onName(n);
        return;
    }
    // A signal that is exactly a word operation's result is written as the operation: it reads
    // the operation's operands (the loop check and keepReaders take those from the word
    // operations), not its own name.
    for (const auto& [result, sig] : resultName_)
        if (sig == outs_[i].bit.signal) return;
    if (definer_[v] != static_cast<int>(i) && refs_[v] && !isWire_[v])
        onName(refs_[v]->signal.empty() ? refs_[v]->text : refs_[v]->signal);
    coneOf(v, definer_[v] == static_cast<int>(i), [](NodeId) {}, [](NodeId) {}, onName);
}

std::vector<std::string> Writer::unreadBits() {
    // Bits the written text names: every reference of the replaced groups' statements and wires
    // and of the word operations' operands, by (signal, offset); scalars by their name.
    std::set<std::pair<std::string, int>> read;
    std::set<std::string> wholeRead;
    auto record = [&](const VarRef& r) {
        if (!r.signal.empty()) read.insert({r.signal, r.offset});
        else read.insert({r.text, 0});
    };
    std::vector<NodeId> work;
    std::vector<std::uint8_t> expanded(net_.nodeCount(), 0);
    auto expand = [&](NodeId root) {
        work.push_back(root);
        while (!work.empty()) {
            NodeId v = work.back();
            work.pop_back();
            if (expanded[v]) continue;
            expanded[v] = 1;
            std::function<void(const Factored&)> walk = [&](const Factored& f) {
                if (f.kind == Factored::Kind::Lit) {
                    NodeId u = literalVar(f.lit);
                    if (u == 0 || isWire_[u]) return;   // wires: their own definitions are roots
                    if (refs_[u]) record(*refs_[u]);
                    else if (net_.isLogic(u)) work.push_back(u);
                }
                for (const auto& k : f.kids) walk(k);
            };
            walk(forms_[v]);
        }
    };
    for (std::size_t i = 0; i < outs_.size(); ++i) {
        int g = groupOfOut(i);
        if (g < 0 || !groups_[static_cast<std::size_t>(g)].replaced) continue;
        NodeId v = literalVar(net_.outputs()[i].driver);
        if (v == 0) continue;
        if (!net_.isLogic(v) && aliasOf_[v] == static_cast<int>(i)) {
            // An output equal to its own bit (a word operation's result written as the source
            // wrote it: `assign w1 = a - b;`) reads nothing; the bit is not read by it.
            const VarRef& r = inputRefs_[v];
            if (r.signal.empty() || r.signal != outs_[i].bit.signal || r.offset != outs_[i].bit.offset) record(r);
        } else if (definer_[v] == static_cast<int>(i)) expand(v);
        else if (refs_[v] && !isWire_[v]) record(*refs_[v]);
        else if (!refs_[v] && net_.isLogic(v)) expand(v);   // written inline (a withdrawn name's logic)
    }
    for (NodeId w : wires_)
        if (wireGroup_[w] >= 0 && groups_[static_cast<std::size_t>(wireGroup_[w])].replaced) expand(w);
    for (std::size_t k = 0; k < low_.wordOps.size(); ++k)
        if (opWritten(k))
            for (const auto& o : low_.wordOps[k].operands)
                if (!o.generated) wholeRead.insert(o.name);
    // What the replaced statements read and nothing kept reads.
    std::set<std::string> replacedReads, keptReads;
    std::set<int> replacedIds;
    for (std::size_t g = 0; g < groups_.size(); ++g)
        if (groups_[g].replaced)
            for (int st : groupStmts_[g])
                for (int mid : membersOfStmt_.at(st)) {
                    const auto& rd = byId_.at(mid)->reads;
                    replacedIds.insert(mid);
                    replacedReads.insert(rd.begin(), rd.end());
                }
    // What the rest of the module reads, by bit where the text tells (a statement kept as
    // written through its IR, kept code through the reader's static read ranges). Text the
    // current defines leave out is not compiled, so lint does not see its reads.
    std::set<std::pair<std::string, int>> keptBits;
    for (const auto& mem : m_.members)
        if (!replacedIds.count(mem.id) && mem.what != "excluded_text") {
            const Reads& r = readsOf(mem);
            keptBits.insert(r.first.begin(), r.first.end());
            keptReads.insert(r.second.begin(), r.second.end());
        }
    auto keptReadsBit = [&](const std::string& name, int k) { return keptBits.count({name, k}) > 0; };
    // Bits the replaced statements' own text read: only those are listed (a bit the original
    // left unread keeps its lint warning, as in the original).
    std::set<std::pair<std::string, int>> origBits;
    std::set<std::string> origWhole;
    for (int mid : replacedIds) originalReads(m_, *byId_.at(mid), origBits, origWhole);
    std::vector<std::string> out;
    notReadWidth_ = 0;
    std::string origName;   // the author's signal `runs` is listing ("" for kerf's own results)
    auto runs = [&](const std::string& name, int width, bool scalar, const std::function<std::string(int, int)>& text) {
        if (wholeRead.count(name)) return;
        int lo = -1;
        for (int k = 0; k <= width; ++k) {
            bool unread = k < width && !read.count(scalar ? std::make_pair(verilogName(name), 0) : std::make_pair(name, k)) &&
                          (origName.empty() || origWhole.count(origName) || origBits.count({origName, k})) &&
                          (origName.empty() || !keptReadsBit(origName, k));
            if (unread && lo < 0) lo = k;
            if (!unread && lo >= 0) {
                out.push_back(text(lo, k - lo));
                notReadWidth_ += k - lo;
                lo = -1;
            }
        }
    };
    for (const auto& name : replacedReads) {
        origName = name;
        auto it = m_.signals.find(name);
        // A signal the replaced statements write stays read as a whole (keepReaders) unless it
        // is dissolved; bits of it the new text no longer reads (a bit now known constant, read
        // through its value) are listed like any other (Verilator UNUSEDSIGNAL otherwise).
        if (it == m_.signals.end() || keptReads.count(name) ||
            std::find(low_.dissolved.begin(), low_.dissolved.end(), name) != low_.dissolved.end())
            continue;
        const auto& sig = it->second;
        if (sig.dir == frontend::PortDir::Output || sig.dir == frontend::PortDir::Inout) continue;
        bool scalar = !sig.vector && sig.width == 1;
        runs(name, sig.width, scalar, [&](int lo, int n) { return frontend::referenceText(m_, name, lo, n); });
    }
    origName.clear();
    for (std::size_t k = 0; k < low_.wordOps.size(); ++k)
        if (const auto& w = low_.wordOps[k]; opWritten(k))
            if (!sameAs_.count(w.result) && !resultName_.count(w.result)) runs(w.result, w.resultWidth, w.resultWidth == 1, [&](int lo, int n) {
                if (w.resultWidth == 1) return verilogName(w.result);
                return n == 1 ? fmt::format("{}[{}]", w.result, lo) : fmt::format("{}[{}:{}]", w.result, lo + n - 1, lo);
            });
    return out;
}

void Writer::collectRefs(const PExpr& e, std::set<std::string>& out) const {
    if (e.kind == PExpr::Kind::Ref && e.ref) out.insert(e.ref->signal.empty() ? e.ref->text : e.ref->signal);
    for (const auto& k : e.kids) collectRefs(k, out);
}

PExpr Writer::outputExpr(std::size_t i) {
    ExprBuilder eb(refs_, forms_, &reduced_);
    Literal d = net_.outputs()[i].driver;
    NodeId v = literalVar(d);
    if (definer_[v] == static_cast<int>(i)) return eb.definition(v, literalNegated(d));
    if (v != 0 && !net_.isLogic(v) && aliasOf_[v] == static_cast<int>(i)) {
        PExpr e;
        e.kind = PExpr::Kind::Ref;
        e.ref = &inputRefs_[v];
        e.text = inputRefs_[v].text;
        e.neg = literalNegated(d);
        return e;
    }
    return eb.literal(d);
}

void Writer::planChoices() {
    choices_.clear();
    for (const auto& d : domains_) {
        if (!d.assignedNamed || !chosen_.count(d.signal)) continue;
        auto sig = m_.signals.find(d.signal);
        if (sig == m_.signals.end() || sig->second.width != d.width) continue;
        // Every bit an output of one statement, each once.
        std::vector<std::size_t> bits(static_cast<std::size_t>(d.width), outs_.size());
        int stmt = -2;
        bool ok = true;
        for (std::size_t i = 0; i < outs_.size() && ok; ++i) {
            if (outs_[i].generated || outs_[i].bit.signal != d.signal) continue;
            int off = outs_[i].bit.offset;
            if (off < 0 || off >= d.width || bits[static_cast<std::size_t>(off)] != outs_.size()) ok = false;
            else bits[static_cast<std::size_t>(off)] = i;
            if (stmt != -2 && stmt != outs_[i].stmt) ok = false;
            stmt = outs_[i].stmt;
        }
        for (std::size_t i : bits) ok = ok && i < outs_.size();
        // An enum target is written by if/else (see statementsFor): only inside a block.
        if (ok && enumTyped(d.signal)) ok = byId_.at(stmt)->kind == frontend::MemberKind::Comb;
        if (!ok) continue;
        std::vector<Literal> drivers;
        for (std::size_t i : bits) drivers.push_back(net_.outputs()[i].driver);
        auto vc = valueChoice(d, net_, drivers);
        if (!vc) continue;
        // The target's bits lend no name to their logic: the choice reads that logic.
        for (std::size_t i : bits) allowed_[i] = 0;
        choices_.emplace(d.signal, std::pair{std::move(*vc), std::move(bits)});
    }
}

PExpr Writer::choiceExpr(const std::string& signal) {
    const auto& [vc, bits] = choices_.at(signal);
    ExprBuilder eb(refs_, forms_, &reduced_);
    auto name = [&](const ValueChoice::Link& link) {
        PExpr e;
        e.kind = PExpr::Kind::Ref;
        e.text = link.ref;
        for (std::size_t c = 0; c < m_.constants.size(); ++c)
            if (m_.constants[c].ref == link.ref) e.constant = static_cast<int>(c);
        return e;
    };
    PExpr e = name(vc.links.back());
    for (std::size_t i = vc.links.size() - 1; i-- > 0;) {
        const auto& link = vc.links[i];
        PExpr cond;
        cond.kind = PExpr::Kind::And;
        for (const auto& [k, val] : link.cube) {
            Literal l = net_.outputs()[bits[static_cast<std::size_t>(k)]].driver;
            cond.kids.push_back(eb.literal(val ? l : algebra::negateLiteral(l)));
        }
        if (cond.kids.size() == 1) {
            PExpr only = std::move(cond.kids[0]);
            cond = std::move(only);
        }
        PExpr m;
        m.kind = PExpr::Kind::Mux;
        PExpr then = name(link);
        if (cond.neg && e.atomic()) {
            // `~(c) ? A : B` reads as `c ? B : A`; inside a chain the order of the links stays.
            cond.neg = false;
            std::swap(then, e);
        }
        m.kids.push_back(std::move(cond));
        m.kids.push_back(std::move(then));
        m.kids.push_back(std::move(e));
        e = std::move(m);
    }
    return e;
}

std::string Writer::statement(const std::string& ind, const std::string& lead, const PExpr& e) const {
    std::size_t col = ind.size() + lead.size();
    std::string body = layoutText(e, col, opts_.lineLimit, 1);
    collectConstants(e, constantsNamed_);
    // Continuation lines are padded with spaces; keep the statement's own indentation characters.
    std::string out = lead;
    std::size_t pos = 0;
    while (true) {
        std::size_t nl = body.find('\n', pos);
        std::string line = body.substr(pos, nl == std::string::npos ? std::string::npos : nl - pos);
        if (pos == 0) out += line;
        else out += "\n" + ind + line.substr(std::min(ind.size(), line.size()));
        if (nl == std::string::npos) break;
        pos = nl + 1;
    }
    return out + ";";
}

namespace {
/// A bit as the block's statements name it: (vector, offset), or (scalar's text, 0);
/// offset -1 stands for every bit of the signal (a word operation reading it whole).
using BitKey = std::pair<std::string, int>;

struct Assignment {
    std::string lhs;
    PExpr rhs;
    std::string signal;
    std::set<std::string> reads;
    std::set<BitKey> readBits;      ///< every bit the value reads, its own signal's included
    std::vector<BitKey> writeBits;  ///< the bits it assigns
    std::string prefix, suffix;   ///< around the value, for targets that need it (a one-bit enum)
    bool choice = false;          ///< a choice among named values (`rhs` a chain of ?:)
};

BitKey keyOf(const VarRef& r) { return r.signal.empty() ? BitKey{r.text, 0} : BitKey{r.signal, r.offset}; }

/// The bits a printed expression reads: its names, and the slices its comparisons read.
void collectBits(const PExpr& e, std::set<BitKey>& out) {
    if (e.kind == PExpr::Kind::Ref && e.ref) out.insert(keyOf(*e.ref));
    if (e.kind == PExpr::Kind::Compare && !e.sliceSignal.empty())
        for (int k = e.sliceLo; k <= e.sliceHi; ++k) out.insert({e.sliceSignal, k});
    for (const auto& k : e.kids) collectBits(k, out);
}

/// A printed statement (ending in ';') with the assignment's value suffix put before the ';'.
std::string wrapped(const Assignment& a, std::string printed) {
    if (a.suffix.empty() || printed.empty()) return printed;
    printed.pop_back();
    return printed + a.suffix + ";";
}
}

std::string Writer::statementsFor(int stmt, const std::string& ind, std::set<std::string>* refsOut) {
    const auto* mem = byId_.at(stmt);
    // Outputs of the statement, by signal in port order, then internal signals by declaration.
    std::map<std::string, std::vector<std::size_t>> bySignal;
    for (std::size_t i = 0; i < outs_.size(); ++i)
        if (!outs_[i].generated && outs_[i].stmt == stmt) bySignal[outs_[i].bit.signal].push_back(i);
    std::vector<std::string> signals;
    for (auto& [s, v] : bySignal) signals.push_back(s);
    std::stable_sort(signals.begin(), signals.end(), [&](const std::string& a, const std::string& b) {
        int ra = signalRank(a), rb = signalRank(b);
        bool pa = ra >= kRankPort, pb = rb >= kRankPort;
        if (pa != pb) return pa;
        return ra < rb;
    });
    // The block's assignments; the signals in `split` are written bit by bit (those whose
    // vector assignments cannot otherwise be ordered, see below).
    auto build = [&](const std::set<std::string>& split) {
    std::vector<Assignment> as;
    for (const auto& s : signals) {
        auto idx = bySignal[s];
        std::sort(idx.begin(), idx.end(), [&](std::size_t a, std::size_t b) { return outs_[a].bit.offset < outs_[b].bit.offset; });
        const auto& sig = m_.signals.at(s);
        std::vector<PExpr> es;
        for (std::size_t i : idx) es.push_back(outputExpr(i));
        auto writes = [&](Assignment& a, std::size_t from, std::size_t to) {
            for (std::size_t q = from; q <= to; ++q) a.writeBits.push_back(keyOf(refFor(outs_[idx[q]].bit, 0)));
        };
        auto add = [&](std::string lhs, PExpr e, std::size_t q) {
            Assignment a{std::move(lhs), std::move(e), s, {}, {}, {}, {}, {}};
            collectRefs(a.rhs, a.reads);
            collectBits(a.rhs, a.readBits);
            a.reads.erase(s);
            writes(a, q, q);
            as.push_back(std::move(a));
        };
        if (auto ch = choices_.find(s); ch != choices_.end() && idx.size() == ch->second.second.size()) {
            add(verilogName(s), choiceExpr(s), 0);
            writes(as.back(), 1, idx.size() - 1);
            as.back().choice = true;
            continue;
        }
        const frontend::WordOp* op = nullptr;
        for (const auto& w : low_.wordOps)
            if (auto named = resultName_.find(w.result); named != resultName_.end() && named->second == s) op = &w;
        if (op) {
            PExpr e;
            e.kind = PExpr::Kind::Ref;
            e.text = operationText(*op);
            add(verilogName(s), e, 0);
            auto& a = as.back();
            writes(a, 1, idx.size() - 1);
            // What the operation reads: named operands whole, inline operands bit by bit.
            for (const auto& o : op->operands) {
                std::string n = o.name;
                if (auto same = sameAs_.find(n); same != sameAs_.end()) n = same->second;
                if (auto named = resultName_.find(n); named != resultName_.end()) n = named->second;
                if (!o.generated) {
                    a.readBits.insert({n, -1});
                    a.readBits.insert({verilogName(n), 0});
                    continue;
                }
                for (std::size_t i = 0; i < outs_.size(); ++i)
                    if (outs_[i].generated && outs_[i].bit.signal == o.name) collectBits(outputExpr(i), a.readBits);
            }
            continue;
        }
        if (!sig.vector && sig.width == 1) {
            // The front end's target text: a one-bit enum is assigned through its values.
            auto pieces = frontend::targetPieces(m_, s, 0, 1);
            add(pieces.front().lhs, es[0], 0);
            as.back().prefix = pieces.front().valuePrefix;
            as.back().suffix = pieces.front().valueSuffix;
            continue;
        }
        const bool templates = !split.count(s);
        std::size_t k = 0;
        while (k < idx.size()) {
            // Constant bits: one assignment of a sized value (`flags[4:3] = 2'b00;`); a whole
            // vector whose every bit is a constant or one condition (either polarity): one
            // choice between two values (`w2 = sel ? 3'b010 : 3'b001;`). Not an enum target
            // (a value needs its type's name there).
            if (templates && !enumTyped(s)) {
                auto driver = [&](std::size_t q) { return net_.outputs()[idx[q]].driver; };
                std::size_t last = k;
                NodeId cond = 0;
                std::size_t constants = 0;
                for (std::size_t q = k; q < idx.size(); ++q) {
                    if (q > k && outs_[idx[q]].bit.offset != outs_[idx[k]].bit.offset + static_cast<int>(q - k)) break;
                    NodeId v = literalVar(driver(q));
                    if (v != 0 && cond != 0 && v != cond) break;
                    if (v == 0) ++constants;
                    else cond = v;
                    last = q;
                }
                bool whole = outs_[idx[k]].bit.offset == 0 && outs_[idx[last]].bit.offset == sig.width - 1;
                if (cond != 0 && !whole) {
                    // Not the whole vector: only the constant bits from k (`flags[4:3] = 2'b00;`
                    // beside `flags[7:5] = word[30:28];`).
                    cond = 0;
                    constants = 0;
                    std::size_t q = k;
                    while (q < idx.size() && literalVar(driver(q)) == 0 &&
                           outs_[idx[q]].bit.offset == outs_[idx[k]].bit.offset + static_cast<int>(q - k))
                        ++q, ++constants;
                    last = q > k ? q - 1 : k;
                    whole = outs_[idx[k]].bit.offset == 0 && outs_[idx[last]].bit.offset == sig.width - 1;
                }
                const int lo = outs_[idx[k]].bit.offset, hi = outs_[idx[last]].bit.offset;
                if (last > k && (cond == 0 ? constants > 0 : whole)) {
                    std::string lhs;
                    if (whole) {
                        lhs = verilogName(s);
                    } else {
                        auto pieces = frontend::targetPieces(m_, s, lo, hi - lo + 1);
                        if (pieces.size() == 1 && pieces[0].valuePrefix.empty()) lhs = pieces[0].lhs;
                    }
                    if (!lhs.empty()) {
                        // The condition as one of the run's bits defines it, or as it is named.
                        PExpr c;
                        bool flip = false;
                        if (cond != 0) {
                            ExprBuilder eb(refs_, forms_, &reduced_);
                            bool here = false, alias = false;
                            for (std::size_t q = k; q <= last; ++q) {
                                here = here || definer_[cond] == static_cast<int>(idx[q]);
                                alias = alias || (!net_.isLogic(cond) && aliasOf_[cond] == static_cast<int>(idx[q]));
                            }
                            if (alias) {
                                // An input (a word result) the run's bit lends its name to: its own name.
                                c.kind = PExpr::Kind::Ref;
                                c.ref = &inputRefs_[cond];
                                c.text = inputRefs_[cond].text;
                            } else {
                                c = here ? eb.definition(cond, false) : eb.literal(algebra::makeLiteral(cond, false));
                            }
                            // `~(c) ? A : B` reads as `c ? B : A`.
                            if (c.neg) c.neg = false, flip = true;
                            // Never a condition that reads the vector it assigns.
                            std::set<std::string> condReads;
                            collectRefs(c, condReads);
                            std::set<std::pair<std::string, int>> condBits;
                            collectBits(c, condBits);
                            bool self = condReads.count(s) > 0;
                            for (const auto& [n, b] : condBits) self = self || n == s || n == verilogName(s);
                            if (self) lhs.clear();
                        }
                      if (!lhs.empty()) {
                        // The run's value when the condition is `when` (MSB first).
                        auto value = [&](bool when) {
                            std::string bits;
                            for (std::size_t q = last + 1; q-- > k;) {
                                Literal d = driver(q);
                                bool one = literalVar(d) == 0 ? literalNegated(d) : (when != flip) != literalNegated(d);
                                bits += one ? '1' : '0';
                            }
                            PExpr v;
                            v.kind = PExpr::Kind::Ref;
                            v.text = sizedBinary(bits);
                            return v;
                        };
                        PExpr e = value(true);
                        if (cond != 0) {
                            PExpr m;
                            m.kind = PExpr::Kind::Mux;
                            m.kids.push_back(std::move(c));
                            m.kids.push_back(std::move(e));
                            m.kids.push_back(value(false));
                            e = std::move(m);
                        }
                        Assignment a{lhs, std::move(e), s, {}, {}, {}, {}, {}};
                        collectRefs(a.rhs, a.reads);
                        collectBits(a.rhs, a.readBits);
                        a.reads.erase(s);
                        writes(a, k, last);
                        as.push_back(std::move(a));
                        k = last + 1;
                        continue;
                      }
                    }
                }
            }
            // The longest run of consecutive bits from k with a vector template. Runs with
            // a template are closed under shortening (expression.h), so bisect between the
            // shortest run (two bits) and the last consecutive bit: n log n, not cubic.
            std::size_t best = k;
            std::optional<PExpr> bestT;
            std::size_t last = k;
            while (templates && last + 1 < idx.size() &&
                   outs_[idx[last + 1]].bit.offset - outs_[idx[k]].bit.offset == static_cast<int>(last + 1 - k))
                ++last;
            auto runFrom = [&](std::size_t t) { return std::span<const PExpr>(es.data() + k, t + 1 - k); };
            if (last > k) {
                if (auto T = vectorTemplate(runFrom(k + 1))) {
                    std::size_t lo = k + 1, hi = last;   // lo has a template; find the largest that has
                    bestT = std::move(T);
                    while (lo < hi) {
                        std::size_t mid = lo + (hi - lo + 1) / 2;
                        if (auto M = vectorTemplate(runFrom(mid))) {
                            lo = mid;
                            bestT = std::move(M);
                        } else {
                            hi = mid - 1;
                        }
                    }
                    best = lo;   // bestT is lo's template: the last run that had one
                }
            }
            std::string lhs;
            if (bestT) {
                int lo = outs_[idx[k]].bit.offset, hi = outs_[idx[best]].bit.offset;
                if (lo == 0 && hi == sig.width - 1) {
                    lhs = verilogName(s);
                } else {
                    // The range as the declared type names it; a range that needs a value
                    // conversion (a one-bit enum field) is written bit by bit.
                    auto pieces = frontend::targetPieces(m_, s, lo, hi - lo + 1);
                    if (pieces.size() == 1 && pieces[0].valuePrefix.empty()) lhs = pieces[0].lhs;
                    else bestT.reset();
                }
            }
            if (bestT) {
                // Reads of the template are the per-bit reads.
                Assignment a{lhs, *bestT, s, {}, {}, {}, {}, {}};
                for (std::size_t q = k; q <= best; ++q) collectRefs(es[q], a.reads), collectBits(es[q], a.readBits);
                a.reads.erase(s);
                writes(a, k, best);
                as.push_back(std::move(a));
                k = best + 1;
            } else {
                auto pieces = frontend::targetPieces(m_, s, outs_[idx[k]].bit.offset, 1);
                add(pieces.front().lhs, es[k], k);
                as.back().prefix = pieces.front().valuePrefix;
                as.back().suffix = pieces.front().valueSuffix;
                ++k;
            }
        }
    }
    return as;
    };
    std::vector<Assignment> as = build({});
    for (const auto& a : as)
        if (refsOut) refsOut->insert(a.reads.begin(), a.reads.end());
    if (mem->kind == frontend::MemberKind::Comb) {
        // Every bit the block assigns is assigned before any statement of the block reads it
        // (F30: `w0[0] = ... w0[4] ...` before `w0[7:2] = ...` reads the value w0 had before).
        // The names the logic reads follow the network, which has no loop, so bit by bit an
        // order always exists; the signals of an assignment of several bits that reads bits of
        // its own, or of assignments that read each other's bits (a cycle), are written bit by
        // bit instead — only those: every other signal keeps its vector assignments.
        // `stuck` receives the assignments on a cycle when there is no order.
        auto order = [&](const std::vector<Assignment>& list,
                         std::set<std::size_t>& stuck) -> std::optional<std::vector<std::size_t>> {
            std::map<BitKey, std::size_t> writerOfBit;
            std::map<std::string, std::vector<std::size_t>> writersOfSignal;
            for (std::size_t q = 0; q < list.size(); ++q)
                for (const auto& b : list[q].writeBits) {
                    writerOfBit[b] = q;
                    auto& w = writersOfSignal[b.first];
                    if (w.empty() || w.back() != q) w.push_back(q);
                }
            std::vector<std::vector<std::size_t>> users(list.size());
            std::vector<std::size_t> waiting(list.size(), 0);
            for (std::size_t q = 0; q < list.size(); ++q) {
                std::set<std::size_t> deps;
                for (const auto& b : list[q].readBits) {
                    if (b.second < 0) {
                        if (auto w = writersOfSignal.find(b.first); w != writersOfSignal.end())
                            deps.insert(w->second.begin(), w->second.end());
                    } else if (auto w = writerOfBit.find(b); w != writerOfBit.end()) {
                        deps.insert(w->second);
                    }
                }
                if (deps.count(q)) stuck.insert(q);   // reads a bit it assigns itself
                for (std::size_t p : deps) users[p].push_back(q);
                waiting[q] = deps.size();
            }
            // Ready assignments in their written order (deterministic, and the order of a block
            // that reads none of its own bits is unchanged).
            std::set<std::size_t> ready;
            for (std::size_t q = 0; q < list.size(); ++q)
                if (waiting[q] == 0) ready.insert(q);
            std::vector<std::size_t> out;
            while (!ready.empty()) {
                std::size_t q = *ready.begin();
                ready.erase(ready.begin());
                out.push_back(q);
                for (std::size_t u : users[q])
                    if (--waiting[u] == 0) ready.insert(u);
            }
            if (out.size() == list.size() && stuck.empty()) return out;
            // The assignments on a cycle: strongly connected components of more than one
            // (Tarjan's algorithm, iterative; R. E. Tarjan, "Depth-first search and linear graph
            // algorithms", SIAM J. Comput. 1(2), 1972, from memory).
            const std::size_t none = static_cast<std::size_t>(-1);
            std::vector<std::size_t> index(list.size(), none), low(list.size(), 0), comp;
            std::vector<std::uint8_t> onStack(list.size(), 0);
            std::size_t counter = 0;
            for (std::size_t root = 0; root < list.size(); ++root) {
                if (index[root] != none) continue;
                std::vector<std::pair<std::size_t, std::size_t>> dfs{{root, 0}};
                index[root] = low[root] = counter++;
                comp.push_back(root);
                onStack[root] = 1;
                while (!dfs.empty()) {
                    auto& [v, next] = dfs.back();
                    if (next < users[v].size()) {
                        std::size_t w = users[v][next++];
                        if (index[w] == none) {
                            index[w] = low[w] = counter++;
                            comp.push_back(w);
                            onStack[w] = 1;
                            dfs.push_back({w, 0});
                        } else if (onStack[w]) {
                            low[v] = std::min(low[v], index[w]);
                        }
                        continue;
                    }
                    std::size_t done = v;
                    dfs.pop_back();
                    if (!dfs.empty()) low[dfs.back().first] = std::min(low[dfs.back().first], low[done]);
                    if (low[done] != index[done]) continue;
                    std::vector<std::size_t> scc;
                    for (;;) {
                        std::size_t w = comp.back();
                        comp.pop_back();
                        onStack[w] = 0;
                        scc.push_back(w);
                        if (w == done) break;
                    }
                    if (scc.size() > 1) stuck.insert(scc.begin(), scc.end());
                }
            }
            return std::nullopt;
        };
        std::set<std::string> split;
        std::set<std::size_t> stuck;
        auto seq = order(as, stuck);
        while (!seq) {
            // Split the signals on the cycles; when none is left to split, split them all.
            std::size_t before = split.size();
            for (std::size_t q : stuck)
                if (as[q].writeBits.size() > 1) split.insert(as[q].signal);
            if (split.size() == before)
                for (const auto& s : signals) split.insert(s);
            if (split.size() == before) break;
            as = build(split);
            stuck.clear();
            seq = order(as, stuck);
        }
        if (!seq)
            throw Error("writer: the restructured block would read a variable before assigning it", {},
                        ExitCode::Internal);
        std::vector<Assignment> ordered;
        for (std::size_t q : *seq) ordered.push_back(std::move(as[q]));
        std::string unit = ind.find('\t') != std::string::npos ? "\t" : "  ";
        std::string style = mem->style.empty() ? "always_comb" : mem->style;
        std::string out = style == "always_comb" ? "always_comb begin" : "always @(*) begin";
        if (!mem->label.empty()) out += " : " + mem->label;   // scopes and waveforms name it
        for (const auto& a : ordered) {
            if (a.choice && enumTyped(a.signal)) {
                // An enum target chooses by if/else: a ?: of enum values is valid SystemVerilog
                // (IEEE 1800 11.4.11) but Icarus Verilog 11/12 asks for a cast it cannot do.
                collectConstants(a.rhs, constantsNamed_);
                const PExpr* link = &a.rhs;
                std::string lead = "if (";
                while (link->kind == PExpr::Kind::Mux) {
                    std::string tail = ") " + a.lhs + " = " + flatText(link->kids[1]) + ";";
                    std::string body = layoutText(link->kids[0], ind.size() + unit.size() + lead.size(),
                                                  opts_.lineLimit, tail.size());
                    out += "\n" + ind + unit + lead + body + tail;
                    lead = "else if (";
                    link = &link->kids[2];
                }
                out += "\n" + ind + unit + "else " + a.lhs + " = " + flatText(*link) + ";";
                continue;
            }
            out += "\n" + ind + unit + wrapped(a, statement(ind + unit, a.lhs + " = " + a.prefix, a.rhs));
        }
        out += "\n" + ind + "end" + (mem->endLabel && !mem->label.empty() ? " : " + mem->label : "");
        return out;
    }
    if (mem->netDecl) {
        if (as.size() == 1 && (as[0].lhs == verilogName(as[0].signal)))
        {
            // Laid out from the column where ` = ` goes (after `wire name`), so continuation
            // lines keep their operator under the first operand (F140: laid out from the
            // indentation, the operator column fell inside it and was cut off).
            const std::size_t at = mem->src.start - lineStart(src_, mem->src.start);
            const std::string head(at > ind.size() ? at - ind.size() : 0, ' ');
            std::string t = wrapped(as[0], statement(ind, head + " = " + as[0].prefix, as[0].rhs));
            return t.substr(head.size(), t.size() - 1 - head.size());   // the declaration keeps its own ';'
        }
        // Bits one by one: a concatenation, most significant first.
        std::string s = as.empty() ? "" : as[0].signal;
        auto idx = bySignal[s];
        std::sort(idx.begin(), idx.end(), [&](std::size_t a, std::size_t b) { return outs_[a].bit.offset > outs_[b].bit.offset; });
        std::string cat = " = {";
        for (std::size_t q = 0; q < idx.size(); ++q) {
            PExpr e = outputExpr(idx[q]);
            collectConstants(e, constantsNamed_);
            cat += (q ? ", " : "") + flatText(e);
        }
        return cat + "}";
    }
    std::string out;
    for (std::size_t q = 0; q < as.size(); ++q) {
        if (q) out += "\n" + ind;
        out += wrapped(as[q], statement(ind, "assign " + as[q].lhs + " = " + as[q].prefix, as[q].rhs));
    }
    return out;
}

namespace {

/// A constant operand's bits (most significant first) as a sized literal a reviewer reads at
/// once: binary up to 8 bits, hexadecimal above (`32'h1`, `24'hffffff`), never 32 binary digits.
std::string constantText(const std::string& bits) {
    if (bits.size() <= 8) return fmt::format("{}'b{}", bits.size(), bits);
    std::string hex;
    for (std::size_t end = bits.size(); end > 0;) {
        std::size_t begin = end >= 4 ? end - 4 : 0;
        int v = 0;
        for (std::size_t k = begin; k < end; ++k) v = v * 2 + (bits[k] == '1');
        hex.insert(hex.begin(), "0123456789abcdef"[v]);
        end = begin;
    }
    std::size_t first = hex.find_first_not_of('0');
    hex = first == std::string::npos ? "0" : hex.substr(first);
    return fmt::format("{}'h{}", bits.size(), hex);
}

} // namespace

std::optional<std::string> Writer::inlineOperand(const std::map<int, std::size_t>& bits, int width) {
    if (static_cast<int>(bits.size()) != width || width < 1) return std::nullopt;
    struct Piece {
        const VarRef* ref = nullptr;   // null: a constant run, or `expr`
        int lo = 0, n = 0;             // ref: offsets [lo, lo + n); constant: bits in `value` (msb first)
        std::string value;
        std::string expr;              // a complemented name (`~v[11]`), printed as it stands
        bool neg = false;              // ref: the slice read complemented (`~a[7:0]`)
    };
    std::vector<Piece> pieces;   // most significant first
    for (int k = width - 1; k >= 0; --k) {
        auto it = bits.find(k);
        if (it == bits.end()) return std::nullopt;
        PExpr e = outputExpr(it->second);
        if (e.kind == PExpr::Kind::Zero || e.kind == PExpr::Kind::One) {
            char c = (e.kind == PExpr::Kind::One) != e.neg ? '1' : '0';
            if (!pieces.empty() && !pieces.back().ref && pieces.back().expr.empty()) pieces.back().value += c;
            else pieces.push_back({nullptr, 0, 0, std::string(1, c), {}});
            continue;
        }
        if (e.kind != PExpr::Kind::Ref || !e.ref) return std::nullopt;
        const VarRef* r = e.ref;
        if (e.neg && (r->signal.empty() || !r->module)) {
            // One complemented name stays one element (`{3'b000, ~v[11]}`): a bit statement
            // per constant bit of the operand would be padding a reviewer has to read past.
            pieces.push_back({nullptr, 0, 0, {}, flatText(e)});
            continue;
        }
        // Neighbouring bits of one signal, in order and of one polarity, are one slice:
        // `~a[7], ~a[6], ..., ~a[0]` is `~a[7:0]` (or `~a`).
        if (!pieces.empty() && pieces.back().ref && !r->signal.empty() && pieces.back().ref->signal == r->signal &&
            pieces.back().lo == r->offset + 1 && pieces.back().neg == e.neg) {
            pieces.back().lo = r->offset;
            ++pieces.back().n;
            continue;
        }
        pieces.push_back({r, r->offset, 1, {}, {}, e.neg});
    }
    std::vector<std::string> texts;
    for (const auto& p : pieces) {
        if (!p.expr.empty()) {
            texts.push_back(p.expr);
        } else if (!p.ref) {
            texts.push_back(constantText(p.value));
        } else if (p.ref->signal.empty()) {
            texts.push_back(p.ref->text);
        } else if (p.ref->module) {
            std::string t = frontend::referenceText(*p.ref->module, p.ref->signal, p.lo, p.n);
            texts.push_back(p.neg ? "~" + t : t);
        } else {
            auto gw = generatedWidths().find(p.ref->signal);
            // A generated operand's width is in generatedWidths; a family of wires
            // (formFamilies) has its own width in the reference.
            bool whole = p.lo == 0 && (gw != generatedWidths().end() ? gw->second == p.n : p.ref->width == p.n);
            std::string name = verilogName(p.ref->signal);
            texts.push_back(whole ? name
                                  : p.n == 1 ? fmt::format("{}[{}]", name, p.lo)
                                             : fmt::format("{}[{}:{}]", name, p.lo + p.n - 1, p.lo));
        }
    }
    if (texts.size() == 1) {
        // A part select or a constant is unsigned; a whole name might be declared signed.
        const std::string& t = texts[0];
        const Piece& p = pieces[0];
        // A complement is braced: in the operation's wider context `~v` would widen first.
        if (p.neg) return "{" + t + "}";
        bool generated = p.ref && !p.ref->module && !p.ref->signal.empty();
        if (!t.empty() && p.expr.empty() && (generated || t.back() == ']' || t.find('\'') != std::string::npos))
            return t;
        // A complement is braced: in the operation's wider context `~v[11]` would widen first.
        if (!p.expr.empty() || !p.ref) return "{" + t + "}";
        // A whole signal declared unsigned is its name; a signed one (or a struct member, whose
        // signedness the reference does not show) is read unsigned as the source wrote it,
        // `$unsigned(sa)` (IEEE 1800-2017 11.7), never `{sa}` (F123).
        if (p.ref->module) {
            auto s = p.ref->module->signals.find(p.ref->signal);
            if (s != p.ref->module->signals.end() && !s->second.isSigned && p.lo == 0 && p.n == s->second.width &&
                t == verilogName(p.ref->signal))
                return t;
        }
        return "$unsigned(" + t + ")";
    }
    std::string cat = "{";
    for (std::size_t q = 0; q < texts.size(); ++q) cat += (q ? ", " : "") + texts[q];
    return cat + "}";
}

void Writer::inlineOperands() {
    if (inlinedDone_) return;
    inlinedDone_ = true;
    std::map<std::string, std::map<int, std::size_t>> bitsOf;
    for (std::size_t i = 0; i < outs_.size(); ++i)
        if (outs_[i].generated) bitsOf[outs_[i].bit.signal][outs_[i].bit.offset] = i;
    for (const auto& w : low_.wordOps)
        for (const auto& o : w.operands) {
            if (!o.generated || inlined_.count(o.name)) continue;
            if (auto text = inlineOperand(bitsOf[o.name], o.width)) inlined_[o.name] = *text;
        }
}

std::string Writer::operationText(const frontend::WordOp& w, std::size_t breakCol) {
    inlineOperands();
    auto operandText = [&](std::size_t i) {
        auto in = inlined_.find(w.operands[i].name);
        std::string n = in != inlined_.end() ? in->second : verilogName(w.operands[i].name);
        if (in == inlined_.end() && !w.operands[i].generated) {
            // A result read whole under an author's name.
            if (auto named = resultName_.find(w.operands[i].name); named != resultName_.end()) n = verilogName(named->second);
        }
        bool sign = w.isSigned && !(i == 1 && (w.op == "<<" || w.op == ">>" || w.op == "<<<" || w.op == ">>>"));
        // `$signed` of one braced name needs no braces: `$signed(a)`; nor of `$unsigned(a)`.
        if (sign && n.size() > 2 && n.front() == '{' && n.find(',') == std::string::npos && n.find('{', 1) == std::string::npos)
            n = n.substr(1, n.size() - 2);
        static constexpr std::string_view kUnsigned = "$unsigned(";
        if (sign && n.starts_with(kUnsigned) && n.back() == ')') n = n.substr(kUnsigned.size(), n.size() - kUnsigned.size() - 1);
        return sign ? fmt::format("$signed({})", n) : n;
    };
    if (w.unary) return fmt::format("{}{}", w.op, operandText(0));
    std::string a = operandText(0), b = operandText(1);
    std::string flat = fmt::format("{} {} {}", a, w.op, b);
    if (breakCol == 0 || breakCol + flat.size() + 1 <= opts_.lineLimit || breakCol < w.op.size() + 1) return flat;
    return fmt::format("{}\n{}{} {}", a, std::string(breakCol - w.op.size() - 1, ' '), w.op, b);
}

std::string Writer::wireBlock(int g, const std::string& ind) {
    ExprBuilder eb(refs_, forms_, &reduced_);
    std::string out;
    // The word operations of this group (formGroups), with their generated operands.
    auto inGroup = [&](std::size_t k) { return opGroup_[k] == g; };
    bool words = std::any_of(opGroup_.begin(), opGroup_.end(), [&](int h) { return h == g; });
    inlineOperands();
    const auto& inlined = inlined_;
    std::set<std::string> repeatedOperands;   // operands of a repeated operation: not written
    for (const auto& w : low_.wordOps)
        if (sameAs_.count(w.result))
            for (const auto& o : w.operands) repeatedOperands.insert(o.name);
    if (words) {
        for (std::size_t k = 0; k < low_.wordOps.size(); ++k) {
            const auto& w = low_.wordOps[k];
            if (!inGroup(k) || sameAs_.count(w.result)) continue;
            for (const auto& o : w.operands)
                if (o.generated && !inlined.count(o.name))
                    out += ind + (o.width > 1 ? fmt::format("wire [{}:0] {};\n", o.width - 1, o.name)
                                              : fmt::format("wire {};\n", o.name));
            if (!resultName_.count(w.result))
                out += ind + (w.resultWidth > 1 ? fmt::format("wire [{}:0] {};\n", w.resultWidth - 1, w.result)
                                                : fmt::format("wire {};\n", w.result));
        }
    }
    std::set<int> familiesDone;
    for (NodeId w : wires_) {
        if (wireGroup_[w] != g) continue;
        if (familyOf_[w] >= 0) {   // members are consecutive in wires_ (orderFamilies)
            if (familiesDone.insert(familyOf_[w]).second)
                out += familyText(static_cast<std::size_t>(familyOf_[w]), ind, eb);
            continue;
        }
        out += ind + statement(ind, "wire " + refs_[w]->text + " = ", eb.definition(w, refs_[w]->inverted)) + "\n";
    }
    if (words) {
        // An operand with constant bits is one vector assignment when it fits on a line
        // (`assign kf_w0_a = {2'b00, a & b, c};`), not a statement per bit padding it.
        std::map<std::string, std::map<int, std::size_t>> bitsOf;
        for (std::size_t i = 0; i < outs_.size(); ++i)
            if (outs_[i].generated && groupOfOut(i) == g && !inlined.count(outs_[i].bit.signal) &&
                !repeatedOperands.count(outs_[i].bit.signal))
                bitsOf[outs_[i].bit.signal][outs_[i].bit.offset] = i;
        std::set<std::string> asVector;
        for (const auto& [name, bits] : bitsOf) {
            auto gw = generatedWidths().find(name);
            if (gw == generatedWidths().end() || static_cast<int>(bits.size()) != gw->second || gw->second < 2) continue;
            const int width = gw->second;
            std::vector<PExpr> bit(static_cast<std::size_t>(width));   // least significant first
            bool constant = false, logic = false;
            if (bits.begin()->first != 0 || bits.rbegin()->first != width - 1) continue;   // not bits 0..width-1
            for (const auto& [k, i] : bits) {
                bit[static_cast<std::size_t>(k)] = outputExpr(i);
                bool c = bit[static_cast<std::size_t>(k)].kind == PExpr::Kind::Zero ||
                         bit[static_cast<std::size_t>(k)].kind == PExpr::Kind::One;
                constant = constant || c;
                logic = logic || !c;
            }
            if (!logic) continue;
            auto isConst = [&](int k) {
                return bit[static_cast<std::size_t>(k)].kind == PExpr::Kind::Zero ||
                       bit[static_cast<std::size_t>(k)].kind == PExpr::Kind::One;
            };
            // Elements least significant first: runs of constants, and runs of logic bits that
            // share one shape written as one vector expression (vectorTemplate), else bit by bit.
            std::vector<std::string> texts;
            std::vector<PExpr> exprs;
            for (int k = 0; k < width;) {
                int j = k;
                if (isConst(k)) {
                    std::string run;
                    for (; j < width && isConst(j); ++j) {
                        const PExpr& e = bit[static_cast<std::size_t>(j)];
                        run.insert(run.begin(), (e.kind == PExpr::Kind::One) != e.neg ? '1' : '0');
                    }
                    texts.push_back(fmt::format("{}'b{}", run.size(), run));
                    k = j;
                    continue;
                }
                while (j + 1 < width && !isConst(j + 1)) ++j;
                auto runOf = [&](int hi) {
                    return std::span<const PExpr>(bit.data() + k, static_cast<std::size_t>(hi - k + 1));
                };
                int best = k;
                std::optional<PExpr> bestT;
                if (j > k)
                    if (auto T = vectorTemplate(runOf(k + 1))) {   // closed under shortening: bisect
                        int lo = k + 1, hi = j;
                        bestT = std::move(T);
                        while (lo < hi) {
                            int mid = lo + (hi - lo + 1) / 2;
                            if (auto M = vectorTemplate(runOf(mid))) lo = mid, bestT = std::move(M);
                            else hi = mid - 1;
                        }
                        best = lo;
                    }
                PExpr e = bestT ? std::move(*bestT) : bit[static_cast<std::size_t>(k)];
                texts.push_back(flatText(e));
                exprs.push_back(std::move(e));
                k = best + 1;
            }
            // Without constants, only an operand whose bits share one shape is one vector
            // assignment (`{8{en}} & data`); a concatenation of unlike bits reads no better.
            if (!constant && texts.size() != 1) continue;
            std::reverse(texts.begin(), texts.end());
            std::string line = ind + "assign " + verilogName(name) + " = ";
            if (constant) {
                line += "{";
                for (std::size_t q = 0; q < texts.size(); ++q) line += (q ? ", " : "") + texts[q];
                line += "};";
            } else {
                line += texts[0] + ";";
            }
            if (line.size() > opts_.lineLimit) continue;
            for (const auto& e : exprs) collectConstants(e, constantsNamed_);
            out += line + "\n";
            asVector.insert(name);
        }
        for (std::size_t i = 0; i < outs_.size(); ++i)
            if (outs_[i].generated && groupOfOut(i) == g && !inlined.count(outs_[i].bit.signal) &&
                !repeatedOperands.count(outs_[i].bit.signal) && !asVector.count(outs_[i].bit.signal))
                out += ind + statement(ind, "assign " + bitText(m_, outs_[i].bit) + " = ", outputExpr(i)) + "\n";
        for (std::size_t k = 0; k < low_.wordOps.size(); ++k) {
            const auto& w = low_.wordOps[k];
            if (!inGroup(k) || sameAs_.count(w.result) || resultName_.count(w.result)) continue;
            std::string lead = fmt::format("assign {} = ", w.result);
            out += ind + lead + operationText(w, ind.size() + lead.size()) + ";\n";
        }
    }
    return out;
}

bool Writer::plan() {
    chooseNames();
    chooseWires();
    nameWires();
    formGroups();
    formFamilies();
    return checkDeclarationOrder();
}

WriteResult Writer::run() {
    WriteResult res;
    res.file = m_.src.file;
    src_ = io::readFile(m_.src.file);
    std::size_t crlf = 0, lf = 0;
    for (std::size_t i = 0; i < src_.size(); ++i)
        if (src_[i] == '\n') ++lf, crlf += (i > 0 && src_[i - 1] == '\r');
    res.newline = (lf > 0 && crlf * 2 > lf) ? "\r\n" : "\n";
    if (low_.replaced.empty()) {
        res.text = src_;
        return res;
    }
    reduced_ = reducedSignals(m_);
    for (std::size_t ls = lineStart(src_, m_.src.start); ls < m_.src.end && ls < src_.size() && !ownOutput_;) {
        std::size_t le = src_.find('\n', ls);
        le = le == std::string::npos ? src_.size() : le + 1;
        ownOutput_ = oldHeaderLines(src_, ls, le).has_value();
        ls = le;
    }
    indexMembers();
    indexOutputs();
    inputRefs_.assign(net_.nodeCount(), VarRef{});
    aliasOf_.assign(net_.nodeCount(), -1);
    for (std::size_t k = 0; k < net_.inputs().size(); ++k)
        inputRefs_[net_.inputs()[k]] = refFor(low_.inputBits[k], signalRank(low_.inputBits[k].signal));
    planChoices();
    bool settled = false;
    for (std::size_t round = 0; round <= outs_.size() + 1 + familiesBroken_ && !settled; ++round) {
        if (!plan()) continue;
        decide();
        settled = checkCycles();
    }
    // Text for gates: groups whose rewrite is long text for the gates it saves stay as written,
    // and the plan is made again without them (at most once per group: each pass keeps more).
    for (std::size_t pass = 0; settled && !unorderable_ && pass < groups_.size() && textHeavy(); ++pass) {
        settled = false;
        for (std::size_t round = 0; round <= outs_.size() + 1 + familiesBroken_ && !settled; ++round) {
            if (!plan()) continue;
            decide();
            settled = checkCycles();
        }
    }
    if (!settled || unorderable_) {
        // Never a plan that was not checked: every group stays as written, with the reason.
        for (auto& G : groups_)
            if (G.replaced)
                G.replaced = false, G.reason = "kerf could not order the rewritten statements without a loop "
                                               "between them (a limit of the writer), so they stay as written";
    }
    for (const auto& G : groups_) res.groups.push_back(G);
    bool any = std::any_of(groups_.begin(), groups_.end(), [](const StatementGroup& G) { return G.replaced; });
    if (!any) {
        res.text = src_;
        return res;
    }

    // ---- edits
    std::vector<Edit> edits;
    std::size_t firstChange = std::string::npos;
    for (std::size_t g = 0; g < groups_.size(); ++g) {
        if (!groups_[g].replaced) continue;
        if (groupPos_[g] != std::string::npos) {
            std::string block = wireBlock(static_cast<int>(g), indentOf(src_, groupPos_[g]));
            if (!block.empty()) {
                edits.push_back({groupPos_[g], groupPos_[g], block, static_cast<int>(g)});
                firstChange = std::min(firstChange, groupPos_[g]);
            }
        }
        for (int s : groupStmts_[g]) {
            const auto* mem = byId_.at(s);
            std::string ind = indentOf(src_, mem->src.start);
            bool hasOutputs = std::any_of(outs_.begin(), outs_.end(), [&](const Out& o) { return o.stmt == s; });
            if (!hasOutputs) {
                // Its signals were dissolved into other logic (--dissolve-internal).
                std::size_t ls = lineStart(src_, mem->src.start);
                std::size_t le = src_.find('\n', mem->src.end);
                le = le == std::string::npos ? src_.size() : le + 1;
                if (!mem->netDecl && blankBetween(src_, ls, mem->src.start) && blankBetween(src_, mem->src.end, le - 1))
                    edits.push_back({ls, le, "", static_cast<int>(g)});
                else edits.push_back({mem->src.start, mem->src.end, "", static_cast<int>(g)});
                firstChange = std::min(firstChange, lineStart(src_, mem->src.start));
                continue;
            }
            // Other statements writing bits of the same signals: the first one now writes them all.
            // The comments inside all of them are carried into the new text (comments.cpp).
            std::set<std::pair<std::size_t, std::size_t>> done{{mem->src.start, mem->src.end}};
            std::vector<const frontend::Member*> others;
            for (int mid : membersOfStmt_.at(s)) {
                const auto* other = byId_.at(mid);
                if (done.insert({other->src.start, other->src.end}).second) others.push_back(other);
            }
            edits.push_back({mem->src.start, mem->src.end,
                             carryComments(m_, src_, *mem, others, statementsFor(s, ind, nullptr), ind, opts_.lineLimit),
                             static_cast<int>(g)});
            firstChange = std::min(firstChange, lineStart(src_, mem->src.start));
            for (const auto* other : others) {
                std::size_t ls = lineStart(src_, other->src.start);
                std::size_t le = src_.find('\n', other->src.end);
                le = le == std::string::npos ? src_.size() : le + 1;
                if (!other->netDecl && blankBetween(src_, ls, other->src.start) &&
                    blankBetween(src_, other->src.end, le - 1))
                    edits.push_back({ls, le, "", static_cast<int>(g)});
                else edits.push_back({other->src.start, other->src.end, "", static_cast<int>(g)});
            }
        }
    }
    // Declarations of signals that no longer exist: loop counters of replaced blocks, and
    // internal signals dissolved on request.
    std::set<int> replacedStmts;
    for (std::size_t g = 0; g < groups_.size(); ++g)
        if (groups_[g].replaced)
            for (int s : groupStmts_[g]) replacedStmts.insert(s);
    std::map<std::pair<std::size_t, std::size_t>, std::vector<const frontend::Declarator*>> stmts;
    std::set<const frontend::Declarator*> gone;
    // Statements that write a name or use it as a loop counter, by name (one pass).
    std::map<std::string, std::vector<int>> touchers;
    for (int id : low_.replaced) {
        const auto* mem = byId_.at(id);
        for (const auto& w : mem->writes) touchers[w].push_back(id);
        for (frontend::SymbolId l : mem->locals) touchers[m_.ir.symbols[l].name].push_back(id);
    }
    for (const auto& name : low_.dissolved) {
        const auto& s = m_.signals.at(name);
        if (!s.decl || s.decl->file != m_.src.file) continue;
        bool allReplaced = true;
        for (int id : touchers[name])
            if (!replacedStmts.count(stmtOf_.at(id))) allReplaced = false;
        if (allReplaced) gone.insert(&*s.decl);
    }
    for (const auto& [name, s] : m_.signals)
        if (s.decl && s.decl->file == m_.src.file && gone.count(&*s.decl))
            stmts[{s.decl->stmtStart, s.decl->stmtEnd}].push_back(&*s.decl);
    std::map<std::pair<std::size_t, std::size_t>, std::vector<const frontend::Declarator*>> allDecls;
    for (const auto& [name, s] : m_.signals)
        if (s.decl && s.decl->file == m_.src.file && stmts.count({s.decl->stmtStart, s.decl->stmtEnd}))
            allDecls[{s.decl->stmtStart, s.decl->stmtEnd}].push_back(&*s.decl);
    for (auto& [key, decls] : allDecls) {
        std::sort(decls.begin(), decls.end(), [](auto* a, auto* b) { return a->start < b->start; });
        bool allGone = std::all_of(decls.begin(), decls.end(), [&](auto* d) { return gone.count(d) > 0; });
        if (allGone && static_cast<int>(decls.size()) >= decls.front()->count) {
            std::size_t ls = lineStart(src_, key.first);
            std::size_t le = src_.find('\n', key.second);
            le = le == std::string::npos ? src_.size() : le + 1;
            if (blankBetween(src_, ls, key.first) && blankBetween(src_, key.second, le - 1)) edits.push_back({ls, le, ""});
            else edits.push_back({key.first, key.second, ""});
            continue;
        }
        for (std::size_t i = 0; i < decls.size();) {
            if (!gone.count(decls[i])) { ++i; continue; }
            std::size_t j = i;
            while (j < decls.size() && gone.count(decls[j])) ++j;
            if (j < decls.size()) edits.push_back({decls[i]->start, decls[j]->start, ""});
            else if (i > 0) edits.push_back({decls[i - 1]->end, decls[j - 1]->end, ""});
            i = j;
        }
    }
    // A statement rewritten into exactly its own text is no change (kerf run on its own output),
    // and a group all of whose statements come back so is reported as kept: the header, the
    // summary and the report count only groups whose text changes.
    edits.erase(std::remove_if(edits.begin(), edits.end(),
                               [&](const Edit& e) { return e.end > e.start && src_.compare(e.start, e.end - e.start, e.text) == 0; }),
                edits.end());
    {
        std::vector<std::uint8_t> edited(groups_.size(), 0);
        for (const auto& e : edits)
            if (e.group >= 0) edited[static_cast<std::size_t>(e.group)] = 1;
        for (std::size_t g = 0; g < groups_.size(); ++g)
            if (res.groups[g].replaced && !edited[g])
                res.groups[g].replaced = false, res.groups[g].reason = "rewritten into the same text";
    }
    if (edits.empty()) {
        res.text = src_;
        return res;
    }
    for (std::size_t g = 0; g < groups_.size(); ++g) {
        if (!res.groups[g].replaced) continue;
        if (groupPos_[g] != std::string::npos)
            for (NodeId w : groupWires_[g]) {
                const std::string& n = familyOf_[w] >= 0 ? families_[static_cast<std::size_t>(familyOf_[w])].name
                                                         : refs_[w]->text;
                if (familyOf_[w] < 0 || families_[static_cast<std::size_t>(familyOf_[w])].members.front() == w)
                    res.wiresAdded.push_back(n);
            }
        for (std::size_t i = 0; i < outs_.size(); ++i) {
            if (outs_[i].generated || groupOfStmt_.at(outs_[i].stmt) != static_cast<int>(g)) continue;
            NodeId v = literalVar(net_.outputs()[i].driver);
            if (definer_[v] == static_cast<int>(i)) {
                const std::string& sg = outs_[i].bit.signal;
                if (!isPort(sg) && std::find(res.namesKept.begin(), res.namesKept.end(), sg) == res.namesKept.end())
                    res.namesKept.push_back(sg);
            }
        }
    }
    // kerf run on its own output: the header comment of the earlier run (and its note line) goes;
    // the one written below has the figures of this run, so the module has one header.
    for (std::size_t ls = lineStart(src_, m_.src.start); ls < m_.src.end && ls < src_.size();) {
        std::size_t le = src_.find('\n', ls);
        le = le == std::string::npos ? src_.size() : le + 1;
        if (auto h = oldHeaderLines(src_, ls, le)) {
            bool clear = std::none_of(edits.begin(), edits.end(), [&](const Edit& e) {
                return e.start < *h && e.end > ls && !(e.start == e.end && (e.start == ls || e.start == *h));
            });
            if (clear) edits.push_back({ls, *h, ""});
            ls = *h;
            continue;
        }
        ls = le;
    }
    // Bits the function no longer depends on: read by one wire named *unused* just before
    // `endmodule`, so that lint reports no unused signal the original did not have.
    res.notRead = unreadBits();
    // Named constants only the replaced statements named and the new text does not: read by
    // the same wire, so that lint reports no unused parameter the original did not have.
    std::map<std::string, std::string> sizedText;   // constant -> its sized text in a concatenation
    {
        std::set<int> replacedNamed, keptNamed;
        std::set<int> replacedIds;
        for (std::size_t g = 0; g < groups_.size(); ++g)
            if (groups_[g].replaced)
                for (int st : groupStmts_[g])
                    for (int mid : membersOfStmt_.at(st)) replacedIds.insert(mid);
        for (const auto& mem : m_.members)
            (replacedIds.count(mem.id) ? replacedNamed : keptNamed).insert(mem.constants.begin(), mem.constants.end());
        for (int c : replacedNamed) {
            const auto& nc = m_.constants[static_cast<std::size_t>(c)];
            if (keptNamed.count(c) || nc.elsewhere || constantsNamed_.count(c)) continue;
            res.constantsNotNamed.push_back(nc.ref);
            res.notRead.push_back(nc.ref);
            notReadWidth_ += nc.width();
            // An untyped parameter (`localparam DEBUG = 0`) is unsized, which a concatenation
            // does not allow (IEEE 1800 11.4.12); its part-select is sized. The description does
            // not tell it from `localparam int`, so every 32-bit integer constant gets one.
            if (nc.sliceable && nc.width() == 32 && nc.msb == 31 && nc.lsb == 0)
                sizedText[nc.ref] = fmt::format("{}[31:0]", nc.ref);
        }
    }
    if (!res.notRead.empty()) {
        std::size_t endAt = src_.rfind("endmodule", m_.src.end);
        if (endAt == std::string::npos || endAt < m_.src.start)
            throw Error("writer: the module's end was not found", {}, ExitCode::Internal);
        std::set<std::string> used = taken_;
        for (NodeId w : wires_) used.insert(refs_[w]->text);
        for (const auto& f : families_) used.insert(f.name);
        std::string name = opts_.prefix.empty() ? "kf_unused" : opts_.prefix + "unused";
        for (int k = 2; used.count(name); ++k) name = fmt::format("{}{}_{}", opts_.prefix.empty() ? "kf_" : opts_.prefix, "unused", k);
        std::string ind = indentOf(src_, edits.empty() ? endAt : edits.front().start);
        if (ind.empty()) ind = "  ";
        std::string lead = notReadWidth_ == 1 ? fmt::format("wire {} = ", name)
                                              : fmt::format("wire [{}:0] {} = ", notReadWidth_ - 1, name);
        // The concatenation packed on lines within the limit, continuations under its first item.
        std::string cat;
        {
            const std::size_t itemCol = ind.size() + lead.size() + (res.notRead.size() > 1 ? 1 : 0);
            std::size_t col = itemCol;
            for (std::size_t k = res.notRead.size(); k-- > 0;) {
                auto sized = sizedText.find(res.notRead[k]);
                std::string item = res.notRead.size() > 1 && sized != sizedText.end() ? sized->second : res.notRead[k];
                std::size_t need = item.size() + (k ? 1 : 2);   // its comma, or `};`
                if (col > itemCol && col + 1 + need > opts_.lineLimit) {
                    cat += "\n" + std::string(itemCol, ' ');
                    col = itemCol;
                } else if (col > itemCol) {
                    cat += ' ';
                    ++col;
                }
                cat += item + (k ? "," : "");
                col += item.size() + (k ? 1 : 0);
            }
        }
        if (res.notRead.size() > 1) cat = "{" + cat + "}";
        const bool bitsListed = res.notRead.size() > res.constantsNotNamed.size();
        std::string block = (bitsListed
                                 ? ind + "// kerf: the restructured logic does not depend on these bits; they are read here so\n" +
                                       ind + "// that lint reports no unused signal (a name containing 'unused': common practice)\n" +
                                       (res.constantsNotNamed.empty()
                                            ? std::string()
                                            : ind + "// (named constants it no longer compares with are read here too)\n")
                                 : ind + "// kerf: the restructured logic no longer names these constants; they are read here so\n" +
                                       ind + "// that lint reports no unused parameter (a name containing 'unused': common practice)\n") +
                            ind + lead + cat + ";\n";
        edits.push_back({lineStart(src_, endAt), lineStart(src_, endAt), block});
        res.unusedWire = name;
    }
    firstChange = std::string::npos;
    for (const auto& e : edits) firstChange = std::min(firstChange, lineStart(src_, e.start));
    // Header comment above the first change, and the guard of the --param values the
    // replaced statements were specialised for (guard.cpp), right below it.
    std::string header = "// kerf: restructured logic\n";
    std::size_t headerAt = firstChange;
    std::set<int> replacedNow;
    for (const auto& G : res.groups)
        if (G.replaced) replacedNow.insert(G.members.begin(), G.members.end());
    bool sv = m_.src.file.size() > 3 && m_.src.file.compare(m_.src.file.size() - 3, 3, ".sv") == 0;
    std::string guard = parameterGuard(pinnedValues(m_, replacedNow), sv, indentOf(src_, headerAt));
    {
        // kerf run on its own output with the same --param values: the guard is there already
        // (a second one would redefine its block name).
        std::size_t a = guard.find("if ("), b = guard.find('\n', a);
        if (a != std::string::npos && src_.find(guard.substr(a, b - a)) != std::string::npos) guard.clear();
    }
    edits.push_back({headerAt, headerAt, indentOf(src_, headerAt) + header + guard});
    std::stable_sort(edits.begin(), edits.end(), [](const Edit& a, const Edit& b) {
        if (a.start != b.start) return a.start < b.start;
        return (a.start == a.end) > (b.start == b.end);   // insertions before replacements
    });
    // The header goes first among insertions at its position.
    for (std::size_t k = 0; k + 1 < edits.size(); ++k)
        if (edits[k + 1].start == headerAt && edits[k + 1].end == headerAt && edits[k + 1].text.find(header) != std::string::npos &&
            edits[k].start == headerAt && edits[k].end == headerAt)
            std::swap(edits[k], edits[k + 1]);
    std::string text;
    std::size_t pos = 0;
    bool headerDone = false;
    for (const Edit& e : edits) {
        if (e.start < pos) {
            if (e.end <= pos && e.text.empty()) continue;
            throw Error("writer: overlapping edits", {}, ExitCode::Internal);
        }
        text.append(src_, pos, e.start - pos);
        std::string t = e.text;
        if (res.newline != "\n") {
            std::string c;
            for (char ch : t) c += ch == '\n' ? std::string("\r\n") : std::string(1, ch);
            t = c;
        }
        if (!headerDone && e.start == headerAt && e.end == headerAt && e.text.find(header) != std::string::npos) {
            res.headerPos = text.size();
            res.headerLen = t.find('\n') + 1;
            headerDone = true;
        }
        text += t;
        pos = e.end;
    }
    text.append(src_, pos, std::string::npos);
    // The header's length runs to its line end, newline excluded.
    if (headerDone) {
        std::size_t nl = text.find('\n', res.headerPos);
        res.headerLen = nl - res.headerPos;
        if (nl > 0 && text[nl - 1] == '\r') --res.headerLen;
    }
    res.text = std::move(text);
    res.changed = res.text != src_;
    return res;
}
} // namespace

namespace {
WriteResult writeNamed(const WriteInput& in, const WriteOptions& opts, NamingRecord record, std::string log);
} // namespace

WriteResult writeModule(const WriteInput& in, const WriteOptions& opts) {
    // A reduction the source assigns whole stays whole unless its fragments save the margin
    // (reductions.cpp): on a copy of the network, before the names are weighed on it.
    NamingRecord record;
    std::string log;
    std::vector<SourceReduction> reductions = sourceReductions(*in.module);
    if (!reductions.empty()) {
        WrittenFigures base = writtenFigures(*in.network, *in.forms, {});
        ReductionBudget budget;
        budget.depthBound = opts.depthBound >= 0 ? static_cast<std::size_t>(opts.depthBound) : base.depth;
        budget.gateMargin = opts.minGain.gatesOf(base.gates);
        if (opts.minGain.value <= 0) budget.share = 0;
        net::Network net = *in.network;
        std::vector<algebra::Factored> forms = *in.forms;
        if (keepReductionsWhole(reductions, *in.lowered, net, forms, budget, record, &log) > 0) {
            WriteInput copy = in;
            copy.network = &net;
            copy.forms = &forms;
            return writeNamed(copy, opts, std::move(record), std::move(log));
        }
    }
    return writeNamed(in, opts, std::move(record), std::move(log));
}

namespace {
WriteResult writeNamed(const WriteInput& in, const WriteOptions& opts, NamingRecord reductionRecord,
                       std::string reductionLog) {
    auto finish = [&](WriteResult r, NamingRecord rec, std::string log) {
        if (!rec.weighed && reductionRecord.weighed) {
            // Only reductions were weighed: their figures are the record's.
            std::vector<NamingDecision> own = std::move(rec.decisions);
            rec = reductionRecord;
            rec.decisions.clear();
            rec.decisions.insert(rec.decisions.end(), own.begin(), own.end());
        }
        rec.decisions.insert(rec.decisions.begin(), reductionRecord.decisions.begin(), reductionRecord.decisions.end());
        r.naming = std::move(rec);
        r.namingLog = reductionLog + log;
        return r;
    };
    // Registers the source only names are written by their names (named_values.cpp) where
    // that keeps the goal's depth bound and the --min-gain margin of the bitwise form
    // (naming_cost.cpp): on a copy of the network, so the caller's forms stay the engine's.
    std::vector<NamedDomain> domains = opts.names ? namedDomains(*in.module) : std::vector<NamedDomain>{};
    if (!domains.empty()) {
        NamingBudget budget;
        WrittenFigures base = writtenFigures(*in.network, *in.forms, {});
        budget.depthBound = opts.depthBound >= 0 ? static_cast<std::size_t>(opts.depthBound) : base.depth;
        budget.gateMargin = opts.minGain.gatesOf(base.gates);
        std::string log;
        NamingRecord record;
        NamingPlan plan =
            chooseNaming(domains, *in.module, *in.lowered, *in.network, *in.forms, budget, &log, &record);
        if (!plan.empty()) {
            NamedResult named = applyNaming(plan, domains, *in.module, *in.lowered, *in.network, *in.forms);
            WriteInput copy = in;
            copy.network = &named.net;
            copy.forms = &named.forms;
            Writer w(copy, opts);
            w.setDomains(std::move(domains), plan.chosen);
            WriteResult r = w.run();
            r.namedDomains.assign(plan.compared.begin(), plan.compared.end());
            r.namedChoices = w.choicesWritten();
            return finish(std::move(r), std::move(record), std::move(log));
        }
        return finish(Writer(in, opts).run(), std::move(record), std::move(log));
    }
    return finish(Writer(in, opts).run(), NamingRecord{}, std::string());
}
} // namespace

bool keptForText(const StatementGroup& g) { return !g.replaced && g.reason.starts_with(kLongText); }

} // namespace kerf::emit
