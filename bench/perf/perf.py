"""FitSpec against reference implementations: whole-process wall time, CPU time and peak RSS.

Run through bench/perf/run.sh (it installs the references from Debian and builds FitSpec), or:
  /usr/bin/python3 bench/perf/perf.py --fitspec BIN_DIR/fitspec --stages BENCH_DIR/FitSpec.Bench [--work DIR] [--quick]

Cases (see PERFORMANCE.md): P1 l2 fit end to end against numpy; P2 l1 (median) fit against R quantreg
and scipy HiGHS; P3 a batch of 1000 small l1 fits against a scipy loop; P4 peak memory of P1 against the
design matrix bytes; P1 and P2 at several row counts. Every comparison checks that the answers agree.
Each measured command runs under /usr/bin/time -v (peak RSS, CPU seconds) with a wall clock around it,
with a timeout, several times; medians and minima are reported. Data files are read once before the
timed runs, so every tool reads them from the page cache.
"""
import argparse
import json
import os
import platform
import shutil
import signal
import statistics
import subprocess
import sys
import time

HERE = os.path.dirname(os.path.abspath(__file__))
sys.dont_write_bytecode = True  # no __pycache__ inside the repository
sys.path.insert(0, HERE)
import gen_data  # noqa: E402

L2_TOL = 1e-6  # coefficients, relative, per coefficient
L1_TOL = 1e-7  # objective, relative
DESIGN_BYTES_P1 = 10**6 * 20 * 8


# ---------------------------------------------------------------- running and measuring

class Run:
    def __init__(self, wall, cpu, rss_kb, stdout, stderr, rc, timed_out, others):
        self.wall, self.cpu, self.rss_kb = wall, cpu, rss_kb
        self.stdout, self.stderr, self.rc, self.timed_out = stdout, stderr, rc, timed_out
        self.others = others  # share of the machine's CPU used by other processes during the run

    @property
    def ok(self):
        return self.rc == 0 and not self.timed_out


def busy_ticks():
    """CPU ticks the whole machine spent busy (all but idle and iowait), from /proc/stat."""
    fields = [int(x) for x in open("/proc/stat", encoding="ascii").readline().split()[1:]]
    return sum(fields) - fields[3] - fields[4]


def measure(cmd, timeout, work, cwd=None, env=None, nice=0):
    """Runs cmd under /usr/bin/time -v; returns wall (perf_counter), CPU (user+sys), peak RSS, and how
    much of the machine other processes used meanwhile (this is a shared machine)."""
    stats = os.path.join(work, "time-v.txt")
    full = (["nice", "-n", str(nice)] if nice else []) + ["/usr/bin/time", "-v", "-o", stats] + cmd
    busy0 = busy_ticks()
    start = time.perf_counter()
    proc = subprocess.Popen(full, cwd=cwd, env=env, stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                            text=True, start_new_session=True)
    timed_out = False
    try:
        out, err = proc.communicate(timeout=timeout)
    except subprocess.TimeoutExpired:
        timed_out = True
        os.killpg(proc.pid, signal.SIGKILL)  # our own process group only
        out, err = proc.communicate()
    wall = time.perf_counter() - start
    busy = (busy_ticks() - busy0) / os.sysconf("SC_CLK_TCK")
    cpu, rss = float("nan"), 0
    if os.path.exists(stats):
        for line in open(stats, encoding="utf-8", errors="replace"):
            key, _, value = line.strip().partition(": ")
            if key in ("User time (seconds)", "System time (seconds)"):
                cpu = (0.0 if cpu != cpu else cpu) + float(value)
            elif key == "Maximum resident set size (kbytes)":
                rss = int(value)
        os.remove(stats)
    others = max(0.0, busy - (cpu if cpu == cpu else 0.0)) / (wall * os.cpu_count())
    return Run(wall, cpu, rss, out, err, proc.returncode, timed_out, others)


def repeat(label, make_cmd, reps, timeout, work, log, **kw):
    """Runs make_cmd(rep) reps times; returns the list of runs (stops at the first failure)."""
    runs = []
    for rep in range(reps):
        cmd, cwd = make_cmd(rep)
        load = os.getloadavg()[0]
        r = measure(cmd, timeout, work, cwd=cwd, **kw)
        r.load = load
        runs.append(r)
        log(f"  {label} rep {rep + 1}/{reps}: wall {r.wall:.3f} s, cpu {r.cpu:.3f} s, rss {r.rss_kb / 1024:.0f} MiB,"
            f" rc {r.rc}{' TIMEOUT' if r.timed_out else ''}, load {load:.1f}, others' CPU share {100 * r.others:.0f}%")
        if not r.ok:
            log("    stderr: " + r.stderr.strip()[-2000:])
            break
    return runs


def summary(runs):
    ok = [r for r in runs if r.ok]
    if not ok:
        return None
    walls = [r.wall for r in ok]
    return {
        "reps": len(ok),
        "wall_median": statistics.median(walls),
        "wall_min": min(walls),
        "cpu_median": statistics.median([r.cpu for r in ok]),
        "rss_max_bytes": max(r.rss_kb for r in ok) * 1024,
        "load_median": statistics.median([r.load for r in ok]),
        "others_median": statistics.median([r.others for r in ok]),
    }


def warm(path):
    """Reads a file (or every file under a folder) once, so timed runs read from the page cache."""
    paths = [path] if os.path.isfile(path) else [os.path.join(d, f) for d, _, fs in os.walk(path) for f in fs]
    for p in paths:
        with open(p, "rb") as f:
            while f.read(1 << 22):
                pass


def last_json(text):
    for line in reversed(text.strip().splitlines()):
        line = line.strip()
        if line.startswith("{"):
            return json.loads(line)
    return None


def read_json(path):
    with open(path, encoding="utf-8") as f:
        return json.load(f)


# ---------------------------------------------------------------- specs

def linear_spec(folder, name, csv, loss, p):
    terms = ", ".join(["b0: 1"] + [f"b{j}: x{j}" for j in range(1, p)])
    path = os.path.join(folder, name + ".fit.yaml")
    with open(path, "w", encoding="ascii") as f:
        f.write(f"fitspec: 1\nname: {name}\ndata: {{path: {os.path.basename(csv)}}}\nmodel:\n  response: y\n"
                f"  terms: {{{terms}}}\nloss: {loss}\nreport: {{formats: [json]}}\n")
    return path


def fitspec_cmd(fitspec, specs, out, formats="json"):
    cmd = [fitspec, "solve", *specs, "--out", out, "--force", "--stamp"]
    return cmd + (["--format", formats] if formats else [])


def fresh(folder):
    shutil.rmtree(folder, ignore_errors=True)
    return folder


# ---------------------------------------------------------------- agreement

def rel(a, b):
    return abs(a - b) / max(abs(b), 1e-300)


def coef_agreement(fs, ref, tol):
    worst = max(rel(fs[k], ref[k]) for k in ref)
    return {"worst_relative": worst, "passed": worst <= tol and len(fs) == len(ref)}


def objective_agreement(fs, ref, tol):
    d = rel(fs, ref)
    return {"relative": d, "passed": d <= tol}


def agree_text(a, what):
    if a is None:
        return "n/a"
    value = a.get("worst_relative", a.get("relative"))
    return f"{'yes' if a['passed'] else 'NO'} ({what} {value:.1e})"


# ---------------------------------------------------------------- the cases

def case_p1(args, data, work, log, n, profile):
    csv = gen_data.linear_set(data, "l2", n, seed=11)
    warm(csv)
    spec = linear_spec(data, f"p1-l2-{n}", csv, "l2", 20)
    reps = args.reps_large if n >= 10**6 else args.reps
    out = os.path.join(work, "out", f"p1-{n}")
    ref_out = os.path.join(work, "out", f"p1-{n}-numpy.json")
    fs_runs, np_runs = [], []
    # P4's profile: how much of the peak is garbage the collector had not returned yet.
    gc_variants = {"profile: fitspec, DOTNET_GCConserveMemory=9": {"DOTNET_GCConserveMemory": "9"},
                   "profile: fitspec, DOTNET_GCgen0size=0x4000000 (64 MB)": {"DOTNET_GCgen0size": "0x4000000"}} if profile and n == args.sizes[-1] else {}
    gc_runs = {k: [] for k in gc_variants}
    for rep in range(reps):  # interleaved, so that drift in the machine's load hits both alike
        fs_runs += repeat(f"P1 n={n} fitspec", lambda _: (fitspec_cmd(args.fitspec, [spec], fresh(out)), None),
                          1, args.timeout, work, log, nice=args.nice)
        np_runs += repeat(f"P1 n={n} numpy", lambda _: (["/usr/bin/python3", os.path.join(HERE, "ref_lstsq.py"), csv, ref_out], None),
                          1, args.timeout, work, log, nice=args.nice)
        for label, extra in gc_variants.items():
            gc_runs[label] += repeat(f"P1 n={n} {label}", lambda _: (fitspec_cmd(args.fitspec, [spec], fresh(out + "-gc")), None),
                                     1, args.timeout, work, log, env=dict(os.environ, **extra), nice=args.nice)
    row = {"case": "P1", "n": n, "fitspec": summary(fs_runs), "numpy": summary(np_runs)}
    for label in gc_variants:
        row[label] = summary(gc_runs[label])
    if row["fitspec"] and row["numpy"]:
        result = read_json(os.path.join(out, f"p1-l2-{n}.result.json"))
        ref = read_json(ref_out)
        row["fitspec"]["fit_s"] = result["problem"]["solve_seconds"]
        row["numpy"]["fit_s"] = statistics.median([last_json(r.stdout)["fit_s"] for r in np_runs if r.ok])
        row["numpy"]["read_s"] = statistics.median([last_json(r.stdout)["read_s"] for r in np_runs if r.ok])
        row["status"] = result["status"]
        row["agreement"] = coef_agreement(result["coefficients"], ref["coefficients"], L2_TOL)
        row["provenance"] = result["provenance"]
    return row


def case_p2(args, data, work, log, n):
    csv = gen_data.linear_set(data, "l1", n, seed=12)
    warm(csv)
    spec = linear_spec(data, f"p2-l1-{n}", csv, "l1", 10)
    reps = args.reps_large if n >= 10**6 else args.reps
    out = os.path.join(work, "out", f"p2-{n}")
    tools = {
        "fitspec": lambda: (fitspec_cmd(args.fitspec, [spec], fresh(out)), None),
        "R rq fn (fread)": lambda: (["Rscript", os.path.join(HERE, "ref_rq.R"), csv, os.path.join(work, "out", f"p2-{n}-rq-fread.json"), "fread"], None),
        "R rq fn (read.csv)": lambda: (["Rscript", os.path.join(HERE, "ref_rq.R"), csv, os.path.join(work, "out", f"p2-{n}-rq-readcsv.json"), "read.csv"], None),
        "scipy highs-ipm dual": lambda: (["/usr/bin/python3", os.path.join(HERE, "ref_l1_linprog.py"), csv, os.path.join(work, "out", f"p2-{n}-scipy-dual.json"), "dual"], None),
    }
    runs = {k: [] for k in tools}
    for rep in range(reps):
        for name, make in tools.items():
            if rep > 0 and not any(r.ok for r in runs[name]):
                continue
            if name == "R rq fn (read.csv)" and rep >= min(reps, args.reps_slow):
                continue
            runs[name] += repeat(f"P2 n={n} {name}", lambda _: make(), 1, args.timeout, work, log, nice=args.nice)
    row = {"case": "P2", "n": n}
    for name in tools:
        row[name] = summary(runs[name])
        if row[name] and name != "fitspec":
            row[name]["fit_s"] = statistics.median([last_json(r.stdout)["fit_s"] for r in runs[name] if r.ok])
            row[name]["read_s"] = statistics.median([last_json(r.stdout)["read_s"] for r in runs[name] if r.ok])
    ref_files = {"R rq fn (fread)": "rq-fread", "R rq fn (read.csv)": "rq-readcsv", "scipy highs-ipm dual": "scipy-dual"}
    if row["fitspec"]:
        result = read_json(os.path.join(out, f"p2-l1-{n}.result.json"))
        row["fitspec"]["fit_s"] = result["problem"]["solve_seconds"]
        row["status"] = result["status"]
        row["formulation"] = result["problem"]["formulation"]
        row["fitspec_objective"] = result["objective"]
        for name, key in ref_files.items():
            if row[name]:
                ref = read_json(os.path.join(work, "out", f"p2-{n}-{key}.json"))
                row[name]["agreement"] = objective_agreement(result["objective"], ref["objective"], L1_TOL)
    if n == args.primal_rows:
        ref_out = os.path.join(work, "out", f"p2-{n}-scipy-primal.json")
        r = repeat(f"P2 n={n} scipy highs-ipm primal", lambda _: (["/usr/bin/python3", os.path.join(HERE, "ref_l1_linprog.py"), csv, ref_out, "primal"], None),
                   1, args.primal_timeout, work, log, nice=args.nice)
        s = summary(r)
        if s:
            s["fit_s"] = last_json(r[0].stdout)["fit_s"]
            s["read_s"] = last_json(r[0].stdout)["read_s"]
            if row["fitspec"]:
                s["agreement"] = objective_agreement(row["fitspec_objective"], read_json(ref_out)["objective"], L1_TOL)
        row["scipy highs-ipm primal"] = s if s else {"skipped": f"did not finish within {args.primal_timeout} s" if r and r[0].timed_out else "failed"}
    return row


def case_p3(args, data, work, log, profile):
    batch = gen_data.batch_set(data, args.batch_fits, seed=13)
    warm(batch)
    row = {"case": "P3", "fits": args.batch_fits}
    ref_out = os.path.join(work, "out", "p3-scipy.json")

    def fitspec(formats, folder, prefix=(), extra=()):
        out = os.path.join(work, "out", folder)
        return lambda: ([*prefix, *fitspec_cmd(args.fitspec, [batch], fresh(out), formats), *extra], None), out

    variants = {
        "fitspec all formats": fitspec(None, "p3-all"),
        "fitspec json": fitspec("json", "p3-json"),
        "scipy loop": (lambda: (["/usr/bin/python3", os.path.join(HERE, "ref_batch_linprog.py"), batch, ref_out], None), None),
    }
    if profile:
        # Profile variants, interleaved with the others so that the machine's load hits all alike.
        if shutil.which("eatmydata"):
            variants["profile: all formats, fsync disabled (eatmydata)"] = fitspec(None, "p3-eat-all", prefix=("eatmydata",))
            variants["profile: json, fsync disabled (eatmydata)"] = fitspec("json", "p3-eat-json", prefix=("eatmydata",))
        variants["profile: json, --jobs 1"] = fitspec("json", "p3-jobs1", extra=("--jobs", "1"))
    runs = {k: [] for k in variants}
    for rep in range(args.reps_batch):
        for label, (make, _) in variants.items():
            if rep == 0 or any(r.ok for r in runs[label]):
                runs[label] += repeat(f"P3 {label}", lambda _: make(), 1, args.timeout, work, log, nice=args.nice)
    for label, (_, out) in variants.items():
        row[label] = summary(runs[label])
        if row[label] and out:
            row[label]["fits_per_s"] = args.batch_fits / row[label]["wall_median"]
            row[label]["out"] = out
    if row["scipy loop"]:
        loops = [last_json(r.stdout)["loop_s"] for r in runs["scipy loop"] if r.ok]
        row["scipy loop"]["loop_s_median"] = statistics.median(loops)
        row["scipy loop"]["fits_per_s"] = args.batch_fits / statistics.median(loops)
        ref = read_json(ref_out)
        for label in [k for k in variants if k != "scipy loop"]:
            if row[label]:
                worst, statuses = 0.0, set()
                for name, objective in ref.items():
                    result = read_json(os.path.join(row[label]["out"], f"{name}.result.json"))
                    statuses.add(result["status"])
                    worst = max(worst, rel(result["objective"], objective))
                row[label]["agreement"] = {"relative": worst, "passed": worst <= L1_TOL and statuses == {"optimal"}, "statuses": sorted(statuses)}
    return row


# ---------------------------------------------------------------- profiles (where FitSpec's time goes)

def stage_profile(args, work, log, label, specs, prefix=()):
    out = fresh(os.path.join(work, "out", "stages-" + label))
    r = measure([*prefix, args.stages, "stages", out, *specs], args.timeout * 2, work, nice=args.nice)
    log(f"  stages {label}: wall {r.wall:.2f} s, rc {r.rc}")
    if not r.ok:
        log("    " + r.stderr.strip()[-2000:])
        return None
    table = [line for line in r.stdout.splitlines() if line.startswith("|") or line.startswith("Stage")]
    data = json.loads(next(line[6:] for line in r.stdout.splitlines() if line.startswith("json: ")))
    return {"label": label, "table": table, "data": data, "peak_rss_bytes_time_v": r.rss_kb * 1024}


def profiles(args, data, work, log, rows):
    prof = {}
    big = args.sizes[-1]
    prof["stages P1"] = stage_profile(args, work, log, f"p1-{big}", [os.path.join(data, f"p1-l2-{big}.fit.yaml")])
    prof["stages P2"] = stage_profile(args, work, log, f"p2-{big}", [os.path.join(data, f"p2-l1-{big}.fit.yaml")])
    batch = gen_data.batch_set(data, args.batch_fits, seed=13)
    prof["stages P3"] = stage_profile(args, work, log, "p3", [batch])
    if shutil.which("eatmydata"):
        prof["stages P3, fsync disabled"] = stage_profile(args, work, log, "p3-no-fsync", [batch], prefix=("eatmydata",))

    # P3: the cost of one process (start-up, JIT, one tiny fit), and of flushing every file to disk.
    one = os.path.join(batch, "fit0001.fit.yaml")
    out = os.path.join(work, "out", "p3-one")
    prof["one tiny fit, json"] = summary(repeat("one tiny fit", lambda _: (fitspec_cmd(args.fitspec, [one], fresh(out)), None),
                                                args.reps, args.timeout, work, log, nice=args.nice))
    return prof


# ---------------------------------------------------------------- report

def fmt_s(x):
    return "—" if x is None else (f"{x:.3f}" if x < 10 else f"{x:.2f}")


def fmt_mb(b):
    return f"{b / 1e6:.0f}"


def versions(rows):
    v = {}
    for row in rows:
        if row.get("provenance"):
            p = row["provenance"]
            v["FitSpec"] = p.get("tool_version", "?") + (f" (commit {p['commit']})" if p.get("commit") else "")
            v["HiGHS (FitSpec provenance)"] = p.get("solver")
            v[".NET"] = p.get("runtime") or p.get("framework") or "?"
            break
    py = subprocess.run(["/usr/bin/python3", "-c", "import numpy, scipy, sys; print(numpy.__version__, scipy.__version__, sys.version.split()[0])"],
                        capture_output=True, text=True).stdout.split()
    if len(py) == 3:
        v["numpy"], v["scipy"], v["Python (/usr/bin/python3)"] = py
    blas = os.path.realpath("/usr/lib/x86_64-linux-gnu/libblas.so.3")
    v["BLAS/LAPACK under numpy"] = blas
    r = subprocess.run(["Rscript", "-e", 'cat(R.version$major, R.version$minor, as.character(packageVersion("quantreg")), as.character(packageVersion("data.table")))'],
                       capture_output=True, text=True).stdout.split()
    if len(r) == 4:
        v["R"], v["quantreg"], v["data.table"] = f"{r[0]}.{r[1]}", r[2], r[3]
    return v


def machine():
    model, cores = "?", os.cpu_count()
    for line in open("/proc/cpuinfo", encoding="utf-8"):
        if line.startswith("model name"):
            model = line.split(":", 1)[1].strip()
            break
    mem = next(line.split(":", 1)[1].strip() for line in open("/proc/meminfo", encoding="utf-8") if line.startswith("MemTotal"))
    return {"cpu": model, "cores": cores, "memory": mem, "kernel": platform.release()}


def render(rows, prof, info, goals):
    L = []
    m = info["machine"]
    L.append(f"Machine: {m['cpu']}, {m['cores']} cores, MemTotal {m['memory']}, Linux {m['kernel']}. "
             f"Load average (1 min) at start {info['load_start']:.1f}, at end {info['load_end']:.1f}; measured commands ran at nice {info['nice']}.")
    L.append("")
    L.append("Versions: " + "; ".join(f"{k} {v}" for k, v in info["versions"].items()))
    L.append("")
    L.append("Wall = whole process (median of reps, min in brackets), seconds; CPU = user+sys seconds (median); "
             "RSS = peak resident set (max over reps), MB; read, fit = timed inside the reference scripts (FitSpec's fit: "
             "problem.solve_seconds of its result; its read is in the stage profile below); busy = share of the machine's CPU "
             "that other processes used during the runs (median), a measure of how disturbed the timing is.")
    L.append("")
    L.append("| case | rows | tool | reps | wall s (min) | CPU s | peak RSS MB | read s | fit s | busy | agrees with FitSpec |")
    L.append("| --- | ---: | --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | --- |")
    for row in rows:
        if row["case"] == "P3":
            continue
        tools = ["fitspec", "numpy", *[k for k in row if k.startswith("profile:")]] if row["case"] == "P1" else ["fitspec", "R rq fn (fread)", "R rq fn (read.csv)", "scipy highs-ipm dual", "scipy highs-ipm primal"]
        for t in tools:
            if t not in row:
                continue
            s = row[t]
            if s is None:
                L.append(f"| {row['case']} | {row['n']} | {t} | 0 | failed | | | | | | |")
                continue
            if "skipped" in s:
                L.append(f"| {row['case']} | {row['n']} | {t} | 0 | skipped: {s['skipped']} | | | | | | |")
                continue
            if t.startswith("profile:"):
                agree = "profile run"
            elif t == "fitspec":
                agree = f"status {row.get('status')}" + (f"; {row['formulation']}" if row.get("formulation") else "")
            elif row["case"] == "P1":
                agree = agree_text(row.get("agreement"), "coef rel")
            else:
                agree = agree_text(s.get("agreement"), "objective rel")
            L.append(f"| {row['case']} | {row['n']} | {t} | {s['reps']} | {fmt_s(s['wall_median'])} ({fmt_s(s['wall_min'])}) | {fmt_s(s['cpu_median'])} | "
                     f"{fmt_mb(s['rss_max_bytes'])} | {fmt_s(s.get('read_s'))} | {fmt_s(s.get('fit_s'))} | {100 * s['others_median']:.0f}% | {agree} |")
    for row in rows:
        if row["case"] != "P3":
            continue
        L.append("")
        L.append(f"P3: {row['fits']} small l1 specs (50 rows, 4 terms, bounds on two coefficients), each its own spec and CSV.")
        L.append("")
        L.append("| tool | reps | wall s (min) | CPU s | peak RSS MB | fits/s (median wall) | busy | objectives agree |")
        L.append("| --- | ---: | ---: | ---: | ---: | ---: | ---: | --- |")
        for t in [k for k in row if k not in ("case", "fits")]:
            s = row[t]
            if s is None:
                L.append(f"| {t} | 0 | failed | | | | | |")
                continue
            note = "reference (timed loop only: " + fmt_s(s["loop_s_median"]) + " s)" if t == "scipy loop" else agree_text(s.get("agreement"), "worst objective rel")
            L.append(f"| {t} | {s['reps']} | {fmt_s(s['wall_median'])} ({fmt_s(s['wall_min'])}) | {fmt_s(s['cpu_median'])} | {fmt_mb(s['rss_max_bytes'])} | {s['fits_per_s']:.1f} | {100 * s['others_median']:.0f}% | {note} |")
    L.append("")
    L.append("Goals:")
    L.append("")
    L.append("| goal | target | measured (wall medians) | same ratio on CPU seconds | met (on wall) |")
    L.append("| --- | --- | --- | --- | --- |")
    for g in goals:
        L.append(f"| {g['goal']} | {g['target']} | {g['measured']} | {g.get('cpu', '—')} | {g['met']} |")
    if prof:
        L.append("")
        L.append("Profile of FitSpec (bench-only harness calling FitSpec.Core's stages in one process; one run each):")
        for key in ("stages P1", "stages P2", "stages P3", "stages P3, fsync disabled"):
            p = prof.get(key)
            if p:
                L.append("")
                L.append(f"{key} ({p['label']}):")
                L.append("")
                L.extend(p["table"][1:])
        L.append("")
        L.append("| experiment | reps | wall s (min) | CPU s | peak RSS MB | fits/s | busy |")
        L.append("| --- | ---: | ---: | ---: | ---: | ---: | ---: |")
        for key, s in prof.items():
            if key.startswith("stages") or s is None:
                continue
            fps = f"{s['fits_per_s']:.1f}" if "fits_per_s" in s else ""
            L.append(f"| {key} | {s['reps']} | {fmt_s(s['wall_median'])} ({fmt_s(s['wall_min'])}) | {fmt_s(s['cpu_median'])} | {fmt_mb(s['rss_max_bytes'])} | {fps} | {100 * s['others_median']:.0f}% |")
    return "\n".join(L)


def evaluate(rows, big):
    goals = []

    def find(case, n=None):
        return next((r for r in rows if r["case"] == case and (n is None or r.get("n") == n)), None)

    p1 = find("P1", big)
    if p1 and p1["fitspec"] and p1["numpy"]:
        ratio = p1["fitspec"]["wall_median"] / p1["numpy"]["wall_median"]
        goals.append({"goal": f"P1 wall, FitSpec / numpy, n={big}", "target": "≤ 0.5", "measured": f"{ratio:.2f} ({fmt_s(p1['fitspec']['wall_median'])} s vs {fmt_s(p1['numpy']['wall_median'])} s)",
                      "cpu": f"{p1['fitspec']['cpu_median'] / p1['numpy']['cpu_median']:.2f}",
                      "met": "yes" if ratio <= 0.5 and p1["agreement"]["passed"] else "no"})
        mem = p1["fitspec"]["rss_max_bytes"] / DESIGN_BYTES_P1
        goals.append({"goal": f"P4 peak RSS of P1 / design bytes (160 MB), n={big}", "target": "≤ 2", "measured": f"{mem:.2f} ({fmt_mb(p1['fitspec']['rss_max_bytes'])} MB; numpy {fmt_mb(p1['numpy']['rss_max_bytes'])} MB)",
                      "met": "yes" if mem <= 2 else "no"})
    p2 = find("P2", big)
    r = p2 and p2.get("R rq fn (fread)")
    if p2 and p2["fitspec"] and r:
        ok = r["agreement"]["passed"]
        fit = p2["fitspec"]["fit_s"] / r["fit_s"]
        goals.append({"goal": f"P2 fit, FitSpec solve / R rq fn fit, n={big}", "target": "≤ 1.0", "measured": f"{fit:.2f} ({fmt_s(p2['fitspec']['fit_s'])} s vs {fmt_s(r['fit_s'])} s)",
                      "met": "yes" if fit <= 1.0 and ok else "no"})
        e2e = p2["fitspec"]["wall_median"] / r["wall_median"]
        goals.append({"goal": f"P2 end to end, FitSpec / R (fread + rq), n={big}", "target": "≤ 0.5", "measured": f"{e2e:.2f} ({fmt_s(p2['fitspec']['wall_median'])} s vs {fmt_s(r['wall_median'])} s)",
                      "cpu": f"{p2['fitspec']['cpu_median'] / r['cpu_median']:.2f}",
                      "met": "yes" if e2e <= 0.5 and ok else "no"})
    p3 = find("P3")
    if p3 and p3["scipy loop"]:
        ref = p3["scipy loop"]["fits_per_s"]
        for label, target in (("fitspec all formats", 1.0), ("fitspec json", 3.0)):
            s = p3[label]
            if s:
                ratio = s["fits_per_s"] / ref
                goals.append({"goal": f"P3 throughput, {label} / scipy loop", "target": f"≥ {target:g}", "measured": f"{ratio:.2f} ({s['fits_per_s']:.1f} vs {ref:.1f} fits/s)",
                              "cpu": f"{p3['scipy loop']['loop_s_median'] / s['cpu_median']:.2f} (fits per CPU second; the scipy loop is one thread, its CPU ≈ its loop time)",
                              "met": "yes" if ratio >= target and s["agreement"]["passed"] else "no"})
    return goals


def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--fitspec", required=True, help="the fitspec executable (a Release build)")
    ap.add_argument("--stages", help="the FitSpec.Bench executable, for the stage profile")
    ap.add_argument("--work", default=os.environ.get("FITSPEC_PERF_DIR", "/tmp/fitspec-perf"))
    ap.add_argument("--sizes", default="10000,100000,1000000", help="row counts for P1 and P2")
    ap.add_argument("--reps", type=int, default=5, help="repetitions below 10^6 rows")
    ap.add_argument("--reps-large", type=int, default=5, help="repetitions at 10^6 rows and more")
    ap.add_argument("--reps-slow", type=int, default=3, help="repetitions of R with read.csv (the slowest reader)")
    ap.add_argument("--reps-batch", type=int, default=5)
    ap.add_argument("--batch-fits", type=int, default=1000)
    ap.add_argument("--primal-rows", type=int, default=100000, help="row count for the scipy primal form (0: skip)")
    ap.add_argument("--primal-timeout", type=float, default=240)
    ap.add_argument("--timeout", type=float, default=600, help="seconds per measured command")
    ap.add_argument("--nice", type=int, default=-20 if os.geteuid() == 0 else 0, help="niceness of measured commands (as root: -20, so that other work on a shared machine disturbs the timings less)")
    ap.add_argument("--only", default="P1,P2,P3,profile")
    ap.add_argument("--quick", action="store_true", help="small sizes, 2 reps, 100 batch fits: a smoke test of the script")
    args = ap.parse_args()
    if args.quick:
        args.sizes, args.reps, args.reps_large, args.reps_batch, args.batch_fits, args.primal_rows = "10000,100000", 2, 2, 2, 100, 10000
        args.reps_slow = 2
    args.sizes = [int(s) for s in args.sizes.split(",")]
    only = set(args.only.split(","))
    work = args.work
    data = os.path.join(work, "data")
    os.makedirs(data, exist_ok=True)
    os.makedirs(os.path.join(work, "out"), exist_ok=True)
    log_path = os.path.join(work, "perf.log")
    log_file = open(log_path, "w", encoding="utf-8")

    def log(msg):
        print(msg, flush=True)
        log_file.write(msg + "\n")
        log_file.flush()

    info = {"machine": machine(), "load_start": os.getloadavg()[0], "nice": args.nice}
    log(f"work folder {work}; machine {info['machine']}; load {info['load_start']:.1f}")
    log("generating data (fixed seeds; reused when present)")
    for n in args.sizes:
        if "P1" in only or "profile" in only:
            gen_data.linear_set(data, "l2", n, seed=11)
        if "P2" in only or "profile" in only:
            gen_data.linear_set(data, "l1", n, seed=12)
    gen_data.batch_set(data, args.batch_fits, seed=13)

    start = time.perf_counter()
    rows = []
    for n in args.sizes:
        if "P1" in only:
            rows.append(case_p1(args, data, work, log, n, "profile" in only))
    for n in args.sizes:
        if "P2" in only:
            rows.append(case_p2(args, data, work, log, n))
    if "P3" in only:
        rows.append(case_p3(args, data, work, log, "profile" in only))
    prof = None
    if "profile" in only and args.stages:
        for n in args.sizes[-1:]:  # the stage profile needs the specs of the largest size
            linear_spec(data, f"p1-l2-{n}", gen_data.linear_set(data, "l2", n, seed=11), "l2", 20)
            linear_spec(data, f"p2-l1-{n}", gen_data.linear_set(data, "l1", n, seed=12), "l1", 10)
        prof = profiles(args, data, work, log, rows)
    info["load_end"] = os.getloadavg()[0]
    info["versions"] = versions(rows)
    info["seconds"] = time.perf_counter() - start
    goals = evaluate(rows, args.sizes[-1])
    table = render(rows, prof, info, goals)
    log("")
    log(table)
    log(f"\nbench took {info['seconds']:.0f} s; table in {os.path.join(work, 'perf-table.md')}, figures in {os.path.join(work, 'perf-results.json')}")
    with open(os.path.join(work, "perf-table.md"), "w", encoding="utf-8") as f:
        f.write(table + "\n")
    with open(os.path.join(work, "perf-results.json"), "w", encoding="utf-8") as f:
        json.dump({"info": info, "rows": rows, "profile": prof, "goals": goals}, f, indent=1, default=str)
    # A fast wrong answer is not a result: any disagreement makes the run fail.
    checks = [r["agreement"] for r in rows if "agreement" in r]
    checks += [s["agreement"] for r in rows for s in r.values() if isinstance(s, dict) and "agreement" in s]
    if any(not c["passed"] for c in checks):
        log("some answers disagree with the references (see the table)")
        return 1
    return 0


if __name__ == "__main__":
    sys.exit(main())
