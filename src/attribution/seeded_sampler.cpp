#include "attribution/seeded_sampler.h"

#include <numeric>

namespace manicule {

std::uint64_t SeededSampler::next() {
  std::uint64_t z = (state_ += 0x9E3779B97F4A7C15ULL);
  z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
  z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
  return z ^ (z >> 31);
}

std::uint64_t SeededSampler::below(std::uint64_t n) {
  unsigned __int128 m = static_cast<unsigned __int128>(next()) * n;
  auto low = static_cast<std::uint64_t>(m);
  if (low < n) {
    const std::uint64_t threshold = (0 - n) % n;
    while (low < threshold) {
      m = static_cast<unsigned __int128>(next()) * n;
      low = static_cast<std::uint64_t>(m);
    }
  }
  return static_cast<std::uint64_t>(m >> 64);
}

std::vector<std::size_t> SeededSampler::choose(std::size_t n, std::size_t k) {
  std::vector<std::size_t> pool(n);
  std::iota(pool.begin(), pool.end(), std::size_t{0});
  for (std::size_t i = 0; i < k && i < n; ++i) {
    const std::size_t j = i + static_cast<std::size_t>(below(n - i));
    std::swap(pool[i], pool[j]);
  }
  pool.resize(k < n ? k : n);
  return pool;
}

std::uint64_t derived_seed(std::uint64_t seed, std::uint64_t item) {
  SeededSampler s(seed ^ (item * 0xD1B54A32D192ED03ULL));
  return s.next();
}

}  // namespace manicule
