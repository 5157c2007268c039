"""certify batch under a full disk and a killed worker: nothing finished is lost, nothing half-written
is left, and a rerun completes the table (issue 6, item 4). Curves from Cremona's table via the fixture."""
import json
import os
import signal
import subprocess
import sys
import time
import uuid
from pathlib import Path

import pytest

from test_batch import batch_file, certify, cremona_curves, verified


@pytest.fixture
def small_disk(tmp_path):
    """A 48 KiB tmpfs (root only): room for a few certificates, then ENOSPC; remounted larger on request."""
    mount = tmp_path / "disk"
    mount.mkdir()
    if subprocess.run(["mount", "-t", "tmpfs", "-o", "size=48k", "tmpfs", str(mount)], capture_output=True).returncode:
        pytest.skip("cannot mount a small tmpfs here (needs root): no way to fill a disk safely")
    yield mount, lambda: subprocess.run(["mount", "-o", "remount,size=16m", str(mount)], check=True)
    subprocess.run(["umount", str(mount)], check=True)


@pytest.mark.parametrize("store", ["certificates", "store.sqlite"])
def test_a_full_disk_loses_nothing_finished_and_a_rerun_completes(tmp_path, small_disk, store):
    """Writing into a disk that fills up: the run stops with one line on stderr (status 2, no traceback);
    what is in the store verifies; after room is made, the rerun writes the rest and all of it verifies."""
    mount, enlarge = small_disk
    out = str(mount / store)
    curves = cremona_curves(30, start=100)
    source = batch_file(tmp_path, curves)
    full = certify("batch", source, "-o", out, "--workers", "1", "--only", "torsion")
    assert full.returncode == 2, full.stderr
    assert "Traceback" not in full.stderr and len(full.stderr.strip().splitlines()) >= 1
    assert "no space" in full.stderr.lower() or "disk is full" in full.stderr.lower()
    leftovers = [p for p in Path(out).glob(".certify-*")] if os.path.isdir(out) else []
    assert leftovers == []
    code, rows = verified(out) if (os.path.isdir(out) and any(Path(out).glob("*.json"))) or store.endswith(".sqlite") \
        else (0, [])
    assert code in (0, 2) and all(row["accepted"] for row in rows if not row["reason"].startswith("unreadable"))
    enlarge()
    rerun = certify("batch", source, "-o", out, "--workers", "1", "--only", "torsion")
    assert rerun.returncode == 0, rerun.stderr
    code, rows = verified(out)
    assert code == 0 and len(rows) == 30 and all(row["accepted"] for row in rows)


def children_of(pid: int) -> list:
    """The process ids whose parent is ``pid`` (read from /proc)."""
    found = []
    for entry in os.listdir("/proc"):
        if entry.isdigit():
            try:
                fields = Path(f"/proc/{entry}/stat").read_text().rsplit(")", 1)[1].split()
            except OSError:
                continue
            if int(fields[1]) == pid:
                found.append(int(entry))
    return found


def test_a_killed_worker_fails_only_its_curves_and_a_rerun_retries_them(tmp_path):
    """SIGKILL to the certifying child process as soon as it starts: the batch goes on with a new child,
    reports the lost curves as failures (status 1), and a rerun certifies exactly those."""
    curves = cremona_curves(20, start=200)
    source, out = batch_file(tmp_path, curves), str(tmp_path / f"out-{uuid.uuid4().hex}")
    process = subprocess.Popen([sys.executable, "-m", "certify", "batch", source, "-o", out, "--workers", "1",
                                "--only", "torsion"], stderr=subprocess.PIPE, text=True)
    deadline = time.monotonic() + 60
    while not (children := children_of(process.pid)) and time.monotonic() < deadline:
        time.sleep(0.01)
    assert children, "the batch never started a certifying process"
    os.kill(children[0], signal.SIGKILL)
    _, stderr = process.communicate(timeout=120)
    assert process.returncode == 1 and "Traceback" not in stderr, stderr
    assert "died" in stderr
    failures = [json.loads(line) for line in (Path(out) / "failures.jsonl").read_text().splitlines()]
    assert 1 <= len(failures) < 20
    rerun = certify("batch", source, "-o", out, "--workers", "1", "--only", "torsion")
    assert rerun.returncode == 0, rerun.stderr
    assert f"{20 - len(failures)} already in" in rerun.stderr
    code, rows = verified(out)
    assert code == 0 and len(rows) == 20 and all(row["accepted"] for row in rows)
