// diff.cpp — unified diff of two texts by lines.
//
// Lines are compared after trimming the common head and tail; the middle is
// matched with the greedy shortest-edit-script algorithm of E. W. Myers, "An
// O(ND) difference algorithm and its variations", Algorithmica 1 (1986)
// (from memory), keeping one frontier per edit distance to trace the script
// back. A middle too large for that (more than a few million cells) is shown
// as one replaced block, which is still a correct diff.
#include "kerf/emit/diff.h"

#include <fmt/format.h>

#include <algorithm>
#include <vector>

namespace kerf::emit {

namespace {

std::vector<std::string> splitLines(const std::string& s) {
    std::vector<std::string> out;
    std::size_t pos = 0;
    while (pos < s.size()) {
        std::size_t nl = s.find('\n', pos);
        if (nl == std::string::npos) {
            out.push_back(s.substr(pos));
            break;
        }
        out.push_back(s.substr(pos, nl + 1 - pos));
        pos = nl + 1;
    }
    return out;
}

enum class Op { Same, Del, Add };

/// Edit script of a against b (Myers), or empty optional when too large.
std::vector<Op> script(const std::vector<std::string>& a, std::size_t a0, std::size_t a1,
                       const std::vector<std::string>& b, std::size_t b0, std::size_t b1) {
    const long n = static_cast<long>(a1 - a0), m = static_cast<long>(b1 - b0);
    const long maxD = n + m;
    std::vector<Op> ops;
    if (n == 0 || m == 0 || (n + m) * (n + m) > 40'000'000L) {
        ops.insert(ops.end(), static_cast<std::size_t>(n), Op::Del);
        ops.insert(ops.end(), static_cast<std::size_t>(m), Op::Add);
        return ops;
    }
    const long off = maxD + 1;
    std::vector<long> v(static_cast<std::size_t>(2 * maxD + 3), 0);
    std::vector<std::vector<long>> trace;
    long dFound = -1;
    for (long d = 0; d <= maxD && dFound < 0; ++d) {
        trace.push_back(v);
        for (long k = -d; k <= d; k += 2) {
            long x = (k == -d || (k != d && v[static_cast<std::size_t>(off + k - 1)] < v[static_cast<std::size_t>(off + k + 1)]))
                         ? v[static_cast<std::size_t>(off + k + 1)]
                         : v[static_cast<std::size_t>(off + k - 1)] + 1;
            long y = x - k;
            while (x < n && y < m && a[a0 + static_cast<std::size_t>(x)] == b[b0 + static_cast<std::size_t>(y)]) ++x, ++y;
            v[static_cast<std::size_t>(off + k)] = x;
            if (x >= n && y >= m) {
                dFound = d;
                break;
            }
        }
    }
    // Trace back.
    long x = n, y = m;
    for (long d = dFound; d > 0; --d) {
        const auto& pv = trace[static_cast<std::size_t>(d)];
        long k = x - y;
        long prevK = (k == -d || (k != d && pv[static_cast<std::size_t>(off + k - 1)] < pv[static_cast<std::size_t>(off + k + 1)]))
                         ? k + 1
                         : k - 1;
        long prevX = pv[static_cast<std::size_t>(off + prevK)];
        long prevY = prevX - prevK;
        while (x > prevX && y > prevY) ops.push_back(Op::Same), --x, --y;
        ops.push_back(x == prevX ? Op::Add : Op::Del);
        x = prevX;
        y = prevY;
    }
    while (x > 0 && y > 0) ops.push_back(Op::Same), --x, --y;
    std::reverse(ops.begin(), ops.end());
    return ops;
}

} // namespace

std::string unifiedDiff(const std::string& before, const std::string& after, const std::string& nameBefore,
                        const std::string& nameAfter, int context) {
    if (before == after) return "";
    std::vector<std::string> a = splitLines(before), b = splitLines(after);
    std::size_t head = 0;
    while (head < a.size() && head < b.size() && a[head] == b[head]) ++head;
    std::size_t tail = 0;
    while (tail < a.size() - head && tail < b.size() - head && a[a.size() - 1 - tail] == b[b.size() - 1 - tail]) ++tail;
    std::vector<Op> ops(head, Op::Same);
    std::vector<Op> mid = script(a, head, a.size() - tail, b, head, b.size() - tail);
    ops.insert(ops.end(), mid.begin(), mid.end());
    ops.insert(ops.end(), tail, Op::Same);

    std::string out = fmt::format("--- {}\n+++ {}\n", nameBefore, nameAfter);
    auto line = [](char tag, const std::string& l) {
        std::string s(1, tag);
        s += l;
        if (s.empty() || s.back() != '\n') s += "\n\\ No newline at end of file\n";
        return s;
    };
    // Positions of each op in a and b.
    std::vector<std::size_t> ia(ops.size() + 1), ib(ops.size() + 1);
    for (std::size_t i = 0, x = 0, y = 0; i <= ops.size(); ++i) {
        ia[i] = x, ib[i] = y;
        if (i == ops.size()) break;
        if (ops[i] != Op::Add) ++x;
        if (ops[i] != Op::Del) ++y;
    }
    std::size_t i = 0;
    const std::size_t c = static_cast<std::size_t>(context);
    while (i < ops.size()) {
        if (ops[i] == Op::Same) { ++i; continue; }
        std::size_t start = i >= c ? i - c : 0;
        std::size_t end = i;
        // Extend the hunk while changes are within 2*context of each other.
        while (end < ops.size()) {
            std::size_t j = end;
            while (j < ops.size() && ops[j] != Op::Same) ++j;
            std::size_t k = j;
            while (k < ops.size() && ops[k] == Op::Same) ++k;
            end = j;
            if (k == ops.size() || k - j > 2 * c) break;
            end = k;
        }
        std::size_t stop = std::min(ops.size(), end + c);
        std::size_t na = 0, nb = 0;
        for (std::size_t q = start; q < stop; ++q) {
            if (ops[q] != Op::Add) ++na;
            if (ops[q] != Op::Del) ++nb;
        }
        out += fmt::format("@@ -{},{} +{},{} @@\n", na ? ia[start] + 1 : ia[start], na, nb ? ib[start] + 1 : ib[start], nb);
        for (std::size_t q = start; q < stop; ++q) {
            if (ops[q] == Op::Same) out += line(' ', a[ia[q]]);
            else if (ops[q] == Op::Del) out += line('-', a[ia[q]]);
            else out += line('+', b[ib[q]]);
        }
        i = stop;
    }
    return out;
}

} // namespace kerf::emit
