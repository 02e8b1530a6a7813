"""paygrove against scikit-learn's RandomForestRegressor as the table grows:
10,000, 100,000 and 1,000,000 rows of the generated table of
bench/generated_table.ts (6 numeric, 4 categorical features; invented),
written once to a CSV that both programs load from disk. 100 trees,
max_features=1.0, min_samples_leaf=5, bootstrap, n_jobs=2 (paygrove: 2
workers). Reports load and fit seconds, peak resident memory, model size,
one profile through every tree, and how fit time grows with rows.
Usage: /usr/bin/python3 bench/scale_vs_sklearn.py [ROWS ...]
(deno on PATH; each side runs in its own process, so peak memory is its own)."""
import csv
import json
import os
import pickle
import resource
import subprocess
import sys
import tempfile
import time

HERE = os.path.dirname(os.path.abspath(__file__))
TREES = 100


def sklearn_side(path):
    import numpy
    import sklearn
    from sklearn.ensemble import RandomForestRegressor
    start = time.perf_counter()
    with open(path, newline="") as f:
        reader = csv.reader(f)
        header = next(reader)
        columns = list(zip(*reader))
    X = []
    for name, values in zip(header, columns):
        if name == "pay":
            y = numpy.asarray(values, dtype=float)
        elif values[0].startswith("k"):
            # Ordered integer codes: the sorted position of each level, as in paygrove.
            index = {v: i for i, v in enumerate(sorted(set(values)))}
            X.append([index[v] for v in values])
        else:
            X.append(numpy.asarray(values, dtype=float))
    X = numpy.asarray(X, dtype=numpy.float32).T.copy()
    del columns
    load_seconds = time.perf_counter() - start
    load_peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    model = RandomForestRegressor(n_estimators=TREES, max_features=1.0, min_samples_leaf=5,
                                  bootstrap=True, oob_score=True, n_jobs=2, random_state=1)
    start = time.perf_counter()
    model.fit(X, y)
    fit_seconds = time.perf_counter() - start
    profile = X[:1]
    start = time.perf_counter()
    repeats = 20
    for _ in range(repeats):
        [tree.predict(profile) for tree in model.estimators_]
    profile_ms = (time.perf_counter() - start) / repeats * 1000
    print(json.dumps({"program": f"scikit-learn {sklearn.__version__}", "rows": int(X.shape[0]),
                      "features": int(X.shape[1]), "trees": TREES, "loadSeconds": load_seconds,
                      "loadPeakMiB": load_peak, "fitSeconds": fit_seconds,
                      "fitPeakMiB": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024,
                      "modelMB": len(pickle.dumps(model)) / 1e6, "profileMs": profile_ms,
                      "oobR2": model.oob_score_}))


def run(args):
    out = subprocess.run(args, check=True, capture_output=True, text=True, cwd=os.path.join(HERE, ".."))
    return json.loads(out.stdout.strip().splitlines()[-1])


def main():
    if len(sys.argv) > 1 and sys.argv[1] == "--sklearn":
        sklearn_side(sys.argv[2])
        return
    sizes = [int(a) for a in sys.argv[1:]] or [10000, 100000, 1000000]
    print(f"{TREES} trees, max_features=1.0, min leaf 5, 2 workers/jobs; {os.cpu_count()} cores")
    previous = None
    for rows in sizes:
        with tempfile.TemporaryDirectory() as tmp:
            path = os.path.join(tmp, "table.csv")
            with open(path, "w") as f:
                subprocess.run(["deno", "run", os.path.join(HERE, "generated_table.ts"), str(rows), "1"],
                               check=True, stdout=f)
            ours = run(["deno", "run", "--allow-read", "bench/scale_timing.ts", path])
            theirs = run([sys.executable, os.path.abspath(__file__), "--sklearn", path])
        for r in (ours, theirs):
            print(f"{r['rows']:>8} rows  {r['program']:20} load {r['loadSeconds']:6.2f} s "
                  f"(peak {r['loadPeakMiB']:5.0f} MiB)  fit {r['fitSeconds']:7.1f} s "
                  f"(peak {r['fitPeakMiB']:5.0f} MiB)  model {r['modelMB']:7.1f} MB  "
                  f"one profile {r['profileMs']:6.3f} ms  OOB R^2 {r['oobR2']:.4f}")
        ratio = ours["fitSeconds"] / theirs["fitSeconds"]
        growth = ""
        if previous is not None:
            growth = (f"; x{rows / previous[0]:.0f} rows: paygrove fit x{ours['fitSeconds'] / previous[1]:.1f}, "
                      f"scikit-learn x{theirs['fitSeconds'] / previous[2]:.1f}")
        print(f"{rows:>8} rows  ratio paygrove/scikit-learn: fit {ratio:.2f}, load "
              f"{ours['loadSeconds'] / theirs['loadSeconds']:.2f}{growth}")
        previous = (rows, ours["fitSeconds"], theirs["fitSeconds"])
        sys.stdout.flush()


main()
