"""brinebolt: time-domain propulsion simulator for seawater MHD-thruster vessels.

Layout (each layer imports only those below it; see DEVELOPERS.md)
------
``sim.cli``      the ``brinebolt`` command, one module per command.
``sim.api``      the Python face.
``sim.analysis`` comparisons, range estimates, curves, plots and reports.
``sim.flight``   flies a loaded scenario with its HDF5 log.
``sim.io``       unit-aware file parsing and validation, the seam to engine specs, HDF5 logs.
``sim.engine``   engine specs, the coupled ODE, mission events (simpy), steady points, summary.
``sim.safety``   safety figures and caution texts.
``sim.physics``  pure physics: pure functions and frozen dataclasses, SI units, no I/O.
"""

__version__ = "0.1.0"
