/* A C99 program using the header: compiled with -std=c99 -pedantic -Werror, then run. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "powerback.h"

int main(void) {
  pwb_transform_spec spec;
  pwb_transform *t = NULL;
  double x[3] = {0.5, 1.0, 4.0}, z[3], back[3];
  int i;

  if (pwb_version_number() != PWB_VERSION_NUMBER) {
    fprintf(stderr, "header %d, library %u\n", PWB_VERSION_NUMBER, pwb_version_number());
    return 1;
  }
  pwb_transform_spec_init(&spec);
  spec.family = PWB_BOX_COX;
  spec.lambda = 0.5;
  if (pwb_transform_new(&spec, &t) != PWB_OK) return 2;
  if (pwb_transform_apply(t, x, 3, z) != PWB_OK) return 3;
  if (pwb_transform_invert(t, z, 3, back) != PWB_OK) return 4;
  for (i = 0; i < 3; ++i)
    if (fabs(back[i] - x[i]) > 1e-14 * x[i]) return 5;
  /* (4^0.5 - 1) / 0.5 = 2 */
  if (fabs(z[2] - 2.0) > 1e-15) return 6;
  x[0] = -1.0;
  if (pwb_transform_apply(t, x, 3, z) != PWB_ERR_DOMAIN || strlen(pwb_last_error()) == 0) return 7;
  pwb_transform_free(t);
  pwb_transform_free(NULL);
  printf("c99 header program ok: %s\n", pwb_version_string());
  return 0;
}
