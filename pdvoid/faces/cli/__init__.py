"""The ``pdvoid`` command line: one module per command group, ``main`` builds the parser."""

from pdvoid.faces.cli.command import build_parser, main

__all__ = ["build_parser", "main"]
