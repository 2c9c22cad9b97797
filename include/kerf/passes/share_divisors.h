// kerf/passes/share_divisors.h — the technique of the `extract-divisors` and `extract-kernels` moves: extract
// multi-cube divisors shared by nodes (or repeated inside one), by literal
// saving. Two methods: two-cube divisors together with two-literal cubes
// (fast, incremental; argument "pairs", the default) and kernels common to
// several nodes (argument "kernels"); "both" runs kernels then pairs.
//
// Contract. Needs: any network. Preserves: every node's function, outputs,
// inputs. Gives: each extraction saves literals. An existing node whose cover
// equals the divisor is reused instead of adding one. Depth: respects
// ctx.depthCap. Changed region (ctx.focus, pairs only): divisors come from
// the marked nodes; each is valued over every node that can hold it (the
// readers of its variable with the fewest readers). Kernels: whole network.
#pragma once

#include "kerf/passes/pass.h"

namespace kerf::passes {

struct ShareDivisorsOptions {
    enum class Method { Pairs, Kernels, Both };
    Method method = Method::Pairs;
    std::size_t maxCubesForPairs = 64;    ///< nodes with more cubes give no divisors here (see extract-cubes)
    std::size_t maxCubeForLiteralPairs = 24; ///< cubes with more literals give no two-literal divisors
    /// Nodes with more cubes give two-literal divisors only, no two-cube
    /// ones (whose number grows with the square of the node's cubes); 0: the
    /// same bound as maxCubesForPairs.
    std::size_t maxCubesForCubePairs = 0;
    std::size_t maxKernelsPerNode = 200;
    std::size_t kernelWork = 200000;       ///< steps of one node's kernel enumeration
    std::size_t maxExtractions = 1000000;
    /// Candidate divisors one move keeps in its table: once it holds this
    /// many, a divisor not in it is not counted anywhere (nodes still count
    /// the divisors already in it). Bounds the move's memory, which grows
    /// with the cube pairs of every node entered and re-entered after each
    /// extraction: 23.6 million on the 100k `sopwide` network (F149). 0: no
    /// bound.
    std::size_t maxCandidates = 4000000;
};

void shareDivisors(net::Network& net, const ShareDivisorsOptions& opts, PassContext& ctx);

} // namespace kerf::passes
