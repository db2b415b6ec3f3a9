#!/usr/bin/python3
"""Reference simulations for rigcal's tests, computed independently with scipy.

    /usr/bin/python3 scripts/scipy_reference.py        (Debian package python3-scipy)

For each reference case in test/fixtures/models/ (ref-motor, ref-thermal, ref-shaker, two-mass)
this script re-states the model's equations by hand (it does not read the YAML), reads the logged
inputs from the CSV files, integrates with scipy.integrate.solve_ivp (Radau, rtol 1e-11, tiny atol),
restarting at every jump of a hold input (shifted by its delay) and at every sample of a linear input
(its kinks), and writes test/fixtures/scipy/<case>.json with the outputs and states at the sample
times in the model's units. It also records, per output, the sum of squared differences between the
logged (noisy) values and the reference: the tests compare rigcal's error against that noise.

The tests read the JSON files and run without Python.
"""
import csv
import json
import math
import os
import sys

import numpy as np
import scipy
from scipy.integrate import solve_ivp

ROOT = os.path.join(os.path.dirname(os.path.abspath(__file__)), '..')
MODELS = os.path.join(ROOT, 'test', 'fixtures', 'models')
OUT = os.path.join(ROOT, 'test', 'fixtures', 'scipy')
RTOL = 1e-11
RPM = 2 * math.pi / 60  # rad/s per rpm (exact by definition of the revolution)
KELVIN_AT_0C = 273.15


def read_csv(name):
    with open(os.path.join(MODELS, name), newline='') as f:
        rows = [r for r in csv.reader(f) if r and not r[0].startswith('#')]
    header, body = rows[0], rows[1:]
    cols = {}
    for j, h in enumerate(header):
        cols[h] = np.array([float(r[j]) if r[j].strip() not in ('', 'NaN', 'nan') else np.nan for r in body])
    return cols


class Hold:
    """Zero-order hold of logged samples, delayed by `delay`; the first value before the log."""

    def __init__(self, t, v, delay=0.0):
        self.t, self.v, self.delay = t, v, delay

    def at(self, t):
        s = t - self.delay
        k = np.searchsorted(self.t, s, side='right') - 1
        return self.v[max(k, 0)]

    def jumps(self):
        return [self.t[k] + self.delay for k in range(1, len(self.t)) if self.v[k] != self.v[k - 1]]


class Linear:
    def __init__(self, t, v):
        self.t, self.v = t, v

    def at(self, t):
        return float(np.interp(t, self.t, self.v))

    def jumps(self):
        return list(self.t)


def integrate(rhs, x0, start, times, breakpoints, atol):
    """States at `times`, integrating segment by segment between breakpoints (Radau).

    Each segment is solved once with its end point appended to t_eval, so the state carried into the
    next segment is the solution at exactly the breakpoint."""
    end = times[-1]
    stops = sorted(set([start, end] + [b for b in breakpoints if start < b < end]))
    out = np.full((len(x0), len(times)), np.nan)
    x = np.array(x0, dtype=float)
    if times[0] == start:
        out[:, 0] = x
    for a, b in zip(stops[:-1], stops[1:]):
        mid = 0.5 * (a + b)
        inside = np.where((times > a) & (times <= b))[0]
        teval = list(times[inside])
        if not teval or teval[-1] != b:
            teval.append(b)
        sol = solve_ivp(lambda t, y: rhs(t, y, mid), (a, b), x, method='Radau', rtol=RTOL, atol=atol,
                        t_eval=teval)
        if not sol.success:
            raise RuntimeError(sol.message)
        out[:, inside] = sol.y[:, :len(inside)]
        x = sol.y[:, -1]
    return out


def ssq(measured, reference):
    ok = ~np.isnan(measured)
    return float(np.sum((measured[ok] - reference[ok]) ** 2)), int(np.sum(ok))


def experiment_record(name, time_column, outputs, states, measured, set_args=None):
    rec = {'name': name, 'time': time_column.tolist(), 'outputs': {}, 'states': {}, 'noise': {}}
    if set_args:
        rec['set'] = set_args
    for k, v in outputs.items():
        rec['outputs'][k] = v.tolist()
        s, n = ssq(measured[k], v)
        rec['noise'][k] = {'ssq': s, 'count': n, 'rms': math.sqrt(s / n)}
    for k, v in states.items():
        rec['states'][k] = v.tolist()
    return rec


# --- ref-motor: hold V, rpm, set J, start before the first sample ---------------------------------
def motor_case():
    base = dict(R=1.9, J=3.1e-3, L=1.9e-3, K=0.08, b=2.0e-4, Tc=0.012, ws=0.5)
    exps = []
    for name, fname, J, start in (('steps', 'ref-motor-steps.csv', 3.1e-3, None), ('disc', 'ref-motor-disc.csv', 4.6e-3, 0.0)):
        p = dict(base, J=J)
        d = read_csv(fname)
        t = d['t']
        V = Hold(t, d['volts'])

        def rhs(tt, x, mid, p=p, V=V):
            v = V.at(mid)
            return [(v - p['R'] * x[0] - p['K'] * x[1]) / p['L'],
                    (p['K'] * x[0] - p['b'] * x[1] - p['Tc'] * math.tanh(x[1] / p['ws'])) / p['J']]

        s0 = t[0] if start is None else start
        x = integrate(rhs, [0.0, 0.0], s0, t, V.jumps(), atol=[1e-13, 1e-11])
        exps.append(experiment_record(name, t, {'current': x[0], 'speed': x[1]}, {'i': x[0], 'w': x[1]},
                                      {'current': d['amps'], 'speed': d['rpm'] * RPM}))
    return {'model': 'ref-motor.yaml', 'experiments': exps}


# --- ref-thermal: hold P delayed by lag, degC, a log in minutes ---------------------------------
def thermal_case():
    h, C, lag = 1.6, 950.0, 4.3
    exps = []
    for name, fname, tcol, factor, T0 in (('steps', 'ref-thermal-steps.csv', 't', 1.0, 295.4),
                                          ('minutes', 'ref-thermal-minutes.csv', 'minutes', 60.0, 300.0)):
        d = read_csv(fname)
        t = d[tcol] * factor  # into the model's time unit, s (1 min = 60 s exactly)
        P = Hold(t, d['heater_W'], lag)
        Ta = Linear(t, d['ambient_C'] + KELVIN_AT_0C)

        def rhs(tt, x, mid, P=P, Ta=Ta):
            return [(P.at(mid) - h * (x[0] - Ta.at(tt))) / C]

        x = integrate(rhs, [T0], t[0], t, P.jumps() + Ta.jumps(), atol=[1e-10])
        exps.append(experiment_record(name, d[tcol], {'temperature': x[0]}, {'T': x[0]},
                                      {'temperature': d['block_C'] + KELVIN_AT_0C}))
    return {'model': 'ref-thermal.yaml', 'experiments': exps}


# --- ref-shaker: linear input, mm, per-experiment offset, initial override, window ---------------
def shaker_case():
    m, k, c = 2.5, 4000.0, 10.0
    exps = []
    cases = (('chirp', 'ref-shaker-chirp.csv', None, 0.0, 0.0005, ['offset@chirp=0.0005']),
             ('random', 'ref-shaker-random.csv', (0.5, 4.5), 0.002, 0.0, None))
    for name, fname, window, r0, offset, set_args in cases:
        d = read_csv(fname)
        t, a, lvdt = d['t'], d['table_acc'], d['lvdt_mm'] / 1000.0
        if window:
            keep = (t >= window[0]) & (t <= window[1])
            t, a, lvdt = t[keep], a[keep], lvdt[keep]
        A = Linear(t, a)

        def rhs(tt, x, mid, A=A):
            return [x[1], -(k * x[0] + c * x[1]) / m - A.at(tt)]

        x = integrate(rhs, [r0, 0.0], t[0], t, A.jumps(), atol=[1e-14, 1e-12])
        exps.append(experiment_record(name, t, {'lvdt': x[0] + offset}, {'r': x[0], 'v': x[1]},
                                      {'lvdt': lvdt}, set_args))
    return {'model': 'ref-shaker.yaml', 'experiments': exps}


# --- two-mass: 4-state linear chain, hold force, 10,000 samples ----------------------------------
def two_mass_case():
    m1, m2, k1, k2, c1, c2 = 1.0, 0.5, 200.0, 100.0, 0.5, 0.3
    d = read_csv('two-mass-10k.csv')
    t = d['t']
    F = Hold(t, d['force'])

    def rhs(tt, x, mid):
        coupling = k2 * (x[2] - x[0]) + c2 * (x[3] - x[1])
        return [x[1], (F.at(mid) - k1 * x[0] - c1 * x[1] + coupling) / m1, x[3], -coupling / m2]

    x = integrate(rhs, [0.0] * 4, t[0], t, F.jumps(), atol=[1e-15, 1e-13, 1e-15, 1e-13])
    rec = experiment_record('prbs', t, {'x1': x[0], 'x2': x[2]}, {'x1': x[0], 'v1': x[1], 'x2': x[2], 'v2': x[3]},
                            {'x1': d['x1'], 'x2': d['x2']})
    return {'model': 'two-mass.yaml', 'experiments': [rec]}


def main():
    os.makedirs(OUT, exist_ok=True)
    cases = {'ref-motor': motor_case, 'ref-thermal': thermal_case, 'ref-shaker': shaker_case, 'two-mass': two_mass_case}
    only = sys.argv[1:] or list(cases)
    for name in only:
        data = cases[name]()
        data.update({
            'source': 'scipy.integrate.solve_ivp (Radau), restarted at every input jump and kink',
            'scipy': scipy.__version__,
            'numpy': np.__version__,
            'rtol': RTOL,
            'command': '/usr/bin/python3 scripts/scipy_reference.py',
        })
        path = os.path.join(OUT, name + '.json')
        with open(path, 'w') as f:
            json.dump(data, f, separators=(',', ':'))
        for e in data['experiments']:
            noise = ', '.join(f"{k} rms {v['rms']:.4g} over {v['count']}" for k, v in e['noise'].items())
            print(f"{name}/{e['name']}: {len(e['time'])} samples; logged minus reference: {noise}")


if __name__ == '__main__':
    main()
