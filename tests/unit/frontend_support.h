// frontend_support.h — building reader descriptions (docs/reader-format.md,
// version 3) by hand for the front-end unit tests, and evaluating lowered networks.
#pragma once

#include "kerf/frontend/lower.h"

#include <fmt/format.h>
#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <map>
#include <string>
#include <utility>
#include <vector>

namespace kerf::test {

using json = nlohmann::json;

/// A module description under construction. Expressions and statements are
/// appended to their tables in the order they are made (operands first).
class DescBuilder {
public:
    json types = json::array(), ports = json::array(), signals = json::array(), members = json::array();
    json exprs = json::array(), stmts = json::array();

    static json src(int line) {
        return {{"file", "t.v"}, {"start", line * 10}, {"end", line * 10 + 5}, {"line", line}, {"col", 3}};
    }

    int vec(int width, bool isSigned = false) {
        auto key = std::make_pair(width, isSigned);
        auto it = vecs_.find(key);
        if (it != vecs_.end()) return it->second;
        json t = width == 1 && !isSigned
                     ? json{{"kind", "logic"}, {"width", 1}, {"signed", false}, {"four_state", true}}
                     : json{{"kind", "vector"}, {"width", width}, {"signed", isSigned}, {"four_state", true},
                            {"msb", width - 1}, {"lsb", 0}};
        types.push_back(t);
        int id = static_cast<int>(types.size()) - 1;
        vecs_[key] = id;
        return id;
    }
    int addType(json t) {
        types.push_back(std::move(t));
        return static_cast<int>(types.size()) - 1;
    }

    /// A module signal (a port when `dir` is given); returns its symbol id.
    int sig(const std::string& name, int width, const std::string& dir = "", bool var = false,
            std::vector<std::string> attributes = {}, int type = -1) {
        int id = nextSymbol_++;
        json s = {{"name", name}, {"id", id}, {"kind", var ? "variable" : "net"},
                  {"type", type >= 0 ? type : vec(width)}, {"width", width}, {"signed", false},
                  {"msb", width - 1}, {"lsb", 0}, {"vector", width > 1}, {"port", !dir.empty()},
                  {"decl", dir.empty() ? json{{"file", "t.v"}, {"start", 900 + id}, {"end", 901 + id},
                                              {"stmt_start", 900 + id}, {"stmt_end", 901 + id}, {"count", 1}}
                                       : json(nullptr)},
                  {"src", src(1)}};
        if (!attributes.empty()) s["attributes"] = attributes;
        signals.push_back(s);
        if (!dir.empty())
            ports.push_back({{"name", name}, {"direction", dir}, {"type", s["type"]}, {"width", width},
                             {"signed", false}, {"msb", width - 1}, {"lsb", 0}, {"kind", var ? "variable" : "net"},
                             {"src", src(1)}});
        symbols_[name] = id;
        widths_[name] = width;
        return id;
    }
    /// A local of the member about to be added; returns its symbol id.
    int local(const std::string& name, int width, bool isSigned = false) {
        int id = nextSymbol_++;
        pendingLocals_.push_back({{"name", name}, {"id", id}, {"kind", "variable"}, {"type", vec(width, isSigned)},
                                  {"width", width}, {"signed", isSigned}, {"msb", width - 1}, {"lsb", 0},
                                  {"vector", true}, {"port", false}, {"src", src(1)}, {"decl", nullptr}});
        symbols_[name] = id;
        widths_[name] = width;
        return id;
    }

    int add(json node) {
        exprs.push_back(std::move(node));
        return static_cast<int>(exprs.size()) - 1;
    }
    int ref(const std::string& name) {
        return add(json::array({"ref", vec(widths_.at(name)), -1, -1, symbols_.at(name)}));
    }
    int cnst(const std::string& bits, bool isSigned = false) {
        return add(json::array({"const", vec(static_cast<int>(bits.size()), isSigned), -1, -1, bits}));
    }
    int un(const std::string& op, int a, int w) { return add(json::array({"unary", vec(w), -1, -1, op, a})); }
    int bin(const std::string& op, int a, int b, int w) {
        return add(json::array({"binary", vec(w), -1, -1, op, a, b}));
    }
    int cond(int c, int t, int e, int w) { return add(json::array({"cond", vec(w), -1, -1, c, t, e})); }
    int index(int value, int idx, int msb, int lsb, int w) {
        return add(json::array({"index", vec(w), -1, -1, value, idx, msb, lsb}));
    }
    int range(int value, int left, int right, int msb, int lsb, int w) {
        return add(json::array({"range", vec(w), -1, -1, value, left, right, msb, lsb}));
    }

    int stmt(json s) {
        stmts.push_back(std::move(s));
        return static_cast<int>(stmts.size()) - 1;
    }
    int assign(int lhs, int rhs, int line = 0) {
        return stmt(json::array({"assign", line * 10, line * 10 + 5, lhs, rhs}));
    }
    int block(std::vector<int> items) { return stmt(json::array({"block", -1, -1, items})); }
    int ifs(int c, int t, int e = -1) { return stmt(json::array({"if", -1, -1, c, t, e, "none"})); }
    int caseStmt(int sel, std::vector<std::pair<std::vector<int>, int>> items, int dflt = -1,
                 const std::string& kind = "case", const std::string& check = "none",
                 std::vector<std::string> attrs = {}) {
        json its = json::array();
        for (auto& [xs, body] : items) its.push_back(json::array({xs, body}));
        return stmt(json::array({"case", -1, -1, kind, check, sel, its, dflt, attrs}));
    }

    /// A `case_table` statement: `labels` MSB first, `width` bits each; `counts` labels per item
    /// (empty: one each); per target its values, MSB first per item, '-' where not assigned.
    int caseTable(int sel, int width, const std::string& labels, std::vector<int> counts, std::vector<int> targets,
                  std::vector<std::string> values, int dflt = -1, const std::string& kind = "case",
                  const std::string& check = "none", bool isSigned = false) {
        json t = {{"width", width}, {"signed", isSigned}, {"labels", labels}, {"targets", targets}, {"values", values}};
        if (!counts.empty()) t["counts"] = counts;
        return stmt(json::array({"case_table", -1, -1, kind, check, sel, t, dflt, json::array()}));
    }

    void assignMember(int lhs, int rhs, int line, std::vector<std::string> reads, std::vector<std::string> writes) {
        members.push_back({{"kind", "assign"}, {"id", members.size()}, {"src", src(line)}, {"lhs", lhs},
                           {"rhs", rhs}, {"reads", reads}, {"writes", writes}});
    }
    void combMember(int body, int line, std::vector<std::string> reads, std::vector<std::string> writes) {
        members.push_back({{"kind", "comb"}, {"id", members.size()}, {"src", src(line)}, {"style", "always_comb"},
                           {"locals", pendingLocals_}, {"body", body}, {"reads", reads}, {"writes", writes}});
        pendingLocals_ = json::array();
    }
    void keptMember(int line, std::vector<std::string> reads, std::vector<std::string> writes,
                    json writeRanges = json::object(), std::vector<std::string> mentions = {}) {
        json m = {{"kind", "kept"}, {"id", members.size()}, {"src", src(line)}, {"what", "always_ff"},
                  {"reason", "it is sequential logic (always_ff)"}, {"reads", reads}, {"writes", writes},
                  {"mentions", mentions}};
        if (!writeRanges.empty()) m["write_ranges"] = writeRanges;
        members.push_back(m);
    }

    json build() const {
        json lines = json::array();
        for (int i = 0; i < 200; ++i) lines.push_back(i * 10);
        return {{"format", "kerf-module"}, {"version", 3},
                {"module", {{"name", "t"}, {"src", {{"file", "t.v"}, {"start", 0}, {"end", 1999}, {"line", 1}, {"col", 1}}}}},
                {"files", json::array({{{"path", "t.v"}, {"line_starts", lines}}})},
                {"types", types}, {"ports", ports}, {"signals", signals}, {"members", members},
                {"exprs", exprs}, {"stmts", stmts}};
    }

private:
    std::map<std::pair<int, bool>, int> vecs_;
    std::map<std::string, int> symbols_, widths_;
    json pendingLocals_ = json::array();
    int nextSymbol_ = 0;
};

/// Evaluate output `out` of a network for an assignment of inputs by name (missing inputs are 0).
inline bool evalOutput(const net::Network& n, const std::string& out, const std::map<std::string, bool>& in) {
    std::vector<std::uint64_t> words;
    for (auto id : n.inputs()) {
        auto it = in.find(n.node(id).name);
        words.push_back(it != in.end() && it->second ? ~0ull : 0ull);
    }
    auto vals = net::simulate(n, words);
    for (std::size_t i = 0; i < n.outputs().size(); ++i)
        if (n.outputs()[i].name == out) return vals[i] & 1;
    ADD_FAILURE() << "no output " << out;
    return false;
}

inline bool hasOutput(const net::Network& n, const std::string& out) {
    for (const auto& o : n.outputs())
        if (o.name == out) return true;
    return false;
}

} // namespace kerf::test
