"""Reference values for tests/uncertainty.rs, from general-purpose libraries on PyPI.
Each line printed names the value, the library and version, and the function used.
The Rust tests hold these values as numbers; they never run Python.

python -m venv venv && venv/bin/pip install numpy scipy mpmath && venv/bin/python uncertainty_values.py
"""
from importlib.metadata import version

import mpmath as mp
import numpy as np
from scipy import special, stats

mp.mp.dps = 40


def show(name, lib, func, value):
    print(f"{name:44s} {lib:16s} {func:60s} {value!r}")


v = lambda p: f"{p} {version(p)}"

# The coverage factor of a Gaussian for p = 95 %.
show("k_p for p = 0.95", v("scipy"), "stats.norm.ppf(0.975)", float(stats.norm.ppf(0.975)))

# PCG64 (XSL-RR 128/64) from a given state and increment: raw 64-bit outputs and the
# doubles of Generator.random().
state, inc = 0x0123456789ABCDEF_FEDCBA9876543210, 0x0F1E2D3C4B5A6978_8796A5B4C3D2E1F1
bg = np.random.PCG64()
bg.state = {"bit_generator": "PCG64", "state": {"state": state, "inc": inc},
            "has_uint32": 0, "uinteger": 0}
show("pcg64 raw", v("numpy"), "PCG64 with state/inc set, random_raw(4)",
     [int(x) for x in bg.random_raw(4)])
bg.state = {"bit_generator": "PCG64", "state": {"state": state, "inc": inc},
            "has_uint32": 0, "uinteger": 0}
show("pcg64 doubles", v("numpy"), "Generator(PCG64 same state).random(3)",
     [float(x) for x in np.random.Generator(bg).random(3)])

# Y = X1 + X2 + X3 + X4, each rectangular with expectation 0 and standard deviation 1
# (half-width sqrt 3): the 97.5 % quantile of the sum, from the Irwin-Hall CDF.
a = mp.sqrt(3)


def irwin_hall_cdf(x, n=4):
    return sum((-1) ** k * mp.binomial(n, k) * (x - k) ** n for k in range(int(mp.floor(x)) + 1)) / mp.factorial(n)


def sum_cdf(y):
    # sum of 4 U(-a, a) = 2a * (IrwinHall(4) - 2)
    return irwin_hall_cdf(y / (2 * a) + 2)


q = mp.findroot(lambda y: sum_cdf(y) - mp.mpf("0.975"), 3.9)
show("rectangular sum 97.5 % quantile", v("mpmath"), "findroot on the Irwin-Hall CDF", float(q))

# X = sqrt(K), K ~ N(4, 0.5^2): quantiles of X are sqrt of those of K.
z = mp.sqrt(2) * mp.erfinv(mp.mpf("0.95"))
show("sqrt N(4, 0.25) 2.5 %", v("mpmath"), "sqrt(4 - 0.5 z), z = sqrt(2) erfinv(0.95)", float(mp.sqrt(4 - 0.5 * z)))
show("sqrt N(4, 0.25) 97.5 %", v("mpmath"), "sqrt(4 + 0.5 z)", float(mp.sqrt(4 + 0.5 * z)))
show("P(N(0.5, 0.25) < 0)", v("scipy"), "stats.norm.cdf(-1)", float(stats.norm.cdf(-1)))
show("W(1), the omega constant", v("scipy"), "special.lambertw(1).real", float(special.lambertw(1).real))
