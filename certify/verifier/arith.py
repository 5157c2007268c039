"""Exact arithmetic for the verifier: strict number parsing, integer polynomials, rational roots.

Polynomials are lists of integers, constant term first. Nothing here searches: every routine is a
direct computation whose cost is bounded by its inputs.
"""
import re
from fractions import Fraction
from math import gcd, isqrt

from certify.verifier.errors import Rejection
from certify.verifier.limits import MAX_DIGITS, MAX_HINT_PRIME, MAX_SQUAREFREE_DEGREE

_INTEGER = re.compile(r"-?(0|[1-9][0-9]*)")
_RATIONAL = re.compile(r"-?(0|[1-9][0-9]*)(/[1-9][0-9]*)?")


def parse_integer(text, what: str) -> int:
    """An integer written canonically as a decimal string ('-12'; not '+12', '012', '1e3', '-0')."""
    if not isinstance(text, str) or not _INTEGER.fullmatch(text) or text == "-0":
        raise Rejection("number syntax", f"{what} is not an integer in canonical decimal form", value=text)
    if len(text) > MAX_DIGITS:
        raise Rejection("number size", f"{what} has more than {MAX_DIGITS} digits", digits=len(text))
    return int(text)


def parse_rational(text, what: str) -> Fraction:
    """A rational written canonically as 'n' or 'n/d' with d > 1 and gcd(n, d) = 1."""
    if not isinstance(text, str) or not _RATIONAL.fullmatch(text) or text.startswith("-0"):
        raise Rejection("number syntax", f"{what} is not a rational in canonical form n or n/d", value=text)
    numerator, _, denominator = text.partition("/")
    if max(len(numerator), len(denominator)) > MAX_DIGITS:
        raise Rejection("number size", f"{what} has more than {MAX_DIGITS} digits", digits=len(text))
    value = Fraction(int(numerator), int(denominator or "1"))
    if denominator and (denominator == "1" or value.denominator != int(denominator)):
        raise Rejection("number syntax", f"{what} is not in lowest terms with denominator > 1", value=text)
    return value


def is_prime(n: int) -> bool:
    """Primality by trial division; the verifier only meets primes up to MAX_HINT_PRIME."""
    if n < 2:
        return False
    return all(n % d for d in range(2, isqrt(n) + 1))


def prime_factors(n: int) -> list:
    """The distinct prime factors of a positive integer by trial division (n is a small group order here)."""
    factors, d = [], 2
    while d * d <= n:
        if n % d == 0:
            factors.append(d)
            while n % d == 0:
                n //= d
        d += 1
    return factors + ([n] if n > 1 else [])


def rational_square_root(value: Fraction):
    """The non-negative rational square root of ``value``, or None if it is not a square in Q."""
    if value < 0:
        return None
    root_n, root_d = isqrt(value.numerator), isqrt(value.denominator)
    if root_n * root_n == value.numerator and root_d * root_d == value.denominator:
        return Fraction(root_n, root_d)
    return None


# --- integer polynomials, constant term first ---

def trim(f: list) -> list:
    """f without leading zero coefficients."""
    f = list(f)
    while f and f[-1] == 0:
        f.pop()
    return f


def poly_add(f: list, g: list) -> list:
    size = max(len(f), len(g))
    return trim([(f[i] if i < len(f) else 0) + (g[i] if i < len(g) else 0) for i in range(size)])


def poly_scale(c, f: list) -> list:
    return trim([c * a for a in f])


def poly_sub(f: list, g: list) -> list:
    return poly_add(f, poly_scale(-1, g))


def poly_mul(f: list, g: list) -> list:
    if not f or not g:
        return []
    out = [0] * (len(f) + len(g) - 1)
    for i, a in enumerate(f):
        if a:
            for j, b in enumerate(g):
                out[i + j] += a * b
    return trim(out)


def poly_eval(f: list, x):
    """f(x) by Horner's rule, exactly (x an int or Fraction)."""
    value = 0
    for a in reversed(f):
        value = value * x + a
    return value


def poly_eval_mod(f: list, x: int, m: int) -> int:
    value = 0
    for a in reversed(f):
        value = (value * x + a) % m
    return value


def derivative(f: list) -> list:
    return trim([i * a for i, a in enumerate(f)][1:])


def clear_denominators(f: list) -> list:
    """The integer polynomial d·f, where d is the least common denominator of the coefficients of f."""
    common = 1
    for a in f:
        common = common * Fraction(a).denominator // gcd(common, Fraction(a).denominator)
    return trim([int(Fraction(a) * common) for a in f])


def _remainder(f: list, g: list) -> list:
    """The remainder of f modulo g ≠ 0 over Q (coefficients Fractions)."""
    f = [Fraction(c) for c in f]
    while len(f) >= len(g):
        factor, shift = f[-1] / g[-1], len(f) - len(g)
        f = trim([c - factor * g[i - shift] if i >= shift else c for i, c in enumerate(f)])
    return f


def _quotient(f: list, g: list) -> list:
    """The exact quotient f/g over Q."""
    f, quotient = [Fraction(c) for c in f], [Fraction(0)] * (len(f) - len(g) + 1)
    while len(f) >= len(g):
        factor, shift = f[-1] / g[-1], len(f) - len(g)
        quotient[shift] = factor
        f = trim([c - factor * g[i - shift] if i >= shift else c for i, c in enumerate(f)])
    return quotient


def squarefree_part(f: list) -> list:
    """f / gcd(f, f′) as an integer polynomial: the same roots, each simple (Euclid's algorithm over Q)."""
    a, b = trim(f), derivative(f)
    while b:
        a, b = b, _remainder(a, b)
    return f if len(a) <= 1 else clear_denominators(_quotient(f, a))


def simple_roots_mod(f: list, p: int):
    """The roots of f in F_p if each of them is a simple root, else None."""
    f = [c % p for c in f]
    df = derivative(f)
    roots = [r for r in range(p) if poly_eval_mod(f, r, p) == 0]
    return roots if all(poly_eval_mod(df, r, p) for r in roots) else None


def rational_roots(f: list, p: int, what: str) -> list:
    """All rational roots of the non-zero integer polynomial f, found exactly from the prime hint p.

    Statement used (Hensel's lemma; rational root theorem): if p ∤ lc(f) and every root of f in F_p is
    simple, each rational root a/b (lowest terms, b | lc(f), a | f(0) when f(0) ≠ 0) is p-integral and
    is the p-adic lift of exactly one root r of f mod p. Lifting r to precision M > 2·|lc(f)·f(0)|
    determines the integer lc(f)·a/b as the symmetric residue of lc(f)·r mod M; that candidate is then
    checked by exact evaluation. Hence the returned list is complete, without any search. When a root
    mod p is multiple and deg f ≤ MAX_SQUAREFREE_DEGREE, f is replaced by its squarefree part, which
    has the same roots.
    """
    f = trim(f)
    if not f:
        raise Rejection("rational roots", f"{what}: the polynomial is zero")
    roots = []
    if f[0] == 0:
        roots.append(Fraction(0))
        while f[0] == 0:
            f = f[1:]
    if len(f) == 1:
        return roots
    if not (2 < p <= MAX_HINT_PRIME and is_prime(p)):
        raise Rejection("rational roots", f"{what}: the hint is not an odd prime up to {MAX_HINT_PRIME}", p=p)
    residues = simple_roots_mod(f, p) if f[-1] % p else None
    if residues is None and len(f) - 1 <= MAX_SQUAREFREE_DEGREE:
        f = squarefree_part(f)
        residues = simple_roots_mod(f, p) if f[-1] % p else None
    if residues is None:
        raise Rejection("rational roots", f"{what}: the hint prime divides the leading coefficient or a root "
                        f"modulo it is not simple (squarefree parts are taken only up to degree "
                        f"{MAX_SQUAREFREE_DEGREE})", p=p, degree=len(f) - 1)
    lead, bound, df = f[-1], 2 * abs(f[-1] * f[0]), derivative(f)
    for r in residues:
        modulus = p
        while modulus <= bound:
            modulus *= modulus
            r = (r - poly_eval_mod(f, r, modulus) * pow(poly_eval_mod(df, r, modulus), -1, modulus)) % modulus
        candidate = (lead * r) % modulus
        if candidate > modulus // 2:
            candidate -= modulus
        root = Fraction(candidate, lead)
        if poly_eval(f, root) == 0:
            roots.append(root)
    return sorted(roots)
