"""Files that are never seen half-written: atomic replacement, folder locks and run manifests.

Every file pdvoid writes goes to a temporary name in the target folder and is renamed into place only when it
is complete (:func:`atomic_write`); a folder that receives a run's outputs is locked while the run writes
(:class:`FolderLock`); a run's folder ends with a manifest (:func:`write_manifest`) listing each file with its
size and SHA-256, written last, so that a reader can refuse an incomplete or mixed folder
(:func:`verify_manifest`).
"""

from __future__ import annotations

import contextlib
import hashlib
import json
import os
import tempfile
from collections.abc import Iterator, Mapping, Sequence
from pathlib import Path
from typing import IO, Any

from pdvoid.core.errors import InputError

__all__ = ["atomic_write", "FolderLock", "write_manifest", "verify_manifest", "sha256_file", "MANIFEST_NAME",
           "LOCK_NAME", "RUN_FILES", "check_run_file", "scenario_digest", "read_toml_file",
           "read_toml_bytes"]

MANIFEST_NAME = "manifest.json"
LOCK_NAME = ".pdvoid.lock"
MANIFEST_FORMAT = "pdvoid-run-manifest"
MANIFEST_VERSION = 1
#: the files a ``pdvoid simulate --out`` folder holds besides its manifest
RUN_FILES = ("result.npz", "events.csv", "summary.json")


@contextlib.contextmanager
def atomic_write(path: str | os.PathLike[str], mode: str = "wb", *, encoding: str | None = None,
                 newline: str | None = None) -> Iterator[IO[Any]]:
    """Open a temporary file beside ``path`` for writing; on success it replaces ``path`` in one rename.

    On an exception (including a full disk or an interrupt) the temporary file is removed and ``path`` keeps
    whatever it held before.

    Parameters
    ----------
    path : str or os.PathLike
        The file to write.
    mode : str
        ``"wb"`` or ``"w"``.
    encoding, newline : str, optional
        For text mode, as for :func:`open`.

    Yields
    ------
    file object
        The open temporary file.

    Raises
    ------
    pdvoid.InputError
        When the folder does not exist or is not writable (checked before anything is written).
    """
    if mode not in ("wb", "w"):
        raise InputError(f"mode must be 'wb' or 'w'; got {mode!r}")
    target = Path(path)
    folder = target.parent if str(target.parent) else Path(".")
    if not folder.is_dir():
        raise InputError(f"{target}: the folder {folder} does not exist")
    if target.is_dir():
        raise InputError(f"{target}: is a folder, not a file")
    try:
        fd, tmp = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".part", dir=folder)
    except OSError as exc:
        raise InputError(f"{target}: cannot write in {folder} ({exc.strerror})") from None
    ok = False
    try:
        with os.fdopen(fd, mode, encoding=encoding if mode == "w" else None,
                       newline=newline if mode == "w" else None) as fh:
            yield fh
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, target)
        ok = True
    finally:
        if not ok:
            with contextlib.suppress(OSError):
                os.unlink(tmp)


def sha256_file(path: str | os.PathLike[str]) -> str:
    """The SHA-256 of a file's bytes, as 64 hexadecimal digits.

    Parameters
    ----------
    path : str or os.PathLike
        The file.

    Returns
    -------
    str
        The digest.
    """
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for block in iter(lambda: fh.read(1 << 20), b""):
            h.update(block)
    return h.hexdigest()


class FolderLock:
    """An exclusive lock on an output folder while a run writes into it (a context manager).

    The lock is a file created with ``O_EXCL`` that holds the process id; a second run aimed at the same folder
    is refused with an :class:`pdvoid.InputError`. A lock left behind by a process that no longer exists is
    taken over (its process id is checked on this machine).

    Parameters
    ----------
    folder : str or os.PathLike
        The folder (created if missing).
    """

    def __init__(self, folder: str | os.PathLike[str]) -> None:
        self.folder = Path(folder)
        self.path = self.folder / LOCK_NAME
        self._held = False

    def __enter__(self) -> FolderLock:
        try:
            self.folder.mkdir(parents=True, exist_ok=True)
        except OSError as exc:
            raise InputError(f"{self.folder}: cannot create the output folder ({exc.strerror})") from None
        for _attempt in range(2):
            try:
                fd = os.open(self.path, os.O_CREAT | os.O_EXCL | os.O_WRONLY, 0o644)
            except FileExistsError:
                if self._stale():
                    with contextlib.suppress(OSError):
                        os.unlink(self.path)
                    continue
                raise InputError(
                    f"{self.folder}: another pdvoid run is writing into this folder (lock file {self.path}); "
                    "wait for it or choose another folder"
                ) from None
            except OSError as exc:
                raise InputError(f"{self.folder}: cannot lock the output folder ({exc.strerror})") from None
            try:
                with os.fdopen(fd, "w", encoding="utf-8") as fh:
                    fh.write(str(os.getpid()))
            except BaseException as exc:
                # an empty lock file would count as held for ever (a full disk refuses even these few bytes)
                with contextlib.suppress(OSError):
                    os.unlink(self.path)
                if isinstance(exc, OSError):
                    raise InputError(f"{self.folder}: cannot lock the output folder ({exc.strerror or exc})"
                                     ) from None
                raise
            self._held = True
            return self
        raise InputError(f"{self.folder}: cannot take over the stale lock file {self.path}")

    def _stale(self) -> bool:
        try:
            pid = int(self.path.read_text(encoding="utf-8").strip() or "0")
        except (OSError, ValueError):
            return False  # being written right now, or unreadable: treat as held
        if pid <= 0:
            return False
        try:
            os.kill(pid, 0)
        except ProcessLookupError:
            return True
        except PermissionError:
            return False
        return False

    def __exit__(self, *exc: object) -> None:
        if self._held:
            with contextlib.suppress(OSError):
                os.unlink(self.path)
            self._held = False


def write_manifest(folder: str | os.PathLike[str], files: Sequence[str], info: Mapping[str, Any]) -> Path:
    """Write the manifest of a run's folder, last, listing each file with its size and SHA-256.

    Parameters
    ----------
    folder : str or os.PathLike
        The run's folder.
    files : sequence of str
        Names of the files in ``folder`` that belong to the run.
    info : mapping
        What the run was (pdvoid version, scenario hash, seed, cycles, frequency, ...): JSON-serialisable.

    Returns
    -------
    pathlib.Path
        The manifest file.
    """
    root = Path(folder)
    entries = []
    for name in files:
        p = root / name
        if Path(name).name != name:
            raise InputError(f"manifest entries are plain file names; got {name!r}")
        entries.append({"name": name, "bytes": p.stat().st_size, "sha256": sha256_file(p)})
    doc = {"format": MANIFEST_FORMAT, "format_version": MANIFEST_VERSION, **dict(info), "files": entries}
    out = root / MANIFEST_NAME
    with atomic_write(out, "w", encoding="utf-8", newline="\n") as fh:
        json.dump(doc, fh, indent=2, allow_nan=False)
        fh.write("\n")
    return out


def verify_manifest(folder: str | os.PathLike[str], *, required: Sequence[str] = ()) -> dict[str, Any]:
    """Check a run's folder against its manifest: every listed file present with its size and SHA-256.

    Parameters
    ----------
    folder : str or os.PathLike
        The run's folder.
    required : sequence of str
        File names that must be listed.

    Returns
    -------
    dict
        The manifest.

    Raises
    ------
    pdvoid.InputError
        "incomplete or mixed output" with the reason: no manifest, an unreadable one, a missing file, or a
        file whose size or digest differs from the manifest.
    """
    root = Path(folder)
    path = root / MANIFEST_NAME
    head = f"{root}: incomplete or mixed output"
    try:
        if path.stat().st_size > 1_000_000:
            raise InputError(f"{head}: the manifest is larger than 1 MB")
        doc = json.loads(path.read_text(encoding="utf-8"))
    except FileNotFoundError:
        raise InputError(f"{head}: no {MANIFEST_NAME} (the run did not finish, or the folder was not written by "
                         "pdvoid)") from None
    except (OSError, UnicodeDecodeError, json.JSONDecodeError) as exc:
        raise InputError(f"{head}: unreadable {MANIFEST_NAME} ({exc})") from None
    if not isinstance(doc, dict) or doc.get("format") != MANIFEST_FORMAT or not isinstance(doc.get("files"), list):
        raise InputError(f"{head}: {MANIFEST_NAME} is not a pdvoid run manifest")
    listed = set()
    for entry in doc["files"]:
        if not isinstance(entry, dict) or not isinstance(entry.get("name"), str):
            raise InputError(f"{head}: malformed entry in {MANIFEST_NAME}: {entry!r}")
        name = entry["name"]
        if Path(name).name != name:
            raise InputError(f"{head}: manifest entry {name!r} is not a plain file name")
        listed.add(name)
        p = root / name
        if not p.is_file():
            raise InputError(f"{head}: {name} is listed in the manifest but missing")
        if p.stat().st_size != entry.get("bytes") or sha256_file(p) != entry.get("sha256"):
            raise InputError(f"{head}: {name} differs from the file the run wrote (size or SHA-256)")
    missing = [n for n in required if n not in listed]
    if missing:
        raise InputError(f"{head}: the manifest does not list {', '.join(missing)}")
    return doc


def check_run_file(path: str | os.PathLike[str]) -> None:
    """Refuse a file that sits in a run's folder whose manifest is missing or does not match.

    A folder counts as a run's folder when it holds a manifest, a lock, or at least two of :data:`RUN_FILES`; it
    is refused while a live process holds its lock, and a lock left by a killed run marks it unfinished; the file must
    then be listed in a manifest that matches every listed file. A file
    elsewhere (a measured event list, a result saved on its own) is not checked.

    Parameters
    ----------
    path : str or os.PathLike
        The file about to be read.

    Raises
    ------
    pdvoid.InputError
        "incomplete or mixed output: ..." with the reason (:func:`verify_manifest`), or when a run is still
        writing into the folder.
    """
    p = Path(path)
    root = p.parent
    present = [n for n in RUN_FILES if (root / n).is_file()]
    has_manifest = (root / MANIFEST_NAME).exists()
    locked = (root / LOCK_NAME).exists()
    if locked and not FolderLock(root)._stale():
        raise InputError(f"{root}: incomplete or mixed output: a pdvoid run is writing into this folder (lock file "
                         f"{LOCK_NAME}); wait for it to finish")
    # a lock left behind marks a run that was killed before it finished: its folder is checked like any other
    if not has_manifest and not locked and len(present) < 2:
        return
    verify_manifest(root, required=(p.name,))


def scenario_digest(text: str) -> str:
    """SHA-256 of a scenario's canonical text (its scenario-file form), for manifests and reports.

    Parameters
    ----------
    text : str
        The scenario file text.

    Returns
    -------
    str
        The hex digest.
    """
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def read_toml_file(path: str | os.PathLike[str], limit: int, what: str) -> dict[str, Any]:
    """Read a small TOML file safely: a regular file, at most ``limit`` bytes (read with that bound, so a device
    or a growing file cannot exhaust memory), UTF-8 with or without a byte-order mark, nesting refused cleanly.

    Parameters
    ----------
    path : str or os.PathLike
        The file.
    limit : int
        Largest size accepted [bytes].
    what : str
        What the file is, for messages (e.g. "scenario file").

    Returns
    -------
    dict
        The parsed document.

    Raises
    ------
    pdvoid.InputError
        Naming the file: not a regular file, too large, not UTF-8, malformed TOML (line and column), or nested
        too deeply.
    """
    return read_toml_bytes(path, limit, what)[0]


def read_toml_bytes(path: str | os.PathLike[str], limit: int, what: str) -> tuple[dict[str, Any], bytes]:
    """As :func:`read_toml_file`, also returning the bytes read, so that a hash of the file is the hash of the
    very text parsed (the review pack's SHA-256).

    Parameters
    ----------
    path : str or os.PathLike
        The file.
    limit : int
        Largest size accepted [bytes].
    what : str
        What the file is, for messages (e.g. "scenario file").

    Returns
    -------
    tuple
        (the parsed document as a dict, the file's content as bytes).

    Raises
    ------
    pdvoid.InputError
        As :func:`read_toml_file`.
    """
    import tomllib

    if not isinstance(path, (str, os.PathLike)) or isinstance(path, bytes):
        raise InputError(f"{what} path must be a str or path; got {type(path).__name__}")
    p = Path(path)
    text, raw = read_text_bytes(p, limit, what)
    try:
        return tomllib.loads(text), raw
    except tomllib.TOMLDecodeError as exc:
        raise InputError(f"{p}: malformed TOML (the {what} is not valid TOML): {exc}") from None
    except RecursionError:
        raise InputError(f"{p}: {what} nests tables or arrays too deeply") from None
    except ValueError as exc:  # e.g. an integer of more digits than Python converts (sys.int_info)
        raise InputError(f"{p}: malformed TOML (the {what} holds a value that cannot be read: {exc})"[:400]) from None


def read_text_bytes(path: Path, limit: int, what: str) -> tuple[str, bytes]:
    """A UTF-8 text file (a byte-order mark accepted) of at most ``limit`` bytes, as text and as read.

    Parameters
    ----------
    path : pathlib.Path
        The file.
    limit : int
        Largest size read [bytes]; a larger file is refused before it is decoded.
    what : str
        What the file is, for the messages (e.g. "the diameters file").

    Returns
    -------
    tuple of (str, bytes)
        The decoded text and the bytes read.

    Raises
    ------
    InputError
        For a missing or unreadable file, one larger than ``limit``, or one that is not UTF-8.
    """
    try:
        if not path.is_file():
            raise InputError(f"{path}: cannot read {what}: not found or not a regular file")
        with open(path, "rb") as fh:
            raw = fh.read(limit + 1)
    except OSError as exc:
        raise InputError(f"{path}: cannot read {what} ({exc.strerror})") from None
    if len(raw) > limit:
        raise InputError(f"{path}: {what} larger than the {limit} byte limit")
    try:
        return raw.decode("utf-8-sig"), raw
    except UnicodeDecodeError as exc:
        raise InputError(f"{path}: {what} is not UTF-8 text ({exc.reason} at byte {exc.start})") from None
