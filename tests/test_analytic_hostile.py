"""Hostile analytic rank witnesses (evidence.analytic of a certify-rank certificate): mutations of genuine
witnesses, forgeries aimed at each step of the argument of certify/verifier/lseries.py, and cost cases.

The oracle: a certificate is rejected with the verifier's ``Rejection`` (never another exception), or it is
accepted and its rank bounds contain the true rank — Cremona's rank from the fixture tests/data/
rank_lt_1000.txt (Debian pari-elldata, ranks proven), or cypari2's ``ellrank`` and ``ellanalyticrank``
(reference library) for curves outside it. The verifier's schema step must agree with the reference library
jsonschema on every mutant (tests/schema_reference.py).

The forgeries follow the argument: the functional-equation identity L(E, 1) = S(cA) + w·S(c/A) makes the
root-number tests G = S(c/A) − S(cA) and D = S(c/A) + S(cA) − 2S(c) vanish exactly for w = −1 and w = +1
(J. E. Cremona, *Algorithms for Modular Elliptic Curves*, 2nd ed., §2.13), so a witness claiming the wrong
parity must fail the root-number test, and one claiming order 0 or 1 for a curve of analytic rank 2 or 3
must fail the L-value test, at every precision, test point and truncation point the limits allow. The
conductor must be the curve's own (Tate's algorithm on the embedded evidence); a witness borrowed from
another curve, even one with the same conductor, must be refused. Cost cases run both entry points under
tests/hostile_run.py's time and memory bounds.
"""
from __future__ import annotations

import copy
import functools
import json
import random
from fractions import Fraction

import pytest

from certify.certificates import certify_checked
from certify.conductor import certify_conductor
from certify.verifier import verify
from certify.verifier.errors import Rejection
from certify.verifier.lseries import check_truncation, primes_up_to
from certify.verifier.schema import schema_violations
from hostile_run import ENTRY_POINTS, assert_answered, run
from rank_reference import fixture_rows, pari
from schema_reference import schema_violations as reference_violations

TABLE = fixture_rows("rank_lt_1000.txt")
TABLE_RANKS = {a: rank for _, _, rank, a in TABLE}

POOL_CURVES = ((0, -1, 1, -10, -20), (1, 0, 0, -6641, -215575), (1, 1, 1, 17, 179), (1, 1, 1, -27930, -1808687),
               (1, -1, 0, -165, 533), (0, -1, 0, -45, 133), (0, 0, 1, 6, 13), (1, 0, 1, -145, 692),
               (1, 1, 0, 25, -14), (1, 0, 1, -758201, 254051548))
"""Table curves (by coefficients; orientation only, the truth is the fixture's rank) whose genuine rank
certificates carry an analytic witness of order 0 or 1 (asserted by the pool test)."""

RANK_TWO = (0, 1, 1, -2, 0)
"""A curve of the table of rank 2 (fixture): its L(E, 1) and L′(E, 1) vanish (w = +1, order 2)."""

RANK_THREE = (0, 0, 1, -7, 6)
"""Conductor 5077, rank 3 by cypari2 ellrank (outside the fixture); w = −1 and L′(E, 1) = 0."""

MUTANTS = 360


def fractions(a) -> list:
    return [Fraction(c) for c in a]


@functools.cache
def pool() -> tuple:
    """((certificate, rank), …) for POOL_CURVES with an analytic witness, each accepted."""
    out = []
    for a in POOL_CURVES:
        cert = certify_checked("rank", fractions(a))
        if cert["evidence"]["analytic"] is not None:
            verify(cert)
            out.append((cert, TABLE_RANKS[a]))
    return tuple(out)


def fresh(index: int) -> dict:
    return copy.deepcopy(pool()[index][0])


@functools.cache
def reference_rank(curve: tuple) -> int:
    """The rank: the fixture's, else cypari2's ellrank when its bounds meet (else the analytic rank)."""
    a = tuple(int(Fraction(c)) for c in curve) if all(Fraction(c).denominator == 1 for c in curve) else None
    if a in TABLE_RANKS:
        return TABLE_RANKS[a]
    e = pari.ellinit([Fraction(c) for c in curve])
    low, high = (int(x) for x in pari.ellrank(e)[:2])
    return low if low == high else int(pari.ellanalyticrank(e)[0])


def assert_sound(cert) -> "Rejection | None":
    """Rejected with a Rejection, or accepted with bounds that contain the true rank."""
    try:
        verify(cert)
    except Rejection as rejection:
        return rejection
    rank = reference_rank(tuple(cert["curve"]))
    claim = cert["claim"]
    assert int(claim["rank_lower"]) <= rank, ("accepted a false lower bound", claim, rank)
    assert claim["rank_upper"] is None or int(claim["rank_upper"]) >= rank, ("accepted a false upper bound",
                                                                           claim, rank)
    return None


def rejection(cert) -> Rejection:
    with pytest.raises(Rejection) as caught:
        verify(cert)
    return caught.value


def test_pool_is_genuine_with_both_orders():
    """The pool certificates are accepted, true (fixture ranks) and carry witnesses of order 0 and 1."""
    orders = set()
    for cert, rank in pool():
        assert cert["claim"]["rank_upper"] == str(rank) == cert["evidence"]["analytic"]["order"]
        orders.add(cert["evidence"]["analytic"]["order"])
    assert orders == {"0", "1"} and len(pool()) >= 8


# --- mutations ----------------------------------------------------------------------------------------------

JUNK = (None, 0, 1, -1, 1.5, True, False, [], {}, "", " 1", "+1", "-0", "1e3", "0x10", "1/1", "2/4", "1/0",
        "NaN", "9" * 4001, "-" + "9" * 3999, "1" + "0" * 3999, ["1"], {"1": "1"}, "٣")
"""Values of every JSON type and malformed decimal spellings, including numbers at and over MAX_DIGITS."""


def leaf_paths(value, prefix=()) -> list:
    out = [prefix] if prefix else []
    children = value.items() if isinstance(value, dict) else enumerate(value) if isinstance(value, list) else ()
    for key, child in children:
        out += leaf_paths(child, prefix + (key,))
    return out


def get_at(value, path):
    for key in path:
        value = value[key]
    return value


def put_at(value, path, new) -> None:
    get_at(value, path[:-1])[path[-1]] = new


def nearby(text, rnd: random.Random) -> str:
    try:
        value = Fraction(text)
    except (TypeError, ValueError, ZeroDivisionError):
        return rnd.choice(["0", "1", "-1", "2"])
    return str(rnd.choice([value + 1, value - 1, -value, 2 * value, value / 2, Fraction(0), Fraction(1), value + 2,
                           value * 3 / 2, value + Fraction(1, 1000), value - Fraction(1, 1000), value ** 2]))


def analytic(cert) -> dict:
    return cert["evidence"]["analytic"]


def respell_leaf(cert, rnd, others) -> None:
    paths = [p for p in leaf_paths(analytic(cert)) if isinstance(get_at(analytic(cert), p), str)]
    path = rnd.choice(paths)
    put_at(analytic(cert), path, nearby(get_at(analytic(cert), path), rnd))


def junk_leaf(cert, rnd, others) -> None:
    path = rnd.choice(leaf_paths(analytic(cert)))
    put_at(analytic(cert), path, copy.deepcopy(rnd.choice(JUNK)))


def drop_key(cert, rnd, others) -> None:
    dicts = [p for p in [()] + leaf_paths(analytic(cert)) if isinstance(get_at(analytic(cert), p), dict)
             and get_at(analytic(cert), p)]
    target = get_at(analytic(cert), rnd.choice(dicts))
    del target[rnd.choice(sorted(target))]


def extra_key(cert, rnd, others) -> None:
    analytic(cert)[rnd.choice(["conductor_claim", "L_value", "order "])] = "1"


def list_surgery(cert, rnd, others) -> None:
    lists = [p for p in leaf_paths(analytic(cert)) if isinstance(get_at(analytic(cert), p), list)
             and get_at(analytic(cert), p)]
    if not lists:
        analytic(cert)["frobenius_hints"] = [{"prime": "2", "trace": "0", "point": ["0", "0"]}]
        return
    target = get_at(analytic(cert), rnd.choice(lists))
    how = rnd.randrange(3)
    if how == 0:
        target.pop(rnd.randrange(len(target)))
    elif how == 1:
        target.append(copy.deepcopy(rnd.choice(target)))
    else:
        target.reverse()


def flip_order(cert, rnd, others) -> None:
    """The other order, with the root number it forces and the claim that would follow."""
    order = 1 - int(analytic(cert)["order"])
    analytic(cert)["order"], analytic(cert)["root_number"] = str(order), str((-1) ** order)
    if rnd.random() < 0.7:
        cert["claim"]["rank_upper"] = str(order)
        if order == 0:
            cert["claim"]["rank_lower"], cert["claim"]["points"] = "0", []
            cert["evidence"]["independence"] = None


def new_parameters(cert, rnd, others) -> None:
    """Precision, truncation and test point anywhere in and around their limits."""
    entry = analytic(cert)
    which = rnd.randrange(3)
    if which == 0:
        entry["precision_bits"] = str(rnd.choice([0, 1, 2, 3, 5, 8, 16, 31, 64, 127, 128, 129, rnd.randint(1, 128)]))
    elif which == 1:
        m = int(entry["truncation"])
        entry["truncation"] = str(rnd.choice([0, 1, m - 1, m + 1, 2 * m, 12_000, 12_001, rnd.randint(1, 3 * m)]))
    else:
        denominator = rnd.choice([1, 2, 5, 999, 1000, 1001])
        entry["test_point"] = str(Fraction(rnd.randint(denominator, 2 * denominator + 1), denominator))


def borrow_conductor(cert, rnd, others) -> None:
    analytic(cert)["conductor"] = copy.deepcopy(analytic(rnd.choice(others))["conductor"])


def borrow_witness(cert, rnd, others) -> None:
    cert["evidence"]["analytic"] = copy.deepcopy(analytic(rnd.choice(others)))


def bad_hint(cert, rnd, others) -> None:
    """A Frobenius hint with a wrong trace, a wrong point or at a bad or small prime."""
    entry = analytic(cert)
    m = int(entry["truncation"])
    primes = primes_up_to(m)
    hints = entry.setdefault("frobenius_hints", [])
    p = rnd.choice(primes[:4] + primes[-4:])
    trace = rnd.randint(-2, 2) + (round(2 * p ** 0.5) * rnd.choice([-1, 1]) if rnd.random() < 0.5 else 0)
    hint = {"prime": str(p), "trace": str(trace), "point": [str(rnd.randrange(p)), str(rnd.randrange(p))]}
    if hints and rnd.random() < 0.6:
        target = rnd.choice(hints)
        key = rnd.choice(["trace", "point"])
        target[key] = str(int(target["trace"]) + rnd.choice([-2, -1, 1, 2])) if key == "trace" else \
            [str((int(v) + rnd.randint(1, 3)) % int(target["prime"])) for v in target["point"]]
    else:
        hints[:] = sorted(hints + [hint], key=lambda h: int(h["prime"]))


MUTATIONS = (respell_leaf, respell_leaf, junk_leaf, drop_key, extra_key, list_surgery, flip_order, flip_order,
             new_parameters, new_parameters, borrow_conductor, borrow_witness, bad_hint)


def mutant(seed: int) -> tuple:
    rnd = random.Random(seed)
    index = rnd.randrange(len(pool()))
    cert = fresh(index)
    others = [c for i, (c, _) in enumerate(pool()) if i != index]
    names = []
    for _ in range(rnd.choice([1, 1, 2, 3])):
        mutation = rnd.choice(MUTATIONS)
        if not isinstance(cert["evidence"].get("analytic"), dict):
            break
        try:
            mutation(cert, rnd, others)
        except (KeyError, IndexError, TypeError, ValueError, ZeroDivisionError):
            continue       # the mutation did not apply to a structure an earlier one broke
        names.append(mutation.__name__)
    return cert, names


def test_mutants_are_rejected_or_true():
    """MUTANTS mutants of the pool's witnesses: a Rejection or a true claim, never a crash, the schema steps
    agreeing with jsonschema; most are rejected, by checks across the witness."""
    checks, accepted = set(), 0
    for seed in range(MUTANTS):
        cert, names = mutant(seed)
        outcome = assert_sound(cert)
        assert bool(schema_violations(cert)) == bool(reference_violations(cert)), (seed, names)
        if outcome is None:
            accepted += 1
        else:
            checks.add(outcome.check)
    assert accepted < MUTANTS // 3
    assert {"root number", "truncation", "analytic limit", "number syntax", "structure", "input model"} <= checks, checks


def test_both_entry_points_answer_a_directory_of_mutants(tmp_path):
    """100 mutants as files: one verdict each on both entry points, no traceback, the verdicts of this process."""
    expected = {}
    for seed in range(100):
        cert, _ = mutant(seed)
        name = f"analytic-{seed:03d}.json"
        (tmp_path / name).write_text(json.dumps(cert))
        expected[name] = assert_sound(cert) is None
    for entry in ENTRY_POINTS:
        verdicts = assert_answered(run(entry, "--jsonl", str(tmp_path)), certificates=100, jsonl=True)
        assert {v["file"].rsplit("/", 1)[-1]: v["accepted"] for v in verdicts} == expected, entry


# --- forgeries ----------------------------------------------------------------------------------------------

def least_truncation(conductor: int, bits: int, test_point: Fraction) -> int:
    """The least M that the verifier's check_truncation accepts (searched upward)."""
    m = 1
    while True:
        try:
            check_truncation(conductor, m, bits, test_point)
            return m
        except Rejection:
            m += 1


@functools.cache
def conductor_certificate(a: tuple) -> dict:
    return certify_conductor(tuple(fractions(a)))


def forged(a: tuple, order: int, bits: int, test_point: Fraction, truncation=None, claim_upper=None) -> dict:
    """A rank certificate for the curve a claiming rank_upper = order (rank_lower 0, no points) with an analytic
    witness of that order built on the curve's genuine conductor evidence."""
    conductor = conductor_certificate(a)
    n = int(conductor["claim"]["conductor"])
    base = copy.deepcopy(pool()[0][0])
    base["curve"] = [str(c) for c in a]
    base["claim"] = {"rank_lower": "0", "rank_upper": str(order if claim_upper is None else claim_upper),
                     "points": [], "selmer_dimensions": None}
    base["evidence"]["integral_model"] = {"change": ["1", "0", "0", "0"], "curve": [str(c) for c in a]}
    base["evidence"]["independence"] = None
    base["evidence"]["descent"] = None
    base["evidence"]["analytic"] = {
        "conductor": copy.deepcopy(conductor["evidence"]), "order": str(order), "root_number": str((-1) ** order),
        "truncation": str(truncation or least_truncation(n, bits, test_point)), "precision_bits": str(bits),
        "test_point": str(test_point)}
    if "frobenius_hints" in pool()[0][0]["evidence"]["analytic"]:
        base["evidence"]["analytic"]["frobenius_hints"] = []
    return base


TEST_POINTS = (Fraction(1001, 1000), Fraction(6, 5), Fraction(3, 2), Fraction(1999, 1000), Fraction(2))
PRECISIONS = (1, 2, 4, 8, 16, 32, 64)


@pytest.mark.parametrize("a, order", [((0, -1, 1, -10, -20), 1), ((1, 0, 0, -6641, -215575), 1),
                                      ((0, -1, 0, -45, 133), 0), ((1, 0, 1, -145, 692), 0),
                                      (RANK_TWO, 0), (RANK_TWO, 1), (RANK_THREE, 1), (RANK_THREE, 0)],
                         ids=["rank0-as-order1", "rank0-as-order1-b", "rank1-as-order0", "rank1-as-order0-b",
                              "rank2-as-order0", "rank2-as-order1", "rank3-as-order1", "rank3-as-order0"])
def test_false_order_is_refused_at_every_precision_and_test_point(a, order):
    """The wrong parity fails the root-number test (it vanishes identically); order 0 or 1 for analytic rank
    2 or 3 fails the L-value test; at every precision, test point and at the least truncation point and one
    beyond it. The ranks: fixture, cypari2 ellrank / ellanalyticrank."""
    assert reference_rank(a) != order
    for bits in PRECISIONS:
        for test_point in TEST_POINTS:
            cert = forged(a, order, bits, test_point)
            least = int(cert["evidence"]["analytic"]["truncation"])
            for truncation in (least, least + 1):
                cert["evidence"]["analytic"]["truncation"] = str(truncation)
                assert rejection(cert).check in ("root number", "L-value", "upper bound"), (bits, test_point)


def test_truncation_one_below_the_least_is_refused():
    """At M − 1 below the least accepted M, the tail check refuses the witness by name."""
    cert, _ = pool()[0]
    entry = cert["evidence"]["analytic"]
    n = int(conductor_certificate(tuple(int(c) for c in cert["curve"]))["claim"]["conductor"])
    least = least_truncation(n, int(entry["precision_bits"]), Fraction(entry["test_point"]))
    for truncation, accepted in ((least - 1, False), (least, True)):
        copied = copy.deepcopy(cert)
        copied["evidence"]["analytic"]["truncation"] = str(truncation)
        if accepted:
            verify(copied)
        else:
            assert rejection(copied).check == "truncation"


def test_witness_of_a_curve_with_the_same_conductor_is_refused():
    """Two classes of one conductor with different ranks (fixture): the rank-0 curve's witness on the rank-1
    curve is refused by the input-model check of its conductor evidence."""
    by_conductor = {}
    for n, _, rank, a in TABLE:
        by_conductor.setdefault(n, {}).setdefault(rank, a)
    n, ranks = next((n, r) for n, r in sorted(by_conductor.items()) if {0, 1} <= set(r))
    donor = certify_checked("rank", fractions(ranks[0]))
    assert donor["evidence"]["analytic"] is not None
    receiver = forged(ranks[1], 0, 32, Fraction(6, 5))
    receiver["evidence"]["analytic"] = copy.deepcopy(donor["evidence"]["analytic"])
    assert rejection(receiver).check == "input model"


def test_conductor_evidence_with_a_prime_missing_or_an_exponent_changed_is_refused():
    """The factorisation of the minimal discriminant must account for all of it, each exponent v_p(Δ)."""
    cert = copy.deepcopy(pool()[1][0])
    factorisation = cert["evidence"]["analytic"]["conductor"]["discriminant_factorisation"]
    dropped = copy.deepcopy(cert)
    dropped["evidence"]["analytic"]["conductor"]["discriminant_factorisation"] = factorisation[1:]
    assert rejection(dropped).check == "factorisation"
    raised = copy.deepcopy(cert)
    raised["evidence"]["analytic"]["conductor"]["discriminant_factorisation"][0]["exponent"] = \
        str(int(factorisation[0]["exponent"]) + 1)
    assert rejection(raised).check == "factorisation"


def test_root_number_inconsistent_with_the_order_is_refused():
    for cert, _ in pool()[:3]:
        copied = copy.deepcopy(cert)
        copied["evidence"]["analytic"]["root_number"] = str(-int(copied["evidence"]["analytic"]["root_number"]))
        assert rejection(copied).check == "root number"


# --- cost ---------------------------------------------------------------------------------------------------

LARGE_CONDUCTOR_CURVE = (0, 0, 1, 23, 42)
"""Conductor 1,549,835 (cypari2 ellglobalred), rank 1 (cypari2 ellrank): the series for L′(E, 1) at the
largest truncation the count budget allows evaluate E₁ by its power series at almost every n."""


def largest_counted_truncation() -> int:
    """The largest M with Σ_{p ≤ M} p within MAX_ANALYTIC_COUNT_WORK (point counts at every prime)."""
    from certify.verifier.limits import MAX_ANALYTIC_COUNT_WORK
    total = 0
    for p in primes_up_to(12_000):
        if total + p > MAX_ANALYTIC_COUNT_WORK:
            return p - 1
        total += p
    return 12_000


def costly_witness(order: int) -> dict:
    from certify.verifier.limits import MAX_ANALYTIC_SERIES_WORK
    truncation = largest_counted_truncation()
    return forged(LARGE_CONDUCTOR_CURVE, order, MAX_ANALYTIC_SERIES_WORK // truncation, Fraction(1001, 1000),
                  truncation=truncation)


@pytest.mark.parametrize("order", [0, 1])
def test_witness_at_the_count_and_series_limits_is_answered(tmp_path, order):
    """M at the count budget, b at the series budget, the slowest test point, a conductor of 1.5·10⁶: both
    entry points answer within the hostile-run bounds; the true order (1, cypari2 ellanalyticrank) is
    accepted, the false one refused."""
    assert int(pari.ellanalyticrank(pari.ellinit(list(LARGE_CONDUCTOR_CURVE)))[0]) == 1
    path = tmp_path / "costly.json"
    path.write_text(json.dumps(costly_witness(order)))
    for entry in ENTRY_POINTS:
        verdicts = assert_answered(run(entry, "--quiet", str(path)))
        assert verdicts[0].startswith("accepted: " if order == 1 else "rejected: "), (entry, verdicts)


def test_huge_conductor_is_refused_by_the_tail_check(tmp_path):
    """y² = x³ + D, D the product of the first 300 primes (cube-free, so the model is minimal away from 2 and
    3; the conductor has about 1,500 digits): no truncation within the limits bounds the tails, and both entry
    points refuse it quickly by name."""
    d = 1
    for p in primes_up_to(2_000)[:300]:
        d *= p
    a = (0, 0, 0, 0, d)
    cert = forged(a, 0, 1, Fraction(2), truncation=12_000 if sum(primes_up_to(12_000)) <= 5_000_000 else 9_000)
    assert rejection(cert).check in ("truncation", "analytic limit", "work")
    path = tmp_path / "huge.json"
    path.write_text(json.dumps(cert))
    for entry in ENTRY_POINTS:
        assert assert_answered(run(entry, "--quiet", str(path)))[0].startswith("rejected: ")


# --- Frobenius hints ----------------------------------------------------------------------------------------

def hinted_pool_certificate() -> tuple:
    """(a pool certificate of order 1 whose witness gets genuine Frobenius hints at every good prime
    7 ≤ p ≤ M where the certifier finds one, its hints); skipped where the format has no hints."""
    cert = copy.deepcopy(next(c for c, rank in pool() if rank == 1))
    entry = cert["evidence"]["analytic"]
    if "frobenius_hints" not in entry:
        pytest.skip("the witness format has no Frobenius hints")
    from certify.analytic import frobenius_hint
    model = tuple(int(c) for c in entry["conductor"]["minimal_model"]["curve"])
    bad = {int(f["prime"]) for f in entry["conductor"]["discriminant_factorisation"]}
    hints = [h for p in primes_up_to(int(entry["truncation"])) if p >= 7 and p not in bad
             for h in [frobenius_hint(model, p)] if h is not None]
    entry["frobenius_hints"] = hints
    return cert, hints


def test_genuine_hints_are_accepted_and_their_traces_are_pari_s():
    """The hints built for the test are right (cypari2 ellap) and the verifier accepts them."""
    cert, hints = hinted_pool_certificate()
    e = pari.ellinit([int(c) for c in cert["evidence"]["analytic"]["conductor"]["minimal_model"]["curve"]])
    assert len(hints) >= 5
    assert all(int(h["trace"]) == int(pari.ellap(e, int(h["prime"]))) for h in hints)
    verify(cert)


def point_multiple(cert, hint, k: int) -> list:
    from certify.verifier.curves import multiple_mod
    model = tuple(int(c) for c in cert["evidence"]["analytic"]["conductor"]["minimal_model"]["curve"])
    point = multiple_mod(model, k, tuple(int(v) for v in hint["point"]), int(hint["prime"]))
    return None if point is None else [str(v) for v in point]


def wrong_trace_same_point(cert, hint):
    hint["trace"] = str(int(hint["trace"]) + 1)


def trace_beyond_hasse(cert, hint):
    p = int(hint["prime"])
    hint["trace"] = str(-(int((4 * p) ** 0.5) + 1))


def count_too_small(cert, hint):
    """At the first hint (a prime below 35, where p + 1 − 2√p ≤ 4√p can happen), the largest trace."""
    hint = cert["evidence"]["analytic"]["frobenius_hints"][0]
    p = int(hint["prime"])
    assert p < 35
    hint["trace"] = str(next(t for t in range(int((4 * p) ** 0.5), -1, -1) if (p + 1 - t) ** 2 <= 16 * p))


def point_off_the_curve(cert, hint):
    """The same x with an ordinate that is neither of the two on the curve (y and −y − a1x − a3)."""
    a1, _, a3, _, _ = (int(c) for c in cert["evidence"]["analytic"]["conductor"]["minimal_model"]["curve"])
    p, (x, y) = int(hint["prime"]), (int(v) for v in hint["point"])
    hint["point"][1] = str(next(v for v in range(p) if v not in (y, (-y - a1 * x - a3) % p)))


def point_not_reduced(cert, hint):
    hint["point"][0] = str(int(hint["point"][0]) + int(hint["prime"]))


def point_of_smaller_order(cert, hint):
    count = int(hint["prime"]) + 1 - int(hint["trace"])
    r = next(r for r in range(2, count + 1) if count % r == 0)
    hint["point"] = point_multiple(cert, hint, r)


def hint_at_a_bad_prime(cert, hint):
    bad = [f["prime"] for f in cert["evidence"]["analytic"]["conductor"]["discriminant_factorisation"]]
    hint["prime"] = next(p for p in reversed(bad) if int(p) < int(hint["prime"])) if any(
        int(p) < int(hint["prime"]) for p in bad) else bad[0]
    cert["evidence"]["analytic"]["frobenius_hints"].sort(key=lambda h: int(h["prime"]))


def hint_beyond_the_truncation(cert, hint):
    m = int(cert["evidence"]["analytic"]["truncation"])
    hint["prime"] = str(next(p for p in range(m + 1, 2 * m + 2) if all(p % d for d in range(2, p))))
    cert["evidence"]["analytic"]["frobenius_hints"].sort(key=lambda h: int(h["prime"]))


def hint_twice(cert, hint):
    hints = cert["evidence"]["analytic"]["frobenius_hints"]
    hints.insert(hints.index(hint), copy.deepcopy(hint))


HINT_FORGERIES = {
    "wrong trace, same point": (wrong_trace_same_point, ("frobenius hint order", "frobenius hint trace")),
    "trace beyond Hasse's bound": (trace_beyond_hasse, ("frobenius hint trace",)),
    "count not above 4 sqrt(p)": (count_too_small, ("frobenius hint trace",)),
    "point off the curve": (point_off_the_curve, ("frobenius hint point",)),
    "coordinate not a residue": (point_not_reduced, ("frobenius hint point",)),
    "point of a smaller order": (point_of_smaller_order, ("frobenius hint order",)),
    "hint at a bad prime": (hint_at_a_bad_prime, ("frobenius hint prime",)),
    "hint beyond the truncation": (hint_beyond_the_truncation, ("frobenius hint prime",)),
    "one prime twice": (hint_twice, ("frobenius hint prime",)),
}


@pytest.mark.parametrize("name", sorted(HINT_FORGERIES))
def test_forged_hints_are_refused_by_their_check(name):
    """Each step of the hint argument (lseries module docstring: Hasse's bound, Lagrange, N > 4√p) attacked
    alone, at the first and the last hint, is refused by the check named for it."""
    forge, checks = HINT_FORGERIES[name]
    for which in (0, -1):
        cert, hints = hinted_pool_certificate()
        forge(cert, hints[which])
        assert rejection(cert).check in checks, (name, which)


def test_every_false_trace_within_hasse_is_refused():
    """At each hinted prime, every trace t' ≠ a_p with t'² ≤ 4p, with the genuine point or its multiples
    (the only points an attacker can offer of an order dividing #Ẽ(F_p)), is refused."""
    cert, hints = hinted_pool_certificate()
    for index in range(min(len(hints), 4)):
        hint = hints[index]
        p, true_trace = int(hint["prime"]), int(hint["trace"])
        for trace in range(-int((4 * p) ** 0.5), int((4 * p) ** 0.5) + 1):
            if trace == true_trace:
                continue
            for k in (1, 2, 3):
                copied = copy.deepcopy(cert)
                target = copied["evidence"]["analytic"]["frobenius_hints"][index]
                target["trace"] = str(trace)
                target["point"] = point_multiple(cert, hint, k) or hint["point"]
                assert rejection(copied).check.startswith("frobenius hint"), (p, trace, k)


CERTIFIER_CURVE = (0, 0, 1, 10, -1152)
"""Conductor 4,007,861 (cypari2 ellglobalred), analytic rank 1 (cypari2 ellanalyticrank): the certifier's
witness needs M = 10,754 > 9,318, beyond what point counts alone may reach, and carries Frobenius hints."""


def test_hinted_witness_beyond_the_counted_truncation_is_accepted_in_a_rank_certificate():
    from certify.analytic import analytic_witness
    assert int(pari.ellanalyticrank(pari.ellinit(list(CERTIFIER_CURVE)))[0]) == 1
    entry = analytic_witness(fractions(CERTIFIER_CURVE))
    assert entry is not None and int(entry["truncation"]) > largest_counted_truncation()
    cert = forged(CERTIFIER_CURVE, 1, 32, Fraction(6, 5))
    cert["evidence"]["analytic"] = entry
    verify(cert)
