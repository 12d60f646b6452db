// Model against code: counted costs (from a costs file, or from a runner in
// the maintainer's own tests) compared exactly with T(n) under the claim's
// relation (docs/language.md, "Linking a claim to code").
#ifndef THETAGATE_VERIFIER_CHECKING_CODE_CHECK_H_
#define THETAGATE_VERIFIER_CHECKING_CODE_CHECK_H_

#include <cstdint>
#include <map>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "verifier/checking/result.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/model/claim.h"

namespace thetagate::engine {

// T(n) of one claim, compared with counted costs. Not thread-safe (one
// evaluator, memoised across sizes).
class CostModel {
 public:
  // Quotients are read as the claim's rounding says (both: floor and ceil,
  // and a cost must respect both readings).
  CostModel(const Claim& claim, ModelRelation relation, Budget budget = {});
  ~CostModel();

  // Sign of cost − T(n), exactly (a T(n) that is not an integer is never
  // equal). For rounding = both, the sign toward a violation. Throws
  // InputError when T(n) is undefined (no case line, a domain error),
  // BudgetExceeded.
  int compare(const BigInt& n, const BigInt& cost);
  // T(n) as text (the floor reading's first).
  std::string model_text(const BigInt& n);
  // For upper-bound and exact relations, a count every larger count breaks
  // the relation at n beyond doubt: the least, over the readings, of floor
  // T(n) (of the upper end of an interval's enclosure), 0 if that is
  // negative. nullopt for a lower bound. Throws as compare().
  std::optional<BigInt> allowed_max(const BigInt& n);
  // Renews each reading's step and time budgets (Evaluator::start_query).
  void start_query();
  // Whether sign(cost − T(n)) breaks the relation.
  bool violates(int sign) const;
  ModelRelation relation() const { return relation_; }

 private:
  ModelRelation relation_;
  std::vector<std::unique_ptr<Evaluator>> readings_;
  ExprPtr model_expr_;
  SourceText model_source_;
};

// Collects measurements into per-size rows: keeps, per n, the cost furthest
// toward a violation.
class CostRows {
 public:
  explicit CostRows(ModelRelation relation) : relation_(relation) {}
  // REQUIRES: sizes arrive in any order; `sign` from CostModel::compare.
  void add(const BigInt& n, const BigInt& cost, const std::string& model, int sign,
           const std::string& from);
  std::vector<CostRow> rows() const;

 private:
  struct Entry {
    CostRow row;
    BigInt cost;
  };
  ModelRelation relation_;
  // By n: a file of any order costs O(log sizes) per line (a sorted vector
  // made a descending file quadratic).
  std::map<BigInt, Entry> entries_;
};

// The costs file of `link`, resolved and confined: a relative path is read
// against the claim file's folder, and the file (after every symbolic link
// is followed) must lie in that folder's tree, or in `widened_root` when it
// is not empty. Throws InputError at the `costs` key for a path holding a
// control character or NUL, an absolute path (unless inside
// `widened_root`), a path that leaves the tree ("../x", a link pointing
// out), and for a file that does not exist. Returns the canonical path.
std::string confined_costs_path(const CodeLink& link, const std::string& widened_root);

// Reads the claim's costs file (confined_costs_path) and checks every line.
// Throws InputError for an unreadable file or a malformed line (file, line,
// column, hint), and for a size where T is undefined (located at that
// line). A message never quotes the file's content beyond a short excerpt:
// the file may be one its claim file named to leak it.
// `clock_limit` (seconds, 0 = no clock) replaces the hang guard of 600 s.
CodeResult check_costs_file(const Claim& claim, const std::string& widened_root = "",
                            std::optional<double> clock_limit = std::nullopt);

// check_costs_file's work on bytes already read (`bytes` stands for the
// file link.costs_path): every line checked. The same errors.
CodeResult check_costs_text(const Claim& claim, std::string bytes,
                            std::optional<double> clock_limit = std::nullopt);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_CHECKING_CODE_CHECK_H_
