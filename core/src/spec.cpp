// The spec container, its writer, number formatting and the file helpers. The reader is in
// spec_parse.cpp.
#include "powerback/spec.hpp"

#include <cerrno>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <iterator>
#include <set>

#include "powerback/errors.hpp"

namespace powerback {

bool valid_utf8_text(const char* s, std::size_t n, std::size_t* bad) {
  const auto* u = reinterpret_cast<const unsigned char*>(s);
  std::size_t i = 0;
  auto fail = [&](std::size_t at) {
    if (bad) *bad = at;
    return false;
  };
  while (i < n) {
    const unsigned c = u[i];
    if (c == 0) return fail(i);
    if (c < 0x80) {
      ++i;
      continue;
    }
    std::size_t len;
    unsigned lo = 0x80, hi = 0xBF;  // allowed range of the second byte
    if (c >= 0xC2 && c <= 0xDF) {
      len = 2;
    } else if (c >= 0xE0 && c <= 0xEF) {
      len = 3;
      if (c == 0xE0) lo = 0xA0;       // no overlong forms
      if (c == 0xED) hi = 0x9F;       // no UTF-16 surrogates
    } else if (c >= 0xF0 && c <= 0xF4) {
      len = 4;
      if (c == 0xF0) lo = 0x90;
      if (c == 0xF4) hi = 0x8F;       // nothing above U+10FFFF
    } else {
      return fail(i);
    }
    if (n - i < len) return fail(i);
    if (u[i + 1] < lo || u[i + 1] > hi) return fail(i);
    for (std::size_t k = 2; k < len; ++k)
      if (u[i + k] < 0x80 || u[i + k] > 0xBF) return fail(i);
    i += len;
  }
  return true;
}

std::string format_hex_double(double x) {
  require(std::isfinite(x), "a spec holds only finite numbers; got " + format_number(x));
  char buf[64];
  const auto res = std::to_chars(buf, buf + sizeof buf, std::fabs(x), std::chars_format::hex);
  if (res.ec != std::errc()) throw Error(ErrorCode::Internal, "hexadecimal formatting failed");
  return std::string(std::signbit(x) ? "-0x" : "0x") + std::string(buf, res.ptr);
}

void check_spec_name(const std::string& name, const std::string& what) {
  require(!name.empty(), what + " needs a non-empty name");
  require(name.size() <= kSpecMaxNameLength,
          "the name \"" + name.substr(0, 40) + "...\" of " + what + " has " +
              std::to_string(name.size()) + " bytes; a spec allows at most " +
              std::to_string(kSpecMaxNameLength));
  std::size_t bad = 0;
  const bool utf8 = valid_utf8_text(name.data(), name.size(), &bad);
  require(utf8, "the name of " + what + " has " +
                    (name[bad] == '\0' ? std::string("a NUL byte") : std::string("invalid UTF-8")) +
                    " at byte " + std::to_string(bad) + "; names must be UTF-8 text");
}

void Spec::add(const std::string& name, const Transform& t) {
  check_spec_name(name, "transform " + std::to_string(items_.size()));
  require(find(name) == items_.size(),
          "the name \"" + name + "\" is used twice; names in a spec must be distinct");
  if (items_.size() >= kSpecMaxRecords)
    throw Error(ErrorCode::Memory,
                "a spec holds at most " + std::to_string(kSpecMaxRecords) + " transforms");
  items_.push_back(NamedTransform{name, t});
  index_.emplace(name, items_.size() - 1);
}

const NamedTransform& Spec::at(std::size_t i) const {
  require(i < items_.size(), "index " + std::to_string(i) + " is out of range: the spec holds " +
                                 std::to_string(items_.size()) + " transforms");
  return items_[i];
}

void Spec::set_model(const SpecModel& m) {
  check_spec_name(m.response, "the model's response");
  require(m.names.size() == m.coefficients.size(),
          "the model has " + std::to_string(m.names.size()) + " coefficient names but " +
              std::to_string(m.coefficients.size()) + " values; give one value per name");
  if (m.names.size() > kSpecMaxCoefficients)
    throw Error(ErrorCode::Memory, "a spec's model holds at most " +
                                       std::to_string(kSpecMaxCoefficients) + " coefficients");
  std::set<std::string> seen;
  for (std::size_t j = 0; j < m.names.size(); ++j) {
    check_spec_name(m.names[j], "coefficient " + std::to_string(j));
    require(seen.insert(m.names[j]).second,
            "the coefficient name \"" + m.names[j] + "\" is used twice; names must be distinct");
    require(!std::isinf(m.coefficients[j]),
            "coefficient \"" + m.names[j] + "\" is infinite; a spec holds finite values or NaN "
            "for an aliased coefficient");
  }
  require(std::isnan(m.sigma) || (std::isfinite(m.sigma) && m.sigma >= 0.0),
          "sigma must be finite and non-negative (or NaN when not available); got " +
              format_number(m.sigma));
  model_ = m;
  has_model_ = true;
}

const SpecModel& Spec::model() const {
  require(has_model_, "the spec has no model record");
  return model_;
}

std::size_t Spec::find(const std::string& name) const noexcept {
  // A hash index keeps parsing linear in the record count (a hostile file may hold 65536).
  const auto it = index_.find(name);
  return it == index_.end() ? items_.size() : it->second;
}

namespace {

std::string quote(const std::string& s) {
  static const char* hex = "0123456789abcdef";
  std::string q = "\"";
  for (const char ch : s) {
    const auto c = static_cast<unsigned char>(ch);
    if (c == '"') q += "\\\"";
    else if (c == '\\') q += "\\\\";
    else if (c == '\n') q += "\\n";
    else if (c == '\t') q += "\\t";
    else if (c == '\r') q += "\\r";
    else if (c < 0x20 || c == 0x7F) q += std::string("\\x") + hex[c >> 4] + hex[c & 15];
    else q += ch;
  }
  return q + "\"";
}

}  // namespace

std::string write_spec(const Spec& spec) {
  std::string out = std::string(kSpecMagic) + " " + std::to_string(kSpecFormatVersion) + "\n";
  for (std::size_t i = 0; i < spec.size(); ++i) {
    const NamedTransform& nt = spec.at(i);
    const TransformSpec& s = nt.transform.spec();
    out += "transform name=" + quote(nt.name) + " family=" + family_name(s.family);
    if (family_has_lambda(s.family)) out += " lambda=" + format_hex_double(s.lambda);
    out += " shift=" + format_hex_double(s.shift);
    out += s.reflect ? " reflect=true pivot=" + format_hex_double(s.pivot) : " reflect=false";
    out += "\n";
  }
  if (spec.has_model()) {
    const SpecModel& m = spec.model();
    auto num_or_na = [](double v) { return std::isnan(v) ? std::string("NA") : format_hex_double(v); };
    out += "model response=" + quote(m.response) + " coefficients=" +
           std::to_string(m.names.size()) + " sigma=" + num_or_na(m.sigma) +
           " df=" + std::to_string(m.df) + "\n";
    for (std::size_t j = 0; j < m.names.size(); ++j)
      out += "coefficient name=" + quote(m.names[j]) + " value=" + num_or_na(m.coefficients[j]) + "\n";
  }
  return out + "end\n";
}

Spec read_spec_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in)
    throw Error(ErrorCode::Argument, "cannot open the spec file \"" + path + "\" for reading: " +
                                         std::strerror(errno));
  // Read in chunks and stop one chunk past the limit, so a huge file costs bounded memory.
  std::string text;
  char chunk[1 << 16];
  while (in && text.size() <= kSpecMaxBytes) {
    in.read(chunk, sizeof chunk);
    text.append(chunk, static_cast<std::size_t>(in.gcount()));
  }
  if (in.bad())
    throw Error(ErrorCode::Argument, "reading the spec file \"" + path + "\" failed");
  if (text.size() > kSpecMaxBytes)
    throw Error(ErrorCode::Parse, "the spec file \"" + path + "\" is larger than the limit of " +
                                      std::to_string(kSpecMaxBytes) + " bytes");
  return parse_spec(text.data(), text.size());
}

void write_spec_file(const Spec& spec, const std::string& path) {
  const std::string text = write_spec(spec);
  std::ofstream out(path, std::ios::binary | std::ios::trunc);
  if (!out)
    throw Error(ErrorCode::Argument, "cannot open the spec file \"" + path + "\" for writing: " +
                                         std::strerror(errno));
  out.write(text.data(), static_cast<std::streamsize>(text.size()));
  out.close();
  if (!out) throw Error(ErrorCode::Argument, "writing the spec file \"" + path + "\" failed");
}

}  // namespace powerback
