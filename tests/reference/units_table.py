"""The subset of the unit table used by the catalogue defaults, for the reference scripts.
Factors as in src/units.rs (NIST SP 811 (2008) Appendix B.8; SI Brochure 9th ed.)."""
import math

FACTORS = {
    "1": 1.0, "%": 0.01, "m": 1.0, "mm": 1e-3, "L/s": 1e-3, "m^3/s": 1.0, "mm^2/s": 1e-6,
    "m^2": 1.0, "mm^2": 1e-6, "s/m^(1/3)": 1.0, "s": 1.0, "h": 3600.0, "yr": 3.1536e7,
    "°": math.pi / 180, "kN": 1e3, "MPa": 1e6, "GPa": 1e9, "kN/m": 1e3, "cm^4": 1e-8,
    "kg/m": 1.0, "Hz": 1.0, "W/(m^2*K)": 1.0, "W/(m*K)": 1.0, "kg/s": 1.0,
    "kJ/(kg*K)": 1e3, "A": 1.0, "V": 1.0, "nA": 1e-9, "mA": 1e-3, "ohm": 1.0, "K": 1.0,
    "bar": 1e5, "cm^3/mol": 1e-6, "m^2/yr": 1 / 3.1536e7, "kPa": 1e3, "kN/m^3": 1e3,
    "currency": 1.0,
}
OFFSETS = {"°C": 273.15}


def to_si(value, unit):
    if unit in OFFSETS:
        return value + OFFSETS[unit]
    return value * FACTORS[unit]


def from_si(value, unit):
    if unit in OFFSETS:
        return value - OFFSETS[unit]
    return value / FACTORS[unit]
