// Skein tests: a small XML well-formedness checker for the SVG writers (report/plot.hpp, report/svg.hpp) and the
// SVGs inlined in the HTML report, and helpers to look elements up by id.
//
//   std::vector<skein::testing::Element> elements;
//   ASSERT_EQ(skein::testing::CheckXml(svg_text, elements), "");
//   const auto by_id = skein::testing::ById(elements);
#pragma once

#include <cctype>
#include <map>
#include <sstream>
#include <string>
#include <vector>

namespace skein::testing {

/// A small XML well-formedness check (XML 1.0, the subset an SVG writer uses): one root element, every start
/// tag closed in order, attribute values quoted, no attribute twice, only the five predefined entities or
/// numeric references, no '<' in text. Returns "" when well formed, else what is wrong. Elements met are
/// reported through `visit` (name and attributes).
struct Element {
  std::string name;
  std::map<std::string, std::string> attributes;
  std::string text;  ///< character data directly inside (for <text>-like elements)
};

inline std::string CheckXml(const std::string& doc, std::vector<Element>& elements) {
  std::vector<std::size_t> open;  // indices into elements
  std::size_t i = 0, roots = 0;
  auto is_name = [](char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '-' || c == '_' || c == ':' || c == '.'; };
  auto check_entities = [](const std::string& s) -> bool {
    for (std::size_t k = 0; k < s.size(); ++k) {
      if (s[k] == '<') return false;
      if (s[k] != '&') continue;
      const std::size_t e = s.find(';', k);
      if (e == std::string::npos) return false;
      const std::string ent = s.substr(k + 1, e - k - 1);
      if (!(ent == "amp" || ent == "lt" || ent == "gt" || ent == "quot" || ent == "apos" ||
            (ent.size() > 1 && ent[0] == '#')))
        return false;
    }
    return true;
  };
  if (doc.compare(0, 5, "<?xml") == 0) {
    i = doc.find("?>");
    if (i == std::string::npos) return "unterminated XML declaration";
    i += 2;
  }
  while (i < doc.size()) {
    const std::size_t lt = doc.find('<', i);
    const std::string text = doc.substr(i, (lt == std::string::npos ? doc.size() : lt) - i);
    if (!check_entities(text)) return "bad character data: " + text.substr(0, 40);
    if (open.empty() && text.find_first_not_of(" \t\r\n") != std::string::npos) return "text outside the root";
    if (!open.empty()) elements[open.back()].text += text;
    if (lt == std::string::npos) break;
    const std::size_t gt = doc.find('>', lt);
    if (gt == std::string::npos) return "unterminated tag";
    std::string tag = doc.substr(lt + 1, gt - lt - 1);
    i = gt + 1;
    if (!tag.empty() && tag[0] == '/') {
      const std::string name = tag.substr(1);
      if (open.empty() || elements[open.back()].name != name) return "mismatched end tag </" + name + ">";
      open.pop_back();
      continue;
    }
    const bool empty = !tag.empty() && tag.back() == '/';
    if (empty) tag.pop_back();
    std::size_t k = 0;
    while (k < tag.size() && is_name(tag[k])) ++k;
    Element el;
    el.name = tag.substr(0, k);
    if (el.name.empty()) return "tag without a name";
    while (k < tag.size()) {
      while (k < tag.size() && std::isspace(static_cast<unsigned char>(tag[k]))) ++k;
      if (k >= tag.size()) break;
      const std::size_t n0 = k;
      while (k < tag.size() && is_name(tag[k])) ++k;
      const std::string attr = tag.substr(n0, k - n0);
      if (attr.empty() || k >= tag.size() || tag[k] != '=') return "bad attribute in <" + el.name + ">";
      ++k;
      if (k >= tag.size() || (tag[k] != '"' && tag[k] != '\'')) return "unquoted attribute " + attr;
      const char q = tag[k++];
      const std::size_t end = tag.find(q, k);
      if (end == std::string::npos) return "unterminated attribute " + attr;
      const std::string value = tag.substr(k, end - k);
      if (!check_entities(value)) return "bad attribute value " + attr;
      if (el.attributes.count(attr)) return "attribute twice: " + attr;
      el.attributes[attr] = value;
      k = end + 1;
    }
    if (open.empty()) ++roots;
    if (roots > 1) return "more than one root element";
    elements.push_back(el);
    if (!empty) open.push_back(elements.size() - 1);
  }
  if (!open.empty()) return "unclosed element <" + elements[open.back()].name + ">";
  if (roots != 1) return "no root element";
  return "";
}


/// Elements that carry an id, by id (the first when an id repeats).
inline std::map<std::string, const Element*> ById(const std::vector<Element>& elements) {
  std::map<std::string, const Element*> m;
  for (const Element& e : elements) {
    const auto it = e.attributes.find("id");
    if (it != e.attributes.end() && !m.count(it->second)) m[it->second] = &e;
  }
  return m;
}

/// How many "x,y" pairs an SVG points attribute holds; -1 when one of them is not a pair of numbers.
inline long CountPointPairs(const std::string& points) {
  std::istringstream in(points);
  std::string pair;
  long n = 0;
  while (in >> pair) {
    const std::size_t comma = pair.find(',');
    if (comma == std::string::npos) return -1;
    try {
      std::size_t used = 0;
      std::stod(pair.substr(0, comma), &used);
      if (used != comma) return -1;
      std::stod(pair.substr(comma + 1), &used);
      if (used != pair.size() - comma - 1) return -1;
    } catch (...) {
      return -1;
    }
    ++n;
  }
  return n;
}

/// The <svg>...</svg> fragments of a document (an HTML page), in order.
inline std::vector<std::string> SvgFragments(const std::string& doc) {
  std::vector<std::string> out;
  std::size_t at = 0;
  while ((at = doc.find("<svg", at)) != std::string::npos) {
    const std::size_t end = doc.find("</svg>", at);
    if (end == std::string::npos) break;
    out.push_back(doc.substr(at, end + 6 - at));
    at = end + 6;
  }
  return out;
}

}  // namespace skein::testing
