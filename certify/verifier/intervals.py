"""Rigorous real intervals from the standard library: closed intervals [lo, hi] with Fraction end-points,
and enclosures of π, √n, exp(−x), ln x, Euler's constant γ and the exponential integral E₁(x).

Every function returns an interval that contains the true value, whatever the rounding: its series are
summed in fixed point (integers counting units of 2^−P) with every division rounded down for the lower
end and up for the upper end, the truncation error is bounded by a proven estimate, named in each
docstring, and the end-points are finally rounded outward to multiples of 2^−bits (``outward``), which
keeps the denominators bounded. ``bits`` is an absolute precision: the width of each result is a few
units of 2^−bits. Arithmetic on intervals is exact (``+``, ``−``, ``×``, ``÷`` by an interval not
containing 0); callers round with ``outward`` where the denominators would grow.
"""
import functools
from fractions import Fraction
from math import isqrt

GUARD_BITS = 12
"""Extra fixed-point bits inside each function, more than the rounding steps of its series can use up."""


class Interval:
    """The closed interval [lo, hi] of real numbers, lo ≤ hi, with rational end-points."""

    __slots__ = ("lo", "hi")

    def __init__(self, lo, hi=None):
        self.lo = Fraction(lo)
        self.hi = self.lo if hi is None else Fraction(hi)
        if self.lo > self.hi:
            raise ValueError("an interval needs lo <= hi")

    def __repr__(self):
        return f"Interval({float(self.lo)!r}, {float(self.hi)!r})"

    def __add__(self, other):
        other = as_interval(other)
        return Interval(self.lo + other.lo, self.hi + other.hi)

    __radd__ = __add__

    def __neg__(self):
        return Interval(-self.hi, -self.lo)

    def __sub__(self, other):
        return self + (-as_interval(other))

    def __rsub__(self, other):
        return as_interval(other) - self

    def __mul__(self, other):
        if isinstance(other, (int, Fraction)):
            ends = (self.lo * other, self.hi * other)
            return Interval(min(ends), max(ends))
        other = as_interval(other)
        ends = (self.lo * other.lo, self.lo * other.hi, self.hi * other.lo, self.hi * other.hi)
        return Interval(min(ends), max(ends))

    __rmul__ = __mul__

    def __truediv__(self, other):
        other = as_interval(other)
        if other.lo <= 0 <= other.hi:
            raise ZeroDivisionError("division by an interval that contains 0")
        return self * Interval(1 / other.hi, 1 / other.lo)

    def outward(self, bits: int) -> "Interval":
        """The smallest interval with end-points in 2^−bits·Z that contains this one."""
        scale = 1 << bits
        return Interval(Fraction((self.lo.numerator << bits) // self.lo.denominator, scale),
                        Fraction(-((-self.hi.numerator << bits) // self.hi.denominator), scale))

    def contains(self, x) -> bool:
        return self.lo <= x <= self.hi

    def excludes_zero(self) -> bool:
        return self.lo > 0 or self.hi < 0

    @property
    def width(self) -> Fraction:
        return self.hi - self.lo


def as_interval(value) -> Interval:
    return value if isinstance(value, Interval) else Interval(value)


def _fixed(lower: int, upper: int, scale_bits: int, bits: int) -> Interval:
    """The interval [lower, upper]·2^−scale_bits, rounded outward to 2^−bits."""
    return Interval(Fraction(lower, 1 << scale_bits), Fraction(upper, 1 << scale_bits)).outward(bits)


def _bracket(x: Fraction, scale_bits: int) -> tuple:
    """(⌊x·2^P⌋, ⌈x·2^P⌉) for P = scale_bits."""
    return (x.numerator << scale_bits) // x.denominator, -((-x.numerator << scale_bits) // x.denominator)


def square_root(n: int, bits: int) -> Interval:
    """√n for an integer n ≥ 0: ⌊√(n·4^bits)⌋ (integer square root, exact) gives s ≤ 2^bits·√n < s + 1."""
    s = isqrt(n << (2 * bits))
    return Interval(Fraction(s, 1 << bits), Fraction(s if s * s == n << (2 * bits) else s + 1, 1 << bits))


def _arctan_inverse(m: int, scale_bits: int) -> tuple:
    """Integers (lower, upper) with lower ≤ 2^P·arctan(1/m) ≤ upper, P = scale_bits, m ≥ 2.

    arctan(1/m) = Σ_{k ≥ 0} (−1)^k / ((2k + 1) m^(2k+1)), an alternating series whose terms decrease to
    0, so the sum lies within the first omitted term t_K of the partial sum of t_0, …, t_(K−1) (Leibniz's
    criterion; W. Rudin, *Principles of Mathematical Analysis*, 3rd ed., Theorem 3.43 and its proof).
    Each term is rounded down or up in the direction that keeps the bound.
    """
    one = 1 << scale_bits
    lower = upper = 0
    k, power = 0, m
    while True:
        denominator = (2 * k + 1) * power
        down, up = one // denominator, -(-one // denominator)
        if up <= 1:
            return lower - up, upper + up
        if k % 2 == 0:
            lower, upper = lower + down, upper + up
        else:
            lower, upper = lower - up, upper - down
        k, power = k + 1, power * m * m


@functools.lru_cache(maxsize=16)
def pi(bits: int) -> Interval:
    """π by Machin's formula π = 16 arctan(1/5) − 4 arctan(1/239) (J. Machin, 1706, published in
    W. Jones, *Synopsis Palmariorum Matheseos*, London 1706), each arctangent by its alternating series
    with the Leibniz bound (``_arctan_inverse``)."""
    scale_bits = bits + GUARD_BITS
    low5, high5 = _arctan_inverse(5, scale_bits)
    low239, high239 = _arctan_inverse(239, scale_bits)
    return _fixed(16 * low5 - 4 * high239, 16 * high5 - 4 * low239, scale_bits, bits)


def exp_neg(x: Fraction, bits: int) -> Interval:
    """e^−x for a rational x ≥ 0.

    Argument reduction: y = x/2^s ≤ 1/2 and e^−x = (e^−y)^(2^s). Taylor's theorem with the Lagrange
    remainder (Rudin, Theorem 5.15): e^−y = Σ_{k < K} (−y)^k/k! + R with |R| = e^−ξ y^K/K! ≤ y^K/K!
    for some ξ in [0, y]. Each squaring of an interval of positive numbers squares its end-points; the
    2^s relative error it builds up is covered by s extra fixed-point bits. When x ≥ 0.7·bits + 1,
    e^−x < 2^−bits (ln 2 < 0.7) and the enclosure [0, 2^−bits] is returned without a series.
    """
    x = Fraction(x)
    if x < 0:
        raise ValueError("exp_neg needs x >= 0")
    if x >= Fraction(7, 10) * bits + 1:
        return Interval(0, Fraction(1, 1 << bits))
    s = 0
    while x > Fraction(1, 2) * (1 << s):
        s += 1
    scale_bits = bits + s + GUARD_BITS
    one = 1 << scale_bits
    y_low, y_high = _bracket(x / (1 << s), scale_bits)
    lower = upper = 0
    term_low = term_high = one          # y^k/k! in units of 2^−P, bounded below and above
    k = 0
    while term_high > 1:
        if k % 2 == 0:
            lower, upper = lower + term_low, upper + term_high
        else:
            lower, upper = lower - term_high, upper - term_low
        k += 1
        term_low = term_low * y_low // (one * k)
        term_high = -(-term_high * y_high // (one * k))
    lower, upper = max(lower - term_high, 0), upper + term_high
    for _ in range(s):
        lower, upper = lower * lower // one, -(-upper * upper // one)
    return _fixed(lower, upper, scale_bits, bits)


def _atanh_sum(z_low: int, z_high: int, scale_bits: int) -> tuple:
    """Integers bounding 2^P·atanh(z) for 0 ≤ z ≤ 1/3 given as [z_low, z_high]·2^−P, P = scale_bits.

    atanh(z) = Σ_{k ≥ 0} z^(2k+1)/(2k + 1), a series of positive terms whose tail after K terms is at most
    z^(2K+1)/((2K + 1)(1 − z²)) ≤ (9/8)·z^(2K+1)/(2K + 1) for z ≤ 1/3 (a geometric series with ratio z²).
    """
    one = 1 << scale_bits
    z2_low, z2_high = z_low * z_low // one, -(-z_high * z_high // one)
    lower = upper = 0
    power_low, power_high, k = z_low, z_high, 0
    while power_high > 1:
        lower += power_low // (2 * k + 1)
        upper += -(-power_high // (2 * k + 1))
        power_low, power_high = power_low * z2_low // one, -(-power_high * z2_high // one)
        k += 1
    return lower, upper + 9 * (power_high + 1) // 8 + 1


@functools.lru_cache(maxsize=16)
def _log2_fixed(scale_bits: int) -> tuple:
    """Integers bounding 2^P·ln 2 = 2^P·2·atanh(1/3)."""
    third_low, third_high = _bracket(Fraction(1, 3), scale_bits)
    lower, upper = _atanh_sum(third_low, third_high, scale_bits)
    return 2 * lower, 2 * upper


def log(x: Fraction, bits: int) -> Interval:
    """ln x for a rational x > 0.

    ln x = −ln(1/x), so x ≥ 1; write x = 2^e·m with 1 ≤ m < 2, then ln x = e·ln 2 + ln m with
    ln m = 2 atanh((m − 1)/(m + 1)) and ln 2 = 2 atanh(1/3), each by the atanh series with its geometric
    tail bound (``_atanh_sum``; the series is ln((1 + z)/(1 − z)) = 2 Σ z^(2k+1)/(2k + 1), e.g.
    M. Abramowitz and I. A. Stegun, *Handbook of Mathematical Functions* (1964), 4.1.28).
    """
    x = Fraction(x)
    if x <= 0:
        raise ValueError("log needs x > 0")
    if x < 1:
        return -log(1 / x, bits)
    e = (x.numerator // x.denominator).bit_length() - 1
    m = x / (1 << e)
    scale_bits = bits + e.bit_length() + GUARD_BITS
    z_low, z_high = _bracket((m - 1) / (m + 1), scale_bits)
    low_m, high_m = _atanh_sum(z_low, z_high, scale_bits)
    low2, high2 = _log2_fixed(scale_bits)
    return _fixed(e * low2 + 2 * low_m, e * high2 + 2 * high_m, scale_bits, bits)


def bernoulli_numbers(count: int) -> list:
    """[B_0, …, B_count] exactly, from Σ_{j=0}^{k} C(k + 1, j)·B_j = 0 for k ≥ 1 (B_1 = −1/2)."""
    numbers = [Fraction(1)]
    for k in range(1, count + 1):
        binomial, total = 1, Fraction(0)      # C(k + 1, j), j = 0, 1, …
        for j in range(k):
            total += binomial * numbers[j]
            binomial = binomial * (k + 1 - j) // (j + 1)
        numbers.append(-total / (k + 1))
    return numbers


@functools.lru_cache(maxsize=16)
def euler_gamma(bits: int) -> Interval:
    """Euler's constant γ by the Euler–Maclaurin expansion of the harmonic numbers: for n, m ≥ 1,

        γ = H_n − ln n − 1/(2n) + Σ_{k=1}^{m} B_2k/(2k·n^2k) − R,  |R| < |B_(2m+2)|/((2m + 2)·n^(2m+2)),

    the remainder being smaller than the first omitted term (D. E. Knuth, *The Art of Computer
    Programming*, vol. 1, 3rd ed., §1.2.7, eq. (3) for m = 2, and §1.2.11.2 for every m; R. L. Graham,
    D. E. Knuth and O. Patashnik, *Concrete Mathematics*, 2nd ed. (1994), §9.6). With n = bits + 16 the
    terms fall fast; m grows until the bound is below 2^−(bits + GUARD_BITS). H_n and the Bernoulli terms
    are exact rationals.
    """
    n = bits + 16
    target = Fraction(1, 1 << (bits + GUARD_BITS))
    numbers = bernoulli_numbers(4)
    m = 1
    while abs(numbers[2 * m + 2]) / ((2 * m + 2) * Fraction(n) ** (2 * m + 2)) >= target:
        m += 1
        numbers = bernoulli_numbers(2 * m + 2)
    value = sum(Fraction(1, j) for j in range(1, n + 1)) - Fraction(1, 2 * n)
    value += sum(numbers[2 * k] / (2 * k * Fraction(n) ** (2 * k)) for k in range(1, m + 1))
    remainder = abs(numbers[2 * m + 2]) / ((2 * m + 2) * Fraction(n) ** (2 * m + 2))
    return (Interval(value - remainder, value + remainder) - log(Fraction(n), bits + GUARD_BITS)).outward(bits)


def exponential_integral(x: Fraction, bits: int) -> Interval:
    """E₁(x) = ∫_x^∞ e^−t/t dt for a rational x > 0.

    Series (Abramowitz and Stegun 5.1.11): E₁(x) = −γ − ln x + Σ_{k ≥ 1} (−1)^(k+1) x^k/(k·k!). Its terms
    t_k grow to about e^x/x before they fall, so the sum is kept in fixed point with ⌈1.45·x⌉ extra bits
    (log₂ e < 1.45). Truncation bound: once K + 2 ≥ 2x, |Σ_{k > K} t_k| ≤ Σ_{k > K} x^k/k! ≤
    2·x^(K+1)/(K+1)! (a geometric series with ratio x/(K + 2) ≤ 1/2).
    For large x, 0 < E₁(x) < e^−x/x, since 1/t < 1/x under the integral (ibid. 5.1.20); it is used when
    x ≥ 0.7·bits + 1, where that bound is below 2^−bits.
    """
    x = Fraction(x)
    if x <= 0:
        raise ValueError("exponential_integral needs x > 0")
    if x >= Fraction(7, 10) * bits + 1:
        return Interval(0, exp_neg(x, bits).hi / x).outward(bits)
    scale_bits = bits + GUARD_BITS + -(-145 * x.numerator // (100 * x.denominator)) + 8
    one = 1 << scale_bits
    x_low, x_high = _bracket(x, scale_bits)
    lower = upper = 0
    power_low, power_high, k = one, one, 0      # x^k/k! bounded below and above
    twice_x = -(-2 * x.numerator // x.denominator)
    while True:
        k += 1
        power_low, power_high = power_low * x_low // (one * k), -(-power_high * x_high // (one * k))
        if k + 1 >= twice_x and power_high <= 1:
            break
        if k % 2:
            lower, upper = lower + power_low // k, upper - (-power_high // k)
        else:
            lower, upper = lower + (-power_high // k), upper - power_low // k
    series = _fixed(lower - 2 * power_high, upper + 2 * power_high, scale_bits, bits + GUARD_BITS)
    return (series - euler_gamma(bits + GUARD_BITS) - log(x, bits + GUARD_BITS)).outward(bits)
