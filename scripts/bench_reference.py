"""
Vectorised numpy reference for `npm run bench` (scripts/bench.ts): the same work as the
engine's benchmark case, written the way a numpy user would, pinned to one thread.

Case: 100,000 paths x 40 years x 3 correlated lognormal funds; one glide path (80/20 growth
and diversified until 12 years before retirement, then linearly to 30/70 diversified and
bonds, weights read at mid-year); one member aged 25 retiring at 65 (salary 32,000 growing
3 %, 8 % contributions spread through each year in monthly instalments, pot 2,000); blended
annual charges; float32 pots at every age; percentiles at every age (numpy's partition-based
np.percentile); certainty equivalent at lambda = 1.5 (log-sum-exp).

Prints one JSON object: milliseconds (best of several runs, wall clock and CPU time of this
process) for the market step (normals -> correlation -> exp), the walk of one option x member
over a generated market, and the full run, with numpy's version.

    OPENBLAS_NUM_THREADS=1 python3 scripts/bench_reference.py [paths]
"""
import os

for var in ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "MKL_NUM_THREADS", "NUMEXPR_NUM_THREADS"):
    os.environ[var] = "1"

import json  # noqa: E402
import sys  # noqa: E402
import time  # noqa: E402

import numpy as np  # noqa: E402

PATHS = int(sys.argv[1]) if len(sys.argv) > 1 else 100_000
YEARS = 40
BLOCK = 10_000
MEAN = np.array([0.07, 0.05, 0.03])
VOL = np.array([0.16, 0.10, 0.05])
CHARGE = np.array([0.003, 0.004, 0.002])
CORR = np.array([[1, 0.7, 0.1], [0.7, 1, 0.25], [0.1, 0.25, 1]])
PERCENTILES = [5, 10, 25, 50, 75, 90, 95]
INFLATION = 0.025
LAMBDA = 1.5

# Lognormal matched to the arithmetic mean and standard deviation of the simple return.
SIG2 = np.log1p(VOL**2 / (1 + MEAN) ** 2)
MU = np.log1p(MEAN) - SIG2 / 2
A = (np.linalg.cholesky(CORR) * np.sqrt(SIG2)[:, None]).T  # x = z @ A gives diag(sigma) L z

# Glide-path weights held through each year, read at years to retirement n - y - 1/2.
start = np.array([0.8, 0.2, 0.0])
end = np.array([0.0, 0.3, 0.7])
to_go = YEARS - np.arange(YEARS) - 0.5
t = np.clip(to_go / 12, 0, 1)[:, None]
WEIGHTS = end + (start - end) * t  # (years, funds)
NET = 1 - WEIGHTS @ CHARGE  # 1 - blended charge
CONTRIB = 0.08 * 32_000 * 1.03 ** np.arange(YEARS)
DEFLATORS = (1 + INFLATION) ** np.arange(1, YEARS + 1)

rng = np.random.default_rng(2024)


def market(n):
    """Gross returns (years, funds, paths): normals -> correlation -> exp."""
    z = rng.standard_normal((YEARS * n, 3))
    x = z @ A
    x += MU
    np.exp(x, out=x)
    return x.reshape(YEARS, n, 3).transpose(0, 2, 1)


def walk(gross, bands):
    """One option x member over a market block; returns the pots at retirement."""
    n = gross.shape[2]
    pot = np.full(n, 2000.0)
    for y in range(YEARS):
        q = WEIGHTS[y] @ gross[y] * NET[y]
        spread = (q - 1) / (12 * (q ** (1 / 12) - 1))  # monthly instalments: s(q) = i / i^(12)
        pot = pot * q + CONTRIB[y] * spread
        if bands is not None:
            bands[y, :] = pot
    return pot


def full_run():
    bands = np.empty((YEARS, PATHS), dtype=np.float32)
    terminal = np.empty(PATHS)
    for first in range(0, PATHS, BLOCK):
        n = min(BLOCK, PATHS - first)
        terminal[first : first + n] = walk(market(n), bands[:, first : first + n])
    per_age = np.percentile(bands, PERCENTILES, axis=1)
    real = terminal / DEFLATORS[-1]
    e = 1 - 2 * LAMBDA
    a = e * np.log(real)
    m = a.max()
    ce = np.exp((m + np.log(np.mean(np.exp(a - m)))) / e)
    return per_age, ce


def best(fn, runs):
    wall, cpu = float("inf"), float("inf")
    for _ in range(runs):
        w0, c0 = time.perf_counter(), time.process_time()
        fn()
        wall = min(wall, time.perf_counter() - w0)
        cpu = min(cpu, time.process_time() - c0)
    return {"wallMs": wall * 1000, "cpuMs": cpu * 1000}


def market_all():
    for first in range(0, PATHS, BLOCK):
        market(min(BLOCK, PATHS - first))


stored = market(BLOCK)


def walk_all():
    for _ in range(PATHS // BLOCK):
        walk(stored, None)


print(
    json.dumps(
        {
            "numpy": np.__version__,
            "paths": PATHS,
            "years": YEARS,
            "funds": 3,
            "market": best(market_all, 3),
            "walk": best(walk_all, 3),
            "full": best(full_run, 2),
        }
    )
)
