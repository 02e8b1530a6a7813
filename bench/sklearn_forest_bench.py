"""The scikit-learn side of bench/ensemble_bench.ts: RandomForestRegressor
with 200 trees, max_features=1.0, min_samples_leaf=5, bootstrap, out-of-bag
score, on CPS1988 (categoricals as ordered integer codes, as in
fixtures/reference/trees_cps1988.json), with one and two jobs; and one
profile through every tree. Usage: /usr/bin/python3 bench/sklearn_forest_bench.py"""
import json
import os
import time

import numpy
import sklearn
from sklearn.ensemble import RandomForestRegressor

HERE = os.path.dirname(os.path.abspath(__file__))
with open(os.path.join(HERE, "..", "fixtures", "reference", "trees_cps1988.json")) as f:
    doc = json.load(f)
X = numpy.asarray(doc["X"], dtype=numpy.float32).T.copy()
y = numpy.asarray(doc["y"])
print(f"scikit-learn {sklearn.__version__}, {X.shape[0]} rows, 200 trees, min leaf 5")
for jobs in (1, 2):
    model = RandomForestRegressor(n_estimators=200, max_features=1.0, min_samples_leaf=5,
                                  bootstrap=True, oob_score=True, n_jobs=jobs, random_state=1)
    start = time.perf_counter()
    model.fit(X, y)
    print(f"fit, n_jobs={jobs}: {time.perf_counter() - start:.2f} s (OOB R^2 {model.oob_score_:.4f})")
profile = X[:1]
start = time.perf_counter()
for _ in range(20):
    [tree.predict(profile) for tree in model.estimators_]
print(f"one profile through 200 trees (per-tree loop): {(time.perf_counter() - start) / 20 * 1000:.1f} ms")
