"""Rational roots of integer polynomials for the certifier, and the prime hint from which the
verifier's exact routine (``certify.verifier.arith.rational_roots``) finds them again."""
from __future__ import annotations

from fractions import Fraction

from certify.pari import pari
from certify.verifier.arith import is_prime, poly_eval_mod, simple_roots_mod, squarefree_part, trim
from certify.verifier.limits import MAX_HINT_PRIME, MAX_SQUAREFREE_DEGREE


ROOT_FILTER_PRIMES = (3, 5, 7, 11, 13)
"""Primes at which a polynomial is first searched for roots: with none modulo p ∤ lc(f) it has no
rational root (a root a/b has p ∤ b and reduces to one), and PARI need not factor it."""


def rational_roots(polynomial: list) -> list:
    """The rational roots of an integer polynomial, sorted (PARI factors it, unless it has no root
    modulo one of ROOT_FILTER_PRIMES)."""
    f = [int(c) for c in trim(polynomial)]
    if len(f) <= 1 or any(f[-1] % p and not any(poly_eval_mod(f, r, p) == 0 for r in range(p))
                          for p in ROOT_FILTER_PRIMES):
        return []
    return sorted(Fraction(str(r)) for r in pari.nfroots(None, pari.Polrev(f)))


SIMPLE_HINT_BOUND = 13
"""Primes tried for a hint at which the polynomial itself has simple roots, before its squarefree part
is taken: the verifier then skips its Euclid over Q. A squarefree polynomial nearly always has one this
small; one that is not (φ_2 − x(T)ψ_2² for a point T of order 2 is a square) has none at all."""


def hint_prime(polynomial: list) -> int:
    """An odd prime from which the verifier's ``rational_roots`` finds all rational roots: p ∤ lc(f) and
    every root of f in F_p simple, f the polynomial without its factors x (or, for small degree only,
    its squarefree part). The least such p up to SIMPLE_HINT_BOUND for f itself, else the least for f
    or its squarefree part (f has multiple roots mod every p exactly when it is not squarefree)."""
    f = trim(polynomial)
    while f and f[0] == 0:
        f = f[1:]
    found = _least_hint([f], SIMPLE_HINT_BOUND)
    if found is None:
        found = _least_hint([f] + ([squarefree_part(f)] if len(f) - 1 <= MAX_SQUAREFREE_DEGREE else []),
                            MAX_HINT_PRIME)
    if found is None:
        raise ArithmeticError(f"no hint prime up to {MAX_HINT_PRIME}")
    return found


def _least_hint(candidates: list, bound: int):
    """The least odd prime p ≤ bound at which one of the polynomials has p ∤ lc and simple roots mod p."""
    p = 3
    while p <= bound:
        if any(g[-1] % p and simple_roots_mod(g, p) is not None for g in candidates):
            return p
        p += 2
        while not is_prime(p):
            p += 2
    return None


def roots_with_hint(polynomial: list) -> tuple[list, int]:
    """(rational roots, hint prime) of a non-zero integer polynomial."""
    return rational_roots(polynomial), hint_prime(polynomial)
