"""Reference values for the edge cases of the templates (tests/template_edges.rs):
inputs at the ends of each template's range, where cancellation, poles, 0/0 limits and
narrow scan ranges used to bite. Each value is computed independently of the
catalogue's formulas, mostly in 50-digit arithmetic with mpmath, and printed as: check
name, library and version, function, value. The Rust tests hold these values as
numbers; they never run Python.

python3 -m venv venv && venv/bin/pip install mpmath scipy fluids ht thermo numpy-financial
venv/bin/python tests/reference/edge_values.py
"""
from importlib.metadata import version

import fluids
import ht
import mpmath as mp
import numpy_financial as npf
import thermo
from fluids.friction import Colebrook, Serghides_1
from scipy.optimize import brentq

mp.mp.dps = 50
G = mp.mpf("9.80665")


def show(name, lib, func, value):
    print(f"{name:46s} {lib:22s} {func:58s} {float(value)!r}")


v = lambda p: f"{p} {version(p)}"
MP = v("mpmath")

# mechanics.catenary-span-sag: s = a (cosh(S/2a) - 1), a = H/w, solved for H in 50 digits.
def catenary_h(span, sag, w):
    span, sag, w = mp.mpf(span), mp.mpf(sag), mp.mpf(w)
    g = lambda a: a * (mp.cosh(span / (2 * a)) - 1) - sag
    a0 = span * span / (8 * sag)  # the parabola, a start only
    return w * mp.findroot(g, a0)


for span, sag, w in [(50, 2, 20), (50, 0.5, 20), (120, 6, 15), (300, 30, 50), (8, 0.2, 400), (30, 1.2, 5)]:
    show(f"catenary H span={span} sag={sag} w={w}", MP, "findroot on a(cosh(S/2a)-1) = s", catenary_h(span, sag, w))
# a taut stay: wS/2H about 7e-5, where cosh(x) - 1 keeps only about 8 digits
show("catenary H taut span=30 sag=0.0005 w=50", MP, "findroot on a(cosh(S/2a)-1) = s", catenary_h(30, "0.0005", 50))
# the sag of that stay at a given tension
H, S, w = mp.mpf("11250000"), mp.mpf(30), mp.mpf(50)
show("catenary sag taut H=11250 kN S=30 w=50", MP, "a(cosh(S/2a)-1), a = H/w", H / w * (mp.cosh(w * S / (2 * H)) - 1))

# mechanics.catenary-span-length: Lc = 2a sinh(S/2a), solved for H
def catenary_h_from_length(span, length, w):
    span, length, w = mp.mpf(span), mp.mpf(length), mp.mpf(w)
    g = lambda a: 2 * a * mp.sinh(span / (2 * a)) - length
    sag = mp.sqrt(3 * span * (length - span) / 8)
    return w * mp.findroot(g, span * span / (8 * sag))


show("catenary length H span=50 Lc=51 w=20", MP, "findroot on 2a sinh(S/2a) = Lc", catenary_h_from_length(50, 51, 20))

# thermal.plane-wall-transient: zeta tan zeta = Bi, theta = C1 exp(-zeta^2 Fo) cos(zeta x*)
def wall_theta(bi, fo, xs):
    bi, fo, xs = mp.mpf(bi), mp.mpf(fo), mp.mpf(xs)
    # in the complement u = pi/2 - zeta: tan(u) = (pi/2 - u)/Bi, one root in (0, pi/2)
    u = mp.findroot(lambda u: (mp.pi / 2 - u) * mp.cos(u) - bi * mp.sin(u), (mp.mpf(0), mp.pi / 2), solver="anderson")
    z = mp.pi / 2 - u
    c1 = 4 * mp.sin(z) / (2 * z + mp.sin(2 * z))
    return z, c1, c1 * mp.exp(-z * z * fo) * mp.cos(z * xs)


# the scenario wall: h 15, k 1.4, alpha 0.7 mm^2/s, L 100 mm, t 10 h, x 0
bi, fo = mp.mpf(15) * mp.mpf("0.1") / mp.mpf("1.4"), mp.mpf("0.7e-6") * 36000 / mp.mpf("0.01")
_, _, theta = wall_theta(bi, fo, 0)
show("plane wall Ti for T=0 Tinf=10 (degC)", MP, "Ti = Tinf + (T - Tinf)/theta, one term", 10 + (0 - 10) / theta)
show("plane wall Ti for T=7 Tinf=10 (degC)", MP, "Ti = Tinf + (T - Tinf)/theta, one term", 10 + (7 - 10) / theta)
show("plane wall Ti for T=9.9 Tinf=10 (degC)", MP, "Ti = Tinf + (T - Tinf)/theta, one term", 10 + (mp.mpf("9.9") - 10) / theta)
# Bi = 1e9: zeta is within 1.6e-9 of pi/2
z, c1, theta = wall_theta(mp.mpf("1e9"), mp.mpf("1e-6") * 3600 / 10000, 0)
show("plane wall zeta1 at Bi=1e9", MP, "findroot on zeta tan zeta = Bi", z)
show("plane wall pi/2 - zeta1 at Bi=1e9", MP, "findroot on zeta tan zeta = Bi", mp.pi / 2 - z)
show("plane wall C1 at Bi=1e9", MP, "4 sin z/(2z + sin 2z)", c1)
show("plane wall T at Bi=1e9 Fo=3.6e-7 (degC)", MP, "Tinf + (Ti - Tinf) theta, Ti=55 Tinf=10", 10 + 45 * theta)

# coastal.wave-dispersion: omega^2 = g k tanh(k h), solved for L = 2 pi / k
def wavelength(period, depth):
    period, depth = mp.mpf(period), mp.mpf(depth)
    w = 2 * mp.pi / period
    k0 = max(w * w / G, w / mp.sqrt(G * depth))
    k = mp.findroot(lambda k: G * k * mp.tanh(k * depth) - w * w, k0)
    return 2 * mp.pi / k


show("wave L T=1200 h=4000 (tsunami)", MP, "findroot on w^2 = g k tanh(k h)", wavelength(1200, 4000))
show("wave L T=44640 h=4000 (tide)", MP, "findroot on w^2 = g k tanh(k h)", wavelength(44640, 4000))
show("wave L T=10 h=10", MP, "findroot on w^2 = g k tanh(k h)", wavelength(10, 10))

# thermal.hx-effectiveness-ntu and thermal.hx-lmtd at Cr = 1 exactly: ht's counterflow
# effectiveness at Cr = 1 is NTU/(1 + NTU)
C = 2 * 4190.0
NTU = 900 * 25 / C
eff = ht.hx.effectiveness_from_NTU(NTU, 1.0, subtype="counterflow")
show("hx eff at Cr=1 NTU=22500/8380", v("ht"), "hx.effectiveness_from_NTU(NTU, 1, counterflow)", eff)
show("hx Tho at Cr=1 Thi=80 Tci=15 (degC)", v("ht"), "Thi - eff (Thi - Tci)", 80 - eff * 65)
# just off Cr = 1 (Cc = Ch (1 + 1e-10)), in 50 digits; the plain formula loses digits here
ntu, cr = mp.mpf(900 * 25) / mp.mpf(C), 1 / (1 + mp.mpf("1e-10"))
e = (1 - mp.exp(-ntu * (1 - cr))) / (1 - cr * mp.exp(-ntu * (1 - cr)))
show("hx Tho at Cr=1/(1+1e-10) (degC)", MP, "(1-exp(-m))/(1-Cr exp(-m)), 50 digits", 80 - e * 65)

# gas.area-mach at an area ratio of 1e6, both roots (NACA Report 1135 eq. 80)
def area_ratio(m, g):
    return 1 / m * ((2 / (g + 1)) * (1 + (g - 1) / 2 * m * m)) ** ((g + 1) / (2 * (g - 1)))


for g in ["1.4", "1.7"]:
    gm = mp.mpf(g)
    gap = lambda m: mp.log(area_ratio(m, gm)) - mp.log(mp.mpf("1e6"))
    sub = mp.findroot(gap, (mp.mpf("1e-8"), mp.mpf("1e-5")), solver="anderson")
    sup = mp.findroot(gap, (mp.mpf(2), mp.mpf(1000)), solver="anderson")
    show(f"area-mach AR=1e6 g={g} subsonic M", MP, "findroot on ln A/A* = ln 1e6", sub)
    show(f"area-mach AR=1e6 g={g} supersonic M", MP, "findroot on ln A/A* = ln 1e6", sup)

# gas.fanno: a long duct, fL*/D = 1e10 (g = 1.4), subsonic M
fanno = lambda m, g: (1 - m * m) / (g * m * m) + (g + 1) / (2 * g) * mp.log((g + 1) * m * m / (2 + (g - 1) * m * m))
gm = mp.mpf("1.4")
show("fanno fLD=1e10 g=1.4 subsonic M", MP, "findroot on the Fanno parameter", mp.exp(mp.findroot(lambda t: mp.log(fanno(mp.exp(t), gm) / mp.mpf("1e10")), (mp.log("1e-7"), mp.log("1e-3")), solver="anderson")))

# gas.prandtl-meyer with g = 1.1: nu = 200 deg is beyond the old bound of 130.45 deg
pm = lambda m, g: mp.sqrt((g + 1) / (g - 1)) * mp.atan(mp.sqrt((g - 1) / (g + 1) * (m * m - 1))) - mp.atan(mp.sqrt(m * m - 1))
gm = mp.mpf("1.1")
show("prandtl-meyer g=1.1 nu=200deg M", MP, "findroot on the Prandtl-Meyer function", mp.findroot(lambda m: pm(m, gm) - mp.radians(200), (mp.mpf(2), mp.mpf(1000)), solver="anderson"))
show("prandtl-meyer numax g=1.1 (deg)", MP, "90 (sqrt((g+1)/(g-1)) - 1)", 90 * (mp.sqrt(mp.mpf("2.1") / mp.mpf("0.1")) - 1))

# finance.loan-payment at tiny rates: A = P r / (1 - (1 + r)^-N) in 50 digits
for r in ["1e-12", "1e-9", "1e-6"]:
    rr = mp.mpf(r)
    show(f"loan A r={r} N=360 P=1e6", MP, "P r/(1 - (1+r)^-N), 50 digits", 10**6 * rr / (1 - (1 + rr) ** -360))
show("loan A r=0 N=360 P=1e6", "-", "P/N (the limit)", mp.mpf(10**6) / 360)
show("loan pmt r=1e-9 numpy-financial", v("numpy-financial"), "pmt(1e-9, 360, -1e6)", npf.pmt(1e-9, 360, -1e6))

# finance.irr beyond the old scan (-95 % to 500 %)
show("irr [-1, 8]", v("numpy-financial"), "irr([-1, 8])", npf.irr([-1, 8]))
show("irr [-100, 3]", v("numpy-financial"), "irr([-100, 3])", npf.irr([-100, 3]))

# thermo.peng-robinson at a pressure where Z > 3 (n-butane, 350 K, 3000 bar)
pr = thermo.eos.PR(Tc=425.1, Pc=37.96e5, omega=0.200, T=350.0, P=3000e5)
show("PR n-butane 350K 3000bar V_l", v("thermo"), "eos.PR(...).V_l", pr.V_l)
show("PR n-butane 350K 3000bar Z", v("thermo"), "P V_l/(R T)", 3000e5 * pr.V_l / (8.314462618 * 350.0))

# pipes.colebrook solved for the diameter (a case the old start missed)
f_, re_, eps_ = 1.305586e-2, 5.221790e5, 6.937779e-8
d = brentq(lambda d: Colebrook(re_, eps_ / d) - f_, 0.01, 10.0, xtol=1e-15, rtol=1e-15)
show("colebrook D for f=0.01305586 Re=522179", v("fluids") + "+" + v("scipy"), "brentq on friction.Colebrook(Re, eps/D) - f", d)
# the starter against its published form
show("serghides Re=1e5 eD=1e-4", v("fluids"), "friction.Serghides_1(1e5, 1e-4)", Serghides_1(1e5, 1e-4))
show("serghides Re=4000 eD=0.05", v("fluids"), "friction.Serghides_1(4000, 0.05)", Serghides_1(4000, 0.05))

# channels.manning-circular at a depth of 5e-7 D (the old scan started at 1e-6 D)
D_, n_, S_ = mp.mpf(20), mp.mpf("0.008"), mp.mpf("0.5")
def manning_q(y):
    th = 2 * mp.acos(1 - 2 * y / D_)
    A = D_ * D_ / 8 * (th - mp.sin(th))
    P = D_ * th / 2
    return A * (A / P) ** (mp.mpf(2) / 3) * mp.sqrt(S_) / n_
show("manning circular Q at y=1e-5 D=20 S=0.5 n=0.008", MP, "Manning with the segment geometry", manning_q(mp.mpf("1e-5")))

print("versions:", v("mpmath"), v("scipy"), v("fluids"), v("ht"), v("thermo"), v("numpy-financial"))
