// Skein report: tables for people and JSON for programs, for the design studies of study.hpp.
// Writers only format; every number comes from the study.
#pragma once

#include <iosfwd>
#include <vector>

#include "skein/report/plot.hpp"
#include "skein/results.hpp"
#include "skein/study.hpp"

namespace skein::report {

/// The mesh-convergence table: one row per quantity with the three meshes' values, the extrapolated value,
/// the order used (observed or assumed) and the error estimate, followed by the notes and the cautions.
void WriteConvergenceTable(const study::ConvergenceStudy& s, std::ostream& out);

/// The results document of json.hpp with a "convergence" object added (results-format.md: keys may be added).
void WriteJsonWithConvergence(const Results& r, const study::ConvergenceStudy& s, std::ostream& out);

/// The twist design: the design point, induced drag, span efficiency and root bending before and after, the
/// twist of each section, and the cautions.
void WriteTwistDesign(const study::TwistDesign& d, std::ostream& out);

/// The twist design as JSON: {"format": "skein-twist-design", "version": 1, "before": {...}, "after": {...},
/// "sections": [{"eta", "twist_before_deg", "twist_after_deg"}], ...}.
void WriteTwistDesignJson(const study::TwistDesign& d, std::ostream& out);

/// The comparison: a ranked table (least induced drag first) and the cautions.
void WriteComparisonTable(const study::Comparison& c, std::ostream& out);
/// The comparison as JSON: {"format": "skein-comparison", "version": 1, "CL": ..., "cases": [...]} in the
/// order ranked, each with the names of study::CompareEntry.
void WriteComparisonJson(const study::Comparison& c, std::ostream& out);
/// The comparison as CSV (compare.csv): a header row and one row per case in ranked order.
void WriteComparisonCsv(const study::Comparison& c, std::ostream& out);

/// The parameter study: the varied keys, one row per variant (first key fastest) with alpha, CL, CD_induced,
/// span efficiency, Cm, CL_alpha, root bending, neutral point and where the local cl peaks; for one varied
/// key, where the least induced drag lies (ParabolicMinimum); and the cautions.
void WriteStudyTable(const study::Study& s, std::ostream& out);
/// The study as JSON: {"format": "skein-study", "version": 1, "title", "source", "target": {"CL"} or
/// {"alpha_deg"}, "axes": [{"path", "values"}], "variants": [{"values", "alpha_deg", "CL", ...}],
/// "least_induced_drag_at" (or null), "warnings"}; the names of study::StudyVariant. No thread counts, so the
/// document is the same on any number of threads.
void WriteStudyJson(const study::Study& s, std::ostream& out);
/// The study as CSV (study.csv): a header row (the varied paths, then the names of study::StudyVariant) and
/// one row per variant, in variant order; an empty field where a value cannot be computed.
void WriteStudyCsv(const study::Study& s, std::ostream& out);

/// The study's charts (plot.hpp): CD_induced and span efficiency against the first varied value, one line per
/// value of the second when there are two (ids "CD_induced" / "span_efficiency", or "line-1", "line-2", ...;
/// id prefixes "cd-" and "e-").
std::vector<plot::Chart> StudyCharts(const study::Study& s);
/// The two charts stacked in one SVG document (induced drag above, span efficiency below, the cautions under).
void WriteStudySvg(const study::Study& s, std::ostream& out);

/// The cautions every design-study report carries (conceptual-design estimates, linear inviscid theory).
void WriteCautions(std::ostream& out);

}  // namespace skein::report
