// libFuzzer target: arbitrary bytes through the whole library pipeline, read -> mesh -> geometry checks ->
// assemble -> solve -> loads -> reports (build with -DSKEIN_BUILD_FUZZ=ON and clang; run tools/fuzz.sh).
//
// The contract under test: bad input ends in skein::InputError, a numerical failure in skein::NumericalError,
// and nothing else happens: no other exception, no crash, no hang, no sanitizer report, no non-finite number
// in a report that claims success. Cases above kMaxFuzzPanels are read and counted but not solved, so each
// input stays fast enough for the fuzzer to explore.
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <cstdio>
#include <sstream>
#include <string>
#include <string_view>

#include "skein/skein.hpp"

namespace {

constexpr std::size_t kMaxFuzzPanels = 400;
constexpr std::size_t kMaxFuzzPoints = 8;  // flight points solved (each may need its own factorisation)

[[noreturn]] void Fail(const char* what, const std::string& detail) {
  std::fprintf(stderr, "fuzz_case: %s: %s\n", what, detail.c_str());
  std::abort();
}

void CheckFinite(double v, const char* name) {
  if (!std::isfinite(v)) Fail("non-finite value in a successful result", name);
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  skein::Case c;
  try {
    c = skein::ReadCaseText(text, "fuzz.toml");
  } catch (const skein::InputError& e) {
    const std::string what = e.what();
    if (what.find('\n') != std::string::npos) Fail("multi-line InputError", what);
    if (what.rfind("fuzz.toml", 0) != 0) Fail("InputError without the file name", what);
    return 0;
  } catch (const std::exception& e) {
    Fail("unexpected exception from ReadCaseText", e.what());
  }
  // The echo must read back (WriteCaseToml's promise), whatever the case holds.
  {
    std::ostringstream echo;
    skein::WriteCaseToml(c, echo);
    try {
      (void)skein::ReadCaseText(echo.str(), "echo.toml");
    } catch (const std::exception& e) {
      Fail("the echoed case does not read back", std::string(e.what()) + "\n--- echo ---\n" + echo.str());
    }
  }
  if (skein::CountPanels(c) > kMaxFuzzPanels) return 0;
  if (c.flight.alpha_deg.size() * c.flight.beta_deg.size() > kMaxFuzzPoints) {
    c.flight.alpha_deg.resize(std::min<std::size_t>(c.flight.alpha_deg.size(), kMaxFuzzPoints));
    c.flight.beta_deg.resize(1);
  }
  skein::RunOptions ro;
  ro.threads = 1;
  ro.max_panels = kMaxFuzzPanels;
  try {
    const skein::Results r = skein::Run(c, ro);
    for (const skein::PointResult& p : r.points) {
      CheckFinite(p.CL, "CL");
      CheckFinite(p.CD_induced, "CD_induced");
      CheckFinite(p.CY, "CY");
      CheckFinite(p.Cl, "Cl");
      CheckFinite(p.Cm, "Cm");
      CheckFinite(p.Cn, "Cn");
      for (const auto& [name, v] : p.derivatives.items) CheckFinite(v, name.c_str());
    }
    std::ostringstream sink;
    skein::report::WriteJson(r, sink);
    skein::report::WritePointsCsv(r, sink);
    skein::report::WriteStripsCsv(r, sink);
    skein::report::WriteSummary(r, sink);
  } catch (const skein::InputError&) {
  } catch (const skein::NumericalError&) {
  } catch (const std::exception& e) {
    Fail("unexpected exception from Run", e.what());
  }
  return 0;
}
