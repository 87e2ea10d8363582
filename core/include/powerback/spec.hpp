// powerback/spec.hpp — the portable text spec: named transforms written and read as plain text.
//
// The format ("powerback-spec 1") is described in docs/spec-format.md. In short:
//
//   powerback-spec 1
//   # optional comment lines
//   transform name="income" family=box-cox lambda=0x1p-1 shift=0x1p+0 reflect=false
//   transform name="score" family=log shift=0x0p+0 reflect=true pivot=0x1.94p+6
//   end
//
// Numbers are written as hexadecimal floating constants, which read back bit for bit; the
// reader also takes decimal numbers (correctly rounded). The reader is strict: any deviation is
// an Error(Parse) naming the line and column. Input size is bounded by the limits below, so
// hostile input cannot make the reader allocate without bound.
#pragma once

#include <cstddef>
#include <string>
#include <unordered_map>
#include <vector>

#include "powerback/transform.hpp"

namespace powerback {

constexpr int kSpecFormatVersion = 1;
constexpr const char* kSpecMagic = "powerback-spec";
constexpr std::size_t kSpecMaxBytes = std::size_t(16) << 20;  // whole input: 16 MiB
constexpr std::size_t kSpecMaxLineLength = 4096;               // bytes per line, without newline
constexpr std::size_t kSpecMaxRecords = 65536;                 // transform records per spec
constexpr std::size_t kSpecMaxNameLength = 256;                // bytes of a name once unescaped
constexpr std::size_t kSpecMaxCoefficients = 65536;            // coefficients of a model record

struct NamedTransform {
  std::string name;  // UTF-8, non-empty, no NUL, at most kSpecMaxNameLength bytes
  Transform transform;
};

// A fitted model's record: the response's name, the coefficients in design order (intercept
// first when there is one), the residual standard deviation and the residual degrees of freedom.
// A NaN coefficient marks an aliased one (written NA); sigma is NaN when not available (df = 0).
struct SpecModel {
  std::string response;
  std::vector<std::string> names;   // distinct, each a valid spec name
  std::vector<double> coefficients; // same length as names; finite or NaN
  double sigma = 0.0;               // finite and >= 0, or NaN
  std::size_t df = 0;
};

// Checks that name is a valid spec name (non-empty, at most kSpecMaxNameLength bytes, UTF-8
// without NUL); Error(Argument) naming `what` otherwise.
void check_spec_name(const std::string& name, const std::string& what);

// An ordered set of transforms with distinct names, and at most one model record.
class Spec {
 public:
  // Appends a transform. Error(Argument) for an empty, over-long, duplicate or non-UTF-8 name,
  // or a name with a NUL byte; Error(Memory) past kSpecMaxRecords.
  void add(const std::string& name, const Transform& t);
  std::size_t size() const noexcept { return items_.size(); }
  const NamedTransform& at(std::size_t i) const;  // Error(Argument) when i >= size()
  // Index of the transform called name, or size() when there is none.
  std::size_t find(const std::string& name) const noexcept;

  // Attaches (or replaces) the model record. Error(Argument) for an invalid response or
  // coefficient name, repeated coefficient names, lengths that differ, an infinite coefficient,
  // or a negative or infinite sigma; Error(Memory) past kSpecMaxCoefficients. On failure the
  // spec is unchanged.
  void set_model(const SpecModel& m);
  bool has_model() const noexcept { return has_model_; }
  const SpecModel& model() const;  // Error(Argument) when there is no model record

 private:
  std::vector<NamedTransform> items_;
  std::unordered_map<std::string, std::size_t> index_;  // name -> position in items_
  SpecModel model_;
  bool has_model_ = false;
};

// The spec as text (ends with "end\n").
std::string write_spec(const Spec& spec);
// Parses text of `size` bytes (which may hold NUL bytes: they are rejected, as is invalid UTF-8).
// Error(Parse) with "line L, column C" for any malformed input.
Spec parse_spec(const char* text, std::size_t size);

// The same through files. read: Error(Argument) when the file cannot be opened, Error(Parse) when
// it exceeds kSpecMaxBytes or does not parse. write: Error(Argument) when it cannot be written.
Spec read_spec_file(const std::string& path);
void write_spec_file(const Spec& spec, const std::string& path);

// Hexadecimal floating text of a finite x ("0x1.8p+1", "-0x1p-3", "0x0p+0"); exact.
std::string format_hex_double(double x);
// Whether s is valid UTF-8 without NUL bytes; on failure *bad is the offset of
// the NUL byte or of the first byte of the ill-formed sequence.
bool valid_utf8_text(const char* s, std::size_t n, std::size_t* bad);

}  // namespace powerback
