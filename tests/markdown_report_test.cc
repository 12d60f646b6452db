// The Markdown report (reports/markdown_report.h), read back with a real
// CommonMark parser: cmark-gfm, the GitHub flavour, whose table extension
// is what pull-request comments render. No hand-written half-parser: the
// table's cells and the details blocks are checked as the parser sees them.
#include "reports/markdown_report.h"

#include <cmark-gfm-core-extensions.h>
#include <cmark-gfm.h>
#include <gtest/gtest.h>

#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <memory>
#include <random>
#include <sstream>
#include <string>
#include <vector>

#include "tests/support/test_support.h"
#include "verifier/syntax/terminal_text.h"

namespace thetagate::engine {
namespace {

using test_support::CommandResult;
using test_support::run_shell;

// The document cmark-gfm reads from `markdown`, and its HTML.
struct Parsed {
  std::vector<std::vector<std::string>> rows;  // every table row's cells, as plain text
  int tables = 0;
  std::vector<std::string> html_blocks;
  std::string html;
};

std::string plain_text(cmark_node* node) {
  std::string text;
  for (cmark_node* child = cmark_node_first_child(node); child != nullptr;
       child = cmark_node_next(child)) {
    std::string type = cmark_node_get_type_string(child);
    if (type == "text" || type == "code" || type == "html_inline") {
      text += cmark_node_get_literal(child);
    } else {
      text += plain_text(child);
    }
  }
  return text;
}

void collect(cmark_node* node, Parsed& parsed) {
  std::string type = cmark_node_get_type_string(node);
  if (type == "table") ++parsed.tables;
  if (type == "html_block") parsed.html_blocks.push_back(cmark_node_get_literal(node));
  if (type == "table_row" || type == "table_header") {
    std::vector<std::string> cells;
    for (cmark_node* cell = cmark_node_first_child(node); cell != nullptr;
         cell = cmark_node_next(cell)) {
      cells.push_back(plain_text(cell));
    }
    parsed.rows.push_back(cells);
    return;
  }
  for (cmark_node* child = cmark_node_first_child(node); child != nullptr;
       child = cmark_node_next(child)) {
    collect(child, parsed);
  }
}

Parsed parse_markdown(const std::string& markdown) {
  cmark_gfm_core_extensions_ensure_registered();
  std::unique_ptr<cmark_parser, decltype(&cmark_parser_free)> parser(
      cmark_parser_new(CMARK_OPT_DEFAULT), cmark_parser_free);
  cmark_syntax_extension* table = cmark_find_syntax_extension("table");
  EXPECT_NE(table, nullptr);
  cmark_parser_attach_syntax_extension(parser.get(), table);
  cmark_parser_feed(parser.get(), markdown.data(), markdown.size());
  std::unique_ptr<cmark_node, decltype(&cmark_node_free)> document(
      cmark_parser_finish(parser.get()), cmark_node_free);
  Parsed parsed;
  collect(document.get(), parsed);
  // Raw HTML passed through (as forges pass <details>), so that the test
  // sees whatever markup the report would put on the page.
  char* html = cmark_render_html(document.get(), CMARK_OPT_UNSAFE,
                                 cmark_parser_get_syntax_extensions(parser.get()));
  parsed.html = html;
  std::free(html);
  return parsed;
}

std::string read_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::stringstream text;
  text << in.rdbuf();
  return text.str();
}

ClaimResult claim(const std::string& name, Verdict verdict) {
  ClaimResult c;
  c.name = name;
  c.file = "claims/orchard.toml";
  c.line = 3;
  c.verdict = verdict;
  c.claimed = "O(n)";
  c.derived = "Theta(n lg n)";
  c.method = "master theorem, case 2";
  return c;
}

// Names a stranger could write: table syntax, raw HTML, emphasis, code,
// links, a heading, math and a terminal escape.
const std::vector<std::string> kNames = {
    "orchard::split | merge",
    "<img src=x onerror=alert(1)>",
    "**bold** `code` [link](https://example.invalid) _x_ ~~y~~",
    "# heading $x$ \\ back & amp;",
    "\x1b]0;title\x07 plain",
};

RunResult strange_run() {
  RunResult run;
  run.seed = 42;
  ClaimResult holds = claim(kNames[0], Verdict::kHolds);
  holds.claimed = "Theta(n lg n)";
  holds.basis.kind = BasisKind::kDerivationAgrees;
  holds.basis.theorem = TheoremEvidence{};
  holds.basis.theorem->method = "master theorem, case 2";
  run.claims.push_back(holds);
  ClaimResult refuted = claim(kNames[1], Verdict::kRefuted);
  Witness w;
  w.n = BigInt(1) << 19;
  w.ratio = 10.3;
  w.value = "5505025";
  w.bound = "524288";
  refuted.witnesses.push_back(w);
  refuted.steps = {"a = 2, b = 2: n^(log_b a) = n", "f(n) = n is Theta(n^(log_b a))"};
  run.claims.push_back(refuted);
  ClaimResult undecided = claim(kNames[2], Verdict::kUndecided);
  undecided.failed_hypotheses = {"Akra–Bazzi: <the driving function> is not polynomially bounded"};
  undecided.notes = {"n/2 is read as floor(n/2) | ceil"};
  run.claims.push_back(undecided);
  ClaimResult error = claim(kNames[3], Verdict::kError);
  Diagnostic d;
  d.where.file = "claims/orchard.toml";
  d.where.line = 9;
  d.where.column = 14;
  d.message = "unknown name 'Theta' <b>";
  d.hint = "asymptotic classes belong in 'bound' | here";
  error.error = d;
  run.claims.push_back(error);
  run.claims.push_back(claim(kNames[4], Verdict::kUndecided));
  return run;
}

TEST(MarkdownReport, OneTableRowPerClaimWithTheNamesAsTextNotMarkup) {
  RunResult run = strange_run();
  Parsed parsed = parse_markdown(render_markdown(run));
  ASSERT_EQ(parsed.tables, 1);
  ASSERT_EQ(parsed.rows.size(), run.claims.size() + 1);
  EXPECT_EQ(parsed.rows[0], (std::vector<std::string>{"Verdict", "Claim", "Claimed", "Derived",
                                                      "Proof or witness"}));
  for (size_t i = 0; i < run.claims.size(); ++i) {
    const std::vector<std::string>& row = parsed.rows[i + 1];
    ASSERT_EQ(row.size(), 5u) << i;
    EXPECT_EQ(row[0], verdict_name(run.claims[i].verdict));
    // Read back exactly as written (control characters written out): no
    // cell split at '|', no emphasis, link, code or HTML consumed.
    EXPECT_EQ(row[1], escape_controls(kNames[i])) << i;
  }
  EXPECT_EQ(parsed.rows[1][4], "proof: master theorem, case 2");
  EXPECT_EQ(parsed.rows[2][2], "O(n)");
  EXPECT_EQ(parsed.rows[2][3], "Theta(n lg n) by master theorem, case 2");
  EXPECT_EQ(parsed.rows[2][4], "witness n = 2^19: T(n)/g(n) = 10.3");
  EXPECT_EQ(parsed.rows[4][4],
            "claims/orchard.toml:9:14: unknown name 'Theta' <b>");  // the located error
}

TEST(MarkdownReport, NoStrangersMarkupReachesTheRenderedPage) {
  Parsed parsed = parse_markdown(render_markdown(strange_run()));
  EXPECT_EQ(parsed.html.find("<img"), std::string::npos) << parsed.html;
  EXPECT_EQ(parsed.html.find("<b>"), std::string::npos) << parsed.html;
  EXPECT_EQ(parsed.html.find("<strong>bold"), std::string::npos) << parsed.html;
  EXPECT_EQ(parsed.html.find("<a href"), std::string::npos) << parsed.html;
  EXPECT_EQ(parsed.html.find("<h1"), std::string::npos) << parsed.html;
  EXPECT_EQ(parsed.html.find('\x1b'), std::string::npos);
  EXPECT_EQ(parsed.html.find('\x07'), std::string::npos);
  EXPECT_NE(parsed.html.find("&lt;img src=x"), std::string::npos) << parsed.html;
}

TEST(MarkdownReport, ADetailsBlockForEachClaimThatDidNotHold) {
  std::string markdown = render_markdown(strange_run());
  Parsed parsed = parse_markdown(markdown);
  int opened = 0, closed = 0;
  for (const std::string& block : parsed.html_blocks) {
    if (block.rfind("<details>\n<summary>", 0) == 0) {
      ++opened;
      // The summary is HTML-escaped: the name's markup stays text.
      EXPECT_EQ(block.find("<img"), std::string::npos) << block;
    }
    if (block.rfind("</details>", 0) == 0) ++closed;
  }
  EXPECT_EQ(opened, 4);  // refuted, undecided, error, undecided; not the holds
  EXPECT_EQ(closed, 4);
  EXPECT_NE(parsed.html.find("<summary>refuted: &lt;img src=x onerror=alert(1)&gt;</summary>"),
            std::string::npos)
      << parsed.html;
  // The details carry the derivation steps, witnesses, reasons and notes.
  for (const char* text :
       {"a = 2, b = 2: n^(log_b a) = n", "n = 2^19 (upper side, T(n)/g(n) = 10.3)",
        "Akra–Bazzi: &lt;the driving function&gt; is not polynomially bounded",
        "n/2 is read as floor(n/2) | ceil", "Hint: asymptotic classes belong in 'bound' | here"}) {
    EXPECT_NE(parsed.html.find(text), std::string::npos) << text << "\n" << parsed.html;
  }
}

// Any text of letters, digits, spaces and ASCII punctuation, escaped by
// markdown_text, reads back from a table cell as itself.
TEST(MarkdownReport, EscapedTextReadsBackAsItselfInATableCell) {
  const std::string alphabet = "ab_1 <>/!?\\`*[]()|#~&$@=+-.:;'\"{}^%,";
  std::mt19937 random(20261205);
  for (int round = 0; round < 3000; ++round) {
    std::string text = "x";  // a cell's leading and trailing spaces are trimmed
    size_t length = 1 + random() % 12;
    for (size_t i = 0; i < length; ++i) text += alphabet[random() % alphabet.size()];
    text += "x";
    Parsed parsed = parse_markdown("| a |\n| --- |\n| " + markdown_text(text) + " |\n");
    ASSERT_EQ(parsed.rows.size(), 2u) << text;
    ASSERT_EQ(parsed.rows[1].size(), 1u) << text;
    EXPECT_EQ(parsed.rows[1][0], text) << markdown_text(text);
  }
}

TEST(MarkdownReport, AnEmptyRunIsTheSummaryAlone) {
  RunResult run;
  run.seed = 7;
  EXPECT_EQ(render_markdown(run),
            std::string("### thetagate: 0 claims: 0 holds, 0 refuted, 0 undecided, 0 errors\n\n"
                        "Seed 7, thetagate ") +
                THETAGATE_VERSION_STRING + ".\n");
}

// The command line: --format markdown, and --out FILE.md picks it.
TEST(MarkdownReport, TheCommandLineWritesIt) {
  std::string check = std::string(THETAGATE_BINARY) +
                      " check --recurrence 'T(n) = 2T(n/2) + n; T(1) = 1' --bound 'O(n)' "
                      "--name 'orchard::merge'";
  CommandResult r = run_shell(check + " --format markdown");
  EXPECT_EQ(r.status, 1) << r.out;
  Parsed parsed = parse_markdown(r.out);
  ASSERT_EQ(parsed.rows.size(), 2u) << r.out;
  EXPECT_EQ(parsed.rows[1][0], "refuted");
  EXPECT_EQ(parsed.rows[1][1], "orchard::merge");
  EXPECT_EQ(parsed.rows[1][4].rfind("witness n = ", 0), 0u) << parsed.rows[1][4];
  std::string file = ::testing::TempDir() + "thetagate-review.md";
  CommandResult written = run_shell(check + " --out " + file);
  EXPECT_EQ(written.status, 1) << written.out;
  EXPECT_NE(written.out.find("wrote " + file), std::string::npos) << written.out;
  EXPECT_EQ(parse_markdown(read_file(file)).rows, parsed.rows);
  std::remove(file.c_str());
  // An extension that contradicts --format is a usage error.
  EXPECT_EQ(run_shell(check + " --format json --out " + file).status, 2);
}

}  // namespace
}  // namespace thetagate::engine
