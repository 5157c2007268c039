"""Benchmark (a script, not a test): analytic rank witnesses beside cypari2's uncertified ``ellanalyticrank``.

For the first curves of Cremona's conductor < 1000 table (tests/data/conductor_lt_1000.txt) and the first
curves of the random sample of conductor 100,000–499,999 (tests/data/rank_100000_499999.txt), in one process:
build the witness (``certify.analytic.analytic_witness``, the conductor certificate it embeds included, and
again with that certificate given), check it (``certify.verifier.lseries.check_analytic_witness``), check it
again with its Frobenius hints removed (every a_p counted), time the a_p for p ≤ M alone both ways
(``frobenius_traces``), and run cypari2's ``ellinit`` + ``ellanalyticrank`` on the same coefficients; prints
milliseconds per curve, the share of curves with a witness, the truncation points, precisions and numbers of
hints used. Checks on the way that the proven order is cypari2's analytic rank, so the figures are about
correct runs.

    python bench/bench_analytic.py [table curves, default 200] [large-conductor curves, default 50]
"""
import pathlib
import sys
from fractions import Fraction

sys.path.insert(0, str(pathlib.Path(__file__).resolve().parent.parent / "tests"))

from certify.analytic import analytic_witness  # noqa: E402
from certify.conductor import certify_conductor  # noqa: E402
from certify.pari import pari  # noqa: E402
from certify.verifier.conductor import check_conductor_evidence  # noqa: E402
from certify.verifier.lseries import check_analytic_witness, frobenius_traces, read_hints  # noqa: E402
from conductor_reference import DATA, fixture_rows  # noqa: E402

sys.path.insert(0, str(pathlib.Path(__file__).resolve().parent))
from bench_conductor import timed  # noqa: E402


def run(name: str, curves: list) -> None:
    exact = [tuple(Fraction(c) for c in a) for a in curves]
    conductors, conductor_seconds = timed(certify_conductor, exact)
    witnesses, build_seconds = timed(lambda pair: analytic_witness(pair[0], pair[1]), list(zip(exact, conductors)))
    proven = [(a, w) for a, w in zip(exact, witnesses) if w is not None]
    orders, check_seconds = timed(lambda pair: check_analytic_witness(pair[0], pair[1], "evidence.analytic"), proven)
    ranks, pari_seconds = timed(lambda a: int(pari.ellanalyticrank(pari.ellinit(list(a)))[0]), curves)
    for a, w, rank in zip(curves, witnesses, ranks):
        if (w is None) != (rank >= 2):
            raise SystemExit(f"a witness is missing or wrongly built for {list(a)} (analytic rank {rank})")
    for (a, w), order in zip(proven, orders):
        if order != int(w["order"]):
            raise SystemExit(f"the verifier proved another order for {[str(c) for c in a]}")
    count = len(curves)
    ms = lambda seconds, n=count: f"{1000 * seconds / max(n, 1):9.2f} ms per curve"  # noqa: E731
    by_order = {order: [w for _, w in proven if w["order"] == order] for order in ("0", "1")}
    print(f"{name}: {count} curves, one process; witnesses for {len(proven)} ({100 * len(proven) / count:.1f}%), "
          f"rank 0: {len(by_order['0'])}, rank 1: {len(by_order['1'])}")
    print(f"  conductor certificate (certify_conductor)        {ms(conductor_seconds)}")
    print(f"  build the witness (conductor certificate given)  {ms(build_seconds)}")
    print(f"  check the witness (check_analytic_witness)       {ms(check_seconds, len(proven))}   "
          f"{check_seconds / len(proven) / (pari_seconds / count):6.2f}x ellanalyticrank")
    unhinted = [(a, {**w, "frobenius_hints": []}) for a, w in proven]
    _, unhinted_seconds = timed(lambda pair: check_analytic_witness(pair[0], pair[1], "evidence.analytic"), unhinted)
    hints = sorted(len(w["frobenius_hints"]) for _, w in proven)
    print(f"  check without the hints (every a_p counted)      {ms(unhinted_seconds, len(proven))}   "
          f"hints per witness median {hints[len(hints) // 2]}, max {hints[-1]}")
    stages = [(check_conductor_evidence(a, w["conductor"], "conductor"), w) for a, w in proven]
    for label, with_hints in (("a_p for p <= M, with the hints", True), ("a_p for p <= M, all counted  ", False)):
        _, seconds = timed(lambda stage: traces(*stage, with_hints), stages)
        print(f"    {label}              {ms(seconds, len(proven))}")
    for order, entries in by_order.items():
        if entries:
            subset = [(a, w) for a, w in proven if w["order"] == order]
            _, seconds = timed(lambda pair: check_analytic_witness(pair[0], pair[1], "evidence.analytic"), subset)
            truncations = sorted(int(w["truncation"]) for w in entries)
            bits = sorted(int(w["precision_bits"]) for w in entries)
            print(f"    order {order}: check {ms(seconds, len(subset))}; truncation median {truncations[len(entries) // 2]}, "
                  f"max {truncations[-1]}; precision median {bits[len(entries) // 2]}, max {bits[-1]} bits")
    print(f"  cypari2 ellinit + ellanalyticrank                {ms(pari_seconds)}   (uncertified)")


def traces(conductor_data: tuple, entry: dict, with_hints: bool) -> dict:
    """The verifier's a_p for p ≤ M of the witness, with its Frobenius hints or every one counted."""
    model, _, local = conductor_data
    truncation = int(entry["truncation"])
    hints = read_hints(entry["frobenius_hints"], truncation, "hints") if with_hints else []
    return frobenius_traces(model, local, truncation, hints)


def rank_rows(name: str) -> list:
    """The curves of a rank fixture (lines 'conductor class_index rank a1 … a6')."""
    rows = []
    for line in (DATA / name).read_text().splitlines():
        if line.strip() and not line.startswith("#"):
            rows.append(tuple(int(v) for v in line.split()[3:]))
    return rows


def main() -> None:
    table = int(sys.argv[1]) if len(sys.argv) > 1 else 200
    large = int(sys.argv[2]) if len(sys.argv) > 2 else 50
    run(f"the first {table} curves of the conductor < 1000 table", [a for _, a in fixture_rows("conductor_lt_1000.txt")[:table]])
    if large:
        run(f"{large} random curves of conductor 100,000-499,999", rank_rows("rank_100000_499999.txt")[:large])


if __name__ == "__main__":
    main()
