"""Every limit on what an input may make pdvoid allocate, in one place, and the memory budget they share.

Fixed limits bound counts that have no physical meaning beyond a size (file sizes, bins, seeds, cycles). The
memory budget bounds what several inputs multiply into (bins × bins, events × arrays, the arrays of a result
file): :func:`check_memory` compares an estimate with the budget *before* anything is allocated and raises an
:class:`~pdvoid.InputError` that says how much memory the request would take. The budget is
:data:`DEFAULT_MEMORY_BUDGET` unless the environment variable ``PDVOID_MEMORY_LIMIT`` sets another one, in bytes
or with a unit (``8GiB``, ``500MB``).
"""

from __future__ import annotations

import os
import re

from pdvoid.core.errors import InputError

__all__ = [
    "MEMORY_LIMIT_VARIABLE",
    "DEFAULT_MEMORY_BUDGET",
    "MAX_TEXT_FILE_BYTES",
    "MAX_DATA_FILE_BYTES",
    "MAX_RESULT_FILE_BYTES",
    "MAX_DEFLATE_RATIO",
    "MAX_SEEDS",
    "MAX_CYCLES",
    "MAX_BINS",
    "MAX_HISTOGRAM_PHASE_BINS",
    "MAX_HISTOGRAM_CHARGE_EDGES",
    "memory_budget",
    "check_memory",
    "format_bytes",
]

#: environment variable that sets the memory budget (bytes, or a number with B, kB, MB, GB, KiB, MiB, GiB, TiB)
MEMORY_LIMIT_VARIABLE = "PDVOID_MEMORY_LIMIT"
#: memory budget when the environment sets none [bytes] (2 GiB)
DEFAULT_MEMORY_BUDGET = 2 * 1024**3
#: largest scenario, sweep or parameter file (TOML) [bytes]
MAX_TEXT_FILE_BYTES = 1_000_000
#: largest measured-data, exchange or count-matrix file [bytes] (200 MiB)
MAX_DATA_FILE_BYTES = 200 * 1024**2
#: largest result file (``.npz``) [bytes] (4 GiB); its arrays must also fit in the memory budget
MAX_RESULT_FILE_BYTES = 4 * 1024**3
#: a deflated member of a result file may claim at most this many bytes per compressed byte [-]; deflate cannot
#: exceed about 1032, so a larger claim is a corrupt or crafted file (common practice: zlib's documented bound)
MAX_DEFLATE_RATIO = 1100
#: most seeds of a repeated test (e.g. the ramp test) [-]
MAX_SEEDS = 1000
#: most AC cycles of one simulation [-]
MAX_CYCLES = 10**9
#: most bins along one axis of a pattern or a histogram computed from events [-]
MAX_BINS = 100_000
#: most phase bins of the histogram mode of a simulation [-]
MAX_HISTOGRAM_PHASE_BINS = 3600
#: most charge edges of the histogram mode of a simulation [-]
MAX_HISTOGRAM_CHARGE_EDGES = 10_001

_UNITS = {"": 1, "b": 1, "kb": 10**3, "mb": 10**6, "gb": 10**9, "tb": 10**12,
          "kib": 1024, "mib": 1024**2, "gib": 1024**3, "tib": 1024**4}
_SIZE = re.compile(r"^\s*(\d+(?:\.\d*)?)\s*([a-zA-Z]*)\s*$")


def memory_budget() -> int:
    """The memory one request may allocate [bytes]: ``PDVOID_MEMORY_LIMIT`` if set, else the default.

    Returns
    -------
    int
        The budget [bytes].

    Raises
    ------
    InputError
        When ``PDVOID_MEMORY_LIMIT`` is set to something that is not a positive size.
    """
    text = os.environ.get(MEMORY_LIMIT_VARIABLE)
    if text is None or not text.strip():
        return DEFAULT_MEMORY_BUDGET
    m = _SIZE.match(text)
    unit = m.group(2).lower() if m else ""
    if m is None or unit not in _UNITS or len(text) > 40:
        raise InputError(f"{MEMORY_LIMIT_VARIABLE} must be a size such as 4GiB, 500MB or 1000000 (bytes); "
                         f"got {text[:40]!r}")
    value = int(float(m.group(1)) * _UNITS[unit])
    if value <= 0:
        raise InputError(f"{MEMORY_LIMIT_VARIABLE} must be a positive size; got {text!r}")
    return value


def format_bytes(n: float) -> str:
    """A byte count for people: ``"2.4 GB"``, ``"512 kB"``, ``"12 B"`` (decimal units).

    Parameters
    ----------
    n : float
        Bytes [bytes].

    Returns
    -------
    str
        The count with a decimal unit.
    """
    for unit, size in (("TB", 1e12), ("GB", 1e9), ("MB", 1e6), ("kB", 1e3)):
        if n >= size:
            return f"{n / size:.3g} {unit}"
    return f"{int(n)} B"


def check_memory(what: str, nbytes: float) -> int:
    """Refuse a request whose memory estimate exceeds the budget, before anything is allocated.

    Parameters
    ----------
    what : str
        What would be allocated, for the message, e.g. ``"a 30000 x 30000 pattern"``.
    nbytes : float
        The estimate [bytes].

    Returns
    -------
    int
        The estimate, rounded up [bytes].

    Raises
    ------
    InputError
        When ``nbytes`` exceeds :func:`memory_budget`; the message gives both and names the variable that raises
        the budget.
    """
    budget = memory_budget()
    if not nbytes <= budget:  # also catches NaN
        raise InputError(f"{what} would take {format_bytes(nbytes)} of memory, more than the budget of "
                         f"{format_bytes(budget)}; ask for less, or raise the budget with the environment variable "
                         f"{MEMORY_LIMIT_VARIABLE} (e.g. {MEMORY_LIMIT_VARIABLE}=8GiB)")
    return int(-(-nbytes // 1))
