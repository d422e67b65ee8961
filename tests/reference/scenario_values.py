"""Computes the dependent default value of each template from the others, so that the
defaults of src/templates/catalogue.json satisfy their equations (the demo scenario of
demo/scenario.md). Formulas are written here independently of the catalogue text and
solved with scipy.optimize.brentq.

Run:  python3 tests/reference/scenario_values.py          (prints)
      python3 tests/reference/scenario_values.py --write  (updates the catalogue)
"""

import json
import math
import re
import sys
from pathlib import Path

from scipy.optimize import brentq

G = 9.80665
R = 8.314462618
KB, Q_E = 1.380649e-23, 1.602176634e-19
CAT = Path(__file__).resolve().parents[2] / "src" / "templates" / "catalogue.json"


def colebrook(re, rr):
    g = lambda f: 1 / math.sqrt(f) + 2 * math.log10(rr / 3.7 + 2.51 / (re * math.sqrt(f)))
    return brentq(g, 1e-4, 1.0, xtol=1e-16, rtol=1e-15)


def manning(area, perim, s, n):
    return area * (area / perim) ** (2 / 3) * math.sqrt(s) / n


def dependent(t, v):
    """The dependent symbol of template t and its value, from the SI values v."""
    i = t["id"]
    if i == "pipes.colebrook":
        return "f", colebrook(v["Re"], v["eps"] / v["D"])
    if i == "pipes.darcy-colebrook":
        vel = 4 * v["Q"] / (math.pi * v["D"] ** 2)
        f = colebrook(vel * v["D"] / v["nu"], v["eps"] / v["D"])
        return "hf", f * v["L"] / v["D"] * vel**2 / (2 * G)
    if i == "pipes.hazen-williams":
        return "hf", 10.67 * v["L"] * v["Q"] ** 1.852 / (v["C"] ** 1.852 * v["D"] ** 4.8704)
    if i == "pipes.pump-operating-point":
        def g(q):
            vel = 4 * q / (math.pi * v["D"] ** 2)
            f = colebrook(vel * v["D"] / v["nu"], v["eps"] / v["D"])
            pump = v["H0"] - (v["H0"] - v["Hr"]) * (q / v["Qr"]) ** 2
            return pump - v["Hs"] - (f * v["L"] / v["D"] + v["K"]) * vel**2 / (2 * G)
        return "Q", brentq(g, 0.01 * v["Qr"], v["Qr"] * 2, xtol=1e-16, rtol=1e-15)
    if i == "channels.manning-rectangular":
        b, y = v["b"], v["y"]
        return "Q", manning(b * y, b + 2 * y, v["S"], v["n"])
    if i == "channels.manning-trapezoidal":
        b, y, z = v["b"], v["y"], v["z"]
        return "Q", manning((b + z * y) * y, b + 2 * y * math.sqrt(1 + z * z), v["S"], v["n"])
    if i == "channels.manning-circular":
        d, y = v["D"], v["y"]
        th = 2 * math.acos(1 - 2 * y / d)
        return "Q", manning(d * d / 8 * (th - math.sin(th)), d * th / 2, v["S"], v["n"])
    if i == "channels.critical-depth-trapezoidal":
        b, z, q = v["b"], v["z"], v["Q"]
        g = lambda y: q * q * (b + 2 * z * y) - G * ((b + z * y) * y) ** 3
        return "y", brentq(g, 1e-6, 50, xtol=1e-16, rtol=1e-15)
    if i == "coastal.wave-dispersion":
        T, h = v["T"], v["h"]
        g = lambda L: (2 * math.pi / T) ** 2 - G * (2 * math.pi / L) * math.tanh(2 * math.pi * h / L)
        return "L", brentq(g, 0.1, 1e4, xtol=1e-14, rtol=1e-15)
    if i == "gas.area-mach":
        M, k = v["M"], v["g"]
        return "AR", 1 / M * ((2 / (k + 1)) * (1 + (k - 1) / 2 * M * M)) ** ((k + 1) / (2 * (k - 1)))
    if i == "gas.prandtl-meyer":
        M, k = v["M"], v["g"]
        r = math.sqrt((k + 1) / (k - 1))
        return "nu", r * math.atan(math.sqrt((M * M - 1) / r**2)) - math.atan(math.sqrt(M * M - 1))
    if i == "gas.fanno":
        M, k = v["M"], v["g"]
        return "fLD", (1 - M * M) / (k * M * M) + (k + 1) / (2 * k) * math.log(
            (k + 1) * M * M / (2 + (k - 1) * M * M))
    if i == "structures.secant-column":
        A, e, c, r, Le, E = (v[s] for s in ("A", "e", "c", "r", "Le", "E"))
        g = lambda P: P / A * (1 + e * c / r**2 / math.cos(Le / (2 * r) * math.sqrt(P / (E * A)))) - v["smax"]
        pe = math.pi**2 * E * A * r * r / Le**2
        return "P", brentq(g, 1e-6, pe * 0.999999, xtol=1e-12, rtol=1e-15)
    if i == "structures.deflection-simply-supported-udl":
        return "I", 5 * v["w"] * v["L"] ** 4 * v["n"] / (384 * v["E"] * v["L"])
    if i == "structures.deflection-cantilever-point":
        return "I", v["P"] * v["L"] ** 3 * v["n"] / (3 * v["E"] * v["L"])
    if i.startswith("structures.beam-frequency"):
        k = int(v["mode"])
        if i.endswith("cantilever"):
            bl = brentq(lambda x: math.cos(x) * math.cosh(x) + 1, (k - 1) * math.pi, k * math.pi, xtol=1e-15)
        elif i.endswith("clamped-clamped"):
            bl = brentq(lambda x: math.cos(x) * math.cosh(x) - 1, k * math.pi, (k + 1) * math.pi, xtol=1e-15)
        else:
            bl = brentq(lambda x: math.sin(x) * math.cosh(x) - math.cos(x) * math.sinh(x),
                        k * math.pi, (k + 0.5) * math.pi, xtol=1e-15)
        return "fn", bl**2 / (2 * math.pi * v["L"] ** 2) * math.sqrt(v["E"] * v["I"] / v["m"])
    if i == "thermal.plane-wall-transient":
        bi = v["h"] * v["L"] / v["k"]
        z = brentq(lambda z: z * math.tan(z) - bi, 1e-12, math.pi / 2 - 1e-12, xtol=1e-16)
        c1 = 4 * math.sin(z) / (2 * z + math.sin(2 * z))
        fo = v["alpha"] * v["t"] / v["L"] ** 2
        th = c1 * math.exp(-z * z * fo) * math.cos(z * v["x"] / v["L"])
        return "T", v["Tinf"] + th * (v["Ti"] - v["Tinf"])
    if i in ("thermal.hx-lmtd", "thermal.hx-effectiveness-ntu"):
        ch, cc = v["mh"] * v["cph"], v["mc"] * v["cpc"]
        cmin, cmax = min(ch, cc), max(ch, cc)
        cr, ntu = cmin / cmax, v["U"] * v["A"] / cmin
        eff = (1 - math.exp(-ntu * (1 - cr))) / (1 - cr * math.exp(-ntu * (1 - cr)))
        return "Tho", v["Thi"] - eff * cmin * (v["Thi"] - v["Tci"]) / ch
    if i == "electrical.pv-single-diode":
        vt = v["n"] * v["Ns"] * KB * v["T"] / Q_E
        g = lambda I: v["IL"] - v["I0"] * (math.exp((v["V"] + I * v["Rs"]) / vt) - 1) - (v["V"] + I * v["Rs"]) / v["Rsh"] - I
        return "I", brentq(g, -50, 50, xtol=1e-16, rtol=1e-15)
    if i == "electrical.diode-resistor":
        vt = v["n"] * KB * v["T"] / Q_E
        g = lambda I: I * v["R"] + vt * math.log(1 + I / v["Is"]) - v["Vs"]
        return "I", brentq(g, 1e-15, v["Vs"] / v["R"], xtol=1e-18, rtol=1e-15)
    if i in ("thermo.peng-robinson", "thermo.van-der-waals"):
        T, P, Tc, Pc = v["T"], v["P"], v["Tc"], v["Pc"]
        if i == "thermo.peng-robinson":
            kap = 0.37464 + 1.54226 * v["w"] - 0.26992 * v["w"] ** 2
            a = 0.45723552892138219 * R**2 * Tc**2 / Pc * (1 + kap * (1 - math.sqrt(T / Tc))) ** 2
            b = 0.077796073903888456 * R * Tc / Pc
            g = lambda V: R * T / (V - b) - a / (V * V + 2 * b * V - b * b) - P
        else:
            a, b = 27 * R**2 * Tc**2 / (64 * Pc), R * Tc / (8 * Pc)
            g = lambda V: R * T / (V - b) - a / V**2 - P
        # the vapour-like root: the largest, below 3RT/P
        hi = 3 * R * T / P
        lo = hi / 3 * 0.3
        return "V", brentq(g, lo, hi, xtol=1e-16, rtol=1e-15)
    if i == "geotech.consolidation-time-factor":
        U = v["U"]
        def u_of(tv):
            q = math.pi**2 * tv / 4
            return 1 - 8 / math.pi**2 * sum(math.exp(-(2 * m + 1) ** 2 * q) / (2 * m + 1) ** 2 for m in range(20))
        tv = brentq(lambda tv: u_of(tv) - U, 1e-4, 5, xtol=1e-16, rtol=1e-15)
        return "t", tv * v["H"] ** 2 / v["cv"]
    if i == "geotech.infinite-slope":
        b = v["b"]
        return "FS", v["c"] / (v["gam"] * v["z"] * math.cos(b) ** 2 * math.tan(b)) + (
            1 - v["hw"] * v["gw"] / (v["gam"] * v["z"])) * math.tan(v["phi"]) / math.tan(b)
    if i == "mechanics.catenary-span-sag":
        S, s, w = v["S"], v["s"], v["w"]
        g = lambda H: H / w * (math.cosh(w * S / (2 * H)) - 1) - s
        return "H", brentq(g, 1e3, 1e9, xtol=1e-12, rtol=1e-15)
    if i == "mechanics.catenary-span-length":
        S, Lc, w = v["S"], v["Lc"], v["w"]
        g = lambda H: 2 * H / w * math.sinh(w * S / (2 * H)) - Lc
        return "H", brentq(g, 1e2, 1e9, xtol=1e-12, rtol=1e-15)
    if i == "finance.loan-payment":
        r, N, P = v["r"], v["N"], v["P"]
        return "A", P * r / (1 - (1 + r) ** (-N))
    if i == "finance.irr":
        c = t["list"]["values"]
        g = lambda r: sum(ck / (1 + r) ** k for k, ck in enumerate(c))
        return "r", brentq(g, -0.5, 1, xtol=1e-16, rtol=1e-15)
    raise KeyError(i)


def main():
    sys.path.insert(0, str(Path(__file__).parent))
    from units_table import to_si, from_si  # noqa: E402

    cat = json.loads(CAT.read_text())
    for t in cat:
        v = {x["symbol"]: to_si(x["value"], x["unit"]) for x in t["variables"]}
        sym, val = dependent(t, v)
        var = next(x for x in t["variables"] if x["symbol"] == sym)
        shown = float(f"{from_si(val, var['unit']):.15g}")
        print(f"{t['id']:45s} {sym:5s} = {shown!r} {var['unit']}")
        var["value"] = shown
    if "--write" in sys.argv:
        # rewrite the one value on the variable's line, keeping the layout of the file
        text = CAT.read_text()
        for t in cat:
            sym, _ = dependent(t, {x["symbol"]: to_si(x["value"], x["unit"]) for x in t["variables"]})
            var = next(x for x in t["variables"] if x["symbol"] == sym)
            start = text.index(f'"id": "{t["id"]}"')
            at = text.index(f'{{"symbol": "{sym}",', start)
            end = text.index("\n", at)
            line = re.sub(r'"value": [^,]+,', f'"value": {var["value"]!r},', text[at:end], count=1)
            text = text[:at] + line + text[end:]
        CAT.write_text(text)


if __name__ == "__main__":
    main()
