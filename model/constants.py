"""SI defining constants and unit definitions, as the model uses them.

The values are the exact SI definitions (and the CODATA electron mass), identical to
``scipy.constants``; ``tests/test_units.py`` holds every one against it. They are written
here rather than imported because importing ``scipy.constants`` costs about 0.12 s on the
instrument PCs this runs on, as much as Textual itself, and would sit on the screen's
start-up path.
"""

__all__ = [
    "atm",
    "bar",
    "centi",
    "e",
    "epsilon_0",
    "inch",
    "k",
    "kilo",
    "m_e",
    "mega",
    "micro",
    "milli",
    "mmHg",
    "nano",
    "psi",
    "torr",
    "zero_Celsius",
]

kilo = 1e3
mega = 1e6
centi = 1e-2
milli = 1e-3
micro = 1e-6
nano = 1e-9
atm = 101325.0
"""Standard atmosphere, Pa (definition)."""
bar = 1e5
"""Pa (definition)."""
torr = atm / 760.0
"""Pa (definition: 1/760 atm)."""
mmHg = torr
"""Conventional millimetre of mercury, taken equal to the torr as scipy.constants does."""
inch = 0.0254
"""m (definition)."""
psi = 6894.757293168361
"""Pound-force per square inch, Pa (from the exact pound and inch)."""
k = 1.380649e-23
"""Boltzmann constant, J/K (exact since 2019)."""
e = 1.602176634e-19
"""Elementary charge, C (exact since 2019)."""
m_e = 9.1093837139e-31
"""Electron mass, kg (CODATA 2022)."""
epsilon_0 = 8.8541878188e-12
"""Vacuum permittivity, F/m (CODATA 2022)."""
zero_Celsius = 273.15
"""0 degrees Celsius in K (definition)."""
