#!/usr/bin/env python3
"""Times scipy.optimize.least_squares on the committed fit cases (for scripts/bench-fit.ts).

Prints one JSON line: per case the median wall time of `repeats` fits in ms and the cost reached.
"""
import json
import sys
import time

import numpy as np

sys.path.insert(0, __file__.rsplit("/", 1)[0])
import generate  # noqa: E402  (the same model, residual and scipy options as the committed estimates)


def main():
    repeats = int(sys.argv[1]) if len(sys.argv) > 1 else 5
    ref = json.load(open(__file__.rsplit("/", 1)[0] + "/out/cases.json"))
    out = []
    for case in ref["cases"]:
        m = case["measurement"]
        f = np.array(m["freqHz"])
        meas = 10 ** (np.array(m["magDb"]) / 20) * np.exp(1j * np.radians(m["phaseDeg"]))
        fun = generate.case_residual(case, meas, f)
        times = []
        for _ in range(repeats):
            t0 = time.perf_counter()
            res = generate.fit_case(case, fun)
            times.append((time.perf_counter() - t0) * 1000)
        out.append({"name": case["name"], "ms": float(np.median(times)), "cost": float(res.cost), "nfev": int(res.nfev)})
    print(json.dumps(out))


if __name__ == "__main__":
    main()
