// algebra_bench.cpp — timing of the algebraic core on large covers.
//
// Covers of 10 to 100,000 cubes over 256 variables, of two kinds:
//   random   — cubes of 2..8 literals, random variables and polarities, with a
//              planted 4-cube divisor so that division has a real quotient;
//   decoder  — full minterms over ceil(log2 N) address bits, each ANDed with
//              one of the remaining variables (a decoder or ROM output), so
//              every literal is shared by about half of the cubes.
// Measured: weak division (index build included, and with a prebuilt
// index), kernel enumeration under the default KernelOptions bound, and
// factoring by both methods. Counters: cubes, literals, kernels found,
// whether the bound stopped enumeration, factored literal count, and the
// process's peak resident set (getrusage ru_maxrss; it only grows, so read
// it on the largest sizes). Complexity fits (BigO) are printed per family.
//
// Run: kerf_algebra_bench [--benchmark_filter=REGEX]

#include "kerf/algebra/cover.h"

#include <benchmark/benchmark.h>
#include <sys/resource.h>

#include <algorithm>
#include <map>
#include <random>

namespace {

using namespace kerf::algebra;

constexpr std::uint32_t kVars = 256;

double peakRssMiB() {
    rusage ru{};
    getrusage(RUSAGE_SELF, &ru);
    return static_cast<double>(ru.ru_maxrss) / 1024.0;   // Linux: KiB
}

Cube randomCube(std::mt19937& rng, std::uint32_t lo, std::uint32_t hi, std::size_t minLits, std::size_t maxLits) {
    std::uniform_int_distribution<std::uint32_t> var(lo, hi - 1);
    std::uniform_int_distribution<std::size_t> len(minLits, maxLits);
    std::vector<Literal> lits;
    std::size_t k = len(rng);
    while (lits.size() < k) {
        Literal l = makeLiteral(var(rng), rng() & 1);
        bool clash = false;
        for (Literal m : lits) clash |= literalVar(m) == literalVar(l);
        if (!clash) lits.push_back(l);
    }
    return Cube(std::move(lits));
}

struct Workload {
    Cover f;
    Cover divisor;
};

// Random cover of n cubes; about an eighth of them are d*q for a planted
// 4-cube divisor d over variables 0..7 (q over the other variables).
Workload randomWorkload(std::size_t n) {
    std::mt19937 rng(static_cast<unsigned>(n) * 7919u + 1);
    Workload w;
    for (int i = 0; i < 4; ++i) w.divisor.cubes.push_back(randomCube(rng, 0, 8, 1, 3));
    w.divisor.normalize();
    Cover q;
    for (std::size_t i = 0; i < std::max<std::size_t>(1, n / 32); ++i) q.cubes.push_back(randomCube(rng, 8, kVars, 1, 5));
    q.normalize();
    w.f = multiply(w.divisor, q);
    while (w.f.cubes.size() < n) w.f.cubes.push_back(randomCube(rng, 0, kVars, 2, 8));
    w.f.normalize();
    return w;
}

// Decoder-like: minterm i over `bits` address variables, times data variable.
Workload decoderWorkload(std::size_t n) {
    std::uint32_t bits = 1;
    while ((std::size_t{1} << bits) < n) ++bits;
    std::mt19937 rng(static_cast<unsigned>(n) + 17u);
    std::vector<std::uint32_t> codes(std::size_t{1} << bits);
    for (std::uint32_t i = 0; i < codes.size(); ++i) codes[i] = i;
    std::shuffle(codes.begin(), codes.end(), rng);
    Workload w;
    for (std::size_t i = 0; i < n; ++i) {
        std::vector<Literal> lits;
        for (std::uint32_t b = 0; b < bits; ++b) lits.push_back(makeLiteral(b, ((codes[i] >> b) & 1) == 0));
        lits.push_back(makeLiteral(bits + static_cast<std::uint32_t>(rng() % (kVars - bits)), false));
        w.f.cubes.emplace_back(std::move(lits));
    }
    w.f.normalize();
    // Divide by "a0 | ~a0" style split: the two polarities of address bit 0
    // times address bit 1 (a 2-cube divisor present throughout).
    w.divisor = Cover{{Cube({makeLiteral(0, false), makeLiteral(1, false)}), Cube({makeLiteral(0, true), makeLiteral(1, true)})}};
    return w;
}

const Workload& workload(bool decoder, std::size_t n) {
    static std::map<std::pair<bool, std::size_t>, Workload> cache;
    auto it = cache.find({decoder, n});
    if (it == cache.end()) it = cache.emplace(std::make_pair(decoder, n), decoder ? decoderWorkload(n) : randomWorkload(n)).first;
    return it->second;
}

void common(benchmark::State& state, const Cover& f) {
    state.SetComplexityN(static_cast<benchmark::IterationCount>(f.size()));
    state.counters["cubes"] = static_cast<double>(f.size());
    state.counters["lits"] = static_cast<double>(f.literalCount());
    state.counters["peakMiB"] = peakRssMiB();
}

template <bool Decoder>
void BM_Divide(benchmark::State& state) {
    const Workload& w = workload(Decoder, static_cast<std::size_t>(state.range(0)));
    std::size_t qn = 0;
    for (auto _ : state) {
        Division d = divide(w.f, w.divisor);
        qn = d.quotient.size();
        benchmark::DoNotOptimize(d);
    }
    state.counters["quotient"] = static_cast<double>(qn);
    common(state, w.f);
}

template <bool Decoder>
void BM_DivideIndexed(benchmark::State& state) {
    const Workload& w = workload(Decoder, static_cast<std::size_t>(state.range(0)));
    CoverIndex index(w.f);
    for (auto _ : state) {
        Division d = divide(index, w.divisor);
        benchmark::DoNotOptimize(d);
    }
    common(state, w.f);
}

template <bool Decoder>
void BM_DivideByCube(benchmark::State& state) {
    const Workload& w = workload(Decoder, static_cast<std::size_t>(state.range(0)));
    const Cube c = w.divisor.cubes[0];
    for (auto _ : state) {
        Division d = divideByCube(w.f, c);
        benchmark::DoNotOptimize(d);
    }
    common(state, w.f);
}

template <bool Decoder>
void BM_Kernels(benchmark::State& state) {
    const Workload& w = workload(Decoder, static_cast<std::size_t>(state.range(0)));
    KernelStats stats;
    std::size_t found = 0;
    for (auto _ : state) {
        std::vector<KernelPair> ks = kernels(w.f, KernelOptions{}, &stats);
        found = ks.size();
        benchmark::DoNotOptimize(ks);
    }
    state.counters["kernels"] = static_cast<double>(found);
    state.counters["truncated"] = stats.truncated ? 1 : 0;
    state.counters["work"] = static_cast<double>(stats.work);
    common(state, w.f);
}

template <bool Decoder, FactorMethod M>
void BM_Factor(benchmark::State& state) {
    const Workload& w = workload(Decoder, static_cast<std::size_t>(state.range(0)));
    std::size_t lits = 0;
    for (auto _ : state) {
        Factored g = factor(w.f, M);
        lits = g.literalCount();
        benchmark::DoNotOptimize(g);
    }
    state.counters["factoredLits"] = static_cast<double>(lits);
    common(state, w.f);
}

void sizes(benchmark::internal::Benchmark* b) {
    for (long n : {10L, 100L, 1000L, 10000L, 100000L}) b->Arg(n);
    b->Unit(benchmark::kMillisecond)->Complexity();
}

BENCHMARK(BM_Divide<false>)->Name("divide/random")->Apply(sizes);
BENCHMARK(BM_Divide<true>)->Name("divide/decoder")->Apply(sizes);
BENCHMARK(BM_DivideIndexed<false>)->Name("divide_indexed/random")->Apply(sizes);
BENCHMARK(BM_DivideIndexed<true>)->Name("divide_indexed/decoder")->Apply(sizes);
BENCHMARK(BM_DivideByCube<false>)->Name("divide_by_cube/random")->Apply(sizes);
BENCHMARK(BM_DivideByCube<true>)->Name("divide_by_cube/decoder")->Apply(sizes);
BENCHMARK(BM_Kernels<false>)->Name("kernels/random")->Apply(sizes);
BENCHMARK(BM_Kernels<true>)->Name("kernels/decoder")->Apply(sizes);
BENCHMARK(BM_Factor<false, FactorMethod::Quick>)->Name("factor_quick/random")->Apply(sizes);
BENCHMARK(BM_Factor<true, FactorMethod::Quick>)->Name("factor_quick/decoder")->Apply(sizes);
BENCHMARK(BM_Factor<false, FactorMethod::Best>)->Name("factor_best/random")->Apply(sizes);
BENCHMARK(BM_Factor<true, FactorMethod::Best>)->Name("factor_best/decoder")->Apply(sizes);

} // namespace

BENCHMARK_MAIN();
