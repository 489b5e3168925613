"""Astropy oracle for the Lomb-Scargle reference tests (test/reference/*.spec.ts).

Reads a JSON request on stdin and writes a JSON answer on stdout. For each case it runs
astropy's LombScargle(t, y, dy, fit_mean=True, center_data=True, normalization='standard')
on the explicit frequency grid f = f0 + df * arange(nf): exact ('slow') and 'fast' power,
the Baluev false-alarm probability of given powers (astropy's own implementation,
_statistics.false_alarm_probability(method='baluev') with fmax = the grid's last frequency),
and the best-fit model at a few times.

Request kind "pointwise" ({"kind": "pointwise", "cases": [...]}, used by the check values of
SCIENCE.md section 8): for each case the same LombScargle's exact ('slow') power at explicit
frequencies, and, when asked, LombScargle.false_alarm_probability(method='baluev') with
astropy's own frequency limits (autofrequency with the given samples_per_peak and
maximum_frequency), returned beside those limits.

Astropy's Baluev FAP imports scipy.special.gammaln. When scipy is not installed (Debian's
python3-astropy only recommends it), a stand-in built on math.lgamma is put in its place:
the same function to double precision, and the rest of astropy's code runs unchanged.
"""
import json
import math
import sys
import time

try:
    import scipy.special  # noqa: F401
except ImportError:
    import types
    import numpy as np

    scipy = types.ModuleType("scipy")
    special = types.ModuleType("scipy.special")
    special.gammaln = np.vectorize(math.lgamma, otypes=[float])
    scipy.special = special
    sys.modules["scipy"] = scipy
    sys.modules["scipy.special"] = special

import numpy as np
from astropy.utils import iers

iers.conf.auto_download = False
iers.conf.auto_max_age = None

from astropy.timeseries import LombScargle  # noqa: E402
from astropy.timeseries.periodograms.lombscargle import _statistics  # noqa: E402


def run_case(case):
    t = np.asarray(case["t"], dtype=float)
    y = np.asarray(case["y"], dtype=float)
    dy = None if case.get("dy") is None else np.asarray(case["dy"], dtype=float)
    f = case["f0"] + case["df"] * np.arange(case["nf"])
    ls = LombScargle(t, y, dy, fit_mean=True, center_data=True, normalization="standard")
    out = {}
    methods = case.get("methods", ["slow", "fast"])
    for method in methods:
        start = time.perf_counter()
        p = ls.power(f, method=method, assume_regular_frequency=True)
        out[method + "Seconds"] = time.perf_counter() - start
        if not case.get("timingOnly"):
            out[method] = p.tolist()
    if case.get("timingOnly"):
        return out
    ref = out.get("slow", out.get("fast"))
    zmax = float(np.max(ref))
    zs = [float(z) for z in case.get("fapPowers", [])] + [zmax]
    out["fapPowers"] = zs
    out["fap"] = [
        float(_statistics.false_alarm_probability(z, float(f[-1]), t, y, dy, normalization="standard", method="baluev"))
        for z in zs
    ]
    fbest = float(f[int(np.argmax(ref))])
    out["bestFrequency"] = fbest
    tfit = np.asarray(case.get("modelTimes", []), dtype=float)
    out["model"] = ls.model(tfit, fbest).tolist() if tfit.size else []
    return out


def run_pointwise_case(case):
    t = np.asarray(case["t"], dtype=float)
    y = np.asarray(case["y"], dtype=float)
    dy = None if case.get("dy") is None else np.asarray(case["dy"], dtype=float)
    ls = LombScargle(t, y, dy, fit_mean=True, center_data=True, normalization="standard")
    out = {"power": ls.power(np.asarray(case["frequencies"], dtype=float), method="slow").tolist()}
    fap = case.get("fap")
    if fap:
        limits = {"samples_per_peak": fap["samplesPerPeak"], "maximum_frequency": fap["maximumFrequency"]}
        out["fapPowers"] = [float(z) for z in fap["powers"]]
        out["fap"] = np.atleast_1d(ls.false_alarm_probability(np.asarray(out["fapPowers"]), method="baluev", **limits)).tolist()
        out["fapFrequencyLimits"] = [float(f) for f in ls.autofrequency(return_freq_limits=True, **limits)]
    return out


def main():
    request = json.load(sys.stdin)
    if request.get("kind") == "pointwise":
        import astropy

        json.dump({"astropyVersion": astropy.__version__, "cases": [run_pointwise_case(c) for c in request["cases"]]}, sys.stdout)
        return
    if request.get("timing"):
        # Warm-up, then the best of `repeat` runs of method='fast', timed inside python.
        answers = []
        for case in request["cases"]:
            t = np.asarray(case["t"], dtype=float)
            y = np.asarray(case["y"], dtype=float)
            dy = None if case.get("dy") is None else np.asarray(case["dy"], dtype=float)
            f = case["f0"] + case["df"] * np.arange(case["nf"])
            ls = LombScargle(t, y, dy, fit_mean=True, center_data=True, normalization="standard")
            ls.power(f, method="fast", assume_regular_frequency=True)
            best = math.inf
            for _ in range(request.get("repeat", 5)):
                start = time.perf_counter()
                ls.power(f, method="fast", assume_regular_frequency=True)
                best = min(best, time.perf_counter() - start)
            answers.append({"fastSeconds": best})
        json.dump({"cases": answers}, sys.stdout)
        return
    import astropy

    json.dump({"astropyVersion": astropy.__version__, "cases": [run_case(c) for c in request["cases"]]}, sys.stdout)


if __name__ == "__main__":
    main()
