// Tests for kernels and co-kernels (src/algebra/kernels.cpp).
//
// Oracle: the definitions (R. K. Brayton and C. McMullen, ISCAS 1982; G. De
// Micheli, "Synthesis and Optimization of Digital Circuits", 1994, ch. 8 —
// from memory): a kernel of f is a cube-free quotient f / c, c its
// co-kernel; a kernel is of level 0 when it has no kernel but itself and of
// level n when its other kernels reach level n - 1 at most, with one of
// them at n - 1. The brute-force oracle below tries every co-kernel
// candidate: a co-kernel must be the intersection of the cubes of f that
// contain it (otherwise f / c keeps a common cube), so trying the
// intersection of every non-empty subset of cubes finds them all.

#include "algebra_support.h"

#include <gtest/gtest.h>

#include <map>
#include <random>
#include <set>

namespace kerf::algebra {
namespace {

using testing::Vars;
struct CoverLess {
    bool operator()(const Cover& a, const Cover& b) const { return a.cubes < b.cubes; }
};
struct PairLess {
    bool operator()(const std::pair<Cube, Cover>& a, const std::pair<Cube, Cover>& b) const {
        if (a.first != b.first) return a.first < b.first;
        return a.second.cubes < b.second.cubes;
    }
};
using PairSet = std::set<std::pair<Cube, Cover>, PairLess>;   // (co-kernel, kernel)

PairSet bruteKernels(const Cover& f) {
    PairSet out;
    const std::size_t n = f.size();
    std::set<Cube> tried;
    for (std::size_t mask = 1; mask < (std::size_t{1} << n); ++mask) {
        Cube c;
        bool first = true;
        for (std::size_t j = 0; j < n; ++j) {
            if (!(mask >> j & 1)) continue;
            c = first ? f.cubes[j] : cubeIntersection(c, f.cubes[j]);
            first = false;
        }
        if (!tried.insert(c).second) continue;
        Cover k = divideByCube(f, c).quotient;
        if (isCubeFree(k)) out.emplace(c, k);
    }
    return out;
}

int bruteLevel(const Cover& k, std::map<Cover, int, CoverLess>& memo) {
    auto it = memo.find(k);
    if (it != memo.end()) return it->second;
    int level = 0;
    for (const auto& [c, sub] : bruteKernels(k))
        if (!c.empty()) level = std::max(level, 1 + bruteLevel(sub, memo));
    memo.emplace(k, level);
    return level;
}

PairSet asSet(const std::vector<KernelPair>& ks) {
    PairSet s;
    for (const KernelPair& k : ks) s.emplace(k.cokernel, k.kernel);
    return s;
}

std::set<std::pair<std::string, std::string>> named(const Vars& v, const std::vector<KernelPair>& ks) {
    std::set<std::pair<std::string, std::string>> s;
    for (const KernelPair& k : ks) s.emplace(v.str(k.cokernel), v.str(k.kernel));
    return s;
}

// --- Worked examples -------------------------------------------------------

// From memory: De Micheli 1994, ch. 8 illustrates kernels on a cover of this
// shape (two cubes sharing a two-literal cube, a third sharing one literal,
// and a lone cube), giving a chain of kernels of levels 0, 1 and 2. Our own
// variables.
TEST(AlgebraKernels, NestedChainOfKernels) {
    Vars v;
    Cover f = v("p & r & t | q & r & t | s & t | u");
    std::vector<KernelPair> ks = kernels(f);
    EXPECT_EQ(named(v, ks), (std::set<std::pair<std::string, std::string>>{
                                {"1", "p & r & t | r & t & q | t & s | u"},
                                {"t", "p & r | r & q | s"},
                                {"r & t", "p | q"}}));
    std::map<std::string, int> level;
    for (const KernelPair& k : ks) level[v.str(k.cokernel)] = k.level;
    EXPECT_EQ(level["r & t"], 0);
    EXPECT_EQ(level["t"], 1);
    EXPECT_EQ(level["1"], 2);
    // The cover itself comes first.
    EXPECT_TRUE(ks.at(0).cokernel.empty());
}

// Computed from the definition: a product of two sums has each sum as a
// kernel, once per cube of the other sum.
TEST(AlgebraKernels, KernelWithSeveralCoKernels) {
    Vars v;
    Cover f = v("(a | b) & (c | d)");
    EXPECT_EQ(named(v, kernels(f)), (std::set<std::pair<std::string, std::string>>{
                                        {"1", "a & c | a & d | b & c | b & d"},
                                        {"a", "c | d"},
                                        {"b", "c | d"},
                                        {"c", "a | b"},
                                        {"d", "a | b"}}));
}

// Computed from the definition: a common cube multiplies every co-kernel and
// the cover itself is not a kernel.
TEST(AlgebraKernels, CommonCubeMultipliesCoKernels) {
    Vars v;
    Cover f = v("x & y & a & c | x & y & a & d | x & y & b");
    EXPECT_EQ(named(v, kernels(f)), (std::set<std::pair<std::string, std::string>>{
                                        {"x & y", "a & c | a & d | b"},
                                        {"x & y & a", "c | d"}}));
}

TEST(AlgebraKernels, DegenerateCovers) {
    Vars v;
    EXPECT_TRUE(kernels(Cover::zero()).empty());
    EXPECT_TRUE(kernels(v("a & b")).empty());
    EXPECT_TRUE(kernels(v("a & b | a & c & b")).empty() == false);
    // The cube 1 can be part of a kernel: a & b | a = a & (b | 1).
    EXPECT_EQ(named(v, kernels(v("a & b | a"))),
              (std::set<std::pair<std::string, std::string>>{{"a", "1 | b"}}));
    // No literal repeats: the cover is its only kernel, of level 0.
    auto ks = kernels(v("a | b & c | ~a"));
    ASSERT_EQ(ks.size(), 1u);
    EXPECT_EQ(ks[0].level, 0);
}

TEST(AlgebraKernels, LevelZeroOnly) {
    Vars v;
    Cover f = v("p & r & t | q & r & t | s & t | u");
    KernelOptions opts;
    opts.levelZeroOnly = true;
    EXPECT_EQ(named(v, kernels(f, opts)), (std::set<std::pair<std::string, std::string>>{{"r & t", "p | q"}}));
}

TEST(AlgebraKernels, BoundsTruncateAndSaySo) {
    Vars v;
    Cover f = v("(a | b | c) & (d | e | f) & (g | h)");
    KernelStats stats;
    auto all = kernels(f, {}, &stats);
    EXPECT_FALSE(stats.truncated);
    EXPECT_TRUE(stats.levelsExact);
    EXPECT_GT(all.size(), 10u);
    KernelOptions few;
    few.maxKernels = 4;
    auto some = kernels(f, few, &stats);
    EXPECT_EQ(some.size(), 4u);
    EXPECT_TRUE(stats.truncated);
    KernelOptions little;
    little.maxWork = 10;
    auto fewer = kernels(f, little, &stats);
    EXPECT_LT(fewer.size(), all.size());
    EXPECT_TRUE(stats.truncated);
    // A truncated list is a prefix of the full depth-first list.
    for (std::size_t i = 0; i < some.size(); ++i) {
        EXPECT_EQ(some[i].cokernel, all[i].cokernel);
        EXPECT_EQ(some[i].kernel, all[i].kernel);
    }
}

TEST(AlgebraKernels, CheapLevelsOnlySayZeroOrMore) {
    KernelOptions opts;
    opts.computeLevels = false;
    std::map<std::string, int> level;
    Vars w;
    for (const KernelPair& k : kernels(w("p & r & t | q & r & t | s & t | u"), opts))
        level[w.str(k.cokernel)] = k.level;
    EXPECT_EQ(level["r & t"], 0);
    EXPECT_EQ(level["t"], 1);
    EXPECT_EQ(level["1"], 1);
}

TEST(AlgebraKernels, LevelZeroKernelDescendsByMostFrequentLiteral) {
    Vars v;
    // c is the most frequent literal (3 cubes): f / c = a & e | b & e | d,
    // then e (2 cubes): a | b, where no literal repeats.
    KernelPair k = levelZeroKernel(v("a & c & e | b & c & e | c & d | f"));
    EXPECT_EQ(v.str(k.kernel), "a | b");
    EXPECT_EQ(v.str(k.cokernel), "c & e");
    EXPECT_EQ(k.level, 0);
    KernelPair self = levelZeroKernel(v("a | b"));
    EXPECT_EQ(v.str(self.kernel), "a | b");
    EXPECT_TRUE(self.cokernel.empty());
    EXPECT_TRUE(levelZeroKernel(v("a & b")).kernel.isZero());
}

// --- Properties over random covers ----------------------------------------

TEST(AlgebraKernels, MatchBruteForceOnRandomCovers) {
    std::mt19937 rng(1982);
    std::size_t totalPairs = 0;
    for (int iter = 0; iter < 2500; ++iter) {
        Cover f;
        if (iter % 2) {
            f = testing::randomCover(rng, 3 + rng() % 6, 1 + rng() % 9, 4, 0.2);
        } else {   // products of small sums have many kernels
            Cover a = testing::randomCover(rng, 4, 1 + rng() % 3, 2, 0.0);
            Cover b = testing::randomCover(rng, 4, 1 + rng() % 3, 2, 0.0);
            for (Cube& c : b.cubes)
                for (Literal& l : c.lits) l += 8;
            f = add(multiply(a, b), testing::randomCover(rng, 8, rng() % 3, 3));
            if (f.size() > 10) continue;
        }
        std::vector<KernelPair> ks = kernels(f);
        PairSet got = asSet(ks);
        ASSERT_EQ(got.size(), ks.size()) << "duplicate pair, iteration " << iter;
        PairSet want = bruteKernels(f);
        ASSERT_EQ(got, want) << "iteration " << iter;
        totalPairs += ks.size();
        std::map<Cover, int, CoverLess> memo;
        for (const KernelPair& k : ks) {
            ASSERT_TRUE(isCubeFree(k.kernel));
            ASSERT_EQ(divideByCube(f, k.cokernel).quotient, k.kernel);
            ASSERT_EQ(k.level, bruteLevel(k.kernel, memo)) << "iteration " << iter;
        }
        // Level-0 filter and the single level-0 descent agree with the full list.
        KernelOptions l0;
        l0.levelZeroOnly = true;
        PairSet zero;
        for (const KernelPair& k : ks)
            if (k.level == 0) zero.emplace(k.cokernel, k.kernel);
        ASSERT_EQ(asSet(kernels(f, l0)), zero);
        KernelPair one = levelZeroKernel(f);
        if (ks.empty()) {
            ASSERT_TRUE(one.kernel.isZero());
        } else {
            ASSERT_TRUE(zero.count({one.cokernel, one.kernel})) << "iteration " << iter;
        }
    }
    EXPECT_GT(totalPairs, 5000u);
}

TEST(AlgebraKernels, LargerRandomCoversGiveValidDistinctPairs) {
    std::mt19937 rng(4242);
    for (int iter = 0; iter < 60; ++iter) {
        Cover f = testing::randomCover(rng, 10, 40 + rng() % 60, 5, 0.2);
        KernelOptions opts;
        opts.maxKernels = 3000;
        std::vector<KernelPair> ks = kernels(f, opts);
        ASSERT_EQ(asSet(ks).size(), ks.size());
        for (const KernelPair& k : ks) {
            ASSERT_TRUE(isCubeFree(k.kernel));
            ASSERT_EQ(divideByCube(f, k.cokernel).quotient, k.kernel);
        }
    }
}

} // namespace
} // namespace kerf::algebra
