// The serialised summaries' readers (pwb_*_deserialize of the lambda summary, the lambda grid
// pass, the fit summary and the fit checks) on any bytes. A read either fails with a status and
// a message, or the object it gives writes bytes that read back and write again bit for bit,
// and finishing it neither crashes nor raises an internal error.
//
// The first byte chooses how the rest becomes bytes to read:
//   0: as they are (the header and checksum checks see arbitrary data);
//   1: a valid header for one kind, the rest as its body, and a correct checksum appended, so
//      that the field-by-field reading is reached (random bytes almost never pass a checksum);
//   2: a real summary built from the input's rows, serialised, a few of its bytes overwritten
//      and the checksum recomputed (corruption of a well-formed body).
#include <cmath>
#include <cstring>
#include <vector>

#include "fuzz_input.hpp"

namespace {

using Bytes = std::vector<unsigned char>;

// The summaries' checksum: FNV-1a over every byte before it, stored little-endian (the format
// is described in powerback.h's summaries section and core/src/accumulate_common.cpp).
void put_checksum(Bytes& b) {
  std::uint64_t h = 14695981039346656037ull;
  for (unsigned char c : b) {
    h ^= c;
    h *= 1099511628211ull;
  }
  for (int i = 0; i < 8; ++i) b.push_back(static_cast<unsigned char>((h >> (8 * i)) & 0xffu));
}

// One kind of serialised object and its C ABI functions.
template <class H>
struct Kind {
  pwb_status (*read)(const unsigned char*, size_t, H**);
  pwb_status (*write)(const H*, unsigned char*, size_t, size_t*);
  void (*free)(H*);
};

template <class H>
Bytes written(const Kind<H>& k, const H* h) {
  size_t need = 0;
  pwbfuzz::check_status(k.write(h, nullptr, 0, &need));
  Bytes b(need);
  if (k.write(h, b.data(), b.size(), &need) != PWB_OK || need != b.size())
    pwbfuzz::fail("a summary that was read could not be written");
  return b;
}

// Reads b; when it succeeds, write -> read -> write must reproduce the bytes, and finish (the
// callback) must not break. Returns the status of the first read.
template <class H, class Finish>
pwb_status read_round_trip(const Kind<H>& k, const Bytes& b, Finish finish) {
  H* h = nullptr;
  const pwb_status st = k.read(b.empty() ? nullptr : b.data(), b.size(), &h);
  pwbfuzz::check_status(st);
  if (st != PWB_OK) {
    if (h) pwbfuzz::fail("a failed read left a handle");
    return st;
  }
  const Bytes once = written(k, h);
  H* again = nullptr;
  if (k.read(once.data(), once.size(), &again) != PWB_OK)
    pwbfuzz::fail("bytes a summary wrote do not read back");
  const Bytes twice = written(k, again);
  if (once != twice) pwbfuzz::fail("write -> read -> write is not bit-identical");
  finish(h);
  k.free(again);
  k.free(h);
  return st;
}

void finish_lambda(pwb_lambda_summary* s) {
  pwb_lambda_result r;
  pwb_lambda_result_init(&r);
  pwb_summary_pass_info info;
  pwb_summary_pass_info_init(&info);
  double grid[5], ll[5];
  pwbfuzz::check_status(pwb_lambda_summary_finish(s, nullptr, &r, 5, grid, ll, &info));
  size_t n = 0, bins = 0;
  pwbfuzz::check_status(pwb_lambda_summary_count(s, &n, &bins));
}

void finish_pass(pwb_lambda_pass* p) {
  size_t g = 0;
  pwbfuzz::check_status(pwb_lambda_pass_grid_size(p, &g));
}

void finish_fit(pwb_fit_summary* s) {
  pwb_model_info info;
  info.struct_size = sizeof info;
  pwbfuzz::check_status(pwb_fit_summary_finish(s, &info, nullptr, nullptr, nullptr, nullptr, 0));
  pwb_fit_checks* c = nullptr;
  const pwb_status st = pwb_fit_checks_new(s, &c);
  pwbfuzz::check_status(st);
  if (st == PWB_OK) pwb_fit_checks_free(c);
}

void finish_checks(pwb_fit_checks* c) {
  pwb_residual_checks rc;
  pwb_residual_checks_init(&rc);
  pwbfuzz::check_status(pwb_fit_checks_finish(c, &rc));
  const double eta[3] = {-1.0, 0.0, 2.5};
  double mean[3];
  pwbfuzz::check_status(pwb_fit_checks_smearing(c, eta, 3, mean));
}

const Kind<pwb_lambda_summary> kLambda{pwb_lambda_summary_deserialize, pwb_lambda_summary_serialize,
                                       pwb_lambda_summary_free};
const Kind<pwb_lambda_pass> kPass{pwb_lambda_pass_deserialize, pwb_lambda_pass_serialize,
                                  pwb_lambda_pass_free};
const Kind<pwb_fit_summary> kFit{pwb_fit_summary_deserialize, pwb_fit_summary_serialize,
                                 pwb_fit_summary_free};
const Kind<pwb_fit_checks> kChecks{pwb_fit_checks_deserialize, pwb_fit_checks_serialize,
                                   pwb_fit_checks_free};

// Reads b as kind k (0..3), or as every kind when k is 4.
void read_as(int k, const Bytes& b) {
  if (k == 0 || k == 4) read_round_trip(kLambda, b, finish_lambda);
  if (k == 1 || k == 4) read_round_trip(kPass, b, finish_pass);
  if (k == 2 || k == 4) read_round_trip(kFit, b, finish_fit);
  if (k == 3 || k == 4) read_round_trip(kChecks, b, finish_checks);
}

// The header of a kind (1..4 in the format) as a real summary writes it: magic and version are
// taken from a freshly serialised empty lambda summary, so the target follows the format.
Bytes header(std::uint32_t kind) {
  pwb_lambda_summary* s = nullptr;
  if (pwb_lambda_summary_new(PWB_BOX_COX, 0, &s) != PWB_OK) pwbfuzz::fail("cannot make a summary");
  Bytes b = written(kLambda, s);
  pwb_lambda_summary_free(s);
  b.resize(12);
  for (int i = 0; i < 4; ++i) b[8 + i] = static_cast<unsigned char>((kind >> (8 * i)) & 0xffu);
  return b;
}

// A real summary of the input's rows, serialised.
Bytes built(pwbfuzz::Input& in, int k) {
  const std::size_t n = in.size(40), p = in.size(2);
  std::vector<double> y = in.values(n), X = in.values(n * p);
  for (double& v : y) v = std::fabs(v) + 0.5;  // Box-Cox and the log need y > 0
  const std::size_t cut = n ? in.byte() % (n + 1) : 0;
  Bytes out;
  if (k == 0 || k == 1) {
    pwb_lambda_summary* s = nullptr;
    if (pwb_lambda_summary_new(in.byte() & 1 ? PWB_YEO_JOHNSON : PWB_BOX_COX, p, &s) != PWB_OK)
      pwbfuzz::fail("cannot make a lambda summary");
    // two chunks, the second through a merge
    pwbfuzz::check_status(pwb_lambda_summary_add(s, y.data(), p ? X.data() : nullptr, cut, n, nullptr));
    pwb_lambda_summary* t = nullptr;
    if (pwb_lambda_summary_new(PWB_BOX_COX, p, &t) == PWB_OK) {
      if (n > cut)
        pwbfuzz::check_status(pwb_lambda_summary_add(t, y.data() + cut, p ? X.data() + cut : nullptr,
                                                     n - cut, n, nullptr));
      pwbfuzz::check_status(pwb_lambda_summary_merge(s, t));
      pwb_lambda_summary_free(t);
    }
    if (k == 0) {
      out = written(kLambda, s);
    } else {
      const double grid[4] = {-1.0, -0.5, 0.0, 0.5};
      pwb_lambda_pass* g = nullptr;
      if (pwb_lambda_pass_new(s, grid, 4, &g) == PWB_OK) {
        pwbfuzz::check_status(pwb_lambda_pass_add(g, y.data(), p ? X.data() : nullptr, n, n, nullptr));
        out = written(kPass, g);
        pwb_lambda_pass_free(g);
      }
    }
    pwb_lambda_summary_free(s);
    return out;
  }
  pwb_transform_spec ts;
  pwb_transform_spec_init(&ts);
  ts.family = PWB_LOG;
  pwb_transform* tr = nullptr;
  if (pwb_transform_new(&ts, &tr) != PWB_OK) pwbfuzz::fail("cannot make a log transform");
  pwb_fit_summary* f = nullptr;
  if (pwb_fit_summary_new(in.byte() & 1 ? tr : nullptr, p, 0, &f) != PWB_OK)
    pwbfuzz::fail("cannot make a fit summary");
  pwb_transform_free(tr);
  pwbfuzz::check_status(pwb_fit_summary_add(f, y.data(), p ? X.data() : nullptr, n, n, nullptr));
  if (k == 2) {
    out = written(kFit, f);
  } else {
    pwb_fit_checks* c = nullptr;
    if (pwb_fit_checks_new(f, &c) == PWB_OK) {
      pwbfuzz::check_status(pwb_fit_checks_add(c, y.data(), p ? X.data() : nullptr, n, n, nullptr));
      out = written(kChecks, c);
      pwb_fit_checks_free(c);
    }
  }
  pwb_fit_summary_free(f);
  return out;
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  pwbfuzz::Input in(data, size);
  const int mode = in.byte() % 3;
  if (mode == 0) {
    read_as(4, size > 1 ? Bytes(data + 1, data + size) : Bytes());
  } else if (mode == 1) {
    const int k = in.byte() % 4;
    Bytes b = header(static_cast<std::uint32_t>(k + 1));
    while (in.left()) b.push_back(in.byte());
    put_checksum(b);
    read_as(k, b);
  } else {
    const int k = in.byte() % 4;
    Bytes b = built(in, k);
    if (b.size() < 20) return 0;
    read_as(k, b);  // the intact bytes read and round-trip
    b.resize(b.size() - 8);
    for (std::size_t edits = in.size(4); edits > 0; --edits) {
      const std::size_t at = 12 + (static_cast<std::size_t>(in.byte()) << 8 | in.byte()) % (b.size() - 12);
      b[at] = in.byte();
    }
    put_checksum(b);
    read_as(k, b);
  }
  return 0;
}
