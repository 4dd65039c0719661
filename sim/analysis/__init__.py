"""Post-processing: comparisons, range estimates, curves, plots, reports."""
