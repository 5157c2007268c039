"""Weierstrass curves for the verifier: invariants, changes of variables, group law, point counts,
division polynomials. Coefficients are (a1, a2, a3, a4, a6) as Fractions; points are pairs (x, y)
of Fractions, and None is the point at infinity O.
"""
import functools
from fractions import Fraction

from certify.verifier.arith import is_prime, poly_mul, poly_scale, poly_sub, rational_square_root, trim
from certify.verifier.errors import Rejection


def b_invariants(a) -> tuple:
    """(b2, b4, b6, b8) of Silverman, *The Arithmetic of Elliptic Curves*, III.1."""
    a1, a2, a3, a4, a6 = a
    return (a1 * a1 + 4 * a2, 2 * a4 + a1 * a3, a3 * a3 + 4 * a6,
            a1 * a1 * a6 + 4 * a2 * a6 - a1 * a3 * a4 + a2 * a3 * a3 - a4 * a4)


def c_invariants(a) -> tuple:
    """(c4, c6) of Silverman III.1."""
    b2, b4, b6, _ = b_invariants(a)
    return b2 * b2 - 24 * b4, -b2 ** 3 + 36 * b2 * b4 - 216 * b6


def integral(values):
    """The values as ints when every one is an integer, else None. Exact arithmetic on ints is some fifty
    times faster than on Fractions; the callers give their results back as Fractions when any input was one."""
    if all(isinstance(v, int) or v.denominator == 1 for v in values):
        return tuple(int(v) for v in values)
    return None


def as_inputs(values, inputs) -> tuple:
    """The values (ints) as Fractions if any of the inputs is a Fraction, else as they are."""
    return tuple(Fraction(v) for v in values) if any(isinstance(v, Fraction) for v in inputs) else tuple(values)


def discriminant(a) -> Fraction:
    """Δ = −b2²b8 − 8b4³ − 27b6² + 9b2b4b6 (Silverman III.1); the curve is singular exactly when Δ = 0."""
    whole = integral(a)
    b2, b4, b6, b8 = b_invariants(a if whole is None else whole)
    delta = -b2 * b2 * b8 - 8 * b4 ** 3 - 27 * b6 * b6 + 9 * b2 * b4 * b6
    return delta if whole is None else as_inputs((delta,), a)[0]


def translate(a, r, s, t) -> tuple:
    """The coefficients u^i·a_i' after x = u²x' + r, y = u³y' + su²x' + t, which do not depend on u
    (Silverman III.1, Table 3.1); for u = 1 the new model, and integers stay integers."""
    a1, a2, a3, a4, a6 = a
    return (a1 + 2 * s,
            a2 - s * a1 + 3 * r - s * s,
            a3 + r * a1 + 2 * t,
            a4 - s * a3 + 2 * r * a2 - (t + r * s) * a1 + 3 * r * r - 2 * s * t,
            a6 + r * a4 + r * r * a2 + r ** 3 - t * a3 - t * t - r * t * a1)


def change_model(a, change) -> tuple:
    """The coefficients after x = u²x' + r, y = u³y' + su²x' + t (Silverman III.1, Table 3.1)."""
    u, r, s, t = change
    if u == 0:
        raise Rejection("model change", "u must be non-zero", u=u)
    whole = integral((*a, *change))
    if whole is not None and whole[5] in (1, -1):   # the usual case, u = ±1 on an integral model: in ints
        image = translate(whole[:5], *whole[6:])
        return as_inputs((c * whole[5] ** k for c, k in zip(image, (1, 2, 3, 4, 6))), (*a, *change))
    a1, a2, a3, a4, a6 = translate(a, r, s, t)
    return a1 / u, a2 / u ** 2, a3 / u ** 3, a4 / u ** 4, a6 / u ** 6


def change_point(point, change):
    """The image of a point under the same change of variables."""
    if point is None:
        return None
    u, r, s, t = change
    x, y = point
    return (x - r) / u ** 2, (y - s * (x - r) - t) / u ** 3


def on_curve(a, point) -> bool:
    if point is None:
        return True
    a1, a2, a3, a4, a6 = a
    x, y = point
    return y * y + a1 * x * y + a3 * y == x ** 3 + a2 * x * x + a4 * x + a6


def negate(a, point):
    """−(x, y) = (x, −y − a1x − a3) (Silverman III.2.3)."""
    if point is None:
        return None
    x, y = point
    return x, -y - a[0] * x - a[2]


def add(a, p, q):
    """P + Q by the chord-and-tangent rule (Silverman III.2.3), exactly over Q."""
    if p is None:
        return q
    if q is None:
        return p
    a1, a2, a3, a4, a6 = a
    (x1, y1), (x2, y2) = p, q
    if x1 == x2:
        if y1 + y2 + a1 * x2 + a3 == 0:
            return None
        slope = (3 * x1 * x1 + 2 * a2 * x1 + a4 - a1 * y1) / (2 * y1 + a1 * x1 + a3)
    else:
        slope = (y2 - y1) / (x2 - x1)
    x3 = slope * slope + a1 * slope - a2 - x1 - x2
    y3 = -(slope + a1) * x3 - (y1 - slope * x1) - a3
    return x3, y3


def multiple(a, n: int, point):
    """n·P for n ≥ 0 by repeated doubling."""
    result, power = None, point
    while n:
        if n & 1:
            result = add(a, result, power)
        power = add(a, power, power)
        n >>= 1
    return result


def torsion_order(model, point, bound: int) -> int:
    """The order of a point of an integral model if it is at most ``bound``, else 0.

    Every multiple of a torsion point is torsion, and a non-zero torsion point of an integral model has
    4x and 8y integral (Silverman, *The Arithmetic of Elliptic Curves*, Cor. VIII.7.2, after Cassels):
    a multiple without that property ends the search at once, so the coordinates met stay integers
    (up to 4 and 8) instead of rationals of fast-growing height.
    """
    current = point
    for n in range(1, bound + 1):
        if current is None:
            return n
        x, y = current
        if (4 * x).denominator != 1 or (8 * y).denominator != 1:
            return 0
        current = add(model, current, point)
    return 0


def count_points(a, p: int) -> int:
    """#E(F_p) for an integral model with good reduction at the odd prime p, by a direct count.

    Completing the square, (2y + a1x + a3)² = 4x³ + b2x² + 2b4x + b6 =: f(x), so each x in F_p gives
    1 + (f(x)/p) points, plus O (Silverman III.1; Washington, *Elliptic Curves*, §4.1). The last counts
    are kept: the checks of one certificate, and the certificates of one curve, often count at the same
    prime (one prime serving the Frobenius witnesses of several ℓ, the torsion bound and the class).
    """
    if not (p > 2 and is_prime(p)):
        raise Rejection("point count", "the prime is not an odd prime", p=p)
    return counted_points(tuple(a), p)


@functools.lru_cache(maxsize=512)
def counted_points(a: tuple, p: int) -> int:
    """count_points once its prime is checked; at most 512 counts kept (each of a model and a prime)."""
    b2, b4, b6, _ = (int(b) % p for b in b_invariants(a))
    squares = [0] * p
    for y in range(1, (p + 1) // 2):
        squares[y * y % p] = 1
    count = 1
    for x in range(p):
        value = ((4 * x + b2) * x + 2 * b4) * x + b6
        value %= p
        count += 1 if value == 0 else (2 if squares[value] else 0)
    return count


@functools.lru_cache(maxsize=4)
def division_polynomials(a, n: int) -> list:
    """[f_0, …, f_n] with f_m = ψ_m for m odd and f_m = ψ_m/ψ_2 for m even, as integer polynomials.

    ψ_2² = f = 4x³ + b2x² + 2b4x + b6; ψ_3 and ψ_4/ψ_2 are Silverman's Exercise 3.7 (Washington §3.2);
    higher ones follow from ψ_{2m+1} = ψ_{m+2}ψ_m³ − ψ_{m−1}ψ_{m+1}³ and
    ψ_{2m} = ψ_m(ψ_{m+2}ψ_{m−1}² − ψ_{m−2}ψ_{m+1}²)/ψ_2, with ψ_2² replaced by f. The model must be integral.
    """
    b2, b4, b6, b8 = (int(b) for b in b_invariants(a))
    f = two_division_polynomial(a)
    f4 = [b4 * b8 - b6 * b6, b2 * b8 - b4 * b6, 10 * b8, 10 * b6, 5 * b4, b2, 2]
    fs = [[], [1], [1], [b8, 3 * b6, 3 * b4, b2, 3], f4]
    ff = poly_mul(f, f)
    for m in range(5, n + 1):
        k = m // 2
        if m % 2:
            left = poly_mul(fs[k + 2], poly_mul(fs[k], poly_mul(fs[k], fs[k])))
            right = poly_mul(fs[k - 1], poly_mul(fs[k + 1], poly_mul(fs[k + 1], fs[k + 1])))
            fs.append(poly_sub(poly_mul(ff, left), right) if k % 2 == 0 else poly_sub(left, poly_mul(ff, right)))
        else:
            inner = poly_sub(poly_mul(fs[k + 2], poly_mul(fs[k - 1], fs[k - 1])),
                             poly_mul(fs[k - 2], poly_mul(fs[k + 1], fs[k + 1])))
            fs.append(poly_mul(fs[k], inner))
    return fs[:n + 1]


def two_division_polynomial(a) -> list:
    """f = 4x³ + b2x² + 2b4x + b6 = ψ_2², whose roots are the x-coordinates of the points of order 2."""
    b2, b4, b6, _ = (int(b) for b in b_invariants(a))
    return trim([b6, 2 * b4, b2, 4])


def torsion_polynomial(a, ell: int) -> list:
    """A polynomial whose roots are the x-coordinates of the points of order ℓ (ℓ prime): f for ℓ = 2, ψ_ℓ otherwise."""
    return two_division_polynomial(a) if ell == 2 else division_polynomials(a, ell)[ell]


def division_by_ell_polynomial(a, ell: int, x_q: Fraction) -> list:
    """d·(φ_ℓ − x_Q·ψ_ℓ²), d the denominator of x_Q: its roots are the x(P) with ℓP = ±Q.

    φ_n = xψ_n² − ψ_{n−1}ψ_{n+1} and x(nP) = φ_n(P)/ψ_n(P)² (Silverman Ex. 3.7).
    """
    fs = division_polynomials(a, ell + 1)
    f = two_division_polynomial(a)
    if ell % 2:
        psi_squared, neighbours = poly_mul(fs[ell], fs[ell]), poly_mul(f, poly_mul(fs[ell - 1], fs[ell + 1]))
    else:
        psi_squared, neighbours = poly_mul(f, poly_mul(fs[ell], fs[ell])), poly_mul(fs[ell - 1], fs[ell + 1])
    phi = poly_sub(poly_mul([0, 1], psi_squared), neighbours)
    return poly_sub(poly_scale(x_q.denominator, phi), poly_scale(x_q.numerator, psi_squared))


def points_with_x(a, x: Fraction) -> list:
    """The rational points with the given x-coordinate.

    y solves y² + (a1x + a3)y − (x³ + a2x² + a4x + a6) = 0, whose discriminant is f(x) = ψ_2(x)²:
    there are rational points exactly when f(x) is a square in Q.
    """
    a1, a2, a3, a4, a6 = a
    linear = a1 * x + a3
    root = rational_square_root(linear * linear + 4 * (x ** 3 + a2 * x * x + a4 * x + a6))
    if root is None:
        return []
    return [(x, y) for y in sorted({(-linear + root) / 2, (-linear - root) / 2})]


# --- the group E~(F_q) of the reduction at an odd prime q of good reduction ---

def reduce_point(point, q: int):
    """The reduction of a rational point of an integral model modulo q, as residues (x, y), or None for O.

    On an integral model v_q(x) < 0 exactly when v_q(y) < 0 (y is a root of a monic polynomial with
    q-integral coefficients once x is q-integral), and then the point reduces to O; otherwise its
    reduction is (x mod q, y mod q) (Silverman, *The Arithmetic of Elliptic Curves*, VII.2)."""
    if point is None or point[0].denominator % q == 0:
        return None
    x, y = point
    return (x.numerator * pow(x.denominator, -1, q) % q, y.numerator * pow(y.denominator, -1, q) % q)


def add_mod(a, p, r, q: int):
    """P + R in E~(F_q) by the chord-and-tangent rule (Silverman III.2.3), for an integral model a with
    good reduction at q; points are residue pairs, None is O."""
    if p is None:
        return r
    if r is None:
        return p
    a1, a2, a3, a4, _ = (int(c) for c in a)
    (x1, y1), (x2, y2) = p, r
    if x1 == x2:
        if (y1 + y2 + a1 * x2 + a3) % q == 0:
            return None
        slope = (3 * x1 * x1 + 2 * a2 * x1 + a4 - a1 * y1) * pow(2 * y1 + a1 * x1 + a3, -1, q) % q
    else:
        slope = (y2 - y1) * pow(x2 - x1, -1, q) % q
    x3 = (slope * slope + a1 * slope - a2 - x1 - x2) % q
    return x3, (-(slope + a1) * x3 - (y1 - slope * x1) - a3) % q


def multiple_mod(a, n: int, point, q: int):
    """n·P in E~(F_q) for n ≥ 0, by repeated doubling."""
    result = None
    while n:
        if n & 1:
            result = add_mod(a, result, point, q)
        point = add_mod(a, point, point, q)
        n >>= 1
    return result
