"""Rational roots of integer polynomials for the certifier, and the prime hint from which the
verifier's exact routine (``certify.verifier.arith.rational_roots``) finds them again."""
from __future__ import annotations

from fractions import Fraction

from certify.pari import pari
from certify.verifier.arith import is_prime, simple_roots_mod, squarefree_part, trim
from certify.verifier.limits import MAX_HINT_PRIME, MAX_SQUAREFREE_DEGREE


def rational_roots(polynomial: list) -> list:
    """The rational roots of an integer polynomial, sorted (PARI factors it)."""
    if len(trim(polynomial)) <= 1:
        return []
    return sorted(Fraction(str(r)) for r in pari.nfroots(None, pari.Polrev(polynomial)))


def hint_prime(polynomial: list) -> int:
    """The least odd prime from which the verifier's ``rational_roots`` finds all rational roots:
    p ∤ lc(f) and every root of f in F_p simple, f the polynomial without its factors x (or, for small
    degree only, its squarefree part)."""
    f = trim(polynomial)
    while f and f[0] == 0:
        f = f[1:]
    candidates = [f] + ([squarefree_part(f)] if len(f) - 1 <= MAX_SQUAREFREE_DEGREE else [])
    p = 3
    while p <= MAX_HINT_PRIME:
        if any(g[-1] % p and simple_roots_mod(g, p) is not None for g in candidates):
            return p
        p += 2
        while not is_prime(p):
            p += 2
    raise ArithmeticError(f"no hint prime up to {MAX_HINT_PRIME}")


def roots_with_hint(polynomial: list) -> tuple[list, int]:
    """(rational roots, hint prime) of a non-zero integer polynomial."""
    return rational_roots(polynomial), hint_prime(polynomial)
