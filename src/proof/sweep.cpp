// sweep.cpp — the proving engine: random simulation, candidate classes,
// SAT sweeping with merging, and output-pair SAT queries.
//
// SAT sweeping (proving simulation-equivalent internal nodes in topological
// order and merging them, so that later queries see shared structure) follows
// A. Kuehlmann and F. Krohm, "Equivalence checking using cuts and heaps",
// DAC 1997, and A. Kuehlmann, V. Paruthi, F. Krohm, M. K. Ganai, "Robust
// Boolean reasoning for equivalence checking and functional property
// verification", IEEE TCAD 2002 (both from memory). Each AND is encoded
// with the three Tseitin (1968) clauses, lazily for the cone a query needs,
// in an incremental CaDiCaL solver (A. Biere) queried under assumptions.
// The data structures and schedule are our own.
//
// Candidate classes: every node gets a hash of its simulation signature,
// complemented when the node is 1 under the all-zero pattern so that a node
// and the complement of another fall in the same class. Nodes are taken in
// topological order; a node whose (merged) fanins hash to an existing node
// is merged structurally; otherwise it is compared with the earliest
// representative of its class. A SAT counterexample is stored as a pattern;
// pending patterns are evaluated on demand on the cones being compared, and
// every 64 of them are simulated on the whole graph and folded into the
// hashes, which splits the classes.
#include "kerf/proof/equivalence.h"
#include "kerf/proof/simulation.h"
#include "kerf/io/progress.h"

#include <cadical.hpp>
#include <fmt/format.h>

#include <algorithm>
#include <bit>
#include <chrono>
#include <climits>
#include <memory>
#include <cstdio>

namespace kerf::proof {

namespace {

using Clock = std::chrono::steady_clock;

double secondsSince(Clock::time_point t) {
    return std::chrono::duration<double>(Clock::now() - t).count();
}

std::uint64_t mixWord(std::uint64_t h, std::uint64_t w) {
    h ^= w + 0x9E3779B97F4A7C15ull + (h << 6) + (h >> 2);
    h *= 0xFF51AFD7ED558CCDull;
    return h ^ (h >> 33);
}

std::uint64_t pairKey(AigLit a, AigLit b) { return (std::uint64_t{a} << 32) | b; }

/// Counts conflicts through the learned clauses CaDiCaL exports (one per
/// conflict); refuses every clause so nothing is copied.
struct ConflictCounter : CaDiCaL::Learner {
    std::int64_t count = 0;
    bool learning(int) override {
        ++count;
        return false;
    }
    void learn(int) override {}
};

constexpr AigNode kNone = ~AigNode{0};

/// Open-addressing hash map from 64-bit keys to node ids (kNone = absent).
class FlatMap {
public:
    AigNode find(std::uint64_t key) const {
        if (vals_.empty()) return kNone;
        for (std::size_t i = slot(key);; i = (i + 1) & mask_) {
            if (vals_[i] == kNone) return kNone;
            if (keys_[i] == key) return vals_[i];
        }
    }
    /// The value stored for `key`, inserting `value` when absent.
    AigNode& at(std::uint64_t key, AigNode value) {
        if ((size_ + 1) * 2 > vals_.size()) grow();
        for (std::size_t i = slot(key);; i = (i + 1) & mask_) {
            if (vals_[i] == kNone) {
                keys_[i] = key;
                vals_[i] = value;
                ++size_;
                return vals_[i];
            }
            if (keys_[i] == key) return vals_[i];
        }
    }
    void clear() {
        std::fill(vals_.begin(), vals_.end(), kNone);
        size_ = 0;
    }

private:
    std::size_t slot(std::uint64_t k) const {
        k ^= k >> 33;
        k *= 0xFF51AFD7ED558CCDull;
        k ^= k >> 33;
        return static_cast<std::size_t>(k) & mask_;
    }
    void grow() {
        std::vector<std::uint64_t> keys = std::move(keys_);
        std::vector<AigNode> vals = std::move(vals_);
        std::size_t cap = std::max<std::size_t>(1024, vals.size() * 2);
        keys_.assign(cap, 0);
        vals_.assign(cap, kNone);
        mask_ = cap - 1;
        size_ = 0;
        for (std::size_t i = 0; i < vals.size(); ++i)
            if (vals[i] != kNone) at(keys[i], vals[i]);
    }
    std::vector<std::uint64_t> keys_;
    std::vector<AigNode> vals_;
    std::size_t size_ = 0, mask_ = 0;
};

enum class Cmp { Equal, Different, Undecided };

class Sweeper {
public:
    Sweeper(const Aig& g, const ProofOptions& opt) : g_(g), opt_(opt), rng_(opt.seed ^ 0xC0FFEEull) {
        const std::size_t n = g.size();
        hash_.assign(n, 0);
        keyHash_.assign(n, 0);
        supp_.assign(n, 0);
        constLike_.assign(n, 0);
        isDriver_.assign(n, 0);
        phase_.assign(n, 0);
        repr_.assign(n, 0);
        hf0_.assign(n, 0);
        hf1_.assign(n, 0);
        isHead_.assign(n, 0);
        var_.assign(n, 0);
        pendVal_.assign(n, 0);
        pendStamp_.assign(n, 0);
        nextInBucket_.assign(n, kNone);
        lastInBucket_.assign(n, kNone);
        jStamp_.assign(n, 0);
        jVal_.assign(n, 0);
        cube_.assign(n, 0);
        pendIn_.assign(g.inputs().size(), 0);
        newSolver();
    }
    ~Sweeper() {
        if (solver_) solver_->disconnect_learner();
    }

    PairsReport run(const std::vector<std::pair<AigLit, AigLit>>& pairs);

private:
    void markCone(const std::vector<std::pair<AigLit, AigLit>>& pairs, const std::vector<std::uint8_t>& todo,
                  std::vector<AigNode>& all, std::vector<AigNode>& ands);
    void simulate(const std::vector<std::pair<AigLit, AigLit>>& pairs, std::vector<PairOutcome>& out);
    void sweep();
    void makeHead(AigNode n, AigLit a, AigLit b);
    void addToBucket(AigNode n);
    bool justify(AigLit first, AigLit second, std::vector<std::uint8_t>& pattern, bool productOnly = false);
    void noteCube(AigNode n);
    bool splitByJustification(AigNode n, AigNode h, bool p, std::vector<std::uint8_t>& pattern);
    bool fold(AigLit a, AigLit b, AigLit& result) const;
    AigLit mapLit(AigLit l) const { return repr_[aigNode(l)] ^ (l & 1u); }
    AigNode findCandidate(AigNode n);
    bool matchesPending(AigNode n, AigNode h);
    std::uint64_t bucketKey(AigNode n) const;
    Cmp tryMerge(AigNode n, AigLit a, AigLit b, AigNode h, bool poolPattern);
    std::int64_t internalLimit() const {
        return std::min({opt_.conflictsPerInternal, opt_.totalConflicts / 2 - sweepConflicts_, totalLeft()});
    }
    std::uint64_t pendingValue(AigNode root);
    void addPattern(const std::vector<std::uint8_t>& pattern);
    void foldPatterns();
    // SAT
    void newSolver();
    void encode(AigNode root);
    int satLit(AigLit l) const { return aigNegated(l) ? -var_[aigNode(l)] : var_[aigNode(l)]; }
    int solve(std::initializer_list<int> assumptions, std::int64_t limit, std::int64_t& used);
    Cmp compare(AigLit x, AigLit y, std::int64_t limit, std::int64_t& used, std::vector<std::uint8_t>& pattern);
    std::vector<std::uint8_t> modelPattern();
    std::int64_t totalLeft() const { return opt_.totalConflicts - st_.conflicts; }

    const Aig& g_;
    ProofOptions opt_;
    Random rng_;
    ProofStats st_;

    std::vector<AigNode> simAll_, simAnds_;     // cone of every pair: simulated
    std::vector<AigNode> needAll_, needAnds_;   // cone of undecided pairs: swept
    std::size_t outputsToCompare_ = 0;          // for the progress share after the sweep
    std::vector<std::uint64_t> hash_, keyHash_;
    int foldsSinceRebuild_ = 0;
    std::vector<std::uint64_t> supp_;         // structural support, one bit per input (mod 64)
    std::vector<std::uint8_t> constLike_;
    std::vector<std::uint8_t> isDriver_;      // drives one side of an undecided output pair     // signature equal to the constant's after random simulation
    std::vector<std::uint8_t> pattern_;
    std::vector<std::uint64_t> foldVal_;
    std::vector<std::uint8_t> phase_;
    std::vector<AigLit> repr_;
    std::vector<AigLit> hf0_, hf1_;
    std::vector<std::uint8_t> isHead_;
    std::vector<AigNode> heads_;
    FlatMap mergedStrash_;
    FlatMap buckets_;                          // signature hash -> first head of the class
    std::vector<AigNode> nextInBucket_, lastInBucket_;
    // justification scratch
    std::vector<std::uint32_t> jStamp_;
    std::vector<std::uint8_t> jVal_;
    std::uint32_t jVersion_ = 0;
    std::vector<AigLit> jStack_;
    bool jChose_ = false;                      // the last walk required some AND to be 0
    std::vector<std::uint32_t> jInputs_;       // inputs the last walk assigned (index * 2 + value)
    std::vector<std::uint64_t> cube_;          // constant-like products: hash of their literals (0: none)

    std::vector<std::uint64_t> pendIn_;
    int pendCount_ = 0;
    std::vector<std::uint64_t> pendVal_;
    std::vector<std::uint32_t> pendStamp_;
    std::uint32_t pendVersion_ = 1;

    std::unique_ptr<CaDiCaL::Solver> solver_;
    ConflictCounter counter_;
    std::vector<int> var_;
    std::vector<AigNode> encoded_;  // nodes with a variable in the current solver
    int nextVar_ = 0;
    std::int64_t sweepConflicts_ = 0;
    bool sweepBudgetSpent_ = false;
};

void Sweeper::markCone(const std::vector<std::pair<AigLit, AigLit>>& pairs, const std::vector<std::uint8_t>& todo,
                       std::vector<AigNode>& all, std::vector<AigNode>& ands) {
    std::vector<std::uint8_t> mark(g_.size(), 0);
    std::vector<AigNode> work;
    for (std::size_t i = 0; i < pairs.size(); ++i) {
        if (!todo[i]) continue;
        work.push_back(aigNode(pairs[i].first));
        work.push_back(aigNode(pairs[i].second));
    }
    while (!work.empty()) {
        AigNode n = work.back();
        work.pop_back();
        if (mark[n]) continue;
        mark[n] = 1;
        if (g_.isAnd(n)) {
            work.push_back(aigNode(g_.fanin0(n)));
            work.push_back(aigNode(g_.fanin1(n)));
        }
    }
    mark[0] = 1;
    all.clear();
    ands.clear();
    for (AigNode n = 0; n < g_.size(); ++n) {
        if (!mark[n]) continue;
        all.push_back(n);
        if (g_.isAnd(n)) ands.push_back(n);
    }
}

void Sweeper::simulate(const std::vector<std::pair<AigLit, AigLit>>& pairs, std::vector<PairOutcome>& out) {
    PatternSource source(g_.inputs().size(), opt_.seed);
    std::vector<std::uint64_t> in, val(g_.size(), 0);
    const auto& ins = g_.inputs();
    for (int w = 0; w < opt_.simWords; ++w) {
        source.fill(static_cast<std::size_t>(w), in);
        simulateWord(g_, in, val, &simAnds_);
        if (w == 0)
            for (AigNode n : simAll_) phase_[n] = val[n] & 1u;
        for (AigNode n : simAll_) hash_[n] = mixWord(hash_[n], phase_[n] ? ~val[n] : val[n]);
        for (std::size_t i = 0; i < pairs.size(); ++i) {
            if (out[i].status != PairStatus::Undecided) continue;
            std::uint64_t d = literalValue(val, pairs[i].first) ^ literalValue(val, pairs[i].second);
            if (!d) continue;
            unsigned bit = static_cast<unsigned>(std::countr_zero(d));
            out[i].status = PairStatus::Different;
            out[i].by = SettledBy::Simulation;
            out[i].pattern.resize(ins.size());
            for (std::size_t j = 0; j < ins.size(); ++j) out[i].pattern[j] = (in[j] >> bit) & 1u;
        }
    }
}

bool Sweeper::fold(AigLit a, AigLit b, AigLit& result) const {
    if (a > b) std::swap(a, b);
    if (a == kAigFalse || a == aigNot(b)) {
        result = kAigFalse;
        return true;
    }
    if (a == kAigTrue || a == b) {
        result = b;
        return true;
    }
    if (AigNode m = mergedStrash_.find(pairKey(a, b)); m != kNone) {
        result = aigLit(m);
        return true;
    }
    return false;
}

void Sweeper::makeHead(AigNode n, AigLit a, AigLit b) {
    isHead_[n] = 1;
    repr_[n] = aigLit(n);
    hf0_[n] = std::min(a, b);
    hf1_[n] = std::max(a, b);
    if (g_.isAnd(n)) mergedStrash_.at(pairKey(hf0_[n], hf1_[n]), n);
    addToBucket(n);
    heads_.push_back(n);
}

void Sweeper::addToBucket(AigNode n) {
    nextInBucket_[n] = kNone;
    AigNode& first = buckets_.at(bucketKey(n), n);
    if (first == n) {
        lastInBucket_[n] = n;
    } else {
        nextInBucket_[lastInBucket_[first]] = n;
        lastInBucket_[first] = n;
    }
}

std::uint64_t Sweeper::pendingValue(AigNode root) {
    if (pendStamp_[root] == pendVersion_) return pendVal_[root];
    std::vector<AigNode> stack{root};
    while (!stack.empty()) {
        AigNode n = stack.back();
        if (pendStamp_[n] == pendVersion_) {
            stack.pop_back();
            continue;
        }
        if (n == 0 || g_.isInput(n)) {
            pendVal_[n] = n == 0 ? 0 : pendIn_[g_.inputIndex(n)];
            pendStamp_[n] = pendVersion_;
            stack.pop_back();
            continue;
        }
        AigNode a = aigNode(g_.fanin0(n)), b = aigNode(g_.fanin1(n));
        bool ready = true;
        if (pendStamp_[a] != pendVersion_) stack.push_back(a), ready = false;
        if (pendStamp_[b] != pendVersion_) stack.push_back(b), ready = false;
        if (!ready) continue;
        auto lv = [&](AigLit l) { return aigNegated(l) ? ~pendVal_[aigNode(l)] : pendVal_[aigNode(l)]; };
        pendVal_[n] = lv(g_.fanin0(n)) & lv(g_.fanin1(n));
        pendStamp_[n] = pendVersion_;
        stack.pop_back();
    }
    return pendVal_[root];
}

// Look for an input assignment that makes two literals true by walking back
// from them: an AND required 1 needs both fanins 1, an AND
// required 0 needs one fanin 0 (one already required 0 if any, else one at
// random). No backtracking: a clash gives up and the caller asks SAT. Used
// before SAT on every candidate pair: wide ANDs (decoder terms) are almost
// never 1 under random patterns, so they crowd the constant class and each
// other's classes, and a walk back splits them far more cheaply than a SAT
// call. A success is a splitting pattern; it proves nothing, so it cannot
// make a proof unsound.
// With `productOnly` the walk gives up at the first AND required 0 and fills
// no pattern (noteCube only wants the literals of a product).
bool Sweeper::justify(AigLit first, AigLit second, std::vector<std::uint8_t>& pattern, bool productOnly) {
    if (++jVersion_ == 0) {
        std::fill(jStamp_.begin(), jStamp_.end(), 0);
        jVersion_ = 1;
    }
    // Both literals must become true; `first` is handled first.
    jStack_.clear();
    jChose_ = false;
    jInputs_.clear();
    jStack_.push_back(second);
    jStack_.push_back(first);
    std::size_t steps = 0;
    std::uint64_t coin = 0;
    int coinBits = 0;
    auto stamped = [&](AigLit l, bool& truth) {
        AigNode m = aigNode(l);
        if (jStamp_[m] != jVersion_) return false;
        truth = (jVal_[m] != 0) != aigNegated(l);
        return true;
    };
    while (!jStack_.empty()) {
        if (++steps > 100000) return false;
        AigLit l = jStack_.back();
        jStack_.pop_back();
        AigNode m = aigNode(l);
        bool v = !aigNegated(l);
        if (jStamp_[m] == jVersion_) {
            if ((jVal_[m] != 0) != v) return false;
            continue;
        }
        jStamp_[m] = jVersion_;
        jVal_[m] = v;
        if (m == 0) {
            if (v) return false;
            continue;
        }
        if (g_.isInput(m)) {
            jInputs_.push_back(g_.inputIndex(m) * 2 + (v ? 1u : 0u));
            continue;
        }
        AigLit f0 = g_.fanin0(m), f1 = g_.fanin1(m);
        if (v) {
            jStack_.push_back(f0);
            jStack_.push_back(f1);
            continue;
        }
        jChose_ = true;
        if (productOnly) return false;
        bool t0 = false, t1 = false;
        bool s0 = stamped(f0, t0), s1 = stamped(f1, t1);
        if ((s0 && !t0) || (s1 && !t1)) continue;  // already false
        AigLit pick;
        if (s0) pick = f1;
        else if (s1) pick = f0;
        else {
            if (coinBits == 0) coin = rng_.next(), coinBits = 64;
            pick = (coin & 1u) ? f0 : f1;
            coin >>= 1, --coinBits;
        }
        jStack_.push_back(aigNot(pick));
    }
    if (productOnly) return true;
    const auto& ins = g_.inputs();
    pattern.resize(ins.size());
    std::uint64_t bits = 0;
    for (std::size_t j = 0; j < ins.size(); ++j) {
        if (j % 64 == 0) bits = rng_.next();
        AigNode in = ins[j];
        pattern[j] = jStamp_[in] == jVersion_ ? jVal_[in] : ((bits >> (j % 64)) & 1u);
    }
    return true;
}

// Candidate n == h ^ p: look for n != h ^ p without SAT.
bool Sweeper::splitByJustification(AigNode n, AigNode h, bool p, std::vector<std::uint8_t>& pattern) {
    if (h == 0) return justify(aigLit(n, p), kAigTrue, pattern);  // n looked like the constant p
    // n = 1 and h^p = 0, or h^p = 1 and n = 0: the side that must be 1 goes first.
    return justify(aigLit(n), aigLit(h, !p), pattern) || justify(aigLit(h, p), aigLit(n, true), pattern);
}

// A node that looked constant and is a product of input literals (one walk
// back setting it to its rarer value requires no AND to be 0) is that
// product whatever its structure: its literals are the inputs the walk
// assigned. Their hash joins the class key (bucketKey), so a rare product is
// only compared with rare products of the same literals. Without it, every
// wide product over the same inputs shares one class (decoder matchers: ten
// thousand in one class), the candidate scan stops before the partner, and
// the unmerged products leave the output queries to SAT.
void Sweeper::noteCube(AigNode n) {
    std::vector<std::uint8_t> none;
    if (!justify(aigLit(n, phase_[n] != 0), kAigTrue, none, true)) return;
    std::sort(jInputs_.begin(), jInputs_.end());
    std::uint64_t h = 0x2545F4914F6CDD1Dull;
    for (std::uint32_t x : jInputs_) h = mixWord(h, x);
    cube_[n] = h | 1u;   // never 0
}

bool Sweeper::matchesPending(AigNode n, AigNode h) {
    if (pendCount_ == 0) return true;
    const std::uint64_t mask = pendCount_ >= 64 ? ~std::uint64_t{0} : ((std::uint64_t{1} << pendCount_) - 1);
    std::uint64_t vn = pendingValue(n), vh = pendingValue(h);
    if (phase_[n]) vn = ~vn;
    if (phase_[h]) vh = ~vh;
    return ((vn ^ vh) & mask) == 0;
}

// Class key: the signature hash; for nodes that looked constant under random
// simulation (wide ANDs and the like) also the structural support, so that
// such rare functions are only compared with rare functions over the same
// inputs. Equal functions over different structural supports (redundant
// inputs) are then not merged early; that costs effort, never soundness.
// Buckets are keyed by the hash as of the last rebuild (keyHash_), which
// happens every few folds; members whose current hash differs are skipped.
std::uint64_t Sweeper::bucketKey(AigNode n) const {
    if (!constLike_[n]) return keyHash_[n];
    return mixWord(mixWord(keyHash_[n], supp_[n] ^ 0x5BD1E9955BD1E995ull), cube_[n]);
}

AigNode Sweeper::findCandidate(AigNode n) {
    AigNode first = buckets_.find(bucketKey(n));
    int scanned = 0, compared = 0;
    for (AigNode h = first; h != kNone && ++scanned <= 64; h = nextInBucket_[h]) {
        if (h == 0 || hash_[h] != hash_[n]) continue;
        if (++compared > 8) break;
        if (matchesPending(n, h)) return h;
    }
    return kNone;
}

void Sweeper::addPattern(const std::vector<std::uint8_t>& pattern) {
    for (std::size_t j = 0; j < pendIn_.size(); ++j)
        if (pattern[j]) pendIn_[j] |= std::uint64_t{1} << pendCount_;
    ++pendCount_;
    ++pendVersion_;
    if (pendCount_ == 64) foldPatterns();
}

void Sweeper::foldPatterns() {
    if (pendCount_ == 0) return;
    auto t0 = Clock::now();
    foldVal_.resize(g_.size());
    simulateWord(g_, pendIn_, foldVal_, &needAnds_);
    for (AigNode n : needAll_) hash_[n] = mixWord(hash_[n], phase_[n] ? ~foldVal_[n] : foldVal_[n]);
    ++st_.patternFolds;
    if (++foldsSinceRebuild_ >= 8) {
        foldsSinceRebuild_ = 0;
        for (AigNode n : needAll_) keyHash_[n] = hash_[n];
        buckets_.clear();
        for (AigNode h : heads_) addToBucket(h);
    }
    std::fill(pendIn_.begin(), pendIn_.end(), 0);
    pendCount_ = 0;
    ++pendVersion_;
    st_.simSeconds += secondsSince(t0);
}

// A satisfiable answer assigns every variable of the solver, so its cost
// grows with everything encoded so far. Internal queries therefore move to a
// fresh solver once the current one holds `solverVarLimit` variables (the
// proved merges live in the graph, only learned clauses are dropped); the
// same recycling is common practice in SAT sweeping implementations.
void Sweeper::newSolver() {
    if (solver_) solver_->disconnect_learner();
    for (AigNode n : encoded_) var_[n] = 0;
    encoded_.clear();
    nextVar_ = 0;
    solver_ = std::make_unique<CaDiCaL::Solver>();
    solver_->set("lucky", 0);   // the lucky-phase check scans every clause on each call
    solver_->set("elim", 0);    // variables are reused by later incremental queries
    solver_->set("quiet", 1);
    solver_->connect_learner(&counter_);
    ++st_.solvers;
}

void Sweeper::encode(AigNode root) {
    if (var_[root]) return;
    std::vector<AigNode> stack{root};
    while (!stack.empty()) {
        AigNode n = stack.back();
        if (var_[n]) {
            stack.pop_back();
            continue;
        }
        if (n == 0) {
            var_[0] = ++nextVar_;
            encoded_.push_back(0);
            solver_->add(-var_[0]);
            solver_->add(0);
            stack.pop_back();
            continue;
        }
        if (g_.isInput(n)) {
            var_[n] = ++nextVar_;
            encoded_.push_back(n);
            stack.pop_back();
            continue;
        }
        AigNode a = aigNode(hf0_[n]), b = aigNode(hf1_[n]);
        bool ready = true;
        if (!var_[a]) stack.push_back(a), ready = false;
        if (!var_[b]) stack.push_back(b), ready = false;
        if (!ready) continue;
        int v = ++nextVar_;
        var_[n] = v;
        encoded_.push_back(n);
        int x = satLit(hf0_[n]), y = satLit(hf1_[n]);
        // Tseitin: v <-> x & y
        solver_->add(-v), solver_->add(x), solver_->add(0);
        solver_->add(-v), solver_->add(y), solver_->add(0);
        solver_->add(v), solver_->add(-x), solver_->add(-y), solver_->add(0);
        stack.pop_back();
    }
}

int Sweeper::solve(std::initializer_list<int> assumptions, std::int64_t limit, std::int64_t& used) {
    if (limit <= 0) return 0;
    auto t0 = Clock::now();
    for (int a : assumptions) solver_->assume(a);
    solver_->limit("conflicts", static_cast<int>(std::min<std::int64_t>(limit, INT_MAX)));
    counter_.count = 0;
    int r = solver_->solve();
    std::int64_t c = r == 0 ? std::max(counter_.count, limit) : std::min(counter_.count, limit);
    used += c;
    st_.conflicts += c;
    ++st_.satCalls;
    st_.satSeconds += secondsSince(t0);
    return r;
}

std::vector<std::uint8_t> Sweeper::modelPattern() {
    const auto& ins = g_.inputs();
    std::vector<std::uint8_t> p(ins.size(), 0);
    std::uint64_t bits = 0;
    for (std::size_t j = 0; j < ins.size(); ++j) {
        if (j % 64 == 0) bits = rng_.next();
        int v = var_[ins[j]];
        p[j] = v ? (solver_->val(v) > 0) : ((bits >> (j % 64)) & 1u);
    }
    return p;
}

Cmp Sweeper::compare(AigLit x, AigLit y, std::int64_t limit, std::int64_t& used,
                     std::vector<std::uint8_t>& pattern) {
    if (x == y) return Cmp::Equal;
    if (x == aigNot(y)) {
        pattern.assign(g_.inputs().size(), 0);
        return Cmp::Different;
    }
    if (aigNode(x) == 0) std::swap(x, y);
    encode(aigNode(x));
    encode(aigNode(y));
    std::int64_t before = used;
    auto left = [&] { return limit - (used - before); };
    if (aigNode(y) == 0) {
        // x must be the constant y: look for x != y.
        int r = solve({y == kAigFalse ? satLit(x) : -satLit(x)}, left(), used);
        if (r == 10) {
            pattern = modelPattern();
            return Cmp::Different;
        }
        if (r != 20) return Cmp::Undecided;
        solver_->add(y == kAigFalse ? -satLit(x) : satLit(x));
        solver_->add(0);
        return Cmp::Equal;
    }
    int sx = satLit(x), sy = satLit(y);
    int r = solve({sx, -sy}, left(), used);
    if (r == 10) {
        pattern = modelPattern();
        return Cmp::Different;
    }
    if (r != 20) return Cmp::Undecided;
    solver_->add(-sx), solver_->add(sy), solver_->add(0);
    r = solve({-sx, sy}, left(), used);
    if (r == 10) {
        pattern = modelPattern();
        return Cmp::Different;
    }
    if (r != 20) return Cmp::Undecided;
    solver_->add(sx), solver_->add(-sy), solver_->add(0);
    return Cmp::Equal;
}

Cmp Sweeper::tryMerge(AigNode n, AigLit a, AigLit b, AigNode h, bool poolPattern) {
    std::int64_t limit = internalLimit();
    if (limit <= 0) {
        sweepBudgetSpent_ = true;
        return Cmp::Undecided;
    }
    bool p = (phase_[n] ^ phase_[h]) != 0;
    if (splitByJustification(n, h, p, pattern_)) {
        ++st_.internalRefuted;
        ++st_.internalJustified;
        if (poolPattern) addPattern(pattern_);
        return Cmp::Different;
    }
    // Define n tentatively over the merged fanins so the query sees merged structure.
    hf0_[n] = std::min(a, b);
    hf1_[n] = std::max(a, b);
    if (nextVar_ > opt_.solverVarLimit) newSolver();
    Cmp c = compare(aigLit(n), aigLit(h, p), limit, sweepConflicts_, pattern_);
    switch (c) {
    case Cmp::Equal:
        repr_[n] = aigLit(h, p);
        ++st_.internalMerged;
        break;
    case Cmp::Different:
        ++st_.internalRefuted;
        if (poolPattern) addPattern(pattern_);
        break;
    case Cmp::Undecided: ++st_.internalUndecided; break;
    }
    return c;
}

void Sweeper::sweep() {
    repr_[0] = kAigFalse;
    makeHead(0, 0, 0);
    for (AigNode n : needAll_)
        if (g_.isInput(n)) makeHead(n, 0, 0);
    std::size_t done = 0;
    auto t0 = Clock::now();
    for (AigNode n : needAnds_) {
        AigLit a = mapLit(g_.fanin0(n)), b = mapLit(g_.fanin1(n));
        AigLit r;
        ++done;
        // Progress: the sweep's nodes, then the outputs compared one by one (run()).
        if ((done & 4095) == 0) io::Progress::global().share(done, needAnds_.size() + outputsToCompare_);
        if (opt_.verbose >= 2 && done % 100000 == 0)
            fmt::print(stderr, "kerf proof: swept {}/{} nodes, {} merged, {} SAT calls, {:.1f} s\n", done,
                       needAnds_.size(), st_.internalMerged, st_.satCalls, secondsSince(t0));
        if (fold(a, b, r)) {
            repr_[n] = r;
            continue;
        }
        if (opt_.sweepInternal && constLike_[n]) noteCube(n);
        if (opt_.sweepInternal && !sweepBudgetSpent_) {
            // A node that looked constant is first compared with the constant.
            // The pattern that splits it is specific to it and is not pooled:
            // pooling one pattern per rare node would make re-simulation
            // quadratic on decoder-like logic.
            if (constLike_[n] && matchesPending(n, 0) && tryMerge(n, a, b, 0, false) == Cmp::Equal) continue;
            // Output drivers are compared in the output phase, under the larger per-output budget.
            if (isDriver_[n]) {
                makeHead(n, a, b);
                continue;
            }
            if (AigNode h = findCandidate(n); h != kNone && !sweepBudgetSpent_ &&
                                              tryMerge(n, a, b, h, true) == Cmp::Equal)
                continue;
        }
        makeHead(n, a, b);
    }
}

PairsReport Sweeper::run(const std::vector<std::pair<AigLit, AigLit>>& pairs) {
    auto t0 = Clock::now();
    PairsReport rep;
    rep.pairs.resize(pairs.size());
    st_.outputs = pairs.size();
    st_.aigNodes = g_.andCount();
    st_.aigInputs = g_.inputs().size();

    std::vector<std::uint8_t> todo(pairs.size(), 1);
    for (std::size_t i = 0; i < pairs.size(); ++i) {
        if (pairs[i].first == pairs[i].second) {
            rep.pairs[i].status = PairStatus::Equal;
            rep.pairs[i].by = SettledBy::Hashing;
            todo[i] = 0;
        }
    }
    markCone(pairs, todo, simAll_, simAnds_);
    auto ts = Clock::now();
    simulate(pairs, rep.pairs);
    st_.simSeconds += secondsSince(ts);

    for (std::size_t i = 0; i < pairs.size(); ++i) todo[i] = rep.pairs[i].status == PairStatus::Undecided;
    for (AigNode n : simAll_) {
        constLike_[n] = hash_[n] == hash_[0];
        keyHash_[n] = hash_[n];
        if (g_.isInput(n)) supp_[n] = std::uint64_t{1} << (g_.inputIndex(n) % 64);
        else if (g_.isAnd(n)) supp_[n] = supp_[aigNode(g_.fanin0(n))] | supp_[aigNode(g_.fanin1(n))];
    }
    markCone(pairs, todo, needAll_, needAnds_);
    for (std::size_t i = 0; i < pairs.size(); ++i)
        if (todo[i]) isDriver_[aigNode(pairs[i].first)] = isDriver_[aigNode(pairs[i].second)] = 1;
    outputsToCompare_ = pairs.size();
    sweep();

    std::vector<std::uint8_t> pattern;
    for (std::size_t i = 0; i < pairs.size(); ++i) {
        if ((i & 63) == 0) io::Progress::global().share(needAnds_.size() + i, needAnds_.size() + pairs.size());
        if (!todo[i]) continue;
        PairOutcome& o = rep.pairs[i];
        AigLit x = mapLit(pairs[i].first), y = mapLit(pairs[i].second);
        if (x == y) {
            o.status = PairStatus::Equal;
            o.by = SettledBy::Merging;
            continue;
        }
        std::int64_t used = 0;
        if (nextVar_ > 16 * opt_.solverVarLimit) newSolver();
        auto tq = Clock::now();
        int varsBefore = nextVar_;
        Cmp c = compare(x, y, std::min(opt_.conflictsPerQuery, totalLeft()), used, pattern);
        if (opt_.verbose >= 2)
            fmt::print(stderr, "kerf proof: output {}: {} conflicts, {} new variables, {:.3f} s, {}\n", i, used,
                       nextVar_ - varsBefore, secondsSince(tq),
                       c == Cmp::Equal ? "equal" : c == Cmp::Different ? "different" : "undecided");
        if (c == Cmp::Undecided) {
            o.status = PairStatus::Undecided;
            o.by = SettledBy::Budget;
            continue;
        }
        o.by = SettledBy::Sat;
        o.status = c == Cmp::Equal ? PairStatus::Equal : PairStatus::Different;
        if (c == Cmp::Different) o.pattern = pattern;
    }

    for (const PairOutcome& o : rep.pairs) {
        switch (o.by) {
        case SettledBy::Hashing: ++st_.byHashing, ++st_.byStructure; break;
        case SettledBy::Merging: ++st_.byStructure; break;
        case SettledBy::Simulation: ++st_.bySimulation; break;
        case SettledBy::Sat: ++st_.bySat; break;
        case SettledBy::Budget: ++st_.undecided; break;
        }
    }
    st_.seconds = secondsSince(t0);
    rep.stats = st_;
    return rep;
}

} // namespace

PairsReport provePairs(const Aig& g, const std::vector<std::pair<AigLit, AigLit>>& pairs, const ProofOptions& opts) {
    Sweeper s(g, opts);
    return s.run(pairs);
}

} // namespace kerf::proof
