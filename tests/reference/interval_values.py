"""Exact values of the language's library functions at chosen doubles, for
tests/interval_props.rs: each enclosure of a point must hold the exact value.

Each line printed is a Rust row: (function, x, nearest double, side), where side is
the sign of (exact value − nearest double): −1, 0 or 1; computed with mpmath at 50
significant digits. The Rust tests hold these rows; they never run Python.

python -m venv venv && venv/bin/pip install mpmath && venv/bin/python interval_values.py
"""
from importlib.metadata import version

import mpmath as mp

mp.mp.dps = 50

FUNCTIONS = {
    "sqrt": mp.sqrt, "cbrt": lambda x: mp.sign(x) * mp.cbrt(abs(x)), "exp": mp.exp, "ln": mp.log,
    "expm1": mp.expm1, "log1p": mp.log1p, "log10": mp.log10,
    "log2": lambda x: mp.log(x, 2), "sin": mp.sin, "cos": mp.cos, "tan": mp.tan,
    "sec": mp.sec, "csc": mp.csc, "cot": mp.cot, "asin": mp.asin, "acos": mp.acos,
    "atan": mp.atan, "sinh": mp.sinh, "cosh": mp.cosh, "tanh": mp.tanh,
    "asinh": mp.asinh, "acosh": mp.acosh, "atanh": mp.atanh,
}

POINTS = {
    "sqrt": [2.0, 0.1, 1e-300, 1.7e308],
    "cbrt": [2.0, -0.1, 1e-300, 3.0],
    "exp": [1.0, -745.0, 709.0, 1e-10, 0.6931471805599453],
    "ln": [2.0, 1.0000000000000002, 1e-300, 0.1],
    "expm1": [1e-10, -1e-5, 0.5, 30.0],
    "log1p": [1e-10, -0.5, 1e10, 2.220446049250313e-16],
    "log10": [2.0, 1e-5, 7.0, 1e300],
    "log2": [3.0, 0.1, 1e100],
    "sin": [3.141592653589793, 1.5707963267948966, 355.0, 1e6, 1e-8, 22.0],
    "cos": [1.5707963267948966, 3.141592653589793, 355.0, 1e6, 0.1],
    "tan": [1.5707963267948966, 1.5707963267948963, 355.0, 1e6, 0.5],
    "sec": [1.5707963267948966, 3.0, 1e6],
    "csc": [3.141592653589793, 1e-8, 2.0],
    "cot": [3.141592653589793, 1.5707963267948966, 0.5],
    "asin": [0.5, 0.9999999999, -1e-10],
    "acos": [0.5, -0.9999999999, 1e-10],
    "atan": [1.0, 1e10, -0.3],
    "sinh": [1e-10, 2.0, 700.0],
    "cosh": [1e-5, 2.0, -700.0],
    "tanh": [1e-10, 0.5, 19.0],
    "asinh": [1e-10, 2.0, 1e300],
    "acosh": [1.0000000001, 2.0, 1e300],
    "atanh": [1e-10, 0.5, 0.9999999999],
}

print(f"// mpmath {version('mpmath')}, mp.dps = 50")
for name, xs in POINTS.items():
    for x in xs:
        v = FUNCTIONS[name](mp.mpf(x))
        hi = float(v)
        side = int(mp.sign(v - mp.mpf(hi)))
        print(f'    ("{name}", {x!r}, {hi!r}, {side}),')
