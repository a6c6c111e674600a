// Skein report: CSV tables (results-format.md): points.csv, one row per point, and strips.csv, one row per
// strip (point index, surface, then the strip arrays). Same names as the JSON.
#pragma once

#include <iosfwd>

#include "skein/results.hpp"

namespace skein::report {

void WritePointsCsv(const Results& r, std::ostream& out);
void WriteStripsCsv(const Results& r, std::ostream& out);
/// probes.csv: one row per probe of each solved point (point, probe, x, y, z, u, v, w, downwash_deg,
/// sidewash_deg, q_ratio, in_core, note; probe.hpp), values empty for a probe in a vortex core; only the
/// header when the case has no probes.
void WriteProbesCsv(const Results& r, std::ostream& out);
/// structural.csv: one row per station of each surface's given half (point, surface, station, shear_N,
/// bending_Nm), for cases that give a speed; only the header otherwise.
void WriteStructuralCsv(const Results& r, std::ostream& out);

}  // namespace skein::report
