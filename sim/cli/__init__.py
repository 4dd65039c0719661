"""The ``brinebolt`` command.

One module per command (``run``, ``check``, ``steady``, ``versus``, ``reach``, ``range_curve``,
``thruster_curves``, ``report``), each with ``register(sub)`` and ``cmd_<name>(args)``; the
shared option vocabulary in :mod:`sim.cli.options`; exit codes, console helpers and the error
mapping in :mod:`sim.cli.core`; the parser and :func:`main` in :mod:`sim.cli.app`. Heavy
libraries (rich, numpy, scipy, h5py, matplotlib, pydantic, pint) are imported inside the command
functions, so that ``brinebolt --help`` starts fast.

Exit codes
----------
0  the mission was completed (or the command succeeded)
2  bad input: a file, key, value or option is wrong (every problem is listed)
3  the mission ended early because a limit or trigger stopped it
4  numerical failure (the solver or a model found no solution); the partial log is kept
5  output could not be written (full disk, ``--output``); the last good log snapshot is kept
1  internal error (a bug in brinebolt; ``--debug`` shows the traceback)
130 interrupted (Ctrl-C); the partial log is kept
143 terminated by SIGTERM; the partial log is kept, marked "terminated (SIGTERM)"

A closed output pipe ends a command quietly with exit code 0.

No traceback is shown for a user error; ``brinebolt --debug COMMAND ...`` shows it for any error.
"""

from sim.cli.app import build_parser, main

__all__ = ["build_parser", "main"]
