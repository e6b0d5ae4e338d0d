"""numpy.percentile with method="hazen" (Hyndman & Fan 1996 definition 5) of the numbers on stdin."""
import sys

import numpy as np

x = np.array([float(t) for t in sys.stdin.read().split()])
print(" ".join(repr(float(v)) for v in np.percentile(x, [10, 50, 90], method="hazen")))
