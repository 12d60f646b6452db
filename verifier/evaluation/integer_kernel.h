// The evaluator's fast path for integer recurrences. When every case line
// of the recurrence stays in the integers (n, whole constants, + - *, whole
// constant powers, floor/ceil of quotients, of lg and of sqrt, quotients
// inside T(...), mod, min, max, comparisons, even/odd; no helpers, bare
// logarithms or roots), it is compiled into a small program over reused GMP
// registers, and subproblems are remembered as raw limbs (LimbMemo). It
// expands exactly the subproblems the general evaluator would, in the same
// order, so step counts and memo accounting match the general path's
// (except where that path redoes a size at higher interval precision: the
// kernel is exact and never needs to); it avoids the general path's
// allocation and shared ownership per operation.
//
// Anything unusual at run time (a call that does not shrink past the
// default base case, no applicable line, mod or quotient by zero) throws
// KernelDeclines; the evaluator then redoes that size on the general path,
// which reports the error with its location.
#ifndef THETAGATE_VERIFIER_EVALUATION_INTEGER_KERNEL_H_
#define THETAGATE_VERIFIER_EVALUATION_INTEGER_KERNEL_H_

#include <gmp.h>

#include <cstdint>
#include <memory>
#include <optional>
#include <vector>

#include "verifier/evaluation/limb_memo.h"
#include "verifier/model/recurrence.h"
#include "verifier/numbers/number.h"
#include "verifier/numbers/value.h"

namespace thetagate::engine {

// The memory budget's nominal costs, the same on both evaluation paths (so
// a budget ends the same evaluation whichever path ran it), beyond the
// limbs of the numbers themselves: one remembered value (its key, the
// table's index and entry, the allocator's headers) and one size waiting
// on the work stack (its slot, its frame, its allocation). Calibrated on
// long top-down chains (T(n - floor(sqrt(n))) from 10^12 and 2^64) so that
// the process's peak resident memory stays close to the budget.
inline constexpr uint64_t kMemoEntryBytes = 184;
inline constexpr uint64_t kPendingSizeBytes = 96;

struct KernelDeclines {};

// What the evaluator keeps: the step budget and the memo budget.
class KernelHooks {
 public:
  virtual ~KernelHooks() = default;
  // One subproblem expanded, while `pending_bytes` are held by the sizes
  // waiting on the work stack (counted against the memory budget). May
  // throw BudgetExceeded.
  virtual void charge_step(uint64_t pending_bytes) = 0;
  // One value remembered; memo_size counts them. May throw BudgetExceeded.
  virtual void remembered(uint64_t key_bits, uint64_t value_bits, size_t memo_size) = 0;
};

class IntegerKernel {
 public:
  // The compiled recurrence, or null when some line leaves the integers.
  // ctx.max_value_bits limits every value, as on the general path.
  static std::unique_ptr<IntegerKernel> compile(const Recurrence& r, const NumericContext& ctx);
  ~IntegerKernel();
  IntegerKernel(const IntegerKernel&) = delete;
  IntegerKernel& operator=(const IntegerKernel&) = delete;

  // T(n) into `out`. REQUIRES: n >= 0. Throws KernelDeclines, BudgetExceeded.
  void value_at(mpz_srcptr n, mpz_ptr out, KernelHooks& hooks);

  size_t memo_size() const { return memo_.size(); }
  void clear_memo() { memo_.clear(); }

 private:
  struct Node;
  struct Line;
  struct Frame;
  class Compiler;
  // A GMP integer initialised once and reused: no allocation once warm.
  struct Register {
    mpz_t z;
    Register() { mpz_init(z); }
    ~Register() { mpz_clear(z); }
  };
  IntegerKernel();

  mpz_ptr temp(size_t depth);
  mpz_ptr arg_register(size_t index);
  mpz_srcptr key_of(const Frame& f, mpz_srcptr root) const;
  // The value of a leaf (n, a constant, a call's value) without a copy;
  // any other node is evaluated into scratch. view backs a call's value.
  mpz_srcptr operand(uint32_t node, mpz_ptr scratch, size_t depth, mpz_ptr view);
  void eval(uint32_t node, mpz_ptr out, size_t depth);
  bool test(uint32_t node, size_t depth);
  const Line* select(mpz_srcptr n);
  void check_result_bits(mpz_srcptr x) const;
  LimbView remember(mpz_srcptr key, mpz_srcptr value, KernelHooks& hooks);

  std::vector<Node> nodes_;
  std::vector<Line> lines_;  // in the order select_case tries them
  std::vector<BigInt> constants_;
  bool default_base_ = false;
  NumericContext ctx_;
  LimbMemo memo_;
  std::vector<std::unique_ptr<Register>> temps_;
  std::vector<std::unique_ptr<Register>> args_;
  Register value_;  // a body's result
  Register one_;    // the default base case's value
  // The work stack of value_at(), kept for its capacity.
  std::vector<Frame> frames_;
  std::vector<LimbView> known_;  // known_[i]: args_[i]'s value; limbs null if not yet
  // While an expression is evaluated: n and the values of its line's calls.
  mpz_srcptr current_n_ = nullptr;
  const LimbView* current_slots_ = nullptr;
};

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_EVALUATION_INTEGER_KERNEL_H_
