// SeededSampler: the random choices of resampling and General Impostors, made the same way
// on every machine and compiler (the standard library's distributions are not specified
// bit for bit). SplitMix64 (Steele, Lea & Flood 2014, OOPSLA) generates; Lemire's
// multiply-shift with rejection (2019, ACM TOMACS 29(1)) maps to a range without bias.
// Each user owns one; nothing is shared between threads.
#pragma once
#include <cstddef>
#include <cstdint>
#include <vector>

namespace manicule {

class SeededSampler {
 public:
  explicit SeededSampler(std::uint64_t seed) : state_(seed) {}

  std::uint64_t next();
  // Uniform in [0, n); n > 0.
  std::uint64_t below(std::uint64_t n);
  // k distinct values of [0, n) in the order drawn (partial Fisher-Yates); k <= n.
  std::vector<std::size_t> choose(std::size_t n, std::size_t k);

 private:
  std::uint64_t state_;
};

// A seed for the i-th item of a run, so that items can be computed in any order (or in
// parallel) and still draw the same numbers.
std::uint64_t derived_seed(std::uint64_t seed, std::uint64_t item);

}  // namespace manicule
