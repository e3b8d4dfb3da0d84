"""Invented benchmark data, fixed seeds: a linear model plus noise, written as CSV.

l2 sets: y and 19 inputs, Gaussian noise. l1 sets: y and 9 inputs, heavy-tailed
(Student t, 2 degrees of freedom) noise. batch: many small l1 fits, each its own
spec and CSV. Files are written once (temp file + rename) and reused while their
name (which carries the size and seed) is unchanged.
"""
import os
import sys

import numpy as np

L2_INPUTS = 19
L1_INPUTS = 9
BATCH_INPUTS = 3
BATCH_ROWS = 50


def _write_csv(path, header, columns, fmt):
    tmp = path + ".tmp"
    with open(tmp, "w", encoding="ascii") as f:
        f.write(",".join(header) + "\n")
        np.savetxt(f, np.column_stack(columns), fmt=fmt, delimiter=",")
    os.replace(tmp, path)


def linear_set(folder, kind, rows, seed):
    """kind 'l2' (19 inputs, Gaussian noise) or 'l1' (9 inputs, t(2) noise). Returns the CSV path."""
    inputs = L2_INPUTS if kind == "l2" else L1_INPUTS
    path = os.path.join(folder, f"{kind}_{rows}x{inputs + 1}_s{seed}.csv")
    if os.path.exists(path):
        return path
    rng = np.random.default_rng(seed)
    x = rng.uniform(0.0, 10.0, size=(rows, inputs))
    beta = np.linspace(0.5, 2.5, inputs) * np.where(np.arange(inputs) % 2 == 0, 1.0, -1.0)
    noise = rng.normal(0.0, 1.0, rows) if kind == "l2" else rng.standard_t(2.0, rows)
    y = 3.0 + x @ beta + noise
    header = ["y"] + [f"x{j}" for j in range(1, inputs + 1)]
    _write_csv(path, header, [y] + [x[:, j] for j in range(inputs)], "%.6f")
    return path


BATCH_SPEC = """fitspec: 1
name: {name}
data: {{path: data/{name}.csv}}
model:
  response: y
  terms: {{b0: 1, b1: x1, b2: x2, b3: x3}}
loss: l1
constraints:
  - {{kind: bounds, on: [b1, b2], min: {lo}, max: {hi}}}
"""


def batch_set(folder, fits, seed):
    """fits small l1 specs with bounds on b1 and b2 (active in some fits). Returns the folder."""
    root = os.path.join(folder, f"batch_{fits}_s{seed}")
    done = os.path.join(root, ".complete")
    if os.path.exists(done):
        return root
    os.makedirs(os.path.join(root, "data"), exist_ok=True)
    rng = np.random.default_rng(seed)
    for k in range(1, fits + 1):
        name = f"fit{k:04d}"
        x = rng.uniform(0.0, 5.0, size=(BATCH_ROWS, BATCH_INPUTS))
        beta = np.array([0.8, 1.2, -0.6]) + rng.normal(0.0, 0.15, BATCH_INPUTS)
        y = 1.5 + x @ beta + rng.standard_t(2.0, BATCH_ROWS) * 0.2
        header = ["y", "x1", "x2", "x3"]
        _write_csv(os.path.join(root, "data", f"{name}.csv"), header, [y] + [x[:, j] for j in range(BATCH_INPUTS)], "%.6f")
        # The upper bound 1.0 cuts into b1's spread (true ~0.8) and b2's (true ~1.2): active in many fits.
        with open(os.path.join(root, f"{name}.fit.yaml"), "w", encoding="ascii") as f:
            f.write(BATCH_SPEC.format(name=name, lo=0, hi=1.0))
    open(done, "w", encoding="ascii").close()
    return root


if __name__ == "__main__":
    # gen_data.py FOLDER l2|l1 ROWS SEED   or   gen_data.py FOLDER batch FITS SEED
    folder, kind, count, seed = sys.argv[1], sys.argv[2], int(sys.argv[3]), int(sys.argv[4])
    os.makedirs(folder, exist_ok=True)
    print(batch_set(folder, count, seed) if kind == "batch" else linear_set(folder, kind, count, seed))
