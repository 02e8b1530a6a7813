"""paygrove against scikit-learn's RandomForestRegressor on the same tables in
the same run: 200 trees, max_features=1.0, min_samples_leaf=5, bootstrap,
out-of-bag score, with 2 workers/jobs and with one thread, categoricals as ordered integer codes in both
programs. Tables: CPS1988 (fixtures/reference/trees_cps1988.json) and the
generated table of bench/generated_table.ts (100,000 rows by default).
Prints seconds, trees per second, peak memory and the ratios
paygrove / scikit-learn for fitting and for one profile through every tree.
Usage: /usr/bin/python3 bench/forest_vs_sklearn.py [ROWS]
(deno on PATH; each side runs in its own process so peak memory is its own)."""
import csv
import io
import json
import os
import resource
import subprocess
import sys
import time

HERE = os.path.dirname(os.path.abspath(__file__))
TREES = 200


def load(table, rows):
    import numpy
    if table == "cps1988":
        with open(os.path.join(HERE, "..", "fixtures", "reference", "trees_cps1988.json")) as f:
            doc = json.load(f)
        return numpy.asarray(doc["X"], dtype=numpy.float32).T.copy(), numpy.asarray(doc["y"])
    text = subprocess.run(["deno", "run", os.path.join(HERE, "generated_table.ts"), str(rows), "1"],
                          check=True, capture_output=True, text=True).stdout
    reader = csv.reader(io.StringIO(text))
    header = next(reader)
    data = list(reader)
    columns = list(zip(*data))
    X = []
    for name, values in zip(header, columns):
        if name == "pay":
            y = numpy.asarray(values, dtype=float)
        elif values[0].startswith("k"):
            # Ordered integer codes: the sorted position of each level, as in paygrove.
            levels = sorted(set(values))
            index = {v: i for i, v in enumerate(levels)}
            X.append([index[v] for v in values])
        else:
            X.append([float(v) for v in values])
    return numpy.asarray(X, dtype=numpy.float32).T.copy(), y


def sklearn_side(table, rows, jobs):
    import sklearn
    from sklearn.ensemble import RandomForestRegressor
    start = time.perf_counter()
    X, y = load(table, rows)
    load_seconds = time.perf_counter() - start
    model = RandomForestRegressor(n_estimators=TREES, max_features=1.0, min_samples_leaf=5,
                                  bootstrap=True, oob_score=True, n_jobs=jobs, random_state=1)
    start = time.perf_counter()
    model.fit(X, y)
    fit_seconds = time.perf_counter() - start
    profile = X[:1]
    start = time.perf_counter()
    repeats = 20
    for _ in range(repeats):
        [tree.predict(profile) for tree in model.estimators_]
    profile_ms = (time.perf_counter() - start) / repeats * 1000
    peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    print(json.dumps({"program": f"scikit-learn {sklearn.__version__}", "table": table,
                      "rows": int(X.shape[0]), "features": int(X.shape[1]), "trees": TREES,
                      "workers": jobs,
                      "loadSeconds": load_seconds, "fitSeconds": fit_seconds,
                      "treesPerSecond": TREES / fit_seconds, "profileMs": profile_ms,
                      "oobR2": model.oob_score_, "peakMiB": peak}))


def run(args):
    out = subprocess.run(args, check=True, capture_output=True, text=True, cwd=os.path.join(HERE, ".."))
    return json.loads(out.stdout.strip().splitlines()[-1])


def main():
    if len(sys.argv) > 1 and sys.argv[1] == "--sklearn":
        sklearn_side(sys.argv[2], int(sys.argv[3]), int(sys.argv[4]))
        return
    rows = int(sys.argv[1]) if len(sys.argv) > 1 else 100000
    print(f"200 trees, max_features=1.0 (all features), min leaf 5; {os.cpu_count()} cores")
    for table in ("cps1988", "generated"):
        for workers in (2, 1):
            ours = run(["deno", "run", "--allow-read", "bench/forest_timing.ts", table, str(rows),
                        str(workers)])
            theirs = run([sys.executable, os.path.abspath(__file__), "--sklearn", table, str(rows),
                          str(workers)])
            for r in (ours, theirs):
                print(f"{table:9} {r['rows']:>7} rows  {r['program']:20} {workers} thread(s)  "
                      f"fit {r['fitSeconds']:7.2f} s ({r['treesPerSecond']:6.1f} trees/s)  "
                      f"one profile {r['profileMs']:7.3f} ms  OOB R^2 {r['oobR2']:.4f}  "
                      f"peak {r['peakMiB']:6.0f} MiB  (load {r['loadSeconds']:.2f} s)")
            print(f"{table:9} {workers} thread(s): ratio paygrove/scikit-learn: fit "
                  f"{ours['fitSeconds'] / theirs['fitSeconds']:.2f}, "
                  f"one profile {ours['profileMs'] / theirs['profileMs']:.3f}")


if __name__ == "__main__":
    main()
