"""Benchmark: isogeny-class certificates for the first N curves of the conductor < 1000 table, in one
process: ms per curve to certify and to verify, beside cypari2's uncertified ellisomat on the same
curves in the same run. Targets for issue 3: certify within 5x and verify within 2x of ellisomat.

    python bench/bench_isogeny.py [N]      (default 500)
"""
import pathlib
import sys
import time
from fractions import Fraction

ROOT = pathlib.Path(__file__).resolve().parent.parent
sys.path[:0] = [str(ROOT), str(ROOT / "tests")]

from certify.isogeny.certificate import certify_isogeny_class  # noqa: E402
from certify.pari import pari  # noqa: E402
from certify.verifier import verify  # noqa: E402
from isogeny_reference import table_rows  # noqa: E402


def main(count: int) -> None:
    rows = [a for _, _, a in table_rows()[:count]]
    started = time.perf_counter()
    for a in rows:
        pari.ellisomat(pari.ellinit(list(a)))
    reference = time.perf_counter() - started
    certificates, started = [], time.perf_counter()
    for a in rows:
        certificates.append(certify_isogeny_class(tuple(Fraction(c) for c in a)))
    certifying = time.perf_counter() - started
    started = time.perf_counter()
    for cert in certificates:
        verify(cert)
    verifying = time.perf_counter() - started
    per = lambda seconds: 1000 * seconds / len(rows)  # noqa: E731
    print(f"{len(rows)} curves of the conductor < 1000 table")
    print(f"ellisomat (reference, uncertified): {per(reference):8.2f} ms per curve")
    print(f"certify isogeny-class:             {per(certifying):8.2f} ms per curve "
          f"({certifying / reference:.1f}x the reference; target 5x)")
    print(f"verify:                            {per(verifying):8.2f} ms per curve "
          f"({verifying / reference:.1f}x the reference; target 2x)")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 500)
