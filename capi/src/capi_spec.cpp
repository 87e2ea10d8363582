// The spec handle of the C ABI: named transforms, written to and read from the portable text.
#include <string>

#include "capi_internal.hpp"
#include "capi_sizes.hpp"
#include "capi_transform_handle.hpp"
#include "powerback/spec.hpp"
#include "powerback/transform.hpp"

struct pwb_spec {
  powerback::Spec impl;
};

using namespace powerback;

namespace {

pwb_spec* new_handle(Spec&& s) { return new pwb_spec{std::move(s)}; }

}  // namespace

extern "C" {

pwb_status pwb_spec_new(pwb_spec** out) {
  if (out) *out = nullptr;
  return capi::guarded([&] {
    capi::need(out, "out");
    *out = new pwb_spec{};
  });
}

void pwb_spec_free(pwb_spec* s) { delete s; }

pwb_status pwb_spec_add_transform(pwb_spec* s, const char* name, const pwb_transform* t) {
  return capi::guarded([&] {
    capi::need(s, "s");
    capi::need(name, "name");
    capi::need(t, "t");
    s->impl.add(name, capi::transform_of(t, "t"));
  });
}

pwb_status pwb_spec_count(const pwb_spec* s, size_t* count) {
  return capi::guarded([&] {
    capi::need(s, "s");
    capi::need(count, "count");
    *count = s->impl.size();
  });
}

pwb_status pwb_spec_name(const pwb_spec* s, size_t i, char* buf, size_t cap, size_t* needed) {
  return capi::guarded([&] {
    capi::need(s, "s");
    capi::copy_text(s->impl.at(i).name, buf, cap, needed);
  });
}

pwb_status pwb_spec_find(const pwb_spec* s, const char* name, size_t* index) {
  return capi::guarded([&] {
    capi::need(s, "s");
    capi::need(name, "name");
    capi::need(index, "index");
    const std::size_t i = s->impl.find(name);
    if (i == s->impl.size())
      throw Error(ErrorCode::Argument, std::string("the spec has no transform named \"") + name + "\"");
    *index = i;
  });
}

pwb_status pwb_spec_transform(const pwb_spec* s, size_t i, pwb_transform** out) {
  if (out) *out = nullptr;
  return capi::guarded([&] {
    capi::need(s, "s");
    capi::need(out, "out");
    *out = capi::new_transform_handle(s->impl.at(i).transform);
  });
}

pwb_status pwb_spec_write(const pwb_spec* s, char* buf, size_t cap, size_t* needed) {
  return capi::guarded([&] {
    capi::need(s, "s");
    capi::copy_text(write_spec(s->impl), buf, cap, needed);
  });
}

pwb_status pwb_spec_write_file(const pwb_spec* s, const char* path) {
  return capi::guarded([&] {
    capi::need(s, "s");
    capi::need(path, "path");
    write_spec_file(s->impl, path);
  });
}

pwb_status pwb_spec_read(const char* text, size_t len, pwb_spec** out) {
  if (out) *out = nullptr;
  return capi::guarded([&] {
    capi::need(out, "out");
    capi::need_array(text, len, "text");
    *out = new_handle(parse_spec(text, len));
  });
}

pwb_status pwb_spec_read_file(const char* path, pwb_spec** out) {
  if (out) *out = nullptr;
  return capi::guarded([&] {
    capi::need(path, "path");
    capi::need(out, "out");
    *out = new_handle(read_spec_file(path));
  });
}

pwb_status pwb_spec_set_model(pwb_spec* s, const char* response, const char* const* names,
                              const double* coef, size_t ncoef, double sigma, size_t df) {
  return capi::guarded([&] {
    capi::need(s, "s");
    capi::need(response, "response");
    capi::need_array(names, ncoef, "names");
    capi::need_array(coef, ncoef, "coef");
    if (ncoef > kSpecMaxCoefficients)
      throw Error(ErrorCode::Memory, "ncoef is " + std::to_string(ncoef) + "; a spec's model holds at most " +
                                         std::to_string(kSpecMaxCoefficients) + " coefficients");
    (void)capi::checked_mul(ncoef, sizeof(double), "coef");
    SpecModel m;
    m.response = response;
    m.names.reserve(ncoef);
    for (size_t j = 0; j < ncoef; ++j) {
      if (!names[j])
        throw Error(ErrorCode::Argument, "names[" + std::to_string(j) + "] is NULL");
      m.names.emplace_back(names[j]);
    }
    m.coefficients.assign(coef, coef + ncoef);
    m.sigma = sigma;
    m.df = df;
    s->impl.set_model(m);
  });
}

pwb_status pwb_spec_has_model(const pwb_spec* s, int* has) {
  return capi::guarded([&] {
    capi::need(s, "s");
    capi::need(has, "has");
    *has = s->impl.has_model() ? 1 : 0;
  });
}

pwb_status pwb_spec_model_info(const pwb_spec* s, size_t* ncoef, double* sigma, size_t* df) {
  return capi::guarded([&] {
    capi::need(s, "s");
    const SpecModel& m = s->impl.model();
    if (ncoef) *ncoef = m.names.size();
    if (sigma) *sigma = m.sigma;
    if (df) *df = m.df;
  });
}

pwb_status pwb_spec_model_response(const pwb_spec* s, char* buf, size_t cap, size_t* needed) {
  return capi::guarded([&] {
    capi::need(s, "s");
    capi::copy_text(s->impl.model().response, buf, cap, needed);
  });
}

pwb_status pwb_spec_model_coef_name(const pwb_spec* s, size_t j, char* buf, size_t cap,
                                    size_t* needed) {
  return capi::guarded([&] {
    capi::need(s, "s");
    const SpecModel& m = s->impl.model();
    if (j >= m.names.size())
      throw Error(ErrorCode::Argument, "coefficient index " + std::to_string(j) +
                                           " is out of range: the model has " +
                                           std::to_string(m.names.size()) + " coefficients");
    capi::copy_text(m.names[j], buf, cap, needed);
  });
}

pwb_status pwb_spec_model_coefficients(const pwb_spec* s, double* coef, size_t ncoef) {
  return capi::guarded([&] {
    capi::need(s, "s");
    const SpecModel& m = s->impl.model();
    if (ncoef != m.coefficients.size())
      throw Error(ErrorCode::Argument, "ncoef is " + std::to_string(ncoef) + " but the model has " +
                                           std::to_string(m.coefficients.size()) +
                                           " coefficients (see pwb_spec_model_info)");
    capi::need_array(coef, ncoef, "coef");
    (void)capi::checked_mul(ncoef, sizeof(double), "coef");
    for (size_t j = 0; j < ncoef; ++j) coef[j] = m.coefficients[j];
  });
}

}  // extern "C"
