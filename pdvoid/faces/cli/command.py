"""The command line: ``pdvoid demo``, ``pdvoid simulate`` and the other commands.

Every report states that results are engineering estimates; test and acceptance levels come from the applicable
standards; local codes and licensed practice prevail.
"""

from __future__ import annotations

import argparse
import os
import sys
from collections.abc import Sequence

from pdvoid._version import __version__
from pdvoid.core.errors import InputError
from pdvoid.faces.cli import analysis, fit, measure, population, report, simulate, sweep
from pdvoid.faces.cli.output import SAFETY
from pdvoid.faces.cli.stopping import exit_status, signal_name, sigterm_raises

__all__ = ["build_parser", "main"]

COMMAND_MODULES = (simulate, analysis, fit, measure, report, sweep, population)


def build_parser() -> argparse.ArgumentParser:
    """The argument parser of the ``pdvoid`` command with every sub-command.

    Returns
    -------
    argparse.ArgumentParser
        The parser.
    """
    p = argparse.ArgumentParser(prog="pdvoid", description="Partial discharges in gas-filled voids: fields, "
                                "inception, AC-cycle simulation, phase-resolved patterns. " + SAFETY)
    p.add_argument("--version", action="version", version=f"pdvoid {__version__}")
    sub = p.add_subparsers(dest="command", required=True)
    for module in COMMAND_MODULES:
        module.register(sub)
    return p


def main(argv: Sequence[str] | None = None) -> int:
    """Run the ``pdvoid`` command.

    Parameters
    ----------
    argv : sequence of str, optional
        The arguments (default: ``sys.argv[1:]``).

    Returns
    -------
    int
        The exit status: 0 on success, 2 for a user error (printed as ``pdvoid: error: ...``), 1 when the system
        refused a file operation (disk full, permission) or for an internal error (a short report with a hint to
        file it, no traceback), 130 when interrupted (Ctrl-C, SIGINT), 143 when stopped by SIGTERM.
    """
    parser = build_parser()
    ns = parser.parse_args(argv)
    try:
        with sigterm_raises():
            return int(ns.func(ns) or 0)
    except InputError as exc:
        print(f"pdvoid: error: {exc}", file=sys.stderr)
        return 2
    except BrokenPipeError:
        # the reader of our output went away (e.g. ``pdvoid demo | head``): stop quietly, as a filter would
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
        return 0
    except KeyboardInterrupt as exc:
        print(f"pdvoid: interrupted ({signal_name(exc)}); no file was left half-written, and a run folder left "
              "unfinished is refused by the readers", file=sys.stderr)
        return exit_status(exc)
    except OSError as exc:  # the system refused a file operation: disk full, permissions, a vanished folder
        where = f" {exc.filename}" if exc.filename else ""
        print(f"pdvoid: error: the system refused a file operation{where}: {exc.strerror or exc}; no output was "
              "left half-written", file=sys.stderr)
        return 1
    except Exception as exc:  # an internal error: a short report, not a traceback
        print(f"pdvoid: internal error: {type(exc).__name__}: {exc}\n"
              f"  pdvoid {__version__}, command: {' '.join(sys.argv[1:] if argv is None else argv)}\n"
              "  This is a bug in pdvoid, not in your input: please file it with the command and the scenario "
              "file.", file=sys.stderr)
        return 1


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
