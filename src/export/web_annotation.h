// Stored results as W3C Web Annotation JSON-LD (Web Annotation Data Model, W3C
// Recommendation 23 February 2017), mapped as tei-conventions.md section 6 says:
//  - an AnnotationCollection whose first AnnotationPage holds every annotation; each
//    annotation carries "@context": "http://www.w3.org/ns/anno.jsonld" as well, so that
//    it stands alone when taken out
//  - one annotation per result: per segment profile ("describing"), per distance
//    ("assessing", target: its TEI link, since several WADM targets would not mean
//    "this pair"), the PCA summary ("describing")
//  - id: the edition's URI + "#" + xml:id; creator (respStmt) and created
//    (revisionDesc/change[@status="created"]/@when); generator and generated: this export
//  - body: the note as a TextualBody (text/plain, en), the fs values as a TextualBody
//    (application/json) and the fs element's IRI
//  - target: "#id" becomes URI#id; a TEI xpath() pointer becomes a SpecificResource
//    with an XPathSelector on the edition; a join becomes its parts, one target each.
//    XPath steps are written namespace-free (*[local-name()='sp'][3]) so they select in
//    a namespaced TEI document without a prefix binding.
// This layer knows no XML: it reads StoredResults (src/standoff/stored_results.h).
#pragma once
#include <string>

#include <nlohmann/json.hpp>

#include "standoff/stored_results.h"

namespace manicule {

// `base_uri`: the URI of the document the results were read from (an edition, or a
// separate results file whose pointers are relative to it). `generated`: ISO 8601 time.
nlohmann::ordered_json web_annotations(const StoredResults& results, const std::string& base_uri,
                               const std::string& generated);

// A TEI xpath() pointer's path as a namespace-free XPath 1.0 expression.
std::string namespace_free_xpath(const std::string& path);

}  // namespace manicule
