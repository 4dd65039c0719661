"""Physical and trade constants used across brinebolt (defined once, here)."""

KNOT_M_S = 1852.0 / 3600.0
"""One knot [m/s]: one international nautical mile per hour (exact by definition)."""

NAUTICAL_MILE_M = 1852.0
"""International nautical mile [m] (exact by definition, 1929)."""
