"""Cycle-by-cycle switching simulation of a peak current-mode buck or boost with its Type II loop.

Exact piecewise-linear simulation: within each switching interval the circuit (inductor, every
capacitor branch with its ESR, the load, the op-amp network and the injection oscillator) is one
linear system dz/dt = M z, integrated with the matrix exponential. The switch turns on at each
clock edge and off when the sensed current plus the compensation ramp reaches the op-amp output
(trailing-edge peak current control): Ri·iL + Se·tau = vc, found by Newton iteration on the exact
solution. Nothing here uses an averaged or small-signal model.

Loop gain by sine injection in series with the feedback path: x = vout + injection enters the
divider, y = vout returns; over whole periods of both the injection and the switching clock,
T = -Y/X from Fourier integrals taken exactly interval by interval (Gauss-Legendre on each
smooth piece, split at the switching instants, so the ESR steps of a boost are integrated exactly).
"""
import numpy as np
from scipy.linalg import expm

GL_X, GL_W = np.polynomial.legendre.leggauss(10)


class Converter:
    """State z = [iL, v_cap..., vC1, vC2, sin, cos, tau, one]."""

    def __init__(self, doc, inj_amp=0.0, inj_freq=1.0, se=None):
        p = doc["plant"]
        m = doc["modulator"]
        c = doc["compensator"]["parts"]
        self.boost = p["topology"] == "boost"
        self.vg = p["vin"]
        self.vout = p["vout"]
        self.R = p["vout"] / p["iout"]
        self.L = p["inductor"]["l"]
        self.rl = p["inductor"]["dcr"] + p.get("rdsOn", 0.0)  # both switches carry rdsOn
        self.Ts = 1.0 / p["fsw"]
        self.Ri = m["senseGain"]
        self.Se = m.get("rampSlope", 0.0) if se is None else se
        self.caps = [(b["c"] * b["count"], b["esr"] / b["count"]) for b in p["capacitors"]]
        assert all(esr > 0 for _, esr in self.caps), "the simulator needs ESR > 0 on every branch"
        self.vref = doc["feedback"]["vref"]
        self.r1 = doc["feedback"]["r1"]
        self.rb = self.r1 * self.vref / (self.vout - self.vref)
        self.r2, self.c1, self.c2 = c["r2"], c["c1"], c["c2"]
        self.inj_amp = inj_amp
        self.w = 2 * np.pi * inj_freq
        n = len(self.caps)
        self.iL, self.iC1, self.iC2 = 0, 1 + n, 2 + n
        self.iS, self.iCo, self.iTau, self.iOne = 3 + n, 4 + n, 5 + n, 6 + n
        self.n = 7 + n
        self.M_on = self._matrix(on=True)
        self.M_off = self._matrix(on=False)
        # comparator: g = Ri·iL + Se·tau − vc,  vc = Vref − vC2
        g = np.zeros(self.n)
        g[self.iL] = self.Ri
        g[self.iTau] = self.Se
        g[self.iC2] = 1.0
        g[self.iOne] = -self.vref
        self.g = g
        # g(z(tau)) on a fixed coarse grid of the on-interval is one matrix product per period
        self.grid_taus = np.linspace(0, self.Ts, 9)[1:]
        self.grid_rows = np.einsum("j,tjk->tk", g, expm(self.M_on[None, :, :] * self.grid_taus[:, None, None]))

    def vout_row(self, on):
        """vout as a linear function of z: KCL at the output node with every branch's ESR."""
        row = np.zeros(self.n)
        gsum = 1.0 / self.R + sum(1.0 / esr for _, esr in self.caps)
        if not (self.boost and on):
            row[self.iL] = 1.0 / gsum  # the inductor current reaches the output node
        for k, (_, esr) in enumerate(self.caps):
            row[1 + k] = (1.0 / esr) / gsum
        return row

    def _matrix(self, on):
        n = self.n
        M = np.zeros((n, n))
        vo = self.vout_row(on)
        # inductor
        if self.boost:
            M[self.iL, self.iOne] += self.vg / self.L
            M[self.iL, self.iL] += -self.rl / self.L
            if not on:
                M[self.iL] -= vo / self.L
        else:
            if on:
                M[self.iL, self.iOne] += self.vg / self.L
            M[self.iL, self.iL] += -self.rl / self.L
            M[self.iL] -= vo / self.L
        # capacitor branches: C dv/dt = (vout − v)/esr
        for k, (c, esr) in enumerate(self.caps):
            M[1 + k] += vo / (esr * c)
            M[1 + k, 1 + k] -= 1.0 / (esr * c)
        # op-amp network: i_f = (vout + inj − Vref)/R1 − Vref/Rb flows through Zf to the output
        i_f = vo / self.r1
        i_f = i_f.copy()
        i_f[self.iS] += self.inj_amp / self.r1
        i_f[self.iOne] += -self.vref / self.r1 - self.vref / self.rb
        i_r2 = np.zeros(n)
        i_r2[self.iC2] = 1.0 / self.r2
        i_r2[self.iC1] = -1.0 / self.r2
        M[self.iC1] += i_r2 / self.c1
        M[self.iC2] += (i_f - i_r2) / self.c2
        # injection oscillator and the clock's ramp time
        M[self.iS, self.iCo] = self.w
        M[self.iCo, self.iS] = -self.w
        M[self.iTau, self.iOne] = 1.0
        return M

    def initial_state(self):
        """Averaged DC guess: the loop settles the rest."""
        z = np.zeros(self.n)
        d = 1 - self.vg / self.vout if self.boost else self.vout / self.vg
        il = self.vout / self.R / ((1 - d) if self.boost else 1.0)
        z[self.iL] = il
        for k in range(len(self.caps)):
            z[1 + k] = self.vout
        vc = self.Ri * il + self.Se * d * self.Ts
        z[self.iC2] = self.vref - vc
        z[self.iC1] = z[self.iC2]
        z[self.iCo] = 1.0
        z[self.iOne] = 1.0
        return z

    def on_time(self, z, guess):
        """First tau in (0, Ts) with g(z(tau)) = 0 on the on-interval; Ts if never (duty 1)."""
        g0 = self.g @ z
        if g0 >= 0:
            return 0.0
        Ts = self.Ts
        # bracket on a coarse grid (g rises with the inductor current and the ramp)
        taus = self.grid_taus
        gs = self.grid_rows @ z
        idx = np.nonzero(gs >= 0)[0]
        if len(idx) == 0:
            return Ts
        hi = taus[idx[0]]
        lo = 0.0 if idx[0] == 0 else taus[idx[0] - 1]
        t = min(max(guess, lo), hi)
        for _ in range(40):  # safeguarded Newton
            zt = expm(self.M_on * t) @ z
            gt = self.g @ zt
            if gt >= 0:
                hi = t
            else:
                lo = t
            dg = self.g @ (self.M_on @ zt)
            t_new = t - gt / dg if dg > 0 else 0.5 * (lo + hi)
            if not (lo < t_new < hi):
                t_new = 0.5 * (lo + hi)
            if abs(t_new - t) < 1e-15 * Ts or hi - lo < 1e-14 * Ts:
                return t_new
            t = t_new
        return t

    def run(self, z, periods, t0=0.0, window=None, guess=None):
        """Simulate whole periods from clock edge t0. Returns the state, duties and, when `window`
        (number of trailing periods) is given, the Fourier integrals of vout and vout + injection."""
        Ts = self.Ts
        duties = np.empty(periods)
        X = Y = 0.0 + 0.0j
        guess = guess if guess is not None else 0.5 * Ts
        start_meas = periods - window if window else periods
        row_on, row_off = self.vout_row(True), self.vout_row(False)
        inj_row = np.zeros(self.n)
        inj_row[self.iS] = self.inj_amp
        for k in range(periods):
            z = z.copy()
            z[self.iTau] = 0.0
            t_on = self.on_time(z, guess)
            guess = t_on if 0 < t_on < Ts else guess
            duties[k] = t_on / Ts
            tk = t0 + k * Ts
            segs = [(self.M_on, t_on, row_on), (self.M_off, Ts - t_on, row_off)]
            for M, dt, row in segs:
                if dt <= 0:
                    continue
                if k >= start_meas:
                    taus = 0.5 * dt * (GL_X + 1)
                    Es = expm(M[None, :, :] * taus[:, None, None])
                    zs = Es @ z
                    vo = zs @ row
                    vx = vo + zs @ inj_row
                    ph = np.exp(-1j * self.w * (tk + taus))
                    wts = 0.5 * dt * GL_W
                    Y += np.sum(wts * vo * ph)
                    X += np.sum(wts * vx * ph)
                z = expm(M * dt) @ z
                tk += dt
        return z, duties, X, Y, guess


def settle(doc, periods=3000, se=None):
    c = Converter(doc, se=se)
    z = c.initial_state()
    z, duties, _, _, guess = c.run(z, periods)
    return c, z, duties, guess


def loop_gain(doc, z_ss, freq, cycles, settle_periods, amp, guess):
    """T(j2πf) = −Y/X over `cycles` switching periods after `settle_periods`, started from the
    steady state z_ss at a clock edge (injection phase 0 there). Also returns the estimate from
    the window before, as a convergence check."""
    c = Converter(doc, inj_amp=amp, inj_freq=freq)
    z = z_ss.copy()
    z[c.iS], z[c.iCo] = 0.0, 1.0
    z, _, _, _, guess = c.run(z, settle_periods, t0=0.0, guess=guess)
    t0 = settle_periods * c.Ts
    z, _, X1, Y1, guess = c.run(z, cycles, t0=t0, window=cycles, guess=guess)
    z, _, X2, Y2, _ = c.run(z, cycles, t0=t0 + cycles * c.Ts, window=cycles, guess=guess)
    return -Y2 / X2, -Y1 / X1
