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
