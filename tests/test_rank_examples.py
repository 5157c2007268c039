"""Rank certificates for curves with published or reference ranks, and traps.

Each example names its source beside it; every rank is also checked against cypari2's ``ellrank``
(reference library), and every certificate must be accepted by the verifier, list independent points on
the input model (cypari2 ``ellheightmatrix``) and carry a descent exactly when the curve has a rational
point of order 2, whose bound is the best 2-isogeny descent bound wherever cypari2 determines it
(tests/rank_reference.py) and is rank_upper unless an analytic witness proves less.
"""
import json
import subprocess
import sys
from fractions import Fraction

import pytest

from rank_reference import (descent_bounds, ellrank_bounds, fixture_rows, has_rational_two_torsion, independent,
                            pari, pari_curve, sha_two_rank, two_torsion_points)
from test_rank_table import certified, descent_bound, has_analytic_witness

TABLE = fixture_rows("rank_lt_1000.txt")
LARGE = fixture_rows("rank_100000_499999.txt")


def bounds_of(cert: dict) -> tuple:
    claim = cert["claim"]
    return int(claim["rank_lower"]), None if claim["rank_upper"] is None else int(claim["rank_upper"])


def check_honest(cert: dict, rank: int) -> tuple:
    """rank_lower <= rank <= rank_upper; the points are rank_lower independent points on the input model
    (cypari2); a descent exactly with a rational point of order 2, its bound never below the least a
    2-isogeny descent can give (rank + dim Sha(E)[2], cypari2 ell2cover) and equal to rank_upper unless
    an analytic witness proves less. Returns (rank_lower, rank_upper, descent bound)."""
    a = [Fraction(c) for c in cert["curve"]]
    lower, upper = bounds_of(cert)
    bound = descent_bound(cert)
    points = cert["claim"]["points"]
    assert lower == len(points) and independent(cert["curve"], points), points
    assert lower <= rank and (upper is None or rank <= upper)
    if has_rational_two_torsion(a):
        assert bound is not None and bound >= rank + sha_two_rank(a, rank)
    else:
        assert bound is None
    if has_analytic_witness(cert):
        assert upper is not None and (bound is None or upper <= bound)
    else:
        assert upper == bound
    return lower, upper, bound


def check_example(a, rank: int) -> dict:
    """The certificate of a proves what the source says: the lower bound is the rank, and the descent
    bound is the best 2-isogeny descent bound (the rank itself when Sha[2] of E and of a 2-isogenous
    curve vanish)."""
    cert = certified(a)
    assert cert["curve"] == [str(Fraction(c)) for c in a], "the certificate carries the input model"
    lower, _, bound = check_honest(cert, rank)
    assert lower == rank
    bounds = descent_bounds(a, rank)
    if bounds:
        assert bound == min(bounds), f"descent bounds {bounds}"
    return cert


def congruent(n: int) -> tuple:
    """y² = x³ − n²x: n is a congruent number exactly when the rank is positive (Koblitz, Ch. I)."""
    return (0, 0, 0, -n * n, 0)


# Koblitz, Introduction to Elliptic Curves and Modular Forms (2nd ed.), Ch. I (recalled from memory): 1, 2, 3
# are not congruent (rank 0; Fermat for 1 and 2), 5, 6, 7 are (rank 1: the right triangles with sides 3/2, 20/3,
# 41/6; 3, 4, 5; 24/5, 35/12, 337/60, areas and Pythagoras checked by hand). Each rank is also checked with
# cypari2's ellrank; 34 and 41 have rank 2 by ellrank alone.
CONGRUENT = [(1, 0), (2, 0), (3, 0), (5, 1), (6, 1), (7, 1), (34, 2), (41, 2)]


@pytest.mark.parametrize("n, rank", CONGRUENT)
def test_congruent_number_curves(n, rank):
    assert ellrank_bounds(congruent(n)) == (rank, rank)       # cypari2 ellrank
    cert = check_example(congruent(n), rank)
    assert bounds_of(cert) == (rank, rank)                     # full 2-torsion, Sha[2] = 0 (cypari2): descent closes


def test_congruent_157_finishes_with_honest_bounds():
    """n = 157 is congruent (rank 1, cypari2 ellrank) but the smallest generator has a numerator of
    dozens of digits (recalled from memory; PARI's documentation of ellrank takes this curve as its
    example of a rank found without a point), beyond a naive point search: the certifier must still
    finish, with honest bounds. Run in a subprocess with a hang guard (not a timing target)."""
    a = congruent(157)
    assert ellrank_bounds(a) == (1, 1)                         # cypari2 ellrank
    script = ("import json, sys\nfrom fractions import Fraction\nfrom certify.rank.certificate import certify_rank\n"
              "from certify.verifier import verify\n"
              f"cert = certify_rank(tuple(Fraction(c) for c in {list(a)}))\nverify(cert)\nprint(json.dumps(cert))\n")
    run = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True, timeout=1800)
    assert run.returncode == 0, run.stderr[-2000:]
    cert = json.loads(run.stdout)
    _, _, bound = check_honest(cert, 1)
    assert bound == min(descent_bounds(a, 1))                  # full 2-torsion: the best descent is sharp (cypari2)


# Silverman–Tate, Rational Points on Elliptic Curves (2nd ed.), §III.6 (recalled from memory): for p prime,
# y² = x³ + px has rank at most 2, by the 2-isogeny descent itself (α(E(Q)) ⊆ {1, p} since C_d has no real
# point for d < 0; ᾱ(Ē(Q)) ⊆ {±1, ±2, ±p, ±2p}), and rank 0 when p ≡ 7 or 11 (mod 16), again by the
# descent. Each rank is also checked with cypari2's ellrank.
SILVERMAN_TATE_PRIMES = [int(p) for p in pari.primes(30)]


@pytest.mark.parametrize("p", SILVERMAN_TATE_PRIMES)
def test_silverman_tate_x3_plus_px(p):
    a = (0, 0, 0, p, 0)
    lower, upper = ellrank_bounds(a)                           # cypari2 ellrank
    assert lower == upper
    cert = certified(a)
    low, high, bound = check_honest(cert, lower)
    assert bound <= 2                                          # Silverman–Tate §III.6: the descent bound
    if p % 16 in (7, 11):
        assert (low, high, bound) == (0, 0, 0)                 # Silverman–Tate §III.6: rank 0 by descent


def test_rank_three_curves_from_the_table():
    """The curves of rank 3 among the 500 random curves of conductor 100,000–499,999 (Cremona's tables)."""
    rank_three = [a for _, _, rank, a in LARGE if rank == 3]
    assert rank_three
    for a in rank_three:
        assert ellrank_bounds(a)[1] >= 3                       # cypari2 ellrank
        check_example(a, 3)


def test_rank_three_without_two_torsion():
    """y² + y = x³ − 7x + 6 has rank 3 (cypari2 ellrank) and no point of order 2: three independent
    points, no upper bound."""
    a = (0, 0, 1, -7, 6)
    assert ellrank_bounds(a) == (3, 3)
    assert not two_torsion_points(a)
    cert = check_example(a, 3)
    assert bounds_of(cert) == (3, None)


def full_two_torsion_traps() -> dict:
    """{i: (a, rank, bounds)}: for each position i = 0, 1, 2 of a point T of order 2 in increasing order of
    x(T), the first table curve with E(Q)[2] = (Z/2)² whose descent by E → E/<T> for that T is not sharp
    (Sha(E/<T>)[2] ≠ 0) while another of its three descents is (Sha[2] = 0 on both sides). Found with
    cypari2 (ell2cover) on Cremona's ranks: whichever single point of order 2 a certifier settled on by
    the order of x, one of these curves defeats it."""
    found = {}
    for _, _, rank, a in TABLE:
        if len(two_torsion_points(a)) == 3:
            bounds = descent_bounds(a, rank)
            if bounds and min(bounds) == rank:
                for position, bound in enumerate(bounds):
                    if bound > rank:
                        found.setdefault(position, (a, rank, bounds))
        if len(found) == 3:
            break
    return found


def test_full_two_torsion_with_one_descent_not_sharp():
    """A certifier that used only one of the three points of order 2 would stop at the larger bound on
    one of these curves; the certificate must reach the rank (Cremona's table)."""
    traps = full_two_torsion_traps()
    assert sorted(traps) == [0, 1, 2]
    for a, rank, bounds in traps.values():
        cert = check_example(a, rank)
        assert bounds_of(cert) == (rank, rank), f"{a}: descent bounds {bounds}"


def test_sha_curve_stays_honest():
    """[0, −1, 0, −900, −10098]: one rational point of order 2, rank 0 (Cremona's table, conductor 960),
    Sha(E)[2] of dimension 2 (cypari2 ell2cover; Sha of order 4 recalled from memory). The descent cannot
    close: its bound is at least 2 (rank + dim Sha(E)[2]), and without an analytic witness the certificate
    must say rank_lower = 0 < rank_upper."""
    a = (0, -1, 0, -900, -10098)
    rank = next(r for _, _, r, b in TABLE if b == a)                # Cremona's table
    assert rank == 0 and ellrank_bounds(a)[0] == 0 and sha_two_rank(a, rank) == 2
    cert = certified(a)
    lower, upper, bound = check_honest(cert, rank)
    assert lower == 0 and bound >= 2
    if not has_analytic_witness(cert):
        assert upper == bound > lower


def scaled(a, factor: Fraction) -> tuple:
    """The model with coefficients a_i·λ^i: the change x = X/λ², y = Y/λ³ (u = 1/λ in Silverman, AEC III.1)."""
    return tuple(Fraction(c) * factor ** i for c, i in zip(a, (1, 2, 3, 4, 6)))


def shifted(a4: int, a6: int, r: Fraction) -> tuple:
    """y² = x³ + a4x + a6 after x = X + r: y² = X³ + 3rX² + (3r² + a4)X + (r³ + a4r + a6)."""
    return (0, 3 * r, 0, 3 * r * r + a4, r ** 3 + a4 * r + a6)


MODELS = [
    (congruent(5), Fraction(6), 1),                # Koblitz Ch. I: rank 1; non-minimal integral model
    (congruent(34), Fraction(2, 3), 2),            # cypari2 ellrank: rank 2; non-integral model
    (shifted(-25, 0, Fraction(7, 2)), Fraction(5, 4), 1),     # the n = 5 curve, x shifted by 7/2 and scaled
    ((0, 0, 1, -7, 6), Fraction(3), 3),            # cypari2 ellrank: rank 3, no point of order 2
    ((0, 0, 1, -1, 0), Fraction(1, 2), 1),         # cypari2 ellrank: rank 1, no point of order 2
]


@pytest.mark.parametrize("a, factor, rank", MODELS, ids=lambda v: str(v))
def test_non_minimal_and_rational_models(a, factor, rank):
    """The same curve in another model has the same rank; the points are listed on the input model."""
    model = scaled(a, factor)
    assert ellrank_bounds(model) == (rank, rank)               # cypari2 ellrank
    cert = check_example(model, rank)
    assert bounds_of(cert) == bounds_of(certified(a))


# j = 0: y² = x³ + k; j = 1728: y² = x³ + Dx. Ranks by cypari2's ellrank; y² = x³ − 2 has the point (3, 5)
# (Fermat) and y² = x³ + 1 only its six torsion points (Euler), both recalled from memory.
J_ZERO_AND_1728 = [(0, 0, 0, 0, -2), (0, 0, 0, 0, 1), (0, 0, 0, 0, 8), (0, 0, 0, 0, 17), (0, 0, 0, 0, -432),
                   (0, 0, 0, -2, 0), (0, 0, 0, 2, 0), (0, 0, 0, 3, 0), (0, 0, 0, 4, 0), (0, 0, 0, -5, 0)]


@pytest.mark.parametrize("a", J_ZERO_AND_1728, ids=lambda v: str(v))
def test_j_zero_and_1728(a):
    assert pari_curve(a)[12] in (0, 1728)                     # the j-invariant (cypari2 ellinit)
    lower, upper = ellrank_bounds(a)                           # cypari2 ellrank
    assert lower == upper
    check_example(a, lower)
