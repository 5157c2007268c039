"""The torsion certifier: finds E(Q)_tors and the evidence that nothing is missing.

Search and proof are the same computation. On the reduced minimal model (or only an integral one,
when minimality would need an infeasible factorisation), the rational ℓ-torsion points come from the
rational roots of the ℓ-torsion polynomial; a point Q is ℓ-divisible exactly when φ_ℓ − x(Q)ψ_ℓ² has
a rational root x with f(x) a rational square. Dividing until no class of
G/ℓG divides gives E(Q)[ℓ^∞] (see ``certify.verifier.torsion`` for the argument), and the roots met
on the way, with a prime hint for each polynomial, are the evidence. Point counts at good odd primes
(PARI's ellap) bound the order and decide which primes ℓ need that evidence at all.
"""
from __future__ import annotations

from math import gcd

from certify.curves import Curve, FactoringTooHard, format_rational, inverse_change
from certify.pari import frobenius_trace, odd_primes
from certify.verifier import theorems
from certify.roots import hint_prime, rational_roots
from certify.verifier.arith import prime_factors
from certify.verifier.curves import (add, change_point, division_by_ell_polynomial, multiple, negate,
                                     points_with_x, torsion_polynomial)
from certify.verifier.torsion import FORMAT, RELIES_ON

SEARCH_PRIMES = 40
"""Number of good odd primes whose point counts bound the torsion before division polynomials decide."""


def certify_torsion(a, given=None) -> dict:
    """The torsion certificate of the curve with coefficients ``a`` (five Fractions)."""
    curve = Curve(a)
    try:
        reduced, change = curve.minimal_model()
    except FactoringTooHard:
        reduced, change = curve.integral_model()
    model = reduced.a
    counts = good_reduction_counts(model, SEARCH_PRIMES)
    evidence_by_ell, generators = {}, []
    for ell in prime_factors(_gcd_all(counts.values())):
        ell_generators, evidence_by_ell[ell] = ell_primary_part(model, ell, change)
        generators += ell_generators
    group = closure(model, generators)
    invariants, model_generators = structure(model, group)
    primes = bounding_primes(counts, len(group))
    bound = _gcd_all(counts[p] for p in primes)
    back = inverse_change(change)
    return {
        "format": FORMAT,
        "version": "1",
        "curve": [format_rational(c) for c in curve.a],
        "claim": {
            "invariants": [str(n) for n in invariants],
            "generators": [_point_strings(change_point(P, back)) for P in model_generators],
        },
        "evidence": {
            "generator_orders": [str(n) for n in invariants],
            "integral_model": {"change": [format_rational(v) for v in change],
                               "curve": [format_rational(c) for c in model]},
            "primes": [{"p": str(p), "count": str(counts[p])} for p in primes],
            "ell_parts": [evidence_by_ell[ell] for ell in prime_factors(bound // len(group))],
        },
        "relies_on": theorems.entries(RELIES_ON),
    }


def good_reduction_counts(model, how_many: int) -> dict:
    """{p: #E(F_p)} for the first ``how_many`` odd primes of good reduction of the integral model, or
    fewer when their gcd is already 1: no further count can lower it, and the torsion is trivial."""
    delta = int(Curve(model).discriminant)
    counts, bound = {}, 0
    for p in odd_primes():
        if delta % p:
            counts[p] = p + 1 - frobenius_trace(model, p)
            bound = gcd(bound, counts[p])
            if len(counts) == how_many or bound == 1:
                return counts


def bounding_primes(counts: dict, order: int) -> list:
    """The primes, in increasing order, each of which lowers the gcd of the counts before it."""
    chosen, bound = [], 0
    for p in sorted(counts):
        if bound == order:
            break
        if gcd(bound, counts[p]) != bound:
            chosen.append(p)
            bound = gcd(bound, counts[p])
    return chosen


def ell_primary_part(model, ell: int, change) -> tuple[list, dict]:
    """Generators of E(Q)[ℓ^∞] on the model, and the ``ell_parts`` evidence entry for ℓ."""
    polynomial = torsion_polynomial(model, ell)
    torsion_roots = rational_roots(polynomial)
    generators = [P for x in torsion_roots for P in points_with_x(model, x)]
    while True:
        group = closure(model, generators)
        classes = []
        for q in class_representatives(model, group, ell):
            division = division_by_ell_polynomial(model, ell, q[0])
            roots = rational_roots(division)
            preimages = [P for x in roots for P in points_with_x(model, x)]
            if preimages:
                P = preimages[0]
                generators.append(P if multiple(model, ell, P) == q else negate(model, P))
                break
            classes.append({"point": _point_strings(change_point(q, inverse_change(change))),
                            "prime": str(hint_prime(division)), "roots": [format_rational(x) for x in roots]})
        else:
            return generators, {
                "ell": str(ell),
                "torsion": {"prime": str(hint_prime(polynomial)),
                            "roots": [format_rational(x) for x in torsion_roots]},
                "classes": classes,
            }


def class_representatives(model, group: list, ell: int) -> list:
    """One point for each pair {C, −C} of non-zero classes of G/ℓG, the simplest first."""
    scaled = frozenset(multiple(model, ell, g) for g in group)
    seen, representatives = {scaled}, []
    for g in sorted(group[1:], key=_point_size):
        coset = frozenset(add(model, g, h) for h in scaled)
        if coset not in seen:
            representatives.append(g)
            seen |= {coset, frozenset(add(model, negate(model, g), h) for h in scaled)}
    return representatives


def closure(model, generators: list) -> list:
    """The subgroup generated by the points (a finite torsion group), O first."""
    elements = [None]
    for P in generators:
        if P in elements:
            continue
        multiples, current = [], P
        while current is not None:
            multiples.append(current)
            current = add(model, current, P)
        elements = list(dict.fromkeys([add(model, e, m) for e in elements for m in [None] + multiples]))
        if len(elements) > 16:
            raise AssertionError("a torsion group larger than Mazur's bound: the division search is wrong")
    return elements


def structure(model, group: list) -> tuple[list, list]:
    """Invariants [n1, n2] (n1 | n2; [] for the trivial group) and generators of orders n1, n2."""
    by_size = sorted(group[1:], key=_point_size)
    orders = {P: _order(model, P) for P in by_size}
    n2 = max(orders.values(), default=1)
    n1 = len(group) // n2
    if n2 == 1:
        return [], []
    second = next(P for P in by_size if orders[P] == n2)
    if n1 == 1:
        return [n2], [second]
    first = next(P for P in by_size if orders[P] == n1 and len(closure(model, [P, second])) == len(group))
    return [n1, n2], [first, second]


def _order(model, P) -> int:
    n, current = 1, P
    while current is not None:
        current, n = add(model, current, P), n + 1
    return n


def _gcd_all(values) -> int:
    result = 0
    for v in values:
        result = gcd(result, v)
    return result


def _point_size(P) -> tuple:
    """A sort key that puts points of small height first, then orders by coordinates."""
    x, y = P
    return (max(abs(x.numerator), x.denominator), x, y)


def _point_strings(P) -> list:
    return [format_rational(P[0]), format_rational(P[1])]
