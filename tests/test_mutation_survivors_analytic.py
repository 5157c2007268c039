"""Tests written for the mutants of the analytic witnesses' modules (certify/verifier/lseries.py and
certify/verifier/intervals.py) that survived their mutation run (issue 15; ``tests/mutation_run.py``,
``python bench/bench_mutation.py lseries.py intervals.py``). Each test names the mutants it kills.

Three kinds of test. Where a weakened check would accept a false statement (a Frobenius trace, an analytic
order), the test builds that witness and asks cypari2 (the reference library: ellap, ellgroup, ellorder,
ellglobalred) that it is false, so the verifier must refuse it by the check that names it. Where a bound is
shifted by one, the witness exactly at the limit is accepted (its order confirmed by Cremona's table through
tests/data/rank_lt_1000.txt, Debian pari-elldata), or passes the check to be refused by a later one. Where an
enclosure of intervals.py would stop containing the true value, or grow past the few units of 2^−bits its
docstring promises, mpmath at 400 bits (reference library) is compared at points that hit the edge case.
"""
import copy
import functools
from fractions import Fraction

import mpmath
import pytest

from certify.analytic import least_truncation
from certify.conductor import certify_conductor
from certify.pari import pari
from certify.verifier import intervals, lseries
from certify.verifier.errors import Rejection
from certify.verifier.intervals import Interval
from certify.verifier.limits import (FROBENIUS_HINT_WORK, MAX_ANALYTIC_COUNT_WORK, MAX_ANALYTIC_SERIES_WORK,
                                     MAX_PRECISION_BITS, MAX_TRUNCATION)
from certify.verifier.lseries import check_analytic_witness, primes_up_to
from rank_reference import fixture_rows

mpmath.mp.prec = 400

TABLE_RANKS = {a: rank for _, _, rank, a in fixture_rows("rank_lt_1000.txt")}
"""Cremona's ranks of the curves of conductor < 1000 (tests/data/rank_lt_1000.txt)."""

CONDUCTOR_11 = (0, -1, 1, -10, -20)
"""Conductor 11, rank 0 in Cremona's table: its series converge the fastest (the largest decay rates)."""


def exact(a) -> tuple:
    return tuple(Fraction(c) for c in a)


def reference(x: Fraction):
    return mpmath.mpf(x.numerator) / x.denominator


@functools.lru_cache(maxsize=None)
def conductor_evidence(a: tuple) -> dict:
    return certify_conductor(exact(a))["evidence"]


def entry(a: tuple, order: int, truncation: int, bits: int, test_point: str, hints=(), root_number=None) -> dict:
    """A witness entry on the curve's genuine conductor evidence, the root number (−1)^order by default."""
    return {"conductor": copy.deepcopy(conductor_evidence(a)), "order": str(order),
            "root_number": str((-1) ** order if root_number is None else root_number),
            "truncation": str(truncation), "precision_bits": str(bits), "test_point": test_point,
            "frobenius_hints": list(hints)}


def rejection(a: tuple, witness) -> Rejection:
    with pytest.raises(Rejection) as caught:
        check_analytic_witness(exact(a), witness, "evidence.analytic")
    return caught.value


def no_work(*args):
    raise AssertionError("work done before the reading refused the witness")


# --- lseries.py: reading ---

def test_an_entry_that_is_not_an_object_says_so():
    """Kills the deleted raise of ``not isinstance(entry, dict)`` in read_witness_and_hints: without it the
    first field lookup refuses a list or a string with 'has no field', not naming what is wrong with it."""
    for witness in ([], "order 0", None):
        refused = rejection(CONDUCTOR_11, witness)
        assert refused.check == "structure" and "must be an object" in str(refused)


def test_an_order_other_than_0_or_1_is_refused_as_such():
    """Kills the deleted raise of ``order not in (0, 1)``: the curve of conductor 37 has rank 1 (Cremona's
    table) and w = −1 (cypari2 ellrootno), so the order-1 test D ≠ 0 and L′(E, 1) ≠ 0 pass; claimed as order 2
    with root number (−1)² = +1 the witness would then be accepted as proving the false analytic rank 2
    (cypari2 ellanalyticrank gives 1)."""
    a = (0, 0, 1, -1, 0)
    curve = pari.ellinit(list(a))
    assert TABLE_RANKS[a] == 1 == int(pari.ellanalyticrank(curve)[0]) and int(pari.ellrootno(curve)) == -1
    genuine = entry(a, 1, least_truncation(37, 32, Fraction(6, 5)), 32, "6/5")
    assert check_analytic_witness(exact(a), genuine, "evidence.analytic") == 1
    genuine["order"], genuine["root_number"] = "2", "1"
    assert rejection(a, genuine).check == "analytic order"


def test_a_root_number_other_than_plus_or_minus_one_is_refused_before_any_work(monkeypatch):
    """Kills the deleted raise of ``root_number not in (1, -1)``: without it a root number of 5 or 0 reaches
    check_root_number_claim only after the conductor checks have run (the limits come first; here none is
    exceeded)."""
    monkeypatch.setattr(lseries, "check_conductor_evidence", no_work)
    for value in (5, 0, -2):
        refused = rejection(CONDUCTOR_11, entry(CONDUCTOR_11, 0, 30, 32, "2", root_number=value))
        assert refused.check == "root number" and "1 or -1" in str(refused)


def test_least_and_largest_parameters_the_limits_allow_are_accepted():
    """Kills ``1 < truncation`` and ``1 < bits`` (and the constants 1 -> 2 of both ranges), ``bits <
    MAX_PRECISION_BITS`` and ``truncation * bits >= MAX_ANALYTIC_SERIES_WORK`` in read_witness_and_hints: on
    the curve of conductor 11 (rank 0, Cremona's table) M = 1 with b = 1 already bounds every tail, and
    b = MAX_PRECISION_BITS with M·b = MAX_ANALYTIC_SERIES_WORK exactly is within the limits; both witnesses
    prove the table's rank."""
    assert TABLE_RANKS[CONDUCTOR_11] == 0
    largest = MAX_ANALYTIC_SERIES_WORK // MAX_PRECISION_BITS
    assert largest * MAX_PRECISION_BITS == MAX_ANALYTIC_SERIES_WORK and largest <= MAX_TRUNCATION
    for truncation, bits in ((1, 1), (largest, MAX_PRECISION_BITS)):
        witness = entry(CONDUCTOR_11, 0, truncation, bits, "2")
        assert check_analytic_witness(exact(CONDUCTOR_11), witness, "evidence.analytic") == 0


def test_count_work_exactly_at_its_limit_passes_the_reading():
    """Kills ``work >= MAX_ANALYTIC_COUNT_WORK``: the first prime M with Σ_{p ≤ M} p above the limit and two
    hints at primes p < q ≤ M with Σ_{p ≤ M} p − p − q + 2·FROBENIUS_HINT_WORK = MAX_ANALYTIC_COUNT_WORK (the
    rule of hinted_count_work) is within the limit: the reading returns it (the hints' traces and points are
    checked only after the conductor evidence)."""
    primes, total = primes_up_to(MAX_TRUNCATION), 0
    for i, m in enumerate(primes):
        total += m
        pair = total + 2 * FROBENIUS_HINT_WORK - MAX_ANALYTIC_COUNT_WORK
        if total > MAX_ANALYTIC_COUNT_WORK and pair % 2 == 0:
            below = set(primes[:i + 1])
            p = next(p for p in primes[:i + 1] if pair - p in below and pair - p > p)
            break
    hints = [{"prime": str(v), "trace": "0", "point": ["0", "0"]} for v in (p, pair - p)]
    witness = entry(CONDUCTOR_11, 0, m, MAX_ANALYTIC_SERIES_WORK // m, "2", hints)
    assert lseries.count_work(witness, "evidence.analytic") == MAX_ANALYTIC_COUNT_WORK
    assert lseries.read_witness(witness, "evidence.analytic")[2] == m


def test_a_hint_at_every_prime_up_to_the_truncation_passes_the_reading():
    """Kills ``len(entries) >= len(primes)`` in read_hints: as many hints as primes p ≤ M (one each, the limit
    of the docstring) are read; one more is refused as 'analytic limit'."""
    hints = [{"prime": str(p), "trace": "0", "point": ["0", "0"]} for p in (2, 3, 5, 7)]
    assert len(lseries.read_hints(hints, 10, "hints")) == len(primes_up_to(10))
    with pytest.raises(Rejection) as refused:
        lseries.read_hints(hints + hints[-1:], 10, "hints")
    assert refused.value.check == "analytic limit"


# --- lseries.py: the tails ---

def test_a_tail_of_exactly_two_to_the_minus_b_passes_the_truncation_check():
    """Kills ``tail >= Fraction(1, 1 << bits)`` and ``Fraction(1, 2 << bits)`` in check_truncation: for conductor 57, A = 6/5, M = 1 and b = 1
    (found by a search over conductors and test points) the verifier's bound on the tail of S(c/A) is 1/2 = 2^−b
    exactly, a bound the check must admit; it is a true bound, mpmath's e^(−2r)/(1 − e^(−r)) at r = 2π/(A√57)
    being below it. The witness then fails only its root-number test at that precision (the curve has rank 0
    in Cremona's table)."""
    a, test_point = (1, 0, 1, -7, 5), Fraction(6, 5)
    assert TABLE_RANKS[a] == 0 and int(pari.ellglobalred(pari.ellinit(list(a)))[0]) == 57
    tails = lseries.tails(57, 1, lseries.working_bits(1, 1), test_point)
    assert tails["S(c/A)"] == Fraction(1, 2) and max(tails.values()) == Fraction(1, 2)
    r = 2 * mpmath.pi / (reference(test_point) * mpmath.sqrt(57))
    assert mpmath.exp(-2 * r) / (1 - mpmath.exp(-r)) < mpmath.mpf(1) / 2
    assert rejection(a, entry(a, 0, 1, 1, "6/5")).check == "root number"


def test_a_tail_just_above_two_to_the_minus_b_is_refused():
    """Kills ``tail > Fraction(2, 1 << bits)`` (constant 1 -> 2) in check_truncation: for y² + y = x³ + x² − 17x
    + 7 (conductor 901, rank 0 in Cremona's table) at b = 32 and A = 6/5, the largest M at which mpmath's
    e^(−r(M+1))/(1 − e^(−r)), r = 2π/(A√901), still exceeds 2^−b (by less than a factor 2: e^r < 2) is refused
    as 'truncation', since the verifier's rigorous bound is at least that value."""
    a, bits, test_point = (0, 1, 1, -17, 7), 32, Fraction(6, 5)
    assert TABLE_RANKS[a] == 0 and int(pari.ellglobalred(pari.ellinit(list(a)))[0]) == 901
    r = 2 * mpmath.pi / (reference(test_point) * mpmath.sqrt(901))
    truncation = 1
    while mpmath.exp(-r * (truncation + 2)) / (1 - mpmath.exp(-r)) > mpmath.mpf(2) ** -bits:
        truncation += 1
    assert mpmath.exp(-r * (truncation + 1)) / (1 - mpmath.exp(-r)) < mpmath.mpf(2) ** (1 - bits)
    assert rejection(a, entry(a, 0, truncation, bits, "6/5")).check == "truncation"


def test_a_decay_rate_too_small_for_the_working_precision_is_refused_by_name():
    """Kills ``denominator < 0`` in tail_bound: for y² + y = x³ + 97x + 1001, of conductor 491,491,747 (cypari2
    ellglobalred), at M = 1, b = 1, A = 2 the rate c/A = 2π/(A√N) ≈ 1.4·10⁻⁴ has the lower end 2^−13 at the
    working precision of 13 bits, where e^(−r) is enclosed with upper end 1: no finite tail bound, a
    'truncation' rejection rather than a division by zero. M = 1 is indeed far too small: mpmath's
    e^(−2r)/(1 − e^(−r)) is above 1000."""
    a = (0, 0, 1, 97, 1001)
    conductor = int(pari.ellglobalred(pari.ellinit(list(a)))[0])
    assert conductor == 491_491_747
    r = 2 * mpmath.pi / (2 * mpmath.sqrt(conductor))
    assert mpmath.exp(-2 * r) / (1 - mpmath.exp(-r)) > 1000
    assert lseries.tails(conductor, 1, lseries.working_bits(1, 1), Fraction(2))["S(c/A)"] is None
    assert rejection(a, entry(a, 0, 1, 1, "2")).check == "truncation"


def test_a_vanishing_enclosure_names_the_value_it_encloses():
    """Kills ``order != 0`` and its constant 0 -> 1 in check_nonvanishing: the rejection of an order-0 claim
    names L(E,1), of an order-1 claim L'(E,1). The curves: y² + y = x³ + x² − 2x, rank 2 in Cremona's table,
    w = +1 (cypari2 ellrootno), so L(E, 1) = 0; y² + y = x³ − 7x + 6, analytic rank 3 (cypari2
    ellanalyticrank), w = −1, so L′(E, 1) = 0."""
    for a, order, name in (((0, 1, 1, -2, 0), 0, "L(E,1)"), ((0, 0, 1, -7, 6), 1, "L'(E,1)")):
        curve = pari.ellinit(list(a))
        assert int(pari.ellanalyticrank(curve)[0]) >= 2 and int(pari.ellrootno(curve)) == (-1) ** order
        conductor = int(pari.ellglobalred(curve)[0])
        refused = rejection(a, entry(a, order, least_truncation(conductor, 20, Fraction(2)), 20, "2"))
        assert refused.check == "L-value" and f"the enclosure of {name} contains 0" in str(refused)


# --- lseries.py: Frobenius hints ---

def hinted_witness(a: tuple, hint: dict) -> dict:
    """The order-0 witness at 32 bits and A = 6/5 (least truncation) of a rank-0 curve, with one hint."""
    conductor = int(pari.ellglobalred(pari.ellinit(list(a)))[0])
    return entry(a, 0, least_truncation(conductor, 32, Fraction(6, 5)), 32, "6/5", [hint])


def reduction(a: tuple, p: int):
    """Ẽ(F_p) of the minimal model the witness's conductor evidence proves (cypari2 ellinit over F_p)."""
    return pari.ellinit([int(c) for c in conductor_evidence(a)["minimal_model"]["curve"]], p)


def residues(point) -> list:
    return [str(int(pari.lift(c))) for c in point]


def test_a_trace_just_beyond_hasses_bound_is_refused():
    """Kills ``trace * trace > 5 * p`` (constant 4 -> 5) in check_hint_trace. On y² = x³ + 2x (conductor 256,
    rank 0 in Cremona's table) a_37 = −12 and Ẽ(F_37) ≅ Z/50 (cypari2 ellap, ellgroup), so 2·G has order 25 for
    a generator G (cypari2 ellorder). The false trace t = 13 (4·37 < t² = 169 ≤ 5·37) gives N = 25 with
    N² = 625 > 16·37 and a point of order exactly N: only Hasse's bound t² ≤ 4p refuses it, since the Hasse
    interval [38 − 2√37, 38 + 2√37] holds 50 = 2N as well as 25 (Silverman V.1.1; 37 is the only prime where
    a trace with 4p < t² ≤ 5p can pass the other checks)."""
    a, p = (0, 0, 0, 2, 0), 37
    assert TABLE_RANKS[a] == 0 and int(pari.ellap(pari.ellinit(list(a)), p)) == -12
    curve = reduction(a, p)
    assert [int(n) for n in pari.ellgroup(curve)] == [50]
    point = pari.ellmul(curve, pari.ellgroup(curve, 0, 1)[2][0], 2)
    assert int(pari.ellorder(curve, point)) == 25
    hint = {"prime": str(p), "trace": "13", "point": residues(point)}
    assert rejection(a, hinted_witness(a, hint)).check == "frobenius hint trace"


def test_a_genuine_hint_with_n_squared_just_above_16p_is_accepted():
    """Kills ``count * count <= 17 * p`` (constant 16 -> 17) in check_hint_trace: on y² + xy + y = x³ − x² −
    3x + 3 (conductor 26, rank 0 in Cremona's table) a_3 = −3 (cypari2 ellap), so N = 7 with 16·3 < 49 ≤ 17·3,
    Ẽ(F_3) has 7 points (cypari2 ellcard) and each but O the prime order 7: the hint proves a_3 and the witness the table's rank.
    And kills ``0 <= v <= p`` in check_hint_point: the same hint with x written as p instead of 0 is refused
    as not a residue."""
    a, p = (1, -1, 1, -3, 3), 3
    assert TABLE_RANKS[a] == 0 and int(pari.ellap(pari.ellinit(list(a)), p)) == -3
    _, _, a3, _, a6 = (int(c) for c in conductor_evidence(a)["minimal_model"]["curve"])
    assert int(pari.ellcard(reduction(a, p))) == 7
    ordinates = pari.polrootsmod(pari.Pol([1, a3, -a6]), p)   # y² + a3·y = a6 at x = 0 (cypari2 polrootsmod)
    assert len(ordinates)
    hint = {"prime": str(p), "trace": "-3", "point": ["0", str(int(pari.lift(ordinates[0])))]}
    assert check_analytic_witness(exact(a), hinted_witness(a, hint), "evidence.analytic") == 0
    hint["point"][0] = str(p)
    assert rejection(a, hinted_witness(a, hint)).check == "frobenius hint point"


# --- intervals.py ---

WORKING_BITS = (64, 128, lseries.working_bits(MAX_TRUNCATION, MAX_PRECISION_BITS))
"""Precisions at which lseries calls the primitives, up to the largest working precision the limits allow."""


def encloses(interval: Interval, value) -> bool:
    return reference(interval.lo) <= value <= reference(interval.hi)


def test_an_end_point_at_zero_does_not_exclude_zero():
    """Kills ``self.lo >= 0`` and ``self.hi <= 0`` in Interval.excludes_zero: [0, 1] and [−1, 0] contain 0, so
    an enclosure of L(E, 1) or of a root-number test ending exactly at 0 proves nothing; [2^−200, 1] and
    [−1, −2^−200] exclude it."""
    tiny = Fraction(1, 1 << 200)
    assert not Interval(0, 1).excludes_zero() and not Interval(-1, 0).excludes_zero()
    assert not Interval(0).excludes_zero()
    assert Interval(tiny, 1).excludes_zero() and Interval(-1, -tiny).excludes_zero()


def test_square_roots_of_squares_are_exact():
    """Kills ``s * s == n << (3 * bits)`` (constant 2 -> 3) in square_root: √(m²) = m exactly (math.isqrt, the
    standard library's integer square root, as reference), so the enclosure is the point m, as the docstring
    promises; a non-square keeps an enclosure one unit of 2^−bits wide containing mpmath's sqrt."""
    for bits in (1, 30, 128):
        for m in (1, 6, 11, 1000, 3 * 10 ** 9):
            root = intervals.square_root(m * m, bits)
            assert root.lo == root.hi == m
        for n in (2, 57, 10 ** 12 + 39):
            root = intervals.square_root(n, bits)
            assert encloses(root, mpmath.sqrt(n)) and root.width == Fraction(1, 1 << bits)


def test_exp_neg_just_below_its_shortcut_contains_the_true_value():
    """Kills ``Fraction(7, 11) * bits + 1`` (constant 10 -> 11) in exp_neg: the enclosure [0, 2^−bits] is right
    only when e^−x < 2^−bits, that is x > bits·ln 2 (ln 2 = 0.693… < 0.7, so x ≥ 0.7·bits + 1 suffices;
    7/11 = 0.636… is too small): at x = (7/11)·bits + 1 and x = 0.69·bits, e^−x must be enclosed by the series,
    compared with mpmath's exp, at the precisions lseries uses."""
    for bits in WORKING_BITS:
        for x in (Fraction(7, 11) * bits + 1, Fraction(69, 100) * bits, Fraction(7, 10) * bits + Fraction(999, 1000)):
            interval = intervals.exp_neg(x, bits)
            assert encloses(interval, mpmath.exp(-reference(x))), (bits, x)
            assert interval.width <= Fraction(4, 1 << bits)


def test_exponential_integral_just_below_its_shortcut_is_narrow():
    """Kills ``Fraction(7, 11) * bits + 1`` (constant 10 -> 11) in exponential_integral: [0, e^−x/x] encloses
    E₁(x) for every x > 0 (Abramowitz and Stegun 5.1.20) but is only a few units of 2^−bits wide once
    x ≥ 0.7·bits + 1; at x = (7/11)·bits + 1 and the largest working precision it would be some 40 units. The
    series there encloses mpmath's e1 within the 8 units test_analytic.py allows."""
    for bits in WORKING_BITS:
        for x in (Fraction(7, 11) * bits + 1, Fraction(69, 100) * bits):
            interval = intervals.exponential_integral(x, bits)
            assert encloses(interval, mpmath.e1(reference(x))), (bits, x)
            assert interval.width <= Fraction(8, 1 << bits), (bits, x)


def test_primitives_refuse_arguments_outside_their_domain_by_name():
    """Kills ``x < 0`` in log and ``x < 0`` in exponential_integral: ln 0 and E₁(0) are not finite
    (Abramowitz and Stegun 4.1.2 and 5.1.1), and each function refuses 0 with its own ValueError rather than
    failing inside another (a division by zero, or log refusing the argument E₁ passed on); exp_neg is
    defined at 0 (e^0 = 1) and refuses negative arguments."""
    with pytest.raises(ValueError, match="log needs x > 0"):
        intervals.log(Fraction(0), 30)
    with pytest.raises(ValueError, match="exponential_integral needs x > 0"):
        intervals.exponential_integral(Fraction(0), 30)
    with pytest.raises(ValueError, match="exp_neg needs x >= 0"):
        intervals.exp_neg(Fraction(-1, 3), 30)
    assert intervals.exp_neg(Fraction(0), 30).lo == intervals.exp_neg(Fraction(0), 30).hi == 1
