"""Hostile rank certificates, mechanism *cost within the limits*: files inside every documented limit
(certify/verifier/limits.py) whose checks the author steers towards expensive work — points of enormous
height repeated on a descent side (read and checked on the curve before any budget is charged), every
budget of a rank certificate spent at once, Euler tests modulo a 998-digit prime, 20,000 discs of
1,000-digit quartics, thousands of local generators, character primes up to the work limit, valuations of
4,000-digit numbers. Each file is built here from a genuine certificate (tests/rank_mutations.py) and given
to both entry points (tests/hostile_run.py): answered within its time and memory bounds, one verdict, no
traceback; the verdict or the check that refuses the file is asserted too."""
from __future__ import annotations

import copy
import functools
import json
import sys
from fractions import Fraction

import pytest

import rank_mutations as rm
from certify.verifier.curves import change_point, count_points
from certify.verifier.theorems import entries
from certify.verifier.rank import RELIES_ON_DESCENT
from hostile_run import ENTRY_POINTS, assert_answered, run, write_files
from rank_reference import pari

PROTH_PRIMES = ((3302, 777), (3300, 7161), (3301, 3351), (3303, 1629), (3304, 933), (3305, 905), (3306, 1129),
                (3307, 4481), (3308, 133))
"""(e, k) with k·2^e + 1 prime, 997 to 1,000 digits: the least odd k for each e, found by a search with
cypari2's ``ispseudoprime``; the verifier proves each by its Pocklington check (2^e > √n, so the factor 2
alone suffices), and the tests fail if one is not a BPSW probable prime (cypari2 ``ispseudoprime``)."""

LIMIT_CHECKS = ("descent size", "rank work", "list size", "work", "primality limit")
"""The checks that refuse a certificate for the work it would cause, before that work."""


def congruent_five() -> dict:
    """The pool's certificate of y² = x³ − 25x (rank 1, cypari2 ellrank)."""
    cert, _ = next((copy.deepcopy(c), r) for c, r in rm.pool() if c["curve"] == ["0", "0", "0", "-25", "0"])
    return cert


@functools.cache
def high_point(digits: int = 4000) -> list:
    """The largest multiple kP of the point (−4, 6) of y² = x³ − 25x (cypari2 ellmul) whose coordinates have
    numerators and denominators of at most ``digits`` digits (about 3,880 for k = 56)."""
    if hasattr(sys, "set_int_max_str_digits"):
        sys.set_int_max_str_digits(100_000)
    curve, best = pari.ellinit([0, 0, 0, -25, 0]), None
    for k in range(2, 200):
        point = [str(v) for v in pari.ellmul(curve, [-4, 6], k)]
        if max(len(part.lstrip("-")) for v in point for part in v.split("/")) > digits:
            return best
        best = point
    raise AssertionError("no multiple is large enough")


def proth_certificates(count: int) -> list:
    """Pocklington certificates of the first ``count`` PROTH_PRIMES, each with the factor 2 of n − 1 and a
    quadratic non-residue as base (cypari2 kronecker): about 1,000 units of the primality budget each."""
    out = []
    for e, k in PROTH_PRIMES[:count]:
        n = k * 2 ** e + 1
        base = next(b for b in range(3, 1000) if pari.kronecker(b, n) == -1)
        out.append({"prime": str(n), "factors": [{"factor": "2", "base": str(base)}]})
    return out


def on_descent_model(cert: dict, point: list) -> list:
    """The image of a point of the input curve on the descent's model y² = x³ + a x² + b x."""
    change = tuple(Fraction(v) for v in cert["evidence"]["descent"]["change"])
    return [str(v) for v in change_point(tuple(Fraction(v) for v in point), change)]


def side_points_attack() -> dict:
    """1,150 copies of a 3,880-digit point on the side of E of a genuine certificate (15 MB, under every limit):
    each is checked on the curve in exact rational arithmetic, with no budget charged."""
    cert = congruent_five()
    cert["evidence"]["descent"][rm.side_on_e()]["points"] += [on_descent_model(cert, high_point())] * 1150
    return cert


def all_budgets_attack() -> dict:
    """The side points, with character primes whose point counts fill MAX_WORK (primes q < 100,000 with
    3 ∥ #Ẽ(F_q)) and nine Pocklington certificates of 1,000-digit primes (9,000 of the 10,000 units):
    each budget is separate, so a certificate may spend them all."""
    cert = side_points_attack()
    model = tuple(int(c) for c in cert["evidence"]["integral_model"]["curve"])
    independence = cert["evidence"]["independence"]
    independence["character_primes"] = [str(q) for q in filling_primes(model, int(independence["ell"]))]
    cert["evidence"]["descent"]["pocklington"] = proth_certificates(9)
    return cert


@functools.cache
def filling_primes(model: tuple, ell: int) -> list:
    """The largest primes q < 100,000 of good reduction with ℓ ∥ #Ẽ(F_q) (counted here), increasing, until
    Σ q > 4,850,000."""
    delta, primes, q = int(pari.ellinit(list(model)).disc()), [], 99_999
    while sum(primes) < 4_850_000:
        if pari.isprime(q) and delta % q:
            count = count_points(model, q)
            if count % ell == 0 and count % (ell * ell) != 0:
                primes.append(q)
        q -= 2
    return sorted(primes)


def large_prime_curve_certificate(generators: int) -> dict:
    """y² = x³ + p x with p = 777·2^3302 + 1 (997 digits, proven by its Pocklington certificate), T = {∞, 2, p}:
    ``generators`` copies of the local generator d = 1 with the witness (M, e) = (2, 0) at p, so that each
    costs an Euler test modulo p (an exponentiation with a 997-digit modulus)."""
    e, k = PROTH_PRIMES[0]
    p = k * 2 ** e + 1
    curve = ["0", "0", "0", str(p), "0"]
    membership = [{"prime": "2", "M": "1", "e": "0"}, {"prime": str(p), "M": "2", "e": "0"}]
    side = {"points": [["0", "0"]], "local_generators": [{"d": "1", "membership": membership}] * generators,
            "exclusions": []}
    return {"format": "certify-rank", "version": "1", "curve": curve,
            "claim": {"rank_lower": "0", "rank_upper": "0", "points": [],
                      "selmer_dimensions": {"phi": "1", "phi_dual": "1"}},
            "evidence": {"integral_model": {"change": ["1", "0", "0", "0"], "curve": curve}, "independence": None,
                         "descent": {"change": ["1", "0", "0", "0"], "a": "0", "b": str(p),
                                     "factorisation_b": [{"prime": str(p), "exponent": "1"}],
                                     "factorisation_b_dual": [{"prime": "2", "exponent": "2"},
                                                              {"prime": str(p), "exponent": "1"}],
                                     "pocklington": proth_certificates(1), "phi": side,
                                     "phi_dual": copy.deepcopy(side)},
                         "analytic": None},
            "relies_on": entries(RELIES_ON_DESCENT)}


def euler_attack() -> dict:
    """30 such generators: the local-work budget (about 1,000 units per Euler test at 997 digits) runs out
    at the twentieth."""
    return large_prime_curve_certificate(30)


def thousand_digit_discs_attack() -> dict:
    """y² = x³ + 3^2000 x (a 955-digit b): d = −1 on the side of E 'excluded' at 2 by the partition of Z_2 into its 16,384 discs
    of depth 13 and of 2Z_2 into its 4,096 of depth 13 — 12,288 leaf tests of quartics with 955-digit
    coefficients, every one conclusive (f1 = −t⁴ − 3^2000 is −2 mod 16 or −1 mod 8 on them); the other cosets
    are not excluded."""
    b = 3 ** 2000
    cert = large_prime_curve_certificate(0)
    curve = ["0", "0", "0", str(b), "0"]
    cert["curve"] = cert["evidence"]["integral_model"]["curve"] = curve
    descent = cert["evidence"]["descent"]
    descent.update(b=str(b), pocklington=[], factorisation_b=[{"prime": "3", "exponent": "2000"}],
                   factorisation_b_dual=[{"prime": "2", "exponent": "2"}, {"prime": "3", "exponent": "2000"}])
    exclusion = {"d": "-1", "place": "2", "t_discs": [[str(c), "13"] for c in range(2 ** 13)],
                 "s_discs": [[str(c), "13"] for c in range(0, 2 ** 13, 2)]}
    for side in ("phi", "phi_dual"):
        descent[side] = {"points": [["0", "0"]], "local_generators": [],
                         "exclusions": [exclusion] if side == rm.side_on_e() else []}
    return cert


def many_generators_attack() -> dict:
    """4,096 local generators d = 1 on the side of E: y² = x³ − 25x, each with the witness (M, e) = (3^523, 0)
    (a quartic value of 1,000 digits, a square everywhere) at both primes of T."""
    cert = congruent_five()
    descent = cert["evidence"]["descent"]
    places = sorted({2} | {int(f["prime"]) for f in descent["factorisation_b"] + descent["factorisation_b_dual"]})
    M = str(3 ** 523)
    generator = {"d": "1", "membership": [{"prime": str(p), "M": M, "e": "0"} for p in places]}
    descent[rm.side_on_e()]["local_generators"] = [generator] * 4096
    return cert


def high_claim_points_attack() -> dict:
    """64 copies of the 3,880-digit point as the claim's points: each read on the curve, reduced at every
    character prime; dependent, so refused by the independence check."""
    cert = congruent_five()
    cert["claim"]["points"] = [high_point()] * 64
    cert["claim"]["rank_lower"] = "64"
    return cert


def huge_valuations_attack() -> dict:
    """b = 3^8000 (3,818 digits) and a = 3^4000: the factorisations state the exponents 8000 and, for
    a² − 4b = −3·3^8000, 8001; valuations of 3,800-digit numbers by repeated squaring."""
    cert = thousand_digit_discs_attack()
    a, b = 3 ** 4000, 3 ** 8000
    curve = ["0", str(a), "0", str(b), "0"]
    cert["curve"] = cert["evidence"]["integral_model"]["curve"] = curve
    cert["evidence"]["descent"].update(
        a=str(a), b=str(b), factorisation_b=[{"prime": "3", "exponent": "8000"}],
        factorisation_b_dual=[{"prime": "3", "exponent": "8001"}])
    return cert


UNBUDGETED = {"1,150 points of 3,880 digits on a descent side": side_points_attack,
              "every budget spent at once": all_budgets_attack}

BUDGETED = {
    "Euler tests modulo a 997-digit prime": (euler_attack, ("rank work",)),
    "12,288 leaf tests of 955-digit quartics": (thousand_digit_discs_attack, ("cosets",)),
    "4,096 local generators with 1,000-digit values": (many_generators_attack, LIMIT_CHECKS),
    "64 claim points of 3,880 digits": (high_claim_points_attack, ("independence",)),
    "valuations of 3,800-digit numbers": (huge_valuations_attack, ("rank work", "cosets")),
}


def check_named(verdict: str) -> str:
    """The check a --quiet rejection line names ('rejected: FILE — CHECK: message …')."""
    return verdict.split(" — ", 1)[1].split(":", 1)[0]


@pytest.mark.parametrize("name", BUDGETED)
def test_budgeted_work_is_answered(tmp_path, name):
    build, checks = BUDGETED[name]
    path = write_files(tmp_path, {name: build}, "rank-cost")[name]
    for entry in ENTRY_POINTS:
        verdict, = assert_answered(run(entry, "--quiet", path))
        assert verdict.startswith("rejected: ") and check_named(verdict) in checks, (entry, verdict[:300])


@pytest.mark.parametrize("name", UNBUDGETED)
def test_unbudgeted_side_points_are_refused_by_a_limit(tmp_path, name):
    """The file must be answered within the bounds and refused by a limit before the work, as the hostile-input
    rules promise ('every costly step is budgeted before it runs')."""
    path = write_files(tmp_path, {name: UNBUDGETED[name]}, "rank-cost")[name]
    for entry in ENTRY_POINTS:
        verdict, = assert_answered(run(entry, "--quiet", path))
        assert verdict.startswith("rejected: ") and check_named(verdict) in LIMIT_CHECKS, (entry, verdict[:300])


def test_attack_files_are_what_they_say():
    """The builders make what their docstrings say: the side points are genuine points of the side's curve
    (the verifier's rejection would otherwise be cheap), the Proth numbers are probable primes (cypari2), the
    character primes fill the work limit."""
    from certify.verifier.limits import MAX_WORK
    cert = all_budgets_attack()
    x, y = (pari(v) for v in high_point())
    assert pari.ellisoncurve(pari.ellinit([0, 0, 0, -25, 0]), [x, y])
    descent = cert["evidence"]["descent"]
    side_curve = pari.ellinit([0, int(descent["a"]), 0, int(descent["b"]), 0])
    assert all(pari.ellisoncurve(side_curve, [pari(v) for v in P]) for P in descent[rm.side_on_e()]["points"])
    assert len(json.dumps(cert)) < 20_000_000
    assert all(pari.ispseudoprime(k * 2 ** e + 1) for e, k in PROTH_PRIMES)
    primes = [int(q) for q in cert["evidence"]["independence"]["character_primes"]]
    assert MAX_WORK - 200_000 < sum(primes) + int(cert["evidence"]["independence"]["torsion_prime"]) <= MAX_WORK
