"""Reference values for tests/templates.rs, computed with general-purpose libraries
from PyPI. Each line printed is: check name, library and version, function, value.
The Rust tests hold these values as numbers; they never run Python.

pip install fluids ht thermo pvlib numpy-financial scipy sympy
"""
import math
from importlib.metadata import version

import fluids
import ht
import numpy_financial as npf
import pvlib
import scipy
import sympy
import thermo
from fluids.friction import Colebrook, Haaland, Swamee_Jain_1976
from fluids.open_flow import V_Manning
from scipy.optimize import brentq
from scipy.special import lambertw

G = 9.80665


def show(name, lib, func, value):
    print(f"{name:40s} {lib:22s} {func:50s} {value!r}")


v = lambda p: f"{p} {version(p)}"

# pipes.colebrook
show("colebrook Re=1e5 eD=1e-4", v("fluids"), "friction.Colebrook(1e5, 1e-4)", Colebrook(1e5, 1e-4))
show("swamee-jain Re=1e5 eD=1e-4", v("fluids"), "friction.Swamee_Jain_1976(1e5, 1e-4)", Swamee_Jain_1976(1e5, 1e-4))
show("haaland Re=1e5 eD=1e-4", v("fluids"), "friction.Haaland(1e5, 1e-4)", Haaland(1e5, 1e-4))
show("colebrook Re=1e6 eD=1e-3", v("fluids"), "friction.Colebrook(1e6, 1e-3)", Colebrook(1e6, 1e-3))

# pipes.darcy-colebrook: 250 mm, 1800 m, 60 L/s, eps 0.05 mm, nu 1.3e-6
D, L, Q, eps, nu = 0.25, 1800.0, 0.060, 0.05e-3, 1.3e-6
V = 4 * Q / (math.pi * D * D)
f = Colebrook(V * D / nu, eps / D)
show("darcy hf D=.25 L=1800 Q=.06", v("fluids"), "Colebrook + Darcy-Weisbach", f * L / D * V * V / (2 * G))

# pipes.pump-operating-point at the catalogue defaults
H0, Qr, Hr, Hs, L, D, eps, nu, K = 62, 0.040, 48, 30, 1500, 0.2, 0.1e-3, 1.004e-6, 12


def sys_gap(q):
    vel = 4 * q / (math.pi * D * D)
    return H0 - (H0 - Hr) * (q / Qr) ** 2 - Hs - (Colebrook(vel * D / nu, eps / D) * L / D + K) * vel * vel / (2 * G)


show("pump operating Q", v("fluids") + "+" + v("scipy"), "brentq on Colebrook system curve", brentq(sys_gap, 0.001, 0.08, xtol=1e-15))

# channels: fluids.open_flow.V_Manning(Rh, S, n)
b, y, S, n = 3.0, 1.1, 0.0015, 0.014
A, P = b * y, b + 2 * y
show("manning rect Q b=3 y=1.1", v("fluids"), "open_flow.V_Manning * A", V_Manning(A / P, S, n) * A)
b, z, y, S, n = 2.0, 1.5, 1.2, 0.0008, 0.022
A, P = (b + z * y) * y, b + 2 * y * math.sqrt(1 + z * z)
show("manning trap Q b=2 z=1.5 y=1.2", v("fluids"), "open_flow.V_Manning * A", V_Manning(A / P, S, n) * A)

# thermal.hx: ht.hx
mh, cph, mc, cpc, U, A, Thi, Tci = 1.5, 4180.0, 2.5, 2100.0, 650.0, 18.0, 90.0 + 273.15, 20.0 + 273.15
ch, cc = mh * cph, mc * cpc
cmin, cmax = min(ch, cc), max(ch, cc)
eff = ht.hx.effectiveness_from_NTU(U * A / cmin, cmin / cmax, subtype="counterflow")
Tho = Thi - eff * cmin * (Thi - Tci) / ch
show("hx counterflow Tho (K)", v("ht"), "hx.effectiveness_from_NTU counterflow", Tho)
Tco = Tci + ch * (Thi - Tho) / cc
show("hx LMTD at that point (K)", v("ht"), "LMTD(Thi,Tho,Tci,Tco,counterflow)", ht.LMTD(Thi, Tho, Tci, Tco, counterflow=True))

# electrical.pv-single-diode: pvlib.pvsystem.i_from_v
IL, I0, Rs, Rsh, nNsVth = 8.2, 5e-10, 0.35, 450.0, 1.2 * 60 * 1.380649e-23 * 298.15 / 1.602176634e-19
show("pv i_from_v V=28", v("pvlib"), "pvsystem.i_from_v(28, ...)", float(pvlib.pvsystem.i_from_v(28.0, IL, I0, Rs, Rsh, nNsVth)))
show("pv nNsVth", "-", "n*Ns*k*T/q", nNsVth)

# electrical.diode-resistor: Lambert W closed form
Vs, R, Is, nVt = 3.3, 470.0, 1e-12, 1.9 * 1.380649e-23 * 300.0 / 1.602176634e-19
I = nVt / R * lambertw(Is * R / nVt * math.exp((Vs + Is * R) / nVt)).real - Is
show("diode-resistor I", v("scipy"), "special.lambertw closed form", float(I))

# thermo: n-butane at 350 K, 9.4573 bar (the state of SVNA Example 3.9)
Tc, Pc, w = 425.1, 37.96e5, 0.200
pr = thermo.eos.PR(Tc=Tc, Pc=Pc, omega=w, T=350.0, P=9.4573e5)
show("PR n-butane V_l", v("thermo"), "eos.PR(...).V_l", pr.V_l)
show("PR n-butane V_g", v("thermo"), "eos.PR(...).V_g", pr.V_g)
vdw = thermo.eos.VDW(Tc=Tc, Pc=Pc, T=350.0, P=9.4573e5)
show("VDW n-butane V_l", v("thermo"), "eos.VDW(...).V_l", vdw.V_l)
show("VDW n-butane V_g", v("thermo"), "eos.VDW(...).V_g", vdw.V_g)

# finance: numpy-financial
show("pmt 0.5%/mo 240 1e6", v("numpy-financial"), "pmt(0.005, 240, -1e6)", float(npf.pmt(0.005, 240, -1e6)))
show("rate 240 -7164.31 1e6", v("numpy-financial"), "rate(240, -7164.31, 1e6, 0)", float(npf.rate(240, -7164.31, 1e6, 0)))
show("nper 0.5% -8000 1e6", v("numpy-financial"), "nper(0.005, -8000, 1e6)", float(npf.nper(0.005, -8000, 1e6)))
show("pv 0.4% 180 -5000", v("numpy-financial"), "pv(0.004, 180, -5000)", float(npf.pv(0.004, 180, -5000)))
flows = [-450000, 52000, 58000, 62000, 66000, 70000, 72000, 74000, 76000, 78000, 80000, 82000, 84000]
show("irr scenario flows", v("numpy-financial"), "irr(flows)", float(npf.irr(flows)))
show("irr [-100, 30, 40, 50, 20]", v("numpy-financial"), "irr([-100,30,40,50,20])", float(npf.irr([-100, 30, 40, 50, 20])))

# structures: sympy beam deflections
from sympy.physics.continuum_mechanics.beam import Beam  # noqa: E402

E_, I_ = 200e9, 5.0e-5
b = Beam(8, E_, I_)
R1, R2 = sympy.symbols("R1 R2")
b.apply_load(R1, 0, -1)
b.apply_load(R2, 8, -1)
b.apply_load(-3000, 0, 0, end=8)
b.bc_deflection = [(0, 0), (8, 0)]
b.solve_for_reaction_loads(R1, R2)
show("ss udl midspan deflection", v("sympy"), "continuum_mechanics.beam.Beam", float(b.deflection().subs(sympy.Symbol("x"), 4)))
c = Beam(2.5, E_, 8.0e-6)
Rc, Mc = sympy.symbols("Rc Mc")
c.apply_load(Rc, 0, -1)
c.apply_load(Mc, 0, -2)
c.apply_load(-2000, 2.5, -1)
c.bc_deflection = [(0, 0)]
c.bc_slope = [(0, 0)]
c.solve_for_reaction_loads(Rc, Mc)
show("cantilever tip deflection", v("sympy"), "continuum_mechanics.beam.Beam", float(c.deflection().subs(sympy.Symbol("x"), 2.5)))

# structures.secant-column: the beam-column equation y'' + k^2 (y + e) = 0, y(0) = y(Le) = 0,
# solved symbolically by sympy, then the largest stress P/A + P (y_mid + e) c / I.
x, k, ecc, Lsym = sympy.symbols("x k e L", positive=True)
yfun = sympy.Function("y")
sol = sympy.dsolve(yfun(x).diff(x, 2) + k**2 * (yfun(x) + ecc), yfun(x), ics={yfun(0): 0, yfun(Lsym): 0})
P_, E_, A_, r_, e_, c_, Le = 400e3, 200e9, 4.0e-3, 0.06, 0.015, 0.09, 4.0
I_ = A_ * r_ * r_
mid = float(sol.rhs.subs(x, Lsym / 2).subs({k: math.sqrt(P_ / (E_ * I_)), ecc: e_, Lsym: Le}))
smax = P_ / A_ + P_ * (mid + e_) * c_ / I_
show("secant column smax (Pa)", v("sympy"), "dsolve of y'' + k^2 (y + e) = 0", smax)

# gas.area-mach and gas.fanno: the subsonic roots, by scipy brentq on the relations of
# NACA Report 1135 eq. 80 and the Fanno parameter (Anderson, Modern Compressible Flow, eq. 3.107)
gam = 1.4
area_ratio = lambda M: 1 / M * ((2 / (gam + 1)) * (1 + (gam - 1) / 2 * M * M)) ** ((gam + 1) / (2 * (gam - 1)))
show("area-mach subsonic M at A/A*=1.6875", v("scipy"), "optimize.brentq on NACA 1135 eq. 80", brentq(lambda M: area_ratio(M) - 1.6875, 0.01, 0.99, xtol=1e-16, rtol=1e-15))
fanno = lambda M: (1 - M * M) / (gam * M * M) + (gam + 1) / (2 * gam) * math.log((gam + 1) * M * M / (2 + (gam - 1) * M * M))
show("fanno subsonic M at fL*/D=0.3050", v("scipy"), "optimize.brentq on the Fanno parameter", brentq(lambda M: fanno(M) - 0.3050, 0.01, 0.99, xtol=1e-16, rtol=1e-15))

# pipes.pump-operating-point: the system head at the operating flow, from fluids Colebrook
H0, Qr, Hr, Hs, L, D, eps, nu, K = 62, 0.040, 48, 30, 1500, 0.2, 0.1e-3, 1.004e-6, 12
q = brentq(sys_gap, 0.001, 0.08, xtol=1e-15)
vel = 4 * q / (math.pi * D * D)
show("pump system head at operating Q", v("fluids"), "Hs + (Colebrook*L/D + K) V^2/2g", Hs + (Colebrook(vel * D / nu, eps / D) * L / D + K) * vel * vel / (2 * G))

# channels.critical-depth-trapezoidal: the depth of least specific energy E = y + Q^2/(2 g A^2)
# (the definition of critical depth), by scipy minimize_scalar, at the scenario values
from scipy.optimize import minimize_scalar  # noqa: E402

Qc, bc, zc = 3.2, 1.5, 2.0
spec_energy = lambda y: y + Qc * Qc / (2 * G * ((bc + zc * y) * y) ** 2)
yc = float(minimize_scalar(spec_energy, bounds=(0.05, 3.0), method="bounded", options={"xatol": 1e-12}).x)
show("critical depth by least specific energy", v("scipy"), "optimize.minimize_scalar(bounded) on E(y)", yc)

# coastal.wave-dispersion: T = 10 s, h = 10 m, scipy brentq on omega^2 = g k tanh(k h)
disp = lambda Lw: (2 * math.pi / 10.0) ** 2 - G * (2 * math.pi / Lw) * math.tanh(2 * math.pi * 10.0 / Lw)
show("wave length T=10 h=10", v("scipy"), "optimize.brentq on the dispersion relation", brentq(disp, 1.0, 1000.0, xtol=1e-14, rtol=1e-15))

# thermal.plane-wall-transient: the full series (Incropera 6th ed. eq. 5.39a) with 60 terms,
# eigenvalues of zeta tan zeta = Bi by scipy brentq, against the template's one-term form
def wall_series(bi, fo, xs, terms=60):
    total = 0.0
    for n in range(terms):
        lo, hi = n * math.pi + 1e-12, n * math.pi + math.pi / 2 - 1e-12
        zeta = brentq(lambda z: z * math.sin(z) - bi * math.cos(z), lo, hi, xtol=1e-15, rtol=1e-15)
        cn = 4 * math.sin(zeta) / (2 * zeta + math.sin(2 * zeta))
        total += cn * math.exp(-zeta * zeta * fo) * math.cos(zeta * xs)
    return total


bi = 15 * 0.1 / 1.4
show("plane wall T scenario (degC)", v("scipy"), "Incropera eq. 5.39a series, 60 terms", 10 + 45 * wall_series(bi, 0.7e-6 * 36000 / 0.01, 0.0))
show("plane wall theta Bi=1 Fo=0.3 x*=0.5", v("scipy"), "Incropera eq. 5.39a series, 60 terms", wall_series(1.0, 0.3, 0.5))
