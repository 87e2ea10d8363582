#!/usr/bin/python3
"""Reproduce, from Python through libpowerback, the values R computed (make_r_reference.R).

    /usr/bin/python3 examples/python/check_r_reference.py LIBRARY DIR

DIR holds r_reference.pwbspec (written by powerback::write_transforms) and r_reference.csv
(R's apply_transform / invert_transform of each transform at fixed x), and the model files:
r_reference_model.pwbspec (the transforms of a model R fitted with lm_transformed),
r_reference_model_data.csv (its rows, raw) and r_reference_model_pred.csv (R's predictions).
Python reads the transforms from R's file, transforms the raw predictors, fits the same model
through the C library and predicts the new rows. Each value must agree to
1e-12 relative: both sides run the same C++ code, so only compiler-level rounding differences
between the R build and the CMake build may appear. Also checks that a hostile spec raises.
Exit 0 on success (ctest example.python_reproduces_r).
"""
import csv
import math
import os
import sys

import numpy as np

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import powerback  # noqa: E402

TOL = 1e-12


def close(got, want):
    return got == want or abs(got - want) <= TOL * abs(want)


def main(lib_path, ref_dir):
    lib = powerback.load(lib_path)
    spec = lib.read_spec(os.path.join(ref_dir, "r_reference.pwbspec"))
    rows = {}
    with open(os.path.join(ref_dir, "r_reference.csv"), encoding="utf-8", newline="") as fh:
        for r in csv.DictReader(fh):
            rows.setdefault(r["name"], []).append(r)
    if sorted(rows) != sorted(spec.names()):
        sys.exit("names differ: spec %s, csv %s" % (spec.names(), sorted(rows)))
    checked, worst = 0, 0.0
    for name, rs in rows.items():
        tr = spec[name]
        x = np.array([float(r["x"]) for r in rs])
        z_r = [float(r["z"]) for r in rs]
        back_r = [float(r["back"]) for r in rs]
        z = tr.apply(x)
        back = tr.invert(np.array(z_r))
        for got, want in list(zip(z, z_r)) + list(zip(back, back_r)):
            if not close(got, want):
                sys.exit("%s: python %.17g, R %.17g" % (name, got, want))
            if want != 0:
                worst = max(worst, abs(got - want) / abs(want))
            checked += 1
    # The spec read back writes the same text R wrote: nothing was lost or reinterpreted.
    with open(os.path.join(ref_dir, "r_reference.pwbspec"), encoding="utf-8") as fh:
        if spec.text() != fh.read():
            sys.exit("the spec written back from Python differs from R's file")
    # Rebuilt in Python from the constants alone, the spec is written as R wrote it.
    rebuilt = lib.new_spec({n: lib.transform(**{("lambda_" if k == "lambda" else k): v
                                                for k, v in spec[n].spec.items()})
                            for n in spec.names()})
    if rebuilt.text() != spec.text():
        sys.exit("a spec rebuilt in Python differs from R's")
    try:
        rebuilt.add(spec.names()[0], spec[spec.names()[0]])
        sys.exit("a repeated name was accepted")
    except powerback.PowerbackError as e:
        if e.status != "PWB_ERR_ARGUMENT":
            sys.exit("unexpected error for a repeated name: %s" % e)
    try:
        lib.parse_spec("powerback-spec 9\nend\n")
        sys.exit("a spec from the future was accepted")
    except powerback.PowerbackError as e:
        if e.status != "PWB_ERR_PARSE" or "version 9" not in e.message:
            sys.exit("unexpected error for a future spec: %s" % e)
    try:
        spec["depth"].invert([math.inf])
        sys.exit("an infinite value was inverted")
    except powerback.PowerbackError as e:
        if e.status != "PWB_ERR_NONFINITE":
            sys.exit("unexpected error for Inf: %s" % e)
    n_pred, worst_pred = check_model(lib, ref_dir)
    print("python reproduces R: %d values of %d transforms, largest relative difference %.3g; "
          "%d model predictions, largest relative difference %.3g"
          % (checked, len(rows), worst, n_pred, worst_pred))


def check_model(lib, ref_dir):
    spec = lib.read_spec(os.path.join(ref_dir, "r_reference_model.pwbspec"))
    names = spec.names()
    yname, xnames = names[0], names[1:]  # the response first, then predictors in formula order
    with open(os.path.join(ref_dir, "r_reference_model_data.csv"), newline="") as fh:
        data = list(csv.DictReader(fh))
    with open(os.path.join(ref_dir, "r_reference_model_pred.csv"), newline="") as fh:
        pred = list(csv.DictReader(fh))

    def design(role):
        rs = [r for r in data if r["role"] == role]
        cols = [spec[v].apply(np.array([float(r[v]) for r in rs])) for v in xnames]
        return np.array([float(r[yname]) for r in rs]), np.column_stack(cols)

    y, X = design("fit")
    _, Xnew = design("new")
    model = lib.fit(y, X, response=spec[yname])
    got = {}
    p90 = model.predict(Xnew, interval="prediction", level=0.9)
    got["median"], got["pred_lwr_90"], got["pred_upr_90"] = p90["fit"], p90["lwr"], p90["upr"]
    c95 = model.predict(Xnew, interval="confidence")
    got["conf_lwr_95"], got["conf_upr_95"] = c95["lwr"], c95["upr"]
    got["mean_smearing"] = model.predict(Xnew, center="mean")["fit"]
    got["mean_normal"] = model.predict(Xnew, center="mean", mean_method="normal")["fit"]
    n, worst = 0, 0.0
    for col, values in got.items():
        for i, r in enumerate(pred):
            want = float(r[col])
            if not close(values[i], want):
                sys.exit("model %s row %d: python %.17g, R %.17g" % (col, i + 1, values[i], want))
            worst = max(worst, abs(values[i] - want) / abs(want))
            n += 1
    if n != 7 * len(pred) or len(pred) < 20:
        sys.exit("the model reference has too few rows: %d" % len(pred))
    return n, worst


if __name__ == "__main__":
    if len(sys.argv) != 3:
        sys.exit(__doc__)
    main(sys.argv[1], sys.argv[2])
