"""Problems found in input files, and the error that carries them.

Shared by the loaders (:mod:`sim.io.files`) and the cross-checks (:mod:`sim.io.checks`).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

__all__ = ["MISSING", "InputError", "Problem"]


class _Missing:
    def __repr__(self) -> str:
        return "<missing>"


MISSING = _Missing()
"""Marker for 'no value at this key' (a missing key, or a problem about a whole table)."""


def _show(value: Any) -> str:
    text = repr(value)
    return text if len(text) <= 80 else text[:77] + "..."


@dataclass(frozen=True)
class Problem:
    """One thing wrong in an input file."""

    file: str
    key: str
    value: Any
    message: str
    severity: str = "error"  # or "warning"

    def __str__(self) -> str:
        where = f"{self.file}: {self.key}" if self.key else self.file
        shown = "" if self.value is MISSING else f" = {_show(self.value)}"
        return f"{where}{shown}: {self.message}"


class InputError(Exception):
    """One or more problems in input files (a user error, not a bug)."""

    def __init__(self, problems: list[Problem]) -> None:
        self.problems = problems
        lines = [str(p) for p in problems]
        super().__init__(f"{len(problems)} problem(s) in the input:\n  " + "\n  ".join(lines))
