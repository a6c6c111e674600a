// The HTML report in a real browser: Debian's chromium, headless, opens the page `skein solve --report` wrote,
// with no console message (the page has no script, so any message means something failed to load or parse),
// and its screenshot is not blank (the PNG decoded with zlib, the variance of its grey levels measured).
// Two controls show that both checks can fail: a page that logs a console error is caught, and a blank page
// is judged blank. Skipped, saying so, only when chromium is not installed (tools/setup.sh --with-browser).
// Sources: "common practice" (headless-browser smoke test); the PNG format is W3C's (Portable Network Graphics
// Specification, 2nd ed., 2003: chunks, filter types 0-4, zlib-compressed image data).
#include <sys/wait.h>

#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>
#include <zlib.h>

#include "../support/cli_workdir.hpp"

namespace {

namespace fs = std::filesystem;
using skein::testing::ReadFile;

/// Grey-level variance (0-255 scale) above which a screenshot holds a picture: a blank page measures 0; text and
/// plots on white measure hundreds to thousands. 50 is far from both.
constexpr double kMinVariance = 50.0;
/// Fraction of pixels that are not white in a page with tables and five plots (a blank page has none).
constexpr double kMinInk = 0.01;

bool HaveChromium() { return std::system("command -v chromium > /dev/null 2>&1") == 0; }

struct Shot {
  int exit_code = -1;
  std::vector<std::string> console;  ///< console lines of the browser's log
  std::string png;
};

/// Opens `page` in headless chromium, screenshots it, and collects the console lines of its log.
Shot OpenInBrowser(const fs::path& page, const fs::path& work, int width, int height) {
  const fs::path png = work / "shot.png", log = work / "chromium.log", profile = work / "profile";
  fs::remove(png);
  const std::string cmd = "timeout 180 chromium --headless --no-sandbox --disable-gpu --no-first-run "
                          "--user-data-dir='" + profile.string() + "' --screenshot='" + png.string() +
                          "' --window-size=" + std::to_string(width) + "," + std::to_string(height) +
                          " --enable-logging=stderr --v=0 'file://" + page.string() + "' > /dev/null 2> '" +
                          log.string() + "'";
  const int status = std::system(cmd.c_str());
  Shot s;
  s.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  std::istringstream in(ReadFile(log));
  for (std::string line; std::getline(in, line);)
    if (line.find(":CONSOLE") != std::string::npos || line.find("Uncaught") != std::string::npos)
      s.console.push_back(line);
  s.png = ReadFile(png);
  return s;
}

struct Image {
  std::string error;  ///< "" when decoded
  std::uint32_t width = 0, height = 0;
  std::vector<double> grey;  ///< one value per pixel, 0-255
};

std::uint32_t Be32(const std::string& s, std::size_t at) {
  std::uint32_t v = 0;
  for (std::size_t k = 0; k < 4; ++k) v = (v << 8) | static_cast<unsigned char>(s[at + k]);
  return v;
}

int Paeth(int a, int b, int c) {
  const int p = a + b - c, pa = std::abs(p - a), pb = std::abs(p - b), pc = std::abs(p - c);
  return pa <= pb && pa <= pc ? a : (pb <= pc ? b : c);
}

/// Decodes an 8-bit RGB or RGBA, non-interlaced PNG (what chromium writes) to grey levels.
Image DecodePng(const std::string& png) {
  Image im;
  if (png.size() < 8 || png.compare(0, 8, "\x89PNG\r\n\x1a\n") != 0) {
    im.error = "not a PNG";
    return im;
  }
  std::string idat;
  int depth = 0, colour = 0, interlace = 0;
  for (std::size_t at = 8; at + 8 <= png.size();) {
    const std::uint32_t len = Be32(png, at);
    const std::string type = png.substr(at + 4, 4);
    if (at + 12 + len > png.size()) {
      im.error = "truncated chunk";
      return im;
    }
    if (type == "IHDR") {
      im.width = Be32(png, at + 8);
      im.height = Be32(png, at + 12);
      depth = static_cast<unsigned char>(png[at + 16]);
      colour = static_cast<unsigned char>(png[at + 17]);
      interlace = static_cast<unsigned char>(png[at + 20]);
    } else if (type == "IDAT") {
      idat += png.substr(at + 8, len);
    }
    at += 12 + len;
  }
  const int channels = colour == 2 ? 3 : colour == 6 ? 4 : 0;
  if (depth != 8 || channels == 0 || interlace != 0 || im.width == 0 || im.height == 0) {
    im.error = "unsupported PNG layout";
    return im;
  }
  const std::size_t stride = static_cast<std::size_t>(im.width) * static_cast<std::size_t>(channels);
  std::vector<unsigned char> raw((stride + 1) * im.height);
  uLongf raw_size = static_cast<uLongf>(raw.size());
  if (uncompress(raw.data(), &raw_size, reinterpret_cast<const Bytef*>(idat.data()), static_cast<uLong>(idat.size())) !=
          Z_OK ||
      raw_size != raw.size()) {
    im.error = "zlib could not inflate the image data";
    return im;
  }
  std::vector<unsigned char> prev(stride, 0), cur(stride);
  im.grey.reserve(static_cast<std::size_t>(im.width) * im.height);
  for (std::uint32_t y = 0; y < im.height; ++y) {
    const unsigned char* row = raw.data() + y * (stride + 1);
    const int filter = row[0];
    for (std::size_t i = 0; i < stride; ++i) {
      const int x = row[1 + i];
      const int a = i >= static_cast<std::size_t>(channels) ? cur[i - static_cast<std::size_t>(channels)] : 0;
      const int b = prev[i];
      const int c = i >= static_cast<std::size_t>(channels) ? prev[i - static_cast<std::size_t>(channels)] : 0;
      int v = 0;
      switch (filter) {
        case 0: v = x; break;
        case 1: v = x + a; break;
        case 2: v = x + b; break;
        case 3: v = x + (a + b) / 2; break;
        case 4: v = x + Paeth(a, b, c); break;
        default: im.error = "bad filter type"; return im;
      }
      cur[i] = static_cast<unsigned char>(v & 0xff);
    }
    for (std::size_t px = 0; px < im.width; ++px) {
      const unsigned char* p = &cur[px * static_cast<std::size_t>(channels)];
      im.grey.push_back(0.299 * p[0] + 0.587 * p[1] + 0.114 * p[2]);  // ITU-R BT.601 luma weights
    }
    std::swap(prev, cur);
  }
  return im;
}

double Variance(const std::vector<double>& v) {
  double mean = 0.0, sq = 0.0;
  for (double x : v) mean += x;
  mean /= static_cast<double>(v.size());
  for (double x : v) sq += (x - mean) * (x - mean);
  return sq / static_cast<double>(v.size());
}

double Ink(const std::vector<double>& v) {
  std::size_t n = 0;
  for (double x : v) n += x < 240.0 ? 1u : 0u;
  return static_cast<double>(n) / static_cast<double>(v.size());
}

class Browser : public skein::testing::CliWorkdir {
 protected:
  void SetUp() override {
    if (!HaveChromium())
      GTEST_SKIP() << "chromium is not installed: the browser check of the HTML report was not run "
                      "(tools/setup.sh --with-browser installs it)";
    CliWorkdir::SetUp();
  }
};

TEST_F(Browser, OpensTheReportWithNoConsoleMessageAndDrawsIt) {
  fs::copy_file(fs::path(SKEIN_SOURCE_DIR) / "cases/survey_drone.toml", dir_ / "drone.toml");
  const skein::testing::Outcome o = Skein("solve drone.toml --quiet --report review.html");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  const Shot s = OpenInBrowser(dir_ / "review.html", dir_, 1100, 2400);
  ASSERT_EQ(s.exit_code, 0) << "chromium failed";
  for (const std::string& line : s.console) ADD_FAILURE() << "console: " << line;
  const Image im = DecodePng(s.png);
  ASSERT_EQ(im.error, "");
  EXPECT_EQ(im.width, 1100u);
  EXPECT_EQ(im.height, 2400u);
  EXPECT_GT(Variance(im.grey), kMinVariance);
  EXPECT_GT(Ink(im.grey), kMinInk);
}

TEST_F(Browser, TheChecksCatchAConsoleErrorAndABlankPage) {
  std::ofstream(dir_ / "noisy.html") << "<!DOCTYPE html><html><body><p>x</p><script>console.error('deliberate')"
                                        "</script></body></html>\n";
  const Shot noisy = OpenInBrowser(dir_ / "noisy.html", dir_, 400, 300);
  ASSERT_EQ(noisy.exit_code, 0);
  ASSERT_EQ(noisy.console.size(), 1u);
  EXPECT_NE(noisy.console[0].find("deliberate"), std::string::npos);

  std::ofstream(dir_ / "blank.html") << "<!DOCTYPE html><html><body style=\"background:#fff\"></body></html>\n";
  const Shot blank = OpenInBrowser(dir_ / "blank.html", dir_, 400, 300);
  ASSERT_EQ(blank.exit_code, 0);
  EXPECT_TRUE(blank.console.empty());
  const Image im = DecodePng(blank.png);
  ASSERT_EQ(im.error, "");
  EXPECT_LT(Variance(im.grey), kMinVariance);
  EXPECT_LT(Ink(im.grey), kMinInk);
}

}  // namespace
