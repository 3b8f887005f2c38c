#!/usr/bin/env python3
"""Independent scipy reference for Loopwright's averaged buck/boost models.

Each power stage is built from its averaged large-signal circuit equations (switch-node voltage as
the duty-weighted average of the two switch states, one state per inductor current, capacitor
voltage and ESL branch current), its DC operating point is solved numerically, and the model is
linearised by complex-step differentiation (no closed-form transfer function is used anywhere).
Frequency responses come from scipy.signal.freqresp on the resulting StateSpace, cross-checked
against a direct resolvent solve C (jwI - A)^-1 B + D. Model: state-space averaging
[published: Middlebrook & Cuk, PESC 1976; Erickson & Maksimovic, Fundamentals of Power
Electronics, 2nd ed., ch. 7 (from memory)].

Usage: python3 reference/scipy/generate.py [--cases DIR] [--out DIR]
"""
from __future__ import annotations

import argparse
import json
import pathlib
import sys
import warnings

import numpy as np
import scipy
import scipy.linalg
import scipy.optimize
import scipy.signal

HERE = pathlib.Path(__file__).resolve().parent
# Sub-points inserted between neighbouring sweep points before unwrapping the phase, so that a
# high-Q section never moves the phase by more than 180 degrees between two evaluated points.
OVERSAMPLE = 16
COMPLEX_STEP = 1e-30


# ----------------------------------------------------------------------------------------------
# Averaged large-signal power stage
# ----------------------------------------------------------------------------------------------
class AveragedStage:
    """Averaged large-signal model x' = f(x, u), v = g(x, u) of a CCM buck or boost.

    States x = [iL, vc_1..vc_m, ib_k for every branch k with ESL > 0].
    Inputs u = [d, vg, i_inj] (duty, input voltage, current injected into the output node).
    Switches: both switch positions have resistance rdsOn (the contract's synchronous switches).
    """

    def __init__(self, doc: dict):
        p = doc["plant"]
        self.topology = p["topology"]
        self.vin = float(p["vin"])
        self.vout = float(p["vout"])
        self.iout = float(p["iout"])
        self.fsw = float(p["fsw"])
        self.r_load = self.vout / self.iout
        self.l = float(p["inductor"]["l"])
        self.r_l = float(p["inductor"].get("dcr", 0.0))
        self.r_ds = float(p.get("rdsOn", 0.0))
        # A branch of n identical parts in parallel is one part of n*C, ESR/n, ESL/n.
        self.branches = []
        for b in p["capacitors"]:
            n = int(b.get("count", 1))
            esr = float(b.get("esr", 0.0)) / n
            esl = float(b.get("esl", 0.0)) / n
            if esr <= 0 and esl <= 0:
                raise ValueError("reference model needs esr > 0 or esl > 0 in every branch")
            self.branches.append({"c": float(b["c"]) * n, "esr": esr, "esl": esl})
        self.esl_index = [k for k, b in enumerate(self.branches) if b["esl"] > 0]
        self.n_states = 1 + len(self.branches) + len(self.esl_index)

    # -- node equations (written with plain arithmetic only, so the complex step goes through) --
    def output_voltage(self, x, u):
        d, _vg, i_inj = u
        i_l = x[0]
        m = len(self.branches)
        i_src = i_l if self.topology == "buck" else (1 - d) * i_l
        num = i_src + i_inj
        den = 1.0 / self.r_load
        for k, b in enumerate(self.branches):
            if b["esl"] > 0:
                num = num - x[1 + m + self.esl_index.index(k)]
            else:
                num = num + x[1 + k] / b["esr"]
                den = den + 1.0 / b["esr"]
        return num / den

    def derivatives(self, x, u):
        d, vg, _ = u
        i_l = x[0]
        v = self.output_voltage(x, u)
        m = len(self.branches)
        if self.topology == "buck":
            v_sw = d * (vg - i_l * self.r_ds) + (1 - d) * (0 - i_l * self.r_ds)
            di_l = (v_sw - self.r_l * i_l - v) / self.l
        else:
            v_sw = d * (i_l * self.r_ds) + (1 - d) * (v + i_l * self.r_ds)
            di_l = (vg - self.r_l * i_l - v_sw) / self.l
        out = [di_l]
        for k, b in enumerate(self.branches):
            if b["esl"] > 0:
                i_b = x[1 + m + self.esl_index.index(k)]
            else:
                i_b = (v - x[1 + k]) / b["esr"]
            out.append(i_b / b["c"])
        for k in self.esl_index:
            b = self.branches[k]
            i_b = x[1 + m + self.esl_index.index(k)]
            out.append((v - b["esr"] * i_b - x[1 + k]) / b["esl"])
        return out

    def input_current(self, x, u):
        return u[0] * x[0] if self.topology == "buck" else x[0]

    # -- numerics ---------------------------------------------------------------------------
    def jacobians(self, x0, u0):
        """Complex-step Jacobians A = df/dx, B = df/du, C = dg/dx, D = dg/du (exact to rounding)."""
        n = self.n_states
        a = np.zeros((n, n))
        b = np.zeros((n, 3))
        c = np.zeros((1, n))
        dd = np.zeros((1, 3))
        for j in range(n):
            x = np.array(x0, dtype=complex)
            x[j] += 1j * COMPLEX_STEP
            a[:, j] = np.imag(self.derivatives(x, u0)) / COMPLEX_STEP
            c[0, j] = np.imag(self.output_voltage(x, u0)) / COMPLEX_STEP
        for j in range(3):
            u = np.array(u0, dtype=complex)
            u[j] += 1j * COMPLEX_STEP
            b[:, j] = np.imag(self.derivatives(np.array(x0, dtype=complex), u)) / COMPLEX_STEP
            dd[0, j] = np.imag(self.output_voltage(np.array(x0, dtype=complex), u)) / COMPLEX_STEP
        return a, b, c, dd

    def equilibrium(self, d):
        """States at rest for duty d: f is affine in x for fixed u, so one linear solve."""
        u = (d, self.vin, 0.0)
        x_zero = np.zeros(self.n_states)
        f0 = np.array(self.derivatives(x_zero, u), dtype=float)
        a, _, _, _ = self.jacobians(x_zero, u)
        x = np.linalg.solve(a, -f0)
        # One Newton polish step against rounding.
        x = x - np.linalg.solve(a, np.array(self.derivatives(x, u), dtype=float))
        return x, float(np.real(self.output_voltage(x, u)))

    def operating_point(self):
        lo = 1e-9
        if self.topology == "buck":
            hi = 1 - 1e-9
            if self.equilibrium(hi)[1] < self.vout:
                raise ValueError("buck cannot reach vout")
        else:
            # Output rises with d up to the maximum-gain point, then falls: keep the normal branch.
            res = scipy.optimize.minimize_scalar(lambda d: -self.equilibrium(d)[1], bounds=(lo, 1 - 1e-6),
                                                 method="bounded", options={"xatol": 1e-12})
            hi = float(res.x)
            if self.equilibrium(hi)[1] < self.vout:
                raise ValueError("boost beyond its maximum-gain point")
        duty = scipy.optimize.brentq(lambda d: self.equilibrium(d)[1] - self.vout, lo, hi, xtol=1e-15, rtol=1e-15)
        x, v = self.equilibrium(duty)
        u = (duty, self.vin, 0.0)
        p_out = v * v / self.r_load
        p_in = self.vin * float(np.real(self.input_current(x, u)))
        return {"duty": duty, "x": x, "u": u, "vout": v, "inductorCurrent": float(x[0]), "efficiency": p_out / p_in}


# ----------------------------------------------------------------------------------------------
# Compensator from its parts (nodal analysis, independent of the pole/zero formulas)
# ----------------------------------------------------------------------------------------------
def par(a, b):
    return a * b / (a + b)


def compensator_response(doc: dict, s: np.ndarray) -> np.ndarray | None:
    """Gc = -v_c/v_out (sign of the inverting stage removed), or None when parts are absent."""
    comp = doc.get("compensator") or {}
    parts = comp.get("parts")
    if not parts:
        return None
    kind = comp["kind"]
    r1 = float(doc["feedback"]["r1"])
    vref = float(doc["feedback"]["vref"])
    vout = float(doc["plant"]["vout"])
    rb = r1 * vref / (vout - vref)
    g = lambda k: float(parts[k])  # noqa: E731
    if kind == "type2-ota":
        zc = par(g("r2") + 1 / (s * g("c1")), 1 / (s * g("c2")))
        if "ro" in parts:
            zc = par(zc, g("ro"))
        return (rb / (r1 + rb)) * g("gm") * zc
    if kind == "type1":
        zi, zf = r1 + 0 * s, 1 / (s * g("c1"))
    elif kind == "type2":
        zi, zf = r1 + 0 * s, par(g("r2") + 1 / (s * g("c1")), 1 / (s * g("c2")))
    elif kind == "type3":
        zi = par(r1, g("r3") + 1 / (s * g("c3")))
        zf = par(g("r2") + 1 / (s * g("c1")), 1 / (s * g("c2")))
    else:
        raise ValueError(f"unknown compensator kind {kind}")
    opamp = comp.get("opamp")
    if not opamp:
        return zf / zi
    # Finite single-pole op-amp: solve the two node equations (inverting node vn, output vc = -A vn)
    # with v_out = 1 for every frequency.
    a0 = 10 ** (float(opamp["a0Db"]) / 20)
    wa = 2 * np.pi * float(opamp["gbw"]) / a0
    amp = a0 / (1 + s / wa)
    out = np.empty_like(s)
    for i in range(len(s)):
        # unknowns [vn, vc]: (1 - vn)/zi + (vc - vn)/zf - vn/rb = 0 ; vc + A vn = 0
        m = np.array([[-1 / zi[i] - 1 / zf[i] - 1 / rb, 1 / zf[i]], [amp[i], 1]])
        rhs = np.array([-1 / zi[i], 0])
        vn, vc = np.linalg.solve(m, rhs)
        out[i] = -vc
    return out


def compensator_polynomials(doc: dict):
    """(num, den) of Gc in descending powers of s, by polynomial algebra on the impedances."""
    comp = doc.get("compensator") or {}
    parts = comp.get("parts")
    if not parts or comp.get("opamp"):
        return None
    P = np.polynomial.polynomial  # ascending coefficients inside this function
    def imp_r(r): return ([r], [1.0])
    def imp_c(c): return ([1.0], [0.0, c])
    def series(a, b): return (P.polyadd(P.polymul(a[0], b[1]), P.polymul(b[0], a[1])), P.polymul(a[1], b[1]))
    def parallel(a, b): return (P.polymul(a[0], b[0]), P.polyadd(P.polymul(a[0], b[1]), P.polymul(b[0], a[1])))
    g = lambda k: float(parts[k])  # noqa: E731
    r1 = float(doc["feedback"]["r1"])
    kind = comp["kind"]
    if kind == "type2-ota":
        vref, vout = float(doc["feedback"]["vref"]), float(doc["plant"]["vout"])
        zc = parallel(series(imp_r(g("r2")), imp_c(g("c1"))), imp_c(g("c2")))
        if "ro" in parts:
            zc = parallel(zc, imp_r(g("ro")))
        num, den = P.polymul(zc[0], [vref / vout * g("gm")]), zc[1]
    else:
        if kind == "type1":
            zi, zf = imp_r(r1), imp_c(g("c1"))
        elif kind == "type2":
            zi, zf = imp_r(r1), parallel(series(imp_r(g("r2")), imp_c(g("c1"))), imp_c(g("c2")))
        else:
            zi = parallel(imp_r(r1), series(imp_r(g("r3")), imp_c(g("c3"))))
            zf = parallel(series(imp_r(g("r2")), imp_c(g("c1"))), imp_c(g("c2")))
        num, den = P.polymul(zf[0], zi[1]), P.polymul(zf[1], zi[0])
    num, den = P.polytrim(num), P.polytrim(den)
    return np.array(num[::-1], dtype=float), np.array(den[::-1], dtype=float)


# ----------------------------------------------------------------------------------------------
# Sweeps, phase, metrics
# ----------------------------------------------------------------------------------------------
def sweep_freqs(doc: dict) -> np.ndarray:
    sw = doc["sweep"]
    if "freqHz" in sw:
        return np.asarray(sw["freqHz"], dtype=float)
    return np.logspace(np.log10(sw["startHz"]), np.log10(sw["stopHz"]), int(sw["points"]))


def oversampled(freq: np.ndarray) -> np.ndarray:
    """OVERSAMPLE log-spaced sub-points per interval; the original points sit at k*OVERSAMPLE."""
    lf = np.log10(freq)
    parts = [np.linspace(lf[i], lf[i + 1], OVERSAMPLE, endpoint=False) for i in range(len(lf) - 1)]
    return 10 ** np.concatenate(parts + [lf[-1:]])


def unwrapped_phase_deg(h: np.ndarray) -> np.ndarray:
    """Principal value at the lowest frequency, then continuous (numpy.unwrap) along the dense grid.

    Every case starts two or more decades below its lowest pole, so the principal value there is
    the DC value (0 deg, or -90 deg with one integrator) as the contract asks.
    """
    return np.degrees(np.unwrap(np.angle(h)))


class Evaluator:
    """Exact evaluation of a frequency response, with a continuous phase at arbitrary points."""

    def __init__(self, fn, f_dense):
        self.fn = fn
        self.f = f_dense
        self.h = fn(f_dense)
        self.ph = unwrapped_phase_deg(self.h)

    def phase_at(self, f):
        guess = np.interp(np.log(f), np.log(self.f), self.ph)
        p = np.degrees(np.angle(self.fn(np.array([f]))[0]))
        return p + 360 * np.round((guess - p) / 360)

    def logmag_at(self, f):
        return np.log(np.abs(self.fn(np.array([f]))[0]))


def loop_metrics(ev: Evaluator) -> dict:
    f, lm, ph = ev.f, np.log(np.abs(ev.h)), ev.ph
    crossings = []
    for i in np.nonzero(np.sign(lm[:-1]) * np.sign(lm[1:]) < 0)[0]:
        fc = scipy.optimize.brentq(ev.logmag_at, f[i], f[i + 1], xtol=1e-13 * f[i], rtol=1e-15)
        pm = 180 + ev.phase_at(fc)
        pm = pm - 360 * np.ceil((pm - 180) / 360)  # into (-180, 180]
        crossings.append({"freqHz": fc, "phaseMarginDeg": pm})
    phase_crossings = []
    k_lo, k_hi = int(np.floor((ph.min() + 180) / 360)), int(np.ceil((ph.max() + 180) / 360))
    for k in range(k_lo, k_hi + 1):
        target = -180 + 360 * k
        g = ph - target
        for i in np.nonzero(np.sign(g[:-1]) * np.sign(g[1:]) < 0)[0]:
            f180 = scipy.optimize.brentq(lambda x: ev.phase_at(x) - target, f[i], f[i + 1], xtol=1e-13 * f[i], rtol=1e-15)
            phase_crossings.append({"freqHz": f180, "gainMarginDb": -20 * ev.logmag_at(f180) / np.log(10)})
    phase_crossings.sort(key=lambda c: c["freqHz"])
    # governing margins: smallest |PM| and smallest |GM dB| (python-control stability_margins convention, from memory)
    worst = min(crossings, key=lambda c: abs(c["phaseMarginDeg"])) if crossings else None
    governing_gm = min(phase_crossings, key=lambda c: abs(c["gainMarginDb"])) if phase_crossings else None
    return {
        "crossoverHz": worst["freqHz"] if worst else None,
        "phaseMarginDeg": worst["phaseMarginDeg"] if worst else None,
        "gainMarginDb": governing_gm["gainMarginDb"] if governing_gm else None,
        "crossovers": crossings,
        "phaseCrossovers": phase_crossings,
    }


def closed_loop_poles(plant_ss, comp_tf, fm):
    """Poles of the loop closed through d = -fm * Gc(v); plant_ss = (A, B_d, C, D_d)."""
    ap, bp, cp, dp = plant_ss
    ac, bc, cc, dc = scipy.signal.tf2ss(*comp_tf)
    # u = -fm (cc xc + dc y), y = cp xp + dp u  ->  u = -fm (cc xc + dc cp xp) / (1 + fm dc dp)
    k = 1.0 / (1.0 + fm * dc[0, 0] * dp[0, 0])
    u_xp = -fm * k * dc[0, 0] * cp
    u_xc = -fm * k * cc
    y_xp = cp + dp * u_xp
    y_xc = dp * u_xc
    top = np.hstack([ap + bp @ u_xp, bp @ u_xc])
    bottom = np.hstack([bc @ y_xp, ac + bc @ y_xc])
    return np.linalg.eigvals(np.vstack([top, bottom]))


def response_record(freq, h_dense):
    idx = np.arange(0, len(h_dense), OVERSAMPLE)
    ph = unwrapped_phase_deg(h_dense)[idx]
    return {"magDb": (20 * np.log10(np.abs(h_dense[idx]))).tolist(), "phaseDeg": ph.tolist()}


# ----------------------------------------------------------------------------------------------
def analyse_case(doc: dict) -> dict:
    stage = AveragedStage(doc)
    op = stage.operating_point()
    a, b, c, d = stage.jacobians(op["x"], op["u"])
    freq = sweep_freqs(doc)
    f_dense = oversampled(freq)
    w_dense = 2 * np.pi * f_dense

    def via_freqresp(col):
        sys_ = scipy.signal.StateSpace(a, b[:, [col]], c, d[:, [col]])
        # freqresp goes through a polynomial form and warns about its conditioning when an ESL
        # pole sits near 1e11 rad/s; the resolvent cross-check below bounds the actual error.
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", scipy.signal.BadCoefficients)
            return scipy.signal.freqresp(sys_, w=w_dense)[1]

    def via_resolvent(col):
        eye = np.eye(a.shape[0])
        return np.array([(c @ np.linalg.solve(1j * w * eye - a, b[:, col]))[0] + d[0, col] for w in w_dense])

    out = {"responses": {}, "crossCheck": {}}
    names = {"gvd": 0, "gvg": 1, "zo": 2}
    dense = {}
    for name, col in names.items():
        h = via_freqresp(col)
        h_direct = via_resolvent(col)
        rel = float(np.max(np.abs(h - h_direct) / np.abs(h_direct)))
        out["crossCheck"][name] = {"maxRelativeDifferenceFreqrespVsResolvent": rel}
        dense[name] = h
        out["responses"][name] = response_record(freq, h)

    mod = doc.get("modulator", {})
    fm = 1.0 / float(mod.get("vramp", 1.0))  # at the nominal vin, feed-forward or not
    delay = float(mod.get("delay", 0.0) or 0.0)
    s_dense = 1j * w_dense
    gc = compensator_response(doc, s_dense)
    metrics = None
    if gc is not None:
        out["responses"]["compensator"] = response_record(freq, gc)

        def loop_fn(fq):
            s = 1j * 2 * np.pi * np.asarray(fq, dtype=float)
            hp = np.array([(c @ np.linalg.solve(x * np.eye(a.shape[0]) - a, b[:, 0]))[0] + d[0, 0] for x in s])
            return compensator_response(doc, s) * fm * hp * np.exp(-s * delay)

        loop_dense = gc * fm * dense["gvd"] * np.exp(-s_dense * delay)
        out["responses"]["loop"] = response_record(freq, loop_dense)
        ev = Evaluator(loop_fn, f_dense)
        metrics = loop_metrics(ev)
        comp_tf = compensator_polynomials(doc)
        if comp_tf is not None and delay == 0:
            poles = closed_loop_poles((a, b[:, [0]], c, d[:, [0]]), comp_tf, fm)
            metrics["closedLoopStable"] = bool(np.all(poles.real < 0))
            metrics["closedLoopPolesMaxRealPart"] = float(np.max(poles.real))
        else:
            metrics["closedLoopStable"] = None
    open_poles = np.linalg.eigvals(a)
    return {
        "case": doc.get("name"),
        "generator": "reference/scipy/generate.py",
        "versions": {"python": sys.version.split()[0], "numpy": np.__version__, "scipy": scipy.__version__},
        "method": (
            "averaged large-signal state equations, DC point by brentq on duty, complex-step Jacobians, "
            "scipy.signal.freqresp(StateSpace); phase: principal value at the first point, then numpy.unwrap on a "
            f"{OVERSAMPLE}x oversampled log grid"
        ),
        "operatingPoint": {
            "duty": op["duty"],
            "efficiency": op["efficiency"],
            "inductorCurrent": op["inductorCurrent"],
            "vout": op["vout"],
        },
        "stateCount": int(a.shape[0]),
        "openLoopPolesHz": sorted([abs(p) / (2 * np.pi) for p in open_poles]),
        "freqHz": freq.tolist(),
        **out,
        "metrics": metrics,
    }


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--cases", default=str(HERE.parent / "cases"))
    ap.add_argument("--out", default=str(HERE / "out"))
    args = ap.parse_args(argv)
    out_dir = pathlib.Path(args.out)
    out_dir.mkdir(parents=True, exist_ok=True)
    for path in sorted(pathlib.Path(args.cases).glob("*.json")):
        doc = json.loads(path.read_text())
        doc.setdefault("name", path.stem)
        result = analyse_case(doc)
        (out_dir / path.name).write_text(json.dumps(result, indent=1) + "\n")
        print(f"{path.stem}: duty={result['operatingPoint']['duty']:.6f} states={result['stateCount']}"
              + (f" fc={result['metrics']['crossoverHz']:.1f} PM={result['metrics']['phaseMarginDeg']:.2f}"
                 if result["metrics"] and result["metrics"]["crossoverHz"] else ""))


if __name__ == "__main__":
    main()
