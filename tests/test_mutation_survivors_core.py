"""Tests written for the mutants of arith.py, curves.py and torsion.py that survived the mutation run of
these modules after is_prime became trial division by 6k ± 1 and count_points was split from the cached
count (issue 15; ``tests/mutation_run.py``, ``python bench/bench_mutation.py``). Each test names the
mutants it kills.

A weakened check of torsion.py is met with the certificate it would let through, a false claim by
cypari2's elltors, and the verifier must reject it naming the check; a primitive of arith.py or curves.py
is compared with sympy or cypari2 (the reference libraries) at the edge case the mutant moves.
"""
import copy
from fractions import Fraction

import pytest
import sympy

from certify.curves import parse_curve
from certify.pari import pari
from certify.torsion import certify_torsion
from certify.verifier import verify
from certify.verifier.arith import Budget
from certify.verifier.errors import Rejection
from soundness_pool import pari_curve, torsion_claim_is_true

Z5 = "[0,-1,1,0,0]"
"""y² + y = x³ − x², whose torsion cypari2's elltors gives as Z/5."""


def torsion_certificate(text: str = Z5) -> dict:
    return copy.deepcopy(certify_torsion(parse_curve(text)))


def rejection(cert) -> Rejection:
    with pytest.raises(Rejection) as caught:
        verify(cert)
    return caught.value


def torsion_order_by_pari(cert) -> int:
    return int(pari.elltors(pari_curve(cert["curve"]))[0])


# --- arith.py: number syntax ---

@pytest.mark.parametrize("text", ["0", "-0", "7", "-7", "007", "-07", "+7", "10", "-10", "1e3", " 5", "5 ", ""])
def test_integers_are_read_exactly_in_pythons_canonical_spelling(text):
    """Kills ``text == "-0" -> False`` in parse_integer (the old reason, that the JSON-Schema step refuses
    '-0' first, no longer holds: verify() runs the schema after the kind's checks). The canonical decimal
    form of an integer is the one Python prints (reference: ``str(int(text)) == text``); exactly those
    strings are read, each other one is refused by the number-syntax check."""
    from certify.verifier.arith import parse_integer

    try:
        canonical = str(int(text)) == text
    except ValueError:
        canonical = False
    if canonical:
        assert parse_integer(text, "n") == int(text)
    else:
        with pytest.raises(Rejection) as caught:
            parse_integer(text, "n")
        assert caught.value.check == "number syntax"


@pytest.mark.parametrize("text", ["0", "-0", "-0/3", "0/3", "3/1", "2/4", "-2/4", "-3/4", "3/4", "03/4", "3/04",
                                  "3/-4", "-3", "1/0"])
def test_rationals_are_read_exactly_in_their_lowest_terms_spelling(text):
    """Kills ``text.startswith("-0") -> False`` in parse_rational: the canonical spelling of a rational is
    Python's ``str(Fraction(n, d))`` (lowest terms, d > 1 written only when it is not 1, no '-0'); exactly
    those strings are read, each other one is refused by the number-syntax check."""
    from certify.verifier.arith import parse_rational

    numerator, _, denominator = text.partition("/")
    try:
        canonical = str(Fraction(int(numerator), int(denominator or "1"))) == text and "+" not in text
    except (ValueError, ZeroDivisionError):
        canonical = False
    if canonical:
        assert parse_rational(text, "r") == Fraction(text)
    else:
        with pytest.raises(Rejection) as caught:
            parse_rational(text, "r")
        assert caught.value.check == "number syntax"


# --- arith.py: rational roots ---

def test_the_zero_polynomial_has_no_finite_list_of_roots():
    """Kills ``not f -> f`` and the deleted raise for the zero polynomial in rational_roots (kept, not
    removed as dead code: no polynomial a certificate makes the verifier solve is zero, but rational_roots
    is a primitive whose answer must be complete, and every rational is a root of 0 — sympy's
    ``Poly(0, x).is_zero`` — so the only exact answer is a refusal, not the crash f[0] would give)."""
    from certify.verifier.arith import rational_roots

    x = sympy.Symbol("x")
    for zero in ([], [0], [0, 0, 0]):
        assert sympy.Poly(list(reversed(zero)) or [0], x).is_zero
        with pytest.raises(Rejection) as caught:
            rational_roots(zero, 3, "test", Budget(10 ** 6, "lifting work"))
        assert (caught.value.check, caught.value.message) == ("rational roots", "test: the polynomial is zero")


# --- curves.py: point counts ---

def test_the_counting_formula_is_refused_at_the_prime_two():
    """Kills ``p > 2 -> True``, ``p > 2 -> p >= 2`` in count_points (kept, not removed as dead code: the
    callers in torsion.py, isogeny.py and rank.py refuse p = 2 first, but count_points is the primitive
    lseries.py calls with odd p only because it counts 2 otherwise, and its check is what makes the formula
    safe): completing the square needs 2 invertible, and at p = 2 the formula's count differs from
    cypari2's ellcard on y² + y = x³ − x², which has good reduction at 2 (Δ = −11)."""
    from certify.verifier.curves import count_points, counted_points, discriminant

    model = (0, -1, 1, 0, 0)
    assert discriminant(model) % 2 and counted_points(model, 2) != int(pari.ellcard(pari_curve(model), 2))
    with pytest.raises(Rejection) as caught:
        count_points(model, 2)
    assert (caught.value.check, caught.value.values) == ("point count", {"p": 2})


# --- torsion.py ---

def test_a_certificate_without_point_counts_cannot_bound_the_torsion():
    """Kills the deleted raise 'at least one prime is needed' in check_reduction_bound (and ``not primes ->
    primes``): the old reason (the schema's minItems refuses an empty list first) no longer holds, since
    verify() runs the schema after the kind's checks. With no prime the bound would be gcd() = 0, whose
    prime factors are none, so no ℓ-part would be asked for: the claim 'trivial torsion' for y² + y = x³ − x²
    (Z/5 by cypari2's elltors) would pass every check of torsion.py. It is refused by the reduction bound."""
    cert = torsion_certificate()
    cert["claim"] = {"invariants": [], "generators": []}
    cert["evidence"].update({"generator_orders": [], "primes": [], "ell_parts": []})
    assert torsion_order_by_pari(cert) == 5 and not torsion_claim_is_true(cert)
    failure = rejection(cert)
    assert (failure.check, failure.message) == ("reduction bound", "at least one prime is needed")


@pytest.mark.parametrize("invariant", ["0", "1"])
def test_an_invariant_below_two_is_refused_as_such(invariant):
    """Kills ``any(n < 2 for n in invariants) -> False`` in check_invariants (the old reason, the schema's
    pattern first, no longer holds: verify() runs the schema after the kind's checks): Z/0 and Z/1 are no
    invariant factors. The claim Z/n with the point (0, −1) of y² + y = x³ − x² (order 5 by cypari2's
    ellorder) is refused by the invariants check; without it, n = 0 passed the order check (no multiple
    tried) and divided by zero at the reduction bound."""
    cert = torsion_certificate()
    assert int(pari.ellorder(pari_curve(cert["curve"]), [0, -1])) == 5
    cert["claim"]["invariants"] = cert["evidence"]["generator_orders"] = [invariant]
    assert not torsion_claim_is_true(cert)
    failure = rejection(cert)
    assert failure.check == "invariants" and failure.values == {"invariants": [invariant]}


@pytest.mark.parametrize("u", [2, -2, 3])
@pytest.mark.parametrize("r", [1, -1])
def test_changes_with_r_one_and_u_not_a_unit_on_integral_models(u, r):
    """Kills ``whole[5] in (1, -1): 5 -> 6`` in change_model (the fast path for u = ±1 chosen by r instead of
    u: it multiplies by u^k where it must divide): changes [u, ±1, s, t] with u ≠ ±1 of an integral model,
    against cypari2's ellchangecurve."""
    from certify.verifier.curves import change_model

    a = (1, -1, 1, -3, 3)
    change = (Fraction(u), Fraction(r), Fraction(2), Fraction(-1))
    expected = pari.ellchangecurve(pari_curve(a), [str(c) for c in change])
    assert change_model(tuple(Fraction(c) for c in a), change) == tuple(Fraction(str(c)) for c in expected[:5])


# --- curves.py: the group E~(F_q) of the reduction (used by rank.py, whose tests the run leaves out here) ---

def residue_point(point) -> "tuple | None":
    """A point of cypari2 over F_q ([0], or coordinates Mod(x, q) or, at q = 3, elements of F_3 printed as
    integers) as the verifier's residue pair or None."""
    return None if len(point) == 1 else tuple(int(str(pari.lift(c) if c.type() == "t_INTMOD" else c))
                                               for c in point)


@pytest.mark.parametrize("q", [5, 7, 11])
def test_the_group_law_modulo_q_is_paris(q):
    """Kills the mutants of add_mod and multiple_mod (``p is None``, ``r is None``, ``x1 == x2``, the test for
    P + (−P) = O and ``n & 1``): for every pair of points of Ẽ(F_q) of y² + xy + y = x³ − x² − 3x + 3
    (Δ = −2⁷·13 by cypari2, good reduction at q), O included, the sum is cypari2's elladd over F_q, and
    n·P for n ≤ 2·#Ẽ(F_q) is cypari2's ellmul."""
    from certify.verifier.curves import add_mod, multiple_mod

    a = (1, -1, 1, -3, 3)
    E = pari.ellinit([pari.Mod(c, q) for c in a])
    points = [None] + [(x, y) for x in range(q) for y in range(q) if pari.ellisoncurve(E, [x, y])]
    assert len(points) == int(pari.ellcard(E))

    def pari_point(point):
        return [0] if point is None else [pari.Mod(point[0], q), pari.Mod(point[1], q)]

    for P in points:
        for R in points:
            assert add_mod(a, P, R, q) == residue_point(pari.elladd(E, pari_point(P), pari_point(R))), (P, R)
        for n in range(2 * len(points) + 1):
            assert multiple_mod(a, n, P, q) == residue_point(pari.ellmul(E, pari_point(P), n)), (P, n)


@pytest.mark.parametrize("q", [3, 5, 7, 11, 13])
def test_reduction_of_rational_points_is_a_homomorphism(q):
    """Kills the mutants of reduce_point (``point is None``, the test of the denominator of x against q):
    reduction modulo a prime of good reduction is a homomorphism E(Q) → Ẽ(F_q) (Silverman, VII.2), so the
    reduction of n·P, computed over Q by cypari2's ellmul, is n times the reduction of P, computed over F_q
    by cypari2; P = (0, 0) on y² + y = x³ − x (Δ = 37), of infinite order, and n up to twice the order of
    its reduction, so that the points whose x has q in its denominator (those reducing to O) are met."""
    from certify.verifier.curves import reduce_point

    a = (0, 0, 1, -1, 0)
    E, E_q = pari.ellinit(list(a)), pari.ellinit([pari.Mod(c, q) for c in a])
    P_q = [pari.Mod(0, q), pari.Mod(0, q)]
    order = int(pari.ellorder(E_q, P_q))
    for n in range(2 * order + 1):
        over_q = pari.ellmul(E, [0, 0], n)
        point = None if len(over_q) == 1 else (Fraction(str(over_q[0])), Fraction(str(over_q[1])))
        assert reduce_point(point, q) == residue_point(pari.ellmul(E_q, P_q, n)), n
