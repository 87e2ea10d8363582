/* A program built against an installed powerback, through the CMake package and through
 * pkg-config: it checks the header's version macros against the library it runs with, then
 * writes a spec, reads it back and applies the transform. Exit 0 and one "ok" line on success. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <powerback.h>

static int fail(const char *what) {
  fprintf(stderr, "consumer: %s: %s\n", what, pwb_last_error());
  return 1;
}

int main(void) {
  char want[32];
  pwb_transform_spec ts;
  pwb_transform *t = NULL, *back_t = NULL;
  pwb_spec *s = NULL, *back = NULL;
  size_t need = 0, count = 0;
  char *text;
  double x[2] = {3.0, 8.0}, z[2];

  /* The macros of the header this program was compiled with against the library it runs with. */
  sprintf(want, "%d.%d.%d", PWB_VERSION_MAJOR, PWB_VERSION_MINOR, PWB_VERSION_PATCH);
  if (pwb_version_number() != (unsigned)PWB_VERSION_NUMBER ||
      strcmp(pwb_version_string(), want) != 0) {
    fprintf(stderr, "consumer: header %s (%d), library %s (%u)\n", want, PWB_VERSION_NUMBER,
            pwb_version_string(), pwb_version_number());
    return 1;
  }
  pwb_transform_spec_init(&ts);
  ts.family = PWB_BOX_COX;
  ts.lambda = 0.5;
  ts.shift = 1.0;
  if (pwb_transform_new(&ts, &t) != PWB_OK) return fail("pwb_transform_new");
  if (pwb_spec_new(&s) != PWB_OK || pwb_spec_add_transform(s, "x", t) != PWB_OK)
    return fail("building the spec");
  if (pwb_spec_write(s, NULL, 0, &need) != PWB_OK) return fail("pwb_spec_write (size)");
  text = (char *)malloc(need + 1);
  if (!text || pwb_spec_write(s, text, need + 1, NULL) != PWB_OK) return fail("pwb_spec_write");
  if (pwb_spec_read(text, need, &back) != PWB_OK || pwb_spec_count(back, &count) != PWB_OK ||
      count != 1 || pwb_spec_transform(back, 0, &back_t) != PWB_OK)
    return fail("reading the spec back");
  if (pwb_transform_apply(back_t, x, 2, z) != PWB_OK) return fail("pwb_transform_apply");
  /* (sqrt(3 + 1) - 1) / 0.5 = 2 and (sqrt(8 + 1) - 1) / 0.5 = 4, exact in binary */
  if (z[0] != 2.0 || z[1] != 4.0) {
    fprintf(stderr, "consumer: got %.17g %.17g, want 2 4\n", z[0], z[1]);
    return 1;
  }
  free(text);
  pwb_spec_free(back);
  pwb_spec_free(s);
  pwb_transform_free(back_t);
  pwb_transform_free(t);
  printf("consumer ok: powerback %s\n", pwb_version_string());
  return 0;
}
