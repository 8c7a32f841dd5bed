"""Reference counts for the work-precision benchmark (bench/work-precision.ts).

Runs SciPy's solve_ivp (RK45, DOP853, Radau, LSODA) on the six problems of
bench/work-precision-problems.json at rtol = 10^(-q/2), q = 4 … 26 (1e-2 … 1e-13), with
atol = 1e-3·rtol·(the state's largest size), and records for each run every evaluation of
the right-hand side (counted by a wrapper: Jacobian differencing and dense-output stages
included) and the largest error against the closed form on a 2001-point grid, relative to
the state's largest size (the same measure the TypeScript bench uses). Values on the grid
come from each solver's own dense output (dense_output=True).

On the stiff problem the explicit methods (RK45, DOP853) are held by stability, not by the
tolerance (about 200 000 evaluations at every rtol), so they run at every fourth rtol only.

Run once (python3 with numpy and scipy):  python3 bench/scipy-reference.py
It writes bench/scipy-reference.json, which the bench reads; CI does not need Python. The
file is written after each method, and a method already in it is not run again (delete the
file to measure afresh).
"""
import json
import math
import os
import sys

import numpy as np
import scipy
from scipy.integrate import solve_ivp
from scipy.special import lambertw

HERE = os.path.dirname(os.path.abspath(__file__))
P = json.load(open(os.path.join(HERE, 'work-precision-problems.json')))
HOUR = P['hour']
METHODS = ['RK45', 'DOP853', 'Radau', 'LSODA']
GRID = 2001


def problems():
    c = P['cooling']
    yield dict(name='Newton cooling', t1=c['hours'] * HOUR, y0=[c['T0']],
               f=lambda t, y: [-c['k'] * (y[0] - c['ambient'])],
               exact=lambda t: np.array([c['ambient'] + (c['T0'] - c['ambient']) * np.exp(-c['k'] * t)]))
    g = P['logistic']
    yield dict(name='logistic growth', t1=g['hours'] * HOUR, y0=[g['N0']],
               f=lambda t, y: [g['r'] * y[0] * (1 - y[0] / g['K'])],
               exact=lambda t: np.array([g['K'] / (1 + (g['K'] / g['N0'] - 1) * np.exp(-g['r'] * t))]))
    b = P['bateman']
    amp = b['dose'] * b['ka'] / (b['V'] * (b['ka'] - b['k']))
    yield dict(name='oral absorption (Bateman)', t1=b['hours'] * HOUR, y0=[b['dose'], 0.0],
               f=lambda t, y: [-b['ka'] * y[0], b['ka'] * y[0] / b['V'] - b['k'] * y[1]],
               exact=lambda t: np.array([b['dose'] * np.exp(-b['ka'] * t), amp * (np.exp(-b['k'] * t) - np.exp(-b['ka'] * t))]))
    d = P['doses']
    tau = d['every_hours'] * HOUR
    c0 = d['dose'] / d['V']

    def doses_exact(t):
        t = np.asarray(t, dtype=float)
        total = np.zeros_like(t)
        for i in range(d['count']):
            s = t - i * tau
            total += np.where(s >= 0, c0 * np.exp(-d['k'] * np.maximum(s, 0)), 0.0)
        return np.array([total])
    yield dict(name='6 IV doses', t1=d['count'] * tau, y0=[c0], pieces=[i * tau for i in range(d['count'] + 1)], jump=c0,
               f=lambda t, y: [-d['k'] * y[0]], exact=doses_exact)
    s = P['forced']
    lam = s['lambda']

    def forced_exact(t):
        slow = lambda u: (lam * lam * np.cos(u) + lam * np.sin(u)) / (lam * lam + 1)
        return np.array([slow(t) - slow(0) * np.exp(-lam * t)])
    yield dict(name="stiff forced y' = -1e4 (y - cos t)", t1=s['t1'], y0=[0.0], size=[1.0],
               f=lambda t, y: [-lam * (y[0] - math.cos(t))], exact=forced_exact)
    m = P['michaelis']

    def mm_exact(t):
        x = (m['C0'] / m['Km']) * np.exp((m['C0'] - m['Vmax'] * np.asarray(t, dtype=float)) / m['Km'])
        return np.array([m['Km'] * np.real(lambertw(x))])
    yield dict(name='Michaelis–Menten', t1=m['hours'] * HOUR, y0=[m['C0']],
               f=lambda t, y: [-m['Vmax'] * y[0] / (m['Km'] + y[0])], exact=mm_exact)


def run(p, method, rtol):
    grid = np.linspace(0, p['t1'], GRID)
    exact = p['exact'](grid)
    size = np.array(p.get('size') or np.max(np.abs(exact), axis=1))
    atol = 1e-3 * rtol * size
    count = [0]

    def f(t, y):
        count[0] += 1
        return p['f'](t, y)
    cuts = p.get('pieces') or [0.0, p['t1']]
    y = np.array(p['y0'], dtype=float)
    got = np.full_like(exact, np.nan)
    for i in range(len(cuts) - 1):
        if i > 0:
            y = y + np.array([p['jump']])
        sol = solve_ivp(f, (cuts[i], cuts[i + 1]), y, method=method, rtol=rtol, atol=atol, dense_output=True)
        if sol.status != 0:
            return None
        last = i == len(cuts) - 2
        inside = (grid >= cuts[i]) & ((grid <= cuts[i + 1]) if last else (grid < cuts[i + 1]))
        got[:, inside] = sol.sol(grid[inside])
        y = sol.y[:, -1]
    err = float(np.max(np.abs(got - exact) / size[:, None]))
    return {'rtol': rtol, 'evaluations': count[0], 'error': err}


def main():
    path = os.path.join(HERE, 'scipy-reference.json')
    out = {'scipy': scipy.__version__, 'numpy': np.__version__, 'python': sys.version.split()[0],
           'grid': GRID, 'problems': {}}
    if os.path.exists(path):
        old = json.load(open(path))
        if old.get('scipy') == scipy.__version__:
            out['problems'] = old.get('problems', {})
    for p in problems():
        entry = out['problems'].setdefault(p['name'], {})
        for method in METHODS:
            if method in entry:
                continue
            held = 'size' in p and method in ('RK45', 'DOP853')
            runs = []
            for q in range(4, 27, 4 if held else 1):
                r = run(p, method, 10 ** (-q / 2))
                if r:
                    runs.append(r)
            entry[method] = runs
            print(p['name'], method, [(r['evaluations'], '%.1e' % r['error']) for r in runs[::2]], file=sys.stderr)
            with open(path, 'w') as fh:
                json.dump(out, fh, indent=1)
                fh.write('\n')


if __name__ == '__main__':
    main()
