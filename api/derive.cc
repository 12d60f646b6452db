// Derivations through the public API (include/thetagate/derive.h).
#include "thetagate/derive.h"

#include "api/access.h"
#include "reports/derivation_report.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/model/recurrence.h"

namespace thetagate {

namespace detail {

Derivation Access::make_derivation(engine::Derivation d) {
  return Derivation(std::make_shared<const Derivation::Impl>(Derivation::Impl{std::move(d)}));
}

}  // namespace detail

Derivation::Derivation(std::shared_ptr<const Impl> impl) : impl_(std::move(impl)) {}
bool Derivation::derived() const { return impl_->derivation.derived_class(); }
const std::string& Derivation::bound() const { return impl_->derivation.derived; }
const std::string& Derivation::method() const { return impl_->derivation.method; }
const std::vector<std::string>& Derivation::steps() const { return impl_->derivation.steps; }
const std::vector<std::string>& Derivation::failed_hypotheses() const {
  return impl_->derivation.failed_hypotheses;
}
const std::vector<std::string>& Derivation::notes() const { return impl_->derivation.notes; }
std::string Derivation::to_text() const {
  return engine::render_derivation_text(impl_->derivation);
}
std::string Derivation::to_json() const {
  return engine::render_derivation_json(impl_->derivation);
}

Derivation derive(const Recurrence& recurrence) {
  const engine::Recurrence& r = *detail::Access::recurrence(recurrence);
  engine::check_calls_shrink(r);  // as evaluation and checks do
  return detail::Access::make_derivation(engine::derive(r));
}

Derivation derive(const std::string& recurrence_text) {
  return derive(Recurrence::parse(recurrence_text));
}

}  // namespace thetagate
