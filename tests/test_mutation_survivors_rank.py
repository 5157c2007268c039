"""Tests written for the mutants of certify/verifier/rank.py and certify/verifier/descent.py that survived the
mutation run (issue 15; ``tests/mutation_run.py``, ``python bench/bench_mutation.py rank.py descent.py``). Each
test names the mutants it kills.

As in tests/test_mutation_survivors.py, two kinds of test. Where a weakened check would accept a false claim,
the test builds that certificate by editing a genuine one (tests/rank_mutations.py) and shows the claim false
by a reference: the ranks of Cremona's tables (the fixture from Debian pari-elldata), cypari2's ``ellrank``,
``elltors`` and ``ellcard``, and for Selmer dimensions the descent bound rank + dim Sha(E')[2] that
tests/rank_reference.py derives from cypari2's ``ell2cover`` (Silverman, *The Arithmetic of Elliptic Curves*,
X.4.2). Where the weakened check would only let a malformed or over-limit certificate through to a later check,
the test holds the verifier to its documented rule: a certificate exactly at a limit passes it (and is accepted,
or refused by the next check), one past it is refused by the check that names the limit, and raising the limit
by monkeypatching shows that the limit alone refused it.
"""
from __future__ import annotations

import copy
import json
from fractions import Fraction
from pathlib import Path

import pytest

import rank_mutations as rm
from certify.verifier import descent as descent_module
from certify.verifier import limits, rank, verify
from certify.verifier.descent import echelon, element_vector, reduce_vector
from certify.verifier.errors import Rejection
from certify.verifier.theorems import entries
from rank_reference import descent_bounds, ellrank_bounds, pari, pari_curve, two_torsion_points
from test_rank_hostile import side_data

CONGRUENT_FIVE = ["0", "0", "0", "-25", "0"]
"""y² = x³ − 25x, the congruent-number curve of 5: rank 1 (cypari2 ellrank), generator (−4, −6) in its
certificate, bad primes 2 and 5 only (cypari2: discriminant 2^6·5^6)."""


def pool_certificate(curve: list) -> tuple:
    """(a fresh copy of the pool's certificate of the input curve, its rank from Cremona's tables)."""
    for index, (cert, rank_of_curve) in enumerate(rm.pool()):
        if cert["curve"] == curve:
            return rm.fresh(index), rank_of_curve
    raise AssertionError(f"no pool certificate of {curve}")


def rejection(cert) -> Rejection:
    with pytest.raises(Rejection) as caught:
        verify(cert)
    return caught.value


def points_only(cert: dict, points: list, ell: int, torsion_prime: int, character_primes: list) -> dict:
    """The certificate reduced to a lower bound: the given points (Fractions) with the given independence
    evidence, no descent and no analytic witness, so rank_upper and the Selmer dimensions are null."""
    cert["claim"] = {"rank_lower": str(len(points)), "rank_upper": None,
                     "points": [[str(v) for v in P] for P in points], "selmer_dimensions": None}
    cert["evidence"].update(independence={"ell": str(ell), "torsion_prime": str(torsion_prime),
                                          "character_primes": [str(q) for q in character_primes]},
                            descent=None, analytic=None)
    cert["relies_on"] = entries(rank.RELIES_ON_POINTS)
    return cert


def point_count(curve: list, q: int) -> int:
    """#Ẽ(F_q), by cypari2's ellcard (reference library)."""
    return int(pari.ellcard(pari_curve(curve), q))


# --- rank.py: the shape of the claim and evidence ---

def test_points_without_independence_evidence_are_refused_by_that_rule():
    """Kills the deleted raise for ``points and independence is None``: without it the missing evidence is only
    noticed when its first field is read, and the rejection no longer says what is missing."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    cert["evidence"]["independence"] = None
    failure = rejection(cert)
    assert (failure.check, failure.message) == (
        "structure", "evidence.independence is needed when the claim lists points")


def test_independence_evidence_without_points_is_refused():
    """Kills the deleted raise for ``independence is not None and not points``: the independence evidence of
    y² = x³ − 25x put into the certificate of y² = x³ − 4x − 3 (rank 0 in Cremona's tables), which lists no
    point, is evidence for nothing and must be null (the schema's description of evidence.independence)."""
    donor, _ = pool_certificate(CONGRUENT_FIVE)
    cert, rank_of_curve = pool_certificate(["0", "0", "0", "-4", "-3"])
    assert rank_of_curve == 0 and not cert["claim"]["points"]
    cert["evidence"]["independence"] = donor["evidence"]["independence"]
    failure = rejection(cert)
    assert (failure.check, failure.message) == (
        "structure", "evidence.independence must be null when the claim lists no points")


def test_selmer_dimensions_without_a_descent_are_refused():
    """Kills the deleted raise for ``selmer is not None`` without a descent: y² + y = x³ − x² − 10x − 20 has no
    rational point of order 2 (cypari2 elldivpol), so no 2-isogeny and no Selmer groups of one; a claim of
    their dimensions with no descent to prove them is refused."""
    cert, _ = pool_certificate(["0", "-1", "1", "-10", "-20"])
    assert cert["evidence"]["descent"] is None and not two_torsion_points(cert["curve"])
    cert["claim"]["selmer_dimensions"] = {"phi": "1", "phi_dual": "1"}
    assert rejection(cert).check == "selmer dimensions"


def test_more_than_max_rank_points_are_refused_by_the_list_limit():
    """Kills the deleted raise of read_points: MAX_RANK_POINTS + 1 copies of the generator of y² = x³ − 25x
    (rank 1, cypari2 ellrank) are refused by the list limit, before any is reduced at a character prime."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    cert["claim"]["points"] *= limits.MAX_RANK_POINTS + 1
    cert["claim"]["rank_lower"] = str(limits.MAX_RANK_POINTS + 1)
    failure = rejection(cert)
    assert failure.check == "list size" and failure.values["points"] == limits.MAX_RANK_POINTS + 1


def test_a_non_integral_model_is_refused():
    """Kills the deleted raise of read_integral_model: the rational curve y² + xy/2 + y/4 = x³ + x² − 105x/16
    − 247/16 offered as its own 'integral model' (the identity change) is refused, instead of being truncated to
    integers for the characters."""
    cert, _ = pool_certificate(["1/2", "1", "1/4", "-105/16", "-247/16"])
    cert["evidence"]["integral_model"] = {"change": ["1", "0", "0", "0"], "curve": list(cert["curve"])}
    assert rejection(cert).check == "integral model"


def test_every_character_value_is_the_discrete_logarithm_paris_group_law_gives():
    """characters without its former 'cannot happen' raise (removed as dead code: for ℓ ∥ #Ẽ(F_q) the
    images (#Ẽ/ℓ)·P̃ lie in Ẽ(F_q)[ℓ], cyclic of order ℓ, so each is a multiple of the first non-zero one).
    On y² = x³ + 5x² − 12x with the two points of its demo rank certificate, ℓ = 3 and the first 12 primes q with
    3 ∥ #Ẽ(F_q): every image has a value χ, and χ·G = image in cypari2's group law on Ẽ over F_q
    (ellinit over Mod(1, q), ellmul: the reference library), G the first non-zero image."""
    curve, ell = ["0", "5", "0", "-12", "0"], 3
    cert = json.loads((Path(__file__).parent.parent / "certificates-demo" / "appendix-curve-8.rank.json").read_text())
    assert cert["curve"] == curve
    model = tuple(Fraction(c) for c in curve)
    points = [tuple(Fraction(c) for c in point) for point in cert["claim"]["points"]]
    assert len(points) == 2
    for q in good_primes(curve, 12, ell):
        count = point_count(curve, q)
        values = rank.characters(model, points, ell, q, count)
        reduced = pari.ellinit([int(c) for c in curve], q)
        images = [pari.ellmul(reduced, [pari.Mod(int(x.numerator) * pow(x.denominator, -1, q), q),
                                        pari.Mod(int(y.numerator) * pow(y.denominator, -1, q), q)], count // ell)
                  for x, y in points]
        generator = next((image for image in images if image != [0]), None)
        for image, value in zip(images, values):
            assert 0 <= value < ell
            assert (image == [0]) if generator is None else pari.ellmul(reduced, generator, value) == image


# --- rank.py: the limits of check_sizes and check_character_primes ---

def good_primes(curve: list, count: int, ell: int) -> list:
    """The first ``count`` odd primes q of good reduction with ℓ ∥ #Ẽ(F_q) (cypari2 ellcard and disc)."""
    delta, found, q = int(pari_curve(curve).disc()), [], 3
    while len(found) < count:
        if pari.isprime(q) and delta % q:
            n = point_count(curve, q)
            if n % ell == 0 and n % (ell * ell):
                found.append(q)
        q += 2
    return found


def primes_summing_to(total: int, delta: int) -> list:
    """Increasing primes q < MAX_HINT_PRIME of good reduction (q ∤ delta), at most MAX_PRIMES of them, whose
    sum is exactly ``total``: the largest primes while the rest leaves room for two smaller ones, then 3 if the
    rest is odd, then two primes making up the rest (cypari2 isprime)."""
    def usable(q):
        return q > 2 and delta % q and bool(pari.isprime(q))
    chosen, q = [], limits.MAX_HINT_PRIME - 1
    while total - sum(chosen) >= 2 * q - 10_000:
        if usable(q):
            chosen.append(q)
        q -= 1
    if (total - sum(chosen)) % 2:
        assert usable(3)
        chosen.append(3)
    rest = total - sum(chosen)
    first = next(f for f in range(5, rest // 2) if usable(f) and usable(rest - f) and rest - f < q)
    found = sorted(chosen + [first, rest - first])
    assert len(found) <= limits.MAX_PRIMES and sum(found) == total and len(set(found)) == len(found)
    return found


def with_torsion_prime_dividing(cert: dict) -> int:
    """The torsion prime of y² = x³ − 25x changed to 37, where 3 divides #Ẽ(F_37) = 36 (cypari2 ellcard): the
    first check after the limits then refuses the certificate at the cost of one point count. Returns 37."""
    assert point_count(cert["curve"], 37) % int(cert["evidence"]["independence"]["ell"]) == 0
    cert["evidence"]["independence"]["torsion_prime"] = "37"
    return 37


@pytest.mark.parametrize("excess", [0, 1])
def test_point_counts_at_and_over_max_work(excess):
    """Kills ``counts > MAX_WORK -> counts >= MAX_WORK`` and the deleted raise after it: character primes whose
    sum with the torsion prime is exactly MAX_WORK pass the limit (and the certificate is refused by the
    torsion-prime check that comes next); MAX_WORK + 1 is refused by the work limit before any count."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    p = with_torsion_prime_dividing(cert)
    primes = primes_summing_to(limits.MAX_WORK + excess - p, int(pari_curve(cert["curve"]).disc()))
    cert["evidence"]["independence"]["character_primes"] = [str(q) for q in primes]
    failure = rejection(cert)
    if excess:
        assert failure.check == "work" and failure.values["work"] == limits.MAX_WORK + 1
    else:
        assert failure.check == "torsion prime"


def primality_units(digits: int, factors: int) -> int:
    """The charge of a Pocklington certificate for an n of ``digits`` digits listing ``factors`` factors of
    n − 1, as limits.MAX_PRIMALITY_WORK documents it: factors × (⌈(digits/100)³⌉ + 1)."""
    return factors * (-(-digits ** 3 // 10 ** 6) + 1)


@pytest.mark.parametrize("excess", [0, 1])
def test_pocklington_work_at_and_over_max_primality_work(excess):
    """Kills ``primality > MAX_PRIMALITY_WORK -> >=`` and the deleted raise after it: Pocklington certificates
    charged exactly MAX_PRIMALITY_WORK pass the limit (the certificate is then refused by the torsion-prime
    check that comes next, before any of them is read); one unit more is refused by the primality limit.
    The certificates are weighed by their sizes alone (a one-digit n costs 2 units per factor, a 110-digit
    one 3), so they need not be genuine to be refused."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    with_torsion_prime_dividing(cert)
    assert cert["evidence"]["descent"]["pocklington"] == []
    factor = {"factor": "2", "base": "3"}
    small = (limits.MAX_PRIMALITY_WORK + excess - primality_units(110, excess)) // primality_units(1, 1)
    listed = [{"prime": "7", "factors": [factor] * small}]
    if excess:
        listed.append({"prime": "1" * 110, "factors": [factor]})
    assert sum(primality_units(len(e["prime"]), len(e["factors"])) for e in listed) == \
        limits.MAX_PRIMALITY_WORK + excess
    cert["evidence"]["descent"]["pocklington"] = listed
    failure = rejection(cert)
    assert failure.check == ("primality limit" if excess else "torsion prime")


def with_ell(cert: dict, ell: int) -> dict:
    """The independence evidence of y² = x³ − 25x redone for the prime ℓ: the torsion prime 3 (#Ẽ(F_3) = 4, which
    ℓ does not divide) and the least odd good prime q with ℓ ∥ #Ẽ(F_q) at which the character of the generator
    is not zero (cypari2 ellcard and ellmul)."""
    E = pari_curve(cert["curve"])
    generator = [pari(v) for v in cert["claim"]["points"][0]]
    for q in good_primes(cert["curve"], 40, ell):
        if pari.ellmul(pari.ellinit(E, q), generator, point_count(cert["curve"], q) // ell) != [0]:
            break
    assert point_count(cert["curve"], 3) % ell
    cert["evidence"]["independence"] = {"ell": str(ell), "torsion_prime": "3", "character_primes": [str(q)]}
    return cert


def test_ell_at_max_character_ell_is_accepted():
    """Kills ``ell <= MAX_CHARACTER_ELL -> ell < MAX_CHARACTER_ELL``: characters for ℓ = 97 are allowed; the
    certificate of y² = x³ − 25x redone with them is accepted (its rank 1 is cypari2's)."""
    assert limits.MAX_CHARACTER_ELL == 97 and pari.isprime(97)
    cert, rank_of_curve = pool_certificate(CONGRUENT_FIVE)
    verify(with_ell(cert, 97))
    assert ellrank_bounds(cert["curve"]) == (rank_of_curve, rank_of_curve) == (1, 1)


def test_a_prime_ell_over_max_character_ell_is_refused_by_the_limit(monkeypatch):
    """Kills ``2 <= ell <= MAX_CHARACTER_ELL -> True``: the prime ℓ = 101 passes the primality half of the test
    but not the limit; the certificate is otherwise genuine, as it is accepted once the limit is raised to 101."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    cert = with_ell(cert, 101)
    failure = rejection(cert)
    assert failure.check == "character prime" and failure.values == {"ell": 101}
    monkeypatch.setattr(rank, "MAX_CHARACTER_ELL", 101)
    verify(cert)


def test_max_primes_character_primes_are_accepted_and_one_more_refused():
    """Kills ``len(primes) > MAX_PRIMES -> >=`` and the deleted raise after it: the certificate of y² = x³ − 25x
    with MAX_PRIMES character primes (odd good primes q with 3 ∥ #Ẽ(F_q), cypari2 ellcard) is accepted; with
    one more it is refused by the list limit."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    primes = good_primes(cert["curve"], limits.MAX_PRIMES + 1, 3)
    cert["evidence"]["independence"]["character_primes"] = [str(q) for q in primes[:-1]]
    verify(cert)
    cert["evidence"]["independence"]["character_primes"].append(str(primes[-1]))
    failure = rejection(cert)
    assert failure.check == "list size" and failure.values["primes"] == limits.MAX_PRIMES + 1


def test_a_character_prime_listed_twice_is_refused():
    """Kills ``q <= previous -> q < previous``, ``primes[1:] -> primes[2:]`` and the deleted raise: the
    character primes must increase strictly, and [11, 11] does not (the same character counted twice)."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    cert["evidence"]["independence"]["character_primes"] = ["11", "11"]
    failure = rejection(cert)
    assert (failure.check, failure.message) == ("character prime", "the character primes must increase strictly")


# --- rank.py: the characters ---

def test_a_torsion_point_is_not_proven_independent_by_a_prime_of_bad_reduction():
    """Kills the deleted raise for a prime of bad reduction in check_character_primes, by a false claim it would
    accept. y² = x³ − 4x − 3 has rank 0 (Cremona's tables; cypari2 ellrank) and the point T = (−1, 0) of order 2
    (cypari2 elltors). Claimed as a point of infinite order with ℓ = 2: at q = 7, of good reduction, 2 ∥ #Ẽ(F_7)
    and the character of T is not zero; the torsion prime 13 divides the discriminant, and the reduction there is
    not a group into which the torsion injects, its point count (of the singular cubic, 15) odd. Only the
    good-reduction rule refuses this rank_lower of 1."""
    cert, rank_of_curve = pool_certificate(["0", "0", "0", "-4", "-3"])
    E = pari_curve(cert["curve"])
    assert rank_of_curve == 0 and ellrank_bounds(cert["curve"]) == (0, 0)
    assert [int(v) for v in pari.elltors(E)[2][0]] == [-1, 0] and int(pari.elltors(E)[0]) == 2
    assert int(E.disc()) % 13 == 0 and int(E.disc()) % 7 and point_count(cert["curve"], 7) % 4 == 2
    cert = points_only(cert, [(-1, 0)], 2, 13, [7])
    failure = rejection(cert)
    assert failure.check == "character prime" and failure.values == {"q": 13}


def test_a_point_and_its_negative_are_not_proven_independent_when_ell_does_not_divide_the_count():
    """Kills ``count % ell -> False`` in characters and the deleted raise after it, by a false claim they would
    accept: P = (−4, −6) and −P on y² = x³ − 25x (rank 1, cypari2 ellrank) claimed independent with ℓ = 97 and
    the primes 97 and 101, where 97 does not divide #Ẽ(F_q) (116 and 104, cypari2 ellcard). There (#Ẽ/97)·P̃ = P̃
    has order 29 and 26, below ℓ, so the stepping finds −P̃ at 28 and 25 multiples of P̃ and the 'characters'
    (1, 1) and (28, 25) have rank 2 over F_97; only the rule ℓ | #Ẽ(F_q), which makes the character a
    homomorphism to Z/ℓ, refuses them."""
    cert, rank_of_curve = pool_certificate(CONGRUENT_FIVE)
    assert ellrank_bounds(cert["curve"]) == (1, 1) == (rank_of_curve, rank_of_curve)
    assert [point_count(cert["curve"], q) % 97 for q in (97, 101)] == [116 - 97, 104 - 97]
    P = tuple(Fraction(v) for v in cert["claim"]["points"][0])
    cert = points_only(cert, [P, (P[0], -P[1])], 97, 3, [97, 101])
    failure = rejection(cert)
    assert (failure.check, failure.message) == (
        "character prime", "ell does not divide the number of points modulo q exactly once")
    assert failure.values["q"] == 97


def test_a_character_prime_whose_count_ell_squared_divides_is_refused():
    """Kills ``count % (ell * ell) == 0 -> False`` and its constant ``0 -> 1`` in characters: the characters are
    taken at primes q with ℓ ∥ #Ẽ(F_q) (the module's docstring), and at q = 37 on y² = x³ − 25x the count is
    36 = 4·9 (cypari2 ellcard), so ℓ = 3 divides it twice."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    assert point_count(cert["curve"], 37) == 36
    cert["evidence"]["independence"]["character_primes"] = ["37"]
    failure = rejection(cert)
    assert (failure.check, failure.values) == ("character prime", {"ell": 3, "q": 37, "count": 36})


# --- descent.py: the sizes of a descent ---

@pytest.mark.parametrize("count", [limits.MAX_DESCENT_PRIMES, limits.MAX_DESCENT_PRIMES + 1])
def test_a_factorisation_of_b_at_and_over_max_descent_primes(count):
    """Kills ``len(primes) > MAX_DESCENT_PRIMES -> >=`` and the deleted raise after it: the factorisation of b
    in the descent of y² = x³ − 25x replaced by the first ``count`` primes (cypari2 primes); MAX_DESCENT_PRIMES of
    them pass the limit and are refused as not the factorisation of b = 50, one more is refused by the limit."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    cert["evidence"]["descent"]["factorisation_b"] = [{"prime": str(p), "exponent": "1"}
                                                      for p in pari.primes(count)]
    failure = rejection(cert)
    if count > limits.MAX_DESCENT_PRIMES:
        assert failure.check == "descent size" and failure.values["primes"] == count
    else:
        assert failure.check == "factorisation"


def test_max_descent_generators_points_on_a_side_are_accepted():
    """Kills ``len(...) > most -> >=`` in check_descent_size: a side of the descent of y² = x³ − 25x listing
    MAX_DESCENT_GENERATORS points (its points, then (0, 0) repeated: the same W) is within the limit, and the
    certificate, whose claim is cypari2's rank 1, is accepted."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    points = cert["evidence"]["descent"][rm.side_on_e()]["points"]
    points += [["0", "0"]] * (limits.MAX_DESCENT_GENERATORS - len(points))
    verify(cert)


def disc_count(descent: dict) -> int:
    return sum(len(exclusion.get(key, [])) for side in ("phi", "phi_dual") for exclusion in descent[side]["exclusions"]
               if exclusion["place"] != "infinity" for key in ("t_discs", "s_discs"))


@pytest.mark.parametrize("excess", [0, 1])
def test_disc_covers_at_and_over_max_discs(excess):
    """Kills ``discs > MAX_DISCS -> >=`` and the deleted raise after it: an exclusion with d = 0 put first on a
    side, its covers bringing the discs of the certificate to exactly MAX_DISCS, passes the limit and is refused
    by the element check before any of its discs is read; with one disc more, the limit refuses the file."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    descent = cert["evidence"]["descent"]
    room = limits.MAX_DISCS + excess - disc_count(descent)
    t_discs = min(room, limits.MAX_LIST_LENGTH)
    descent["phi"]["exclusions"].insert(0, {"d": "0", "place": "2", "t_discs": [["0", "0"]] * t_discs,
                                            "s_discs": [["0", "1"]] * (room - t_discs)})
    assert disc_count(descent) == limits.MAX_DISCS + excess
    failure = rejection(cert)
    assert failure.check == ("descent size" if excess else "descent element")


# --- descent.py: elements of V and cosets ---

def test_d_zero_is_refused_as_zero():
    """Kills the deleted raise for ``d == 0`` in element_vector: 0 is no element of Q*/Q*², and the rejection
    says so (without the check, 0 is 'divisible' by every prime of b and refused only as not squarefree)."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    cert["evidence"]["descent"][rm.side_on_e()]["exclusions"][0]["d"] = "0"
    failure = rejection(cert)
    assert failure.check == "descent element" and failure.message.endswith(
        "d must be a non-zero squarefree product of primes of b")


@pytest.mark.parametrize("primes", [[2], [2, 5], [3, 7, 11], [2, 3, 5, 7]])
def test_elements_of_v_are_exactly_the_squarefree_signed_products_of_the_primes(primes):
    """element_vector without its former test ``p² | d`` (removed as dead code: the primes of a
    factorisation are distinct, so a square factor leaves a prime in what is divided out): for every
    d ≠ 0 with |d| ≤ 2,000, it accepts exactly the d = ±∏ of distinct listed primes, by sympy's factorint
    (the reference library), and then gives the vector of the sign and those primes."""
    import sympy

    for d in range(-2000, 2001):
        if d == 0:
            continue
        factors = sympy.factorint(abs(d))
        member = all(e == 1 and p in primes for p, e in factors.items())
        if member:
            expected = (1 if d < 0 else 0) | sum(2 << i for i, p in enumerate(primes) if p in factors)
            assert element_vector(d, primes, "d") == expected
        else:
            with pytest.raises(Rejection) as caught:
                element_vector(d, primes, "d")
            assert caught.value.check == "descent element"


def test_an_element_with_a_prime_outside_b_is_refused():
    """Kills ``rest != 1 -> False`` in element_vector and the deleted raise: on the side of y² = x³ − 15x² + 50x
    (the descent model of y² = x³ − 25x), −1 is excluded at infinity; −3 = −1·3 is not in V = ⟨−1, 2, 5⟩
    (3 ∤ 50), though it has the same sign, so an exclusion 'of −3' at infinity would pass for one of −1."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    exclusion = cert["evidence"]["descent"][rm.side_on_e()]["exclusions"][0]
    assert exclusion == {"d": "-1", "place": "infinity"}
    exclusion["d"] = "-3"
    failure = rejection(cert)
    assert failure.check == "descent element" and failure.values == {"d": -3}


def test_two_exclusions_in_one_coset_are_refused():
    """Kills the deleted raise for an exclusion in the coset of an earlier one in check_cosets: the excluded
    elements are one in each non-zero coset of V/W (the module's docstring), and an exclusion listed twice is
    not."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    exclusions = cert["evidence"]["descent"][rm.side_on_e()]["exclusions"]
    exclusions.append(copy.deepcopy(exclusions[0]))
    failure = rejection(cert)
    assert failure.check == "cosets" and failure.message.endswith("lies in the coset of an earlier exclusion")


# --- descent.py: local generators ---

def with_generator(cert: dict, side: str, d: int, witnesses: list) -> dict:
    """The certificate with d offered as a local generator of the side, with membership witnesses
    [(prime, M, e)], and everything else made consistent with the larger W = ⟨W, d⟩: one exclusion kept in each
    non-zero coset of V/W (those of the certificate, which covered every coset of the smaller W), the side's
    Selmer dimension and rank_upper one higher. When d is no element of S_T, that dimension is false."""
    descent = cert["evidence"]["descent"]
    descent[side]["local_generators"].append(
        {"d": str(d), "membership": [{"prime": str(p), "M": str(M), "e": str(e)} for p, M, e in witnesses]})
    _, _, primes, vectors = side_data(cert, side)
    basis, seen, kept = echelon(vectors), set(), []
    for exclusion in descent[side]["exclusions"]:
        coset = reduce_vector(element_vector(int(exclusion["d"]), primes, ""), basis)
        if coset and coset not in seen:
            seen.add(coset)
            kept.append(exclusion)
    descent[side]["exclusions"] = kept
    dimensions = cert["claim"]["selmer_dimensions"]
    dimensions[side] = str(int(dimensions[side]) + 1)
    cert["claim"]["rank_upper"] = str(int(cert["claim"]["rank_upper"]) + 1)
    return cert


def assert_selmer_dimensions_false(cert: dict, rank_of_curve: int) -> None:
    """The claimed dim Sel^φ + dim Sel^φ̂ − 2 is not rank + dim Sha(E')[2], which it equals (Silverman X.4.2 with
    Silverman–Tate III.6; tests/rank_reference.py): the bounds of every 2-isogeny of the curve by cypari2's
    ell2cover, with Cremona's rank."""
    dimensions = cert["claim"]["selmer_dimensions"]
    bounds = descent_bounds(cert["curve"], rank_of_curve)
    assert bounds and int(dimensions["phi"]) + int(dimensions["phi_dual"]) - 2 not in bounds


def test_a_local_generator_with_no_real_point_is_refused():
    """Kills the deleted raise of check_soluble_over_reals, by a false Selmer dimension it would accept: on the
    side of E: y² = x³ − 102x² + 2312x (the descent model of y² = x³ − 1156x, rank 2), −1 is excluded at infinity;
    offered as a local generator with genuine witnesses at 2 and 17 (the values −2415 ≡ 1 mod 8 and
    −2312 = −8·17² with −8 ≡ 3² mod 17, squares in Q_2 and Q_17), it raises dim Sel^φ̂ to 3, which the bounds
    from cypari2's ell2cover deny."""
    cert, rank_of_curve = pool_certificate(["0", "0", "0", "-1156", "0"])
    side = rm.side_on_e()
    assert {"d": "-1", "place": "infinity"} in cert["evidence"]["descent"][side]["exclusions"]
    cert = with_generator(cert, side, -1, [(2, 1, 1), (17, 0, 1)])
    assert_selmer_dimensions_false(cert, rank_of_curve)
    assert rejection(cert).check == "real solubility"


Y2_X3_X2 = ["0", "-1", "0", "-24", "-36"]
"""y² = x³ − x² − 24x − 36, rank 0 (Cremona's tables): its descent model y² = x³ + 17x² + 72x, T = {∞, 2, 3},
excludes d = 3 at 3 on the side of E, where 3 is soluble at 2 (M = 1, e = 5 gives 15428 = 4·3857,
3857 ≡ 1 mod 8) but at no point of Q_3."""


def test_a_local_generator_missing_a_witness_is_refused():
    """Kills the deleted raise for ``primes != places`` in check_membership, by a false Selmer dimension it would
    accept: d = 3 offered as a local generator with a witness at 2 only; without the check the witnesses are
    paired with the places of T in order and the place 3, where C_3 has no point, is never tested."""
    cert, rank_of_curve = pool_certificate(Y2_X3_X2)
    side = rm.side_on_e()
    assert any(e["d"] == "3" and e["place"] == "3" for e in cert["evidence"]["descent"][side]["exclusions"])
    cert = with_generator(cert, side, 3, [(2, 1, 5)])
    assert_selmer_dimensions_false(cert, rank_of_curve)
    failure = rejection(cert)
    assert failure.check == "membership" and failure.values["listed"] == [2]


def test_a_local_generator_with_a_non_square_witness_is_refused():
    """Kills ``not is_local_square(n, p) -> False`` and the deleted raise in check_membership, by a false Selmer
    dimension they would accept: d = 3 offered with the witness (1, 1) at 3, whose value 3 + 17 + 24 = 44 ≡ 2
    mod 3 is no square in Q_3 (Serre, *A Course in Arithmetic*, II.3.3)."""
    cert, rank_of_curve = pool_certificate(Y2_X3_X2)
    cert = with_generator(cert, rm.side_on_e(), 3, [(2, 1, 5), (3, 1, 1)])
    assert_selmer_dimensions_false(cert, rank_of_curve)
    failure = rejection(cert)
    assert failure.check == "membership" and (failure.values["p"], failure.values["value"]) == (3, 44)


def test_a_witness_of_value_zero_is_refused_without_testing_zero_for_a_square():
    """Kills ``n == 0 -> False`` in check_membership: on y² = x³ − 15x² + 50x (the descent model of y² = x³ − 25x)
    the quartic 5M⁴ − 15M²e² + 10e⁴ of d = 5 vanishes at (1, 1); the witness is refused as such, without asking
    whether 0 is a square in Q_5 (v_5(0) is infinite: the valuation would never end)."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    descent = cert["evidence"]["descent"]
    assert (int(descent["a"]), int(descent["b"])) == (-15, 50)
    descent[rm.side_on_e()]["local_generators"].append(
        {"d": "5", "membership": [{"prime": "2", "M": "1", "e": "2"}, {"prime": "5", "M": "1", "e": "1"}]})
    failure = rejection(cert)
    assert failure.check == "membership" and (failure.values["p"], failure.values["value"]) == (5, 0)


# --- descent.py: exclusions and disc covers ---

def exclusion_of_p_at_p(p: int) -> dict:
    """The certificate of y² = x³ + px (p ≡ 3 mod 4 prime) with d = p excluded at p by the discs Z_p and pZ_p
    on the side of Ē, in place of the exclusion of its coset (the argument is the next test's)."""
    from certify.rank.certificate import certify_rank

    cert = certify_rank((Fraction(0), Fraction(0), Fraction(0), Fraction(p), Fraction(0)), seconds=5)
    side = "phi" if rm.side_on_e() == "phi_dual" else "phi_dual"
    _, _, primes, vectors = side_data(cert, side)
    basis = echelon(vectors)
    target = reduce_vector(element_vector(p, primes, ""), basis)
    exclusions = cert["evidence"]["descent"][side]["exclusions"]
    index = next(i for i, e in enumerate(exclusions)
                 if reduce_vector(element_vector(int(e["d"]), primes, ""), basis) == target)
    exclusions[index] = {"d": str(p), "place": str(p), "t_discs": [["0", "0"]], "s_discs": [["0", "1"]]}
    return cert


def test_an_exclusion_at_a_prime_over_max_disc_prime_is_refused_by_the_limit(monkeypatch):
    """Kills the deleted raise for ``p > MAX_DISC_PRIME`` in check_exclusion_place: y² = x³ + px with the prime
    p = 1,000,000,007 ≡ 3 mod 4 (cypari2 isprime), rank 0 (cypari2 ellrank). On the side of Ē: y² = x³ − 4px,
    f1 = pt⁴ − 4 ≡ −4 on Z_p and f2 = p − 4s⁴ = p·(unit) on pZ_p are non-squares (−1 is no square mod p; an odd
    valuation), so d = p is excluded at p by the discs Z_p and pZ_p: a genuine exclusion, put in place of the one in
    its coset, which the verifier accepts once the limit is raised to p, and refuses at the limit."""
    p = 1_000_000_007
    assert pari.isprime(p) and p % 4 == 3 and p > limits.MAX_DISC_PRIME
    cert = exclusion_of_p_at_p(p)
    assert ellrank_bounds(cert["curve"]) == (0, 0) and cert["claim"]["rank_upper"] == "0"
    failure = rejection(cert)
    assert failure.check == "exclusion place" and failure.values == {"place": p}
    monkeypatch.setattr(descent_module, "MAX_DISC_PRIME", p)
    verify(cert)


def exclusion_at_two(cert: dict) -> dict:
    """The exclusion of d = 5 at 2 on the side of Ē: y² = x³ + 30x² + 25x in the descent of y² = x³ − 25x, whose
    t-cover has the disc 2Z_2 = [0, 1]."""
    side = "phi" if rm.side_on_e() == "phi_dual" else "phi_dual"
    exclusion = next(e for e in cert["evidence"]["descent"][side]["exclusions"] if e["place"] == "2")
    assert exclusion["d"] == "5" and ["0", "1"] in exclusion["t_discs"]
    return exclusion


def refined(discs: list, depth: int) -> list:
    """The cover with 2Z_2 = [0, 1] cut into 2^j + 2^(j+1)Z_2 for j = 1 … depth − 1 and 2^depth Z_2 (a partition
    of 2Z_2); a conclusive leaf test stays conclusive on sub-discs (its higher coefficients only gain powers of 2)."""
    return [d for d in discs if d != ["0", "1"]] + [[str(2 ** j), str(j + 1)] for j in range(1, depth)] + \
        [["0", str(depth)]]


def test_discs_of_depth_max_disc_depth_are_accepted():
    """Kills ``k <= MAX_DISC_DEPTH -> k < MAX_DISC_DEPTH`` in read_discs: a cover refined down to depth
    MAX_DISC_DEPTH is within the limit, and the certificate of y² = x³ − 25x (rank 1, cypari2) is accepted."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    exclusion = exclusion_at_two(cert)
    exclusion["t_discs"] = refined(exclusion["t_discs"], limits.MAX_DISC_DEPTH)
    verify(cert)


def test_discs_deeper_than_max_disc_depth_are_refused_by_the_limit(monkeypatch):
    """Kills ``not depth <= k <= MAX_DISC_DEPTH -> False`` in read_discs and the deleted raise after it: the same
    cover refined one level deeper is refused, and accepted once the limit is raised by one."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    exclusion = exclusion_at_two(cert)
    exclusion["t_discs"] = refined(exclusion["t_discs"], limits.MAX_DISC_DEPTH + 1)
    failure = rejection(cert)
    assert failure.check == "disc cover" and failure.values["k"] == limits.MAX_DISC_DEPTH + 1
    monkeypatch.setattr(descent_module, "MAX_DISC_DEPTH", limits.MAX_DISC_DEPTH + 1)
    verify(cert)


def test_a_disc_centre_of_p_to_the_k_is_refused():
    """Kills ``c < p ** k -> c <= p ** k`` and ``not 0 <= c < p ** k -> False`` in read_discs: each disc is written
    with its centre 0 <= c < p^k, and [4, 2] (the disc 4 + 4Z_2 = [0, 2]) is not, though the cover it is in is
    otherwise a partition whose leaf tests hold."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    exclusion = exclusion_at_two(cert)
    exclusion["t_discs"] = refined(exclusion["t_discs"], 2)
    exclusion["t_discs"][exclusion["t_discs"].index(["0", "2"])] = ["4", "2"]
    failure = rejection(cert)
    assert failure.check == "disc cover" and (failure.values["c"], failure.values["k"]) == (4, 2)


def test_an_s_disc_outside_p_z_p_is_refused_as_such():
    """Kills ``c % p ** depth -> False`` in read_discs: an s-disc must lie in pZ_p, and [1, 1] does not; the
    rejection names the rule (without it, only the partition check notices that the discs do not cover 2Z_2)."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    exclusion = exclusion_at_two(cert)
    exclusion["s_discs"] = [["1", "1"]]
    failure = rejection(cert)
    assert failure.check == "disc cover" and "p^1 | c" in failure.message
    assert (failure.values.get("c"), failure.values.get("k")) == (1, 1)


def test_a_disc_of_three_numbers_is_refused_without_a_crash():
    """Kills ``len(entry) != 2 -> False`` in read_discs: a disc is [c, k], and [0, 1, 0] is refused by the
    structure check (without it, unpacking three numbers into two raises a ValueError: a crash)."""
    cert, _ = pool_certificate(CONGRUENT_FIVE)
    exclusion = exclusion_at_two(cert)
    exclusion["t_discs"][0] = exclusion["t_discs"][0] + ["0"]
    assert rejection(cert).check == "structure"


def test_an_upper_bound_without_a_witness_is_refused():
    """Kills the deleted raise of ``upper is not None`` when no witness bounds the rank: y² = x³ − 25x has
    rank 1 (cypari2 ellrank; Cremona's tables), and its certificate reduced to its point and independence
    evidence, with no descent and no analytic witness, is accepted with rank_upper null; stating
    rank_upper = 0 there is a false claim, refused because no witness proves any upper bound."""
    cert, rank_of_curve = pool_certificate(CONGRUENT_FIVE)
    assert ellrank_bounds(cert["curve"]) == (1, 1) == (rank_of_curve, rank_of_curve)
    independence = cert["evidence"]["independence"]
    points = [tuple(Fraction(v) for v in P) for P in cert["claim"]["points"]]
    cert = points_only(cert, points, int(independence["ell"]), int(independence["torsion_prime"]),
                       [int(q) for q in independence["character_primes"]])
    verify(copy.deepcopy(cert))
    cert["claim"]["rank_upper"] = "0"
    failure = rejection(cert)
    assert (failure.check, failure.message) == ("upper bound", "rank_upper must be null when no witness bounds "
                                                               "the rank")
