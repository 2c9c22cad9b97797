// regions.h — restructuring a large network region by region (regions.cpp).
#pragma once

#include "kerf/passes/engine.h"

namespace kerf::passes::detail {

/// Whether `net` is large enough to be restructured region by region
/// (limit region-literals; goal size; no declared don't-cares).
bool useRegions(const net::Network& net, const EngineOptions& opts);

/// restructure() for a large network: the scheduler runs on each region
/// with the effort's limits; the result is never worse than the input.
/// CPU seconds this process has used (technique timings: the machine may be
/// shared, and wall time then says little about what a technique costs).
double cpuNow();
/// The process's peak resident memory so far, in MB (its high-water mark:
/// never falls; a technique's trials are charged with how far they raise it).
double peakMBNow();

EngineResult restructureByRegions(net::Network& net, const EngineOptions& opts);

} // namespace kerf::passes::detail
