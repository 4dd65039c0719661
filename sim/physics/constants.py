"""Constants of the trade, defined once.

The international nautical mile is exactly 1852 m and the knot is exactly one nautical mile per
hour, by definition (common practice).

References
----------
.. [1] BIPM (2019), The International System of Units (SI), 9th edition, Table 8 (non-SI units:
   nautical mile = 1852 m, knot = 1852/3600 m/s).
"""

NAUTICAL_MILE_M = 1852.0
"""One international nautical mile [m] (exact by definition)."""

KNOT_M_S = 1852.0 / 3600.0
"""One knot, one nautical mile per hour [m/s] (exact by definition)."""
