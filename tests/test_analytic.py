"""Analytic rank witnesses (certify/analytic.py, certify/verifier/lseries.py, certify/verifier/intervals.py).

Outside sources, named at each check: mpmath (the reference for π, e^−x, ln x, γ, E₁ and √n), sympy (the
Bernoulli numbers), cypari2 as reference library (ellan for a_n, lfun(E, 1) for L(E, 1), ellL1(E, 1) for
L′(E, 1), ellrootno for w, ellanalyticrank for the analytic rank, ellglobalred for the conductor), and the
curves of Cremona's table through the fixture tests/data/conductor_lt_1000.txt (Debian pari-elldata).
Hostile witnesses follow the soundness rule of the other kinds: a mutated witness is rejected with the
verifier's Rejection, or the order it proves is the analytic rank by cypari2.
"""
import copy
import functools
import itertools
import math
import random
from fractions import Fraction

import mpmath
import pytest
import sympy
from hypothesis import HealthCheck, given, settings, strategies as st

from certify.analytic import analytic_witness
from certify.conductor import certify_conductor
from certify.pari import pari
from certify.verifier import intervals, lseries
from certify.verifier.conductor import check_conductor_evidence, conductor_of
from certify.verifier.errors import Rejection
from certify.verifier.intervals import Interval
from certify.verifier.limits import (MAX_ANALYTIC_COUNT_WORK, MAX_ANALYTIC_SERIES_WORK, MAX_PRECISION_BITS,
                                     MAX_TEST_POINT_DENOMINATOR, MAX_TRUNCATION)
from certify.verifier.lseries import (analytic_intervals, check_analytic_witness, check_truncation, dirichlet_coefficients,
                                     frobenius_traces)
from conductor_reference import fixture_rows

ROWS = fixture_rows("conductor_lt_1000.txt")
SAMPLE = [a for _, a in ROWS[::100]]
"""52 curves of Cremona's table, every 100th row."""

RANK_THREE = (0, 0, 1, -7, 6)
"""Analytic rank 3 and root number −1 by cypari2 ellanalyticrank and ellrootno (conductor 5077)."""

mpmath.mp.prec = 400


def exact(a) -> tuple:
    return tuple(Fraction(c) for c in a)


def reference(x: Fraction):
    return mpmath.mpf(x.numerator) / x.denominator


def encloses(interval: Interval, value) -> bool:
    return reference(interval.lo) <= value <= reference(interval.hi)


@functools.lru_cache(maxsize=None)
def pari_rank(a: tuple) -> int:
    """The analytic rank by cypari2 ellanalyticrank (reference library)."""
    return int(pari.ellanalyticrank(pari.ellinit(list(a)))[0])


@functools.lru_cache(maxsize=None)
def witness(a: tuple):
    return analytic_witness(exact(a))


def fresh(a: tuple) -> dict:
    return copy.deepcopy(witness(a))


def conductor_data(a: tuple) -> tuple:
    """(model, N, local data) through the verifier's conductor checks on the curve's conductor evidence."""
    model, _, local = check_conductor_evidence(exact(a), certify_conductor(exact(a))["evidence"], "evidence")
    return model, conductor_of(local), local


def certified_intervals(a: tuple, entry: dict) -> tuple:
    """(root-number test, value) as the verifier computes them for the entry."""
    model, conductor, local = conductor_data(a)
    truncation = int(entry["truncation"])
    coefficients = dirichlet_coefficients(frobenius_traces(model, local, truncation), {d.prime for d in local},
                                          truncation)
    bits, test_point = int(entry["precision_bits"]), Fraction(entry["test_point"])
    bounds = check_truncation(conductor, truncation, bits, test_point)
    return analytic_intervals(coefficients, conductor, int(entry["order"]), bits, test_point, bounds)


# --- intervals against mpmath ---

POINTS = [Fraction(0), Fraction(1, 1000), Fraction(1, 3), Fraction(1), Fraction(5, 2), Fraction(17),
          Fraction(123456, 7), Fraction(40)] + [Fraction(random.Random(7).randrange(1, 10 ** 6), 10 ** 4)
                                                for _ in range(4)]


@pytest.mark.parametrize("bits", [8, 30, 64, 128])
def test_constants_contain_the_true_values(bits):
    """π and Euler's γ enclose mpmath's values (reference library), within a few units of 2^−bits."""
    for interval, value in ((intervals.pi(bits), mpmath.pi), (intervals.euler_gamma(bits), mpmath.euler)):
        assert encloses(interval, value)
        assert interval.width <= Fraction(4, 1 << bits)


@pytest.mark.parametrize("bits", [8, 30, 64, 128])
def test_exp_log_and_square_root_contain_the_true_values(bits):
    """e^−x, ln x and √n enclose mpmath's values (reference library) at points from 0 to 10⁴."""
    for x in POINTS:
        assert encloses(intervals.exp_neg(x, bits), mpmath.exp(-reference(x)))
        assert intervals.exp_neg(x, bits).width <= Fraction(4, 1 << bits)
        if x > 0:
            assert encloses(intervals.log(x, bits), mpmath.log(reference(x)))
            assert intervals.log(x, bits).width <= Fraction(4, 1 << bits)
    for n in (0, 1, 2, 11, 37, 10 ** 12 + 39, 499_999):
        assert encloses(intervals.square_root(n, bits), mpmath.sqrt(n))


@pytest.mark.parametrize("bits", [8, 30, 64, 128])
def test_exponential_integral_contains_the_true_value(bits):
    """E₁(x) encloses mpmath's e1 (reference library), on both sides of the switch to 0 < E₁ < e^−x/x."""
    for x in [p for p in POINTS if p > 0] + [Fraction(7, 10) * bits + 1, Fraction(7, 10) * bits]:
        interval = intervals.exponential_integral(x, bits)
        assert encloses(interval, mpmath.e1(reference(x))), x
        assert interval.width <= Fraction(8, 1 << bits)


def test_bernoulli_numbers():
    """B_0 … B_40 equal sympy's bernoulli (reference library; sympy ≥ 1.12 takes B_1 = +1/2, we use −1/2)."""
    ours = intervals.bernoulli_numbers(40)
    assert ours[1] == Fraction(-1, 2)
    assert all(ours[k] == Fraction(str(sympy.bernoulli(k))) for k in range(2, 41))


def test_interval_arithmetic_is_outward():
    """Sums, products, quotients and outward rounding contain every exact result of their end-points."""
    generator = random.Random(3)
    for _ in range(200):
        x = sorted(Fraction(generator.randrange(-99, 99), generator.randrange(1, 50)) for _ in range(2))
        y = sorted(Fraction(generator.randrange(1, 99), generator.randrange(1, 50)) for _ in range(2))
        a, b = Interval(*x), Interval(*y)
        for u in x:
            for v in y:
                assert (a + b).contains(u + v) and (a - b).contains(u - v) and (a * b).contains(u * v)
                assert (a / b).contains(u / v)
        assert a.outward(5).contains(a.lo) and a.outward(5).contains(a.hi)
        assert all(((end * 32).denominator == 1) for end in (a.outward(5).lo, a.outward(5).hi))


# --- the coefficients ---

def test_hasse_bound_lemma_finite_cases():
    """The finite part of the proof of |a_n| ≤ n (``tail_bound``): Hasse's bound |a_p| ≤ 2√p (Silverman V.1.1)
    leaves a_2 in [−2, 2] and a_3 in [−3, 3]; the recursion a_(p^(k+1)) = a_p a_(p^k) − p a_(p^(k−1)) stays within
    p^k for k ≤ 5 (p = 2) and k ≤ 1 (p = 3), and (k + 1) ≤ p^(k/2) holds for the other cases the proof names."""
    for p, trace_bound, last in ((2, 2, 5), (3, 3, 1)):
        for trace in range(-trace_bound, trace_bound + 1):
            sequence = [1, trace]
            for _ in range(last - 1):
                sequence.append(trace * sequence[-1] - p * sequence[-2])
            assert all(abs(value) <= p ** k for k, value in enumerate(sequence))
    assert all((k + 1) ** 2 <= 2 ** k for k in range(6, 200))
    assert all((k + 1) ** 2 <= 3 ** k for k in range(2, 200))
    assert all((k + 1) ** 2 <= 5 ** k for k in range(1, 200))


@pytest.mark.parametrize("a", SAMPLE[::4] + [RANK_THREE], ids=str)
def test_coefficients_are_pari_ellan(a):
    """a_n for n ≤ 1000 from the verifier's own counts and the reduction types equal cypari2 ellan, and
    |a_n| ≤ n (the lemma behind the tails)."""
    model, _, local = conductor_data(a)
    ours = dirichlet_coefficients(frobenius_traces(model, local, 1000), {d.prime for d in local}, 1000)
    assert ours[1:] == [int(c) for c in pari.ellan(pari.ellinit(list(a)), 1000)]
    assert all(abs(c) <= n for n, c in enumerate(ours))


def test_conductor_evidence_embedded():
    """check_conductor_evidence gives cypari2 ellglobalred's conductor, and names the embedded path when the
    evidence is wrong."""
    a = SAMPLE[7]
    assert conductor_data(a)[1] == int(pari.ellglobalred(pari.ellinit(list(a)))[0])
    evidence = certify_conductor(exact(a))["evidence"]
    del evidence["minimal_model"]
    with pytest.raises(Rejection, match="evidence.analytic.conductor has no field 'minimal_model'"):
        check_conductor_evidence(exact(a), evidence, "evidence.analytic.conductor")


# --- witnesses on curves of the table ---

@pytest.mark.parametrize("a", SAMPLE, ids=str)
def test_witness_on_table_curves(a):
    """A witness exactly when the analytic rank (cypari2 ellanalyticrank) is 0 or 1; the verifier proves that
    rank; the root number is cypari2 ellrootno; the enclosure of L(E, 1) (rank 0) contains cypari2
    lfun(E, 1), that of L′(E, 1) (rank 1) cypari2 ellL1(E, 1), each narrower than 10⁻⁶."""
    check_table_curve(a)


def check_table_curve(a):
    rank = pari_rank(a)
    entry = fresh(a)
    if rank >= 2:
        assert entry is None
        return
    assert check_analytic_witness(exact(a), entry, "evidence.analytic") == rank
    E = pari.ellinit(list(a))
    assert entry["root_number"] == str(int(pari.ellrootno(E)))
    test, value = certified_intervals(a, entry)
    assert test.excludes_zero()
    reference_value = pari.lfun(E, 1) if rank == 0 else pari.ellL1(E, 1)
    assert value.contains(Fraction(float(reference_value)))
    assert value.width < Fraction(1, 10 ** 6)


@pytest.mark.table
@pytest.mark.parametrize("a", [a for _, a in ROWS], ids=str)
def test_witness_on_every_table_curve(a):
    """test_witness_on_table_curves on all 5,113 curves of the fixture."""
    check_table_curve(a)


def rank_two_curves(count: int) -> list:
    """The first curves of the fixture of analytic rank 2 (cypari2 ellanalyticrank), from conductor 389 on."""
    found = []
    for n, a in ROWS:
        if n >= 389 and pari_rank(a) == 2:
            found.append(a)
            if len(found) == count:
                return found
    return found


def test_rank_two_gets_no_witness_and_forced_claims_fail():
    """Analytic rank 2 (cypari2 ellanalyticrank): no witness is built; a witness forced to claim order 0 passes
    the root-number test (w = +1, cypari2 ellrootno) but its L(E, 1) interval contains 0, and one forced to
    claim order 1 fails the root-number test. The rank-3 curve of conductor 5077 (w = −1): order 1 fails
    on L′(E, 1) = 0, order 0 on the root number."""
    for a in rank_two_curves(3) + [RANK_THREE]:
        assert witness(a) is None
        w = int(pari.ellrootno(pari.ellinit(list(a))))
        for order, failing in ((0, "L-value" if w == 1 else "root number"), (1, "root number" if w == 1 else "L-value")):
            entry = forced_entry(a, order)
            with pytest.raises(Rejection) as rejected:
                check_analytic_witness(exact(a), entry, "evidence.analytic")
            assert rejected.value.check == failing


def forced_entry(a: tuple, order: int, bits: int = 32, test_point: Fraction = Fraction(6, 5)) -> dict:
    """A witness entry claiming the given order with a truncation the verifier accepts, and no Frobenius hints
    (every a_p counted)."""
    from certify.analytic import least_truncation
    cert = certify_conductor(exact(a))
    truncation = least_truncation(int(cert["claim"]["conductor"]), bits, test_point)
    return {"conductor": cert["evidence"], "order": str(order), "root_number": str((-1) ** order),
            "truncation": str(truncation), "precision_bits": str(bits), "test_point": str(test_point),
            "frobenius_hints": []}


# --- hostile witnesses ---

RANK_ZERO = next(a for a in SAMPLE if pari_rank(a) == 0)
RANK_ONE = next(a for a in SAMPLE if pari_rank(a) == 1)
HOSTILE_SEEDS = [a for a in SAMPLE[:12] if witness(a) is not None]


def outcome(a: tuple, entry) -> None:
    """The soundness rule: Rejection, or the proven order is cypari2's analytic rank."""
    try:
        order = check_analytic_witness(exact(a), entry, "evidence.analytic")
    except Rejection as rejection:
        assert isinstance(rejection.check, str) and rejection.check
        return
    assert order == pari_rank(a), "a false analytic order was accepted"


def test_truncation_too_small_for_the_precision():
    """M one below the least the verifier accepts, or the precision raised by 8 bits: the tails exceed 2^−b."""
    for a in (RANK_ZERO, RANK_ONE):
        entry = fresh(a)
        entry["truncation"] = str(int(entry["truncation"]) - 1)
        with pytest.raises(Rejection) as rejected:
            check_analytic_witness(exact(a), entry, "evidence.analytic")
        assert rejected.value.check == "truncation"
        entry = fresh(a)
        entry["precision_bits"] = str(int(entry["precision_bits"]) + 8)
        with pytest.raises(Rejection) as rejected:
            check_analytic_witness(exact(a), entry, "evidence.analytic")
        assert rejected.value.check == "truncation"


def test_root_number_claimed_plus_one_where_it_is_minus_one():
    """A rank-1 curve (w = −1 by cypari2 ellrootno) with the claim order 0, w = +1: the functional-equation test
    G = S(c/A) − S(cA) contains 0. The claims w = +1 with order 1, and w = −1 with order 0, contradict each
    other."""
    assert int(pari.ellrootno(pari.ellinit(list(RANK_ONE)))) == -1
    entry = forced_entry(RANK_ONE, 0)
    with pytest.raises(Rejection) as rejected:
        check_analytic_witness(exact(RANK_ONE), entry, "evidence.analytic")
    assert rejected.value.check == "root number"
    for a, root_number in ((RANK_ONE, "1"), (RANK_ZERO, "-1")):
        entry = fresh(a)
        entry["root_number"] = root_number
        with pytest.raises(Rejection) as rejected:
            check_analytic_witness(exact(a), entry, "evidence.analytic")
        assert rejected.value.check == "root number"


def test_interval_containing_zero_at_low_precision():
    """With the test point A = 1001/1000 the root-number test is about 1000 times smaller than the value; at
    low claimed precisions (with the truncation they need) its enclosure contains 0 and the witness is
    rejected by name; the witnesses accepted prove cypari2's analytic rank."""
    for a in (RANK_ZERO, RANK_ONE):
        rejected_checks = set()
        for bits in range(1, 16):
            entry = forced_entry(a, pari_rank(a), bits, Fraction(1001, 1000))
            try:
                assert check_analytic_witness(exact(a), entry, "evidence.analytic") == pari_rank(a)
            except Rejection as rejection:
                rejected_checks.add(rejection.check)
        assert rejected_checks == {"root number"}


def test_forged_model_or_factorisation():
    """The minimal model of another curve (so other a_p), an exponent changed, a prime dropped or added: the
    conductor checks reject before any a_p is counted."""
    a, other = RANK_ZERO, RANK_ONE
    forged = fresh(a)
    forged["conductor"]["minimal_model"] = fresh(other)["conductor"]["minimal_model"]
    with pytest.raises(Rejection):
        check_analytic_witness(exact(a), forged, "evidence.analytic")
    forged = fresh(a)
    forged["conductor"] = fresh(other)["conductor"]
    with pytest.raises(Rejection):
        check_analytic_witness(exact(a), forged, "evidence.analytic")
    for change in ("exponent", "drop", "add"):
        forged = fresh(a)
        primes = forged["conductor"]["discriminant_factorisation"]
        if change == "exponent":
            primes[0]["exponent"] = str(int(primes[0]["exponent"]) + 1)
        elif change == "drop":
            primes.pop()
        else:
            primes.append({"prime": "1009", "exponent": "1"})
        with pytest.raises(Rejection) as rejected:
            check_analytic_witness(exact(a), forged, "evidence.analytic")
        assert rejected.value.check == "factorisation"


LIMITS = [("truncation", str(MAX_TRUNCATION + 1)), ("truncation", "0"), ("precision_bits", "0"),
          ("precision_bits", str(MAX_PRECISION_BITS + 1)), ("test_point", "1"), ("test_point", "201/100"),
          ("test_point", f"{MAX_TEST_POINT_DENOMINATOR + 2}/{MAX_TEST_POINT_DENOMINATOR + 1}")]


@pytest.mark.parametrize("key, value", LIMITS + [("series", ""), ("count", "")])
def test_limits_refused_before_any_work(key, value, monkeypatch):
    """Each limit is refused with its name before the conductor checks or any point count run."""
    def no_work(*args):
        raise AssertionError("work done before the limits were checked")
    monkeypatch.setattr(lseries, "check_conductor_evidence", no_work)
    monkeypatch.setattr(lseries, "count_points", no_work)
    entry = fresh(RANK_ZERO)
    if key == "series":
        entry["precision_bits"] = str(MAX_PRECISION_BITS)
        entry["truncation"] = str(MAX_ANALYTIC_SERIES_WORK // MAX_PRECISION_BITS + 1)
    elif key == "count":
        running = itertools.accumulate(lseries.primes_up_to(MAX_TRUNCATION))
        truncation = next(p for p, work in zip(lseries.primes_up_to(MAX_TRUNCATION), running)
                          if work > MAX_ANALYTIC_COUNT_WORK)
        entry["truncation"], entry["precision_bits"] = str(truncation), "20"
    else:
        entry[key] = value
    with pytest.raises(Rejection) as rejected:
        check_analytic_witness(exact(RANK_ZERO), entry, "evidence.analytic")
    assert rejected.value.check == "analytic limit"


def test_limits_admit_genuine_witnesses_of_large_conductor():
    """The rank-1 curve [1, −1, 0, −32, −70] of conductor 496,162 (rank 1 in Cremona's table, through the
    fixture tests/data/rank_100000_499999.txt; analytic rank 1 by cypari2 ellanalyticrank) gets a witness
    within the limits: they leave room for the conductors of the benchmark."""
    a = (1, -1, 0, -32, -70)
    assert pari_rank(a) == 1
    entry = witness(a)
    assert entry is not None and check_analytic_witness(exact(a), entry, "evidence.analytic") == 1


def test_a_conductor_far_beyond_the_limits_gets_no_witness_and_no_error():
    """[1, 1, 0, −96508871424, −3321343798267778]: its conductor N (cypari2 ellglobalred, reference library)
    is so large that the slowest rate s = 2π/(A·√N) of the series makes 1 − e^(−s) round to 0 in floating
    point, where the certifier's tail bound used to raise; the truncation any test point A ≥ 6/5 needs for
    tails below 2^−60, at least 60·log 2/s, is far beyond MAX_TRUNCATION: no witness, and no exception."""
    a = (1, 1, 0, -96508871424, -3321343798267778)
    conductor = int(pari.ellglobalred(pari.ellinit(list(a)))[0])
    slowest = 2 * math.pi / (1.2 * math.sqrt(conductor))
    assert 1 - math.exp(-slowest) == 0 and 60 * math.log(2) / slowest > 2 * MAX_TRUNCATION
    assert analytic_witness(tuple(Fraction(c) for c in a)) is None


SETTINGS = settings(max_examples=500, deadline=None, suppress_health_check=list(HealthCheck), derandomize=True)
MUTATIONS = ["order", "root_number", "truncation", "precision_bits", "test_point", "minimal_model",
             "factorisation", "pocklington", "delete", "type", "swap curve"]
VALUES = ["0", "1", "2", "-1", "3", "7", "31", "32", "33", "100", "6/5", "7/5", "3/2", "2", "12/10", "1.5", "",
          "1000", "-0", "01", "1/2", "5/4"]


@SETTINGS
@given(st.integers(0, len(HOSTILE_SEEDS) - 1), st.sampled_from(MUTATIONS), st.sampled_from(VALUES), st.data())
def test_mutated_witnesses(seed, mutation, value, data):
    """Mutated witnesses: any field replaced by a number or a malformed string, the model or the factorisation
    changed, a key deleted or retyped, the witness of one curve given for another: rejected, or the order
    proven is cypari2's analytic rank — never another exception."""
    a = HOSTILE_SEEDS[seed]
    entry = fresh(a)
    if mutation in ("order", "root_number", "truncation", "precision_bits", "test_point"):
        entry[mutation] = value
    elif mutation == "minimal_model":
        model = entry["conductor"]["minimal_model"]
        part = data.draw(st.sampled_from(["change", "curve"]))
        model[part][data.draw(st.integers(0, len(model[part]) - 1))] = value
    elif mutation == "factorisation":
        primes = entry["conductor"]["discriminant_factorisation"]
        primes[data.draw(st.integers(0, len(primes) - 1))][data.draw(st.sampled_from(["prime", "exponent"]))] = value
    elif mutation == "pocklington":
        entry["conductor"]["pocklington"].append({"prime": value, "factors": []})
    elif mutation == "delete":
        del entry[data.draw(st.sampled_from(sorted(entry)))]
    elif mutation == "type":
        entry[data.draw(st.sampled_from(sorted(entry)))] = data.draw(st.sampled_from([None, 3, [], {}, value]))
    else:
        a = HOSTILE_SEEDS[(seed + 1) % len(HOSTILE_SEEDS)]
    outcome(a, entry)


def test_an_entry_that_is_not_an_object():
    """A witness entry that is a list, a string or null is a structure rejection."""
    for entry in ([], "order 0", None, 3):
        with pytest.raises(Rejection) as rejected:
            check_analytic_witness(exact(RANK_ZERO), entry, "evidence.analytic")
        assert rejected.value.check == "structure"


def test_rank_zero_with_a_non_trivial_sha():
    """[0, −1, 0, −900, −10098] (conductor 960): analytic rank 0 and L(E, 1) by cypari2 ellanalyticrank; said to
    have Sha of order 4 (recalled from memory), so a 2-isogeny descent may not close: the analytic witness
    proves rank 0 all the same."""
    a = (0, -1, 0, -900, -10098)
    assert int(pari.ellglobalred(pari.ellinit(list(a)))[0]) == 960
    check_table_curve(a)
