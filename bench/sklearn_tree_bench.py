"""The scikit-learn side of bench/tree_bench.ts: one DecisionTreeRegressor
fit (min_samples_leaf 5 and 1) and cost_complexity_pruning_path on CPS1988
from fixtures/reference/trees_cps1988.json, timed on this machine.
Usage: /usr/bin/python3 bench/sklearn_tree_bench.py"""
import json
import os
import timeit

import numpy
import sklearn
from sklearn.tree import DecisionTreeRegressor

HERE = os.path.dirname(os.path.abspath(__file__))
with open(os.path.join(HERE, "..", "fixtures", "reference", "trees_cps1988.json")) as f:
    doc = json.load(f)
X = numpy.asarray(doc["X"], dtype=numpy.float32).T.copy()
y = numpy.asarray(doc["y"])


def best_ms(stmt, repeat=7, number=3):
    return min(timeit.repeat(stmt, repeat=repeat, number=number)) / number * 1000


print(f"scikit-learn {sklearn.__version__}, numpy {numpy.__version__}, {X.shape[0]} rows")
print(f"grow one tree, min leaf 5: {best_ms(lambda: DecisionTreeRegressor(min_samples_leaf=5, min_samples_split=10, random_state=0).fit(X, y)):.1f} ms")
print(f"grow one tree, min leaf 1: {best_ms(lambda: DecisionTreeRegressor(random_state=0).fit(X, y)):.1f} ms")
model = DecisionTreeRegressor(min_samples_leaf=5, min_samples_split=10, random_state=0)
print(f"pruning path (fit + path), min leaf 5: {best_ms(lambda: model.cost_complexity_pruning_path(X, y)):.1f} ms")
