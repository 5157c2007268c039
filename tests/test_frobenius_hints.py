"""Frobenius hints of analytic rank witnesses (``certify.analytic.frobenius_hints``, checked by
``certify.verifier.lseries.hinted_traces``): a trace a_p and a point of order N = p + 1 − a_p > 4√p of Ẽ(F_p),
which proves #Ẽ(F_p) = N by Lagrange's theorem and Hasse's bound (Silverman, *The Arithmetic of Elliptic
Curves*, V.1.1) without a count.

Outside sources, named at each check: cypari2 as reference library (ellap for a_p, ellgroup, ellordinate,
ellmul and ellorder for the group Ẽ(F_p), ellanalyticrank for the analytic rank), sympy (primerange, isprime)
for the primes up to M, jsonschema (through tests/schema_reference.py) for the schema, and Cremona's tables
through the fixtures tests/data/conductor_lt_1000.txt and tests/data/rank_100000_499999.txt (Debian
pari-elldata). Hostile hints follow the soundness rule of the other witnesses: rejected by a named check, or
the order proven is cypari2's analytic rank — never another exception.
"""
import copy
import math
import functools
from fractions import Fraction

import pytest
import sympy
from hypothesis import HealthCheck, given, settings, strategies as st

from certify.analytic import HINT_THRESHOLD, analytic_witness, frobenius_hints
from certify.certificates import certify_checked
from certify.conductor import certify_conductor
from certify.pari import pari
from certify.verifier import lseries
from certify.verifier.conductor import check_conductor_evidence
from certify.verifier.errors import Rejection
from certify.verifier.limits import FROBENIUS_HINT_WORK, MAX_ANALYTIC_COUNT_WORK, MAX_TRUNCATION
from certify.verifier.lseries import check_analytic_witness, count_work, frobenius_traces, hinted_traces
from conductor_reference import fixture_rows as conductor_rows
from rank_reference import fixture_rows, has_rational_two_torsion
from schema_reference import schema_violations

LARGE = [(rank, a) for _, _, rank, a in fixture_rows("rank_100000_499999.txt") if rank <= 1]
"""The curves of rank 0 or 1 among the 500 random curves of conductor 100,000–499,999 (Cremona's tables)."""

HINTED = [a for _, a in LARGE[:40:5]]
"""Eight of them, spread over the sample: their witnesses need M ≈ 1,000–3,700, so they carry hints."""

SMALL = [a for _, a in conductor_rows("conductor_lt_1000.txt")[::250]]
"""21 curves of Cremona's conductor < 1000 table, every 250th row."""


def exact(a) -> tuple:
    return tuple(Fraction(c) for c in a)


@functools.lru_cache(maxsize=None)
def witness(a: tuple):
    return analytic_witness(exact(a))


@functools.lru_cache(maxsize=None)
def pari_rank(a: tuple) -> int:
    """The analytic rank by cypari2 ellanalyticrank (reference library)."""
    return int(pari.ellanalyticrank(pari.ellinit(list(a)))[0])


def ellap(a, p: int) -> int:
    """a_p by cypari2 ellap (reference library); an invariant of the isomorphism class, so the same on any model."""
    return int(pari.ellap(pari.ellinit(list(a)), p))


def conductor_data(a) -> tuple:
    """(minimal model, local data) through the verifier's conductor checks."""
    model, _, local = check_conductor_evidence(exact(a), certify_conductor(exact(a))["evidence"], "evidence")
    return model, local


def parsed(hints: list, truncation: int) -> list:
    return lseries.read_hints(hints, truncation, "hints")


def rejection(a, entry) -> str:
    """The name of the check that rejects the witness (the test fails if it is accepted)."""
    with pytest.raises(Rejection) as rejected:
        check_analytic_witness(exact(a), entry, "evidence.analytic")
    return rejected.value.check


# --- genuine hints ---

@pytest.mark.parametrize("a", HINTED, ids=str)
def test_hinted_traces_are_pari_ellap(a):
    """Every trace of the certifier's hints is cypari2's ellap, and the verifier's check of the hints gives
    those traces; with the hints the verifier's a_p for p ≤ M are those it counts without them. Hints are
    only at good primes above the threshold where Ẽ(F_p) is cyclic (cypari2 ellgroup), the only groups with
    a point of order #Ẽ(F_p), and at most of those."""
    entry = witness(a)
    truncation = int(entry["truncation"])
    model, local = conductor_data(a)
    bad = {data.prime for data in local}
    hints = parsed(entry["frobenius_hints"], truncation)
    assert hints and all(trace == ellap(a, p) for p, trace, _ in hints)
    assert hinted_traces(model, bad, hints) == {p: ellap(a, p) for p, _, _ in hints}
    assert frobenius_traces(model, local, truncation, hints) == frobenius_traces(model, local, truncation)
    cyclic = {p for p in sympy.primerange(HINT_THRESHOLD + 1, truncation + 1)
              if p not in bad and len(pari.ellgroup(pari.ellinit(list(model), p))) == 1}
    hinted = {p for p, _, _ in hints}
    assert hinted <= cyclic and len(hinted) >= 0.8 * len(cyclic)


@pytest.mark.parametrize("a", SMALL, ids=str)
def test_hints_on_small_conductors_down_to_small_primes(a):
    """On curves of the conductor < 1000 table, hints built at every good prime 2 < p ≤ 2,000 where one is
    found pass the verifier's checks with cypari2's ellap; at the good primes p < 40 with
    (p + 1 − a_p)² ≤ 16p there is none (the verifier would refuse it). There are hints exactly when E(Q)_tors
    is cyclic (cypari2 elltors): a non-cyclic E(Q)_tors injects into every Ẽ(F_p) at odd good p (Silverman
    VII.3.1), which then has no point of order #Ẽ(F_p)."""
    model, local = conductor_data(a)
    bad = {data.prime for data in local}
    hints = parsed(frobenius_hints(model, bad, 2000, threshold=2), 2000)
    assert bool(hints) == (len(pari.elltors(pari.ellinit(list(a)))[1]) <= 1)
    assert hinted_traces(model, bad, hints) == {p: ellap(a, p) for p, _, _ in hints}
    small = [p for p in sympy.primerange(3, 40) if p not in bad and (p + 1 - ellap(a, p)) ** 2 <= 16 * p]
    assert not {p for p, _, _ in hints} & set(small)


def test_count_work_charges_only_unhinted_primes():
    """count_work is Σ p over the primes p ≤ M without a hint (sympy primerange) plus FROBENIUS_HINT_WORK per
    hint; for a genuine witness of conductor near 500,000 it is below Σ_{p ≤ M} p."""
    for a in HINTED[:3]:
        entry = witness(a)
        truncation = int(entry["truncation"])
        hinted = {int(hint["prime"]) for hint in entry["frobenius_hints"]}
        expected = sum(p for p in sympy.primerange(2, truncation + 1) if p not in hinted)
        assert count_work(entry, "evidence.analytic") == expected + FROBENIUS_HINT_WORK * len(hinted)
        if truncation > 3000:
            assert count_work(entry, "evidence.analytic") < sum(sympy.primerange(2, truncation + 1))


def test_hints_lift_the_count_budget():
    """M = MAX_TRUNCATION with no hints needs Σ_{p ≤ M} p > MAX_ANALYTIC_COUNT_WORK (sympy primerange) and is
    refused at once; with a hint at every prime above 1,500 it passes the reading (the hints are not yet
    checked there), since the hinted primes are not counted."""
    entry = copy.deepcopy(witness(HINTED[0]))
    entry["truncation"], entry["precision_bits"] = str(MAX_TRUNCATION), "20"
    assert sum(sympy.primerange(2, MAX_TRUNCATION + 1)) > MAX_ANALYTIC_COUNT_WORK
    entry["frobenius_hints"] = []
    with pytest.raises(Rejection) as rejected:
        lseries.read_witness(entry, "evidence.analytic")
    assert rejected.value.check == "analytic limit"
    entry["frobenius_hints"] = [{"prime": str(p), "trace": "0", "point": ["0", "0"]}
                                for p in sympy.primerange(1501, MAX_TRUNCATION + 1)]
    assert lseries.read_witness(entry, "evidence.analytic")[2] == MAX_TRUNCATION


def certified_curves() -> list:
    """15 curves of the conductor < 1000 table and 15 of conductor 100,000–499,999 (Cremona's tables), of rank
    0 or 1 and with no rational point of order 2 (cypari2 elldivpol, through rank_reference): no descent, so
    their rank certificates carry an analytic witness."""
    small = [(rank, a) for _, _, rank, a in fixture_rows("rank_lt_1000.txt")[::97] if rank <= 1]
    picked = [entry for entry in small if not has_rational_two_torsion(entry[1])][:15]
    return picked + [entry for entry in LARGE if not has_rational_two_torsion(entry[1])][:15]


def test_rank_certificates_with_hints_verify():
    """certify_checked('rank', a) on 30 table curves with analytic witnesses: accepted (the verifier runs
    inside), valid for the schema by jsonschema, rank_upper Cremona's rank, and on the 15 large conductors
    with Frobenius hints, whose traces are cypari2's ellap."""
    with_hints = 0
    for rank, a in certified_curves():
        cert = certify_checked("rank", exact(a))
        analytic = cert["evidence"]["analytic"]
        assert analytic is not None, a
        assert schema_violations(cert) == []
        assert cert["claim"]["rank_upper"] == str(rank)
        hints = analytic["frobenius_hints"]
        assert all(int(hint["trace"]) == ellap(a, int(hint["prime"])) for hint in hints[::10])
        with_hints += bool(hints)
    assert with_hints >= 15


# --- hostile hints ---

TARGET = next(a for a in HINTED if pari_rank(a) == 0)
"""A rank-0 curve of the large sample (cypari2 ellanalyticrank), whose witness is checked quickly."""


def target() -> tuple:
    """(fresh copy of TARGET's witness, its hints, its truncation point)."""
    entry = copy.deepcopy(witness(TARGET))
    return entry, entry["frobenius_hints"], int(entry["truncation"])


def group(p: int):
    """Ẽ(F_p) of TARGET's minimal model (cypari2 ellinit over F_p)."""
    return pari.ellinit(list(conductor_data(TARGET)[0]), p)


def as_residues(point) -> list:
    return [str(int(pari.lift(c))) for c in point]


def insert(hints: list, hint: dict) -> None:
    """Put the hint at its place in the increasing order of primes."""
    position = sum(1 for h in hints if int(h["prime"]) < int(hint["prime"]))
    hints.insert(position, hint)


def test_genuine_target_is_accepted():
    """The unmutated witness proves cypari2's analytic rank (the hostile cases below start from it)."""
    entry, hints, _ = target()
    assert hints and check_analytic_witness(exact(TARGET), entry, "evidence.analytic") == pari_rank(TARGET)


def test_wrong_trace():
    """a_p changed by ±1 or ±2 within Hasse's bound: N·P ≠ O ('frobenius hint order'), since ord(P) = #Ẽ(F_p)
    divides no other number of the Hasse interval; a trace beyond 2√p: 'frobenius hint trace'."""
    for i in (0, 7, -1):
        for change in (1, -1, 2, -2):
            entry, hints, _ = target()
            p, trace = int(hints[i]["prime"]), int(hints[i]["trace"]) + change
            hints[i]["trace"] = str(trace)
            assert rejection(TARGET, entry) == ("frobenius hint order" if trace * trace <= 4 * p
                                                else "frobenius hint trace")
        entry, hints, _ = target()
        p = int(hints[i]["prime"])
        hints[i]["trace"] = str(math.isqrt(4 * p) + 1)
        assert rejection(TARGET, entry) == "frobenius hint trace"


def test_point_off_the_curve_or_not_residues():
    """y + 1, x = p, y = −1 and x = x + p (the same residue, not reduced): 'frobenius hint point'."""
    for mutate in (lambda x, y, p: [x, (y + 1) % p], lambda x, y, p: [p, y], lambda x, y, p: [x, -1],
                   lambda x, y, p: [x + p, y]):
        entry, hints, _ = target()
        x, y = (int(v) for v in hints[3]["point"])
        hints[3]["point"] = [str(v) for v in mutate(x, y, int(hints[3]["prime"]))]
        assert rejection(TARGET, entry) == "frobenius hint point"


def test_point_of_order_a_proper_divisor():
    """P replaced by r·P for each prime r | N (cypari2 ellmul), of order N/r: 'frobenius hint order'."""
    entry, hints, _ = target()
    index = next(i for i, h in enumerate(hints) if not sympy.isprime(int(h["prime"]) + 1 - int(h["trace"])))
    p, count = int(hints[index]["prime"]), int(hints[index]["prime"]) + 1 - int(hints[index]["trace"])
    curve = group(p)
    point = [pari.Mod(int(v), p) for v in hints[index]["point"]]
    for r in sympy.primefactors(count):
        entry, hints, _ = target()
        multiple = pari.ellmul(curve, point, r)
        assert int(pari.ellorder(curve, multiple)) == count // r
        hints[index]["point"] = as_residues(multiple)
        assert rejection(TARGET, entry) == "frobenius hint order"


def test_point_of_a_non_cyclic_group():
    """At a good prime p ≤ M where Ẽ(F_p) is not cyclic (cypari2 ellgroup), no point has order #Ẽ(F_p): a hint
    there with the true trace and a point of largest order is refused ('frobenius hint order')."""
    _, hints, truncation = target()
    bad = {data.prime for data in conductor_data(TARGET)[1]}
    for p in sympy.primerange(HINT_THRESHOLD, truncation + 1):
        if p not in bad and len(pari.ellgroup(group(p))) == 2 and (p + 1 - ellap(TARGET, p)) ** 2 > 16 * p:
            break
    else:
        pytest.skip("no non-cyclic reduction with N > 4 sqrt(p) up to M")
    generators = pari.ellgroup(group(p), 0, 1)[2]
    entry, hints, _ = target()
    insert(hints, {"prime": str(p), "trace": str(ellap(TARGET, p)), "point": as_residues(generators[0])})
    assert rejection(TARGET, entry) == "frobenius hint order"


def test_count_not_above_four_sqrt_p():
    """At the good primes p < 40 where N = p + 1 − a_p (cypari2 ellap) has N² ≤ 16p, a hint with the true trace
    and a true point (cypari2 ellordinate) is refused: 'frobenius hint trace' (the order of a point cannot
    single out N)."""
    bad = {data.prime for data in conductor_data(TARGET)[1]}
    tried = 0
    for p in sympy.primerange(2, 40):
        trace = ellap(TARGET, p)
        if p in bad or (p + 1 - trace) ** 2 > 16 * p:
            continue
        x = next((x for x in range(p) if len(pari.ellordinate(group(p), x))), None)
        if x is None:   # Ẽ(F_p) = {O}: no point to offer
            continue
        entry, hints, _ = target()
        insert(hints, {"prime": str(p), "trace": str(trace),
                       "point": [str(x), str(int(pari.lift(pari.ellordinate(group(p), x)[0])))]})
        assert rejection(TARGET, entry) == "frobenius hint trace"
        tried += 1
    assert tried


def test_hint_at_a_bad_prime():
    """A hint at a prime of bad reduction up to M (a prime of the conductor, cypari2 ellglobalred):
    'frobenius hint prime'."""
    _, _, truncation = target()
    conductor = int(pari.ellglobalred(pari.ellinit(list(TARGET)))[0])
    bad = [p for p in sympy.primefactors(conductor) if p <= truncation]
    assert bad
    for p in bad:
        entry, hints, _ = target()
        insert(hints, {"prime": str(p), "trace": str(ellap(TARGET, p)), "point": ["0", "0"]})
        assert rejection(TARGET, entry) == "frobenius hint prime"


def test_duplicated_or_unsorted_primes():
    """A hint repeated, or two hints swapped: 'frobenius hint prime', before any hint is checked."""
    entry, hints, _ = target()
    hints.insert(1, copy.deepcopy(hints[1]))
    assert rejection(TARGET, entry) == "frobenius hint prime"
    entry, hints, _ = target()
    hints[2], hints[3] = hints[3], hints[2]
    assert rejection(TARGET, entry) == "frobenius hint prime"


def test_primes_beyond_the_limits():
    """A hint at the first prime above M (sympy nextprime), at a composite number below M, at 1, 0 or −7, each
    at its place in the order: 'frobenius hint prime'."""
    _, hints, truncation = target()
    composite = next(int(h["prime"]) + 1 for h in hints[:-1])
    assert not sympy.isprime(composite)
    for p in (sympy.nextprime(truncation), composite, 1, 0, -7):
        entry, hints, _ = target()
        insert(hints, {"prime": str(p), "trace": "0", "point": ["0", "0"]})
        assert rejection(TARGET, entry) == "frobenius hint prime"


def test_more_hints_than_primes_refused_before_any_work(monkeypatch):
    """More hints than the primes up to M (sympy primerange): 'analytic limit', before the conductor checks,
    any count or any multiple of a point run."""
    def no_work(*args):
        raise AssertionError("work done before the limits were checked")
    for name in ("check_conductor_evidence", "count_points", "multiple_mod"):
        monkeypatch.setattr(lseries, name, no_work)
    entry, hints, truncation = target()
    primes = len(list(sympy.primerange(2, truncation + 1)))
    entry["frobenius_hints"] = [hints[0]] * (primes + 1)
    assert rejection(TARGET, entry) == "analytic limit"
    with pytest.raises(Rejection) as rejected:
        count_work(entry, "evidence.analytic")
    assert rejected.value.check == "analytic limit"


@pytest.mark.parametrize("damage", ["not a list", "not an object", "missing trace", "three residues",
                                    "point a string", "number prime", "prime with a plus", "missing key"])
def test_malformed_hints(damage):
    """Malformed hints are refused by name ('structure', 'number syntax'), never another exception."""
    entry, hints, _ = target()
    if damage == "not a list":
        entry["frobenius_hints"] = {"prime": "307"}
    elif damage == "not an object":
        hints[0] = ["307", "11", ["5", "71"]]
    elif damage == "missing trace":
        del hints[0]["trace"]
    elif damage == "three residues":
        hints[0]["point"].append("0")
    elif damage == "point a string":
        hints[0]["point"] = "5, 71"
    elif damage == "number prime":
        hints[0]["prime"] = int(hints[0]["prime"])
    elif damage == "prime with a plus":
        hints[0]["prime"] = "+" + hints[0]["prime"]
    else:
        del entry["frobenius_hints"]
    assert rejection(TARGET, entry) in ("structure", "number syntax")


SETTINGS = settings(max_examples=150, deadline=None, suppress_health_check=list(HealthCheck), derandomize=True)


@SETTINGS
@given(st.integers(0, 400), st.sampled_from(["prime", "trace", "x", "y"]), st.integers(-30, 30))
def test_mutated_hints(index, key, shift):
    """A hint's prime, trace or a coordinate shifted by −30 … 30: rejected by a named check, or the order
    proven is cypari2's analytic rank."""
    entry, hints, _ = target()
    hint = hints[index % len(hints)]
    if key in ("prime", "trace"):
        hint[key] = str(int(hint[key]) + shift)
    else:
        coordinate = 0 if key == "x" else 1
        hint["point"][coordinate] = str(int(hint["point"][coordinate]) + shift)
    try:
        order = check_analytic_witness(exact(TARGET), entry, "evidence.analytic")
    except Rejection as rejected:
        assert rejected.check and shift != 0
        return
    assert order == pari_rank(TARGET)
