#include "core/file_reading.h"

#include <algorithm>
#include <filesystem>
#include <map>

#include "core/error.h"
#include "profile/profile_builder.h"
#include "profile/vocabulary.h"
#include "tei/reader.h"
#include "text/language_tags.h"
#include "text/tokenizer.h"

namespace manicule {

namespace {

// Whether a tag as an edition gives it can be read as a language ("de_AT" cannot), by
// LanguageRange's rule and cache; one a reading thread, as files repeat a few tags.
bool readable_language(const std::string& tag) {
  thread_local const LanguageRange tags("");
  return tags.readable(tag);
}

// The language holding the most tokens of the file's segments, of those whose tags can be
// read: the file's language. A segment whose tag cannot be read takes the file's (stored
// analyses, docs/store.md), which must then not be that tag too.
std::string main_language(const std::vector<SegmentRecord>& segments) {
  std::map<std::string, std::size_t> tokens;
  for (const auto& r : segments)
    if (readable_language(r.segment.language)) tokens[r.segment.language] += r.tokens;
  std::string best;
  std::size_t most = 0;
  for (const auto& [language, n] : tokens)
    if (n > most || best.empty()) best = language, most = n;
  return best;
}

}  // namespace

FileReading read_file(const std::string& file, const Request& request, const SelectionRules& rules,
                      Tokenizer& tokenizer) {
  FileReading result;
  result.file = file;
  std::error_code ec;
  result.bytes = static_cast<std::size_t>(std::filesystem::file_size(file, ec));
  if (ec) result.bytes = 0;
  try {
    SourceDigest digest;
    HeaderInfo header;
    std::vector<Segment> segments = read_segments(XmlSource::file(file), rules, &digest, &header);
    result.sha256 = digest.sha256;
    result.bytes = digest.bytes;
    ProfileBuilder builder(request.features);
    // Distinct words: for word features they are the segment's features; otherwise they
    // are interned here, a word counting once per segment (no allocation per token).
    const bool words_are_features = request.features.kind == FeatureKind::word;
    // A guess at the distinct words: the plays and novels of ../shared/corpora have one per
    // 40-120 bytes of XML; a low guess costs a rehash or two, a high one a larger table.
    // Capped: vocabulary grows far slower than text, and a file of gigabytes must not get
    // a table of its size (a bigger vocabulary still fits, by doubling).
    constexpr std::size_t kMostExpected = std::size_t{1} << 16;
    if (words_are_features) builder.expect_features(std::min<std::size_t>(result.bytes / 64, kMostExpected));
    Vocabulary words;
    std::vector<std::size_t> last_segment;  // by word id: 1 + the last segment it was seen in
    for (std::size_t index = 0; index < segments.size(); ++index) {
      Segment& segment = segments[index];
      SegmentRecord record;
      builder.begin_segment(segment.id);
      for (const TextRun& run : segment.runs) {
        tokenizer.tokenize(run.text, run.language, [&](std::string_view token) {
          ++record.tokens;
          builder.add_token(token);
          if (words_are_features) return;
          FeatureId id = words.intern(token);
          if (id >= last_segment.size()) last_segment.resize(id + 1, 0);
          if (last_segment[id] != index + 1) last_segment[id] = index + 1, ++record.types;
        });
      }
      builder.end_segment();
      if (!request.keep_text) segment.runs.clear();
      record.segment = std::move(segment);
      result.segments.push_back(std::move(record));
    }
    result.counts = builder.finish();
    if (words_are_features)
      for (std::size_t i = 0; i < result.segments.size(); ++i) result.segments[i].types = result.counts.segments[i].counts.size();
    result.metadata.title = header.title;
    result.metadata.author = join_authors(header.authors);
    result.metadata.date = work_date(header);
    result.metadata.year = first_year(result.metadata.date);
    // The language of its text (tei-conventions 4): its segments' (each run's xml:lang,
    // else langUsage), else the TEI element's xml:lang, and langUsage only after that.
    // Tags that cannot be read are passed by; where none can, the first given is kept.
    result.metadata.language = main_language(result.segments);
    for (const std::string* tag : {&header.tei_language, &header.language})
      if (result.metadata.language.empty() && readable_language(*tag)) result.metadata.language = *tag;
    if (result.metadata.language.empty()) result.metadata.language = header.tei_language;
    if (result.metadata.language.empty()) result.metadata.language = header.language;
  } catch (const Error& e) {
    result.failed = true;
    result.failure = FileFailure{file, e.what(), static_cast<int>(e.kind())};
  } catch (const std::exception& e) {
    result.failed = true;
    result.failure = FileFailure{file, file + ": " + e.what(), static_cast<int>(ErrorKind::internal)};
  }
  return result;
}

}  // namespace manicule
