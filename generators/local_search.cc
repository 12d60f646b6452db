#include "generators/local_search.h"

#include <algorithm>
#include <unordered_map>

#include "generators/random_bits.h"

namespace thetagate::engine {
namespace {

class Climber {
 public:
  Climber(const BigInt& start, const SizeScore& score, const LocalSearchOptions& options)
      : score_(score),
        options_(options),
        k_(bit_length(start) - 1),
        low_(BigInt(1) << k_),
        high_(low_ << 1),
        best_(start) {}

  void begin() { best_value_ = evaluate(best_); }

  // Moves to n if it is in scale and strictly better. Returns whether it moved.
  bool try_move(const BigInt& n) {
    if (n < low_ || n >= high_) return false;
    std::optional<double> v = evaluate(n);
    if (!v || (best_value_ && !better(*v, *best_value_))) return false;
    best_ = n;
    best_value_ = v;
    return true;
  }

  bool exhausted() const { return evaluations_ >= options_.max_evaluations; }
  uint64_t k() const { return k_; }
  const BigInt& best() const { return best_; }

  std::optional<LocalSearchResult> result() const {
    if (!best_value_) return std::nullopt;
    return LocalSearchResult{best_, *best_value_, evaluations_};
  }

 private:
  bool better(double a, double b) const { return options_.maximise ? a > b : a < b; }

  // Each distinct n costs one evaluation; revisits are free.
  std::optional<double> evaluate(const BigInt& n) {
    auto it = seen_.find(n);
    if (it != seen_.end()) return it->second;
    if (exhausted()) return std::nullopt;
    ++evaluations_;
    std::optional<double> v = score_(n);
    seen_.emplace(n, v);
    return v;
  }

  const SizeScore& score_;
  const LocalSearchOptions& options_;
  uint64_t k_;
  BigInt low_, high_;
  BigInt best_;
  std::optional<double> best_value_;
  uint64_t evaluations_ = 0;
  std::unordered_map<BigInt, std::optional<double>, BigIntHash> seen_;
};

void coarse_to_fine(Climber& c) {
  uint64_t lowest = c.k() > 62 ? c.k() - 62 : 0;
  for (uint64_t i = c.k(); i-- > lowest && !c.exhausted();) {
    BigInt step = BigInt(1) << i;
    while (!c.exhausted() && (c.try_move(c.best() + step) || c.try_move(c.best() - step))) {
    }
  }
}

void fine(Climber& c, uint64_t max_step) {
  uint64_t flips = std::min<uint64_t>(c.k(), 64);
  for (bool moved = true; moved && !c.exhausted();) {
    moved = false;
    for (uint64_t d = 1; d <= max_step && !c.exhausted(); ++d)
      moved |= c.try_move(c.best() + d) || c.try_move(c.best() - d);
    for (uint64_t i = 0; i < flips && !c.exhausted(); ++i)
      moved |= c.try_move(c.best() ^ (BigInt(1) << i));
  }
}

void kicks(Climber& c, uint64_t seed) {
  if (c.k() == 0) return;
  SplitMix64 rng(seed);
  // Each round draws its bits whether or not the move is new, so the
  // sequence of tries depends only on the seed and the scores.
  for (int stale = 0; !c.exhausted() && stale < 1000; ++stale) {
    BigInt n = c.best() ^ (BigInt(1) << random_index(rng, c.k()));
    if (rng.next() & 1) n ^= BigInt(1) << random_index(rng, c.k());
    if (c.try_move(n)) stale = 0;
  }
}

}  // namespace

std::optional<LocalSearchResult> local_search(const BigInt& start, const SizeScore& score,
                                              const LocalSearchOptions& options) {
  Climber climber(start, score, options);
  try {
    climber.begin();
    coarse_to_fine(climber);
    fine(climber, options.max_step);
    kicks(climber, options.seed);
  } catch (const StopSearch&) {
    // The caller's work allowance is spent: the best so far stands.
  }
  return climber.result();
}

}  // namespace thetagate::engine
