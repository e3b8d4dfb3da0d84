"""Reference for P3: a Python loop calling scipy linprog once per small l1 fit, on in-memory arrays.

usage: ref_batch_linprog.py BATCH_DIR OUT.json
Every fitNNNN.fit.yaml in BATCH_DIR (terms b0: 1, b1: x1, b2: x2, b3: x3; l1; one bounds line)
and its data/fitNNNN.csv are read first, untimed. The timed loop builds each primal LP
(min sum(r+ + r-) s.t. X b + r+ - r- = y, bounds on b) and solves it with method="highs".
Prints {"fits", "loop_s", "fits_per_s"} on stdout; OUT.json maps fit name -> objective.
"""
import glob
import json
import os
import re
import sys
import time

import numpy as np
from scipy.optimize import linprog

BOUNDS = re.compile(r"kind: bounds, on: \[([^\]]*)\], min: ([-0-9.e+]+), max: ([-0-9.e+]+)")
NAMES = ["b0", "b1", "b2", "b3"]

problems = []
for spec in sorted(glob.glob(os.path.join(sys.argv[1], "*.fit.yaml"))):
    name = os.path.basename(spec)[: -len(".fit.yaml")]
    text = open(spec, encoding="ascii").read()
    m = BOUNDS.search(text)
    on = [s.strip() for s in m.group(1).split(",")]
    box = [(float(m.group(2)), float(m.group(3))) if c in on else (None, None) for c in NAMES]
    data = np.loadtxt(os.path.join(sys.argv[1], "data", name + ".csv"), delimiter=",", skiprows=1)
    x = np.column_stack([np.ones(len(data)), data[:, 1:]])
    problems.append((name, x, data[:, 0], box))

objectives = {}
t0 = time.perf_counter()
for name, x, y, box in problems:
    n, p = x.shape
    eye = np.eye(n)
    a_eq = np.hstack([x, eye, -eye])
    c = np.concatenate([np.zeros(p), np.ones(2 * n)])
    res = linprog(c, A_eq=a_eq, b_eq=y, bounds=box + [(0.0, None)] * (2 * n), method="highs")
    objectives[name] = float(np.abs(y - x @ res.x[:p]).sum()) if res.status == 0 else None
loop_s = time.perf_counter() - t0
with open(sys.argv[2], "w", encoding="ascii") as f:
    json.dump(objectives, f)
print(json.dumps({"fits": len(problems), "loop_s": loop_s, "fits_per_s": len(problems) / loop_s}))
