"""Reference for P2: an l1 (median) fit with scipy linprog(method="highs-ipm").

usage: ref_l1_linprog.py DATA.csv OUT.json dual|primal
dual:   max y'u  s.t. X'u = 0, -1 <= u <= 1 (p equality rows, n bounded columns); the
        coefficients are the equality rows' prices.
primal: min sum(r+ + r-)  s.t. X b + r+ - r- = y, r+, r- >= 0 (n rows).
The objective reported is sum |y - X b| recomputed at the returned coefficients.
Prints {"read_s", "fit_s", "status"} on stdout.
"""
import json
import sys
import time

import numpy as np
import scipy.sparse as sp
from scipy.optimize import linprog

t0 = time.perf_counter()
data = np.loadtxt(sys.argv[1], delimiter=",", skiprows=1)
t1 = time.perf_counter()
form = sys.argv[3]
y = data[:, 0]
n, p = data.shape
x = np.empty_like(data)
x[:, 0] = 1.0
x[:, 1:] = data[:, 1:]
if form == "dual":
    res = linprog(-y, A_eq=sp.csc_matrix(x.T), b_eq=np.zeros(p), bounds=(-1.0, 1.0), method="highs-ipm")
    # The sign of the prices depends on the convention: take the one that fits.
    prices = np.asarray(res.eqlin.marginals) if res.status == 0 else np.full(p, np.nan)
    candidates = [prices, -prices]
    beta = min(candidates, key=lambda b: np.abs(y - x @ b).sum())
else:
    eye = sp.identity(n, format="csc")
    a_eq = sp.hstack([sp.csc_matrix(x), eye, -eye], format="csc")
    c = np.concatenate([np.zeros(p), np.ones(2 * n)])
    bounds = [(None, None)] * p + [(0.0, None)] * (2 * n)
    res = linprog(c, A_eq=a_eq, b_eq=y, bounds=bounds, method="highs-ipm")
    beta = res.x[:p] if res.status == 0 else np.full(p, np.nan)
t2 = time.perf_counter()
objective = float(np.abs(y - x @ beta).sum())
names = ["b0"] + [f"b{j}" for j in range(1, p)]
with open(sys.argv[2], "w", encoding="ascii") as f:
    json.dump({"objective": objective, "lp_objective": float(abs(res.fun)) if res.status == 0 else None,
               "coefficients": dict(zip(names, beta.tolist()))}, f)
print(json.dumps({"read_s": t1 - t0, "fit_s": t2 - t1, "status": int(res.status)}))
