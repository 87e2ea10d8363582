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

// The text of name i of a spec (through the snprintf-like getters), marked UTF-8.
template <class Get>
Rcpp::String utf8_text(Get get) {
  size_t need = 0;
  rpwb::check(get(nullptr, 0, &need));
  std::vector<char> buf(need + 1);
  rpwb::check(get(buf.data(), buf.size(), nullptr));
  return Rcpp::String(std::string(buf.data(), need), CE_UTF8);
}

// Attaches model = list(response, names, coefficients, sigma, df) to s (NA coefficients and an
// NA sigma go through as NaN).
void set_model(pwb_spec* s, const Rcpp::List& model) {
  const std::string response(CHAR(STRING_ELT(model["response"], 0)));
  Rcpp::CharacterVector nms = model["names"];
  Rcpp::NumericVector coef = model["coefficients"];
  std::vector<std::string> keep(nms.size());
  std::vector<const char*> ptrs(nms.size());
  for (R_xlen_t j = 0; j < nms.size(); ++j) {
    keep[j] = CHAR(STRING_ELT(nms, j));
    ptrs[j] = keep[j].c_str();
  }
  const double df = Rcpp::as<double>(model["df"]);
  rpwb::check(pwb_spec_set_model(s, response.c_str(), ptrs.data(), coef.begin(),
                                 static_cast<size_t>(coef.size()),
                                 Rcpp::as<double>(model["sigma"]), static_cast<size_t>(df)));
}

// The model record of s as list(response, coefficients = named numeric with NA, sigma, df).
Rcpp::List get_model(const pwb_spec* s) {
  size_t n = 0, df = 0;
  double sigma = 0.0;
  rpwb::check(pwb_spec_model_info(s, &n, &sigma, &df));
  Rcpp::NumericVector coef(n);
  rpwb::check(pwb_spec_model_coefficients(s, coef.begin(), n));
  Rcpp::CharacterVector nms(n);
  for (size_t j = 0; j < n; ++j) {
    coef[j] = rpwb::nan_to_na(coef[j]);
    nms[j] = utf8_text([&](char* b, size_t c, size_t* need) {
      return pwb_spec_model_coef_name(s, j, b, c, need);
    });
  }
  coef.names() = nms;
  Rcpp::CharacterVector resp(1);
  resp[0] = utf8_text([&](char* b, size_t c, size_t* need) {
    return pwb_spec_model_response(s, b, c, need);
  });
  return Rcpp::List::create(Rcpp::Named("response") = resp, Rcpp::Named("coefficients") = coef,
                            Rcpp::Named("sigma") = rpwb::nan_to_na(sigma),
                            Rcpp::Named("df") = static_cast<double>(df));
}

}  // namespace

// transforms: list of transform lists; names: their UTF-8 names; model: an empty list, or
// list(response, names, coefficients, sigma, df) for the model record. Writes the spec to path.
// [[Rcpp::export]]
void rpwb_spec_write_file(Rcpp::List transforms, Rcpp::CharacterVector names, std::string path,
                          Rcpp::List model) {
  SpecHandle s;
  rpwb::check(pwb_spec_new(s.out()));
  for (R_xlen_t i = 0; i < transforms.size(); ++i) {
    rpwb::Transform t(Rcpp::as<Rcpp::List>(transforms[i]));
    const std::string name(CHAR(STRING_ELT(names, i)));
    rpwb::check(pwb_spec_add_transform(s.get(), name.c_str(), t.get()));
  }
  if (model.size() > 0) set_model(s.get(), model);
  rpwb::check(pwb_spec_write_file(s.get(), path.c_str()));
}

// The spec at path as a list of transform lists (family, lambda, shift, reflect, pivot), named
// by the spec's names (marked UTF-8), with the model record, if any, as attribute "model".
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
  int has = 0;
  rpwb::check(pwb_spec_has_model(s.get(), &has));
  if (has) out.attr("model") = get_model(s.get());
  return out;
}
