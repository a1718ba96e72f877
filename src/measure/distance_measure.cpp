#include "measure/distance_measure.h"

#include <string>

#include "core/error.h"

namespace manicule {

const std::vector<MeasureInfo>& all_distance_measures() {
  using M = DistanceMeasure;
  using I = MeasureInput;
  static const std::vector<MeasureInfo> measures = {
      {M::burrows_delta, "burrows-delta", I::z_scores,
       "Burrows 2002, Literary and Linguistic Computing 17(3):267-287"},
      {M::quadratic_delta, "quadratic-delta", I::z_scores,
       "Argamon 2008, Literary and Linguistic Computing 23(2):131-147"},
      {M::eder_delta, "eder-delta", I::z_scores,
       "Eder, Rybicki & Kestemont 2016, The R Journal 8(1):107-121; "
       "Evert et al. 2017, Digital Scholarship in the Humanities 32(suppl. 2)"},
      {M::cosine_delta, "cosine-delta", I::z_scores,
       "Smith & Aldridge 2011, Journal of Quantitative Linguistics 18(1):63-88"},
      {M::manhattan, "manhattan", I::relative_frequencies, "city-block (L1) distance"},
      {M::euclidean, "euclidean", I::relative_frequencies, "Euclidean (L2) distance"},
      {M::cosine, "cosine", I::relative_frequencies, "cosine distance, 1 - cosine similarity"},
      {M::minmax, "minmax", I::relative_frequencies,
       "Ruzicka distance; Koppel & Winter 2014, JASIST 65(1):178-187"},
  };
  return measures;
}

const MeasureInfo& measure_info(DistanceMeasure measure) {
  for (const MeasureInfo& info : all_distance_measures()) {
    if (info.measure == measure) return info;
  }
  throw Error(ErrorKind::internal, "distance measure without a description");
}

DistanceMeasure parse_distance_measure(std::string_view name) {
  std::string known;
  for (const MeasureInfo& info : all_distance_measures()) {
    if (info.name == name) return info.measure;
    known += known.empty() ? "" : ", ";
    known += info.name;
  }
  throw Error(ErrorKind::usage,
              "unknown distance measure '" + std::string(name) + "' (known: " + known + ")");
}

}  // namespace manicule
