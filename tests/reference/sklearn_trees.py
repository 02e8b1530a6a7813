#!/usr/bin/python3
# Reference fixtures for paygrove's decision-tree learner.
#
# What this does: fits scikit-learn's DecisionTreeRegressor and
# DecisionTreeClassifier on three small open datasets (diabetes and iris,
# both bundled with scikit-learn, and the CPS1988 extract already committed in
# fixtures/cps1988.csv), and writes what scikit-learn produced (tree size,
# depth, in-sample predictions, the cost-complexity pruning path and the leaf
# count after pruning at each step of that path) as JSON files. Our
# TypeScript tree learner is tested against these files.
#
# How to run, with Debian's interpreter and Debian's python3-sklearn
# (scikit-learn 1.2.1, numpy 1.24.2):
#
#     /usr/bin/python3 tests/reference/sklearn_trees.py fixtures/reference
#
# The argument is the folder to write into; it defaults to fixtures/reference
# in this checkout and is created if missing. The output is meant to be the
# same bytes on every run (fixed seeds, sorted keys, no clocks or paths in the
# files), so a rerun can be compared with the committed files byte for byte.
# Run time on a 2-core machine is about a minute.
#
# Things worth knowing when reading the fixtures:
# - scikit-learn turns X into float32 before fitting. We do the same on our
#   side, store those rounded values (as float64 numbers) column by column,
#   and fit on them, so both learners see exactly the same inputs.
# - When two features give equally good splits, scikit-learn picks one
#   according to its random feature order. We refit each case with
#   random_state 0 to 19 and list the rows whose prediction changes in
#   "unstable_rows"; tests should skip those rows. Predictions that differ
#   only by summation rounding (relative difference at most UNSTABLE_RTOL)
#   are not counted as changes: the order in which scikit-learn adds up the
#   targets of a leaf depends on earlier sorting, so the last bits of a leaf
#   mean can move between refits even when the tree is the same.
# - "seed_spread" gives the smallest and largest leaf count, depth, node
#   count and pruning-path length seen over those 20 refits, so a test can
#   tell whether the tree's shape itself depends on the tie-breaking.

import csv
import json
import os
import sys
import time

import numpy
import sklearn
from sklearn.datasets import load_diabetes, load_iris
from sklearn.tree import DecisionTreeClassifier, DecisionTreeRegressor

EXPECTED_SKLEARN = "1.2.1"
EXPECTED_NUMPY = "1.24.2"
SOURCE = ("scikit-learn 1.2.1, numpy 1.24.2 (Debian python3-sklearn); "
          "written by tests/reference/sklearn_trees.py")

SEEDS = range(20)          # random_state values used to find unstable rows
WEIGHT_SEED = 7            # seed of the bootstrap counts
UNSTABLE_RTOL = 1e-12      # see the header: smaller changes are rounding only
MAX_BYTES = 15_000_000     # a dataset file larger than this drops "leaf1" (cps1988)
# Refitting once per pruning-path step costs about (path length) x (rows).
# Above this budget only an evenly spaced subset of path steps is refitted.
# The rule depends only on the data, never on the clock, so output is stable.
REFIT_BUDGET = 5_000_000
REFIT_SUBSET = 200

HERE = os.path.dirname(os.path.abspath(__file__))
REPO = os.path.dirname(os.path.dirname(HERE))
CPS_CSV = os.path.join(REPO, "fixtures", "cps1988.csv")

CPS_NUMERIC = ["education", "experience"]
CPS_CATEGORICAL = ["ethnicity", "smsa", "region", "parttime"]


def load_cps1988():
    with open(CPS_CSV, newline="", encoding="utf-8") as f:
        rows = list(csv.DictReader(f))
    # Each categorical column gets codes 0, 1, ... for its levels in
    # alphabetical order.
    encoding = {}
    for col in CPS_CATEGORICAL:
        levels = sorted({r[col] for r in rows})
        encoding[col] = {level: code for code, level in enumerate(levels)}
    X = numpy.array(
        [[float(r[c]) for c in CPS_NUMERIC]
         + [float(encoding[c][r[c]]) for c in CPS_CATEGORICAL] for r in rows],
        dtype=numpy.float64)
    y = numpy.log(numpy.array([float(r["wage"]) for r in rows], dtype=numpy.float64))
    return X, y, CPS_NUMERIC + CPS_CATEGORICAL, encoding


def datasets():
    d = load_diabetes()
    yield "diabetes", "regression", d.data, d.target.astype(numpy.float64), list(d.feature_names), None
    i = load_iris()
    yield "iris", "classification", i.data, i.target.astype(numpy.int64), list(i.feature_names), None
    X, y, names, encoding = load_cps1988()
    yield "cps1988", "regression", X, y, names, encoding


def cases_for(dataset):
    base = [
        ("leaf5", dict(min_samples_leaf=5, min_samples_split=10, max_depth=None), False),
        ("leaf1", dict(min_samples_leaf=1, min_samples_split=2, max_depth=None), False),
        ("leaf5_weighted", dict(min_samples_leaf=5, min_samples_split=10, max_depth=None), True),
    ]
    if dataset == "iris":
        base.append(("depth3", dict(min_samples_leaf=1, min_samples_split=2, max_depth=3), False))
    return base


def predictions(model, task, X):
    if task == "regression":
        return model.predict(X)
    return model.predict_proba(X)


def unstable(preds, task):
    """Rows whose prediction differs (beyond rounding) between any refits."""
    first = preds[0]
    bad = numpy.zeros(first.shape[0], dtype=bool)
    for p in preds[1:]:
        diff = numpy.abs(p - first)
        limit = UNSTABLE_RTOL * numpy.maximum(1.0, numpy.abs(first))
        over = diff > limit
        if task == "classification":
            over = over.any(axis=1)
        bad |= over
    return [int(i) for i in numpy.flatnonzero(bad)]


def run_case(task, X32, y, name, params, weights):
    Model = DecisionTreeRegressor if task == "regression" else DecisionTreeClassifier
    n = X32.shape[0]

    fits = [Model(random_state=s, **params).fit(X32, y, sample_weight=weights) for s in SEEDS]
    model = fits[0]
    preds = [predictions(m, task, X32) for m in fits]
    paths = [m.cost_complexity_pruning_path(X32, y, sample_weight=weights) for m in fits]
    path = paths[0]
    alphas = [float(a) for a in path.ccp_alphas]
    impurities = [float(v) for v in path.impurities]

    if len(alphas) * n <= REFIT_BUDGET:
        index = list(range(len(alphas)))
        subset = False
    else:
        index = sorted({int(round(v)) for v in numpy.linspace(0, len(alphas) - 1, REFIT_SUBSET)})
        subset = True
    pruned = []
    for k in index:
        # ccp_alpha must not be negative; a path value can only be below zero
        # by rounding, and pruning at 0 is then the same request.
        alpha = max(alphas[k], 0.0)
        m = Model(random_state=0, ccp_alpha=alpha, **params).fit(X32, y, sample_weight=weights)
        pruned.append(int(m.get_n_leaves()))

    def spread(values):
        return [int(min(values)), int(max(values))]

    case = {
        "name": name,
        "min_samples_leaf": params["min_samples_leaf"],
        "min_samples_split": params["min_samples_split"],
        "max_depth": params["max_depth"],
        "sample_weight": None if weights is None else [int(w) for w in weights],
        "n_leaves": int(model.get_n_leaves()),
        "depth": int(model.get_depth()),
        "node_count": int(model.tree_.node_count),
        "pure_splits": pure_splits(model),
        "predict": preds[0].tolist(),
        "unstable_rows": unstable(preds, task),
        "unstable_rtol": UNSTABLE_RTOL,
        "seed_spread": {
            "n_leaves": spread([m.get_n_leaves() for m in fits]),
            "depth": spread([m.get_depth() for m in fits]),
            "node_count": spread([m.tree_.node_count for m in fits]),
            "path_len": spread([len(p.ccp_alphas) for p in paths]),
        },
        "path_seed_difference": path_seed_difference(paths),
        "path": {"ccp_alphas": alphas, "impurities": impurities},
        "pruned_leaves": pruned,
    }
    if subset:
        case["pruned_index"] = index
    return case


ALPHA_RTOL = 1e-9          # alphas this close (relative) are one alpha ...
ALPHA_RISK_FLOOR = 1e-12   # ... or this close as a share of the root's risk


def distinct_alphas(alphas, root_risk):
    """The path's alphas with runs of equal ones (to ALPHA_RTOL, or
    ALPHA_RISK_FLOOR of the root's risk) kept once."""
    out = []
    for i, a in enumerate(alphas):
        if i + 1 < len(alphas) and same_alpha(a, alphas[i + 1], root_risk):
            continue
        out.append(float(a))
    return out


def same_alpha(a, b, root_risk):
    return abs(a - b) <= ALPHA_RTOL * max(abs(a), abs(b)) + ALPHA_RISK_FLOOR * root_risk


def path_seed_difference(paths):
    """How many distinct alphas the path of each random_state lacks or adds
    against random_state 0's (the largest count). Exact ties between features
    are broken at random, and a tie can change which internal node separates
    rows without changing any leaf; this is how far the reference's path moves
    by tie-breaking alone."""
    root_risk = float(paths[0].impurities[-1])
    base = distinct_alphas(list(paths[0].ccp_alphas), root_risk)
    worst = 0
    for p in paths[1:]:
        other = distinct_alphas(list(p.ccp_alphas), root_risk)
        i = j = missed = 0
        while i < len(base) and j < len(other):
            if same_alpha(base[i], other[j], root_risk):
                i += 1
                j += 1
            elif base[i] < other[j]:
                i += 1
                missed += 1
            else:
                j += 1
                missed += 1
        worst = max(worst, missed + (len(base) - i) + (len(other) - j))
    return worst


def pure_splits(model):
    """Splits of nodes whose targets are all equal, made only because the
    node's impurity, computed in floating point, came out a little above
    machine epsilon (e.g. 1.4e-14 for two equal log wages). They add leaves
    without changing any prediction; the count lets a test tell them apart
    from a real difference in the tree."""
    t = model.tree_
    internal = t.children_left != -1
    return int(numpy.sum(internal & (t.impurity <= 1e-12 * t.impurity[0])))


def encode(obj):
    return json.dumps(obj, separators=(",", ":"), sort_keys=True, allow_nan=False) + "\n"


def main(argv):
    outdir = argv[1] if len(argv) > 1 else os.path.join(REPO, "fixtures", "reference")
    if sklearn.__version__ != EXPECTED_SKLEARN or numpy.__version__ != EXPECTED_NUMPY:
        sys.exit(f"expected scikit-learn {EXPECTED_SKLEARN} and numpy {EXPECTED_NUMPY}, "
                 f"found {sklearn.__version__} and {numpy.__version__}; "
                 "the fixtures would not match the committed ones")
    os.makedirs(outdir, exist_ok=True)
    started = time.monotonic()
    worst = 0.0

    for dataset, task, X, y, features, encoding in datasets():
        X32 = numpy.asarray(X).astype(numpy.float32)
        n = X32.shape[0]
        doc = {
            "source": SOURCE,
            "sklearn_version": sklearn.__version__,
            "dataset": dataset,
            "task": task,
            "features": features,
            "X": X32.astype(float).T.tolist(),
            "y": [float(v) for v in y] if task == "regression" else [int(v) for v in y],
            "cases": [],
        }
        if encoding is not None:
            doc["encoding"] = encoding
        if task == "classification":
            doc["classes"] = [int(c) for c in numpy.unique(y)]

        for name, params, weighted in cases_for(dataset):
            t0 = time.monotonic()
            weights = None
            if weighted:
                rng = numpy.random.default_rng(WEIGHT_SEED)
                weights = rng.multinomial(n, [1.0 / n] * n)
            case = run_case(task, X32, y, name, params, weights)
            # A fully grown tree's case is optional: leave it out if it would
            # make the file too big to keep in the repository.
            if name == "leaf1" and len(encode({**doc, "cases": doc["cases"] + [case]})) > MAX_BYTES:
                print(f"{dataset} {name}: skipped, file would exceed {MAX_BYTES} bytes")
                continue
            doc["cases"].append(case)
            share = len(case["unstable_rows"]) / n
            worst = max(worst, share)
            note = " (more than 1%!)" if share > 0.01 else ""
            subset = f", refit {len(case['pruned_index'])} of them" if "pruned_index" in case else ""
            print(f"{dataset} {name}: leaves {case['n_leaves']}, depth {case['depth']}, "
                  f"nodes {case['node_count']}, path {len(case['path']['ccp_alphas'])} steps{subset}; "
                  f"unstable rows {len(case['unstable_rows'])}/{n} = {share:.2%}{note}; "
                  f"{time.monotonic() - t0:.1f}s")

        path = os.path.join(outdir, f"trees_{dataset}.json")
        text = encode(doc)
        with open(path, "w", encoding="utf-8", newline="\n") as f:
            f.write(text)
        print(f"wrote {path} ({len(text)} bytes)")

    print(f"largest unstable share {worst:.2%}; total {time.monotonic() - started:.1f}s")


if __name__ == "__main__":
    main(sys.argv)
