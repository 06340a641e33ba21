"""Exact physical and unit constants used throughout the core."""

#: Speed of light in vacuum, m/s. Exact by the SI definition of the metre
#: (BIPM, SI Brochure, 9th edition).
C0_M_PER_S: float = 299_792_458.0

#: International foot in metres. Exact by the 1959 international yard and
#: pound agreement.
FOOT_M: float = 0.3048

#: Inch in metres (exact, 1/12 foot).
INCH_M: float = FOOT_M / 12.0
