// simulation.cpp — seeded pattern words and bit-parallel AIG simulation.
//
// The pattern mix (uniform, biased towards 0 or 1, walking one / walking
// zero) is common trade practice for random simulation in equivalence
// checking; the schedule below is our own.
#include "kerf/proof/simulation.h"

namespace kerf::proof {

PatternSource::PatternSource(std::size_t inputCount, std::uint64_t seed)
    : inputs_(inputCount), rng_(seed * 0x2545F4914F6CDD1Dull + 0x1234567ull) {}

void PatternSource::fill(std::size_t w, std::vector<std::uint64_t>& words) {
    words.assign(inputs_, 0);
    switch (w % 8) {
    case 2:  // mostly zero: each bit is 1 with probability 1/8
    case 5:
        for (auto& x : words) x = rng_.next() & rng_.next() & rng_.next();
        break;
    case 3:  // mostly one: each bit is 1 with probability 7/8
    case 7:
        for (auto& x : words) x = rng_.next() | rng_.next() | rng_.next();
        break;
    case 6: {  // walking one over all-zero / walking zero over all-one, alternating per pattern
        if (inputs_ == 0) break;
        std::uint64_t base = rng_.next();
        for (unsigned bit = 0; bit < 64; ++bit) {
            std::size_t hot = (base + bit + w * 64) % inputs_;
            bool ones = (bit & 1) != 0;
            for (std::size_t i = 0; i < inputs_; ++i) {
                bool v = ones ? (i != hot) : (i == hot);
                if (v) words[i] |= std::uint64_t{1} << bit;
            }
        }
        break;
    }
    default:  // uniform
        for (auto& x : words) x = rng_.next();
        break;
    }
    if (w == 0)
        for (auto& x : words) x = (x & ~std::uint64_t{3}) | 2u;  // pattern 0 all zero, pattern 1 all one
}

void simulateWord(const Aig& g, const std::vector<std::uint64_t>& inputWords, std::vector<std::uint64_t>& values,
                  const std::vector<AigNode>* nodes) {
    if (values.size() < g.size()) values.resize(g.size(), 0);
    values[0] = 0;
    const auto& ins = g.inputs();
    for (std::size_t i = 0; i < ins.size(); ++i) values[ins[i]] = i < inputWords.size() ? inputWords[i] : 0;
    auto eval = [&](AigNode n) {
        values[n] = literalValue(values, g.fanin0(n)) & literalValue(values, g.fanin1(n));
    };
    if (nodes) {
        for (AigNode n : *nodes) eval(n);
    } else {
        for (AigNode n = 1; n < g.size(); ++n)
            if (g.isAnd(n)) eval(n);
    }
}

} // namespace kerf::proof
