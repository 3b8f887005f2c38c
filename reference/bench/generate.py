"""Writes bench-data fixtures (analyzer-style CSV/TSV files of known analytic loops) and the margins scipy finds on
the exact functions, for tests/unit/bench. Run: python3 reference/bench/generate.py

The loops are written from their factored forms (no project code is imported). Crossings are refined with
scipy.optimize.brentq on the exact function (|T| in dB, and the unwrapped phase + 180 - k*360), after bracketing on a
dense grid (2000 points/decade) whose phase is unwrapped with numpy.unwrap.
"""
import json
import math
import os
import sys

import numpy as np
import scipy
from scipy import optimize, signal

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.normpath(os.path.join(HERE, '..', '..', 'tests', 'unit', 'bench', 'fixtures'))
TWO_PI = 2 * math.pi


def poly_from_factors(gain, zeros_hz=(), pairs=(), integrators=0):
    """Descending polynomial gain * prod(1 + s/wz) * prod(1 + s/(q w0) + s^2/w0^2) * s^integrators."""
    p = np.array([gain], dtype=float)
    for f in zeros_hz:
        w = TWO_PI * f
        p = np.polymul(p, [1 / w, 1])  # f < 0 gives a RHP factor (1 - s/|w|)
    for f0, q in pairs:
        w0 = TWO_PI * f0
        p = np.polymul(p, [1 / w0 ** 2, 1 / (q * w0), 1])
    for _ in range(integrators):
        p = np.polymul(p, [1, 0])
    return p


class Loop:
    def __init__(self, num, den, delay_s=0.0):
        self.sys = signal.TransferFunction(num, den)
        self.delay_s = delay_s

    def h(self, f):
        f = np.atleast_1d(np.asarray(f, dtype=float))
        _, h = signal.freqresp(self.sys, TWO_PI * f)
        return h * np.exp(-1j * TWO_PI * f * self.delay_s)

    def mag_db(self, f):
        return 20 * np.log10(np.abs(self.h(f)))


def dense_phase(loop, f_lo, f_hi):
    """Unwrapped phase on a dense grid, anchored at its first point in (-270, 90]."""
    f = np.logspace(math.log10(f_lo), math.log10(f_hi), int(2000 * math.log10(f_hi / f_lo)) + 1)
    ph = np.degrees(np.unwrap(np.angle(loop.h(f))))
    ph -= 360 * math.ceil((ph[0] - 90) / 360)
    return f, ph


def exact_margins(loop, f_lo, f_hi):
    f, ph = dense_phase(loop, f_lo, f_hi)
    mag = loop.mag_db(f)

    def phase_at(x):
        # the exact phase, placed on the branch of the dense unwrapped curve
        i = min(max(np.searchsorted(f, x), 1), len(f) - 1)
        raw = math.degrees(np.angle(loop.h(x)[0]))
        return raw + 360 * round((ph[i] - raw) / 360)

    crossovers = []
    for i in np.nonzero(np.sign(mag[:-1]) != np.sign(mag[1:]))[0]:
        fc = optimize.brentq(lambda x: loop.mag_db(x)[0], f[i], f[i + 1], xtol=1e-12, rtol=1e-14)
        pm = 180 + phase_at(fc)
        pm = pm - 360 * math.ceil((pm - 180) / 360)
        crossovers.append({'freqHz': fc, 'phaseMarginDeg': pm})
    phase_crossovers = []
    for k in range(-3, 3):
        level = -180 + 360 * k
        d = ph - level
        for i in np.nonzero(np.sign(d[:-1]) != np.sign(d[1:]))[0]:
            fx = optimize.brentq(lambda x: phase_at(x) - level, f[i], f[i + 1], xtol=1e-12, rtol=1e-14)
            phase_crossovers.append({'freqHz': fx, 'gainMarginDb': -loop.mag_db(fx)[0]})
    phase_crossovers.sort(key=lambda c: c['freqHz'])
    gov = min(crossovers, key=lambda c: c['phaseMarginDeg']) if crossovers else None
    pos = [c for c in phase_crossovers if c['gainMarginDb'] > 0]
    gm = min(pos, key=lambda c: c['gainMarginDb']) if pos else None
    return {
        'crossoverHz': gov['freqHz'] if gov else None,
        'phaseMarginDeg': gov['phaseMarginDeg'] if gov else None,
        'gainMarginDb': gm['gainMarginDb'] if gm else None,
        'phaseCrossoverHz': gm['freqHz'] if gm else None,
        'crossovers': crossovers,
        'phaseCrossovers': phase_crossovers,
    }


def sweep(f_lo, f_hi, per_decade):
    n = int(round(per_decade * math.log10(f_hi / f_lo))) + 1
    return np.logspace(math.log10(f_lo), math.log10(f_hi), n)


def wrap180(ph):
    return ph - 360 * np.ceil((ph - 180) / 360)


def fmt(x, digits):
    return f'{x:.{digits}g}'


# --- the loops -------------------------------------------------------------------------------------------------------

# Buck, voltage mode: Gvd = 12 V (1 + s/w_esr) / (1 + s/(Q w0) + s^2/w0^2), f0 = 8 kHz, Q = 3, ESR zero 90 kHz;
# Fm = 1/1.5 V; Type III Gc = wI/s (1 + s/wz)^2 / ((1 + s/wp1)(1 + s/wp2)), fI = 2.2 kHz, zeros 7 kHz, poles
# 90 kHz and 250 kHz; a 150 ns loop delay so that the phase reaches -180 deg.
BUCK_GVD_NUM = poly_from_factors(12.0, [90e3])
BUCK_GVD_DEN = poly_from_factors(1.0, [], [(8e3, 3.0)])
BUCK_GC_NUM = poly_from_factors(TWO_PI * 2.2e3, [7e3, 7e3])
BUCK_GC_DEN = poly_from_factors(1.0, [90e3, 250e3], [], integrators=1)
BUCK_LOOP = Loop(np.polymul(BUCK_GC_NUM, BUCK_GVD_NUM) / 1.5, np.polymul(BUCK_GC_DEN, BUCK_GVD_DEN), delay_s=150e-9)

# Boost with RHP zero: Gvd = 30 V (1 + s/w_esr)(1 - s/w_rhp) / (1 + s/(Q w0) + s^2/w0^2), f0 = 1.2 kHz, Q = 2.5,
# RHP zero 18 kHz, ESR zero 40 kHz; Fm = 1/2 V; Type II Gc = wI/s (1 + s/wz)/(1 + s/wp), fI = 8 Hz, zero 300 Hz,
# pole 12 kHz. The LC peak lifts |T| through 0 dB three times (a useful multi-crossing case).
BOOST_NUM = np.polymul(poly_from_factors(30.0, [40e3, -18e3]), poly_from_factors(TWO_PI * 8.0, [300.0]))
BOOST_DEN = np.polymul(poly_from_factors(1.0, [], [(1.2e3, 2.5)]), poly_from_factors(1.0, [12e3], [], integrators=1))
BOOST_LOOP = Loop(BOOST_NUM / 2.0, BOOST_DEN)

# Plant for the deviation check: the nominal buck Gvd above against a "measured" one whose inductance is 10 % high
# (f0 / sqrt(1.1), Q / sqrt(1.1) for this series-damped form; the ESR zero does not move).
PLANT_MEASURED = Loop(BUCK_GVD_NUM, poly_from_factors(1.0, [], [(8e3 / math.sqrt(1.1), 3.0 / math.sqrt(1.1))]))
PLANT_MODEL = Loop(BUCK_GVD_NUM, BUCK_GVD_DEN)


def write(name, text):
    with open(os.path.join(OUT, name), 'w', newline='') as fh:
        fh.write(text)


def main():
    global OUT
    if '--out' in sys.argv:  # regeneration check writes elsewhere
        OUT = sys.argv[sys.argv.index('--out') + 1]
    os.makedirs(OUT, exist_ok=True)
    expected = {
        'generator': 'reference/bench/generate.py',
        'python': sys.version.split()[0],
        'numpy': np.__version__,
        'scipy': scipy.__version__,
        'files': {},
    }

    # 1. Buck loop, comma-separated, Hz / dB / degrees wrapped into (-180, 180], with an instrument preamble.
    f = sweep(100, 500e3, 50)
    mag = BUCK_LOOP.mag_db(f)
    ph = wrap180(np.degrees(np.angle(BUCK_LOOP.h(f))))
    lines = ['Analyzer export', 'Date,2026-11-30', 'Injection,across 10 R in series with the feedback divider',
             'Level,20 mV', '', 'Frequency (Hz),Gain (dB),Phase (deg),Coherence']
    lines += [f'{fmt(a, 7)},{b:.4f},{c:.3f},0.999' for a, b, c in zip(f, mag, ph)]
    write('buck-type3-loop.csv', '\r\n'.join(lines) + '\r\n')
    margins = exact_margins(BUCK_LOOP, 100, 500e3)
    expected['files']['buck-type3-loop.csv'] = {'points': len(f), **margins}

    # 2. The same loop, European style: semicolon, decimal comma, kHz, linear magnitude, radians, high-to-low sweep.
    lin = np.abs(BUCK_LOOP.h(f))
    rad = np.radians(ph)
    lines = ['Freq [kHz];|T| [V/V];Phase [rad]']
    rows = [f'{fmt(a / 1e3, 7)};{fmt(b, 7)};{c:.6f}'.replace('.', ',') for a, b, c in zip(f, lin, rad)]
    lines += rows[::-1]
    write('buck-type3-loop-eu.csv', '\n'.join(lines) + '\n')
    expected['files']['buck-type3-loop-eu.csv'] = {'points': len(f), **margins}

    # 3. Boost loop, tab-separated, degrees already unwrapped (continuous), 100 points per decade.
    f = sweep(10, 100e3, 100)
    fd, phd = dense_phase(BOOST_LOOP, 10, 100e3)
    ph = np.interp(np.log(f), np.log(fd), phd)
    # correct the interpolated branch to the exact value at each point
    raw = np.degrees(np.angle(BOOST_LOOP.h(f)))
    ph = raw + 360 * np.round((ph - raw) / 360)
    mag = BOOST_LOOP.mag_db(f)
    lines = ['# bench run 14, Vin = 12 V, Iout = 0.5 A', 'f/Hz\tMagnitude/dB\tPhase/°']
    lines += [f'{fmt(a, 7)}\t{b:.4f}\t{c:.3f}' for a, b, c in zip(f, mag, ph)]
    write('boost-type2-loop.tsv', '\n'.join(lines) + '\n')
    expected['files']['boost-type2-loop.tsv'] = {'points': len(f), **exact_margins(BOOST_LOOP, 10, 100e3)}

    # 4. Plant measured with L 10 % high; the deviation against the nominal model at the file's points.
    f = sweep(200, 200e3, 30)
    mag_m = PLANT_MEASURED.mag_db(f)
    ph_m = np.degrees(np.angle(PLANT_MEASURED.h(f)))
    lines = ['Frequency (Hz),Gain (dB),Phase (deg)']
    lines += [f'{fmt(a, 7)},{b:.4f},{c:.3f}' for a, b, c in zip(f, mag_m, ph_m)]
    write('buck-plant-l-high.csv', '\n'.join(lines) + '\n')
    # deviation from the rounded file values, as the parser will see them
    fr = np.array([float(fmt(a, 7)) for a in f])
    mr = np.array([round(b, 4) for b in mag_m])
    pr = np.array([round(c, 3) for c in ph_m])
    dm = mr - PLANT_MODEL.mag_db(fr)
    dp = pr - np.degrees(np.angle(PLANT_MODEL.h(fr)))
    dp = dp - 360 * np.ceil((dp - 180) / 360)
    band = (fr >= 500) & (fr <= 100e3)
    expected['files']['buck-plant-l-high.csv'] = {
        'points': len(f),
        'model': {'gain': 12.0, 'esrZeroHz': 90e3, 'f0Hz': 8e3, 'q': 3.0},
        'band': {'startHz': 500, 'stopHz': 100e3, 'points': int(band.sum())},
        'magDb': {'maxAbs': float(np.max(np.abs(dm[band]))), 'rms': float(np.sqrt(np.mean(dm[band] ** 2))),
                  'atHz': float(fr[band][np.argmax(np.abs(dm[band]))])},
        'phaseDeg': {'maxAbs': float(np.max(np.abs(dp[band]))), 'rms': float(np.sqrt(np.mean(dp[band] ** 2))),
                     'atHz': float(fr[band][np.argmax(np.abs(dp[band]))])},
    }

    with open(os.path.join(OUT, 'expected.json'), 'w') as fh:
        json.dump(expected, fh, indent=2)
        fh.write('\n')
    for name, e in expected['files'].items():
        print(name, {k: v for k, v in e.items() if k in ('crossoverHz', 'phaseMarginDeg', 'gainMarginDb', 'magDb')})


if __name__ == '__main__':
    main()
