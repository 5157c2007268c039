"""Tate's algorithm: the reduction type of an integral Weierstrass model at a prime p.

J. Tate, "Algorithm for determining the type of a singular fiber in an elliptic pencil", in Modular
Functions of One Variable IV, Springer LNM 476 (1975), 33–52; in the form of J. H. Silverman,
*Advanced Topics in the Arithmetic of Elliptic Curves*, GTM 151, IV.9.4, and J. E. Cremona,
*Algorithms for Modular Elliptic Curves*, 2nd ed., §3.2. Each step either stops with the Kodaira
symbol, the number m of components of the special fibre and the Tamagawa number c_p, or moves the
model by a translation x ↦ x + r, y ↦ y + sx + t (integral, so the model stays minimal if it was)
until p divides the coefficients to the next step's powers. If it passes the last step, the model
is not minimal at p. The conductor exponent is Ogg's formula f_p = v_p(Δ) − m + 1 (Ogg 1967; Saito
1988 for every p).

Everything is exact integer arithmetic. Questions about polynomials over F_p (a multiple root, whether
a quadratic splits, how many roots a cubic has) are answered by trying every residue for p ≤ 3 and
by closed formulas (Euler's criterion, Stickelberger's theorem and T^p mod the cubic) for p ≥ 5, so p
may be large.
"""
from dataclasses import dataclass

from certify.verifier.arith import valuation
from certify.verifier.curves import b_invariants, discriminant, translate
from certify.verifier.errors import Rejection

SMALL_PRIME = 3
"""Primes up to this are handled by trying every residue modulo p."""


@dataclass(frozen=True)
class LocalData:
    """The local data of a minimal model at p."""

    prime: int
    exponent: int
    """f_p, the exponent of p in the conductor."""
    kodaira: str
    """The Kodaira symbol in plain text: I0, I4, II, III, IV, I0*, I3*, IV*, III*, II*."""
    tamagawa: int
    """c_p, the order of the group of components defined over F_p."""
    reduction: str
    """good, split multiplicative, non-split multiplicative, or additive."""


def exact(value: int, p: int, k: int) -> int:
    """value / p^k, an integer: every call divides a coefficient by a power of p that the step before
    has made divide it (Silverman, *Advanced Topics*, IV.9.4, the proof of steps 6–11: after step 6,
    p | a2, p² | a4, p³ | a6; each move of the I_k* steps and of step 8 raises the power of p dividing a3,
    a4 or a6 by one, as the double root of the quadratic moved to 0 makes it vanish mod p)."""
    return value // p ** k


def legendre_is_square(value: int, p: int) -> bool:
    """Whether value is a non-zero square modulo the odd prime p (Euler's criterion)."""
    return value % p != 0 and pow(value, (p - 1) // 2, p) == 1


def quadratic_splits(a: int, b: int, c: int, p: int) -> bool:
    """Whether aX² + bX + c (p ∤ a, non-zero discriminant mod p) has a root in F_p."""
    if p <= SMALL_PRIME:
        return any((a * x * x + b * x + c) % p == 0 for x in range(p))
    return legendre_is_square(b * b - 4 * a * c, p)


def quadratic_double_root(a: int, b: int, c: int, p: int) -> int:
    """The double root in F_p of aX² + bX + c (p ∤ a, discriminant ≡ 0 mod p): −b/2a."""
    if p <= SMALL_PRIME:
        return next(x for x in range(p) if (a * x * x + b * x + c) % p == 0)
    return -b * pow(2 * a, -1, p) % p


def cubic_multiple_root(b: int, c: int, d: int, p: int) -> int:
    """The multiple root in F_p of T³ + bT² + cT + d with zero discriminant mod p: where P and P′ vanish.
    For p ≥ 5 it is −b/3 for a triple root (b² ≡ 3c), else (9d − bc)/(2(b² − 3c)) (from
    (T − α)²(T − β): b² − 3c = (α − β)² and 9d − bc = 2α(α − β)²)."""
    if p <= SMALL_PRIME:
        return next(x for x in range(p) if (x ** 3 + b * x * x + c * x + d) % p == 0
                    and (3 * x * x + 2 * b * x + c) % p == 0)
    spread = (b * b - 3 * c) % p
    if spread == 0:
        return -b * pow(3, -1, p) % p
    return (9 * d - b * c) * pow(2 * spread, -1, p) % p


def _multiply_mod_cubic(f: list, g: list, cubic: list, p: int) -> list:
    """f·g modulo the monic cubic T³ + cubic[2]T² + cubic[1]T + cubic[0], over F_p (f, g of degree ≤ 2)."""
    product = [0] * 5
    for i, x in enumerate(f):
        for j, y in enumerate(g):
            product[i + j] += x * y
    for k in (4, 3):
        top, product[k] = product[k] % p, 0
        for i in range(3):
            product[k - 3 + i] -= top * cubic[i]
    return [x % p for x in product[:3]]


def cubic_root_count(b: int, c: int, d: int, p: int) -> int:
    """The number of roots in F_p of P = T³ + bT² + cT + d, squarefree mod p. For p ≥ 5 by Stickelberger's
    theorem (the discriminant is a square exactly when the number of irreducible factors is odd): a
    non-square discriminant means one root; a square one means three roots if T^p ≡ T mod P, else none."""
    if p <= SMALL_PRIME:
        return sum(1 for x in range(p) if (x ** 3 + b * x * x + c * x + d) % p == 0)
    if not legendre_is_square(cubic_discriminant(b, c, d), p):
        return 1
    cubic = [d % p, c % p, b % p]
    power, base, e = [1, 0, 0], [0, 1, 0], p
    while e:
        if e & 1:
            power = _multiply_mod_cubic(power, base, cubic, p)
        base = _multiply_mod_cubic(base, base, cubic, p)
        e >>= 1
    return 3 if power == [0, 1, 0] else 0


def cubic_discriminant(b: int, c: int, d: int) -> int:
    """The discriminant b²c² − 4c³ − 4b³d − 27d² + 18bcd of T³ + bT² + cT + d: zero mod p exactly when
    the cubic has a multiple root in characteristic p."""
    return b * b * c * c - 4 * c ** 3 - 4 * b ** 3 * d - 27 * d * d + 18 * b * c * d


def singular_point(a, p: int) -> tuple:
    """(r, t) with (r, t) the singular point of the reduction mod p (p | Δ): for p ≤ 3 by trying every
    point; for p ≥ 5, r is the multiple root of 4x³ + b2x² + 2b4x + b6 (cubic_multiple_root, made monic)
    and t = −(a1r + a3)/2, from (2y + a1x + a3)² = 4x³ + b2x² + 2b4x + b6."""
    a1, a2, a3, a4, a6 = a
    if p <= SMALL_PRIME:
        return next((x, y) for x in range(p) for y in range(p)
                    if (y * y + a1 * x * y + a3 * y - x ** 3 - a2 * x * x - a4 * x - a6) % p == 0
                    and (2 * y + a1 * x + a3) % p == 0 and (a1 * y - 3 * x * x - 2 * a2 * x - a4) % p == 0)
    b2, b4, b6, _ = b_invariants(a)
    quarter, half = pow(4, -1, p), pow(2, -1, p)
    r = cubic_multiple_root(b2 * quarter, b4 * half, b6 * quarter, p)
    return r, -(a1 * r + a3) * half % p


def local_data(a, p: int) -> LocalData:
    """The local data at p of the integral model a, which must be minimal at p (else Rejection)."""
    n = valuation(discriminant(a), p)
    if n == 0:
        return LocalData(p, 0, "I0", 1, "good")
    r, t = singular_point(a, p)
    a = translate(a, r, 0, t)   # the singular point is now (0, 0): p | a3, a4, a6
    _, _, a3, _, a6 = a
    b2, _, b6, b8 = b_invariants(a)
    if b2 % p:
        return multiplicative(a, p, n)
    if a6 % p ** 2:
        return LocalData(p, n, "II", 1, "additive")
    if b8 % p ** 3:
        return LocalData(p, n - 1, "III", 2, "additive")
    if b6 % p ** 3:
        splits = quadratic_splits(1, exact(a3, p, 1), -exact(a6, p, 2), p)
        return LocalData(p, n - 2, "IV", 3 if splits else 1, "additive")
    a = translate(a, 0, *cusp_shift(a, p))
    _, a2, _, a4, a6 = a
    b, c, d = exact(a2, p, 1), exact(a4, p, 2), exact(a6, p, 3)
    spread = (b * b - 3 * c) % p
    if cubic_discriminant(b, c, d) % p:
        return LocalData(p, n - 4, "I0*", 1 + cubic_root_count(b, c, d, p), "additive")
    a = translate(a, p * cubic_multiple_root(b, c, d, p), 0, 0)
    if spread:
        return star_type(a, p, n)
    return starred_exceptional(a, p, n)


def multiplicative(a, p: int, n: int) -> LocalData:
    """Type I_n (a node at (0, 0)): split when the tangents y² + a1xy − a2x² = 0 are defined over F_p,
    that is when T² + a1T − a2 has a root in F_p; c_p = n if split, else 2 for n even and 1 for n odd."""
    split = quadratic_splits(1, a[0], -a[1], p)
    tamagawa = n if split else 2 - n % 2
    return LocalData(p, 1, f"I{n}", tamagawa, "split multiplicative" if split else "non-split multiplicative")


def cusp_shift(a, p: int) -> tuple:
    """(s, t) making p | a1, a2, p² | a3, a4, p³ | a6 once p² | a6, p³ | b8 and p³ | b6 (Silverman IV.9.4,
    step 6): for odd p, s = −a1/2 mod p and t = −a3/2 mod p³ (then a2 ≡ b2/4, a4 ≡ b4/2 with p² | b4 since
    b4² = b2b6 − 4b8, and a6 ≡ b6/4 mod p³); for p = 2, the first s < 2, t < 8 that works, which exists: the
    conditions depend only on the coefficients mod 8, and each of the 256 residue classes meeting the
    hypotheses has one (checked exhaustively)."""
    if p == 2:
        return next((s, t) for s in range(2) for t in range(8) if reaches_step_6(translate(a, 0, s, t)))
    half = pow(2, -1, p ** 3)
    return -a[0] * half % p, -a[2] * half % p ** 3


def reaches_step_6(a) -> bool:
    """2 | a1, a2, 4 | a3, a4 and 8 | a6: the model step 6 needs at p = 2."""
    a1, a2, a3, a4, a6 = a
    return a1 % 2 == 0 and a2 % 2 == 0 and a3 % 4 == 0 and a4 % 4 == 0 and a6 % 8 == 0


def star_type(a, p: int, n: int) -> LocalData:
    """Type I_k* (the cubic has a double root, now at 0; Silverman IV.9.4, step 7). Step k alternately
    asks whether Y² + (a3/p^j)Y − a6/p^(k+3) (k odd, j = (k+3)/2) or (a2/p)X² + (a4/p^(j+1))X + a6/p^(k+3)
    (k even, j = (k+2)/2) has distinct roots mod p: then the type is I_k*, with c_p = 4 if they lie in
    F_p and 2 if not; otherwise its double root is moved to 0 by y ↦ y + y0·p^j (x ↦ x + x0·p^j)."""
    for k in range(1, n + 1):
        a1, a2, a3, a4, a6 = a
        if k % 2:
            j = (k + 3) // 2
            quadratic = (1, exact(a3, p, j), -exact(a6, p, k + 3))
        else:
            j = (k + 2) // 2
            quadratic = (exact(a2, p, 1), exact(a4, p, j + 1), exact(a6, p, k + 3))
        if (quadratic[1] ** 2 - 4 * quadratic[0] * quadratic[2]) % p:
            return LocalData(p, n - k - 4, f"I{k}*", 4 if quadratic_splits(*quadratic, p) else 2, "additive")
        root = quadratic_double_root(*quadratic, p) * p ** j
        a = translate(a, 0, 0, root) if k % 2 else translate(a, root, 0, 0)
    raise Rejection("tate algorithm", "the I_n* steps do not end within v_p(Δ) steps", p=p)


def starred_exceptional(a, p: int, n: int) -> LocalData:
    """Types IV*, III*, II* (the cubic has a triple root, now at 0; Silverman IV.9.4, steps 8–11): IV* when
    Y² + (a3/p²)Y − a6/p⁴ has distinct roots mod p (c_p = 3 if in F_p, else 1); else its double root moves
    to 0 and the type is III* if p⁴ ∤ a4, II* if p⁶ ∤ a6; past that the model is not minimal at p."""
    quadratic = (1, exact(a[2], p, 2), -exact(a[4], p, 4))
    if (quadratic[1] ** 2 - 4 * quadratic[2]) % p:
        return LocalData(p, n - 6, "IV*", 3 if quadratic_splits(*quadratic, p) else 1, "additive")
    a = translate(a, 0, 0, quadratic_double_root(*quadratic, p) * p ** 2)
    if a[3] % p ** 4:
        return LocalData(p, n - 7, "III*", 2, "additive")
    if a[4] % p ** 6:
        return LocalData(p, n - 8, "II*", 1, "additive")
    raise Rejection("minimal model", "the model is not minimal at p (Tate's algorithm passes type II*)", p=p)
