"""The kernel polynomial of a normalised ℓ-isogeny whose codomain is known, without division polynomials.

On y² = x³ + Ax + B the x-map of the normalised isogeny to y² = x³ + A′x + B′ is
X(x) = x + Σ_{k≥1} τ_k x^{−k}, and it solves f(x)·X′² = X³ + A′X + B′ (Stark 1972; Bostan, Morain,
Salvy and Schost 2008, Math. Comp. 77). Comparing coefficients of x^{2−k} gives
(2k + 3)·τ_k = R_k, with R_k built from τ_1 … τ_{k−1}, so τ_1 = (A − A′)/5 and τ_2 = (B − B′)/7 as in
Vélu's formulas. X − x = M/h² with deg M < deg h² = ℓ − 1, so the τ_k satisfy the linear recurrence
whose characteristic polynomial is h²; the Berlekamp–Massey algorithm finds it from 2(ℓ − 1) terms.
All of this runs modulo primes (see LARGE_PRIME_BITS), and the coefficients of h are recovered by the Chinese
remainder theorem and rational reconstruction; the candidate is then checked exactly (its Vélu codomain here, the isogeny identity by the caller).
"""
from fractions import Fraction
from math import isqrt
from operator import mul

from certify.pari import pari
from certify.verifier.isogeny import velu_codomain

MAX_PRIMES = 100
"""Primes tried before giving up (the first word-sized, the others of LARGE_PRIME_BITS bits)."""

LARGE_PRIME_BITS = 256
"""Size of the primes after the first: a 256-bit prime costs Python's integers about 2.5 times less per
bit of the residues than a word-sized one; the first prime is word-sized, so that a wrong codomain,
which fails at any prime, is rejected cheaply."""


def recurrence_terms(A: int, B: int, A2: int, B2: int, count: int, p: int) -> list:
    """[τ_1, …, τ_count] mod p for the formal solution X = x + Σ τ_k x^{−k} of f·X′² = X³ + A′X + B′.
    The convolutions run as C loops (map, sum); Σ i(k−1−i)·τ_i·τ_{k−1−i} is that of the i·τ_i."""
    tau = [0] * (count + 1)          # tau[k] = τ_k, tau[0] unused
    scaled = [0] * (count + 1)       # scaled[k] = k·τ_k
    squares = [0] * (count + 2)      # squares[m] = coefficient of x^{−m} in (X − x)²
    primes = [1, 0] + [0] * count    # primes[m] = coefficient of x^{−m} in X′²
    cubes = [0] * (count + 2)        # cubes[m] = coefficient of x^{−m} in (X − x)³
    for k in range(1, count + 1):
        products = sum(map(mul, scaled[1:k - 1], scaled[k - 2:0:-1]))
        value = products - 3 * squares[k - 1] + A * primes[k - 1] + (B * primes[k - 2] if k >= 2 else 0)
        value -= cubes[k - 2] if k >= 2 else 0
        value -= A2 if k == 1 else (tau[k - 2] * A2 if k >= 3 else 0)
        value -= B2 if k == 2 else 0
        tau[k] = value * pow(2 * k + 3, -1, p) % p
        scaled[k] = k * tau[k] % p
        squares[k] = sum(map(mul, tau[1:k], tau[k - 1:0:-1])) % p
        if k + 1 <= count:
            primes[k + 1] = (-2 * k * tau[k] + products) % p
        cubes[k] = sum(map(mul, squares[2:k], tau[k - 2:0:-1])) % p
    return tau[1:]


def berlekamp_massey(sequence: list, p: int) -> list:
    """The monic characteristic polynomial (constant term first) of the shortest linear recurrence
    that the sequence satisfies over F_p (Massey 1969)."""
    c, b = [1], [1]
    length, shift, last = 0, 1, 1
    for n, term in enumerate(sequence):
        discrepancy = (term + sum(map(mul, c[1:length + 1], sequence[n - length:n][::-1]))) % p
        if discrepancy == 0:
            shift += 1
            continue
        factor = discrepancy * pow(last, -1, p) % p
        previous = list(c)
        c = c + [0] * max(0, len(b) + shift - len(c))
        for i, coefficient in enumerate(b):
            c[i + shift] = (c[i + shift] - factor * coefficient) % p
        if 2 * length <= n:
            length, b, last, shift = n + 1 - length, previous, discrepancy, 1
        else:
            shift += 1
    c = (c + [0] * (length + 1))[:length + 1]
    return list(reversed(c))


def monic_square_root(square: list, p: int):
    """The monic h with h² = square over F_p, or None."""
    degree = (len(square) - 1) // 2
    if len(square) != 2 * degree + 1:
        return None
    h = [0] * degree + [1]
    half = pow(2, -1, p)
    for k in range(1, degree + 1):
        top = 2 * degree - k
        known = sum(h[i] * h[top - i] for i in range(top - degree, degree + 1) if i != degree - k
                    and top - i != degree - k)
        h[degree - k] = (square[top] - known) * half % p
    check = [0] * (2 * degree + 1)
    for i, x in enumerate(h):
        for j, y in enumerate(h):
            check[i + j] = (check[i + j] + x * y) % p
    return h if check == [c % p for c in square] else None


def reconstruct(residue: int, modulus: int):
    """The fraction u/v with |u|, v ≤ √(modulus/2) congruent to residue, if any (Wang 1981)."""
    bound = isqrt(modulus // 2)
    r0, r1, s0, s1 = modulus, residue % modulus, 0, 1
    while r1 > bound:
        q = r0 // r1
        r0, r1, s0, s1 = r1, r0 - q * r1, s1, s0 - q * s1
    if s1 == 0 or abs(s1) > bound:
        return None
    return Fraction(r1, s1)


def symmetric(residue: int, modulus: int) -> Fraction:
    """The integer of least absolute value congruent to residue (the kernel polynomials of integral short
    models are mostly integral: this needs half the modulus that ``reconstruct`` needs)."""
    residue %= modulus
    return Fraction(residue - modulus if 2 * residue > modulus else residue)


def kernel_from_codomain(A: Fraction, B: Fraction, A2: Fraction, B2: Fraction, ell: int):
    """The kernel polynomial (monic, constant term first) of the normalised ℓ-isogeny from
    y² = x³ + Ax + B to y² = x³ + A′x + B′, ℓ odd, or None if there is none. After each prime the
    integer and the rational candidate are formed; one that a further prime leaves unchanged is checked
    exactly, and None is returned when the rational one is stable and fails that check."""
    short, target = (0, 0, 0, Fraction(A), Fraction(B)), (0, 0, 0, Fraction(A2), Fraction(B2))
    count = 2 * (ell - 1) + 2
    residues, modulus, previous = None, 1, (None, None)
    p = int(pari.nextprime(2 ** 62))
    for _ in range(MAX_PRIMES):
        values = [int(Fraction(v).numerator * pow(Fraction(v).denominator, -1, p) % p) for v in (A, B, A2, B2)]
        square = berlekamp_massey(recurrence_terms(*values, count, p), p)
        if len(square) != ell:
            return None
        h = monic_square_root(square, p)
        if h is None:
            return None
        if residues is None:
            residues = h
        else:
            inverse = pow(modulus, -1, p)
            residues = [r + modulus * ((x - r) * inverse % p) for r, x in zip(residues, h)]
        modulus *= p
        whole = [symmetric(r, modulus) for r in residues]
        if whole == previous[0] and velu_codomain(short, ell, whole) == target:
            return whole
        candidate = [reconstruct(r, modulus) for r in residues]
        if None not in candidate and candidate == previous[1]:
            return candidate if velu_codomain(short, ell, candidate) == target else None
        previous = whole, candidate
        p = int(pari.nextprime(max(p, 2 ** LARGE_PRIME_BITS) + 1))
    return None
