"""Benchmark (a script, not a test): conductor certificates beside cypari2's uncertified ``ellglobalred``.

For the first curves of Cremona's conductor < 1000 table (tests/data/conductor_lt_1000.txt) and the
500 random curves of conductor 100,000–499,999 (tests/data/conductor_100000_499999_local.txt), in one
process: certify each curve (``certify_conductor``), verify each certificate (``certify.verifier.verify``
on the parsed JSON, and again from its JSON text), and run cypari2's ``ellinit`` + ``ellglobalred`` on
the same coefficients; prints milliseconds per curve and the ratio verify / ellglobalred (the target is
at most 1). A third set, y² + y = x³ − x + b with b random of 25 digits (seed 1975), has discriminants
of about 50 digits, where ellglobalred must factor and the verifier only checks a factorisation. Checks
on the way that the conductors agree, so the figures are about correct runs.

    python bench/bench_conductor.py [number of table curves, default 500]
"""
import json
import pathlib
import random
import sys
import time
from fractions import Fraction

sys.path.insert(0, str(pathlib.Path(__file__).resolve().parent.parent / "tests"))

from certify.conductor import certify_conductor  # noqa: E402
from certify.pari import pari  # noqa: E402
from certify.verifier import verify  # noqa: E402
from conductor_reference import fixture_rows  # noqa: E402


def timed(function, items) -> tuple:
    """(results, seconds) of function over the items."""
    start = time.perf_counter()
    results = [function(item) for item in items]
    return results, time.perf_counter() - start


def run(name: str, curves: list) -> None:
    certificates, certify_seconds = timed(lambda a: certify_conductor(tuple(Fraction(c) for c in a)), curves)
    texts = [json.dumps(cert) for cert in certificates]
    _, verify_seconds = timed(verify, certificates)
    _, text_seconds = timed(lambda text: verify(json.loads(text)), texts)
    reference, pari_seconds = timed(lambda a: pari.ellglobalred(pari.ellinit(list(a)))[0], curves)
    for a, cert, conductor in zip(curves, certificates, reference):
        if cert["claim"]["conductor"] != str(conductor):
            raise SystemExit(f"certify and ellglobalred disagree on {list(a)}")
    count = len(curves)
    ms = lambda seconds: f"{1000 * seconds / count:8.3f} ms per curve"  # noqa: E731
    print(f"{name}: {count} curves, one process")
    print(f"  certify (certify_conductor)              {ms(certify_seconds)}")
    print(f"  verify  (certify.verifier, parsed JSON)  {ms(verify_seconds)}   {verify_seconds / pari_seconds:7.3f}x ellglobalred")
    print(f"  verify  (from JSON text)                 {ms(text_seconds)}   {text_seconds / pari_seconds:7.3f}x ellglobalred")
    print(f"  cypari2 ellinit + ellglobalred           {ms(pari_seconds)}   (uncertified)")
    print(f"  certificate size                         {sum(map(len, texts)) / count:8.0f} bytes per curve (compact JSON)")


def main() -> None:
    count = int(sys.argv[1]) if len(sys.argv) > 1 else 500
    run(f"the first {count} curves of the conductor < 1000 table",
        [a for _, a in fixture_rows("conductor_lt_1000.txt")[:count]])
    run("random curves of conductor 100,000-499,999", [a for _, a in fixture_rows("conductor_100000_499999_local.txt")])
    generator = random.Random(1975)
    run("y^2 + y = x^3 - x + b, b of 25 digits", [(0, 0, 1, -1, generator.randrange(10 ** 24, 10 ** 25))
                                                  for _ in range(100)])


if __name__ == "__main__":
    main()
