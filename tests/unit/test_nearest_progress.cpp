// The share of the nearest-segment search that nearest_rows tells NearestOptions::progress
// (nearest_rows.h): after each block of rows but the last, the block products computed so
// far over all of them, where a block's products are its row count times the rows from its
// first on; then 1 once the search is done. The expected shares are worked by hand below
// from that rule, for each way the search runs: Cosine Delta screened in single precision,
// Cosine Delta in double precision, and Burrows's Delta by pair sums.
#include <catch2/catch.hpp>

#include <random>
#include <vector>

#include "measure/nearest_rows.h"

using namespace manicule;

TEST_CASE("nearest_rows tells the share of its search done, block by block", "[measure]") {
  // 1,000 rows of 40 values; blocks of 300 rows start at rows 0, 300, 600 and 900.
  // Products of each block (count x rows from its first on): 300 x 1,000 = 300,000;
  // 300 x 700 = 210,000; 300 x 400 = 120,000; 100 x 100 = 10,000; 640,000 in all.
  // Shares after the first three blocks: 300,000 / 640,000 = 0.46875; 510,000 / 640,000 =
  // 0.796875; 630,000 / 640,000 = 0.984375 (exact in binary); then 1 at the end.
  const std::vector<double> expected = {0.46875, 0.796875, 0.984375, 1.0};
  std::mt19937 random(20261203);
  std::normal_distribution<double> normal(0.0, 1.0);
  RowMatrix rows(1000, 40);
  for (Eigen::Index r = 0; r < rows.rows(); ++r)
    for (Eigen::Index c = 0; c < rows.cols(); ++c) rows(r, c) = normal(random);

  struct Way {
    const char* name;
    DistanceMeasure measure;
    bool screen;
  };
  for (const Way& way : {Way{"Cosine Delta, screened", DistanceMeasure::cosine_delta, true},
                         Way{"Cosine Delta, double precision", DistanceMeasure::cosine_delta, false},
                         Way{"Burrows's Delta, pair sums", DistanceMeasure::burrows_delta, true}}) {
    SECTION(way.name) {
      NearestOptions options;
      options.block_rows = 300;
      options.screen = way.screen;
      options.distance.threads = 2;
      std::vector<double> told;
      options.progress = [&](double share_done) { told.push_back(share_done); };
      const auto nearest = nearest_rows(rows, way.measure, 5, options);
      REQUIRE(nearest.size() == 1000);
      REQUIRE(told == expected);
    }
  }
}
