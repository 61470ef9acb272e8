"""Same-run baseline for the export benchmark: pandas + imbalanced-learn doing the filter, SMOTE
(within alloy, on the training rows, k = 5) and CSV write of the same rows and columns.

Usage: /usr/bin/python3 bench/export_baseline.py INPUT.csv OUTDIR SEED
Reading INPUT.csv is not timed; prints JSON {"seconds": ..., "synthetic": ...}.
"""
import json
import sys
import time

import pandas as pd
from imblearn.over_sampling import SMOTE

src, out, seed = sys.argv[1], sys.argv[2], int(sys.argv[3])
df = pd.read_csv(src, low_memory=False)

t0 = time.perf_counter()
df = df[(df["status"] == "accepted") & df["label"].notna()]
meta = ["record_id", "source_id", "alloy", "split", "is_synthetic", "synthetic_parents", "sample_weight", "label", "status"]
features = [c for c in df.columns if c not in meta]
train = df[df["split"] == "train"]
parts = [train]
synthetic = 0
for alloy, g in train.groupby("alloy"):
    if g["label"].nunique() < 2:
        continue
    X = g[features].fillna(g[features].median()).fillna(0)
    Xr, yr = SMOTE(k_neighbors=5, random_state=seed).fit_resample(X, g["label"])
    extra = Xr.iloc[len(X):].copy()
    extra["label"] = yr.iloc[len(X):].values
    extra["alloy"] = alloy
    extra["split"] = "train"
    extra["is_synthetic"] = 1
    synthetic += len(extra)
    parts.append(extra)
pd.concat(parts, ignore_index=True).to_csv(f"{out}/train.csv", index=False)
for split in ("validation", "test"):
    df[df["split"] == split].to_csv(f"{out}/{split}.csv", index=False)
print(json.dumps({"seconds": time.perf_counter() - t0, "synthetic": synthetic}))
