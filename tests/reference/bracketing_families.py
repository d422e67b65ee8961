"""The formulas of the bracketing benchmark's problem sets, written once for Python.

Each family is f(x, p, m): x the unknown, p the case's three parameters, m a math
namespace (the standard `math` module for float evaluation, `mpmath` for the reference
roots). The Rust transcriptions live in tests/fixtures/engineering.rs and
tests/fixtures/aps748.rs; the benchmark checks every root found by either side against
the high-precision reference, which catches a transcription that differs.

Used by tests/reference/engineering_roots.py (reference roots) and
tests/reference/bench_scipy.py (SciPy's counts).
"""

G = 9.80665  # standard gravity, m/s^2 (CGPM 1901, NIST SP 330)
R_GAS = 8.314462618  # molar gas constant, J/(mol K) (CODATA 2018, exact in the 2019 SI)
DIODE_IS = 1e-14  # saturation current, A
DIODE_VT = 0.025852  # thermal voltage kT/q at 300 K, V (CODATA 2018 constants)


def colebrook(x, p, m):
    re, rr, _ = p
    return 1 / m.sqrt(x) + 2 * m.log10(rr / 3.7 + 2.51 / (re * m.sqrt(x)))


def dispersion(x, p, m):
    period, depth, _ = p
    omega = 2 * m.pi / period
    return G * x * m.tanh(x * depth) - omega * omega


def kepler(x, p, m):
    e, mean, _ = p
    return x - e * m.sin(x) - mean


def area_mach(x, p, m):
    gamma, ratio, _ = p
    base = (2 / (gamma + 1)) * (1 + (gamma - 1) / 2 * x * x)
    return base ** ((gamma + 1) / (2 * (gamma - 1))) / x - ratio


def manning_conveyance(x, m):
    """A R^(2/3) of a circular pipe of diameter 1 running at central angle x."""
    area = (x - m.sin(x)) / 8
    radius = (1 - m.sin(x) / x) / 4
    two_thirds = m.mpf(2) / 3 if hasattr(m, "mpf") else 2 / 3
    return area * radius**two_thirds


def manning(x, p, m):
    q, _, _ = p
    return manning_conveyance(x, m) - q


def diode(x, p, m):
    current, _, _ = p
    return DIODE_IS * (m.exp(x / DIODE_VT) - 1) - current


def arrhenius(x, p, m):
    ea, ratio, _ = p
    return m.exp(-ea / (R_GAS * x)) - ratio


def lambert(x, p, m):
    y, _, _ = p
    return x * m.exp(x) - y


def decay(x, p, m):
    rate, level, _ = p
    return m.exp(-rate * x) - level


def van_der_waals(x, p, m):
    t, pr, _ = p
    return 8 * t / (3 * x - 1) - 3 / (x * x) - pr


def cube_shift(x, p, m):
    c, _, _ = p
    return (x - c) ** 3


def cube_square(x, p, m):
    c, _, _ = p
    return (x * x - c) ** 3


def cube_sine(x, p, m):
    c, _, _ = p
    return (m.sin(x) - c) ** 3


def tanh_level(x, p, m):
    level, _, _ = p
    return m.tanh(x) - level


def exp_inverse(x, p, m):
    level, _, _ = p
    return m.exp(-1 / x) - level


def power_level(x, p, m):
    n, level, _ = p
    return x ** int(n) - level


def atan_level(x, p, m):
    level, _, _ = p
    return m.atan(x) - level


ENGINEERING = {
    "colebrook": colebrook,
    "dispersion": dispersion,
    "kepler": kepler,
    "area_mach": area_mach,
    "manning": manning,
    "diode": diode,
    "arrhenius": arrhenius,
    "lambert": lambert,
    "decay": decay,
    "van_der_waals": van_der_waals,
    "cube_shift": cube_shift,
    "cube_square": cube_square,
    "cube_sine": cube_sine,
    "tanh_level": tanh_level,
    "exp_inverse": exp_inverse,
    "power_level": power_level,
    "atan_level": atan_level,
}


def aps(x, p, m):
    """The Alefeld-Potra-Shi formulas (ACM TOMS 21(3) 1995, Table I), as in
    tests/fixtures/aps748.rs: p = (formula, first parameter, second parameter)."""
    formula, n, q = p
    formula = int(formula)
    if formula == 1:
        return m.sin(x) - x / 2
    if formula == 2:
        s = 0.0
        for i in range(1, 21):
            num = 2 * i - 5
            den = x - i * i
            s += num * num / (den * den * den)
        return -2 * s
    if formula == 3:
        return n * x * m.exp(q * x)
    if formula == 4:
        return x ** int(n) - q
    if formula == 5:
        return m.sin(x) - 0.5
    if formula == 6:
        return 2 * x * m.exp(-n) - 2 * m.exp(-n * x) + 1
    if formula == 7:
        return (1 + (1 - n) * (1 - n)) * x - (1 - n * x) * (1 - n * x)
    if formula == 8:
        return x * x - (1 - x) ** int(n)
    if formula == 9:
        return (1 + (1 - n) ** 4) * x - (1 - n * x) ** 4
    if formula == 10:
        return m.exp(-n * x) * (x - 1) + x ** int(n)
    if formula == 11:
        return (n * x - 1) / ((n - 1) * x)
    if formula == 12:
        return x ** (1 / n) - n ** (1 / n)
    if formula == 13:
        return 0.0 if x == 0 else x * m.exp(-1 / (x * x))
    if formula == 14:
        return n / 20 * (x / 1.5 + m.sin(x) - 1) if x >= 0 else -n / 20
    if formula == 15:
        if x > 2e-3 / (1 + n):
            return m.e - 1.859
        if x >= 0:
            return m.exp((n + 1) * x * 500) - 1.859
        return -0.859
    raise ValueError(f"no APS formula {formula}")


def family(name):
    """The formula of a family by name ("aps" or an engineering family)."""
    if name == "aps":
        return aps
    return ENGINEERING[name]
