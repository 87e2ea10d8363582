// The strict reader of the text spec ("powerback-spec 1"); see docs/spec-format.md.
#include <charconv>
#include <cmath>
#include <cstring>
#include <set>

#include "powerback/errors.hpp"
#include "powerback/spec.hpp"

namespace powerback {
namespace {

[[noreturn]] void fail(std::size_t line, std::size_t col, const std::string& what) {
  throw Error(ErrorCode::Parse,
              "spec line " + std::to_string(line) + ", column " + std::to_string(col) + ": " + what);
}

// A short, printable excerpt of untrusted text for a message.
std::string show(const char* p, std::size_t n) {
  std::string s;
  for (std::size_t i = 0; i < n && i < 32; ++i) {
    const auto c = static_cast<unsigned char>(p[i]);
    s += (c >= 0x20 && c < 0x7F) ? static_cast<char>(c) : '?';
  }
  return n > 32 ? s + "..." : s;
}

bool is_space(char c) { return c == ' ' || c == '\t'; }

enum Key { kName, kFamily, kLambda, kShift, kReflect, kPivot, kKeyCount };
constexpr const char* kKeys[kKeyCount] = {"name", "family", "lambda", "shift", "reflect", "pivot"};
constexpr const char* kKnownKeys = "name, family, lambda, shift, reflect, pivot";

// Cursor over one line (without its newline).
struct Line {
  const char* p;
  std::size_t n;
  std::size_t no;   // 1-based line number
  std::size_t i = 0;
  std::size_t col() const { return i + 1; }
  bool done() const { return i >= n; }
  [[noreturn]] void error(const std::string& what) const { fail(no, col(), what); }
};

std::string parse_string(Line& L) {
  if (L.done() || L.p[L.i] != '"') L.error("expected a quoted string, e.g. name=\"income\"");
  const std::size_t start_col = L.col();
  ++L.i;
  std::string out;
  for (;;) {
    if (L.done()) fail(L.no, start_col, "unterminated string: a closing \" is missing");
    const auto c = static_cast<unsigned char>(L.p[L.i]);
    if (c == '"') {
      ++L.i;
      break;
    }
    if (c < 0x20 || c == 0x7F) L.error("control character in a string; write it as \\xHH");
    if (out.size() >= kSpecMaxNameLength)
      fail(L.no, start_col, "name longer than " + std::to_string(kSpecMaxNameLength) + " bytes");
    if (c != '\\') {
      out += static_cast<char>(c);
      ++L.i;
      continue;
    }
    if (L.i + 1 >= L.n) L.error("a backslash ends the line inside a string");
    const char e = L.p[L.i + 1];
    if (e == '"' || e == '\\') out += e;
    else if (e == 'n') out += '\n';
    else if (e == 't') out += '\t';
    else if (e == 'r') out += '\r';
    else if (e == 'x') {
      auto hexval = [&](std::size_t k) -> int {
        if (k >= L.n) return -1;
        const char h = L.p[k];
        if (h >= '0' && h <= '9') return h - '0';
        if (h >= 'a' && h <= 'f') return h - 'a' + 10;
        if (h >= 'A' && h <= 'F') return h - 'A' + 10;
        return -1;
      };
      const int hi = hexval(L.i + 2), lo = hexval(L.i + 3);
      if (hi < 0 || lo < 0) L.error("\\x needs two hexadecimal digits");
      if (hi == 0 && lo == 0) L.error("\\x00 is not allowed: names cannot hold NUL bytes");
      out += static_cast<char>(hi * 16 + lo);
      L.i += 2;
    } else {
      L.error(std::string("unknown escape \\") + show(&e, 1) +
              "; known escapes: \\\" \\\\ \\n \\t \\r \\xHH");
    }
    L.i += 2;
  }
  std::size_t bad = 0;
  if (!valid_utf8_text(out.data(), out.size(), &bad))
    fail(L.no, start_col, "the string is not valid UTF-8 once its escapes are read");
  return out;
}

// The bare token at the cursor: up to the next space or the end of the line.
std::string token(Line& L) {
  const std::size_t s = L.i;
  while (!L.done() && !is_space(L.p[L.i])) ++L.i;
  return std::string(L.p + s, L.i - s);
}

double parse_number(Line& L) {
  const std::size_t col = L.col();
  const std::string t = token(L);
  if (t.empty()) fail(L.no, col, "expected a number");
  std::string lower;
  for (char c : t) lower += static_cast<char>(c >= 'A' && c <= 'Z' ? c - 'A' + 'a' : c);
  if (lower.find("nan") != std::string::npos || lower.find("inf") != std::string::npos)
    fail(L.no, col, "NaN and infinite values are not allowed in a spec (got " + show(t.data(), t.size()) + ")");
  std::size_t k = 0;
  const bool neg = t[0] == '-';
  if (neg) k = 1;
  const bool hex = t.size() >= k + 2 && t[k] == '0' && (t[k + 1] == 'x' || t[k + 1] == 'X');
  if (hex) k += 2;
  const char* b = t.data() + k;
  const char* e = t.data() + t.size();
  const bool digit_first = b < e && ((*b >= '0' && *b <= '9') || *b == '.' ||
                                     (hex && ((*b >= 'a' && *b <= 'f') || (*b >= 'A' && *b <= 'F'))));
  double v = 0.0;
  std::from_chars_result r{b, std::errc::invalid_argument};
  if (digit_first)
    r = std::from_chars(b, e, v, hex ? std::chars_format::hex : std::chars_format::general);
  if (r.ec == std::errc::result_out_of_range)
    fail(L.no, col, "the number " + show(t.data(), t.size()) + " is out of the range of a double");
  if (r.ec != std::errc() || r.ptr != e)
    fail(L.no, col, "malformed number " + show(t.data(), t.size()) +
                        "; write it like 0x1.8p+1 (hexadecimal) or 1.5 (decimal)");
  return neg ? -v : v;
}

bool parse_bool(Line& L) {
  const std::size_t col = L.col();
  const std::string t = token(L);
  if (t == "true") return true;
  if (t == "false") return false;
  fail(L.no, col, "expected true or false, got " + show(t.data(), t.size()));
}

Family parse_family(Line& L) {
  const std::size_t col = L.col();
  const std::string t = token(L);
  for (int f = 0; f < kFamilyCount; ++f)
    if (t == family_name(static_cast<Family>(f))) return static_cast<Family>(f);
  std::string known;
  for (int f = 0; f < kFamilyCount; ++f)
    known += (f ? ", " : "") + std::string(family_name(static_cast<Family>(f)));
  fail(L.no, col, "unknown family " + show(t.data(), t.size()) + "; known families: " + known);
}

void parse_header(Line& L) {
  const std::string magic = kSpecMagic;
  const std::string line(L.p, L.n);
  const std::string want = magic + " " + std::to_string(kSpecFormatVersion);
  if (line == want) return;
  if (line.compare(0, magic.size() + 1, magic + " ") == 0) {
    const std::string v = line.substr(magic.size() + 1);
    bool digits = !v.empty() && v.size() <= 9 && v[0] != '0';
    for (char c : v) digits = digits && c >= '0' && c <= '9';
    if (digits && std::stol(v) > kSpecFormatVersion)
      fail(1, magic.size() + 2, "this spec uses format version " + v +
                                    ", newer than the version " + std::to_string(kSpecFormatVersion) +
                                    " this library reads: read it with a newer powerback");
    fail(1, magic.size() + 2, "unsupported format version " + show(v.data(), v.size()) +
                                  "; this library reads version " + std::to_string(kSpecFormatVersion));
  }
  fail(1, 1, "not a powerback spec: the first line must be \"" + want + "\"");
}

// Reads the fields of a record: for each "key=value" calls value(k) with the cursor on the value,
// after rejecting unknown and repeated keys. seen[k] tells which keys were given.
template <class F>
void parse_fields(Line& L, const char* const* keys, int nkeys, const char* known, bool* seen,
                  F&& value) {
  for (;;) {
    if (L.done()) break;
    if (!is_space(L.p[L.i])) L.error("expected a space before the next field");
    while (!L.done() && is_space(L.p[L.i])) ++L.i;
    if (L.done()) break;
    const std::size_t key_col = L.col();
    std::size_t e = L.i;
    while (e < L.n && L.p[e] != '=' && !is_space(L.p[e])) ++e;
    const std::string key(L.p + L.i, e - L.i);
    if (e >= L.n || L.p[e] != '=')
      fail(L.no, key_col, "expected key=value, got " + show(key.data(), key.size()));
    int k = 0;
    while (k < nkeys && key != keys[k]) ++k;
    if (k == nkeys)
      fail(L.no, key_col, "unknown key " + show(key.data(), key.size()) + "; known keys: " + known);
    if (seen[k]) fail(L.no, key_col, "the key " + key + " appears twice");
    seen[k] = true;
    L.i = e + 1;
    value(k);
    if (!L.done() && !is_space(L.p[L.i])) L.error("unexpected text after the value of " + key);
  }
}

void parse_transform(Line& L, Spec& spec) {
  bool seen[kKeyCount] = {};
  std::size_t name_col = 0;
  std::string name;
  TransformSpec s;
  parse_fields(L, kKeys, kKeyCount, kKnownKeys, seen, [&](int k) {
    switch (k) {
      case kName: name_col = L.col(); name = parse_string(L); break;
      case kFamily: s.family = parse_family(L); break;
      case kLambda: s.lambda = parse_number(L); break;
      case kShift: s.shift = parse_number(L); break;
      case kReflect: s.reflect = parse_bool(L); break;
      case kPivot: s.pivot = parse_number(L); break;
    }
  });
  const std::size_t end_col = L.n + 1;
  for (int k : {kName, kFamily, kShift, kReflect})
    if (!seen[k]) fail(L.no, end_col, std::string("the transform lacks the key ") + kKeys[k]);
  const std::string fam = family_name(s.family);
  if (family_has_lambda(s.family) && !seen[kLambda])
    fail(L.no, end_col, fam + " needs the key lambda");
  if (!family_has_lambda(s.family) && seen[kLambda])
    fail(L.no, end_col, fam + " has no lambda: remove the key lambda");
  if (s.reflect && !seen[kPivot]) fail(L.no, end_col, "reflect=true needs the key pivot");
  if (!s.reflect && seen[kPivot]) fail(L.no, end_col, "pivot is used only with reflect=true: remove it");
  if (spec.size() >= kSpecMaxRecords)
    fail(L.no, 1, "more than " + std::to_string(kSpecMaxRecords) + " transforms in one spec");
  if (spec.find(name) < spec.size())
    fail(L.no, name_col, "the name \"" + name + "\" is used twice; names must be distinct");
  try {
    spec.add(name, Transform(s));
  } catch (const Error& err) {
    fail(L.no, 1, std::string("invalid transform \"") + name + "\": " + err.what());
  }
}

// A number, or the keyword NA (returned as NaN) for a value that is not available.
double parse_number_or_na(Line& L) {
  if (L.n - L.i >= 2 && L.p[L.i] == 'N' && L.p[L.i + 1] == 'A' &&
      (L.n - L.i == 2 || is_space(L.p[L.i + 2]))) {
    L.i += 2;
    return std::nan("");
  }
  return parse_number(L);
}

// A non-negative decimal integer without sign or leading zeros, at most max.
std::size_t parse_count(Line& L, std::size_t max) {
  const std::size_t col = L.col();
  const std::string t = token(L);
  bool ok = !t.empty() && t.size() <= 15 && (t == "0" || t[0] != '0');
  for (char c : t) ok = ok && c >= '0' && c <= '9';
  if (!ok)
    fail(L.no, col, "expected a whole number like 12, got " + show(t.data(), t.size()));
  const unsigned long long v = std::stoull(t);
  if (v > max) fail(L.no, col, "the number " + t + " exceeds the limit of " + std::to_string(max));
  return static_cast<std::size_t>(v);
}

// A model record being read: its header line and the coefficient records that follow it.
struct PendingModel {
  SpecModel m;
  std::size_t line = 0;      // line of the model record; 0 when none was seen
  std::size_t declared = 0;  // coefficients=N
  bool open = false;         // coefficient records may still follow
  std::set<std::string> names;
};

enum ModelKey { kResponse, kCoefficients, kSigma, kDf, kModelKeyCount };
constexpr const char* kModelKeys[kModelKeyCount] = {"response", "coefficients", "sigma", "df"};
enum CoefKey { kCoefName, kCoefValue, kCoefKeyCount };
constexpr const char* kCoefKeys[kCoefKeyCount] = {"name", "value"};

void parse_model(Line& L, PendingModel& pm) {
  if (pm.line != 0)
    fail(L.no, 1, "a second model record; a spec holds at most one (the first is on line " +
                      std::to_string(pm.line) + ")");
  bool seen[kModelKeyCount] = {};
  std::size_t sigma_col = 0;
  parse_fields(L, kModelKeys, kModelKeyCount, "response, coefficients, sigma, df", seen, [&](int k) {
    switch (k) {
      case kResponse: pm.m.response = parse_string(L); break;
      case kCoefficients: pm.declared = parse_count(L, kSpecMaxCoefficients); break;
      case kSigma: sigma_col = L.col(); pm.m.sigma = parse_number_or_na(L); break;
      case kDf: pm.m.df = parse_count(L, std::size_t(999999999999999)); break;
    }
  });
  for (int k = 0; k < kModelKeyCount; ++k)
    if (!seen[k]) fail(L.no, L.n + 1, std::string("the model lacks the key ") + kModelKeys[k]);
  if (pm.m.sigma < 0.0) fail(L.no, sigma_col, "sigma must not be negative");
  pm.line = L.no;
  pm.open = true;
}

void parse_coefficient(Line& L, PendingModel& pm) {
  if (!pm.open)
    fail(L.no, 1, pm.line == 0 ? "a coefficient record before any model record"
                               : "a coefficient record that does not follow the model record");
  if (pm.m.names.size() >= pm.declared)
    fail(L.no, 1, "more coefficient records than the " + std::to_string(pm.declared) +
                      " declared by the model record on line " + std::to_string(pm.line));
  bool seen[kCoefKeyCount] = {};
  std::size_t name_col = 0;
  std::string name;
  double value = 0.0;
  parse_fields(L, kCoefKeys, kCoefKeyCount, "name, value", seen, [&](int k) {
    if (k == kCoefName) {
      name_col = L.col();
      name = parse_string(L);
    } else {
      value = parse_number_or_na(L);
    }
  });
  for (int k = 0; k < kCoefKeyCount; ++k)
    if (!seen[k]) fail(L.no, L.n + 1, std::string("the coefficient lacks the key ") + kCoefKeys[k]);
  if (name.empty()) fail(L.no, name_col, "a coefficient needs a non-empty name");
  if (!pm.names.insert(name).second)
    fail(L.no, name_col, "the coefficient name \"" + name + "\" is used twice; names must be distinct");
  pm.m.names.push_back(name);
  pm.m.coefficients.push_back(value);
}

// Called at any record other than a coefficient: closes an open model record.
void close_model(std::size_t no, PendingModel& pm, Spec& spec) {
  if (!pm.open) return;
  pm.open = false;
  if (pm.m.names.size() != pm.declared)
    fail(no, 1, "the model record on line " + std::to_string(pm.line) + " declares " +
                    std::to_string(pm.declared) + " coefficients but " +
                    std::to_string(pm.m.names.size()) + " coefficient records follow it");
  try {
    spec.set_model(pm.m);
  } catch (const Error& err) {
    fail(pm.line, 1, std::string("invalid model: ") + err.what());
  }
}

}  // namespace

Spec parse_spec(const char* text, std::size_t size) {
  if (!text && size > 0) throw Error(ErrorCode::Argument, "text is NULL but size > 0");
  if (size > kSpecMaxBytes)
    throw Error(ErrorCode::Parse, "the spec has " + std::to_string(size) +
                                      " bytes, more than the limit of " + std::to_string(kSpecMaxBytes));
  if (size == 0) fail(1, 1, "empty input: not a powerback spec");
  Spec spec;
  PendingModel pm;
  bool ended = false;
  std::size_t pos = 0, no = 0;
  while (pos < size) {
    ++no;
    const void* nl = std::memchr(text + pos, '\n', size - pos);
    const std::size_t stop = nl ? static_cast<std::size_t>(static_cast<const char*>(nl) - text) : size;
    std::size_t len = stop - pos;
    if (len > 0 && text[pos + len - 1] == '\r') --len;  // tolerate CRLF line ends
    if (len > kSpecMaxLineLength)
      fail(no, kSpecMaxLineLength + 1, "line longer than " + std::to_string(kSpecMaxLineLength) + " bytes");
    std::size_t bad = 0;
    if (!valid_utf8_text(text + pos, len, &bad))
      fail(no, bad + 1, text[pos + bad] == '\0' ? "binary data: a NUL byte" : "invalid UTF-8");
    if (ended) fail(no, 1, "text after the end line");
    if (!nl) fail(no, len + 1, "the last line has no newline: the spec is truncated");
    Line L{text + pos, len, no};
    pos = stop + 1;
    if (no == 1) {
      parse_header(L);
      continue;
    }
    std::size_t first = 0;
    while (first < len && is_space(L.p[first])) ++first;
    if (first == len || L.p[0] == '#') continue;  // blank line or comment
    if (first > 0) fail(no, 1, "a record starts at column 1, without leading spaces");
    const std::string kind = token(L);
    if (kind == "coefficient") {
      parse_coefficient(L, pm);
      continue;
    }
    if (kind == "transform" || kind == "model" || kind == "end") close_model(no, pm, spec);
    if (kind == "transform") {
      parse_transform(L, spec);
    } else if (kind == "model") {
      parse_model(L, pm);
    } else if (kind == "end") {
      if (!L.done()) L.error("text after end on the same line");
      ended = true;
    } else {
      fail(no, 1, "unknown record " + show(kind.data(), kind.size()) +
                      "; expected transform, model, coefficient or end");
    }
  }
  if (!ended) fail(no + 1, 1, "the end line is missing: the spec is truncated");
  return spec;
}

}  // namespace powerback
