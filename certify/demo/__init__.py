"""``certify demo [--out DIR]``: the author's workflow on the curves of an invented paper appendix.

For each curve of ``appendix.txt`` it writes a certificate of every kind this installation can write
(``certify.certificates.certifiers``: torsion, isogeny class, conductor, rank), verifies every file back
from disk, and writes the bundle ``appendix.json`` and the tables ``appendix-table.tex`` (a LaTeX
longtable, for ``\\input``) and ``appendix-table.md``. ``certify demo --out certificates-demo``
regenerates the demo folder of the repository.
"""
from __future__ import annotations

import os
import sys
import tempfile
import time
from importlib import resources

from certify.bundle import build_bundle
from certify.certificates import NotAccepted, accepted_certificates, certifiers, stamp, to_json, write_atomically
from certify.curves import parse_curve
from certify.tables import render

BUNDLE = "appendix.json"
TABLES = {"latex": "appendix-table.tex", "markdown": "appendix-table.md"}


def appendix_curves() -> list[str]:
    """The CURVE lines of the demo appendix."""
    text = resources.files("certify.demo").joinpath("appendix.txt").read_text(encoding="utf-8")
    return [line.strip() for line in text.splitlines() if line.strip() and not line.startswith("#")]


def run_demo(out: str | None) -> int:
    """Certify each curve, write and verify its certificates, bundle them, write the tables, print one."""
    folder = out or tempfile.mkdtemp(prefix="certify-demo-")
    os.makedirs(folder, exist_ok=True)
    paths, started = [], time.perf_counter()
    for index, line in enumerate(appendix_curves(), 1):
        for kind, build in certifiers().items():
            path = os.path.join(folder, f"appendix-curve-{index}.{kind}.json")
            write_atomically(path, to_json(stamp(build(parse_curve(line)))))
            paths.append(path)
    certified = time.perf_counter()
    try:
        certificates = accepted_certificates(paths)
    except NotAccepted as error:
        print(f"certify demo: {error}", file=sys.stderr)
        return 1
    verified = time.perf_counter()
    write_atomically(os.path.join(folder, BUNDLE), to_json(build_bundle(certificates)))
    for form, name in TABLES.items():
        write_atomically(os.path.join(folder, name), render(certificates, form))
    print(render(certificates, "markdown"))
    print(f"{len(certificates)} certificates written to {folder} in {certified - started:.1f} s and accepted by "
          f"the verifier in {verified - certified:.1f} s; bundle {BUNDLE}, tables {', '.join(TABLES.values())}.")
    return 0
