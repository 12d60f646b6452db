// Exact evaluation through the public API (include/thetagate/evaluate.h).
#include "thetagate/evaluate.h"

#include "api/access.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/evaluation/size_expression.h"
#include "verifier/model/recurrence.h"

namespace thetagate {

Recurrence::Recurrence(std::shared_ptr<const Impl> impl) : impl_(std::move(impl)) {}

Recurrence Recurrence::parse(const std::string& text, const std::string& origin) {
  return Recurrence(
      std::make_shared<const Impl>(Impl{text, engine::recurrence_from_text(text, origin)}));
}

const std::string& Recurrence::text() const { return impl_->text; }
const std::string& Recurrence::function() const { return impl_->recurrence->main.name; }

struct Evaluator::Impl {
  explicit Impl(std::shared_ptr<const engine::Recurrence> r) : evaluator(std::move(r)) {}
  engine::Evaluator evaluator;
};

Evaluator::Evaluator(const Recurrence& recurrence)
    : impl_(std::make_unique<Impl>(detail::Access::recurrence(recurrence))) {}
Evaluator::~Evaluator() = default;
Evaluator::Evaluator(Evaluator&&) noexcept = default;
Evaluator& Evaluator::operator=(Evaluator&&) noexcept = default;

std::string Evaluator::value_at(const std::string& n) {
  engine::BigInt size = engine::evaluate_size(n, "<size>");
  impl_->evaluator.start_query();  // budgets per call, not per evaluator (evaluate.h)
  return impl_->evaluator.value_at(size).str();
}

std::string exact_size(const std::string& expression, const std::string& origin) {
  return engine::evaluate_size(expression, origin).str();
}

}  // namespace thetagate
