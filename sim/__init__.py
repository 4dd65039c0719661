"""brinebolt: time-domain propulsion simulator for seawater MHD-thruster vessels.

Layout
------
``sim.physics``  pure physics: pure functions and frozen dataclasses, SI units, no I/O.
``sim.engine``   the coupled ODE, mission events (simpy) and the run loop.
``sim.io``       unit-aware file parsing and validation, HDF5 logs.
``sim.analysis`` comparisons, range estimates, curves, plots and reports.
``sim.cli``      the ``brinebolt`` command.
"""

__version__ = "0.1.0"
