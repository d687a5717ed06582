"""Atomic writes, folder locks and run manifests: nothing half-written is ever seen, nothing old is lost."""

from __future__ import annotations

import errno
import json
import os
import subprocess
import sys

import pytest

from pdvoid.core import files as F
from pdvoid.core.errors import InputError


def test_atomic_write_replaces_only_when_complete(tmp_path):
    p = tmp_path / "a.txt"
    p.write_text("old", encoding="utf-8")
    with pytest.raises(RuntimeError), F.atomic_write(p, "w", encoding="utf-8") as fh:
        fh.write("new, half")
        raise RuntimeError("killed half-way")
    assert p.read_text(encoding="utf-8") == "old"
    assert [q.name for q in tmp_path.iterdir()] == ["a.txt"]  # no temporary left behind
    with F.atomic_write(p, "w", encoding="utf-8") as fh:
        fh.write("new")
    assert p.read_text(encoding="utf-8") == "new"


def test_full_disk_keeps_the_previous_file(tmp_path, monkeypatch):
    # a full disk reported when the data is flushed (ENOSPC), simulated: the old file survives untouched
    p = tmp_path / "r.bin"
    p.write_bytes(b"previous result")

    def full(fd):
        raise OSError(errno.ENOSPC, "No space left on device")

    monkeypatch.setattr(F.os, "fsync", full)
    with pytest.raises(OSError), F.atomic_write(p) as fh:
        fh.write(b"x" * 1000)
    assert p.read_bytes() == b"previous result"
    assert sorted(q.name for q in tmp_path.iterdir()) == ["r.bin"]


def test_atomic_write_checks_the_folder_first(tmp_path):
    with pytest.raises(InputError, match="does not exist"), F.atomic_write(tmp_path / "no" / "x.bin"):
        pass
    with pytest.raises(InputError, match="is a folder"), F.atomic_write(tmp_path):
        pass
    with pytest.raises(InputError, match="mode"), F.atomic_write(tmp_path / "x", "a"):
        pass


def test_a_second_run_on_a_locked_folder_is_refused(tmp_path):
    with F.FolderLock(tmp_path / "run"):
        with pytest.raises(InputError, match="another pdvoid run"), F.FolderLock(tmp_path / "run"):
            pass
    with F.FolderLock(tmp_path / "run"):  # released on exit
        pass
    assert not (tmp_path / "run" / F.LOCK_NAME).exists()


def test_a_stale_lock_of_a_dead_process_is_taken_over(tmp_path):
    dead = subprocess.run([sys.executable, "-c", "import os; print(os.getpid())"], capture_output=True, text=True,
                          check=True).stdout.strip()
    (tmp_path / F.LOCK_NAME).write_text(dead, encoding="utf-8")
    with F.FolderLock(tmp_path):
        assert (tmp_path / F.LOCK_NAME).read_text(encoding="utf-8") == str(os.getpid())


def test_manifest_catches_missing_truncated_and_mixed_files(tmp_path):
    (tmp_path / "a.csv").write_text("1,2\n3,4\n", encoding="utf-8")
    (tmp_path / "b.json").write_bytes(b"abc")
    with pytest.raises(InputError, match="no manifest.json"):
        F.verify_manifest(tmp_path)
    F.write_manifest(tmp_path, ["a.csv", "b.json"], {"seed": 1, "cycles": 10})
    doc = F.verify_manifest(tmp_path, required=["a.csv"])
    assert doc["seed"] == 1 and [e["name"] for e in doc["files"]] == ["a.csv", "b.json"]
    # SHA-256 of "abc": the one-block test vector of FIPS 180-2, appendix B.1
    assert doc["files"][1]["sha256"] == "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
    with pytest.raises(InputError, match="does not list c.npz"):
        F.verify_manifest(tmp_path, required=["c.npz"])
    (tmp_path / "a.csv").write_text("1,2\n", encoding="utf-8")  # truncated by a later, killed run
    with pytest.raises(InputError, match="incomplete or mixed output: a.csv differs"):
        F.verify_manifest(tmp_path)
    (tmp_path / "a.csv").unlink()
    with pytest.raises(InputError, match="a.csv is listed in the manifest but missing"):
        F.verify_manifest(tmp_path)


def test_manifest_refuses_foreign_and_odd_documents(tmp_path):
    (tmp_path / F.MANIFEST_NAME).write_text("not json", encoding="utf-8")
    with pytest.raises(InputError, match="unreadable"):
        F.verify_manifest(tmp_path)
    (tmp_path / F.MANIFEST_NAME).write_text(json.dumps({"format": "other"}), encoding="utf-8")
    with pytest.raises(InputError, match="not a pdvoid run manifest"):
        F.verify_manifest(tmp_path)
    doc = {"format": F.MANIFEST_FORMAT, "files": [{"name": "../x", "bytes": 0, "sha256": ""}]}
    (tmp_path / F.MANIFEST_NAME).write_text(json.dumps(doc), encoding="utf-8")
    with pytest.raises(InputError, match="plain file name"):
        F.verify_manifest(tmp_path)
    with pytest.raises(InputError, match="plain file names"):
        F.write_manifest(tmp_path, ["../x"], {})
