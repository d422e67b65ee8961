"""SciPy's bracketing root finders on the benchmark's problem sets, counted exactly.

Run by `cargo run --release --example bench_methods` when Python with SciPy is found;
not needed by CI. Reads one case a line on standard input,

    set <TAB> index <TAB> family <TAB> p0 <TAB> p1 <TAB> p2 <TAB> a <TAB> b

(numbers written so that they read back exactly), and prints one line per case and
method,

    set <TAB> index <TAB> method <TAB> evaluations <TAB> root <TAB> converged

then a last line `# versions: ...`. The stopping rule is the benchmark's for every
method: the final bracket no wider than 4 eps |x| + 4 tiny (tiny = the smallest normal
double), no stop on |f| other than an exact zero. Evaluations are counted by a wrapper
around f (one per abscissa, also when `find_root` passes several at once).
"""

import math
import platform
import sys
import warnings
from importlib.metadata import version

import numpy as np
from scipy.optimize import brentq, toms748
from scipy.optimize.elementwise import find_root

from bracketing_families import family

EPS = np.finfo(float).eps
TINY = np.finfo(float).tiny
XTOL = 4 * TINY
RTOL = 4 * EPS


class Counted:
    """f(x) of one case in double precision, counting every abscissa."""

    def __init__(self, fam, p):
        self.fam = fam
        self.p = p
        self.count = 0

    def scalar(self, x):
        self.count += 1
        try:
            return float(self.fam(float(x), self.p, math))
        except (ValueError, ZeroDivisionError, OverflowError):
            return float("nan")

    def elementwise(self, x):
        x = np.asarray(x, dtype=float)
        out = np.array([self.scalar(v) for v in x.ravel()], dtype=float)
        return out.reshape(x.shape)


def run_find_root(fam, p, a, b):
    c = Counted(fam, p)
    res = find_root(
        c.elementwise,
        (a, b),
        tolerances=dict(xatol=XTOL, xrtol=RTOL, fatol=0.0, frtol=0.0),
    )
    return c.count, float(res.x), bool(res.success)


def run_classic(solver):
    """brentq or toms748 (scalar calls, full output) as a runner."""

    def run(fam, p, a, b):
        c = Counted(fam, p)
        try:
            x, r = solver(
                c.scalar, a, b, xtol=XTOL, rtol=RTOL, maxiter=10_000, full_output=True, disp=False
            )
            return c.count, float(x), bool(r.converged)
        except (ValueError, RuntimeError):
            return c.count, float("nan"), False

    return run


METHODS = [
    ("find_root", run_find_root),
    ("brentq", run_classic(brentq)),
    ("toms748", run_classic(toms748)),
]


def main():
    warnings.simplefilter("ignore")
    out = sys.stdout
    for line in sys.stdin:
        line = line.strip()
        if not line:
            continue
        name, index, fam_name, p0, p1, p2, a, b = line.split("\t")
        fam = family(fam_name)
        p = (float(p0), float(p1), float(p2))
        a, b = float(a), float(b)
        for method, run in METHODS:
            n, x, ok = run(fam, p, a, b)
            out.write(f"{name}\t{index}\t{method}\t{n}\t{x!r}\t{int(ok)}\n")
    out.write(
        f"# versions: Python {platform.python_version()}, NumPy {version('numpy')}, "
        f"SciPy {version('scipy')}\n"
    )


if __name__ == "__main__":
    main()
