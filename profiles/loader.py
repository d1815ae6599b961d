"""The profile loader's public names in one place (each lives in its own module).

``from strikeline.profiles.loader import load_bench, find_gas, ProfileError`` keeps working;
new code may import from :mod:`.bench`, :mod:`.gasdata`, :mod:`.gauges`, :mod:`.ports`,
:mod:`.benchcurve` and :mod:`.fields` directly.
"""

from .bench import BUILTIN_BENCHES, BenchProfile, load_bench, parse_bench, save_curve, with_profile_fill, write_atomic
from .benchcurve import curve_toml
from .fields import ProfileError
from .gasdata import PER_CM_TORR, cathodes, find_cathode, find_gas, gases
from .gauges import gauge_correction

__all__ = [
    "BUILTIN_BENCHES",
    "PER_CM_TORR",
    "BenchProfile",
    "ProfileError",
    "cathodes",
    "curve_toml",
    "find_cathode",
    "find_gas",
    "gases",
    "gauge_correction",
    "load_bench",
    "parse_bench",
    "save_curve",
    "with_profile_fill",
    "write_atomic",
]
