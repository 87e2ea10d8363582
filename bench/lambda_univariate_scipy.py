#!/usr/bin/python3
"""Times scipy.stats.boxcox(x, alpha=0.05) (ML lambda and its 95% interval) on the sample
written by lambda_univariate_bench (raw doubles).

    /usr/bin/python3 lambda_univariate_scipy.py DATAFILE
"""
import sys
import time

import numpy as np
from scipy import stats

x = np.fromfile(sys.argv[1], dtype=np.float64)
t0 = time.perf_counter()
_, lam, ci = stats.boxcox(x, alpha=0.05)
el = time.perf_counter() - t0
print("scipy n=%d lambda=%.8f ci=[%.8f, %.8f]" % (x.size, lam, ci[0], ci[1]))
print("scipy_seconds=%.4f" % el)
