#!/usr/bin/env python3
"""
DCM control-to-output reference from switching simulations (no averaged model involved).

Each case is a buck or boost with an ideal switch and a near-ideal diode, open loop, driven by
a PWM comparator (control voltage against a 0…1 V sawtooth at fsw, so duty = control voltage).
The control voltage is D + a·sin(2πft). After the start-up transient has died out, the output's
Fourier component at f over a whole number of periods of f (and of fsw) gives v̂/d̂ = V(f)/a:
magnitude (dB) and phase (degrees, the sine as 0°). One ngspice transient per frequency.

The same netlist without the sine gives the DC output voltage the engine is given.

Run:  python3 reference/dcm/generate.py      (writes netlists/ and out/cases.json beside it)
Tools: ngspice (Debian package), numpy. Versions are written into the output.
"""
import json
import math
import os
import subprocess
import sys
import tempfile

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))

# Invented, realistic light-load stages that run deep in DCM [checked by the script: K < Kcrit].
CASES = [
    {
        'name': 'buck-dcm',
        'topology': 'buck', 'vin': 12.0, 'duty': 0.2, 'l': 4.7e-6, 'c': 47e-6, 'esr': 0.01,
        'rLoad': 20.0, 'fsw': 100e3,
    },
    {
        'name': 'boost-dcm',
        'topology': 'boost', 'vin': 5.0, 'duty': 0.15, 'l': 4.7e-6, 'c': 22e-6, 'esr': 0.01,
        'rLoad': 100.0, 'fsw': 100e3,
    },
]
# Whole divisors of fsw (100 kHz) so one window holds whole periods of both f and fsw; up to fsw/10.
FREQS = [200.0, 500.0, 1e3, 2e3, 5e3, 10e3]
# Duty perturbation. The switch network's currents are exactly quadratic in d (i2 ∝ d²), so a
# larger sine only adds a 2f harmonic and a DC shift, not an error at f; 0.02 keeps the edge
# modulation (0.02·Ts = 200 ns) well above the time step.
AMPLITUDE = 0.02

SWITCH = '.model SWM SW(VT=0 VH=0.001 RON=1m ROFF=10MEG)'
# Near-ideal diode: N = 0.05 gives about 40 mV at 1 A (the averaged model has none).
DIODE = '.model DI D(IS=1e-12 N=0.05 RS=1m)'


def netlist(case, v0, freq=None):
    ts = 1.0 / case['fsw']
    ctrl = f"SIN({case['duty']} {AMPLITUDE} {freq} 0 0 0)" if freq else f"DC {case['duty']}"
    if case['topology'] == 'buck':
        stage = [
            'S1 in sw ctl 0 SWM',
            'D1 0 sw DI',
            f"L1 sw out {case['l']} ic=0",
        ]
    else:
        stage = [
            f"L1 in sw {case['l']} ic=0",
            'S1 sw 0 ctl 0 SWM',
            'D1 sw out DI',
        ]
    return '\n'.join([
        f"* {case['name']}: open-loop switching {case['topology']} in DCM" + (f', duty sine at {freq} Hz' if freq else ', DC'),
        f"Vin in 0 DC {case['vin']}",
        f'Vc vc 0 {ctrl}',
        # Sawtooth 0 → 1 V over one period: the comparator turns the switch on while vc > ramp.
        f'Vramp ramp 0 PULSE(0 1 0 {ts * 0.999:.9g} {ts * 0.001:.9g} 0 {ts:.9g})',
        'Ectl ctl 0 vc ramp 1',
        *stage,
        f"C1 out cx {case['c']} ic={v0}",
        f"Rc cx 0 {case['esr']}",
        f"RL out 0 {case['rLoad']}",
        SWITCH,
        DIODE,
        '.end',
    ])


def run(netlist_text, tstop, tstep, name):
    with tempfile.TemporaryDirectory() as tmp:
        cir = os.path.join(tmp, 'c.cir')
        data = os.path.join(tmp, 'out.txt')
        ctl = (
            '.control\n'
            f'tran {tstep:.6g} {tstop:.6g} 0 {tstep:.6g} uic\n'
            f'wrdata {data} v(out)\n'
            'quit\n'
            '.endc\n'
        )
        with open(cir, 'w') as fh:
            fh.write(netlist_text.replace('.end', ctl + '.end'))
        os.makedirs(os.path.join(HERE, 'netlists'), exist_ok=True)
        with open(os.path.join(HERE, 'netlists', name + '.cir'), 'w') as fh:
            fh.write(netlist_text.replace('.end', ctl.replace(data, 'out.txt') + '.end'))
        subprocess.run(['ngspice', '-b', cir], check=True, capture_output=True, timeout=1800)
        raw = np.loadtxt(data)
    t, v = raw[:, 0], raw[:, 1]
    # Keep one sample per time (ngspice may repeat a breakpoint).
    keep = np.concatenate(([True], np.diff(t) > 0))
    return t[keep], v[keep]


def settle_time(case, v_guess):
    # Several RC time constants of the output (the DCM pole is faster than 1/(R·C) for both).
    return 6 * case['rLoad'] * case['c']


def main():
    out = {
        'generator': 'reference/dcm/generate.py',
        'tools': {'python': sys.version.split()[0], 'numpy': np.__version__, 'ngspice': ngspice_version()},
        'amplitude': AMPLITUDE,
        'cases': [],
    }
    for case in CASES:
        ts = 1.0 / case['fsw']
        tstep = ts / 500  # 20 ns at 100 kHz: 1/10 of the edge modulation
        # DC operating point: a long run, the mean over the last 20 switching periods.
        t0 = settle_time(case, 0)
        v0_guess = case['vin'] * 0.5 if case['topology'] == 'buck' else case['vin'] * 2
        t, v = run(netlist(case, v0_guess), t0 + 20 * ts, tstep, f"{case['name']}.dc")
        win = t >= t0
        vdc = float(np.trapezoid(v[win], t[win]) / (t[win][-1] - t[win][0]))
        # Check DCM: K = 2L/(R·Ts) below Kcrit (buck 1 − D·… uses the CCM D; here only a sanity print).
        k = 2 * case['l'] / (case['rLoad'] * ts)
        rows = []
        for f in FREQS:
            periods = max(1, int(math.ceil(1e-3 * f)))  # at least one period and 1 ms of data
            window = periods / f
            # Started at the DC output voltage: only the sine's own transient, which decays at the
            # DCM pole (faster than 2/(R·C) for both), has to die out.
            t0 = 3 * case['rLoad'] * case['c']
            tstop = t0 + window
            t, v = run(netlist(case, vdc, f), tstop, tstep, f"{case['name']}.{int(f)}Hz")
            sel = t >= t0 - 1e-12
            tt, vv = t[sel], v[sel]
            # Fourier component at f over the window (whole periods of f and fsw): the sine's
            # phase reference is sin(2πft), so V = (2/T)∫v·e^(−j2πft) dt, and d = a·e^(−jπ/2).
            ph = np.exp(-2j * np.pi * f * tt)
            vf = 2 / window * np.trapezoid(vv * ph, tt)
            df = AMPLITUDE * np.exp(-1j * np.pi / 2)
            g = vf / df
            rows.append({'freqHz': f, 'magDb': 20 * math.log10(abs(g)), 'phaseDeg': math.degrees(math.atan2(g.imag, g.real))})
            print(case['name'], f, rows[-1], file=sys.stderr)
        out['cases'].append({**case, 'voutDc': vdc, 'iout': vdc / case['rLoad'], 'k': k, 'points': rows})
    os.makedirs(os.path.join(HERE, 'out'), exist_ok=True)
    with open(os.path.join(HERE, 'out', 'cases.json'), 'w') as fh:
        json.dump(out, fh, indent=1)
        fh.write('\n')


def ngspice_version():
    try:
        r = subprocess.run(['ngspice', '-v'], capture_output=True, text=True, timeout=30)
        return (r.stdout or r.stderr).strip().splitlines()[1].strip() if r.stdout else 'unknown'
    except Exception:  # noqa: BLE001 - the version string is informative only
        return 'unknown'


if __name__ == '__main__':
    main()
