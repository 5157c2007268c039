"""Exact arithmetic for the verifier: strict number parsing, integer polynomials, rational roots.

Polynomials are lists of integers, constant term first. Nothing here searches: every routine is a
direct computation whose cost is bounded by its inputs.
"""
import math
import re
from fractions import Fraction
from math import gcd, isqrt

from certify.verifier.errors import Rejection
from certify.verifier.limits import MAX_DIGITS, MAX_HINT_PRIME, MAX_LIFTING_WORK, MAX_SQUAREFREE_DEGREE

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
    """Primality by trial division by 2, 3 and the numbers 6k ± 1 up to √n (every prime above 3 is one of
    them); the verifier only meets primes up to MAX_HINT_PRIME."""
    if n < 4:
        return n >= 2
    if n % 2 == 0 or n % 3 == 0:
        return False
    return all(n % d and n % (d + 2) for d in range(5, isqrt(n) + 1, 6))


def valuation(n: int, p: int) -> int:
    """v_p(n) for n ≠ 0 and a prime p, with O(log v) divisions: the powers p, p², p⁴, … that divide n,
    then the binary digits of v from the top (at each step the valuation left is below the next power)."""
    if p == 2:
        return (n & -n).bit_length() - 1
    powers = []
    while n % p == 0:
        powers.append(p)
        p *= p
    v = 0
    for i in reversed(range(len(powers))):
        if n % powers[i] == 0:
            n //= powers[i]
            v += 1 << i
    return v


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


class Budget:
    """What one certificate may still spend on a kind of work whose amount is known only as the checks
    run (e.g. the number of roots modulo a hint prime): each ``spend`` comes before the work it pays for."""

    def __init__(self, limit: int, check: str):
        self.limit, self.check, self.spent = limit, check, 0

    def spend(self, amount: int, what: str, **values) -> None:
        self.spent += amount
        if self.spent > self.limit:
            raise Rejection(self.check, f"{what}: the certificate needs more of this work than the verifier's limit "
                            f"of {self.limit}", spent=self.spent, **values)


def simple_roots_mod(f: list, p: int):
    """The roots of f in F_p if each of them is a simple root, else None."""
    f = [c % p for c in f]
    df = derivative(f)
    roots = [r for r in range(p) if poly_eval_mod(f, r, p) == 0]
    return roots if all(poly_eval_mod(df, r, p) for r in roots) else None


def rational_roots(f: list, p: int, what: str, budget: Budget) -> list:
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
    budget.spend(lifting_work(f, residues), what, roots_mod_p=len(residues), degree=len(f) - 1)
    lead, df = f[-1], derivative(f)
    exponent = lifting_exponent(p, 2 * abs(lead * f[0]))
    modulus = p ** exponent
    for r in residues:
        r = hensel_lift(f, df, r, p, exponent)
        candidate = (lead * r) % modulus
        if candidate > modulus // 2:
            candidate -= modulus
        root = Fraction(candidate, lead)
        if root and is_root(f, root):
            roots.append(root)
    return sorted(roots)


def lifting_exponent(p: int, bound: int) -> int:
    """The least e with p^e > bound (from a lower estimate by logarithms, then exactly)."""
    e = max(0, int((bound.bit_length() - 1) / math.log2(p)) - 1)
    power = p ** e
    while power <= bound:
        e, power = e + 1, power * p
    return e


def hensel_lift(f: list, df: list, r: int, p: int, e: int) -> int:
    """The root of f modulo p^e above the simple root r mod p, by Newton's iteration
    r ← r − f(r)/f′(r), which doubles the p-adic precision at each step (Hensel's lemma); the precisions
    run e, ⌈e/2⌉, … backwards, so that the last step works modulo p^e exactly."""
    precisions = []
    while e > 1:
        precisions.append(e)
        e = (e + 1) // 2
    for e in reversed(precisions):
        m = p ** e
        r = (r - poly_eval_mod(f, r, m) * pow(poly_eval_mod(df, r, m), -1, m)) % m
    return r


def lifting_work(f: list, residues: list) -> int:
    """The cost of lifting each root mod p to a modulus of about D = digits of 2·lc(f)·f(0) digits, by
    Newton steps of about deg f multiplications of D-digit numbers: deg f × D² / 10⁶ units per root."""
    digits = (f[-1] * f[0]).bit_length() * 30103 // 100000 + 2
    return len(residues) * (len(f) - 1) * digits * digits // 10 ** 6


def is_root(f: list, root: Fraction) -> bool:
    """Whether f(a/b) = 0 for the rational a/b ≠ 0 in lowest terms: exactly when bx − a divides f in Z[x]
    (Gauss's lemma, bx − a being primitive). With f = (bx − a)·q, c_i = b·q_(i−1) − a·q_i; the q_i are
    found by exact integer divisions, by a from the constant term up when |a| ≥ |b| and by b from the top
    down otherwise, so that |q_i| never exceeds Σ|c_i|; an inexact division ends the test."""
    a, b = root.numerator, root.denominator
    q = 0
    if abs(a) >= abs(b):
        for c in f[:-1]:
            q, remainder = divmod(b * q - c, a)
            if remainder:
                return False
        return f[-1] == b * q
    for c in reversed(f[1:]):
        q, remainder = divmod(c + a * q, b)
        if remainder:
            return False
    return f[0] == -a * q
