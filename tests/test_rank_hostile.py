"""Hostile rank certificates: mutations of genuine ones (tests/rank_mutations.py) and forged evidence for false
claims, each either rejected by the verifier with its ``Rejection`` or, if accepted, true — its bounds contain
the rank (Cremona's tables, or cypari2's ``ellrank`` as reference library) and its Selmer dimensions are those
of the genuine certificate with the same descent model. The verifier's schema step must agree with the
reference library jsonschema on every mutant (tests/schema_reference.py), and both entry points must answer a
directory of mutants without a traceback (tests/hostile_run.py).

The forged evidence follows the argument of certify/verifier/descent.py step by step: each step that a false
upper bound would have to get past is attacked on its own — a place outside T, a disc cover with a gap or an
overlap, a disc whose leaf test fails, an element of W excluded at infinity, a witness that is not one, a
composite "prime" of b — and each must be refused by the check named for it. The long run (-m table) takes
10,000 mutants.
"""
from __future__ import annotations

import copy
import json
from fractions import Fraction

import pytest

import rank_mutations as rm
from certify.verifier import verify
from certify.verifier.curves import add, multiple, negate
from certify.verifier.descent import element_vector, echelon, image_vector, reduce_vector
from certify.verifier.errors import Rejection
from hostile_run import ENTRY_POINTS, assert_answered, run
from rank_reference import ellrank_bounds, independent, pari, pari_curve, two_torsion_points
from schema_reference import schema_violations as reference_violations
from certify.verifier.schema import schema_violations

CI_MUTANTS = 600
LONG_MUTANTS = 10_000


def rejected(cert: dict) -> Rejection:
    """The verifier's rejection of a certificate that must not pass."""
    with pytest.raises(Rejection) as caught:
        verify(cert)
    return caught.value


def pool_certificate(predicate) -> tuple:
    """(a fresh copy of the first pool certificate satisfying the predicate, its rank)."""
    for index, (cert, rank) in enumerate(rm.pool()):
        if predicate(cert, rank):
            return rm.fresh(index), rank
    raise AssertionError("no pool certificate of that kind")


# --- the pool ---------------------------------------------------------------------------------------------

def test_pool_is_genuine_and_covers_the_evidence_kinds():
    """Every pool certificate is accepted and true (Cremona's tables; cypari2 ellrank), its points
    independent (cypari2 ellheightmatrix), and together they use every kind of evidence of the format."""
    kinds = set()
    for cert, rank in rm.pool():
        verify(cert)
        lower, upper = int(cert["claim"]["rank_lower"]), cert["claim"]["rank_upper"]
        assert lower <= rank and (upper is None or rank <= int(upper))
        assert independent(cert["curve"], cert["claim"]["points"])
        kinds |= set(rm.features(cert))
    assert kinds >= {"at 2", "at an odd prime", "at infinity", "deep discs", "generators", "no descent", "rank 0",
                     "rank 1", "rank 2"}


# --- mutations --------------------------------------------------------------------------------------------

def check_mutant(seed: int) -> "Rejection | None":
    """One mutant: sound (rm.assert_sound), and the schema steps agree."""
    _, cert, names = rm.mutant(seed)
    outcome = rm.assert_sound(cert)
    assert bool(schema_violations(cert)) == bool(reference_violations(cert)), (seed, names)
    return outcome


def test_mutants_are_rejected_or_true():
    """CI_MUTANTS mutants of the pool: never accepted with a false claim, never a crash; most are rejected,
    and by many different checks (the mutations reach every part of the argument)."""
    checks, accepted = set(), 0
    for seed in range(CI_MUTANTS):
        outcome = check_mutant(seed)
        if outcome is None:
            accepted += 1
        else:
            checks.add(outcome.check)
    assert accepted < CI_MUTANTS // 2
    assert {"cosets", "disc cover", "leaf test", "independence", "lower bound", "factorisation",
            "point on curve"} <= checks, checks


@pytest.mark.table
def test_mutants_long_run():
    for seed in range(CI_MUTANTS, CI_MUTANTS + LONG_MUTANTS):
        check_mutant(seed)


def test_both_entry_points_answer_a_directory_of_mutants(tmp_path):
    """200 mutants as files of one directory: each entry point gives one verdict per file, no traceback,
    and the same verdicts as the verifier in this process."""
    expected = {}
    for seed in range(200):
        _, cert, _ = rm.mutant(seed)
        name = f"mutant-{seed:03d}.json"
        (tmp_path / name).write_text(json.dumps(cert))
        try:
            verify(cert)
            expected[name] = True
        except Rejection:
            expected[name] = False
    for entry in ENTRY_POINTS:
        verdicts = assert_answered(run(entry, "--jsonl", str(tmp_path)), certificates=200, jsonl=True)
        assert {v["file"].rsplit("/", 1)[-1]: v["accepted"] for v in verdicts} == expected, entry


# --- false lower bounds -------------------------------------------------------------------------------------

def with_points(cert: dict, points: list) -> dict:
    """The certificate claiming the given points (strings), rank_lower their number, the upper bound raised
    to match when it would fall below."""
    cert["claim"]["points"] = [[str(v) for v in P] for P in points]
    cert["claim"]["rank_lower"] = str(len(points))
    if cert["claim"]["rank_upper"] is not None and int(cert["claim"]["rank_upper"]) < len(points):
        cert["claim"]["rank_upper"] = str(len(points))
    return cert


def points_of(cert: dict) -> tuple:
    a = tuple(Fraction(c) for c in cert["curve"])
    return a, [tuple(Fraction(v) for v in P) for P in cert["claim"]["points"]]


def dependent_multiple(cert):
    a, points = points_of(cert)
    return points + [multiple(a, 2, points[0])]


def dependent_negative(cert):
    a, points = points_of(cert)
    return points + [negate(a, points[0])]


def dependent_sum_with_torsion(cert):
    a, points = points_of(cert)
    return points + [add(a, points[0], tuple(two_torsion_points(a)[0]))]


def torsion_point(cert):
    a, points = points_of(cert)
    return points + [tuple(two_torsion_points(a)[0])]


def dependent_combination(cert):
    a, points = points_of(cert)
    return points + [add(a, multiple(a, 3, points[0]), multiple(a, 5, points[1]))]


FALSE_LOWER_BOUNDS = {
    "P and 2P": (dependent_multiple, lambda c, r: r == 1 and c["evidence"]["descent"] is not None),
    "P and -P": (dependent_negative, lambda c, r: r >= 1),
    "P and P + T, T of order 2": (dependent_sum_with_torsion, lambda c, r: r == 1 and c["evidence"]["descent"]),
    "a point of order 2": (torsion_point, lambda c, r: r == 1 and c["evidence"]["descent"]),
    "P1, P2 and 3P1 + 5P2": (dependent_combination, lambda c, r: r == 2),
}


@pytest.mark.parametrize("name", FALSE_LOWER_BOUNDS)
def test_dependent_points_are_refused(name):
    """rank_lower one above the rank (Cremona's tables), by a point dependent on the others modulo torsion:
    refused by the independence check, whatever the characters' primes."""
    build, kind = FALSE_LOWER_BOUNDS[name]
    cert, rank = pool_certificate(kind)
    cert = with_points(cert, build(cert))
    assert int(cert["claim"]["rank_lower"]) > rank
    assert rejected(cert).check == "independence"


def test_point_of_another_curve_is_refused():
    """A point of the 2-isogenous curve Ē (from the descent side on Ē) claimed on the input curve."""
    other_side = "phi" if rm.side_on_e() == "phi_dual" else "phi_dual"

    def foreign_points(cert):
        descent = cert["evidence"]["descent"]
        return [P for P in descent[other_side]["points"] if P != ["0", "0"]] if descent else []
    cert, _ = pool_certificate(lambda c, r: foreign_points(c))
    a, points = points_of(cert)
    cert = with_points(cert, points + [tuple(Fraction(v) for v in foreign_points(cert)[0])])
    assert rejected(cert).check == "point on curve"


def test_ell_dividing_the_torsion_order_is_refused():
    """ℓ = 2 on a curve with a point of order 2: every count is even (torsion injects), so no torsion prime
    shows 2 ∤ #E(Q)_tors."""
    cert, _ = pool_certificate(lambda c, r: r >= 1 and c["evidence"]["descent"])
    cert["evidence"]["independence"]["ell"] = "2"
    assert rejected(cert).check in ("torsion prime", "character prime")


@pytest.mark.parametrize("field, value, check", [
    ("ell", "9", "character prime"), ("ell", "101", "character prime"), ("ell", "1", "character prime"),
    ("torsion_prime", "2", "character prime"), ("torsion_prime", "15", "character prime"),
])
def test_independence_numbers_out_of_range(field, value, check):
    cert, _ = pool_certificate(lambda c, r: r >= 1)
    cert["evidence"]["independence"][field] = value
    assert rejected(cert).check == check


def test_character_prime_of_bad_reduction_is_refused():
    def odd_bad_primes(cert):
        model = [int(c) for c in cert["evidence"]["integral_model"]["curve"]]
        delta = int(pari.ellinit(model).disc())
        return [q for q in range(3, 1000, 2) if delta % q == 0 and pari.isprime(q)]
    cert, _ = pool_certificate(lambda c, r: r >= 1 and odd_bad_primes(c))
    bad = odd_bad_primes(cert)[0]
    cert["evidence"]["independence"]["character_primes"] = sorted(
        set(cert["evidence"]["independence"]["character_primes"]) | {str(bad)}, key=int)
    assert rejected(cert).check == "character prime"


# --- false upper bounds: forged exclusions ---------------------------------------------------------------------

def side_data(cert: dict, side: str) -> tuple:
    """(A, B, primes of B, vectors spanning W) for one side of the certificate's descent."""
    descent = cert["evidence"]["descent"]
    A, B, key = rm.side_curve(cert, side)
    primes = [int(f["prime"]) for f in descent[key]]
    vectors = [image_vector(tuple(Fraction(v) for v in P), B, primes) for P in descent[side]["points"]]
    vectors += [element_vector(int(g["d"]), primes, "") for g in descent[side]["local_generators"]]
    return A, B, primes, vectors


def element(vector: int, primes: list) -> int:
    """The squarefree integer of a vector of V (bit 0 the sign, bit i + 1 the i-th prime)."""
    d = -1 if vector & 1 else 1
    for i, p in enumerate(primes):
        if vector & (2 << i):
            d *= p
    return d


def false_upper_bound(how) -> tuple:
    """A pool certificate whose rank_upper equals the rank (Cremona's tables), made to claim one less: on a side
    with a point of W besides the trivial image, that point is dropped, W shrinks by one dimension, and the
    cosets this opens — among them the class of the dropped point, which lies in S_T — are 'excluded' by the
    forgery ``how(exclusion, places)`` (left open when ``how`` is None). Returns (certificate, rank)."""
    def kind(cert, rank):
        descent = cert["evidence"]["descent"]
        return (descent is not None and int(cert["claim"]["rank_upper"]) == rank >= 1
                and any(droppable(cert, side) is not None for side in ("phi", "phi_dual")))
    cert, rank = pool_certificate(kind)
    side = next(s for s in ("phi", "phi_dual") if droppable(cert, s) is not None)
    descent = cert["evidence"]["descent"]
    index = droppable(cert, side)
    A, B, primes, vectors = side_data(cert, side)
    dropped = vectors[index]
    descent[side]["points"].pop(index)
    _, _, _, smaller = side_data(cert, side)
    basis = echelon(smaller)
    places = sorted({2} | {int(f["prime"]) for f in descent["factorisation_b"] + descent["factorisation_b_dual"]})
    old = [element_vector(int(e["d"]), primes, "") for e in descent[side]["exclusions"]]
    new = [reduce_vector(dropped, basis)] + [reduce_vector(v ^ dropped, basis) for v in old]
    for vector in new if how is not None else ():
        exclusion = {"d": str(element(vector, primes)), "place": "2", "t_discs": [["0", "1"], ["1", "1"]],
                     "s_discs": [["0", "1"]]}
        how(exclusion, places)
        descent[side]["exclusions"].insert(0, exclusion) if vector == new[0] else descent[side]["exclusions"].append(
            exclusion)
    dimensions = cert["claim"]["selmer_dimensions"]
    dimensions[side] = str(int(dimensions[side]) - 1)
    cert["claim"]["rank_upper"] = str(rank - 1)
    if int(cert["claim"]["rank_lower"]) > rank - 1:
        cert = with_points(cert, [])
        cert["evidence"]["independence"] = None
    return cert, rank


def droppable(cert: dict, side: str):
    """The index of a listed point of the side whose removal lowers dim W by one, or None."""
    _, _, _, vectors = side_data(cert, side)
    full = len(echelon(vectors))
    for i in range(len(cert["evidence"]["descent"][side]["points"])):
        if len(echelon(vectors[:i] + vectors[i + 1:])) == full - 1:
            return i
    return None


def outside_t(exclusion, places):
    exclusion["place"] = str(next(p for p in range(3, 10 ** 4, 2) if pari.isprime(p) and p not in places))
    exclusion["t_discs"], exclusion["s_discs"] = [["0", "0"]], [["0", "1"]]


def with_gap(exclusion, places):
    exclusion["t_discs"] = [["1", "1"]]


def with_overlap(exclusion, places):
    exclusion["t_discs"] = [["0", "1"], ["1", "1"], ["1", "2"], ["3", "2"]]


def uniform_cover(exclusion, places):
    """The whole of Z_2 and 2Z_2 cut into the discs of depth 6 and 5: a genuine partition, on which the leaf
    test cannot show the quartic of an element of S_T a non-square everywhere."""
    exclusion["t_discs"] = [[str(c), "6"] for c in range(64)]
    exclusion["s_discs"] = [[str(c), "5"] for c in range(0, 32, 2)]


def at_infinity(exclusion, places):
    exclusion.pop("t_discs"), exclusion.pop("s_discs")
    exclusion["place"] = "infinity"


FORGERIES = {"a place outside T": (outside_t, ("exclusion place",)),
             "a cover with a gap": (with_gap, ("disc cover",)),
             "a cover with an overlap": (with_overlap, ("disc cover",)),
             "a partition whose leaves fail": (uniform_cover, ("leaf test",)),
             "at infinity": (at_infinity, ("exclusion at infinity",))}


@pytest.mark.parametrize("name", FORGERIES)
def test_forged_exclusions_are_refused(name):
    """rank_upper one below the rank (Cremona's tables), stated consistently (dimensions, exclusion count):
    refused by the check that the forgery meets first. The first forged exclusion is of an element of W,
    which lies in S_T, so no sound check can pass it."""
    how, checks = FORGERIES[name]
    cert, rank = false_upper_bound(how)
    assert int(cert["claim"]["rank_upper"]) < rank
    assert rejected(cert).check in checks


def test_uncovered_coset_is_refused():
    """The same false bound with no exclusion for the new cosets: the coset count is short."""
    cert, rank = false_upper_bound(None)
    assert int(cert["claim"]["rank_upper"]) < rank
    assert rejected(cert).check == "cosets"


def test_false_local_generator_is_refused():
    """An element of V outside S_T (an excluded one of a genuine certificate) as a local generator with
    made-up witnesses: some witness is not a Q_p-point, or C_d has no real point."""
    cert, _ = pool_certificate(lambda c, r: c["evidence"]["descent"] and any(
        e["place"] != "infinity" for s in ("phi", "phi_dual") for e in c["evidence"]["descent"][s]["exclusions"]))
    descent = cert["evidence"]["descent"]
    side = next(s for s in ("phi", "phi_dual") if any(e["place"] != "infinity" for e in descent[s]["exclusions"]))
    excluded = next(e for e in descent[side]["exclusions"] if e["place"] != "infinity")
    places = sorted({2} | {int(f["prime"]) for f in descent["factorisation_b"] + descent["factorisation_b_dual"]})
    for M, e in ((1, 0), (0, 1), (1, 1), (2, 1), (1, 2), (3, 5)):
        forged = copy.deepcopy(cert)
        forged["evidence"]["descent"][side]["local_generators"].append(
            {"d": excluded["d"], "membership": [{"prime": str(p), "M": str(M), "e": str(e)} for p in places]})
        assert rejected(forged).check in ("membership", "real solubility", "cosets")


def test_composite_prime_of_b_is_refused():
    """A factorisation of b that lists a product of two of its primes as one prime (so that V would lose a
    dimension): refused as not prime."""
    cert, _ = pool_certificate(lambda c, r: c["evidence"]["descent"] and sum(
        1 for f in c["evidence"]["descent"]["factorisation_b"] if f["exponent"] == "1") >= 2)
    factors = cert["evidence"]["descent"]["factorisation_b"]
    ones = [f for f in factors if f["exponent"] == "1"][:2]
    merged = {"prime": str(int(ones[0]["prime"]) * int(ones[1]["prime"])), "exponent": "1"}
    rest = [f for f in factors if f not in ones]
    cert["evidence"]["descent"]["factorisation_b"] = sorted(rest + [merged], key=lambda f: int(f["prime"]))
    assert rejected(cert).check in ("primality", "factorisation")


def test_wrong_selmer_dimensions_are_refused():
    cert, _ = pool_certificate(lambda c, r: c["evidence"]["descent"] is not None)
    dims = cert["claim"]["selmer_dimensions"]
    dims["phi"], dims["phi_dual"] = str(int(dims["phi"]) + 1), str(int(dims["phi_dual"]) - 1)
    assert rejected(cert).check == "selmer dimensions"


def test_descent_of_another_curve_is_refused():
    cert, _ = pool_certificate(lambda c, r: c["evidence"]["descent"] is not None)
    other, _ = pool_certificate(lambda c, r: c["evidence"]["descent"] is not None and c["curve"] != cert["curve"])
    cert["evidence"]["descent"] = other["evidence"]["descent"]
    assert rejected(cert).check == "descent model"


# --- the meaning of the claim's Selmer dimensions ----------------------------------------------------------------

def test_selmer_dimension_labels_follow_silverman():
    """Silverman, *The Arithmetic of Elliptic Curves*, X.4.9: for φ: E → E' with E: y² = x³ + a x² + b x, the
    φ-Selmer group S^(φ)(E/Q) contains δ(E'(Q)), δ(x, y) = x mod squares on E' (d | a² − 4b); the dual's
    contains the x-coordinates of E(Q) mod squares (d | b). So dim Sel^φ̂(E') is at least the dimension of
    the span of α(E(Q)), which is computed here from cypari2's generators and 2-torsion of y² = x³ − 25x
    (rank 1, the 2-torsion full) on the descent's model: dimension 2."""
    cert, _ = pool_certificate(lambda c, r: c["curve"] == ["0", "0", "0", "-25", "0"])
    descent = cert["evidence"]["descent"]
    A, B = int(descent["a"]), int(descent["b"])
    E = pari.ellinit([0, A, 0, B, 0])
    generators = [tuple(Fraction(str(v)) for v in P) for P in pari.ellrank(E)[3]]   # [r, R, s, points]
    torsion = [tuple(Fraction(str(v)) for v in P) for P in pari.elltors(E)[2]]
    primes = [int(f["prime"]) for f in descent["factorisation_b"]]
    span = len(echelon([image_vector(P, B, primes) for P in generators + torsion]))
    assert span == 2
    assert int(cert["claim"]["selmer_dimensions"]["phi_dual"]) >= span, "phi_dual is below dim alpha(E(Q))"
