"""Pure physics models (SI units inside, no I/O)."""
