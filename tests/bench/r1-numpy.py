"""R1 reference in NumPy: 10 correlated normals, sum, 1,000,000 trials.

Run: env -u OPENBLAS_CORETYPE -u OPENBLAS_L2_SIZE python3 tests/bench/r1-numpy.py [--json]
Median of 5 after a warm-up; wall time and process CPU time, like tests/bench/run.ts.
Correlated normals by X = mu + Z (V D^1/2)^T from Sigma = V D V^T (numpy.linalg.eigh),
percentiles by numpy.percentile (its default, Hyndman-Fan type 7).
"""
import json
import sys
import time

import numpy as np

K = 10
N = 1_000_000
i = np.arange(1, K + 1)
mu = 10.0 * i
sd = 1.0 + i / 10.0
R = 0.6 ** np.abs(i[:, None] - i[None, :])
Sigma = np.outer(sd, sd) * R
rng = np.random.default_rng(20260101)


def run():
    w, V = np.linalg.eigh(Sigma)
    B = V * np.sqrt(np.clip(w, 0.0, None))
    Z = rng.standard_normal((N, K))
    X = mu + Z @ B.T
    y = X.sum(axis=1)
    p5, p50, p95 = np.percentile(y, [5, 50, 95])
    return float(y.mean()), float(p5), float(p50), float(p95)


run()
walls, cpus = [], []
for _ in range(5):
    w0, c0 = time.perf_counter(), time.process_time()
    value = run()
    walls.append(time.perf_counter() - w0)
    cpus.append(time.process_time() - c0)
walls.sort()
cpus.sort()
result = {
    "numpy": np.__version__,
    "wallMs": walls[2] * 1000,
    "cpuMs": cpus[2] * 1000,
    "mean": value[0],
    "p5": value[1],
    "p50": value[2],
    "p95": value[3],
}
if "--json" in sys.argv:
    print(json.dumps(result))
else:
    print(f"NumPy {result['numpy']}: R1 median wall {result['wallMs']:.0f} ms, CPU {result['cpuMs']:.0f} ms; "
          f"mean {value[0]:.3f} P5 {value[1]:.3f} P50 {value[2]:.3f} P95 {value[3]:.3f}")
