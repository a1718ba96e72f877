// DistanceMeasure: the published distances between two segments' feature vectors, what
// each is computed on, and where it was defined. Formulas (z = z-scores, f = relative
// frequencies, n = number of features, i = a feature's position in rank order, 1-based):
//   burrows-delta    (1/n) sum |z_a - z_b|                Burrows 2002, LLC 17(3):267-287
//   quadratic-delta  sum (z_a - z_b)^2                    Argamon 2008, LLC 23(2):131-147
//   eder-delta       (1/n) sum |z_a - z_b| (n - i + 1)/n  Eder, Rybicki & Kestemont 2016,
//                                                         R Journal 8(1); Evert et al. 2017
//   cosine-delta     1 - cos(z_a, z_b)                    Smith & Aldridge 2011, JQL 18(1):63-88
//   manhattan        sum |f_a - f_b|
//   euclidean        sqrt(sum (f_a - f_b)^2)
//   cosine           1 - cos(f_a, f_b)
//   minmax           1 - sum min(f_a, f_b) / sum max(f_a, f_b)   (Ruzicka; Koppel & Winter
//                                                         2014, JASIST 65(1):178-187)
// docs/measures.md gives the reasoning behind each choice.
#pragma once
#include <string_view>
#include <vector>

namespace manicule {

enum class DistanceMeasure {
  burrows_delta,
  quadratic_delta,
  eder_delta,
  cosine_delta,
  manhattan,
  euclidean,
  cosine,
  minmax,
};

enum class MeasureInput { z_scores, relative_frequencies };

struct MeasureInfo {
  DistanceMeasure measure;
  std::string_view name;      // the name users type, e.g. "cosine-delta"
  MeasureInput input;
  std::string_view citation;  // short reference for reports and provenance
};

const std::vector<MeasureInfo>& all_distance_measures();
const MeasureInfo& measure_info(DistanceMeasure measure);
// Throws Error(usage) naming the known measures if `name` is not one of them.
DistanceMeasure parse_distance_measure(std::string_view name);

}  // namespace manicule
