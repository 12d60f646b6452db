#include "verifier/evaluation/integer_kernel.h"

#include <algorithm>
#include <stdexcept>
#include <utility>

// How the kernel works. compile() translates each case line into nodes of a
// flat program (IntegerKernel::Node, children by index), refusing anything
// whose value could leave the integers. value_at() then walks the sizes
// exactly as Evaluator::top_down does (see "What a step is" in
// evaluator.cc) but evaluates nodes into GMP registers that are allocated
// once and reused (temp(depth) for intermediate results, arg_register(i) for
// the i-th pending call argument), and remembers values as raw limbs
// (LimbMemo). A call's value is read straight from the memo's limbs through
// a read-only mpz (LimbView::as_mpz): no copy.
//
// Each operation is the exact integer meaning the general path gives the
// same expression, so the two paths agree value for value:
//   floor(a/b), ceil(a/b)  GMP's fdiv/cdiv: rounding toward -inf / +inf,
//                          also for negative operands;
//   a mod b                GMP's fdiv_r: the sign of the divisor, as
//                          mod_value on the general path;
//   floor(lg v), ceil(lg v) from the bit length: for v >= 1 with b bits,
//                          2^(b-1) <= v < 2^b, so floor(lg v) = b - 1, and
//                          ceil(lg v) = b - 1 exactly when v is a power of 2,
//                          else b;
//   floor(sqrt v), ceil(sqrt v) mpz_sqrt (the floor), plus one unless v is a
//                          perfect square.
// What the general path reports as an error (lg 0, a zero divisor, no line
// applies, a call that does not shrink past the default base case) the
// kernel declines instead (KernelDeclines), and the general path redoes the
// size to name the problem with its location.

namespace thetagate::engine {

namespace {

enum class Op : uint8_t {
  kConst,
  kN,
  kSlot,
  kAdd,
  kSub,
  kMul,
  kNeg,
  kPow,
  kFloorDiv,
  kCeilDiv,
  kMod,
  kMin,
  kMax,
  kFloorLg,
  kCeilLg,
  kFloorSqrt,
  kCeilSqrt,  // of an integer: whole again
  kCompare,   // a comparison; Node::relation says which
  kAnd,
  kOr,
  kNot,
  kEven,
  kOdd,
};

constexpr size_t kRoot = ~size_t{0};
// As on the general path: past this size, a call that does not shrink is an
// error, not the default base case.
constexpr unsigned long kDefaultBaseLimit = 1ul << 16;
// Whole constant exponents up to this are compiled; larger ones are left to
// the general path's estimates.
constexpr uint64_t kMaxExponent = 1u << 20;

uint64_t bits_of(mpz_srcptr x) { return mpz_sgn(x) == 0 ? 0 : mpz_sizeinbase(x, 2); }

}  // namespace

// One operation of the compiled program; a and b index its operands in
// nodes_.
struct IntegerKernel::Node {
  Op op = Op::kConst;
  ExprKind relation = ExprKind::kEq;  // kCompare: kEq, kNe, kLt, kLe, kGt or kGe
  uint32_t a = 0, b = 0;
  // kConst: constant index; kSlot: call slot; kPow: exponent; with small_b:
  // the right operand's value.
  uint64_t k = 0;
  bool small_b = false;  // b is a constant in [1, ULONG_MAX]: GMP's _ui forms
  int shift = -1;        // with small_b: k = 2^shift, or -1
};

struct IntegerKernel::Line {
  std::optional<uint32_t> point;      // constant index of a point case T(c) = ...
  std::optional<uint32_t> condition;  // node
  std::vector<uint32_t> args;         // one node per call, in the line's call order
  uint32_t body = 0;
};

// A size on value_at()'s work stack; the root's size is the caller's n,
// every other size lives in args_[key] (its parent's argument register).
struct IntegerKernel::Frame {
  size_t key;          // index into args_ of the size, or kRoot
  size_t parent_slot;  // known_[parent_slot] receives the value, or kRoot
  size_t memo_size;    // when pushed, after the memo was asked for this size
  const Line* line = nullptr;
  size_t first_arg = 0;
};

// Translates case lines into nodes; refuses (nullopt) anything that could
// leave the integers.
class IntegerKernel::Compiler {
 public:
  Compiler(IntegerKernel& kernel, const Recurrence& r) : k_(kernel), r_(r) {}

  bool add_line(const CaseLine& source) {
    Line line;
    calls_ = &source.calls;
    if (source.point) line.point = constant(*source.point);
    if (source.condition) {
      std::optional<uint32_t> c = condition(*source.condition);
      if (!c) return false;
      line.condition = c;
    }
    for (const Expr* call : source.calls) {
      // T(n/2) reads the quotient as its floor, as call_argument_value does.
      const Expr& x = *call->args[0];
      std::optional<uint32_t> a = x.kind == ExprKind::kDiv ? quotient(x, Op::kFloorDiv) : value(x);
      if (!a) return false;
      line.args.push_back(*a);
    }
    std::optional<uint32_t> body = value(*source.body);
    if (!body) return false;
    line.body = *body;
    k_.lines_.push_back(std::move(line));
    return true;
  }

 private:
  uint32_t node(Op op, uint32_t a = 0, uint32_t b = 0, uint64_t k = 0) {
    Node n;
    n.op = op;
    n.a = a;
    n.b = b;
    n.k = k;
    k_.nodes_.push_back(n);
    return static_cast<uint32_t>(k_.nodes_.size() - 1);
  }

  uint32_t constant(const BigInt& c) {
    k_.constants_.push_back(c);
    return static_cast<uint32_t>(k_.constants_.size() - 1);
  }

  std::optional<uint32_t> binary(Op op, const Expr& a, const Expr& b) {
    std::optional<uint32_t> x = value(a);
    std::optional<uint32_t> y = x ? value(b) : std::nullopt;
    if (!y) return std::nullopt;
    uint32_t id = node(op, *x, *y);
    // A positive word constant on the right (n/2, n - 1, 3n) uses GMP's _ui
    // forms, and a power of two a shift: the common shapes of divide and
    // conquer never touch a second register.
    bool arithmetic = op == Op::kAdd || op == Op::kSub || op == Op::kMul || op == Op::kFloorDiv ||
                      op == Op::kCeilDiv || op == Op::kMod;
    const Node& right = k_.nodes_[*y];
    if (arithmetic && right.op == Op::kConst) {
      mpz_srcptr c = k_.constants_[right.k].backend().data();
      if (mpz_sgn(c) > 0 && mpz_fits_ulong_p(c)) {
        Node& n = k_.nodes_[id];
        n.small_b = true;
        n.k = mpz_get_ui(c);
        if ((n.k & (n.k - 1)) == 0) n.shift = __builtin_ctzll(n.k);
      }
    }
    return id;
  }

  std::optional<uint32_t> quotient(const Expr& div, Op op) {
    return binary(op, *div.args[0], *div.args[1]);
  }

  std::optional<uint32_t> value(const Expr& e) {
    switch (e.kind) {
      case ExprKind::kNumber: {
        if (boost::multiprecision::denominator(e.number) != 1) return std::nullopt;
        return node(Op::kConst, 0, 0, constant(boost::multiprecision::numerator(e.number)));
      }
      case ExprKind::kVariable:
        return node(Op::kN);
      case ExprKind::kAdd:
        return binary(Op::kAdd, *e.args[0], *e.args[1]);
      case ExprKind::kSub:
        return binary(Op::kSub, *e.args[0], *e.args[1]);
      case ExprKind::kMul:
        return binary(Op::kMul, *e.args[0], *e.args[1]);
      case ExprKind::kNeg: {
        std::optional<uint32_t> x = value(*e.args[0]);
        if (!x) return std::nullopt;
        return node(Op::kNeg, *x);
      }
      case ExprKind::kPow: {
        const Expr& y = *e.args[1];
        if (y.kind != ExprKind::kNumber || !y.has_small || y.small < 0 ||
            static_cast<uint64_t>(y.small) > kMaxExponent) {
          return std::nullopt;
        }
        std::optional<uint32_t> x = value(*e.args[0]);
        if (!x) return std::nullopt;
        return node(Op::kPow, *x, 0, static_cast<uint64_t>(y.small));
      }
      case ExprKind::kCall:
        return call(e);
      default:
        return std::nullopt;  // bare quotients may be fractions; conditions
    }
  }

  std::optional<uint32_t> call(const Expr& e) {
    if (e.name == r_.main.name) {
      auto it = std::find(calls_->begin(), calls_->end(), &e);
      if (it == calls_->end()) return std::nullopt;
      return node(Op::kSlot, 0, 0, static_cast<uint64_t>(it - calls_->begin()));
    }
    if (r_.helpers.count(e.name) != 0) return std::nullopt;
    if ((e.name == "floor" || e.name == "ceil") && e.args.size() == 1) {
      const Expr& x = *e.args[0];
      if (x.kind == ExprKind::kDiv) {
        return quotient(x, e.name == "floor" ? Op::kFloorDiv : Op::kCeilDiv);
      }
      // lg and sqrt of an integer, rounded: bit lengths and integer roots.
      bool lg = x.kind == ExprKind::kCall && (x.name == "lg" || x.name == "log2");
      bool sqrt = x.kind == ExprKind::kCall && x.name == "sqrt";
      if ((lg || sqrt) && x.args.size() == 1) {
        std::optional<uint32_t> inner = value(*x.args[0]);
        if (!inner) return std::nullopt;
        bool floor = e.name == "floor";
        Op op =
            lg ? (floor ? Op::kFloorLg : Op::kCeilLg) : (floor ? Op::kFloorSqrt : Op::kCeilSqrt);
        return node(op, *inner);
      }
      return value(x);  // the floor of an integer is itself
    }
    if (e.name == "mod" && e.args.size() == 2) return binary(Op::kMod, *e.args[0], *e.args[1]);
    if ((e.name == "min" || e.name == "max") && !e.args.empty()) {
      Op op = e.name == "min" ? Op::kMin : Op::kMax;
      std::optional<uint32_t> best = value(*e.args[0]);
      for (size_t i = 1; best && i < e.args.size(); ++i) {
        std::optional<uint32_t> next = value(*e.args[i]);
        best = next ? std::optional<uint32_t>(node(op, *best, *next)) : std::nullopt;
      }
      return best;
    }
    return std::nullopt;  // lg, ln, sqrt, log: irrational in general
  }

  std::optional<uint32_t> condition(const Expr& e) {
    switch (e.kind) {
      case ExprKind::kAnd:
      case ExprKind::kOr: {
        std::optional<uint32_t> x = condition(*e.args[0]);
        std::optional<uint32_t> y = x ? condition(*e.args[1]) : std::nullopt;
        if (!y) return std::nullopt;
        return node(e.kind == ExprKind::kAnd ? Op::kAnd : Op::kOr, *x, *y);
      }
      case ExprKind::kNot:
      case ExprKind::kEven:
      case ExprKind::kOdd: {
        std::optional<uint32_t> x =
            e.kind == ExprKind::kNot ? condition(*e.args[0]) : value(*e.args[0]);
        if (!x) return std::nullopt;
        Op op = e.kind == ExprKind::kNot    ? Op::kNot
                : e.kind == ExprKind::kEven ? Op::kEven
                                            : Op::kOdd;
        return node(op, *x);
      }
      case ExprKind::kEq:
      case ExprKind::kNe:
      case ExprKind::kLt:
      case ExprKind::kLe:
      case ExprKind::kGt:
      case ExprKind::kGe: {
        std::optional<uint32_t> id = binary(Op::kCompare, *e.args[0], *e.args[1]);
        if (id) k_.nodes_[*id].relation = e.kind;
        return id;
      }
      default:
        return std::nullopt;
    }
  }

  IntegerKernel& k_;
  const Recurrence& r_;
  const std::vector<const Expr*>* calls_ = nullptr;
};

IntegerKernel::IntegerKernel() = default;
IntegerKernel::~IntegerKernel() = default;

std::unique_ptr<IntegerKernel> IntegerKernel::compile(const Recurrence& r,
                                                      const NumericContext& ctx) {
  // All or nothing: one line that may leave the integers (a helper, lg n
  // unrounded, a fraction) and the whole recurrence stays on the general
  // path, so a size never mixes the two.
  std::unique_ptr<IntegerKernel> kernel(new IntegerKernel());
  kernel->default_base_ = r.default_base;
  kernel->ctx_ = ctx;
  Compiler compiler(*kernel, r);
  for (const CaseLine* line : r.main.lines_in_order()) {
    if (!compiler.add_line(*line)) return nullptr;
  }
  // Point cases come first and exclude each other: sorted by their point,
  // select() finds one by binary search (a claim may list tens of thousands).
  auto& lines = kernel->lines_;
  auto points_end = std::partition_point(lines.begin(), lines.end(),
                                         [](const Line& l) { return l.point.has_value(); });
  const std::vector<BigInt>& constants = kernel->constants_;
  std::sort(lines.begin(), points_end, [&constants](const Line& a, const Line& b) {
    return constants[*a.point] < constants[*b.point];
  });
  mpz_set_ui(kernel->one_.z, 1);
  return kernel;
}

// Registers grow on first use and are kept: after the first few sizes an
// evaluation allocates only when a value outgrows its register's limbs.
mpz_ptr IntegerKernel::temp(size_t depth) {
  while (temps_.size() <= depth) temps_.push_back(std::make_unique<Register>());
  return temps_[depth]->z;
}

mpz_ptr IntegerKernel::arg_register(size_t index) {
  while (args_.size() <= index) args_.push_back(std::make_unique<Register>());
  return args_[index]->z;
}

void IntegerKernel::check_result_bits(mpz_srcptr x) const {
  // The limb count bounds the bits from above: exact only near the limit.
  if (mpz_size(x) * GMP_NUMB_BITS > ctx_.max_value_bits) check_bits(bits_of(x), ctx_);
}

// `depth` is the first temp() register this subtree may use: an operand
// evaluated into temp(depth) must not be overwritten while its sibling is
// evaluated, so the sibling gets depth + 1.
mpz_srcptr IntegerKernel::operand(uint32_t id, mpz_ptr scratch, size_t depth, mpz_ptr view) {
  const Node& x = nodes_[id];
  switch (x.op) {
    case Op::kConst:
      return constants_[x.k].backend().data();
    case Op::kN:
      return current_n_;
    case Op::kSlot:
      return current_slots_[x.k].as_mpz(view);
    default:
      eval(id, scratch, depth);
      return scratch;
  }
}

void IntegerKernel::eval(uint32_t id, mpz_ptr out, size_t depth) {
  const Node& x = nodes_[id];
  mpz_t view_a, view_b;
  switch (x.op) {
    case Op::kConst:
    case Op::kN:
    case Op::kSlot:
      mpz_set(out, operand(id, out, depth, view_a));
      return;
    case Op::kNeg:
      mpz_neg(out, operand(x.a, out, depth, view_a));
      return;
    case Op::kFloorLg:
    case Op::kCeilLg: {
      mpz_srcptr v = operand(x.a, out, depth, view_a);
      if (mpz_sgn(v) <= 0) throw KernelDeclines{};  // lg of 0 or less: the general path says so
      // floor(lg v) = bits(v) - 1; ceil(lg v) = bits(v - 1), 0 at v = 1.
      uint64_t bits = bits_of(v);
      bool power_of_two = mpz_scan1(v, 0) == bits - 1;
      uint64_t r = x.op == Op::kFloorLg || power_of_two ? bits - 1 : bits;
      mpz_set_ui(out, static_cast<unsigned long>(r));
      return;
    }
    case Op::kFloorSqrt:
    case Op::kCeilSqrt: {
      mpz_srcptr v = operand(x.a, out, depth, view_a);
      if (mpz_sgn(v) < 0) throw KernelDeclines{};  // the root of a negative number
      bool exact = mpz_perfect_square_p(v) != 0;
      mpz_sqrt(out, v);
      if (x.op == Op::kCeilSqrt && !exact) mpz_add_ui(out, out, 1);
      return;
    }
    case Op::kPow: {
      mpz_srcptr base = operand(x.a, out, depth, view_a);
      // Estimate first, as the general path does: a huge power is a budget
      // error, never an allocation failure. |base| >= 2^(bits-1), so
      // |base^k| has at least (bits - 1) k + 1 bits: over the limit for sure
      // when that estimate is.
      if (mpz_cmpabs_ui(base, 1) > 0) {
        uint64_t bits = bits_of(base);
        check_bits((bits > 1 ? bits - 1 : 1) * x.k, ctx_);
      }
      mpz_pow_ui(out, base, x.k);
      check_result_bits(out);
      return;
    }
    default:
      break;
  }
  mpz_srcptr a = operand(x.a, out, depth, view_a);
  if (x.small_b) {  // a positive machine-word constant on the right
    unsigned long k = x.k;
    switch (x.op) {
      case Op::kAdd:
        mpz_add_ui(out, a, k);
        break;
      case Op::kSub:
        mpz_sub_ui(out, a, k);
        break;
      case Op::kMul:
        // bits(a k) <= bits(a) + bits(k): checked before GMP allocates.
        check_bits(bits_of(a) + (64 - static_cast<uint64_t>(__builtin_clzl(k))), ctx_);
        mpz_mul_ui(out, a, k);
        break;
      case Op::kFloorDiv:
        if (x.shift >= 0)
          mpz_fdiv_q_2exp(out, a, static_cast<mp_bitcnt_t>(x.shift));
        else
          mpz_fdiv_q_ui(out, a, k);
        break;
      case Op::kCeilDiv:
        if (x.shift >= 0)
          mpz_cdiv_q_2exp(out, a, static_cast<mp_bitcnt_t>(x.shift));
        else
          mpz_cdiv_q_ui(out, a, k);
        break;
      case Op::kMod:
        if (x.shift >= 0)
          mpz_fdiv_r_2exp(out, a, static_cast<mp_bitcnt_t>(x.shift));
        else
          mpz_set_ui(out, mpz_fdiv_ui(a, k));
        break;
      default:
        throw InternalError("", "a word constant on an operation that takes none");
    }
    check_result_bits(out);
    return;
  }
  mpz_srcptr b = operand(x.b, temp(depth), depth + 1, view_b);
  switch (x.op) {
    case Op::kAdd:
      mpz_add(out, a, b);
      break;
    case Op::kSub:
      mpz_sub(out, a, b);
      break;
    case Op::kMul:
      check_bits(bits_of(a) + bits_of(b), ctx_);
      mpz_mul(out, a, b);
      break;
    case Op::kFloorDiv:
    case Op::kCeilDiv:
    case Op::kMod:
      if (mpz_sgn(b) == 0) throw KernelDeclines{};  // the general path names the error
      if (x.op == Op::kFloorDiv)
        mpz_fdiv_q(out, a, b);
      else if (x.op == Op::kCeilDiv)
        mpz_cdiv_q(out, a, b);
      else
        mpz_fdiv_r(out, a, b);  // the sign of the divisor, as mod_value
      break;
    case Op::kMin:
      mpz_set(out, mpz_cmp(b, a) < 0 ? b : a);
      break;
    case Op::kMax:
      mpz_set(out, mpz_cmp(b, a) > 0 ? b : a);
      break;
    default:
      throw InternalError("", "a condition compiled as a value");
  }
  check_result_bits(out);
}

bool IntegerKernel::test(uint32_t id, size_t depth) {
  const Node& x = nodes_[id];
  switch (x.op) {
    case Op::kAnd:
      return test(x.a, depth) && test(x.b, depth);
    case Op::kOr:
      return test(x.a, depth) || test(x.b, depth);
    case Op::kNot:
      return !test(x.a, depth);
    case Op::kEven:
    case Op::kOdd: {
      mpz_t view;
      mpz_srcptr v = operand(x.a, temp(depth), depth + 1, view);
      return (mpz_even_p(v) != 0) == (x.op == Op::kEven);
    }
    default:
      break;
  }
  if (x.op != Op::kCompare) throw InternalError("", "a value compiled as a condition");
  mpz_t view_a, view_b;
  mpz_srcptr a = operand(x.a, temp(depth), depth + 1, view_a);
  mpz_srcptr b = operand(x.b, temp(depth + 1), depth + 2, view_b);
  return comparison_holds(x.relation, mpz_cmp(a, b));
}

// The order of select_case on the general path: a point case for n if one
// exists (binary search over the sorted points), else the first conditional
// line that holds, else the line without a condition (last in lines_).
const IntegerKernel::Line* IntegerKernel::select(mpz_srcptr n) {
  current_n_ = n;
  auto points_end = std::partition_point(lines_.begin(), lines_.end(),
                                         [](const Line& l) { return l.point.has_value(); });
  auto at = std::lower_bound(lines_.begin(), points_end, n, [this](const Line& l, mpz_srcptr x) {
    return mpz_cmp(constants_[*l.point].backend().data(), x) < 0;
  });
  if (at != points_end && mpz_cmp(constants_[*at->point].backend().data(), n) == 0) return &*at;
  for (auto it = points_end; it != lines_.end(); ++it) {
    if (!it->condition || test(*it->condition, 0)) return &*it;
  }
  throw KernelDeclines{};  // no line applies: the general path says so
}

// Only a new entry is charged to the memo budget, with the bit lengths the
// general path would charge for the same key and value.
LimbView IntegerKernel::remember(mpz_srcptr key, mpz_srcptr value, KernelHooks& hooks) {
  size_t before = memo_.size();
  LimbView stored = memo_.insert(key, value);
  if (memo_.size() != before) hooks.remembered(bits_of(key), bits_of(value), memo_.size());
  return stored;
}

mpz_srcptr IntegerKernel::key_of(const Frame& f, mpz_srcptr root) const {
  return f.key == kRoot ? root : args_[f.key]->z;
}

void IntegerKernel::value_at(mpz_srcptr n, mpz_ptr out, KernelHooks& hooks) {
  // The same walk as Evaluator::top_down: a frame is expanded once (one
  // step), its calls' arguments are computed, unknown ones are pushed, and
  // the body is evaluated when they are all remembered. Steps are charged
  // through `hooks` at the same points as there, with the same pending
  // bytes, so both paths count the same steps and memory. A decline may
  // come after some steps were charged; the general path then charges its
  // own walk of the size again (the sizes the kernel remembered stay: they
  // are exact).
  LimbView result;
  mpz_t view;
  if (memo_.find(n, result)) {
    mpz_set(out, result.as_mpz(view));
    return;
  }
  frames_.clear();
  known_.clear();
  size_t arg_count = 0;
  // Bytes held by the pending arguments, counted against the memory budget.
  uint64_t pending_bytes = 0;
  auto bytes_of = [](mpz_srcptr z) { return mpz_size(z) * sizeof(mp_limb_t) + kPendingSizeBytes; };
  auto drop_args = [&](size_t from) {
    for (size_t i = from; i < arg_count; ++i) pending_bytes -= bytes_of(args_[i]->z);
    arg_count = from;
  };
  auto deliver = [&](size_t slot, LimbView value) {
    if (slot == kRoot)
      result = value;
    else
      known_[slot] = value;
  };
  frames_.push_back({kRoot, kRoot, memo_.size()});
  while (!frames_.empty()) {
    Frame& frame = frames_.back();
    mpz_srcptr m = key_of(frame, n);
    if (frame.line == nullptr) {
      // Pushed by two parents, a size is evaluated once; unless something was
      // remembered since it was pushed, the memo still lacks it.
      // (An unchanged memo size skips the hash lookup; the outcome is the
      // general walk's memo_.find, so the steps are the same.)
      LimbView known;
      if (memo_.size() != frame.memo_size && memo_.find(m, known)) {
        deliver(frame.parent_slot, known);
        frames_.pop_back();
        continue;
      }
      hooks.charge_step(pending_bytes + frames_.size() * sizeof(Frame));
      frame.line = select(m);
      frame.first_arg = arg_count;
      bool base = false;
      for (uint32_t a : frame.line->args) {
        mpz_ptr arg = arg_register(arg_count);
        current_n_ = m;
        eval(a, arg, 0);
        if (mpz_sgn(arg) < 0 || mpz_cmp(arg, m) >= 0) {
          // The default base case T(m) = 1, where the general path applies
          // it; anything else is an error the general path reports.
          if (!default_base_ || mpz_cmp_ui(m, kDefaultBaseLimit) >= 0) throw KernelDeclines{};
          deliver(frame.parent_slot, remember(m, one_.z, hooks));
          base = true;
          break;
        }
        pending_bytes += bytes_of(arg);
        ++arg_count;
      }
      if (base) {
        drop_args(frame.first_arg);
        frames_.pop_back();
        continue;
      }
      // Read everything from `frame` first: pushing may move the stack.
      size_t first = frame.first_arg;
      known_.resize(arg_count);
      for (size_t i = first; i < arg_count; ++i) {
        if (!memo_.find(args_[i]->z, known_[i])) known_[i] = LimbView{};
      }
      for (size_t i = first; i < arg_count; ++i) {
        if (known_[i].limbs == nullptr) frames_.push_back({i, i, memo_.size()});
      }
      continue;
    }
    // Every child is remembered: evaluate the body with the calls' values
    // read in place from the memo (current_slots_).
    Frame done = frame;
    frames_.pop_back();
    for (size_t i = done.first_arg; i < arg_count; ++i) {
      if (known_[i].limbs == nullptr && !memo_.find(args_[i]->z, known_[i])) {
        throw InternalError("", "a finished subproblem is not remembered");
      }
    }
    current_n_ = m;
    current_slots_ = known_.data() + done.first_arg;
    eval(done.line->body, value_.z, 0);
    current_slots_ = nullptr;
    deliver(done.parent_slot, remember(m, value_.z, hooks));
    drop_args(done.first_arg);
    known_.resize(arg_count);
  }
  mpz_set(out, result.as_mpz(view));
}

}  // namespace thetagate::engine
