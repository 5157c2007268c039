"""The referee's kit (certify/verifier/kit.py): ``certify bundle … -o NAME.pyz`` writes one zip archive that a
bare interpreter runs with nothing installed — ``env -i python3 -S NAME.pyz`` from an empty folder, on the
oldest Python this machine has from 3.8 on — and that accepts the demo appendix, rejects an edited member,
is caught by ``--expect`` when a member is removed with its manifest entry, and prints another source
digest when a verifier file is changed. Also: digests a referee can compare, ``-`` for standard input, a
missing file counted once, ``--version``."""
from __future__ import annotations

import glob
import hashlib
import io
import json
import os
import shutil
import subprocess
import sys
import zipfile
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
DEMO = sorted(glob.glob(str(ROOT / "certificates-demo" / "appendix-curve-*.json")))


def oldest_python() -> str:
    """The oldest CPython from 3.8 on that this machine has (pyenv's, or on PATH), else this one."""
    for version in ("3.8", "3.9", "3.10"):
        found = sorted(glob.glob(os.path.expanduser(f"~/.pyenv/versions/{version}.*/bin/python{version}")))
        found = found or [p for p in [shutil.which(f"python{version}")] if p]
        for candidate in found:
            if subprocess.run([candidate, "-c", "pass"], capture_output=True).returncode == 0:
                return candidate
    return sys.executable


BARE = oldest_python()


@pytest.fixture(scope="module")
def kit(tmp_path_factory) -> Path:
    folder = tmp_path_factory.mktemp("kit")
    run = subprocess.run([sys.executable, "-m", "certify", "bundle", *DEMO, "-o", str(folder / "appendix.pyz")],
                         capture_output=True, text=True, cwd=ROOT)
    assert run.returncode == 0, run.stderr
    return folder / "appendix.pyz"


def run_bare(path: Path, *arguments: str, cwd: Path) -> subprocess.CompletedProcess:
    """The kit under ``env -i`` (no environment at all) and ``python -S`` (no site-packages)."""
    return subprocess.run(["env", "-i", BARE, "-S", str(path), *arguments], capture_output=True, text=True, cwd=cwd)


def rewritten(kit: Path, target: Path, change) -> Path:
    """A copy of the kit with ``change(name, bytes) -> bytes or None`` applied to each member (None drops it)."""
    with zipfile.ZipFile(kit) as source, zipfile.ZipFile(target, "w") as out:
        for name in source.namelist():
            data = change(name, source.read(name))
            if data is not None:
                out.writestr(name, data)
    return target


def bundle_digest(kit: Path) -> str:
    from certify.verifier.digest import digest

    with zipfile.ZipFile(kit) as archive:
        return digest(json.loads(archive.read("appendix.json")))


def test_the_kit_is_a_readable_zip_with_only_the_genuine_members(kit):
    from certify.verifier.kit import check_member_name

    with zipfile.ZipFile(kit) as archive:
        names = archive.namelist()
    assert "__main__.py" in names and "appendix.json" in names and "certify/verifier/torsion.py" in names
    for name in names:
        check_member_name(name)


def test_the_kit_runs_on_a_bare_interpreter_from_an_empty_folder(kit, tmp_path):
    """Accepts all 32 demo certificates (four kinds for each of eight curves), prints the bundle digest and
    the source digest of what it carries."""
    from certify.verifier.kit import package_files, source_digest

    run = run_bare(kit, "--quiet", cwd=tmp_path)
    assert run.returncode == 0, run.stderr
    lines = run.stdout.strip().split("\n")
    assert sum(line.startswith("accepted: ") for line in lines) == len(DEMO) == 32
    assert bundle_digest(kit) in lines[-1] and source_digest(package_files()) in lines[-1], lines[-1]
    print(f"kit run by {BARE}")


def test_jsonl_and_expect_in_the_kit(kit, tmp_path):
    run = run_bare(kit, "--jsonl", "--expect", bundle_digest(kit), cwd=tmp_path)
    rows = [json.loads(line) for line in run.stdout.split("\n") if line]
    assert run.returncode == 0 and rows[-1]["members"] == len(DEMO) == 32 and rows[-1]["digest"] == bundle_digest(kit)


def test_a_member_edited_inside_the_kit_is_rejected(kit, tmp_path):
    """A member's claim changed (Z/5Z made Z/10Z) without touching the manifest: rejected, exit status 1."""
    def edit(name, data):
        if name != "appendix.json":
            return data
        bundle = json.loads(data)
        bundle["members"][0]["claim"]["invariants"] = ["10"]
        return json.dumps(bundle).encode()
    edited = rewritten(kit, tmp_path / "edited.pyz", edit)
    run = run_bare(edited, "--quiet", cwd=tmp_path)
    assert run.returncode == 1 and run.stdout.startswith("rejected: "), run.stdout[:300]


def test_a_member_removed_with_its_manifest_entry_is_caught_by_the_cited_digest(kit, tmp_path):
    """The member and its manifest entry removed and the count fixed: every remaining member is accepted, but
    the digest the paper cites is no longer the bundle's, and --expect says so (exit status 1)."""
    def remove(name, data):
        if name != "appendix.json":
            return data
        bundle = json.loads(data)
        del bundle["members"][0], bundle["manifest"]["members"][0]
        bundle["manifest"]["count"] = str(len(bundle["members"]))
        return json.dumps(bundle).encode()
    smaller = rewritten(kit, tmp_path / "smaller.pyz", remove)
    assert run_bare(smaller, "--quiet", cwd=tmp_path).returncode == 0
    run = run_bare(smaller, "--quiet", "--expect", bundle_digest(kit), cwd=tmp_path)
    assert run.returncode == 1 and bundle_digest(kit) in run.stderr and len(run.stderr.strip().split("\n")) == 1


def test_a_changed_verifier_file_changes_the_printed_source_digest(kit, tmp_path):
    from certify.verifier.kit import package_files, source_digest

    changed = rewritten(kit, tmp_path / "changed.pyz", lambda name, data: data + b"\n# changed\n"
                        if name == "certify/verifier/report.py" else data)
    last = run_bare(changed, "--quiet", cwd=tmp_path).stdout.strip().split("\n")[-1]
    assert "source sha256:" in last and source_digest(package_files()) not in last


def test_the_printed_source_digest_is_what_sha256sum_gives_for_the_extracted_files(kit, tmp_path):
    """README, "Which verifier ran": the SHA-256 of the sha256sum listing of the members but the bundle."""
    from certify.verifier.kit import package_files, source_digest

    run = run_bare(kit, "--extract", str(tmp_path / "out"), cwd=tmp_path)
    assert run.returncode == 0, run.stderr
    names = sorted((str(p.relative_to(tmp_path / "out")) for p in (tmp_path / "out").rglob("*")
                    if p.is_file() and p.name != "appendix.json"), key=str.encode)
    listing = "".join(f"{hashlib.sha256((tmp_path / 'out' / n).read_bytes()).hexdigest()}  {n}\n" for n in names)
    assert "sha256:" + hashlib.sha256(listing.encode()).hexdigest() == source_digest(package_files())


def test_a_kit_with_a_foreign_member_or_a_name_given_twice_is_unreadable(kit, tmp_path):
    """A .pyc beside the modules (zipimport would run it instead of the source), or a bundle named twice
    (zip readers differ on which copy they take): refused by the installed verifier, exit status 2."""
    foreign = rewritten(kit, tmp_path / "foreign.pyz", lambda name, data: data)
    with zipfile.ZipFile(foreign, "a") as archive:
        archive.writestr("certify/verifier/report.pyc", b"\0")
    twice = tmp_path / "twice.pyz"
    shutil.copy(kit, twice)
    with zipfile.ZipFile(twice, "a") as archive, pytest.warns(UserWarning):
        archive.writestr("appendix.json", b"{}")
    for path in (foreign, twice):
        run = subprocess.run([sys.executable, "-m", "certify.verifier", "--quiet", str(path)], capture_output=True,
                             text=True, cwd=ROOT)
        assert run.returncode == 2 and "unreadable" in run.stdout, run.stdout


def test_standard_input_and_a_missing_file(tmp_path):
    """'-' reads one certificate from standard input; a missing file is one unreadable verdict."""
    data = Path(DEMO[1]).read_bytes()
    run = subprocess.run([sys.executable, "-m", "certify.verifier", "--jsonl", "-", str(tmp_path / "missing.json")],
                         input=data, capture_output=True, cwd=ROOT)
    rows = [json.loads(line) for line in run.stdout.decode().split("\n") if line]
    assert [(row["file"], row["accepted"]) for row in rows] == [("<stdin>", True), (str(tmp_path / "missing.json"), False)]
    assert run.returncode == 2


def test_versions():
    """The verifier names its version, the same as certify's."""
    import certify
    from certify.verifier import VERSION

    run = subprocess.run([sys.executable, "-S", "-m", "certify.verifier", "--version"], capture_output=True, text=True,
                         cwd=ROOT)
    assert run.stdout.strip() == f"certify verifier {VERSION}" and VERSION == certify.__version__


def test_the_verifier_source_is_python_3_8():
    """Every verifier module parses as Python 3.8 (the oldest the kit promises), whatever runs the tests."""
    import ast

    for path in (ROOT / "certify" / "verifier").glob("*.py"):
        ast.parse(path.read_text(encoding="utf-8"), feature_version=(3, 8))


def with_bytes_appended(kit: Path, target: Path, extra: bytes) -> Path:
    target.write_bytes(kit.read_bytes() + extra)
    return target


def two_directories(kit: Path, target: Path) -> Path:
    """The kit with a second, altered central directory and end record after the first (the layout with which
    zip readers disagree on which directory counts)."""
    data = kit.read_bytes()
    return with_bytes_appended(kit, target, b"\0\0\0\0" + data[data.rindex(b"PK\x01\x02"):])


def recompressed(kit: Path, target: Path, method: int) -> Path:
    with zipfile.ZipFile(kit) as source, zipfile.ZipFile(target, "w", method) as out:
        for name in source.namelist():
            out.writestr(name, source.read(name))
    return target


@pytest.mark.parametrize("damage", ["trailing bytes", "a second directory", "bzip2 members", "lzma members",
                                    "a corrupt deflate stream"])
def test_a_kit_not_laid_out_plainly_is_refused_by_every_reader(kit, tmp_path, damage):
    """Each is refused, with one line and exit status 2, by the installed verifier, and by the kit itself
    under python -S, with no traceback — except where the interpreter's own zip importer fails before any
    of the kit's code runs (it reads only stored and deflated members, and meets a corrupt stream first)."""
    build = {
        "trailing bytes": lambda t: with_bytes_appended(kit, t, b"junk"),
        "a second directory": lambda t: two_directories(kit, t),
        "bzip2 members": lambda t: recompressed(kit, t, zipfile.ZIP_BZIP2),
        "lzma members": lambda t: recompressed(kit, t, zipfile.ZIP_LZMA),
        "a corrupt deflate stream": lambda t: corrupt_deflate(kit, t),
    }[damage]
    path = build(tmp_path / "damaged.pyz")
    installed = subprocess.run([sys.executable, "-m", "certify.verifier", "--quiet", str(path)], capture_output=True,
                               text=True, cwd=ROOT)
    assert installed.returncode == 2 and "unreadable" in installed.stdout and "Traceback" not in installed.stderr
    itself = run_bare(path, "--quiet", cwd=tmp_path)
    assert itself.returncode != 0
    assert damage not in ("trailing bytes", "a second directory") or "Traceback" not in itself.stderr, \
        itself.stderr[-500:]


def corrupt_deflate(kit: Path, target: Path) -> Path:
    """The kit with one byte of the bundle's deflated data changed (the layout is intact)."""
    data = bytearray(kit.read_bytes())
    with zipfile.ZipFile(kit) as archive:
        info = archive.getinfo("appendix.json")
    start = info.header_offset + 30 + len(info.filename)
    data[start + 10] ^= 0xFF
    target.write_bytes(bytes(data))
    return target
