"""What the fuzz tests share (imported as a plain module): hypothesis profiles
and the values typed at the program.

Profiles, chosen with HALFTRIP_FUZZ_PROFILE, else "ci" when CI is set (as in
.ci/run's environment), else "dev":

* ``ci``: 1,000 examples per entry point (each CLI command, each TUI panel);
* ``dev``: 100, for a quick run on a developer's machine;
* ``long``: 10,000, on demand (``HALFTRIP_FUZZ_PROFILE=long``).

Shrinking is on; examples that fail are kept in ``.hypothesis/`` and tried
first next time.
"""

from __future__ import annotations

import os

from hypothesis import HealthCheck, settings
from hypothesis import strategies as st

EXAMPLES = {"ci": 1000, "dev": 100, "long": 10_000}
for _name, _count in EXAMPLES.items():
    settings.register_profile(_name, max_examples=_count, deadline=None,
                              suppress_health_check=[HealthCheck.too_slow])
PROFILE = os.environ.get("HALFTRIP_FUZZ_PROFILE", "ci" if os.environ.get("CI") else "dev")


def profile() -> settings:
    return settings.get_profile(PROFILE)


NUMBERS = st.sampled_from(["0", "-1", "-0", "1e300", "-1e300", "1e-300", "nan", "NaN", "inf",
                           "-inf", "1e309", "0.0000001", "999999999999", "1/0", "0x10",
                           "1e-200", "5e-324", "1.7976931348623157e308", "1_000", "١٢"])
UNITS = st.sampled_from(["", " ns", " m", " ft", " in", " MHz", " ohm", " %", " pF", " nH",
                         " kg", " degC", " wl", " deg", " s", " V", " m/us", " ns/ft", " Ω",
                         " µs", " furlong", " dB", " j", "j ohm", " kohm", " GHz", " km"])
ODD = st.sampled_from(["", " ", "\u200b", "\u202e1 m", "１２ ns", "٣ m", "ⅷ", "🙂", "\x00",
                       "--vf", "-", ":", ",", "1 m:", ":rg58", "1 m:rg58,,", "'", '"', "\\",
                       "1 ft 2 ft", "3-1/0 in", "((1))", "1 m + 2 m", "2**1000 m",
                       "[bold]1[/bold] m", "[/]", "e\u0301\u0301\u0301", "\ud7ff", "\t5 m",
                       "5 m\n6 m", "1" * 400, "1 m:rg58, " * 600, "9" * 5000 + " ns"])
#: Arbitrary text, extreme numbers with right and wrong units, odd Unicode.
VALUES = st.one_of(
    st.text(max_size=30),
    st.builds(lambda n, u: n + u, NUMBERS, UNITS),
    ODD,
    st.builds(lambda a, b: a + b, st.text(max_size=8), UNITS),
)
