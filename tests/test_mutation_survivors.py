"""Tests written for the mutants of the verifier that survived the first mutation run (issue 15;
``tests/mutation_run.py``, ``python bench/bench_mutation.py``). Each test names the mutant it kills.

Two kinds of test. Where a weakened check would accept a false claim, the test builds that certificate
and asks cypari2 (the reference library) that the claim is false, so the verifier must reject it. Where the
weakened check would only let a malformed certificate through to a later check (a duplicate, a bound
shifted by one), the test holds the verifier to its documented rule: the certificate exactly at a limit is
accepted (its claim confirmed by cypari2), one past it is refused by the check that names the limit.
"""
import copy

import pytest

from certify.curves import parse_curve
from certify.pari import pari
from certify.torsion import certify_torsion
from certify.verifier import limits, verify
from certify.verifier.errors import Rejection
from soundness_pool import assert_sound, pari_curve
from test_soundness_limits import good_primes

Z2_Z6 = "[1,0,1,-19,26]"
"""y² + xy + y = x³ − 19x + 26, whose torsion cypari2's elltors gives as Z/2 × Z/6."""


def torsion_certificate(text: str = Z2_Z6) -> dict:
    return copy.deepcopy(certify_torsion(parse_curve(text)))


def rejection(cert) -> Rejection:
    with pytest.raises(Rejection) as caught:
        verify(cert)
    return caught.value


def point_counts(text: str, primes: list) -> list:
    """evidence.primes entries with #E(F_p) from cypari2's ellcard."""
    E = pari_curve(text.strip("[]").split(","))
    return [{"p": str(p), "count": str(int(pari.ellcard(E, p)))} for p in primes]


# --- torsion.py ---

def test_a_group_over_mazurs_bound_is_refused_by_the_bound_itself():
    """Kills MAZUR_LARGEST_GROUP 16 -> 17: Z/17 is no torsion group over Q (Mazur 1977, the theorem the
    certificate cites), and the claim is refused by that bound, before any generator is examined."""
    cert = torsion_certificate()
    cert["claim"]["invariants"], cert["evidence"]["generator_orders"] = ["17"], ["17"]
    cert["claim"]["generators"] = cert["claim"]["generators"][1:]
    assert rejection(cert).check == "invariants"


def test_exactly_max_primes_point_counts_are_accepted():
    """Kills ``len(entries) >= MAX_PRIMES`` in read_primes: MAX_PRIMES correct counts (cypari2's ellcard)
    are within the limit, and the claim stays the one cypari2's elltors confirms."""
    cert = torsion_certificate()
    cert["evidence"]["primes"] = point_counts(Z2_Z6, good_primes(Z2_Z6, limits.MAX_PRIMES, 3))
    assert assert_sound(cert) is None


def test_a_prime_listed_twice_is_refused():
    """Kills the deleted raise for a prime listed twice in read_primes (evidence lists each prime once)."""
    cert = torsion_certificate()
    cert["evidence"]["primes"] = cert["evidence"]["primes"] * 2
    failure = rejection(cert)
    assert (failure.check, failure.message) == ("structure", "a prime is listed twice")


@pytest.mark.parametrize("ell", ["4", "9"])
def test_an_ell_part_for_a_composite_ell_is_refused(ell):
    """Kills ``not is_prime(ell) -> False`` in read_ell_parts: ℓ-parts are for primes ℓ only."""
    cert = torsion_certificate()
    cert["evidence"]["ell_parts"].append({"ell": ell, "torsion": {"prime": "5", "roots": []}, "classes": []})
    assert rejection(cert).check == "ell part"


# --- isogeny.py ---

def test_a_model_that_scales_down_at_a_listed_prime_is_not_minimal():
    """Kills the mutants of ``c4 % p ** 4 == 0 and c6 % p ** 6 == 0`` in check_reduced_minimal (and its
    deleted raise): y² = x³ − 5⁴x + 5⁶ is in reduced form, 5 divides gcd(c4, c6) and is listed, but the
    model is not minimal at 5 — cypari2's ellminimalmodel gives y² = x³ − x + 1."""
    from certify.verifier.isogeny import check_reduced_minimal

    model = (0, 0, 0, -5 ** 4, 5 ** 6)
    assert [int(c) for c in pari.ellminimalmodel(pari_curve(model))[:5]] == [0, 0, 0, -1, 1]
    with pytest.raises(Rejection) as caught:
        check_reduced_minimal(model, {"primes": ["5"]}, "claim.curves[0]")
    assert caught.value.message == "claim.curves[0] is not minimal at p"


def test_three_invariants_are_refused_by_the_invariants_check():
    """Kills ``len(invariants) > 2: 2 -> 3``: E(Q)_tors is a quotient of Z², so a claim with three
    invariants is refused as such, before its generators are examined."""
    cert = torsion_certificate()
    cert["claim"]["invariants"] = cert["evidence"]["generator_orders"] = ["2", "2", "2"]
    cert["claim"]["generators"] = cert["claim"]["generators"] + cert["claim"]["generators"][:1]
    assert rejection(cert).check == "invariants"


def test_invariants_out_of_divisibility_order_are_refused():
    """Kills ``invariants[1] % invariants[0] -> invariants[1] % invariants[1]`` and the deleted raise after
    it: [4, 2] with generators of orders 4 and 2 generates the whole torsion of y² + xy + y = x³ + x² − 10x − 10,
    but the claim is not in the form n1 | n2, and cypari2's elltors (Z/2 × Z/4) denies it as written."""
    from soundness_pool import torsion_claim_is_true

    cert = torsion_certificate("[1,1,1,-10,-10]")
    assert cert["claim"]["invariants"] == ["2", "4"]
    cert["claim"]["invariants"] = cert["evidence"]["generator_orders"] = ["4", "2"]
    cert["claim"]["generators"] = cert["claim"]["generators"][::-1]
    assert not torsion_claim_is_true(cert)
    failure = rejection(cert)
    assert (failure.check, failure.message) == ("invariants", "n1 must divide n2")


def test_an_ell_part_for_the_largest_ell_is_within_the_limit():
    """Kills ``ell > MAX_ELL -> ell >= MAX_ELL``: an ℓ-part for ℓ = MAX_ELL = 13 is allowed (here one the
    point counts do not ask for, so it is read and budgeted but not needed); the claim is cypari2's."""
    cert = torsion_certificate()
    cert["evidence"]["ell_parts"].append({"ell": str(limits.MAX_ELL), "torsion": {"prime": "3", "roots": []},
                                          "classes": []})
    assert assert_sound(cert) is None


def test_an_ell_listed_twice_is_refused():
    """Kills ``ell in parts -> False`` in read_ell_parts: each ℓ is listed once."""
    cert = torsion_certificate()
    part = {"ell": "5", "torsion": {"prime": "3", "roots": []}, "classes": []}
    cert["evidence"]["ell_parts"] += [part, copy.deepcopy(part)]
    assert rejection(cert).check == "ell part"


def test_the_prime_two_is_refused_as_a_bad_choice_of_prime():
    """Kills ``p <= 2 -> False`` and ``p <= 2 -> p < 2`` in check_reduction_bound: p = 2 is refused by the
    good-reduction rule (the reduction injects E(Q)_tors only for odd p), not later by the point count, even
    on y² + y = x³ − x², whose discriminant −11 (cypari2) is odd."""
    cert = torsion_certificate("[0,-1,1,0,0]")
    assert int(pari_curve(cert["curve"]).disc()) % 2
    cert["evidence"]["primes"].insert(0, {"p": "2", "count": "5"})
    assert rejection(cert).check == "good reduction"


# --- arith.py ---

def test_a_hint_prime_of_exactly_max_digits_digits_is_read():
    """Kills ``len(text) > MAX_DIGITS -> >=`` in parse_integer: a point-count prime of MAX_DIGITS digits is
    read (and refused by the good-reduction rule, being over MAX_HINT_PRIME); one digit more is refused
    by the number-size limit."""
    cert = torsion_certificate()
    cert["evidence"]["primes"][0]["p"] = "9" * limits.MAX_DIGITS
    assert rejection(cert).check == "good reduction"
    cert["evidence"]["primes"][0]["p"] = "9" * (limits.MAX_DIGITS + 1)
    assert rejection(cert).check == "number size"


def test_a_coefficient_of_exactly_max_digits_digits_is_read():
    """Kills ``max(len(numerator), len(denominator)) > MAX_DIGITS -> >=`` in parse_rational: a curve
    coefficient with a denominator of MAX_DIGITS digits is read (and the stated integral model is then not
    its image); one digit more is refused by the number-size limit."""
    cert = torsion_certificate()
    cert["curve"][4] = "1/" + "9" * limits.MAX_DIGITS
    assert rejection(cert).check != "number size"
    cert["curve"][4] = "1/" + "9" * (limits.MAX_DIGITS + 1)
    assert rejection(cert).check == "number size"


@pytest.mark.parametrize("seed", range(20))
def test_polynomial_sums_and_products_agree_with_sympy_whichever_is_longer(seed):
    """Kills ``i < len(f) -> i <= len(f)`` (and the same for g) in poly_add: the verifier's callers add a
    longer polynomial to a shorter one only in some orders, so the primitives are checked against sympy
    (the reference for polynomial arithmetic) on random integer polynomials of both orders of length."""
    import random

    import sympy

    from certify.verifier.arith import poly_add, poly_mul, poly_sub

    rnd, x = random.Random(seed), sympy.Symbol("x")
    f = [rnd.randint(-50, 50) for _ in range(rnd.randint(0, 4))]
    g = [rnd.randint(-50, 50) for _ in range(rnd.randint(5, 8))] + [rnd.randint(1, 50)]

    def as_sympy(h):
        return sympy.Poly(list(reversed(h)) or [0], x)

    def coefficients(p):
        return [int(c) for c in reversed(p.all_coeffs())] if not p.is_zero else []

    for left, right in ((f, g), (g, f)):
        assert poly_add(left, right) == coefficients(as_sympy(left) + as_sympy(right))
        assert poly_sub(left, right) == coefficients(as_sympy(left) - as_sympy(right))
        assert poly_mul(left, right) == coefficients(as_sympy(left) * as_sympy(right))


def test_a_budget_may_be_spent_exactly_and_not_beyond():
    """Kills ``self.spent > self.limit -> >=`` and the deleted raise in Budget.spend (the lifting budget,
    MAX_LIFTING_WORK, of every certificate): spending the whole limit is allowed, one unit more is refused
    by the budget's own check before the work it would pay for."""
    from certify.verifier.arith import Budget

    budget = Budget(limits.MAX_LIFTING_WORK, "lifting work")
    budget.spend(limits.MAX_LIFTING_WORK - 1, "first search")
    budget.spend(1, "second search")
    with pytest.raises(Rejection) as caught:
        budget.spend(1, "third search", degree=4)
    assert caught.value.check == "lifting work" and caught.value.values["spent"] == limits.MAX_LIFTING_WORK + 1


def hint_prime_for(f: list) -> int:
    """The least odd prime p not dividing lc(f)·disc(f) (sympy's discriminant): every root of f mod p is
    simple, as rational_roots requires of its hint."""
    import sympy

    x = sympy.Symbol("x")
    poly = sympy.Poly(list(reversed(f)), x)
    bad = int(poly.LC()) * int(sympy.discriminant(poly))
    return next(p for p in sympy.primerange(3, 10 ** 5) if bad % p)


@pytest.mark.parametrize("seed", range(25))
def test_rational_roots_are_sympys_rational_roots(seed):
    """Kills the mutants of rational_roots that lose or invent roots (``len(f) == 1: 1 -> 2`` returns early on
    a linear factor left after the zero roots are taken out): random products of x^k (k ≤ 2), distinct linear
    factors bx − a and perhaps the irreducible 2x² + odd, with the hint prime of ``hint_prime_for`` (taken
    for f without its zero roots); the rational roots must be exactly sympy's."""
    import random
    from fractions import Fraction

    import sympy

    from certify.verifier.arith import Budget, poly_mul, rational_roots

    rnd, x = random.Random(seed), sympy.Symbol("x")
    zeros = rnd.randint(0, 2)
    roots = {Fraction(rnd.randint(-40, 40) or 1, rnd.randint(1, 12)) for _ in range(rnd.randint(1, 3))}
    f = [1]
    for root in roots:
        f = poly_mul(f, [-root.numerator, root.denominator])
    if rnd.random() < 0.5:
        f = poly_mul(f, [rnd.randint(1, 9) * 2 + 1, 0, 2])
    hint = hint_prime_for(f)
    f = [0] * zeros + f
    expected = sorted(Fraction(str(r)) for r in sympy.roots(sympy.Poly(list(reversed(f)), x), filter="Q"))
    assert rational_roots(f, hint, "test", Budget(10 ** 6, "lifting work")) == expected


@pytest.mark.parametrize("hint", [1, 2, 9, 15, 100_001])
def test_a_hint_that_is_not_an_odd_prime_up_to_the_limit_is_refused(hint):
    """Kills ``is_prime(p) -> True`` (and the bounds) in rational_roots' hint check: Hensel's lemma needs a
    prime; 9 and 15 are odd and small but composite."""
    from certify.verifier.arith import Budget, rational_roots

    with pytest.raises(Rejection) as caught:
        rational_roots([-2, 0, 1], hint, "test", Budget(10 ** 6, "lifting work"))
    assert caught.value.check == "rational roots" and "not an odd prime" in caught.value.message


@pytest.mark.parametrize("f, hint, roots", [([-1, 1], 3, [1]), ([-2, 1], 5, [2]), ([-3, 1], 7, [3]),
                                            ([1, 1], 3, [-1])])
def test_a_root_at_the_edge_of_the_symmetric_residues_is_found(f, hint, roots):
    """Kills ``candidate > modulus // 2 -> >=`` in rational_roots: for x − a with hint p = 2a + 1 the lifting
    modulus is p itself (the least power over 2·|lc·f(0)| = 2a), and lc·a = (p − 1)/2 is the largest
    non-negative symmetric residue; the root is a, as a glance shows."""
    from fractions import Fraction

    from certify.verifier.arith import Budget, rational_roots

    assert rational_roots(f, hint, "test", Budget(10 ** 6, "lifting work")) == [Fraction(r) for r in roots]


def test_squarefree_parts_are_taken_up_to_degree_four_only():
    """Kills ``len(f) - 1 <= MAX_SQUAREFREE_DEGREE: 1 -> 2``: (x − 1)²(x² + 2) of degree 4 has its
    squarefree part taken and its root 1 found; (x − 1)²(x³ + 2), of degree 5 = MAX_SQUAREFREE_DEGREE + 1, is
    refused (its root 1 is double modulo every prime)."""
    from certify.verifier.arith import Budget, poly_mul, rational_roots

    square = poly_mul([-1, 1], [-1, 1])
    assert rational_roots(poly_mul(square, [2, 0, 1]), 5, "test", Budget(10 ** 6, "lifting work")) == [1]
    with pytest.raises(Rejection) as caught:
        rational_roots(poly_mul(square, [2, 0, 0, 1]), 5, "test", Budget(10 ** 6, "lifting work"))
    assert caught.value.check == "rational roots" and caught.value.values["degree"] == 5


# --- curves.py ---

@pytest.mark.parametrize("a", [("1/2", "1/2", "1/2", "1/2", "1/2"), ("1/2", "-3/2", "5/2", "1/2", "7/2"),
                               ("1/3", "2/3", "1/3", "4/3", "-1/3")])
def test_invariants_and_changes_of_curves_with_a_common_denominator(a):
    """Kills ``v.denominator == 1: 1 -> 2`` in curves.integral (which would take coefficients of
    denominator 2 for integers): the discriminant and a change of variables of curves whose coefficients
    all share a denominator, against cypari2's ellinit(...).disc and ellchangecurve."""
    from fractions import Fraction

    from certify.verifier.curves import change_model, discriminant

    coefficients = tuple(Fraction(c) for c in a)
    E = pari_curve(a)
    assert discriminant(coefficients) == Fraction(str(E.disc()))
    change = (Fraction(1), Fraction(1, 2), Fraction(1, 2), Fraction(1, 2))
    expected = pari.ellchangecurve(E, [str(c) for c in change])
    assert change_model(coefficients, change) == tuple(Fraction(str(c)) for c in expected[:5])


@pytest.mark.parametrize("text", ["[1,-1,0,4,-3]", "[1,0,0,4,1]"])
def test_a_point_of_order_two_with_x_of_denominator_four_is_torsion(text):
    """Kills the constants of ``(4 * x).denominator != 1 or (8 * y).denominator != 1`` in torsion_order
    moved by one: on these integral models (found by a search with cypari2's elltors) the point of order 2
    is (3/4, −3/8) and (−1/4, 1/8), at the edge of Cassels' bound 4x, 8y ∈ Z; the certificate must be
    accepted and its claim is cypari2's."""
    cert = torsion_certificate(text)
    assert any(point[0].endswith("/4") for point in cert["claim"]["generators"])
    assert assert_sound(cert) is None


@pytest.mark.parametrize("u", ["2", "-2", "-1"])
def test_changes_with_u_other_than_one_on_integral_models(u):
    """Kills ``whole[5] in (1, -1)`` with 1 -> 2 in change_model (the fast path for u = ±1 on integral
    models would scale instead of divide for u = ±2): against cypari2's ellchangecurve."""
    from fractions import Fraction

    from certify.verifier.curves import change_model

    a = (1, -1, 1, -2, 7)
    change = (Fraction(u), Fraction(3), Fraction(1), Fraction(-2))
    expected = pari.ellchangecurve(pari_curve(a), [str(c) for c in change])
    assert change_model(tuple(Fraction(c) for c in a), change) == tuple(Fraction(str(c)) for c in expected[:5])


def test_a_generator_off_the_curve_is_refused_as_such():
    """Kills ``point is None -> is not None`` in on_curve (every affine point would lie on the curve): a
    generator moved off y² + xy + y = x³ − 19x + 26 (cypari2's ellisoncurve says so) is refused by the
    point-on-curve check, before any group law is applied to it."""
    cert = torsion_certificate()
    x, y = cert["claim"]["generators"][0]
    cert["claim"]["generators"][0] = [x, str(int(y) + 1)]
    assert not pari.ellisoncurve(pari_curve(cert["curve"]), [int(x), int(y) + 1])
    assert rejection(cert).check == "point on curve"


def test_composites_listed_as_primes_cannot_hide_torsion(monkeypatch):
    """Kills ``is_prime(p) -> True`` in count_points (check_reduction_bound leaves primality to it): the
    claim 'E(Q)_tors ≅ Z/2' for y² + xy + y = x³ − 19x + 26 is false (cypari2's elltors: Z/2 × Z/6), and
    the certificate lists the composites 77 and 11², coprime to Δ, with the 'counts' the counting formula
    gives there (90 and 92, found with the primality test switched off, then on again). Were the formula
    trusted at composites, the bound would be gcd(90, 92) = 2 = |G| and no ℓ-part would be asked for."""
    from math import gcd

    from certify.verifier import curves

    cert = torsion_certificate()
    model = tuple(int(c) for c in cert["evidence"]["integral_model"]["curve"])
    with monkeypatch.context() as patched:
        patched.setattr(curves, "is_prime", lambda n: True)
        counts = {n: curves.count_points(model, n) for n in (77, 121)}
    assert gcd(*counts.values()) == 2 and gcd(77 * 121, int(curves.discriminant(model))) == 1
    order_two = next(P for P, n in zip(cert["claim"]["generators"], cert["evidence"]["generator_orders"]) if n == "2")
    cert["claim"]["invariants"] = cert["evidence"]["generator_orders"] = ["2"]
    cert["claim"]["generators"] = [order_two]
    cert["evidence"]["primes"] = [{"p": str(n), "count": str(count)} for n, count in counts.items()]
    cert["evidence"]["ell_parts"] = []
    assert int(pari.elltors(pari_curve(cert["curve"]))[0]) == 12
    failure = rejection(cert)
    assert (failure.check, failure.values["p"]) == ("point count", 77)


@pytest.mark.parametrize("a", [(1, 0, 1, -19, 26), (0, -1, 1, -10, -20), (1, -1, 0, 4, -3)])
def test_division_polynomials_up_to_fourteen_are_paris(a):
    """Kills ``m % 2: 2 -> 3`` in division_polynomials (wrong from ψ_8 on, which the ℓ-parts for ℓ = 7 and
    the torsion polynomials for ℓ = 11, 13 use): every f_m, m ≤ 14, against cypari2's elldivpol, which is
    ψ_m for m odd and ψ_m·ψ_2 = (ψ_m/ψ_2)·F for m even (PARI's documentation of elldivpol)."""
    from certify.verifier.arith import poly_mul
    from certify.verifier.curves import division_polynomials, two_division_polynomial

    E = pari.ellinit(list(a))
    ours = division_polynomials(tuple(a), 14)
    for m in range(1, 15):
        expected = [int(c) for c in reversed(pari.Vec(pari.elldivpol(E, m)))]
        assert (ours[m] if m % 2 else poly_mul(ours[m], two_division_polynomial(a))) == expected, m


def test_point_counts_of_exactly_the_work_limit_are_accepted():
    """Kills ``work > MAX_WORK -> >=`` in torsion's check_work_budget: primes whose sum is exactly MAX_WORK
    (the 50 largest good primes below MAX_HINT_PRIME and two more that make up the rest), with cypari2's
    ellcard as counts, are within the limit; the claim stays the one cypari2's elltors confirms."""
    import sympy

    from certify.verifier.curves import discriminant

    delta = int(discriminant((1, 0, 1, -19, 26)))
    good = [p for p in sympy.primerange(3, limits.MAX_HINT_PRIME + 1) if delta % p][::-1]
    chosen = good[:50]
    rest = limits.MAX_WORK - sum(chosen)
    q = next(q for q in good[50:] if rest - q in good[50:] and rest - q != q)
    chosen += [q, rest - q]
    assert sum(chosen) == limits.MAX_WORK
    cert = torsion_certificate()
    cert["evidence"]["primes"] = point_counts(Z2_Z6, chosen)
    assert assert_sound(cert) is None


def test_a_point_of_infinite_order_is_not_a_torsion_generator():
    """Kills the deleted raise 'generator i does not have order n' in check_generator_orders: on
    y² + y = x³ − x (cypari2's elltors: trivial torsion; (0, 0) has infinite order, cypari2's ellorder 0)
    the claim Z/2 generated by (0, 0), with the primes 5 and 17 (ellcard 8 and 18, gcd 2 = |G|), would pass
    every later check: {O, P} has two elements and the bound asks for no ℓ-part."""
    cert = torsion_certificate()
    curve = ["0", "0", "1", "-1", "0"]
    E = pari_curve(curve)
    assert int(pari.elltors(E)[0]) == 1 and int(pari.ellorder(E, [0, 0])) == 0
    cert["curve"] = curve
    cert["claim"] = {"invariants": ["2"], "generators": [["0", "0"]]}
    cert["evidence"].update({"generator_orders": ["2"], "integral_model": {"change": ["1", "0", "0", "0"],
                                                                           "curve": curve},
                             "primes": point_counts("[0,0,1,-1,0]", [5, 17]), "ell_parts": []})
    failure = rejection(cert)
    assert (failure.check, failure.message) == ("generator orders", "generator 0 does not have order 2")


def test_a_change_to_a_non_integral_model_is_refused():
    """Kills the deleted raise of check_integral_model: [2, 0, 0, 0] takes y² + xy + y = x³ − 19x + 26 to
    (1/2, 0, 1/8, −19/16, 13/32) (cypari2's ellchangecurve), which is not integral, so no point count on it
    means anything; the model is refused although it is stated correctly."""
    cert = torsion_certificate()
    image = pari.ellchangecurve(pari_curve(cert["curve"]), [2, 0, 0, 0])
    cert["evidence"]["integral_model"] = {"change": ["2", "0", "0", "0"], "curve": [str(c) for c in image[:5]]}
    failure = rejection(cert)
    assert (failure.check, failure.message) == ("integral model", "the change of variables does not give an "
                                                                  "integral model")


def test_a_subgroup_of_index_two_needs_its_divisibility_evidence():
    """Kills the deleted raise 'some non-zero classes of G/ℓG have no divisibility evidence' in
    check_ell_part: y² + xy + y = x³ + x² − 80x + 242 has E(Q)_tors ≅ Z/4 (cypari2's elltors); the claim
    Z/2, generated by 2P, with the honest ℓ-part for ℓ = 2 except its class evidence (which would show
    2P = 2·P), would otherwise be accepted."""
    from soundness_pool import honest_ell_parts, point_strings, torsion_claim_is_true

    text = "[1,1,1,-80,242]"
    cert = torsion_certificate(text)
    E = pari_curve(cert["curve"])
    assert [int(n) for n in pari.elltors(E)[1]] == [4]
    twice = pari.ellmul(E, [pari(c) for c in cert["claim"]["generators"][0]], 2)
    cert["claim"] = {"invariants": ["2"], "generators": [point_strings(twice)]}
    cert["evidence"]["generator_orders"] = ["2"]
    cert["evidence"]["ell_parts"] = honest_ell_parts(cert)
    assert not torsion_claim_is_true(cert)
    assert rejection(cert).check == "ell division"
    for part in cert["evidence"]["ell_parts"]:
        part["classes"] = []
    failure = rejection(cert)
    assert failure.message == "some non-zero classes of G/ℓG have no divisibility evidence"


def test_a_class_listed_twice_is_refused():
    """Kills the deleted raise 'a class of G/ℓG is listed twice' in check_ell_part (each class, or its
    negative, is given once)."""
    cert = torsion_certificate("[1,1,1,-80,242]")
    part = next(p for p in cert["evidence"]["ell_parts"] if p["classes"])
    part["classes"].append(copy.deepcopy(part["classes"][0]))
    assert rejection(cert).message == "a class of G/ℓG is listed twice (or is the zero class)"


def test_a_class_representative_outside_the_claimed_group_is_refused():
    """Kills the deleted raise 'a class representative is not in the claimed group' in check_ell_part: for
    the false claim Z/2 = ⟨2P⟩ on y² + xy + y = x³ + x² − 80x + 242 (Z/4 by cypari2), P itself is listed as
    a class of G/2G; it is a rational point, but not one of G."""
    from soundness_pool import honest_ell_parts, point_strings

    cert = torsion_certificate("[1,1,1,-80,242]")
    E = pari_curve(cert["curve"])
    generator = cert["claim"]["generators"][0]
    cert["claim"] = {"invariants": ["2"],
                     "generators": [point_strings(pari.ellmul(E, [pari(c) for c in generator], 2))]}
    cert["evidence"]["generator_orders"] = ["2"]
    cert["evidence"]["ell_parts"] = honest_ell_parts(cert)
    part = next(p for p in cert["evidence"]["ell_parts"] if p["classes"])
    part["classes"][0]["point"] = generator
    assert rejection(cert).message == "a class representative is not in the claimed group"


def test_the_order_of_two_invariants_is_their_product_for_mazurs_bound():
    """Kills ``len(invariants) == 2: 2 -> 3`` in the order of check_invariants (the order of [3, 6] would be
    taken as 3): Z/3 × Z/6, of order 18, is no torsion group over Q (Mazur 1977)."""
    cert = torsion_certificate()
    cert["claim"]["invariants"] = cert["evidence"]["generator_orders"] = ["3", "6"]
    failure = rejection(cert)
    assert failure.check == "invariants" and failure.values == {"order": 18}


def test_an_isogeny_class_of_nine_curves_is_refused_by_kenkus_bound():
    """Kills KENKU_LARGEST_CLASS 8 -> 9: no isogeny class over Q has more than 8 curves (Kenku 1982), and
    a claim of 9 is refused by that bound before anything else is read."""
    from soundness_pool import fresh

    cert = fresh("isogeny", 0)
    cert["claim"]["curves"] = (cert["claim"]["curves"] * 9)[:9]
    cert["claim"]["degrees"] = [["1"] * 9 for _ in range(9)]
    assert rejection(cert).check == "class size"
