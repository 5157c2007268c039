"""Benchmark (a script, not a test): rank certificates beside cypari2's uncertified ``ellrank``.

For the first curves of Cremona's conductor < 1000 table (tests/data/rank_lt_1000.txt) and the 500
random curves of conductor 100,000–499,999 (tests/data/rank_100000_499999.txt), in one process:
certify each curve (``certify_rank``), verify each certificate (``certify.verifier.verify`` on the
parsed JSON), and run cypari2's ``ellinit`` + ``ellrank`` on the same coefficients. Prints milliseconds
per curve (mean and worst), the share of curves whose rank is proven (rank_lower = rank_upper), overall
and among the curves with a rational point of order 2, and the share whose lower bound reaches the
table's rank, beside the same shares for ellrank's bounds.

    python bench/bench_rank.py [number of table curves, default 500]
"""
import json
import pathlib
import sys
import time
from fractions import Fraction

sys.path.insert(0, str(pathlib.Path(__file__).resolve().parent.parent / "tests"))

from certify.rank.certificate import certify_rank  # noqa: E402
from certify.verifier import verify  # noqa: E402
from rank_reference import fixture_rows, has_rational_two_torsion, pari  # noqa: E402


def timed(function, items) -> tuple:
    """(results, seconds per item) of function over the items."""
    results, seconds = [], []
    for item in items:
        start = time.perf_counter()
        results.append(function(item))
        seconds.append(time.perf_counter() - start)
    return results, seconds


def share(flags) -> str:
    flags = list(flags)
    return f"{sum(flags) / len(flags):7.1%} ({sum(flags)}/{len(flags)})" if flags else "      - (0/0)"


def run(name: str, rows: list) -> None:
    curves = [a for *_, a in rows]
    ranks = [rank for _, _, rank, _ in rows]
    certificates, certify_seconds = timed(lambda a: certify_rank(tuple(Fraction(c) for c in a)), curves)
    _, verify_seconds = timed(verify, certificates)
    reference, pari_seconds = timed(lambda a: [int(v) for v in pari.ellrank(pari.ellinit(list(a)))[:2]], curves)
    bounds = [(int(c["claim"]["rank_lower"]), c["claim"]["rank_upper"] and int(c["claim"]["rank_upper"]))
              for c in certificates]
    two_torsion = [has_rational_two_torsion(a) for a in curves]
    size = sum(len(json.dumps(c)) for c in certificates) / len(curves)
    def ms(seconds) -> str:
        return f"{1000 * sum(seconds) / len(seconds):9.2f} ms  (worst {1000 * max(seconds):8.1f} ms)"

    print(f"\n{name}: {len(curves)} curves, one process")
    print(f"  certify (certify_rank)                 {ms(certify_seconds)}")
    print(f"  verify  (certify.verifier, parsed)     {ms(verify_seconds)}   "
          f"{sum(verify_seconds) / sum(pari_seconds):6.2f}x ellrank")
    print(f"  cypari2 ellinit + ellrank              {ms(pari_seconds)}   (uncertified)")
    print(f"  certificate size                       {size:9.0f} bytes per curve (JSON)")
    print(f"  {'':38} {'certificates':>22} {'ellrank':>22}")
    print(f"  {'rank proven (lower = upper)':38} {share(lo == hi for lo, hi in bounds):>22} "
          f"{share(lo == hi for lo, hi in reference):>22}")
    print(f"  {'  with a rational point of order 2':38} "
          f"{share(lo == hi for (lo, hi), t in zip(bounds, two_torsion) if t):>22} "
          f"{share(lo == hi for (lo, hi), t in zip(reference, two_torsion) if t):>22}")
    print(f"  {'  without':38} {share(lo == hi for (lo, hi), t in zip(bounds, two_torsion) if not t):>22} "
          f"{share(lo == hi for (lo, hi), t in zip(reference, two_torsion) if not t):>22}")
    print(f"  {'lower bound = table rank':38} {share(lo == r for (lo, _), r in zip(bounds, ranks)):>22} "
          f"{share(lo == r for (lo, _), r in zip(reference, ranks)):>22}")
    print(f"  {'bounds contain the table rank':38} "
          f"{share(lo <= r and (hi is None or r <= hi) for (lo, hi), r in zip(bounds, ranks)):>22} "
          f"{share(lo <= r <= hi for (lo, hi), r in zip(reference, ranks)):>22}")


def main() -> None:
    count = int(sys.argv[1]) if len(sys.argv) > 1 else 500
    run(f"the first {count} curves of the conductor < 1000 table", fixture_rows("rank_lt_1000.txt")[:count])
    run("random curves of conductor 100,000-499,999", fixture_rows("rank_100000_499999.txt"))


if __name__ == "__main__":
    main()
