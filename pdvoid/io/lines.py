"""Reading delimited text files line by line, within fixed limits, with errors that name the file and line.

Shared by the event-list reader (:mod:`pdvoid.io.delimited`), the count-matrix reader
(:mod:`pdvoid.io.matrix`) and the exchange format (:mod:`pdvoid.io.exchange`). Nothing here knows what the
columns mean.

Limits (module constants, checked before or while reading, so a file can never exhaust memory or hang):
:data:`MAX_FILE_BYTES`, :data:`MAX_LINE_CHARS`, :data:`MAX_ROWS`.
"""

from __future__ import annotations

import os
import re
from collections.abc import Iterator
from pathlib import Path

import numpy as np

from pdvoid.core.errors import InputError
from pdvoid.core.limits import MAX_DATA_FILE_BYTES

__all__ = [
    "MAX_FILE_BYTES",
    "MAX_LINE_CHARS",
    "MAX_ROWS",
    "CHUNK_ROWS",
    "line_error",
    "checked_path",
    "iter_lines",
    "RowParser",
    "parse_comment_key",
    "sniff_delimiter",
    "split_fields",
]

MAX_FILE_BYTES = MAX_DATA_FILE_BYTES  #: largest file read [bytes] (200 MiB; pdvoid.core.limits)
MAX_LINE_CHARS = 10_000  #: longest line [characters], line end excluded
MAX_ROWS = 50_000_000  #: most data rows (events, or count rows) in one file
CHUNK_ROWS = 1 << 16  #: rows parsed at once by numpy

_KEY = re.compile(r"^#\s*([A-Za-z][A-Za-z0-9_.\- ]*?)\s*=\s*(.*?)\s*$")
_DELIMITER_NAMES = {",": "comma", ";": "semicolon", "\t": "tab"}


def line_error(path: Path | str, lineno: int | None, reason: str) -> InputError:
    """An :class:`InputError` whose message starts with ``"<file>, line <n>: "`` (or ``"<file>: "``).

    Parameters
    ----------
    path : Path or str
        The file the message is about [-].
    lineno : int or None
        Line number from 1; None when the problem is not on one line [-].
    reason : str
        What is wrong [-].

    Returns
    -------
    InputError
        The error, to be raised by the caller.
    """
    where = f"{path}, line {lineno}" if lineno is not None else f"{path}"
    return InputError(f"{where}: {reason}")


def checked_path(path: str | os.PathLike[str]) -> Path:
    """``path`` as a :class:`Path` to a readable regular file of at most :data:`MAX_FILE_BYTES` bytes.

    Parameters
    ----------
    path : str or os.PathLike
        The file name [-].

    Returns
    -------
    Path
        The checked path.

    Raises
    ------
    InputError
        When ``path`` is not a file name, cannot be read, is not a regular file or is too large.
    """
    if isinstance(path, bool) or not isinstance(path, (str, os.PathLike)):
        raise InputError(f"path must be a file name (str or path-like); got {type(path).__name__}")
    p = Path(path)
    try:
        st = p.stat()
    except OSError as exc:
        raise InputError(f"{p}: cannot read the file ({exc.strerror or exc})") from None
    if not p.is_file():
        raise InputError(f"{p}: not a regular file")
    if st.st_size > MAX_FILE_BYTES:
        raise InputError(
            f"{p}: file of {st.st_size} bytes is larger than the limit of {MAX_FILE_BYTES} bytes"
        )
    return p


def iter_lines(path: Path) -> Iterator[tuple[int, str]]:
    """Yield (line number from 1, text without the line end) for every line of a UTF-8 file.

    A byte-order mark at the start is ignored; ``\\r\\n`` and ``\\n`` end lines. Memory is bounded by the line
    limit; the number of lines by the file-size limit.

    Parameters
    ----------
    path : Path
        The file [-].

    Yields
    ------
    tuple of (int, str)
        The line number and the text of each line.

    Raises
    ------
    InputError
        Naming the line, for lines longer than :data:`MAX_LINE_CHARS`, text that is not UTF-8, NUL characters,
        or a file that grows past :data:`MAX_FILE_BYTES` while it is read.
    """
    limit = MAX_LINE_CHARS
    byte_limit = 4 * limit + 3  # a UTF-8 character takes at most 4 bytes; + "\r\n" + 1 to detect overflow
    lineno = 0
    read = 0
    with open(path, "rb") as fh:
        while True:
            raw = fh.readline(byte_limit)
            if not raw:
                return
            lineno += 1
            read += len(raw)
            if read > MAX_FILE_BYTES:  # the file grew while being read
                raise line_error(path, lineno, f"file is larger than the limit of {MAX_FILE_BYTES} bytes")
            if raw.endswith(b"\n"):
                raw = raw[:-1]
                if raw.endswith(b"\r"):
                    raw = raw[:-1]
            elif len(raw) == byte_limit:
                raise line_error(path, lineno, f"line longer than {limit} characters")
            try:
                text = raw.decode("utf-8")
            except UnicodeDecodeError as exc:
                raise line_error(path, lineno, f"not UTF-8 text (byte {exc.start + 1} of the line)") from None
            if lineno == 1 and text.startswith("\ufeff"):
                text = text[1:]
            if len(text) > limit:
                raise line_error(path, lineno, f"line longer than {limit} characters ({len(text)})")
            if "\x00" in text:
                raise line_error(path, lineno, "NUL character (binary data?)")
            yield lineno, text


def parse_comment_key(text: str) -> tuple[str, str] | None:
    """``("frequency", "50 Hz")`` for a comment line ``# frequency = 50 Hz``; None for other comments.

    Keys start with a letter and hold letters, digits, ``_``, ``.``, ``-`` and spaces; they are returned
    in lower case with surrounding spaces removed.

    Parameters
    ----------
    text : str
        One line of the file [-].

    Returns
    -------
    tuple of (str, str) or None
        (key, value text), or None when the line is not a ``# key = value`` comment.
    """
    m = _KEY.match(text.strip())
    if not m:
        return None
    return m.group(1).strip().lower(), m.group(2)


def sniff_delimiter(text: str) -> str:
    """The field delimiter of a header or first data line: ``;`` if present, else tab, else ``,``.

    Parameters
    ----------
    text : str
        The line [-].

    Returns
    -------
    str
        ``";"``, ``"\\t"`` or ``","``.
    """
    for d in (";", "\t", ","):
        if d in text:
            return d
    return ","


def delimiter_name(d: str) -> str:
    """The name of a delimiter for messages and summaries ("comma", "semicolon", "tab").

    Parameters
    ----------
    d : str
        The delimiter [-].

    Returns
    -------
    str
        Its name, or its ``repr`` for another character.
    """
    return _DELIMITER_NAMES.get(d, repr(d))


def split_fields(text: str, delimiter: str) -> list[str]:
    """Fields of a line, surrounding white space removed.

    Parameters
    ----------
    text : str
        The line [-].
    delimiter : str
        The field delimiter [-].

    Returns
    -------
    list of str
        The fields.
    """
    return [f.strip() for f in text.split(delimiter)]


def _why_bad(text: str, ncols: int, delimiter: str, decimal: str, offset: int = 0) -> str:
    """The reason a data line does not parse as ``ncols`` numbers (for the error message); ``offset`` fields
    precede the numbers on the line."""
    fields = split_fields(text, delimiter)
    if len(fields) != ncols:
        return (
            f"expected {ncols + offset} fields separated by {delimiter_name(delimiter)}, "
            f"found {len(fields) + offset}"
        )
    for i, f in enumerate(fields, 1 + offset):
        if f == "":
            return f"field {i} is empty"
        g = f.replace(",", ".") if decimal == "," else f
        try:
            float(g)
        except ValueError:
            return f"field {i} is not a number: {f[:40]!r}"
        if not re.fullmatch(
            r"[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?|[-+]?(nan|inf|infinity)", g, re.IGNORECASE
        ):
            return f"field {i} is not a plain decimal number: {f[:40]!r}"
    return "not a row of numbers"


class RowParser:
    """Collects data lines and parses them in chunks with numpy into an (n, ncols) float array.

    Every line error (wrong field count, empty or non-numeric field, a '.' in a decimal-comma file, NaN or
    infinite value) is raised as :class:`InputError` naming the file and the line. The row count is limited by
    :data:`MAX_ROWS`.

    Parameters
    ----------
    path : Path
        the file (for messages) [-]
    ncols : int
        number of fields per line [-]
    delimiter : str
        field delimiter [-]
    decimal : str
        "." or "," [-]
    nan_columns : tuple[int, ...]
        indices of columns where NaN is allowed (never infinity) [-]
    field_offset : int
        fields before the numbers on each line (a label), for the field numbers in messages [-]
    """

    def __init__(
        self,
        path: Path,
        ncols: int,
        delimiter: str,
        decimal: str,
        nan_columns: tuple[int, ...] = (),
        field_offset: int = 0,
    ) -> None:
        self.path = path
        self.field_offset = field_offset
        self.nan_columns = nan_columns
        self.ncols = ncols
        self.delimiter = delimiter
        self.decimal = decimal
        self._lines: list[str] = []
        self._linenos: list[int] = []
        self._blocks: list[np.ndarray] = []
        self._blocknos: list[np.ndarray] = []
        self.rows = 0

    def add(self, lineno: int, text: str) -> None:
        """Add one data line (parsed in chunks; a bad line raises when its chunk is parsed, at the latest in
        :meth:`result`).

        Parameters
        ----------
        lineno : int
            Line number of ``text`` in the file, from 1 [-].
        text : str
            The data line [-].

        Raises
        ------
        InputError
            When the file holds more than :data:`MAX_ROWS` data rows, or a line of the chunk does not parse.
        """
        self.rows += 1
        if self.rows > MAX_ROWS:
            raise line_error(self.path, lineno, f"more than {MAX_ROWS} data rows (the limit)")
        self._lines.append(text)
        self._linenos.append(lineno)
        if len(self._lines) >= CHUNK_ROWS:
            self._flush()

    def _fail(self, index: int) -> InputError:
        text = self._lines[index]
        return line_error(
            self.path,
            self._linenos[index],
            _why_bad(text, self.ncols, self.delimiter, self.decimal, self.field_offset),
        )

    def _first_bad(self, lines: list[str]) -> int:
        """Index of the first line that makes numpy's parser fail (bisection on prefixes)."""
        lo, hi = 0, len(lines)  # prefix lines[:lo] parses; lines[:hi] fails
        while hi - lo > 1:
            mid = (lo + hi) // 2
            try:
                self._load(lines[:mid])
                lo = mid
            except ValueError:
                hi = mid
        return hi - 1

    def _load(self, lines: list[str]) -> np.ndarray:
        return np.loadtxt(
            lines, delimiter=self.delimiter, dtype=float, ndmin=2, comments=None, quotechar=None
        )

    def _flush(self) -> None:
        if not self._lines:
            return
        lines = self._lines
        if self.decimal == ",":
            for i, t in enumerate(lines):
                if "." in t:
                    raise line_error(
                        self.path, self._linenos[i], "'.' found in a file whose decimal mark is ','"
                    )
            lines = [t.replace(",", ".") for t in lines]
        if lines[0].count(self.delimiter) != self.ncols - 1:  # numpy takes the column count from row 1
            raise self._fail(0)
        try:
            arr = self._load(lines)
        except ValueError:
            raise self._fail(self._first_bad(lines)) from None
        if arr.shape[1] != self.ncols:  # every line of the chunk has the same, wrong, field count
            raise self._fail(0)
        finite = np.isfinite(arr)
        if self.nan_columns:
            finite[:, list(self.nan_columns)] |= np.isnan(arr[:, list(self.nan_columns)])
        if not finite.all():
            row, col = np.argwhere(~finite)[0]
            what = "NaN" if np.isnan(arr[row, col]) else "infinite (or too large)"
            raise line_error(self.path, self._linenos[row], f"field {col + 1 + self.field_offset} is {what}")
        self._blocks.append(arr)
        self._blocknos.append(np.asarray(self._linenos, dtype=np.int64))
        self._lines = []
        self._linenos = []

    def result(self) -> tuple[np.ndarray, np.ndarray]:
        """All rows added so far, parsed.

        Returns
        -------
        tuple of (numpy.ndarray, numpy.ndarray)
            Values of shape (rows, ncols) and the line number of each row.

        Raises
        ------
        InputError
            Naming the first line that is not ``ncols`` numbers (or holds NaN or infinity where not allowed).
        """
        self._flush()
        if not self._blocks:
            return np.empty((0, self.ncols)), np.empty(0, dtype=np.int64)
        return np.concatenate(self._blocks), np.concatenate(self._blocknos)
