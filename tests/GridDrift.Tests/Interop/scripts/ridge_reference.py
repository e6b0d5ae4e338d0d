"""numpy ridge on standardized data, read as JSON {"x": [[...]...], "y": [...], "lambda": L} on stdin.

Z = (X - mean) / std and t = (y - mean) / std (population std, ddof = 0), then
w = solve(Z'Z + lambda n I, Z't) with numpy.linalg.solve. Prints JSON {"w": [...]}.
"""
import sys, json
import numpy as np

d = json.load(sys.stdin)
x, y, lam = np.array(d["x"], float), np.array(d["y"], float), float(d["lambda"])
z = (x - x.mean(0)) / x.std(0)
t = (y - y.mean()) / y.std()
n, p = z.shape
w = np.linalg.solve(z.T @ z + lam * n * np.eye(p), z.T @ t)
print(json.dumps({"w": w.tolist()}))
