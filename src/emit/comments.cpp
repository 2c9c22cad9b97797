// comments.cpp — the author's comments inside a replaced statement, carried into its new text.
//
// A replaced statement is cut out by its byte range, and with it every comment inside it: the
// label of a case item (`7'b0110011: begin  // OP`), a note beside one assignment of a block,
// a remark between the terms of a long `assign`. Review practice (common trade practice) is
// that a change never deletes the author's comments. The reader lists each member's comments
// (docs/reader-format.md, `comments.inside`); the rules here put every one of them back:
//  - a comment on the line of an assignment, inside it, or directly above it (only blank space
//    and other comments between) describes that assignment (unless a case label or an `if`
//    starts that line: then it names that choice and goes into the note below): it goes above the new assignment
//    of the same signal (`assign` and net declarations: above the new statement, or inside
//    the declaration as a block comment);
//  - any other (a case item's label, a comment above an `if`, a local variable's assignment,
//    a signal with no assignment of its own in the new text) goes into one note at the start
//    of the block, each after the code of the line it was on or above, so it still says what
//    it described.
// A second run on kerf's own output carries its note as it is (the note's first line is
// recognised and written once), so the text is stable.
#include "comments.h"

#include "kerf/frontend/ir.h"

#include <algorithm>
#include <map>
#include <optional>

namespace kerf::emit {
namespace {

using frontend::ExprKind;
using frontend::StmtKind;

/// An assignment of a replaced block: its byte range and the module signal it writes ("" for
/// a local variable or several signals).
struct AssignSpan {
    std::size_t start, end;
    std::string signal;
};

std::string targetSignal(const frontend::ModuleDesc& m, frontend::ExprId id) {
    const auto& ir = m.ir;
    while (id != frontend::kNoId) {
        const auto& e = ir.expr(id);
        switch (e.kind) {
        case ExprKind::Ref: {
            if (e.a >= ir.symbols.size()) return "";
            const auto& s = ir.symbols[e.a];
            return s.local || s.function >= 0 || !m.signals.count(s.name) ? "" : s.name;
        }
        case ExprKind::Index: case ExprKind::Indexed: case ExprKind::Range: id = e.a; break;
        default: return "";
        }
    }
    return "";
}

std::vector<AssignSpan> assignsOf(const frontend::ModuleDesc& m, const frontend::Member& mem) {
    std::vector<AssignSpan> out;
    const auto& ir = m.ir;
    if (mem.kind == frontend::MemberKind::Assign) {
        out.push_back({mem.src.start, mem.src.end, targetSignal(m, mem.lhs)});
        return out;
    }
    std::vector<frontend::StmtId> work;
    if (mem.body != frontend::kNoId) work.push_back(mem.body);
    while (!work.empty()) {
        frontend::StmtId sid = work.back();
        work.pop_back();
        if (sid == frontend::kNoId || sid >= ir.stmts.size()) continue;
        const auto& st = ir.stmt(sid);
        switch (st.kind) {
        case StmtKind::Block:
            for (std::uint32_t k = 0; k < st.b; ++k) work.push_back(ir.list(st.a)[k]);
            break;
        case StmtKind::Assign:
            if (st.start != frontend::kNoId && st.end != frontend::kNoId)
                out.push_back({st.start, st.end, targetSignal(m, st.a)});
            break;
        case StmtKind::If: work.push_back(st.b); work.push_back(st.c); break;
        case StmtKind::Case:
            for (std::uint32_t k = 0; k < st.c; ++k) work.push_back(ir.caseItems[st.b + k].body);
            work.push_back(st.d);
            break;
        case StmtKind::CaseTable: work.push_back(st.d); break;
        case StmtKind::For:
            for (std::uint32_t k = 0; k < st.e; ++k) work.push_back(ir.list(st.d)[k]);
            work.push_back(st.f);
            break;
        case StmtKind::Empty: break;
        }
    }
    return out;
}

std::size_t lineBegin(const std::string& s, std::size_t pos) {
    std::size_t p = s.rfind('\n', pos == 0 ? 0 : pos - 1);
    return pos == 0 || p == std::string::npos ? 0 : p + 1;
}

std::string trimmed(const std::string& s) {
    std::size_t a = s.find_first_not_of(" \t\r\n");
    if (a == std::string::npos) return "";
    std::size_t b = s.find_last_not_of(" \t\r\n");
    return s.substr(a, b - a + 1);
}

std::string withoutCr(std::string s) {
    s.erase(std::remove(s.begin(), s.end(), '\r'), s.end());
    return s;
}

struct Carried {
    std::size_t at;        ///< byte offset in the source (their order)
    std::string text;      ///< the comment as written, `\r` removed
    std::string code;      ///< the code before it on its line (notes only)
    std::string signal;    ///< attached to this signal's new assignment ("" = note)
};

/// A `//` comment as a block comment, for the inside of a net declaration's initializer.
std::string asBlock(const std::string& c) {
    if (c.rfind("/*", 0) == 0) return c;
    std::string body = c.substr(2);
    for (std::size_t p; (p = body.find("*/")) != std::string::npos;) body.replace(p, 2, "* /");
    return "/*" + body + " */";
}

}  // namespace

std::string carryComments(const frontend::ModuleDesc& m, const std::string& src, const frontend::Member& mem,
                          const std::vector<const frontend::Member*>& removed, const std::string& text,
                          const std::string& ind, std::size_t lineLimit) {
    std::vector<const frontend::Member*> members{&mem};
    members.insert(members.end(), removed.begin(), removed.end());
    std::vector<Carried> carried;
    for (const auto* mb : members) {
        if (mb->src.file != mem.src.file || mb->comments.inside.empty()) continue;
        auto spans = assignsOf(m, *mb);
        const auto& inside = mb->comments.inside;
        bool inNote = false;   // within a run of comment lines that is kerf's own note
        for (std::size_t k = 0; k < inside.size(); ++k) {
            auto [a, b] = inside[k];
            // Only what the edit cuts out: a comment after a net declaration's initializer
            // (before its `;`) stays where it is.
            if (b > src.size() || a >= b || a < mb->src.start || b > mb->src.end) continue;
            Carried c{a, withoutCr(src.substr(a, b - a)), "", ""};
            std::size_t ls = lineBegin(src, a);
            std::string code = trimmed(src.substr(ls, a - ls));
            bool ownLine = code.empty();
            if (!ownLine) inNote = false;
            if (ownLine && c.text == kCarriedNotesIntro) {
                inNote = true;
                continue;
            }
            if (inNote) {
                carried.push_back(c);   // a line of an earlier note, kept as it is
                // The run of comment lines ends where code follows.
                std::size_t p = src.find_first_not_of(" \t\r\n", b);
                if (!(k + 1 < inside.size() && p == inside[k + 1].first)) inNote = false;
                continue;
            }
            if (mb->kind == frontend::MemberKind::Assign) {
                c.signal = spans.empty() ? "" : spans.front().signal;
            } else if (!ownLine) {
                // On the line of an assignment: inside it, or after its end on that line. An
                // assignment that shares its first line with a case item's label or an `if`
                // (`default: seg = 7'h47;  // F`) is one choice of several: the comment names
                // that choice, so it goes into the note with its code (F321).
                for (const auto& s : spans) {
                    if (!((s.start <= a && a < s.end) || (s.end <= a && lineBegin(src, s.end) == ls))) continue;
                    std::size_t sl = lineBegin(src, s.start);
                    c.signal = trimmed(src.substr(sl, s.start - sl)).empty() ? s.signal : "";
                }
            } else {
                // Directly above an assignment: only blank space and comments between.
                std::size_t p = b, q = k + 1;
                for (;;) {
                    p = src.find_first_not_of(" \t\r\n", p);
                    if (p != std::string::npos && q < inside.size() && inside[q].first == p) {
                        p = inside[q++].second;
                        continue;
                    }
                    break;
                }
                for (const auto& s : spans)
                    if (s.start == p) c.signal = s.signal;
                // Not above an assignment: the note shows the code line it was above.
                if (c.signal.empty() && p != std::string::npos && p < mb->src.end) {
                    std::size_t e = src.find('\n', p);
                    code = trimmed(src.substr(p, (e == std::string::npos ? src.size() : e) - p));
                    // Only the code: a comment later on that line is carried on its own.
                    for (const auto& [ca, cb] : inside)
                        if (ca > p && ca < (e == std::string::npos ? src.size() : e)) {
                            code = trimmed(src.substr(p, ca - p));
                            break;
                        }
                }
            }
            if (c.signal.empty()) c.code = code;
            carried.push_back(std::move(c));
        }
    }
    if (carried.empty()) return text;
    std::stable_sort(carried.begin(), carried.end(), [](const Carried& x, const Carried& y) { return x.at < y.at; });

    if (mem.netDecl) {
        // ` = expr`: the declaration keeps its own `;`, so the comments go inside it.
        std::string out = text;
        for (const auto& c : carried) out += " " + asBlock(c.text);
        return out;
    }
    bool block = mem.kind == frontend::MemberKind::Comb;
    std::vector<std::string> lines;
    for (std::size_t p = 0;;) {
        std::size_t n = text.find('\n', p);
        lines.push_back(text.substr(p, n == std::string::npos ? std::string::npos : n - p));
        if (n == std::string::npos) break;
        p = n + 1;
    }
    std::string unit = ind.find('\t') != std::string::npos ? "\t" : "  ";
    std::string inner = block ? ind + unit : ind;
    auto noteLines = [&](const std::string& lead) {
        std::vector<std::string> out;
        bool any = false;
        for (const auto& c : carried) {
            if (!c.signal.empty()) continue;
            if (!any) out.push_back(lead + kCarriedNotesIntro);
            any = true;
            if (c.code.empty()) {
                out.push_back(lead + c.text);
                continue;
            }
            std::string code = c.code;
            // A block comment over several lines starts on its own line after its code.
            if (c.text.find('\n') != std::string::npos) {
                out.push_back(lead + "//   " + code);
                out.push_back(lead + c.text);
                continue;
            }
            std::size_t room = lineLimit > lead.size() + 7 + c.text.size() ? lineLimit - lead.size() - 7 - c.text.size() : 0;
            if (code.size() > room) code = room >= 12 ? code.substr(0, room - 3) + "..." : "";
            out.push_back(lead + "//   " + (code.empty() ? "" : code + "  ") + c.text);
        }
        return out;
    };
    // Where the new text assigns each signal first (a block: its first line that does).
    auto firstLineOf = [&](const std::string& signal) -> std::optional<std::size_t> {
        std::string name = frontend::verilogName(signal);
        for (std::size_t k = block ? 1 : 0; k < lines.size(); ++k) {
            std::string t = trimmed(lines[k]);
            if (!block && t.rfind("assign ", 0) == 0) t = trimmed(t.substr(7));
            if (t.rfind(name + " ", 0) == 0 || t.rfind(name + "[", 0) == 0 || t.rfind(name + "=", 0) == 0) return k;
            if (block && t.find(") " + name + " = ") != std::string::npos) return k;   // an if/else choice
        }
        return std::nullopt;
    };
    std::map<std::size_t, std::vector<std::string>> before;   // line index -> comment lines above it
    for (auto& c : carried) {
        if (c.signal.empty()) continue;
        auto k = firstLineOf(c.signal);
        if (!k) {
            // No assignment of that signal of its own in the new text: a note, with its code.
            std::size_t ls = lineBegin(src, c.at);
            c.code = trimmed(src.substr(ls, c.at - ls));
            c.signal.clear();
            continue;
        }
        std::string lineInd = block ? lines[*k].substr(0, lines[*k].find_first_not_of(" \t")) : ind;
        before[*k].push_back(lineInd + c.text);
    }
    std::vector<std::string> notes = noteLines(block ? inner : ind);
    std::string out;
    auto emit = [&](const std::string& l) { out += (out.empty() ? "" : "\n") + l; };
    if (!block) {
        // Above the statement: the edit starts at its first column, so the first comment line
        // takes that place and the statement moves down, indented as it was.
        std::vector<std::string> above = notes;
        for (auto& [k, ls] : before) above.insert(above.end(), ls.begin(), ls.end());
        std::string head;
        for (const auto& l : above) head += l.substr(std::min(ind.size(), l.size())) + "\n" + ind;
        std::string rest;
        for (std::size_t k = 0; k < lines.size(); ++k) {
            if (k) rest += "\n";
            rest += lines[k];
        }
        return head + rest;
    }
    for (std::size_t k = 0; k < lines.size(); ++k) {
        if (k == 1)
            for (const auto& l : notes) emit(l);
        if (auto it = before.find(k); it != before.end())
            for (const auto& l : it->second) emit(l);
        emit(lines[k]);
    }
    return out;
}

}  // namespace kerf::emit
