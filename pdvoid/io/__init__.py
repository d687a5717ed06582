"""Reading and writing discharge data: measured event lists, phase-resolved count matrices and pdvoid's own
self-describing exchange format.

- :func:`read_events` / :func:`write_events`: event lists in delimited text (:mod:`pdvoid.io.delimited`).
- :func:`read_pattern_matrix` / :func:`write_pattern_matrix`: count matrices with their bin edges
  (:mod:`pdvoid.io.matrix`).
- :func:`read_exchange` / :func:`write_exchange`: the "pdvoid-pattern" format (:mod:`pdvoid.io.exchange`).
- :func:`describe_read`: what a reader read (lines, comments, columns, units, time span, ...).

Every malformed input raises :class:`pdvoid.InputError` naming the file and, where it applies, the line.
"""

from __future__ import annotations

from pdvoid.io.delimited import describe_read, read_events
from pdvoid.io.event_writer import write_events
from pdvoid.io.exchange import EXCHANGE_FORMAT, EXCHANGE_VERSION, read_exchange, write_exchange
from pdvoid.io.matrix import PatternMatrix, matrix_from_events, read_pattern_matrix, write_pattern_matrix

__all__ = [
    "read_events",
    "write_events",
    "describe_read",
    "PatternMatrix",
    "matrix_from_events",
    "read_pattern_matrix",
    "write_pattern_matrix",
    "read_exchange",
    "write_exchange",
    "EXCHANGE_FORMAT",
    "EXCHANGE_VERSION",
]
