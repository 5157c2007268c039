"""Where the rational ℓ-isogenies of a curve can be: Frobenius witnesses, the rational points of the
genus-0 curves X_0(ℓ), the finite j-lists, and the codomains of the isogenies of large degree.

The published facts themselves (the Hauptmoduln P_ℓ(t)/t and the j-lists) live in the verifier,
certify.verifier.isogeny, which checks every witness found here."""
from fractions import Fraction
from itertools import combinations

from certify.curves import Curve
from certify.pari import frobenius_trace, odd_primes, pari
from certify.verifier.arith import poly_scale, poly_sub
from certify.verifier.isogeny import FINITE_J, X0_NUMERATORS

FROBENIUS_PRIME_BOUND = 1000
"""Good primes searched for a Frobenius witness; past it the exact witnesses take over."""

PARTNER_J = {11: {FINITE_J[11][0]: FINITE_J[11][2], FINITE_J[11][2]: FINITE_J[11][0]},
             17: {FINITE_J[17][0]: FINITE_J[17][1], FINITE_J[17][1]: FINITE_J[17][0]},
             37: {FINITE_J[37][0]: FINITE_J[37][1], FINITE_J[37][1]: FINITE_J[37][0]}}
"""ℓ → {j: j of the codomain} for the non-CM j of the finite lists (checked against cypari2's
ellisomat in tests); for the CM j (ℓ = 11 at −2¹⁵, and ℓ = 19, 43, 67, 163) the codomain has the same j."""


def frobenius_witnesses(model: Curve, ells) -> dict:
    """{ℓ: the least odd good prime p ≠ ℓ below FROBENIUS_PRIME_BOUND with a_p² − 4p a non-zero
    non-square mod ℓ}, for the odd ℓ that have one; a_p is an isogeny invariant, so one search serves
    the whole class."""
    delta = int(model.discriminant)
    found = {}
    for p in odd_primes():
        if len(found) == len(ells) or p >= FROBENIUS_PRIME_BOUND:
            break
        if delta % p == 0:
            continue
        trace = frobenius_trace(model.a, p)
        for ell in ells:
            if ell not in found and ell != p:
                value = (trace * trace - 4 * p) % ell
                if value and pow(value, (ell - 1) // 2, ell) == ell - 1:
                    found[ell] = p
    return found


def x0_polynomial(ell: int, j: Fraction) -> list:
    """den(j)·P_ℓ(t) − num(j)·t, whose rational roots are the rational ℓ-isogenies when j ≠ 0, 1728."""
    return poly_sub(poly_scale(j.denominator, X0_NUMERATORS[ell]), [0, j.numerator])


TWIST_TEST_PRIMES = 200
"""Primes searched for the twist tests of ``codomain_candidates``: only a p with a_p ≠ 0 tells twists
apart, and a curve with CM by Q(√−163) has a_p = 0 at every p < 41 (all inert)."""


def codomain_candidates(model: Curve, ell: int):
    """Short models (A′, B′) that may be the normalised codomain of the ℓ-isogeny of the model's
    short model y² = x³ − 27c4x − 54c6, for ℓ with a finite j-list.

    The codomain has the partner j (or the same j for CM), so it is a quadratic twist, by d, of any one
    curve with that j; a_p(E^d) = (d/p)·a_p(E) for good p fixes d among the divisors of the bad primes
    and −1 (up to the CM twist, which keeps every a_p). Between minimal models the pull-back of the
    Néron differential is multiplied by an integer dividing ℓ (the dual composes to [ℓ]), so the
    normalised codomain is the twist's short minimal model scaled by u ∈ {1, ℓ, 1/ℓ}."""
    j = model.j
    target_j = PARTNER_J.get(ell, {}).get(j, j)
    if target_j == j:  # CM by the maximal order of Q(√−ℓ): most often the −ℓ twist itself, scaled by u = 1
        yield -27 * model.c4 * ell ** 2, 54 * model.c6 * ell ** 3
    base = (0, 0, 0, 3 * target_j * (1728 - target_j), 2 * target_j * (1728 - target_j) ** 2)
    E = pari.ellinit([int(c) for c in model.a])
    bad = {int(q) for q in pari.factor(abs(int(model.discriminant)))[0]}
    base_min, _ = Curve(base).minimal_model()
    bad |= {int(q) for q in pari.factor(abs(int(base_min.discriminant)))[0]} | {2}
    tests = []  # (p, a_p(E)) for the first 12 good p with a_p ≠ 0
    for q in (int(x) for x in pari.primes(TWIST_TEST_PRIMES)):
        if q not in bad and len(tests) < 12 and int(pari.ellap(E, q)):
            tests.append((q, int(pari.ellap(E, q))))
    support = sorted(bad)
    for size in range(len(support) + 1):
        for subset in combinations(support, size):
            for sign in (1, -1):
                d = sign
                for q in subset:
                    d *= q
                twist, _ = Curve(_twisted(base_min, d)).minimal_model()
                T = pari.ellinit([int(c) for c in twist.a])
                if all(int(pari.ellap(T, q)) == trace for q, trace in tests):
                    c4, c6 = twist.c4, twist.c6
                    for u in (Fraction(1), Fraction(ell), Fraction(1, ell)):
                        yield -27 * c4 / u ** 4, -54 * c6 / u ** 6


def _twisted(model: Curve, d: int) -> tuple:
    """The quadratic twist by d: y² = x³ − 27d²c4·x − 54d³c6."""
    return 0, 0, 0, -27 * d * d * model.c4, -54 * d ** 3 * model.c6
