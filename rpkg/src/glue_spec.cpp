// Rcpp glue for the portable text spec: thin wrappers over pwb_spec_* of powerback.h.
#include "glue_common.h"

#include <string>
#include <vector>

namespace {

// Owns a pwb_spec for the duration of one glue call.
class SpecHandle {
 public:
  SpecHandle() = default;
  ~SpecHandle() { pwb_spec_free(s_); }
  SpecHandle(const SpecHandle&) = delete;
  SpecHandle& operator=(const SpecHandle&) = delete;
  pwb_spec** out() { return &s_; }
  pwb_spec* get() const { return s_; }

 private:
  pwb_spec* s_ = nullptr;
};

}  // namespace

// transforms: list of transform lists; names: their UTF-8 names. Writes the spec to path.
// [[Rcpp::export]]
void rpwb_spec_write_file(Rcpp::List transforms, Rcpp::CharacterVector names, std::string path) {
  SpecHandle s;
  rpwb::check(pwb_spec_new(s.out()));
  for (R_xlen_t i = 0; i < transforms.size(); ++i) {
    rpwb::Transform t(Rcpp::as<Rcpp::List>(transforms[i]));
    const std::string name(CHAR(STRING_ELT(names, i)));
    rpwb::check(pwb_spec_add_transform(s.get(), name.c_str(), t.get()));
  }
  rpwb::check(pwb_spec_write_file(s.get(), path.c_str()));
}

// The spec at path as a list of transform lists (family, lambda, shift, reflect, pivot), named
// by the spec's names (marked UTF-8).
// [[Rcpp::export]]
Rcpp::List rpwb_spec_read_file(std::string path) {
  SpecHandle s;
  rpwb::check(pwb_spec_read_file(path.c_str(), s.out()));
  size_t n = 0;
  rpwb::check(pwb_spec_count(s.get(), &n));
  Rcpp::List out(n);
  Rcpp::CharacterVector names(n);
  for (size_t i = 0; i < n; ++i) {
    size_t need = 0;
    rpwb::check(pwb_spec_name(s.get(), i, nullptr, 0, &need));
    std::vector<char> buf(need + 1);
    rpwb::check(pwb_spec_name(s.get(), i, buf.data(), buf.size(), nullptr));
    names[i] = Rcpp::String(std::string(buf.data(), need), CE_UTF8);
    pwb_transform* t = nullptr;
    rpwb::check(pwb_spec_transform(s.get(), i, &t));
    pwb_transform_spec ts;
    ts.struct_size = sizeof ts;
    const pwb_status st = pwb_transform_get_spec(t, &ts);
    pwb_transform_free(t);
    rpwb::check(st);
    out[i] = Rcpp::List::create(Rcpp::Named("family") = std::string(pwb_family_name(ts.family)),
                                Rcpp::Named("lambda") = rpwb::nan_to_na(ts.lambda),
                                Rcpp::Named("shift") = ts.shift,
                                Rcpp::Named("reflect") = ts.reflect != 0,
                                Rcpp::Named("pivot") = rpwb::nan_to_na(ts.pivot));
  }
  out.names() = names;
  return out;
}
