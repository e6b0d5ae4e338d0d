"""Significance references, read as JSON {"z": [...], "p": [...], "x": [...], "order": k} on stdin.

Two-sided normal tails 2 norm.sf(|z|) and their log10 (log 2 + norm.logsf(|z|), finite where the
tail underflows) from scipy.stats; Benjamini-Hochberg adjusted p-values from
statsmodels.stats.multitest.multipletests(method="fdr_bh"); Yule-Walker AR coefficients and
innovation standard deviation of order k from statsmodels.regression.linear_model.yule_walker
(method="mle": autocovariances divided by n, mean removed). Prints JSON.
"""
import sys, json
import numpy as np
from scipy import stats
from statsmodels.stats.multitest import multipletests
from statsmodels.regression.linear_model import yule_walker

d = json.load(sys.stdin)
z = np.abs(np.array(d["z"], float))
tails = 2 * stats.norm.sf(z)
log10 = (np.log(2) + stats.norm.logsf(z)) / np.log(10)
q = multipletests(np.array(d["p"], float), method="fdr_bh")[1]
rho, sigma = yule_walker(np.array(d["x"], float), order=d["order"], method="mle")
print(json.dumps({"tails": tails.tolist(), "log10": log10.tolist(), "q": q.tolist(), "ar": rho.tolist(), "sigma": float(sigma)}))
