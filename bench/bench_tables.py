"""Figures for issue 14: certify and verify beside PARI's uncertified computation, each as a whole
process, on two fixtures; nothing is asserted.

    python bench/bench_tables.py [--sample 2000] [--first 500] [--slowest 10]
    python bench/bench_tables.py --traps

The fixtures: a fixed random sample of curves of conductor 100,000–499,999
(tests/data/conductor_100000_499999_sample.txt, what most of a table looks like) and the first curves
of the conductor < 1000 table (tests/data/conductor_lt_1000.txt, big classes). For each, four
processes are started one after the other and timed from start to exit:

1. PARI, uncertified: cypari2's ellinit + elltors + ellisomat on every curve;
2. ``certify batch FILE -o STORE.sqlite --workers 1 --only torsion --only isogeny-class``, the two
   certificates per curve that answer what (1) computes;
3. ``certify verify --quiet STORE.sqlite`` (JSON-Schema step included), one process;
4. ``python -S -m certify.verifier --quiet STORE.sqlite``, the standard-library verifier alone.

The ratios are to (1), by wall clock and by CPU time (user + system of the process and its children,
which other jobs on the machine lengthen less). The load average is printed before each process: the
machine's 2 cores are shared, and any load above the benchmark's own lengthens every figure. Then the slowest curves of
each fixture, both certificates certified in this process and timed one curve at a time, and the trap
classes of the isogeny issue (``trap_classes``), each certified and verified in this process.
"""
from __future__ import annotations

import argparse
import os
import resource
import subprocess
import sys
import tempfile
import time
from fractions import Fraction
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
DATA = ROOT / "tests" / "data"
KINDS = ("torsion", "isogeny-class")
"""The certificates that answer what PARI's elltors + ellisomat compute."""
FIXTURES = {"sample": DATA / "conductor_100000_499999_sample.txt", "first": DATA / "conductor_lt_1000.txt"}

PARI_REFERENCE = """
import sys, cypari2
pari = cypari2.Pari()
pari.allocatemem(10 ** 8, 4 * 10 ** 9, silent=True)  # as certify/pari.py: ellisomat needs more than the default
for line in open(sys.argv[1]):
    curve = pari.ellinit([int(c) for c in line.strip()[1:-1].split(",")])
    pari.elltors(curve)
    pari.ellisomat(curve)
"""


def fixture_curves(path: Path, count: int) -> list:
    """The first ``count`` coefficient lists of a fixture (lines ``conductor class a1 a2 a3 a4 a6``)."""
    rows = [line.split() for line in path.read_text().splitlines() if not line.startswith("#")]
    return [[int(c) for c in row[2:7]] for row in rows[:count]]


def load() -> str:
    return "load " + "/".join(f"{value:.2f}" for value in os.getloadavg())


def timed(command: list) -> tuple[float, float, str]:
    """(wall-clock seconds, CPU seconds, load average before) of one process, which must succeed."""
    before, used = load(), resource.getrusage(resource.RUSAGE_CHILDREN)
    started = time.perf_counter()
    subprocess.run(command, check=True, cwd=ROOT, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    wall, after = time.perf_counter() - started, resource.getrusage(resource.RUSAGE_CHILDREN)
    return wall, after.ru_utime + after.ru_stime - used.ru_utime - used.ru_stime, before


def four_figures(name: str, curves: list, folder: str) -> None:
    source = os.path.join(folder, f"{name}.txt")
    with open(source, "w") as out:
        out.write("".join("[" + ",".join(map(str, a)) + "]\n" for a in curves))
    store = os.path.join(folder, f"{name}.sqlite")
    runs = [
        ("PARI elltors + ellisomat (uncertified)", [sys.executable, "-c", PARI_REFERENCE, source]),
        ("certify batch --workers 1", [sys.executable, "-m", "certify", "batch", source, "-o", store, "--workers", "1",
                                       *(option for kind in KINDS for option in ("--only", kind))]),
        ("certify verify (schema step included)", [sys.executable, "-m", "certify", "verify", "--quiet", store]),
        ("python -S -m certify.verifier", [sys.executable, "-S", "-m", "certify.verifier", "--quiet", store]),
    ]
    print(f"{len(curves)} curves of {FIXTURES[name].name}, {2 * len(curves)} certificates, each figure one whole process:")
    reference = None
    for label, command in runs:
        seconds, cpu, before = timed(command)
        reference = reference or (seconds, cpu)
        print(f"  {label:40s} {seconds:7.2f} s  {1000 * seconds / len(curves):6.2f} ms/curve  "
              f"{seconds / reference[0]:5.2f}× PARI;  CPU {cpu:7.2f} s  {cpu / reference[1]:5.2f}× PARI   "
              f"({before} before)", flush=True)


def slowest(name: str, curves: list, count: int) -> None:
    """The ``count`` curves whose two certificates take longest, certified in this process."""
    sys.path.insert(0, str(ROOT))
    from certify.certificates import certifiers

    builders = [certifiers()[kind] for kind in KINDS]
    times = []
    for a in curves:
        started = time.perf_counter()
        for build in builders:
            build(tuple(Fraction(c) for c in a))
        times.append((time.perf_counter() - started, a))
    times.sort(reverse=True)
    print(f"slowest {count} curves of {FIXTURES[name].name} (both certificates, in one process; {load()}):")
    for seconds, a in times[:count]:
        print(f"  {1000 * seconds:8.1f} ms  {a}")


def trap_classes() -> dict:
    """The traps of tests/test_isogeny_traps.py, one curve per class: label → a-invariants."""
    sys.path.insert(0, str(ROOT))
    from certify.curves import Curve
    from certify.pari import pari
    from certify.verifier.isogeny import FINITE_J

    def with_j(j):
        return Curve(tuple(Fraction(str(c)) for c in pari.ellfromj(str(j)))).minimal_model()[0].a

    traps = {"Sutherland's j = 2268945/128": with_j(Fraction(2268945, 128))}
    traps.update({f"j-list, degree {ell}, j = {j}": with_j(j) for ell in (11, 17, 19, 37, 43, 67)
                  for j in FINITE_J[ell]})
    traps.update({"degree 163, conductor 163^2": (0, 0, 1, -2174420, 1234136692),
                  "8 curves, degree 16": (1, 1, 1, -10, -10), "degree 25": (0, -1, 1, -10, -20),
                  "degree 27": (0, 0, 1, 0, -7), "full 2-torsion": (0, 0, 0, -1, 0),
                  "every curve and every ell": (1, 0, 1, 4, -6)})
    traps.update({f"y^2 = x^3 + {k}": (0, 0, 0, 0, k) for k in (1, -1, 2, 16, -432, 3, -27, 5)})
    traps.update({f"y^2 = x^3 + {d}x": (0, 0, 0, d, 0) for d in (1, -1, 2, -2, 4, -4, 3, 5)})
    return traps


def trap_times() -> None:
    """Certify and verify time of the isogeny-class certificate of each trap class, slowest first."""
    from certify.isogeny.certificate import certify_isogeny_class
    from certify.verifier import verify

    times = []
    for label, a in trap_classes().items():
        started = time.process_time()
        certificate = certify_isogeny_class(tuple(Fraction(c) for c in a))
        certifying = time.process_time() - started
        started = time.process_time()
        verify(certificate)
        times.append((certifying, time.process_time() - started, label, len(certificate["claim"]["curves"])))
    times.sort(reverse=True)
    print(f"trap classes of the isogeny issue, CPU seconds in this process ({load()}):")
    for certifying, verifying, label, size in times:
        print(f"  certify {certifying:6.2f} s  verify {verifying:6.2f} s  {size} curves  {label}")


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--sample", type=int, default=2000, help="curves of the large-conductor sample")
    parser.add_argument("--first", type=int, default=500, help="first curves of the conductor < 1000 table")
    parser.add_argument("--slowest", type=int, default=10, help="slowest curves listed per fixture (0: none)")
    parser.add_argument("--traps", action="store_true", help="only the trap classes of the isogeny issue")
    args = parser.parse_args()
    if args.traps:
        return trap_times()
    counts = {"sample": args.sample, "first": args.first}
    with tempfile.TemporaryDirectory() as folder:
        for name, count in counts.items():
            if count:
                four_figures(name, fixture_curves(FIXTURES[name], count), folder)
    for name, count in counts.items():
        if count and args.slowest:
            slowest(name, fixture_curves(FIXTURES[name], count), args.slowest)
    trap_times()


if __name__ == "__main__":
    main()
