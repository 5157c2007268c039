"""Benchmark (a script, not a test): the cost of a torsion certificate against the uncertified answer.

Certifies and verifies the torsion of the first curves of Cremona's conductor < 1000 table (the
fixture tests/data/conductor_lt_1000.txt) in one process, then runs cypari2's own torsion routine
(``ellinit`` + ``elltors``, no certificate) on the same curves, and prints milliseconds per curve
for each. Checks, on the way, that all three agree, so the figures are about correct runs.

    python bench/bench_torsion.py [number of curves, default 1000]
"""
import pathlib
import sys
import time
from fractions import Fraction

sys.path.insert(0, str(pathlib.Path(__file__).resolve().parent.parent / "tests"))

from certify.torsion import certify_torsion  # noqa: E402
from certify.verifier import verify  # noqa: E402
from torsion_pool import pari, table_curves  # noqa: E402


def per_curve_ms(seconds: float, count: int) -> str:
    return f"{1000 * seconds / count:8.2f} ms per curve"


def main() -> None:
    count = int(sys.argv[1]) if len(sys.argv) > 1 else 1000
    curves = [a for _, a in table_curves()[:count]]

    start = time.perf_counter()
    certificates = [certify_torsion(tuple(Fraction(c) for c in a)) for a in curves]
    certify_seconds = time.perf_counter() - start

    start = time.perf_counter()
    for cert in certificates:
        verify(cert)
    verify_seconds = time.perf_counter() - start

    start = time.perf_counter()
    reference = [pari.elltors(pari.ellinit(list(a)))[1] for a in curves]
    reference_seconds = time.perf_counter() - start

    for a, cert, groups in zip(curves, certificates, reference):
        if [int(n) for n in cert["claim"]["invariants"]] != [int(n) for n in reversed(groups)]:
            raise SystemExit(f"certify and elltors disagree on {list(a)}")

    print(f"torsion of the first {len(curves)} curves of the conductor < 1000 table, one process")
    print(f"  certify (certify_torsion)        {per_curve_ms(certify_seconds, len(curves))}")
    print(f"  verify  (certify.verifier)       {per_curve_ms(verify_seconds, len(curves))}")
    print(f"  cypari2 ellinit + elltors        {per_curve_ms(reference_seconds, len(curves))}  (uncertified)")


if __name__ == "__main__":
    main()
