#include "tei/xml_events.h"

#include <libxml/parser.h>
#include <libxml/parserInternals.h>
#include <libxml/SAX2.h>
#include <libxml/entities.h>
#include <libxml/xmlerror.h>

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <exception>
#include <memory>
#include <vector>

#include "core/error.h"
#include "core/regular_file.h"
#include "tei/xml_error_text.h"
#include "core/sha256.h"

namespace manicule {

std::string_view StartTag::attribute(std::string_view local_name, std::string_view ns_uri) const {
  for (int i = 0; i < attribute_count; ++i) {
    const xmlChar** a = attributes + 5 * i;
    std::string_view name(reinterpret_cast<const char*>(a[0]));
    if (name != local_name) continue;
    std::string_view uri = a[2] ? std::string_view(reinterpret_cast<const char*>(a[2])) : "";
    if (uri != ns_uri) continue;
    return std::string_view(reinterpret_cast<const char*>(a[3]), static_cast<std::size_t>(a[4] - a[3]));
  }
  return {};
}

bool StartTag::has_attribute(std::string_view local_name, std::string_view ns_uri) const {
  for (int i = 0; i < attribute_count; ++i) {
    const xmlChar** a = attributes + 5 * i;
    std::string_view uri = a[2] ? std::string_view(reinterpret_cast<const char*>(a[2])) : "";
    if (local_name == reinterpret_cast<const char*>(a[0]) && uri == ns_uri) return true;
  }
  return false;
}

namespace {

// Per-parse state reachable from libxml2 callbacks through ctxt->_private.
struct ParseState {
  XmlEventHandler* handler = nullptr;
  xmlParserCtxtPtr ctxt = nullptr;
  std::string first_error;
  long error_line = 0;
  long error_column = 0;
  std::exception_ptr handler_error;
  bool stopped = false;
  // The namespace of the last start tag: libxml2 hands the same interned URI to every
  // element of a namespace, so its length and TEI-ness are worked out once, not per element.
  const xmlChar* last_uri = nullptr;
  std::string_view last_ns;
  bool last_ns_is_tei = false;
  // The start line of each open element, innermost last: a file cut short is reported
  // with the line where its innermost unclosed element began.
  std::vector<long> open_lines;
  // Replacement text of internal entities handed out so far, against what the source
  // allows (entity_allowance): one entity of a few KiB used thousands of times passes
  // libxml2's checks against nested bombs, yet a 91 KB file grew to 192 MB of text.
  std::size_t entity_bytes = 0;
  std::size_t source_bytes = 0;  // read so far
};

// Replacement text a document may draw from internal entities: 8 MiB, and 8 bytes for each
// byte of the document. Editions declare entities for characters and short phrases; no
// edition seen comes near (a rule of thumb, no source).
std::size_t entity_allowance(const ParseState& st) { return (std::size_t{8} << 20) + 8 * st.source_bytes; }

// Far beyond any edition (TEI's deepest structures, nested apparatus within verse within
// speeches, stay under a hundred): a rule of thumb, no source.
constexpr std::size_t kMaxElementDepth = 10000;

ParseState* state_of(void* ctx) {
  auto ctxt = static_cast<xmlParserCtxtPtr>(ctx);
  return static_cast<ParseState*>(ctxt->_private);
}

void stop_with(ParseState* st, std::exception_ptr e) {
  if (!st->handler_error) st->handler_error = e;
  st->stopped = true;
  xmlStopParser(st->ctxt);
}

void on_start(void* ctx, const xmlChar* local, const xmlChar*, const xmlChar* uri, int,
              const xmlChar**, int nb_attributes, int, const xmlChar** attributes) {
  ParseState* st = state_of(ctx);
  if (st->stopped) return;
  StartTag tag;
  tag.local = reinterpret_cast<const char*>(local);
  if (uri != st->last_uri) {  // (no namespace at first: last_ns empty, not TEI)
    st->last_uri = uri;
    st->last_ns = uri ? std::string_view(reinterpret_cast<const char*>(uri)) : std::string_view();
    st->last_ns_is_tei = st->last_ns == kTeiNamespace;
  }
  tag.ns = st->last_ns;
  tag.in_tei_namespace = st->last_ns_is_tei;
  tag.line = xmlSAX2GetLineNumber(ctx);
  if (st->open_lines.size() >= kMaxElementDepth) {
    // libxml2's push parser sets no depth limit of its own; each open element costs the
    // reader memory, so a document of a million nested elements grew to 213 MB.
    if (st->first_error.empty()) {
      st->first_error = "elements nested more than " + std::to_string(kMaxElementDepth) + " levels deep; refused";
      st->error_line = tag.line;
    }
    st->stopped = true;
    xmlStopParser(st->ctxt);
    return;
  }
  st->open_lines.push_back(tag.line);
  tag.attributes = attributes;
  tag.attribute_count = nb_attributes;
  try {
    st->handler->start(tag);
  } catch (...) {
    stop_with(st, std::current_exception());
  }
}

void on_end(void* ctx, const xmlChar*, const xmlChar*, const xmlChar*) {
  ParseState* st = state_of(ctx);
  if (st->stopped) return;
  if (!st->open_lines.empty()) st->open_lines.pop_back();
  try {
    st->handler->end();
  } catch (...) {
    stop_with(st, std::current_exception());
  }
}

void on_characters(void* ctx, const xmlChar* ch, int len) {
  ParseState* st = state_of(ctx);
  if (st->stopped) return;
  try {
    st->handler->text(std::string_view(reinterpret_cast<const char*>(ch), static_cast<std::size_t>(len)));
  } catch (...) {
    stop_with(st, std::current_exception());
  }
}

void refuse_external(void* ctx, const xmlChar* name) {
  ParseState* st = state_of(ctx);
  if (st->first_error.empty()) {
    st->first_error = "external entity '" + std::string(reinterpret_cast<const char*>(name)) +
                      "' refused: manicule never loads files or URLs named by a document";
    st->error_line = xmlSAX2GetLineNumber(ctx);
    st->error_column = xmlSAX2GetColumnNumber(ctx);
  }
  st->stopped = true;
  xmlStopParser(st->ctxt);
}

bool is_external(xmlEntityPtr entity) {
  return entity && (entity->etype == XML_EXTERNAL_GENERAL_PARSED_ENTITY ||
                    entity->etype == XML_EXTERNAL_GENERAL_UNPARSED_ENTITY ||
                    entity->etype == XML_EXTERNAL_PARAMETER_ENTITY);
}

// External entities are never loaded: their content could be any local file. The lookup
// is done here rather than by xmlSAX2GetEntity, which would fetch external entities.
xmlEntityPtr on_get_entity(void* ctx, const xmlChar* name) {
  auto ctxt = static_cast<xmlParserCtxtPtr>(ctx);
  if (ctxt->inSubset == 0) {
    if (xmlEntityPtr predefined = xmlGetPredefinedEntity(name)) return predefined;
  }
  if (!ctxt->myDoc) return nullptr;
  xmlEntityPtr entity = xmlGetDocEntity(ctxt->myDoc, name);
  if (is_external(entity)) {
    refuse_external(ctx, name);
    return nullptr;
  }
  // (In the DTD too: an attribute's default value expands its references there.)
  if (entity && entity->etype == XML_INTERNAL_GENERAL_ENTITY) {
    ParseState* st = state_of(ctx);
    st->entity_bytes += static_cast<std::size_t>(std::max(entity->length, 0));
    if (st->entity_bytes > entity_allowance(*st)) {
      if (st->first_error.empty()) {
        st->first_error = "entities expand too far: references to '" + std::string(reinterpret_cast<const char*>(name)) +
                          "' and others bring in over " + std::to_string(st->entity_bytes >> 20) +
                          " MiB of text from a document of " + std::to_string(st->source_bytes) +
                          " bytes read so far; refused";
        st->error_line = xmlSAX2GetLineNumber(ctx);
        st->error_column = xmlSAX2GetColumnNumber(ctx);
      }
      st->stopped = true;
      xmlStopParser(ctxt);
      return nullptr;
    }
  }
  return entity;
}

xmlEntityPtr on_get_parameter_entity(void* ctx, const xmlChar* name) {
  auto ctxt = static_cast<xmlParserCtxtPtr>(ctx);
  if (!ctxt->myDoc) return nullptr;
  xmlEntityPtr entity = xmlGetParameterEntity(ctxt->myDoc, name);
  if (is_external(entity)) {
    refuse_external(ctx, name);
    return nullptr;
  }
  return entity;
}

xmlParserInputPtr on_resolve_entity(void* ctx, const xmlChar*, const xmlChar* system_id) {
  ParseState* st = state_of(ctx);
  if (st->first_error.empty()) {
    st->first_error = "external resource '" +
                      std::string(system_id ? reinterpret_cast<const char*>(system_id) : "") +
                      "' refused: manicule never loads files or URLs named by a document";
    st->error_line = xmlSAX2GetLineNumber(ctx);
  }
  return nullptr;
}

void on_external_subset(void*, const xmlChar*, const xmlChar*, const xmlChar*) {}

// Whether anything but white space is left of the input: libxml2's messages for a document
// that never began do not tell text that is not XML from no text at all.
bool text_remains(xmlParserCtxtPtr ctxt) {
  if (!ctxt || !ctxt->input || !ctxt->input->cur || !ctxt->input->end) return false;
  for (const xmlChar* c = ctxt->input->cur; c < ctxt->input->end; ++c)
    if (!IS_BLANK_CH(*c)) return true;
  return false;
}

constexpr const char* kNotMarkup = "not an XML document: it does not begin with markup ('<' expected)";

// libxml2 says "Document is empty" for any input that does not begin with markup.
std::string no_document_message(xmlParserCtxtPtr ctxt) {
  return text_remains(ctxt) ? kNotMarkup : "the file holds only white space: no XML document in it";
}

// At the end of the input the push parser reports any unfinished document as "Extra content
// at the end of the document"; most often the file was cut short.
std::string unfinished_document_message(const ParseState& st, const std::string& libxml2_message) {
  xmlParserCtxtPtr ctxt = st.ctxt;
  if (!ctxt || ctxt->instate == XML_PARSER_EPILOG)  // the root closed, then more than comments
    return libxml2_message + ": only comments and processing instructions may follow the root element";
  if (ctxt->nameNr > 0 && ctxt->name) {
    std::string msg = "the document ends before <" + std::string(reinterpret_cast<const char*>(ctxt->name)) + ">";
    if (!st.open_lines.empty()) msg += " (begun on line " + std::to_string(st.open_lines.back()) + ")";
    if (ctxt->nameNr > 1) msg += " and the " + std::to_string(ctxt->nameNr - 1) + " element(s) around it";
    return msg + (ctxt->nameNr > 1 ? " are" : " is") + " closed: the file looks cut short";
  }
  return text_remains(ctxt) ? kNotMarkup : "no root element: the document ends before its first element";
}

// An entity such as &nbsp; that only the document's external DTD declares: the text it
// stands for is unknown, since external DTDs are never loaded (as no other file or URL is).
std::string undeclared_entity_hint(xmlParserCtxtPtr ctxt) {
  const xmlDtd* doctype = ctxt->myDoc ? ctxt->myDoc->intSubset : nullptr;  // SAX2 keeps the DOCTYPE's ids there
  const std::string dtd = doctype && doctype->SystemID
                              ? std::string(reinterpret_cast<const char*>(doctype->SystemID))
                              : "an external DTD";
  return " (the DOCTYPE names " + dtd + ", which manicule never loads: declare the entity in the " +
         "document's internal subset, or write the character it stands for)";
}

void on_structured_error(void* user, xmlErrorPtr error) {
  auto st = static_cast<ParseState*>(static_cast<xmlParserCtxtPtr>(user)->_private);
  if (!error || error->level < XML_ERR_ERROR || !st->first_error.empty()) return;
  std::string msg = one_line_message(error->message);
  if (error->code == XML_ERR_DOCUMENT_EMPTY) msg = no_document_message(st->ctxt);
  if (error->code == XML_ERR_DOCUMENT_END) msg = unfinished_document_message(*st, msg);
  if ((error->code == XML_ERR_UNDECLARED_ENTITY || error->code == XML_WAR_UNDECLARED_ENTITY) && st->ctxt &&
      st->ctxt->hasExternalSubset)
    msg += undeclared_entity_hint(st->ctxt);
  if (error->code == XML_ERR_ENTITY_LOOP)
    msg = "entities expand too far (an entity-expansion bomb?): refused (" + msg + ")";
  st->first_error = msg;
  st->error_line = error->line;
  st->error_column = error->int2;
  // Inside an entity's replacement text libxml2 counts lines of the entity; report the
  // position in the document instead.
  xmlParserCtxtPtr ctxt = st->ctxt;
  if (ctxt && ctxt->inputNr > 1 && ctxt->inputTab[0]) {
    st->error_line = ctxt->inputTab[0]->line;
    st->error_column = ctxt->inputTab[0]->col;
  } else if (ctxt && ctxt->input && error->code == XML_ERR_ENTITY_LOOP) {
    st->error_line = ctxt->input->line;
    st->error_column = ctxt->input->col;
  }
}

// Fills `first` with the first chunk (at least 4 bytes when available, so libxml2 can
// detect UTF-16 from the byte-order mark).
class ChunkReader {
 public:
  explicit ChunkReader(const XmlSource& source) : source_(source) {
    if (!source.data) {
      file_ = open_regular_file(source.name);
    }
  }
  ~ChunkReader() {
    if (file_) std::fclose(file_);
  }
  // Returns the number of bytes placed in `out` (0 at the end).
  std::size_t next(std::vector<char>& out) {
    std::size_t n;
    if (source_.data) {
      n = std::min(out.size(), source_.size - offset_);
      std::memcpy(out.data(), source_.data + offset_, n);
      offset_ += n;
    } else {
      n = std::fread(out.data(), 1, out.size(), file_);
      if (n == 0 && std::ferror(file_)) {
        throw Error(ErrorKind::bad_input, std::string("error while reading: ") + std::strerror(errno),
                    source_.name);
      }
    }
    hash_.update(out.data(), n);
    bytes_ += n;
    return n;
  }
  // Reads what the parser did not need (it may stop early on an error) so the digest
  // always covers the whole source.
  SourceDigest finish(std::vector<char>& scratch) {
    while (next(scratch) > 0) {
    }
    return SourceDigest{bytes_, hash_.hex_digest()};
  }

 private:
  const XmlSource& source_;
  std::FILE* file_ = nullptr;
  std::size_t offset_ = 0;
  Sha256 hash_;
  std::size_t bytes_ = 0;
};

}  // namespace

SourceDigest parse_xml(const XmlSource& source, XmlEventHandler& handler) {
  ChunkReader reader(source);
  std::vector<char> chunk(256 * 1024);
  std::size_t n = reader.next(chunk);
  if (n == 0) throw Error(ErrorKind::bad_input, "the file is empty: no XML document in it", source.name);

  xmlSAXHandler sax;
  std::memset(&sax, 0, sizeof sax);
  xmlSAXVersion(&sax, 2);  // default SAX2 callbacks keep the internal DTD subset (entities)
  sax.startElementNs = on_start;
  sax.endElementNs = on_end;
  sax.characters = on_characters;
  sax.cdataBlock = on_characters;
  sax.ignorableWhitespace = on_characters;
  sax.getEntity = on_get_entity;
  sax.getParameterEntity = on_get_parameter_entity;
  sax.resolveEntity = on_resolve_entity;
  sax.externalSubset = on_external_subset;
  sax.serror = on_structured_error;
  sax.comment = nullptr;
  sax.processingInstruction = nullptr;
  sax.warning = nullptr;
  sax.error = nullptr;
  sax.fatalError = nullptr;

  ParseState st;
  st.handler = &handler;
  st.source_bytes = n;
  std::unique_ptr<xmlParserCtxt, void (*)(xmlParserCtxtPtr)> ctxt(
      xmlCreatePushParserCtxt(&sax, nullptr, chunk.data(), static_cast<int>(std::min<std::size_t>(n, 4)),
                              source.name.c_str()),
      [](xmlParserCtxtPtr c) {
        if (c->myDoc) xmlFreeDoc(c->myDoc);
        c->myDoc = nullptr;
        xmlFreeParserCtxt(c);
      });
  if (!ctxt) throw Error(ErrorKind::internal, "could not create an XML parser", source.name);
  ctxt->_private = &st;
  ctxt->sax->serror = on_structured_error;
  st.ctxt = ctxt.get();
  // libxml2 hands the structured-error callback the context as its user data.
  xmlCtxtUseOptions(ctxt.get(), XML_PARSE_NONET | XML_PARSE_NOENT | XML_PARSE_NOCDATA |
                                    XML_PARSE_NOWARNING | XML_PARSE_NOERROR);
  ctxt->replaceEntities = 1;  // expand internal entities (external ones are refused above)
  ctxt->loadsubset = 0;
  ctxt->validate = 0;

  std::size_t offset = std::min<std::size_t>(n, 4);
  bool more = true;
  while (more && !st.stopped) {
    if (offset < n) {
      xmlParseChunk(ctxt.get(), chunk.data() + offset, static_cast<int>(n - offset), 0);
      if (!st.first_error.empty() || st.stopped) break;
    }
    offset = 0;
    n = reader.next(chunk);
    st.source_bytes += n;
    if (n == 0) {
      xmlParseChunk(ctxt.get(), nullptr, 0, 1);
      more = false;
    }
  }
  if (st.handler_error) std::rethrow_exception(st.handler_error);
  if (!st.first_error.empty() || !ctxt->wellFormed) {
    std::string msg = st.first_error.empty() ? "malformed XML" : st.first_error;
    long line = st.error_line ? st.error_line : (ctxt->input ? ctxt->input->line : 0);
    throw Error(ErrorKind::bad_input, msg, source.name, line, st.error_column);
  }
  return reader.finish(chunk);
}

}  // namespace manicule
