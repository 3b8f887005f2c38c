"""Writes reference/currentmode/out/input-impedance.json: the input impedance ZD of peak current-mode
stages with the control voltage held (the outer loop open at the comparator), measured on the
cycle-by-cycle switching simulation (simulate.py) by a sine on the input voltage.

    python3 reference/currentmode/input_impedance.py [--out DIR]

Each case first settles with its loop closed (simulate.settle); the comparator's threshold is then
frozen at that steady state's control voltage vc, so the stage runs at the same operating point
with vc constant. The input voltage becomes Vg + a·sin(ωt) and the input current ig (iL while the
switch is on for a buck, iL for a boost) is Fourier-integrated over whole periods of both the sine
and the clock, exactly interval by interval: ZD = V̂g/Îg. Nothing here uses an averaged model.
"""
import argparse
import os
import sys
from fractions import Fraction

import numpy as np
from scipy.linalg import expm

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, HERE)
from simulate import GL_W, GL_X, Converter, settle  # noqa: E402
from generate import SETTLE_PERIODS, INJECTION_SETTLE, generator_info, load_case, point, window_periods, write_json  # noqa: E402

CASES = ["buck-d028-mc13", "buck-d066-mc17", "boost-d058-rhp"]
FRACTIONS = [Fraction(1, 200), Fraction(1, 50), Fraction(1, 20), Fraction(1, 10), Fraction(1, 5)]
LINE_AMPLITUDE = 0.002  # of Vg: linear response, far above rounding


class HeldControl(Converter):
    """The converter with vc frozen and a sine on the input voltage (the feedback injection off)."""

    def __init__(self, doc, vc, line_amp, freq):
        self.line_amp = line_amp
        super().__init__(doc, inj_amp=0.0, inj_freq=freq)
        g = np.zeros(self.n)
        g[self.iL] = self.Ri
        g[self.iTau] = self.Se
        g[self.iOne] = -vc
        self.g = g
        self.grid_rows = np.einsum("j,tjk->tk", g, expm(self.M_on[None, :, :] * self.grid_taus[:, None, None]))

    def _matrix(self, on):
        M = super()._matrix(on)
        if self.boost or on:  # the input voltage drives the inductor
            M[self.iL, self.iS] += self.line_amp / self.L
        return M

    def input_current_row(self, on):
        row = np.zeros(self.n)
        if self.boost or on:
            row[self.iL] = 1.0
        return row

    def run_line(self, z, periods, window, guess):
        """Whole periods from a clock edge at t = 0; the Fourier integrals of the line sine and of ig
        over the last `window` periods."""
        Ts = self.Ts
        V = I = 0.0 + 0.0j
        start = periods - window
        for k in range(periods):
            z = z.copy()
            z[self.iTau] = 0.0
            t_on = self.on_time(z, guess)
            guess = t_on if 0 < t_on < Ts else guess
            tk = k * Ts
            for M, dt, on in [(self.M_on, t_on, True), (self.M_off, Ts - t_on, False)]:
                if dt <= 0:
                    continue
                if k >= start:
                    taus = 0.5 * dt * (GL_X + 1)
                    zs = expm(M[None, :, :] * taus[:, None, None]) @ z
                    ph = np.exp(-1j * self.w * (tk + taus))
                    wts = 0.5 * dt * GL_W
                    V += np.sum(wts * self.line_amp * zs[:, self.iS] * ph)
                    I += np.sum(wts * (zs @ self.input_current_row(on)) * ph)
                z = expm(M * dt) @ z
                tk += dt
        return z, V / I, guess


def run_case(name):
    doc = load_case(name)
    fsw = doc["plant"]["fsw"]
    conv, z_ss, duties, guess = settle(doc, SETTLE_PERIODS)
    vc = conv.vref - z_ss[conv.iC2]
    rows = []
    for frac in FRACTIONS:
        window = window_periods(frac)
        c = HeldControl(doc, vc, LINE_AMPLITUDE * doc["plant"]["vin"], float(frac) * fsw)
        z = z_ss.copy()
        z[c.iS], z[c.iCo] = 0.0, 1.0
        periods = INJECTION_SETTLE + 2 * window
        # the phase reference is the clock edge at t = 0 of this run: start the sine there
        _, zd_prev, g1 = c.run_line(z, INJECTION_SETTLE + window, window, guess)
        _, zd, _ = c.run_line(z, periods, window, guess)
        rows.append(point(float(frac) * fsw, zd, zd_prev, window))
        print(name, float(frac), rows[-1]["magDb"], rows[-1]["phaseDeg"], file=sys.stderr)
    return {"case": name, "simulatedDuty": float(duties[-1]), "heldControlVoltage": float(vc),
            "lineAmplitudeV": LINE_AMPLITUDE * doc["plant"]["vin"], "points": rows}


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--out", default=os.path.join(HERE, "out"))
    args = ap.parse_args()
    info = generator_info()
    info["script"] = "reference/currentmode/input_impedance.py"
    write_json(args.out, "input-impedance.json", {"cases": [run_case(n) for n in CASES], "generator": info})


if __name__ == "__main__":
    main()
