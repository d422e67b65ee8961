"""Reference values for the worked own-equation example of tests/dimensions.rs: pipe
flow in US units (gpm, inches, feet), computed with general-purpose libraries from PyPI.
The Rust tests hold these values as numbers; they never run Python.

pip install fluids scipy

Seen with scipy 1.17.1 and fluids 1.3.1:
Re 207538.88845362485  f 0.01762501179470149  hf_ft 16.24076213109194  V_fts 4.997358494603029
"""
import math
from importlib.metadata import version

from fluids.friction import Colebrook
from scipy import constants as c

# Invented inputs: 450 gpm of water in a 6.065-inch bore, 1200 ft long, roughness
# 0.0018 in, kinematic viscosity 1.217e-5 ft^2/s. Conversions from scipy.constants.
gpm = c.gallon / c.minute
Q = 450 * gpm
D = 6.065 * c.inch
L = 1200 * c.foot
eps = 0.0018 * c.inch
nu = 1.217e-5 * c.foot**2
V = Q / (math.pi * D**2 / 4)
Re = V * D / nu
f = Colebrook(Re, eps / D)
hf = f * L / D * V**2 / (2 * c.g)
print("scipy", version("scipy"), "fluids", version("fluids"))
print("Re", repr(Re), " f", repr(f), " hf_ft", repr(hf / c.foot), " V_fts", repr(V / c.foot))
