"""Reference for P1: numpy loadtxt, then lstsq with a constant column, coefficients to a JSON file.

usage: ref_lstsq.py DATA.csv OUT.json   (prints {"read_s", "fit_s"} on stdout)
"""
import json
import sys
import time

import numpy as np

t0 = time.perf_counter()
data = np.loadtxt(sys.argv[1], delimiter=",", skiprows=1)
t1 = time.perf_counter()
y = data[:, 0]
x = np.empty_like(data)
x[:, 0] = 1.0
x[:, 1:] = data[:, 1:]
beta, _, _, _ = np.linalg.lstsq(x, y, rcond=None)
t2 = time.perf_counter()
names = ["b0"] + [f"b{j}" for j in range(1, data.shape[1])]
with open(sys.argv[2], "w", encoding="ascii") as f:
    json.dump({"coefficients": dict(zip(names, beta.tolist()))}, f)
print(json.dumps({"read_s": t1 - t0, "fit_s": t2 - t1}))
