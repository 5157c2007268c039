"""Benchmark (a script, not a test): conductor certificates and full rank certificates (descents and analytic
witnesses) beside cypari2's uncertified ``ellglobalred``, ``ellrank`` and ``ellanalyticrank``.

For the first curves of Cremona's conductor < 1000 table (tests/data/rank_lt_1000.txt) and the 500 random
curves of conductor 100,000–499,999 (tests/data/rank_100000_499999.txt), in one process:

- conductor: certify each curve (``certify_conductor``), verify each certificate (``certify.verifier.verify``),
  and run cypari2's ``ellinit`` + ``ellglobalred``; the target is verify ≤ 1× ellglobalred;
- rank: certify each curve (``certify_rank``), verify each certificate, and run cypari2's ``ellinit`` +
  ``ellrank`` and ``ellinit`` + ``ellanalyticrank``; the target is certify + verify ≤ 3× ellrank; the analytic
  witnesses alone (``certify.analytic.analytic_witness`` and ``certify.verifier.lseries.check_analytic_witness``)
  are timed again on the curves whose certificate carries one;
- shares: ranks proven (rank_lower = rank_upper), by which witness, beside ellrank's closed bounds, the share
  of analytic rank ≤ 1 by ellanalyticrank (the most an analytic witness can prove) and the table's rank ≥ 2.

Milliseconds are means per curve of the set (worst case beside), ratios are of total times.

    python bench/bench_rank_analytic.py [number of table curves, default 500]
"""
import pathlib
import sys
import time
from fractions import Fraction

sys.path.insert(0, str(pathlib.Path(__file__).resolve().parent.parent / "tests"))

from bench_rank import share, timed  # noqa: E402
from certify.analytic import analytic_witness  # noqa: E402
from certify.conductor import certify_conductor  # noqa: E402
from certify.rank.certificate import certify_rank  # noqa: E402
from certify.verifier import verify  # noqa: E402
from certify.verifier.lseries import check_analytic_witness  # noqa: E402
from rank_reference import fixture_rows, pari  # noqa: E402


def exact(a) -> tuple:
    return tuple(Fraction(c) for c in a)


def ms(seconds: list) -> str:
    if not seconds:
        return "        -"
    return f"{1000 * sum(seconds) / len(seconds):9.2f} ms  (worst {1000 * max(seconds):8.1f} ms)"


def ratio(numerator: list, denominator: list) -> str:
    return f"{sum(numerator) / sum(denominator):7.2f}x"


def conductor_part(curves: list) -> None:
    certificates, certify_seconds = timed(lambda a: certify_conductor(exact(a)), curves)
    _, verify_seconds = timed(verify, certificates)
    reference, pari_seconds = timed(lambda a: int(pari.ellglobalred(pari.ellinit(list(a)))[0]), curves)
    disagree = [a for a, cert, n in zip(curves, certificates, reference) if cert["claim"]["conductor"] != str(n)]
    print("  conductor certificates")
    print(f"    certify (certify_conductor)            {ms(certify_seconds)}")
    print(f"    verify  (certify.verifier)             {ms(verify_seconds)}   {ratio(verify_seconds, pari_seconds)}"
          f" ellglobalred (target 1x)")
    print(f"    cypari2 ellinit + ellglobalred         {ms(pari_seconds)}   (uncertified)")
    print(f"    conductors unlike ellglobalred's       {len(disagree):9d}")


def rank_part(rows: list) -> None:
    curves = [a for *_, a in rows]
    ranks = [rank for _, _, rank, _ in rows]
    certificates, certify_seconds = timed(lambda a: certify_rank(exact(a)), curves)
    _, verify_seconds = timed(verify, certificates)
    ellrank, ellrank_seconds = timed(lambda a: [int(v) for v in pari.ellrank(pari.ellinit(list(a)))[:2]], curves)
    analytic, analytic_seconds = timed(lambda a: int(pari.ellanalyticrank(pari.ellinit(list(a)))[0]), curves)
    witnesses = [cert["evidence"]["analytic"] for cert in certificates]
    with_witness = [(a, witness) for a, witness in zip(curves, witnesses) if witness is not None]
    _, witness_seconds = timed(lambda item: analytic_witness(exact(item[0])), with_witness)
    _, check_seconds = timed(lambda item: check_analytic_witness(exact(item[0]), item[1], "evidence.analytic"),
                             with_witness)
    bounds = [(int(c["claim"]["rank_lower"]), c["claim"]["rank_upper"] and int(c["claim"]["rank_upper"]))
              for c in certificates]
    proven = [lo == hi for lo, hi in bounds]
    by_descent = [p and w is None for p, w in zip(proven, witnesses)]
    by_analytic = [p and w is not None for p, w in zip(proven, witnesses)]
    both = [s + v for s, v in zip(certify_seconds, verify_seconds)]
    print("  rank certificates")
    print(f"    certify (certify_rank)                 {ms(certify_seconds)}   "
          f"{ratio(certify_seconds, ellrank_seconds)} ellrank")
    print(f"    verify  (certify.verifier)             {ms(verify_seconds)}   {ratio(verify_seconds, ellrank_seconds)}"
          f" ellrank")
    print(f"    certify + verify                       {ms(both)}   {ratio(both, ellrank_seconds)} ellrank (target 3x)")
    print(f"    cypari2 ellinit + ellrank              {ms(ellrank_seconds)}   (uncertified)")
    print(f"    cypari2 ellinit + ellanalyticrank      {ms(analytic_seconds)}   (uncertified)")
    print(f"    analytic witness alone, certify        {ms(witness_seconds)}   ({len(with_witness)} curves with one)")
    print(f"    analytic witness alone, verify         {ms(check_seconds)}")
    print(f"    {'':38} {'certificates':>22} {'ellrank':>22}")
    print(f"    {'rank proven (lower = upper)':38} {share(proven):>22} {share(lo == hi for lo, hi in ellrank):>22}")
    print(f"    {'  by the descent alone':38} {share(by_descent):>22}")
    print(f"    {'  with an analytic witness':38} {share(by_analytic):>22}")
    print(f"    {'  among table rank <= 1':38} {share(p for p, r in zip(proven, ranks) if r <= 1):>22} "
          f"{share(lo == hi for (lo, hi), r in zip(ellrank, ranks) if r <= 1):>22}")
    print(f"    {'  among table rank >= 2':38} {share(p for p, r in zip(proven, ranks) if r >= 2):>22} "
          f"{share(lo == hi for (lo, hi), r in zip(ellrank, ranks) if r >= 2):>22}")
    print(f"    {'certificates with an analytic witness':38} {share(witness is not None for witness in witnesses):>22}")
    print(f"    {'analytic rank <= 1 (ellanalyticrank)':38} {share(r <= 1 for r in analytic):>22}")
    print(f"    {'table rank >= 2':38} {share(r >= 2 for r in ranks):>22}")
    print(f"    {'proven rank = table rank':38} {share(lo == r for (lo, hi), r in zip(bounds, ranks) if lo == hi):>22}")
    print(f"    {'witness order = ellanalyticrank':38} "
          f"{share(int(w['order']) == r for w, r in zip(witnesses, analytic) if w is not None):>22}")


def run(name: str, rows: list) -> None:
    print(f"\n{name}: {len(rows)} curves, one process")
    conductor_part([a for *_, a in rows])
    rank_part(rows)


def main() -> None:
    count = int(sys.argv[1]) if len(sys.argv) > 1 else 500
    start = time.perf_counter()
    run(f"the first {count} curves of the conductor < 1000 table", fixture_rows("rank_lt_1000.txt")[:count])
    run("random curves of conductor 100,000-499,999", fixture_rows("rank_100000_499999.txt"))
    print(f"\ntotal {time.perf_counter() - start:.0f} s")


if __name__ == "__main__":
    main()
