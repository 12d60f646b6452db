// Rendering reports and comparing with a baseline (include/thetagate/report.h).
#include "thetagate/report.h"

#include "api/access.h"
#include "reports/baseline.h"
#include "reports/html_report.h"
#include "reports/json_report.h"
#include "reports/junit_report.h"
#include "reports/markdown_report.h"
#include "reports/report_file.h"
#include "reports/text_report.h"
#include "verifier/checking/shard.h"
#include "verifier/syntax/input_file.h"

namespace thetagate {

namespace detail {

Drift Access::make_drift(engine::DriftReport drift) {
  return Drift(std::make_shared<const Drift::Impl>(Drift::Impl{std::move(drift)}));
}

}  // namespace detail

Drift::Drift(std::shared_ptr<const Impl> impl) : impl_(std::move(impl)) {}
bool Drift::any() const { return impl_->drift.any(); }
size_t Drift::compared() const { return impl_->drift.compared; }
std::vector<std::string> Drift::changed_claims() const {
  std::vector<std::string> names;
  for (const engine::ClaimDrift& c : impl_->drift.claims) names.push_back(c.name);
  return names;
}

std::string render(const Report& report, Format format, const RenderOptions& options,
                   const Drift* changes) {
  const engine::RunResult& run = detail::Access::run(report);
  const engine::DriftReport* drift = changes ? &detail::Access::drift(*changes) : nullptr;
  switch (format) {
    case Format::kJson:
      return drift ? engine::render_json_with_drift(run, *drift) : engine::render_json(run);
    case Format::kJunit:
      return engine::render_junit(
          run, engine::JunitOptions{options.undecided_fails,
                                    options.drift_fails && drift ? drift : nullptr});
    case Format::kHtml:
      return engine::render_html(run, drift);
    case Format::kMarkdown:
      return engine::render_markdown(run);
    case Format::kBrief: {
      engine::TextStyle style;
      style.colour = options.colour;
      return engine::render_brief(run, style);
    }
    case Format::kText:
      break;
  }
  engine::TextStyle style;
  style.colour = options.colour;
  std::string text = engine::render_text(run, style);
  if (drift) text += engine::render_drift_text(*drift, style);
  return text;
}

Report read_json_report(const std::string& json_text, const std::string& display_name) {
  return detail::Access::make_report(engine::read_json_report(json_text, display_name));
}

Report read_json_report_file(const std::string& path) {
  std::string text = engine::read_input_file(
      path, engine::kMaxReportFileBytes, "baseline report",
      "give the JSON report of an earlier run: thetagate check --format json --out OLD.json");
  return read_json_report(text, path);
}

Report merge_shards(const std::vector<std::string>& paths) {
  std::vector<engine::RunResult> shards;
  for (const std::string& path : paths) {
    std::string text = engine::read_input_file(
        path, engine::kMaxReportFileBytes, "shard report",
        "give the JSON reports of 'thetagate check --shard K/N --format json'");
    shards.push_back(detail::Access::run(read_json_report(text, path)));
  }
  return detail::Access::make_report(engine::merge_shards(std::move(shards), paths));
}

void check_output_location(const std::string& out, bool folder) {
  engine::check_output_location(out, folder);
}

std::string write_files_whole(const std::vector<std::pair<std::string, std::string>>& files) {
  return engine::write_files_whole(files);
}

void remove_unfinished_reports() noexcept { engine::remove_unfinished_reports(); }

Drift drift_from_baseline(const Report& baseline, const Report& current) {
  return detail::Access::make_drift(
      engine::compare_runs(detail::Access::run(baseline), detail::Access::run(current)));
}

bool want_colour(int fd) { return engine::want_colour(fd); }

}  // namespace thetagate
