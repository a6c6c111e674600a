// The skein command line as a user meets it: the binary (SKEIN_BINARY) is run in a fresh temporary directory
// and its exit code, standard output, standard error and the files it leaves are checked.
//
// Contract (README.md, DEVELOPERS.md "Error channels and exit codes"): bad input gives exactly one line on
// standard error, `file:line:column: what was expected`, exit code 2, and no output file of any kind, partial
// or complete. `--json -` writes the results document to standard output and the summary to standard error.
#include <sys/wait.h>

#include <algorithm>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <regex>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "skein/case_file.hpp"
#include "skein/run.hpp"
#include "../support/cli_workdir.hpp"

namespace {

namespace fs = std::filesystem;
using skein::testing::Outcome;
using skein::testing::ReadFile;

constexpr int kExitInput = 2;

void WriteFile(const fs::path& p, const std::string& text) {
  std::ofstream out(p, std::ios::binary | std::ios::trunc);
  out << text;
}

std::size_t CountLines(const std::string& s) { return static_cast<std::size_t>(std::count(s.begin(), s.end(), '\n')); }

/// 1-based number of the first line of `text` that contains `marker`.
int LineOf(const std::string& text, const std::string& marker) {
  const std::size_t at = text.find(marker);
  EXPECT_NE(at, std::string::npos) << "marker \"" << marker << "\" not in the case text";
  return 1 + static_cast<int>(std::count(text.begin(), text.begin() + static_cast<std::ptrdiff_t>(at), '\n'));
}

/// A fresh, empty working directory per test, removed afterwards.
class Cli : public skein::testing::CliWorkdir {};

// A small valid case of our own (a tapered wing); the bad-input tests each break one thing in it.
const std::string kGoodCase = R"(title = "CLI probe wing"

[flight]
alpha = [2.0, 4.0]

[mesh]
chordwise = 4
spanwise = 8

[[surface]]
name = "wing"
symmetric = true

  [[surface.section]]
  leading_edge = [0.0, 0.0, 0.0]
  chord = 0.30
  twist = 1.0
  camber = "NACA 2412"

  [[surface.section]]
  leading_edge = [0.04, 1.2, 0.06]
  chord = 0.18
  twist = -1.0
)";

std::string Replace(std::string text, const std::string& from, const std::string& to) {
  const std::size_t at = text.find(from);
  EXPECT_NE(at, std::string::npos) << "\"" << from << "\" not in the case text";
  if (at != std::string::npos) text.replace(at, from.size(), to);
  return text;
}

TEST_F(Cli, VersionPrintsNameAndVersion) {
  const Outcome o = Skein("--version");
  EXPECT_EQ(o.exit_code, 0);
  EXPECT_TRUE(std::regex_match(o.out, std::regex(R"(skein \d+\.\d+\.\d+\n)"))) << o.out;
}

TEST_F(Cli, HelpListsSolveWithAnExample) {
  const Outcome o = Skein("--help");
  EXPECT_EQ(o.exit_code, 0);
  EXPECT_NE(o.out.find("solve"), std::string::npos) << o.out;
  EXPECT_NE(o.out.find("Example: skein solve cases/"), std::string::npos) << o.out;
}

TEST_F(Cli, SolveHelpShowsAnExampleAndTheOutputOptions) {
  const Outcome o = Skein("solve --help");
  EXPECT_EQ(o.exit_code, 0);
  EXPECT_NE(o.out.find("Example: skein solve"), std::string::npos) << o.out;
  for (const char* opt : {"CASE", "--json", "--csv", "--threads", "--quiet"})
    EXPECT_NE(o.out.find(opt), std::string::npos) << "solve --help does not mention " << opt;
}

TEST_F(Cli, TheHelpExampleCaseExists) {
  // The help text's example must work as printed from the source tree.
  EXPECT_TRUE(fs::exists(fs::path(SKEIN_SOURCE_DIR) / "cases" / "survey_drone.toml"));
}

TEST_F(Cli, ValidCaseWritesExactlyTheRequestedFiles) {
  WriteFile(dir_ / "wing.toml", kGoodCase);
  const Outcome o = Skein("solve wing.toml --json out.json --csv tables");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  EXPECT_TRUE(o.err.empty()) << o.err;
  EXPECT_NE(o.out.find("CLI probe wing"), std::string::npos) << "the summary names the case";
  EXPECT_NE(o.out.find("Cautions"), std::string::npos) << "the summary carries the cautions";
  EXPECT_TRUE(fs::is_regular_file(dir_ / "out.json"));
  EXPECT_TRUE(fs::is_regular_file(dir_ / "tables" / "points.csv"));
  EXPECT_TRUE(fs::is_regular_file(dir_ / "tables" / "strips.csv"));
  EXPECT_EQ(Entries(), (std::vector<std::string>{"out.json", "tables", "wing.toml"}));
  for (const auto& e : fs::directory_iterator(dir_ / "tables"))
    EXPECT_EQ(e.path().filename().string().find("partial"), std::string::npos) << e.path();
}

TEST_F(Cli, JsonDashWritesTheDocumentToStandardOutput) {
  WriteFile(dir_ / "wing.toml", kGoodCase);
  const Outcome o = Skein("solve wing.toml --json -");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  // Standard output is the document and nothing else; the summary moved to standard error.
  nlohmann::json doc;
  ASSERT_NO_THROW(doc = nlohmann::json::parse(o.out)) << o.out.substr(0, 200);
  EXPECT_EQ(doc.at("format"), "skein-result");
  EXPECT_EQ(doc.at("version"), 1);
  EXPECT_EQ(doc.at("points").size(), 2u);
  EXPECT_NE(o.err.find("CLI probe wing"), std::string::npos) << "summary on standard error";
  EXPECT_EQ(Entries(), (std::vector<std::string>{"wing.toml"})) << "no file named '-' or any other";
}

TEST_F(Cli, QuietJsonDashPrintsOnlyTheDocument) {
  WriteFile(dir_ / "wing.toml", kGoodCase);
  const Outcome o = Skein("solve wing.toml --json - --quiet");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  EXPECT_TRUE(nlohmann::json::accept(o.out)) << o.out.substr(0, 200);
  EXPECT_TRUE(o.err.empty()) << o.err;
}

TEST_F(Cli, RefusesToWriteJsonOverItsOwnInput) {
  WriteFile(dir_ / "wing.toml", kGoodCase);
  for (const char* target : {"wing.toml", "./wing.toml"}) {
    const Outcome o = Skein(std::string("solve wing.toml --json ") + target);
    EXPECT_NE(o.exit_code, 0) << target;
    EXPECT_EQ(CountLines(o.err), 1u) << o.err;
    EXPECT_NE(o.err.find("over the input"), std::string::npos) << o.err;
    EXPECT_EQ(ReadFile(dir_ / "wing.toml"), kGoodCase) << "the case file was overwritten via " << target;
    EXPECT_EQ(Entries(), (std::vector<std::string>{"wing.toml"})) << "no staged or partial file left";
  }
}

TEST_F(Cli, MissingCaseFileIsAnInputError) {
  const Outcome o = Skein("solve nowhere.toml --json out.json");
  EXPECT_EQ(o.exit_code, kExitInput);
  EXPECT_EQ(CountLines(o.err), 1u) << o.err;
  EXPECT_EQ(o.err.rfind("nowhere.toml", 0), 0u) << o.err;
  EXPECT_TRUE(Entries().empty());
}

TEST_F(Cli, UnknownOptionIsAnArgumentError) {
  WriteFile(dir_ / "wing.toml", kGoodCase);
  const Outcome o = Skein("solve wing.toml --jsn out.json");
  EXPECT_EQ(o.exit_code, kExitInput);
  EXPECT_NE(o.err.find("--jsn"), std::string::npos) << o.err;
  EXPECT_EQ(Entries(), (std::vector<std::string>{"wing.toml"}));
}

// One broken case file: the text, the marker on the line the error must name, and words the message must hold.
struct BadInput {
  const char* label;
  std::string text;
  std::string marker;
  std::vector<std::string> words;
};

std::vector<BadInput> BadInputs() {
  return {
      {"misspelt_key", Replace(kGoodCase, "twist = -1.0", "twsit = -1.0"), "twsit", {"unknown key", "twsit", "twist"}},
      {"negative_chord", Replace(kGoodCase, "chord = 0.18", "chord = -0.18"), "chord = -0.18", {"chord", "> 0"}},
      {"non_numeric_alpha", Replace(kGoodCase, "alpha = [2.0, 4.0]", "alpha = \"four\""), "alpha =",
       {"alpha", "number"}},
      {"one_section",
       Replace(kGoodCase, "\n  [[surface.section]]\n  leading_edge = [0.04, 1.2, 0.06]\n  chord = 0.18\n  twist = -1.0\n",
               "\n"),
       "[[surface.section]]", {"two", "section"}},
      {"toml_syntax_error", Replace(kGoodCase, "chordwise = 4", "chordwise = = 4"), "chordwise", {"syntax"}},
  };
}

class CliBadInput : public Cli, public ::testing::WithParamInterface<BadInput> {};

TEST_P(CliBadInput, GivesOneLineWithFileLineColumnExitTwoAndNoOutput) {
  const BadInput& bad = GetParam();
  WriteFile(dir_ / "bad.toml", bad.text);
  const Outcome o = Skein("solve bad.toml --json out.json --csv tables");
  EXPECT_EQ(o.exit_code, kExitInput) << o.err;
  EXPECT_EQ(CountLines(o.err), 1u) << "exactly one line on standard error:\n" << o.err;
  const int line = LineOf(bad.text, bad.marker);
  std::smatch m;
  ASSERT_TRUE(std::regex_search(o.err, m, std::regex(R"(^bad\.toml:(\d+):(\d+): \S)"))) << o.err;
  EXPECT_EQ(std::stoi(m[1]), line) << o.err;
  EXPECT_GE(std::stoi(m[2]), 1) << o.err;
  for (const std::string& w : bad.words) EXPECT_NE(o.err.find(w), std::string::npos) << "\"" << w << "\" in " << o.err;
  EXPECT_TRUE(o.out.empty()) << "no summary for a case that failed:\n" << o.out;
  EXPECT_EQ(Entries(), (std::vector<std::string>{"bad.toml"})) << "no output file, partial or complete";
}

INSTANTIATE_TEST_SUITE_P(Cases, CliBadInput, ::testing::ValuesIn(BadInputs()),
                         [](const ::testing::TestParamInfo<BadInput>& param) { return std::string(param.param.label); });

// A mesh whose panel count the reader accepts (within its per-surface and total caps) but whose influence
// matrix cannot fit in this machine's memory: 25 chordwise panels and enough spanwise panels that the run's own
// estimate (run.hpp EstimateMemoryBytes, about 8 N^2 bytes for the full matrix) exceeds the physical memory by
// a fifth. On the project's 24 GiB machines that is about 61000 panels and 30 GB. It must be refused before
// anything is allocated, naming the memory it would need.
TEST_F(Cli, MeshTooLargeForMemoryIsRefusedBeforeAllocating) {
  const std::size_t memory = skein::PhysicalMemoryBytes();
  if (memory == 0) GTEST_SKIP() << "this system does not report its physical memory";
  constexpr int kChordwise = 25;
  int spanwise = 1;
  while (skein::EstimateMemoryBytes(2u * kChordwise * static_cast<std::size_t>(spanwise), 0, false) <
         memory + memory / 5)
    spanwise += 1 + spanwise / 16;
  const std::size_t panels = 2u * kChordwise * static_cast<std::size_t>(spanwise);
  if (spanwise > skein::kMaxSpanwisePanels || panels > 200000u)  // the reader's total cap (case_file.cpp)
    GTEST_SKIP() << "this machine has more memory than the largest mesh the reader accepts";
  const std::string text = Replace(Replace(kGoodCase, "chordwise = 4", "chordwise = " + std::to_string(kChordwise)),
                                   "spanwise = 8", "spanwise = " + std::to_string(spanwise));
  WriteFile(dir_ / "huge.toml", text);
#if defined(__SANITIZE_ADDRESS__)
  const std::string guard;  // the address sanitizer reserves far more address space than any limit allows
#else
  // Should the refusal ever go missing, the solve fails to allocate instead of exhausting a shared machine.
  const std::string guard = "ulimit -v 8000000 2>/dev/null; ";
#endif
  const Outcome o = Skein("solve huge.toml --json out.json --csv tables", guard);
  EXPECT_EQ(o.exit_code, kExitInput) << o.err;
  EXPECT_EQ(CountLines(o.err), 1u) << o.err;
  EXPECT_NE(o.err.find(std::to_string(panels) + " panels"), std::string::npos) << o.err;
  EXPECT_TRUE(std::regex_search(o.err, std::regex(R"(\d+(\.\d+)? GB)"))) << "names the memory it would need: " << o.err;
  // Like every input error, it names the place in the file: the [mesh] table or the surface whose counts
  // make the mesh too large.
  EXPECT_TRUE(std::regex_search(o.err, std::regex(R"(^huge\.toml:\d+:\d+: )"))) << o.err;
  EXPECT_EQ(Entries(), (std::vector<std::string>{"huge.toml"}));
}

}  // namespace
