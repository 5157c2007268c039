"""Figures for batch certification (issue 4), printed side by side; nothing is asserted.

    python bench/bench_batch.py [--curves 500] [--scaling 2000] [--memory 20000] [--memory-kinds torsion|both]

1. On the first N curves of Cremona's table (tests/data/conductor_lt_1000.txt), one process, both
   certificates per curve: the time of PARI's uncertified elltors + ellisomat on the same curves, the
   time to certify, and the time to verify all the certificates; their ratios; the median certificate size.
2. The first S curves (default 2000, so that the second or so each run spends starting PARI is
   amortised) through ``certify batch`` with 1 and with 2 workers: wall-clock times and speed-up.
3. A run of M curves (the table and quadratic twists of it) through ``certify batch`` into a SQLite
   store, in a child process: peak resident memory after the first M/4 curves and after all M.
"""
from __future__ import annotations

import argparse
import json
import os
import resource
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from certify.certificates import certifiers, to_json  # noqa: E402
from certify.curves import Curve  # noqa: E402
from certify.pari import pari  # noqa: E402
from certify.verifier import verify  # noqa: E402

TABLE = ROOT / "tests" / "data" / "conductor_lt_1000.txt"


def table_curves() -> list:
    """The coefficient lists of the table, in its order."""
    rows = [line.split() for line in TABLE.read_text().splitlines() if not line.startswith("#")]
    return [[int(c) for c in row[2:7]] for row in rows]


def twisted(curves: list, count: int) -> list:
    """``count`` curves: the table, then its quadratic twists y^2 = x^3 - 27c4·d²x - 54c6·d³ for d = -1, 2, -2, 3, …"""
    out, twists = list(curves), [-1, 2, -2, 3, -3, 5, -5]
    for d in twists:
        if len(out) >= count:
            break
        for a in curves:
            curve = Curve(a)
            out.append([0, 0, 0, int(-27 * curve.c4 * d * d), int(-54 * curve.c6 * d ** 3)])
    return out[:count]


def write_batch(curves: list, folder: str, name: str) -> str:
    path = os.path.join(folder, name)
    with open(path, "w") as out:
        out.write("".join("[" + ",".join(map(str, a)) + "]\n" for a in curves))
    return path


def single_process(curves: list) -> None:
    started = time.perf_counter()
    for a in curves:
        curve = pari.ellinit(a)
        pari.elltors(curve)
        pari.ellisomat(curve)
    reference = time.perf_counter() - started
    builders = certifiers()
    texts, started = [], time.perf_counter()
    for a in curves:
        texts += [to_json(build(tuple(a))) for build in builders.values()]
    certifying = time.perf_counter() - started
    started = time.perf_counter()
    for text in texts:
        verify(json.loads(text))
    verifying = time.perf_counter() - started
    print(f"{len(curves)} curves, one process, certificates: {', '.join(builders)}")
    print(f"  PARI elltors + ellisomat (uncertified)  {reference:8.2f} s")
    print(f"  certify ({len(texts)} certificates)          {certifying:8.2f} s   {certifying / reference:5.2f}× PARI")
    print(f"  verify  ({len(texts)} certificates)          {verifying:8.2f} s   {verifying / reference:5.2f}× PARI")
    sizes = [len(text.encode()) for text in texts]
    print(f"  certificate size: median {statistics.median(sizes):.0f} bytes, largest {max(sizes)} bytes")


def batch_run(source: str, out: str, *options) -> float:
    started = time.perf_counter()
    subprocess.run([sys.executable, "-m", "certify", "batch", source, "-o", out, *options],
                   check=False, stderr=subprocess.DEVNULL, cwd=ROOT)
    return time.perf_counter() - started


def workers(curves: list, folder: str) -> None:
    source = write_batch(curves, folder, "workers.txt")
    load = os.getloadavg()[0]
    one = batch_run(source, os.path.join(folder, "one"), "--workers", "1")
    two = batch_run(source, os.path.join(folder, "two"), "--workers", "2")
    print(f"certify batch on the first {len(curves)} curves: 1 worker {one:.2f} s, 2 workers {two:.2f} s, "
          f"speed-up {one / two:.2f}× (load average before: {load:.1f} on {os.cpu_count()} cores; "
          "other work on the machine lowers the speed-up)")


def memory(curves: list, folder: str, kinds: str) -> None:
    """Peak RSS of batch runs over the first quarter and over all of the curves (fresh stores)."""
    for count in (len(curves) // 4, len(curves)):
        source = write_batch(curves[:count], folder, f"memory-{count}.txt")
        probe = ("import resource, sys; from certify.batch import run_batch; "
                 f"run_batch({source!r}, {os.path.join(folder, f'memory-{count}.sqlite')!r}, 2, "
                 f"{None if kinds == 'both' else 'torsion'!r}); "
                 "print(resource.getrusage(resource.RUSAGE_SELF).ru_maxrss, "
                 "resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss)")
        started = time.perf_counter()
        run = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True, cwd=ROOT)
        main, child = run.stdout.split()[-2:]
        print(f"batch of {count} curves ({kinds}, 2 workers): {time.perf_counter() - started:.0f} s, "
              f"peak RSS main process {int(main) / 1024:.0f} MiB, largest worker {int(child) / 1024:.0f} MiB")


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--curves", type=int, default=500)
    parser.add_argument("--scaling", type=int, default=2000)
    parser.add_argument("--memory", type=int, default=20000)
    parser.add_argument("--memory-kinds", choices=("torsion", "both"), default="torsion")
    args = parser.parse_args()
    curves = table_curves()
    with tempfile.TemporaryDirectory() as folder:
        if args.curves:
            single_process(curves[:args.curves])
        if args.scaling:
            workers(curves[:args.scaling], folder)
        if args.memory:
            memory(twisted(curves, args.memory), folder, args.memory_kinds)
    print(f"(this process: peak RSS {resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024:.0f} MiB)")


if __name__ == "__main__":
    main()
