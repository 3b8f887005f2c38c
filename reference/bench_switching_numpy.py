#!/usr/bin/env python3
"""numpy/scipy counterpart of the engine's switching check, for `npm run bench` (scripts/bench-switching.ts).

The same method, written as an engineer would in numpy: each interval by scipy.linalg.expm, the
turn-off instant on a 16-step grid then a safeguarded Newton on the exact solution from the
Hermite-cubic start, the periodic orbit by Newton with the saltation Jacobian, the injected orbit
over N periods by the chord iteration with M0^N, and the one-bin Fourier integrals per interval
from (A - jwI)^-1. Input (JSON on stdin): the switched systems the engine built (matrices, rows),
the comparator's ramp slope (V/s: Vramp/Ts in voltage mode, Se in peak current mode, where the
control row already carries -Ri on the inductor current) and the scale of its margin, and the list
of (N, amplitude) to measure; output: the measured T and the CPU time.
"""
import json
import sys
import time

import numpy as np
from scipy.linalg import expm, lu_factor, lu_solve

K = 16


class Prop:
    def __init__(self, s, fsw, slope, scale):
        self.n, self.nc = s["n"], s["nc"]
        self.a_on = np.array(s["aOn"]).reshape(self.n, self.n)
        self.a_off = np.array(s["aOff"]).reshape(self.n, self.n)
        self.c = np.array(s["control"])
        self.v_on = np.array(s["voutOn"])
        self.v_off = np.array(s["voutOff"])
        self.ts = 1 / fsw
        self.h = self.ts / K
        self.scale = scale
        self.slope = slope
        self.step_on = expm(self.a_on * self.h)
        self.step_off = expm(self.a_off * self.h)

    def margin(self, x, t):
        return self.c @ x - self.slope * t

    def rate(self, x):
        return self.c @ (self.a_on @ x) - self.slope

    def place(self, xl, tl, tr):
        xr = self.step_on @ xl
        g0, d0 = self.margin(xl, tl), self.rate(xl) * self.h
        g1, d1 = self.margin(xr, tr), self.rate(xr) * self.h
        lo, hi = 0.0, 1.0
        for _ in range(50):
            u = (lo + hi) / 2
            val = (2 * u**3 - 3 * u**2 + 1) * g0 + (u**3 - 2 * u**2 + u) * d0 + (-2 * u**3 + 3 * u**2) * g1 + (u**3 - u**2) * d1
            lo, hi = (u, hi) if val > 0 else (lo, u)
        t = tl + min(max((lo + hi) / 2, 1e-9), 1 - 1e-9) * self.h
        xt = expm(self.a_on * (t - tl)) @ xl
        g = self.margin(xt, t)
        lo, hi = (t, tr) if g > 0 else (tl, t)
        it = 0
        while it < 60 and abs(g) > 1e-14 * self.scale:
            r = self.rate(xt)
            cand = t - g / r if r < 0 else (lo + hi) / 2
            if not (lo < cand < hi):
                cand = (lo + hi) / 2
            xc = expm(self.a_on * (cand - tl)) @ xl
            gc = self.margin(xc, cand)
            step = abs(cand - t)
            t, xt, g = cand, xc, gc
            lo, hi = (cand, hi) if gc > 0 else (lo, cand)
            if step <= 1e-15 * self.ts or hi - lo <= 1e-15 * self.ts:
                break
            it += 1
        return t, xt

    def cycle(self, x0):
        if self.margin(x0, 0) <= 0:
            return np.linalg.matrix_power(self.step_off, K) @ x0, 0.0, x0.copy()
        x, k = x0, 0
        nxt = self.step_on @ x
        while k < K and self.margin(nxt, (k + 1) * self.h) > 0:
            x, k = nxt, k + 1
            if k < K:
                nxt = self.step_on @ x
        if k == K:
            return x, self.ts, x.copy()
        t, xt = self.place(x, k * self.h, (k + 1) * self.h)
        y = expm(self.a_off * ((k + 1) * self.h - t)) @ xt
        for _ in range(K - k - 1):
            y = self.step_off @ y
        return y, t, xt

    def jacobian(self, t_off, x_off):
        n, nc = self.n, self.nc
        if t_off <= 0:
            return expm(self.a_off * self.ts)[:nc, :nc]
        if t_off >= self.ts:
            return expm(self.a_on * self.ts)[:nc, :nc]
        f_on, f_off = self.a_on @ x_off, self.a_off @ x_off
        den = self.c @ f_on - self.slope
        s = np.eye(n) - np.outer(f_on - f_off, self.c) / den
        return (expm(self.a_off * (self.ts - t_off)) @ s @ expm(self.a_on * t_off))[:nc, :nc]


def orbit(p, x):
    nc = p.nc
    x = x.copy()
    for _ in range(40):
        x1, t_off, x_off = p.cycle(x)
        f = x1[:nc] - x[:nc]
        if np.max(np.abs(f)) <= 1e-12 * max(np.max(np.abs(x[:nc])), 1e-3):
            break
        j = p.jacobian(t_off, x_off) - np.eye(nc)
        x[:nc] -= np.linalg.solve(j, f)
    x1, t_off, x_off = p.cycle(x)
    return x, p.jacobian(t_off, x_off)


def weights(a, v, n, nc, w):
    wv = np.linalg.solve((a[:nc, :nc] - 1j * w * np.eye(nc)).T, v[:nc])
    q = v[nc:] - wv @ a[:nc, nc:]
    return wv, q


def integral(wq, nc, w, t0, t1, x0, x1):
    wv, q = wq
    z0, z1 = np.exp(-1j * w * t0), np.exp(-1j * w * t1)
    acc = wv @ (x1[:nc] * z1 - x0[:nc] * z0)
    f2 = 1j * (np.exp(-2j * w * t1) - np.exp(-2j * w * t0)) / (2 * w)
    e = np.array([1j * (z1 - z0) / w, -0.5j * ((t1 - t0) - f2), 0.5 * ((t1 - t0) + f2)])
    return acc + q @ e


def measure(sysj, fsw, slope, scale, x_star, m0, periods, amp):
    p = Prop(sysj, fsw, slope, scale)
    n, nc = p.n, p.nc
    w = 2 * np.pi * fsw / periods
    w_on = weights(p.a_on, p.v_on, n, nc, w)
    w_off = weights(p.a_off, p.v_off, n, nc, w)
    chord = lu_factor(np.linalg.matrix_power(m0, periods) - np.eye(nc))
    x0 = x_star.copy()
    x0[nc:] = [1, 0, 1]
    t_prev = 0
    for it in range(10):
        acc = 0j
        x = x0
        for k in range(periods):
            x1, t_off, x_off = p.cycle(x)
            start = k * p.ts
            if t_off > 0:
                acc += integral(w_on, nc, w, start, start + t_off, x, x_off)
            if t_off < p.ts:
                acc += integral(w_off, nc, w, start + t_off, start + p.ts, x_off, x1)
            x = x1
        y = acc - 0.5j * amp * periods * p.ts
        t = -acc / y
        change = abs(t - t_prev) / abs(t)
        t_prev = t
        x0[:nc] -= lu_solve(chord, x[:nc] - x0[:nc])
        if it >= 1 and change <= 1e-6:
            break
    return t


def main():
    job = json.load(sys.stdin)
    out = []
    for case in job["cases"]:
        t0 = time.process_time()
        slope, scale = case["rampSlope"], case["marginScale"]
        p0 = Prop(case["unperturbed"], case["fsw"], slope, scale)
        x_star, m0 = orbit(p0, np.array(case["guess"]))
        results = []
        for m in case["measurements"]:
            t = measure(m["system"], case["fsw"], slope, scale, x_star, m0, m["periods"], m["amplitude"])
            results.append({"periods": m["periods"], "re": t.real, "im": t.imag})
        out.append({"name": case["name"], "cpuS": time.process_time() - t0, "points": results})
    json.dump({"numpy": np.__version__, "cases": out}, sys.stdout)


if __name__ == "__main__":
    main()
