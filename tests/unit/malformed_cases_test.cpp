// Every file in tests/malformed/ is a bad case file whose first line is
//   # expect: <the exact error line, with the file name as its base name>
// The reader must throw InputError with exactly that what(): one line naming file, line, column and what was
// expected (case-format.md, "Rules the reader enforces").
#include <algorithm>
#include <cctype>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "skein/case_file.hpp"

namespace skein {
namespace {

namespace fs = std::filesystem;

const fs::path kMalformedDir = fs::path(SKEIN_SOURCE_DIR) / "tests" / "malformed";

std::vector<std::string> MalformedFiles() {
  std::vector<std::string> names;
  std::error_code ec;
  for (const auto& entry : fs::directory_iterator(kMalformedDir, ec))
    if (entry.is_regular_file() && entry.path().extension() == ".toml") names.push_back(entry.path().filename().string());
  std::sort(names.begin(), names.end());
  return names;
}

std::string ReadText(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

class MalformedCase : public ::testing::TestWithParam<std::string> {};

TEST_P(MalformedCase, GivesTheExpectedErrorLine) {
  const std::string name = GetParam();
  const std::string text = ReadText(kMalformedDir / name);
  const std::string tag = "# expect: ";
  ASSERT_EQ(text.rfind(tag, 0), 0u) << name << ": the first line must start with \"" << tag << "\"";
  const std::size_t eol = text.find('\n');
  ASSERT_NE(eol, std::string::npos) << name;
  const std::string expected = text.substr(tag.size(), eol - tag.size());
  try {
    ReadCaseText(text, name);
    FAIL() << name << ": read without error; expected\n  " << expected;
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()), expected);
    EXPECT_EQ(std::string(e.what()).find('\n'), std::string::npos) << "one line only";
  }
}

INSTANTIATE_TEST_SUITE_P(Files, MalformedCase, ::testing::ValuesIn(MalformedFiles()),
                         [](const ::testing::TestParamInfo<std::string>& p) {
                           std::string id = fs::path(p.param).stem().string();
                           for (char& ch : id)
                             if (!std::isalnum(static_cast<unsigned char>(ch))) ch = '_';
                           return id;
                         });

TEST(MalformedCases, DirectoryHoldsAtLeastTwentyCases) { EXPECT_GE(MalformedFiles().size(), 20u); }

}  // namespace
}  // namespace skein
