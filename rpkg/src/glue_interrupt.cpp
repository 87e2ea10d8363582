// Lets the user interrupt long computations: when the package is loaded, the main R thread gets
// an interrupt check that the library polls between steps (pwb_set_interrupt_check); a pending
// interrupt stops the computation with PWB_ERR_CANCELLED, which rpwb::check turns into R's
// interrupt once the C++ frames are gone.
#include "glue_common.h"

// [[Rcpp::init]]
void rpwb_install_interrupt_check(DllInfo* /*dll*/) {
  pwb_set_interrupt_check(rpwb::interrupt_pending, nullptr);
}
