// measure_driver: a small command-line window on src/profile and src/measure for the
// reference tests (tests/reference/test_measures_*.py) and the distance benchmark.
// Reads tokens per segment (TSV: id, then one token per field), a feature matrix (TSV with
// a header row: id, feature names) or a raw row-major float64 file, and writes TSV with
// every number at full precision (%.17g). Usage: see usage() below.
#include <chrono>
#include <cstdio>
#include <fstream>
#include <iostream>
#include <map>
#include <sstream>
#include <string>
#include <vector>

#include "core/error.h"
#include "measure/bootstrap_consensus.h"
#include "measure/nearest_rows.h"
#include "measure/newick.h"
#include "measure/pca.h"
#include "profile/profile_builder.h"
#include "profile/stop_list.h"

using namespace manicule;

namespace {

const char* usage() {
  return "measure_driver COMMAND [--key value ...]\n"
         "  profile   --table counts|relative|z|stats|excluded|report\n"
         "  distance  --measure NAME [--threads T] [--repeat K] [--output none]\n"
         "  nearest   --measure NAME [--k K] [--block ROWS] [--threads T] [--screen yes|no]\n"
         "  pca       [--input z|relative] [--components K] [--top K] "
         "--table coordinates|variance|loadings|poles\n"
         "  linkage   --method ward|average|complete [--measure NAME] [--newick]\n"
         "  consensus --ranges A-B,A-C,... --measure NAME --method NAME\n"
         "input: tokens TSV on stdin (feature options --kind --n --first --last --culling\n"
         "  --min-tokens --stop FILE), or --matrix FILE (TSV, used as the measure's input),\n"
         "  or --distances FILE (linkage), or --binary FILE --rows R --cols C\n";
}

using Options = std::map<std::string, std::string>;

Options parse_options(int argc, char** argv) {
  Options options;
  for (int i = 2; i < argc; ++i) {
    std::string key = argv[i];
    if (key.rfind("--", 0) != 0) throw Error(ErrorKind::usage, "unexpected argument " + key);
    key = key.substr(2);
    if (key == "newick") {
      options[key] = "1";
    } else if (i + 1 < argc) {
      options[key] = argv[++i];
    } else {
      throw Error(ErrorKind::usage, "--" + key + " needs a value");
    }
  }
  return options;
}

std::string get(const Options& o, const std::string& key, const std::string& fallback) {
  const auto it = o.find(key);
  return it == o.end() ? fallback : it->second;
}

std::size_t get_size(const Options& o, const std::string& key, std::size_t fallback) {
  const auto it = o.find(key);
  return it == o.end() ? fallback : std::stoul(it->second);
}

std::vector<std::string> split(const std::string& line, char separator) {
  std::vector<std::string> fields;
  std::size_t start = 0;
  while (true) {
    const std::size_t end = line.find(separator, start);
    fields.push_back(line.substr(start, end - start));
    if (end == std::string::npos) return fields;
    start = end + 1;
  }
}

void print_number(double value) { std::printf("%.17g", value); }

CountProfile read_token_profile(const Options& o) {
  FeatureSpec spec;
  spec.kind = parse_feature_kind(get(o, "kind", "word"));
  spec.n = static_cast<int>(get_size(o, "n", 1));
  ProfileBuilder builder(spec);
  std::string line;
  while (std::getline(std::cin, line)) {
    if (line.empty()) continue;
    std::vector<std::string> fields = split(line, '\t');
    const std::string id = fields.front();
    fields.erase(fields.begin());
    builder.add_segment(id, fields);
  }
  return builder.finish();
}

FeatureSpaceOptions feature_options(const Options& o) {
  FeatureSpaceOptions options;
  options.rank_first = get_size(o, "first", 1);
  options.rank_last = get_size(o, "last", 1000);
  options.culling_percent = std::stod(get(o, "culling", "0"));
  options.min_segment_tokens = get_size(o, "min-tokens", kDefaultMinSegmentTokens);
  if (o.count("stop")) options.stop_words = load_stop_list(o.at("stop"));
  return options;
}

struct LabelledMatrix {
  std::vector<std::string> rows;
  std::vector<std::string> columns;
  RowMatrix values;
};

LabelledMatrix read_matrix_tsv(const std::string& path) {
  std::ifstream in(path);
  if (!in) throw Error(ErrorKind::bad_input, "cannot read", path);
  LabelledMatrix m;
  std::string line;
  std::getline(in, line);
  m.columns = split(line, '\t');
  m.columns.erase(m.columns.begin());
  std::vector<std::vector<double>> data;
  while (std::getline(in, line)) {
    if (line.empty()) continue;
    const std::vector<std::string> fields = split(line, '\t');
    m.rows.push_back(fields.front());
    data.emplace_back();
    for (std::size_t c = 1; c < fields.size(); ++c) data.back().push_back(std::stod(fields[c]));
  }
  m.values.resize(static_cast<Eigen::Index>(data.size()), static_cast<Eigen::Index>(m.columns.size()));
  for (std::size_t r = 0; r < data.size(); ++r) {
    for (std::size_t c = 0; c < m.columns.size(); ++c) {
      m.values(static_cast<Eigen::Index>(r), static_cast<Eigen::Index>(c)) = data[r].at(c);
    }
  }
  return m;
}

LabelledMatrix read_binary(const Options& o) {
  LabelledMatrix m;
  const auto rows = static_cast<Eigen::Index>(get_size(o, "rows", 0));
  const auto cols = static_cast<Eigen::Index>(get_size(o, "cols", 0));
  m.values.resize(rows, cols);
  std::ifstream in(o.at("binary"), std::ios::binary);
  in.read(reinterpret_cast<char*>(m.values.data()),
          static_cast<std::streamsize>(sizeof(double) * static_cast<std::size_t>(rows * cols)));
  if (!in) throw Error(ErrorKind::bad_input, "cannot read the binary matrix", o.at("binary"));
  for (Eigen::Index r = 0; r < rows; ++r) m.rows.push_back("r" + std::to_string(r));
  return m;
}

// The rows a measure works on: given directly, or built from tokens.
LabelledMatrix measure_input(const Options& o, bool on_z) {
  if (o.count("matrix")) return read_matrix_tsv(o.at("matrix"));
  if (o.count("binary")) return read_binary(o);
  const FeatureTable table = build_feature_table(read_token_profile(o), feature_options(o));
  return {table.segment_ids, table.features, on_z ? table.z : table.relative};
}

template <class Matrix>
void print_matrix(const std::vector<std::string>& rows, const std::vector<std::string>& columns,
                  const Matrix& values) {
  std::printf("id");
  for (const std::string& c : columns) std::printf("\t%s", c.c_str());
  std::printf("\n");
  for (Eigen::Index r = 0; r < values.rows(); ++r) {
    std::printf("%s", rows[static_cast<std::size_t>(r)].c_str());
    for (Eigen::Index c = 0; c < values.cols(); ++c) {
      std::printf("\t");
      print_number(values(r, c));
    }
    std::printf("\n");
  }
}

void run_profile(const Options& o) {
  const FeatureTable t = build_feature_table(read_token_profile(o), feature_options(o));
  const std::string table = get(o, "table", "relative");
  if (table == "counts") print_matrix(t.segment_ids, t.features, feature_counts(t));
  if (table == "relative") print_matrix(t.segment_ids, t.features, t.relative);
  if (table == "z") print_matrix(t.segment_ids, t.features, t.z);
  if (table == "stats") {
    std::printf("feature\trank\ttotal\tmean\tsd\n");
    for (std::size_t f = 0; f < t.feature_count(); ++f) {
      std::printf("%s\t%zu\t%zu\t", t.features[f].c_str(), t.feature_ranks[f], t.feature_totals[f]);
      print_number(t.mean[static_cast<Eigen::Index>(f)]);
      std::printf("\t");
      print_number(t.sd[static_cast<Eigen::Index>(f)]);
      std::printf("\n");
    }
  }
  if (table == "segments") {
    std::printf("id\ttokens\ttotal\n");
    for (std::size_t s = 0; s < t.segment_count(); ++s) {
      std::printf("%s\t%zu\t%zu\n", t.segment_ids[s].c_str(), t.segment_tokens[s], t.segment_totals[s]);
    }
  }
  if (table == "excluded") {
    std::printf("id\ttokens\treason\n");
    for (const ExcludedSegment& e : t.report.excluded_segments) {
      std::printf("%s\t%zu\t%s\n", e.id.c_str(), e.tokens, e.reason.c_str());
    }
  }
  if (table == "report") {
    const FeatureSelectionReport& r = t.report;
    std::printf("key\tvalue\ncandidates\t%zu\nstopped\t%zu\nculled\t%zu\nzero_variance\t%zu\n"
                "fewer_than_asked\t%d\nfeatures\t%zu\nsegments\t%zu\n",
                r.candidates, r.stopped, r.culled, r.zero_variance, r.fewer_than_asked ? 1 : 0,
                t.feature_count(), t.segment_count());
  }
}

void run_distance(const Options& o) {
  const DistanceMeasure measure = parse_distance_measure(get(o, "measure", "burrows-delta"));
  const LabelledMatrix input =
      measure_input(o, measure_info(measure).input == MeasureInput::z_scores);
  DistanceOptions options;
  options.threads = static_cast<unsigned>(get_size(o, "threads", 0));
  Eigen::MatrixXd d;
  for (std::size_t k = 0, repeat = get_size(o, "repeat", 1); k < repeat; ++k) {
    const auto start = std::chrono::steady_clock::now();
    d = pairwise_distances(input.values, measure, options);
    const std::chrono::duration<double> took = std::chrono::steady_clock::now() - start;
    std::fprintf(stderr, "seconds\t%.6f\n", took.count());
  }
  if (get(o, "output", "tsv") == "tsv") print_matrix(input.rows, input.rows, d);
}

// The k nearest rows of each row, computed as an archive's analysis does (nearest_rows.h);
// --block sets the rows a block of dot products holds, --screen no measures every pair in
// double precision.
void run_nearest(const Options& o) {
  const DistanceMeasure measure = parse_distance_measure(get(o, "measure", "cosine-delta"));
  const LabelledMatrix input =
      measure_input(o, measure_info(measure).input == MeasureInput::z_scores);
  NearestOptions options;
  options.distance.threads = static_cast<unsigned>(get_size(o, "threads", 0));
  options.block_rows = get_size(o, "block", 0);
  options.screen = get(o, "screen", "yes") == "yes";
  const auto nearest = nearest_rows(input.values, measure, get_size(o, "k", 5), options);
  std::printf("row\trank\tneighbour\tdistance\n");
  for (std::size_t i = 0; i < nearest.size(); ++i)
    for (std::size_t r = 0; r < nearest[i].size(); ++r) {
      std::printf("%s\t%zu\t%s\t", input.rows[i].c_str(), r + 1, input.rows[nearest[i][r].row].c_str());
      print_number(nearest[i][r].distance);
      std::printf("\n");
    }
}

void run_pca(const Options& o) {
  PcaOptions options;
  options.input = get(o, "input", "z") == "z" ? PcaInput::z_scores : PcaInput::relative_frequencies;
  options.components = get_size(o, "components", 2);
  options.top_features = get_size(o, "top", 5);
  const LabelledMatrix input = measure_input(o, options.input == PcaInput::z_scores);
  const PcaResult p = principal_components(input.values, options);
  std::vector<std::string> names;
  for (Eigen::Index c = 0; c < p.coordinates.cols(); ++c) names.push_back("PC" + std::to_string(c + 1));
  const std::string table = get(o, "table", "coordinates");
  if (table == "coordinates") print_matrix(input.rows, names, p.coordinates);
  if (table == "loadings") print_matrix(input.columns, names, p.loadings);
  if (table == "variance") {
    std::printf("component\tvariance\tratio\n");
    for (Eigen::Index c = 0; c < p.explained_variance.size(); ++c) {
      std::printf("%s\t", names[static_cast<std::size_t>(c)].c_str());
      print_number(p.explained_variance[c]);
      std::printf("\t");
      print_number(p.explained_variance_ratio[c]);
      std::printf("\n");
    }
  }
  if (table == "poles") {
    std::printf("component\tside\tfeature\tloading\n");
    for (std::size_t c = 0; c < p.poles.size(); ++c) {
      for (const auto& [side, list] : {std::pair{"positive", &p.poles[c].positive},
                                       std::pair{"negative", &p.poles[c].negative}}) {
        for (const FeatureWeight& w : *list) {
          std::printf("%s\t%s\t%s\t", names[c].c_str(), side, input.columns[w.feature].c_str());
          print_number(w.loading);
          std::printf("\n");
        }
      }
    }
  }
}

void run_linkage(const Options& o) {
  const LinkageMethod method = parse_linkage_method(get(o, "method", "ward"));
  Dendrogram tree;
  if (o.count("distances")) {
    const LabelledMatrix d = read_matrix_tsv(o.at("distances"));
    tree = hierarchical_clustering(d.values, d.rows, method);
  } else {
    const DistanceMeasure measure = parse_distance_measure(get(o, "measure", "euclidean"));
    const LabelledMatrix input =
        measure_input(o, measure_info(measure).input == MeasureInput::z_scores);
    tree = hierarchical_clustering(pairwise_distances(input.values, measure), input.rows, method);
  }
  if (o.count("newick")) {
    std::printf("%s\n", to_newick(tree).c_str());
    return;
  }
  std::printf("a\tb\theight\tsize\n");
  for (const Merge& m : tree.merges) {
    std::printf("%zu\t%zu\t", m.a, m.b);
    print_number(m.height);
    std::printf("\t%zu\n", m.size);
  }
}

void run_consensus(const Options& o) {
  ConsensusRequest request;
  for (const std::string& range : split(get(o, "ranges", "1-100"), ',')) {
    const std::vector<std::string> ends = split(range, '-');
    request.ranges.emplace_back(std::stoul(ends.at(0)), std::stoul(ends.at(1)));
  }
  request.features = feature_options(o);
  request.measure = parse_distance_measure(get(o, "measure", "cosine-delta"));
  request.method = parse_linkage_method(get(o, "method", "ward"));
  const ConsensusTree tree = bootstrap_consensus(read_token_profile(o), request);
  std::printf("# %s\n", to_newick(tree).c_str());
  std::printf("members\tappearances\tsupport\n");
  for (const ConsensusClade& clade : tree.clades) {
    std::string members;
    for (std::size_t m : clade.members) members += (members.empty() ? "" : ",") + tree.labels[m];
    std::printf("%s\t%zu\t", members.c_str(), clade.appearances);
    print_number(clade.support);
    std::printf("\n");
  }
}

}  // namespace

int main(int argc, char** argv) {
  if (argc < 2) {
    std::fputs(usage(), stderr);
    return 2;
  }
  try {
    const std::string command = argv[1];
    const Options options = parse_options(argc, argv);
    if (command == "profile") run_profile(options);
    else if (command == "distance") run_distance(options);
    else if (command == "nearest") run_nearest(options);
    else if (command == "pca") run_pca(options);
    else if (command == "linkage") run_linkage(options);
    else if (command == "consensus") run_consensus(options);
    else throw Error(ErrorKind::usage, std::string("unknown command\n") + usage());
  } catch (const Error& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return static_cast<int>(e.kind());
  } catch (const std::exception& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return 70;
  }
  return 0;
}
