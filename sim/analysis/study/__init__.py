"""Design studies over a scenario and its vessel: sweeps, optimisation with a mass model,
uncertainty and sensitivity, on the local cores or a Dask cluster.

| module | what it does |
|---|---|
| ``design`` | varied inputs, sampling (grid, random, Latin hypercube, Sobol), variant identity |
| ``evaluate`` | fly one variant with the mass model (worker side) |
| ``store`` | the results table: HDF5 (documented layout), journal, CSV |
| ``runner`` | fly batches of variants on a process pool or a Dask cluster, resuming |
| ``study`` | the stages: sweep, optimum (differential evolution), front (NSGA-II), Monte Carlo
  bands, sensitivity (SALib) and tornado |
| ``figures`` | response map, Pareto front, uncertainty bands, tornado |
"""

from sim.analysis.study.store import read_table, write_csv
from sim.analysis.study.study import (
    Band,
    LoadedStudy,
    Optimum,
    StudyResult,
    TornadoBar,
    load_study,
    run_study,
)

__all__ = [
    "Band",
    "LoadedStudy",
    "Optimum",
    "StudyResult",
    "TornadoBar",
    "load_study",
    "read_table",
    "run_study",
    "write_csv",
]
