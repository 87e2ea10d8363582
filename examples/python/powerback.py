"""powerback from Python: a ctypes binding to the C library libpowerback (no compiled extension).

    import powerback
    lib = powerback.load("/usr/local/lib/libpowerback.so.0.2")   # or set POWERBACK_LIBRARY
    spec = lib.read_spec("transforms.pwbspec")                  # written by R's write_transforms()
    z = spec["income"].apply(numpy.array([1.0, 2.0]))

Arrays are passed as contiguous float64 numpy arrays; results are new numpy arrays. A failing
call raises PowerbackError carrying the library's status name and message. Handles are released
when their Python objects are garbage-collected (or at once with close()).

Cautions that hold in every language: a transform changes what a model estimates; a
back-transformed fitted value is a median, and a mean needs a correction (smearing or the
normal-theory formula); and the numbers inform, but do not replace, domain standards and
professional judgement.
"""
import ctypes
import ctypes.util
import os

import numpy as np

_c_double_p = ctypes.POINTER(ctypes.c_double)
_size_t = ctypes.c_size_t
FAMILIES = ["identity", "box-cox", "yeo-johnson", "log", "log10", "sqrt", "reciprocal", "power",
            "asinh", "logit"]
INTERVALS = {"none": 0, "confidence": 1, "prediction": 2}
CENTERS = {"median": 0, "mean": 1}
MEAN_METHODS = {"smearing": 0, "normal": 1}


class PowerbackError(RuntimeError):
    """A call into libpowerback failed; .status is the status name, e.g. "PWB_ERR_PARSE"."""

    def __init__(self, status, message):
        super().__init__("%s: %s" % (status, message))
        self.status = status
        self.message = message


class _TransformSpec(ctypes.Structure):
    _fields_ = [("struct_size", _size_t), ("family", ctypes.c_int), ("lambda_", ctypes.c_double),
                ("shift", ctypes.c_double), ("reflect", ctypes.c_int), ("pivot", ctypes.c_double)]


class _ModelOptions(ctypes.Structure):
    _fields_ = [("struct_size", _size_t), ("intercept", ctypes.c_int),
                ("estimated_parameters", _size_t)]


class _PredictOptions(ctypes.Structure):
    _fields_ = [("struct_size", _size_t), ("level", ctypes.c_double), ("interval", ctypes.c_int),
                ("center", ctypes.c_int), ("mean_method", ctypes.c_int),
                ("transformed_scale", ctypes.c_int), ("tail_mass", ctypes.c_void_p)]


class _LambdaOptions(ctypes.Structure):
    _fields_ = [("struct_size", _size_t), ("lower", ctypes.c_double), ("upper", ctypes.c_double),
                ("level", ctypes.c_double), ("weights", ctypes.POINTER(ctypes.c_double)),
                # every field of the header: pwb_lambda_options_init writes them all
                ("aliased_out", ctypes.POINTER(_size_t)), ("aliased_cap", _size_t),
                ("threads", _size_t)]


class _LambdaResult(ctypes.Structure):
    _fields_ = [("struct_size", _size_t), ("lambda_", ctypes.c_double),
                ("conf_low", ctypes.c_double), ("conf_high", ctypes.c_double),
                ("convenient", ctypes.c_double), ("loglik", ctypes.c_double),
                ("at_bound", ctypes.c_int), ("converged", ctypes.c_int), ("n", _size_t),
                ("low_open", ctypes.c_int), ("high_open", ctypes.c_int), ("rank", _size_t),
                ("n_aliased", _size_t)]


def _vector(x, name):
    a = np.ascontiguousarray(x, dtype=np.float64)
    if a.ndim != 1:
        raise ValueError("%s must be one-dimensional" % name)
    return a


def _matrix(X, n, name):
    """Column-major copy of an n-by-p array (a 1-d array is one column); None for no columns."""
    if X is None:
        return None, 0
    a = np.asarray(X, dtype=np.float64)
    if a.ndim == 1:
        a = a.reshape(-1, 1)
    if a.ndim != 2 or a.shape[0] != n:
        raise ValueError("%s must have %d rows" % (name, n))
    return np.asfortranarray(a), a.shape[1]


def _ptr(a):
    return None if a is None else a.ctypes.data_as(_c_double_p)


class Library:
    """The loaded C library. path: the shared library file; default $POWERBACK_LIBRARY, then
    what the system's loader finds as "powerback"."""

    def __init__(self, path=None):
        path = path or os.environ.get("POWERBACK_LIBRARY") or ctypes.util.find_library("powerback")
        if not path:
            raise OSError("libpowerback not found: pass its path or set POWERBACK_LIBRARY")
        self._c = ctypes.CDLL(path)
        self._declare()
        if self.version_number() // 100 != 2:  # this module speaks ABI 0.2 (libpowerback.so.0.2)
            raise OSError("libpowerback %s is not the 0.2 series this module was written for"
                          % self.version_string())

    def _declare(self):
        c = self._c
        st = ctypes.c_int
        vp = ctypes.c_void_p
        sig = {
            "pwb_version_number": (ctypes.c_uint, []),
            "pwb_version_string": (ctypes.c_char_p, []),
            "pwb_status_name": (ctypes.c_char_p, [st]),
            "pwb_last_error": (ctypes.c_char_p, []),
            "pwb_transform_spec_init": (None, [ctypes.POINTER(_TransformSpec)]),
            "pwb_transform_new": (st, [ctypes.POINTER(_TransformSpec), ctypes.POINTER(vp)]),
            "pwb_transform_free": (None, [vp]),
            "pwb_transform_get_spec": (st, [vp, ctypes.POINTER(_TransformSpec)]),
            "pwb_transform_apply": (st, [vp, _c_double_p, _size_t, _c_double_p]),
            "pwb_transform_invert": (st, [vp, _c_double_p, _size_t, _c_double_p]),
            "pwb_spec_new": (st, [ctypes.POINTER(vp)]),
            "pwb_spec_free": (None, [vp]),
            "pwb_spec_add_transform": (st, [vp, ctypes.c_char_p, vp]),
            "pwb_spec_count": (st, [vp, ctypes.POINTER(_size_t)]),
            "pwb_spec_name": (st, [vp, _size_t, ctypes.c_char_p, _size_t, ctypes.POINTER(_size_t)]),
            "pwb_spec_transform": (st, [vp, _size_t, ctypes.POINTER(vp)]),
            "pwb_spec_write": (st, [vp, ctypes.c_char_p, _size_t, ctypes.POINTER(_size_t)]),
            "pwb_spec_read": (st, [ctypes.c_char_p, _size_t, ctypes.POINTER(vp)]),
            "pwb_spec_read_file": (st, [ctypes.c_char_p, ctypes.POINTER(vp)]),
            "pwb_spec_write_file": (st, [vp, ctypes.c_char_p]),
            "pwb_model_options_init": (None, [ctypes.POINTER(_ModelOptions)]),
            "pwb_model_fit": (st, [_c_double_p, _c_double_p, _size_t, _size_t, vp,
                                   ctypes.POINTER(_ModelOptions), ctypes.POINTER(vp)]),
            "pwb_model_free": (None, [vp]),
            "pwb_predict_options_init": (None, [ctypes.POINTER(_PredictOptions)]),
            "pwb_model_predict": (st, [vp, _c_double_p, _size_t, _size_t,
                                       ctypes.POINTER(_PredictOptions), _c_double_p, _c_double_p,
                                       _c_double_p, ctypes.POINTER(ctypes.c_uint)]),
            "pwb_lambda_options_init": (None, [ctypes.POINTER(_LambdaOptions)]),
            "pwb_lambda_result_init": (None, [ctypes.POINTER(_LambdaResult)]),
            "pwb_estimate_lambda": (st, [_c_double_p, _size_t, ctypes.c_int,
                                         ctypes.POINTER(_LambdaOptions),
                                         ctypes.POINTER(_LambdaResult)]),
        }
        for name, (res, args) in sig.items():
            f = getattr(c, name)
            f.restype = res
            f.argtypes = args

    def check(self, status):
        if status != 0:
            raise PowerbackError(self._c.pwb_status_name(status).decode(),
                                 self._c.pwb_last_error().decode("utf-8", "replace"))

    def version_number(self):
        return self._c.pwb_version_number()

    def version_string(self):
        return self._c.pwb_version_string().decode()

    def transform(self, family, lambda_=float("nan"), shift=0.0, reflect=False,
                  pivot=float("nan")):
        """A new Transform: v = (reflect ? pivot - x : x) + shift, z = family(v; lambda_)."""
        s = _TransformSpec()
        self._c.pwb_transform_spec_init(ctypes.byref(s))
        s.family = FAMILIES.index(family)
        s.lambda_, s.shift, s.reflect, s.pivot = lambda_, shift, int(bool(reflect)), pivot
        h = ctypes.c_void_p()
        self.check(self._c.pwb_transform_new(ctypes.byref(s), ctypes.byref(h)))
        return Transform(self, h)

    def read_spec(self, path):
        """The named transforms of a spec file ("powerback-spec 1") as a Spec."""
        h = ctypes.c_void_p()
        self.check(self._c.pwb_spec_read_file(os.fsencode(path), ctypes.byref(h)))
        return Spec(self, h)

    def new_spec(self, transforms=None):
        """A new Spec, optionally filled from a dict {name: Transform} (in its order)."""
        h = ctypes.c_void_p()
        self.check(self._c.pwb_spec_new(ctypes.byref(h)))
        spec = Spec(self, h)
        for name, tr in (transforms or {}).items():
            spec.add(name, tr)
        return spec

    def parse_spec(self, text):
        """The same from text (str or bytes)."""
        data = text.encode("utf-8") if isinstance(text, str) else bytes(text)
        h = ctypes.c_void_p()
        self.check(self._c.pwb_spec_read(data, len(data), ctypes.byref(h)))
        return Spec(self, h)

    def estimate_lambda(self, x, family="box-cox", lower=-3.0, upper=3.0, level=0.95):
        """Maximum-likelihood lambda of one variable: a dict of the pwb_lambda_result fields."""
        x = _vector(x, "x")
        o = _LambdaOptions()
        self._c.pwb_lambda_options_init(ctypes.byref(o))
        o.lower, o.upper, o.level = lower, upper, level
        r = _LambdaResult()
        self._c.pwb_lambda_result_init(ctypes.byref(r))
        self.check(self._c.pwb_estimate_lambda(_ptr(x), len(x), FAMILIES.index(family),
                                               ctypes.byref(o), ctypes.byref(r)))
        return {"lambda": r.lambda_, "conf_int": (r.conf_low, r.conf_high),
                "convenient": r.convenient, "loglik": r.loglik, "at_bound": bool(r.at_bound),
                "converged": bool(r.converged), "n": r.n}

    def fit(self, y, X=None, response=None, intercept=True, estimated_parameters=0):
        """A Model: T(y) regressed on [1 X] (X n-by-p; None for none); response a Transform."""
        y = _vector(y, "y")
        Xc, p = _matrix(X, len(y), "X")
        o = _ModelOptions()
        self._c.pwb_model_options_init(ctypes.byref(o))
        o.intercept, o.estimated_parameters = int(bool(intercept)), estimated_parameters
        h = ctypes.c_void_p()
        self.check(self._c.pwb_model_fit(_ptr(y), _ptr(Xc), len(y), p,
                                         response._h if response is not None else None,
                                         ctypes.byref(o), ctypes.byref(h)))
        return Model(self, h, p)


class _Handle:
    _free = None

    def __init__(self, lib, h):
        self._lib, self._h = lib, h

    def close(self):
        if self._h:
            getattr(self._lib._c, self._free)(self._h)
            self._h = None

    def __del__(self):
        self.close()


class Transform(_Handle):
    """One variable's transform; immutable."""
    _free = "pwb_transform_free"

    def _map(self, fn, values, name):
        a = _vector(values, name)
        out = np.empty_like(a)
        self._lib.check(getattr(self._lib._c, fn)(self._h, _ptr(a), len(a), _ptr(out)))
        return out

    def apply(self, x):
        """Transformed values of x; PowerbackError (PWB_ERR_DOMAIN...) naming bad indices."""
        return self._map("pwb_transform_apply", x, "x")

    def invert(self, z):
        """Original-unit values of z, the exact inverse of apply."""
        return self._map("pwb_transform_invert", z, "z")

    @property
    def spec(self):
        s = _TransformSpec()
        s.struct_size = ctypes.sizeof(s)
        self._lib.check(self._lib._c.pwb_transform_get_spec(self._h, ctypes.byref(s)))
        return {"family": FAMILIES[s.family], "lambda": s.lambda_, "shift": s.shift,
                "reflect": bool(s.reflect), "pivot": s.pivot}


class Spec(_Handle):
    """Named transforms read from (or to be written as) the portable text spec."""
    _free = "pwb_spec_free"

    def names(self):
        c, n = self._lib._c, _size_t()
        self._lib.check(c.pwb_spec_count(self._h, ctypes.byref(n)))
        out = []
        for i in range(n.value):
            need = _size_t()
            self._lib.check(c.pwb_spec_name(self._h, i, None, 0, ctypes.byref(need)))
            buf = ctypes.create_string_buffer(need.value + 1)
            self._lib.check(c.pwb_spec_name(self._h, i, buf, len(buf), None))
            out.append(buf.raw[:need.value].decode("utf-8"))
        return out

    def __getitem__(self, name):
        names = self.names()
        if name not in names:
            raise KeyError("the spec has no transform named %r; it has %s" % (name, names))
        h = ctypes.c_void_p()
        self._lib.check(self._lib._c.pwb_spec_transform(self._h, names.index(name), ctypes.byref(h)))
        return Transform(self._lib, h)

    def add(self, name, transform):
        """Appends a copy of transform under name (distinct, non-empty UTF-8)."""
        self._lib.check(self._lib._c.pwb_spec_add_transform(self._h, name.encode("utf-8"),
                                                            transform._h))

    def write(self, path):
        """Writes the spec to the file at path; R's read_transforms() reads it."""
        self._lib.check(self._lib._c.pwb_spec_write_file(self._h, os.fsencode(path)))

    def text(self):
        """The spec as text ("powerback-spec 1" ... "end")."""
        need = _size_t()
        self._lib.check(self._lib._c.pwb_spec_write(self._h, None, 0, ctypes.byref(need)))
        buf = ctypes.create_string_buffer(need.value + 1)
        self._lib.check(self._lib._c.pwb_spec_write(self._h, buf, len(buf), None))
        return buf.raw[:need.value].decode("utf-8")


class Model(_Handle):
    """A linear model fitted on the transformed scale; predictions come back in original units."""
    _free = "pwb_model_free"

    def __init__(self, lib, h, p):
        super().__init__(lib, h)
        self.p = p

    def predict(self, Xnew, interval="none", level=0.95, center="median", mean_method="smearing"):
        """dict of numpy arrays fit, lwr, upr (NaN without an interval) and flags."""
        rows = np.asarray(Xnew).shape[0] if Xnew is not None else 0
        Xc, p = _matrix(Xnew, rows, "Xnew")
        o = _PredictOptions()
        self._lib._c.pwb_predict_options_init(ctypes.byref(o))
        o.level, o.interval = level, INTERVALS[interval]
        o.center, o.mean_method = CENTERS[center], MEAN_METHODS[mean_method]
        fit, lwr, upr = np.empty(rows), np.empty(rows), np.empty(rows)
        flags = (ctypes.c_uint * max(rows, 1))()
        self._lib.check(self._lib._c.pwb_model_predict(self._h, _ptr(Xc), rows, p, ctypes.byref(o),
                                                       _ptr(fit), _ptr(lwr), _ptr(upr), flags))
        return {"fit": fit, "lwr": lwr, "upr": upr, "flags": np.array(flags[:rows], dtype=np.uint32)}


def load(path=None):
    """The C library as a Library object; see Library."""
    return Library(path)
