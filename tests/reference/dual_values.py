"""Derivatives for tests/dual.rs: each function of the language, and four residuals of
engineering practice, differentiated by mpmath (mp.diff at 40 significant digits) at
chosen points. Each line printed is a Rust row: (expression, x, derivative).
The Rust tests hold these rows; they never run Python.

python -m venv venv && venv/bin/pip install mpmath && venv/bin/python dual_values.py
"""
from importlib.metadata import version

import mpmath as mp

mp.mp.dps = 40

ONE = {
    "sqrt": (mp.sqrt, [0.3, 2.0, 1e6]),
    "cbrt": (lambda x: mp.sign(x) * mp.cbrt(abs(x)), [0.3, -2.0]),
    "exp": (mp.exp, [-1.0, 3.0]),
    "ln": (mp.log, [0.3, 5.0]),
    "expm1": (mp.expm1, [1e-8, 2.0]),
    "log1p": (mp.log1p, [1e-8, -0.5]),
    "log10": (mp.log10, [0.3, 5.0]),
    "log2": (lambda x: mp.log(x, 2), [0.3, 5.0]),
    "abs": (abs, [-2.0, 3.0]),
    "sin": (mp.sin, [0.3, 4.0]),
    "cos": (mp.cos, [0.3, 4.0]),
    "tan": (mp.tan, [0.3, 1.5]),
    "sec": (mp.sec, [0.3, 1.5]),
    "csc": (mp.csc, [0.3, 3.0]),
    "cot": (mp.cot, [0.3, 3.0]),
    "asin": (mp.asin, [0.3, -0.9]),
    "acos": (mp.acos, [0.3, -0.9]),
    "atan": (mp.atan, [0.3, 10.0]),
    "sinh": (mp.sinh, [0.3, -3.0]),
    "cosh": (mp.cosh, [0.3, -3.0]),
    "tanh": (mp.tanh, [0.3, -3.0]),
    "asinh": (mp.asinh, [0.3, -30.0]),
    "acosh": (mp.acosh, [1.5, 30.0]),
    "atanh": (mp.atanh, [0.3, -0.9]),
    "deg": (mp.degrees, [0.3]),
    "rad": (mp.radians, [30.0]),
}

ROWS = []
for name, (f, xs) in ONE.items():
    for x in xs:
        ROWS.append((f"{name}(x)", x, mp.diff(f, mp.mpf(x))))

# Powers and two-argument functions, differentiated in x.
ROWS.append(("x^3", 1.7, mp.diff(lambda x: x**3, mp.mpf(1.7))))
ROWS.append(("x^2.5", 1.7, mp.diff(lambda x: x**2.5, mp.mpf(1.7))))
ROWS.append(("2^x", 1.7, mp.diff(lambda x: 2**x, mp.mpf(1.7))))
ROWS.append(("x^x", 1.7, mp.diff(lambda x: x**x, mp.mpf(1.7))))
ROWS.append(("atan2(x, 2)", 1.7, mp.diff(lambda x: mp.atan2(x, 2), mp.mpf(1.7))))
ROWS.append(("atan2(2, x)", -1.7, mp.diff(lambda x: mp.atan2(2, x), mp.mpf(-1.7))))
ROWS.append(("hypot(x, 2)", 1.7, mp.diff(lambda x: mp.hypot(x, 2), mp.mpf(1.7))))
ROWS.append(("npv(x, -100, 60, 70)", 0.08,
             mp.diff(lambda r: -100 + 60 / (1 + r) + 70 / (1 + r) ** 2, mp.mpf(0.08))))

# Residuals of engineering practice (the bench_eval expressions), in their unknown.
def colebrook(f):
    return 1 / mp.sqrt(f) + 2 * mp.log10(mp.mpf("4.6e-5") / (mp.mpf("3.7") * mp.mpf("0.3"))
                                      + mp.mpf("2.51") / (mp.mpf("2e5") * mp.sqrt(f)))
ROWS.append(("1/sqrt(x) + 2*log10(4.6e-5/(3.7*0.3) + 2.51/(2e5*sqrt(x)))", 0.02,
             mp.diff(colebrook, mp.mpf(0.02))))

def area_mach(m):
    k = mp.mpf("1.4")
    return (1 / m) * ((2 / (k + 1)) * (1 + (k - 1) / 2 * m**2)) ** ((k + 1) / (2 * (k - 1))) - 2
ROWS.append(("(1/x)*((2/(1.4 + 1))*(1 + (1.4 - 1)/2*x^2))^((1.4 + 1)/(2*(1.4 - 1))) - 2",
             2.2, mp.diff(area_mach, mp.mpf(2.2))))

def manning(y):
    n, b, z, S, Q = mp.mpf("0.013"), 3, 2, mp.mpf("0.0005"), 12
    A = (b + z * y) * y
    P = b + 2 * y * mp.sqrt(1 + z**2)
    return (1 / n) * A * (A / P) ** (mp.mpf(2) / 3) * mp.sqrt(S) - Q
ROWS.append(("(1/0.013)*((3 + 2*x)*x)*(((3 + 2*x)*x)/(3 + 2*x*sqrt(1 + 2^2)))^(2/3)*sqrt(0.0005) - 12",
             1.2, mp.diff(manning, mp.mpf(1.2))))

def column(P):
    A, e, c, r, L, E = mp.mpf("4e-3"), mp.mpf("0.01"), mp.mpf("0.1"), mp.mpf("0.07"), 5, mp.mpf("2e11")
    return P / A * (1 + e * c / r**2 * mp.sec(L / (2 * r) * mp.sqrt(P / (E * A)))) - mp.mpf("2.5e8")
ROWS.append(("x/4e-3*(1 + 0.01*0.1/0.07^2*sec(5/(2*0.07)*sqrt(x/(2e11*4e-3)))) - 2.5e8",
             2e5, mp.diff(column, mp.mpf(2e5))))

print(f"// mpmath {version('mpmath')}, mp.dps = 40, mp.diff")
for text, x, d in ROWS:
    print(f'    ("{text}", {x!r}, {float(d)!r}),')
