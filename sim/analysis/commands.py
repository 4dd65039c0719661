"""CLI commands of the analysis package (registered by :func:`sim.cli.build_parser`)."""

from __future__ import annotations


def register(sub) -> None:
    """Add the analysis subcommands to the ``brinebolt`` parser's subparsers."""
