"""``certify demo``: certify and verify the torsion of the curves of an invented paper appendix."""
from __future__ import annotations

import json
import os
import tempfile
import time
from importlib import resources

from certify.certificates import to_json, write_atomically
from certify.curves import Curve, parse_curve
from certify.torsion import certify_torsion
from certify.verifier import verify
from certify.verifier.cli import describe_claim


def appendix_curves() -> list[str]:
    """The CURVE lines of the demo appendix."""
    text = resources.files("certify.demo").joinpath("appendix.txt").read_text(encoding="utf-8")
    return [line.strip() for line in text.splitlines() if line.strip() and not line.startswith("#")]


def run_demo(out: str | None) -> int:
    """Certify each curve, write its certificate, verify the file back, and print a table."""
    folder = out or tempfile.mkdtemp(prefix="certify-demo-")
    os.makedirs(folder, exist_ok=True)
    rows, failures = [], 0
    for index, line in enumerate(appendix_curves(), 1):
        a = parse_curve(line)
        started = time.perf_counter()
        cert = certify_torsion(a)
        certified = time.perf_counter()
        path = os.path.join(folder, f"appendix-curve-{index}.torsion.json")
        write_atomically(path, to_json(cert))
        with open(path, encoding="utf-8") as handle:
            verify(json.load(handle))
        verified = time.perf_counter()
        rows.append((Curve(a).equation(), describe_claim(cert).split(", generated")[0].replace("E(Q)_tors ≅ ", ""),
                     f"{1000 * (certified - started):.0f}", f"{1000 * (verified - certified):.0f}"))
    widths = [max(len(row[i]) for row in rows + [("curve", "torsion", "certify ms", "verify ms")]) for i in range(4)]
    header = ("curve", "torsion", "certify ms", "verify ms")
    for row in [header] + rows:
        print("  ".join(cell.ljust(width) for cell, width in zip(row, widths)))
    print(f"\n{len(rows)} certificates written to {folder} and accepted by the verifier.")
    return 1 if failures else 0
