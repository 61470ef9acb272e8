"""SMOTE reference for the export's balancing tests: imbalanced-learn's SMOTE on the same data.

Reads JSON {"X": [[...], ...], "y": [...], "k": 5, "seed": 1} on stdin and prints JSON
{"counts": {class: n}, "synthetic": [[...], ...], "synthetic_y": [...]}: the class counts after
resampling and the rows imbalanced-learn added (it appends them after the originals).
SMOTE: Chawla, Bowyer, Hall & Kegelmeyer, JAIR 16:321-357, 2002. Run with /usr/bin/python3
(Debian's python3-imblearn).
"""
import json
import sys

import numpy as np
from imblearn.over_sampling import SMOTE

data = json.load(sys.stdin)
X = np.asarray(data["X"], dtype=float)
y = np.asarray(data["y"])
Xr, yr = SMOTE(k_neighbors=int(data["k"]), random_state=int(data["seed"])).fit_resample(X, y)
labels, counts = np.unique(yr, return_counts=True)
json.dump(
    {
        "counts": {str(l): int(c) for l, c in zip(labels, counts)},
        "synthetic": Xr[len(X):].tolist(),
        "synthetic_y": [str(v) for v in yr[len(X):]],
    },
    sys.stdout,
)
