// Escaping for XML and HTML output (JUnit and HTML reports).
#ifndef THETAGATE_REPORTS_XML_ESCAPE_H_
#define THETAGATE_REPORTS_XML_ESCAPE_H_

#include <string>

namespace thetagate::engine {

// `text` made safe for XML character data: & < > escaped, forbidden
// characters replaced by U+FFFD; newlines kept.
std::string xml_escape_text(const std::string& text);

// `text` made safe inside a double- or single-quoted attribute: as
// xml_escape_text, plus " ' and tab/newline/CR as character references (so
// an XML parser's attribute normalisation keeps them).
std::string xml_escape_attribute(const std::string& text);

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_XML_ESCAPE_H_
