"""All fifteen torsion groups of Mazur's theorem, each on a certified curve.

Mazur (1977, Publ. Math. IHÉS 47): E(Q)_tors is Z/n (1 ≤ n ≤ 10 or n = 12) or Z/2 × Z/2n (1 ≤ n ≤ 4).
Kubert (1976, Proc. LMS 33, Table 3) parametrises the curves with a point of each order: for n ≥ 4
the Tate normal form y² + (1 − c)xy − by = x³ − bx², where (0, 0) has order n, with b, c rational
functions of a parameter t (the formulas are recalled from memory and checked here against
cypari2). For each group there is a small parameter and one large enough
that the input coefficients have more than 100 digits; the certified group must be the one the
family gives and the one cypari2's ``elltors`` computes, the verifier must accept, and the
certificate must validate against the JSON Schema.
"""
from fractions import Fraction

import pytest

from certify.verifier import verify
from torsion_pool import assert_claim_true, certified, schema_validator

T = Fraction


def tate_normal_form(b, c) -> tuple:
    """y² + (1 − c)xy − by = x³ − bx², on which (0, 0) is a point of order ≥ 4 (Kubert 1976, §2)."""
    return (1 - c, -b, -b, T(0), T(0))


def z8(t):
    """Kubert's Z/8 family: b = (2t − 1)(t − 1), c = b/t."""
    b = (2 * t - 1) * (t - 1)
    return tate_normal_form(b, b / t)


def z9(t):
    """Kubert's Z/9 family: c = t²(t − 1), b = c(t² − t + 1)."""
    c = t * t * (t - 1)
    return tate_normal_form(c * (t * t - t + 1), c)


def z10(t):
    """Kubert's Z/10 family: b = t³(t − 1)(2t − 1)/(t² − 3t + 1)², c = −t(t − 1)(2t − 1)/(t² − 3t + 1)."""
    d = t * t - 3 * t + 1
    return tate_normal_form(t ** 3 * (t - 1) * (2 * t - 1) / d ** 2, -t * (t - 1) * (2 * t - 1) / d)


def z12(t):
    """Kubert's Z/12 family: b = t(2t−1)(2t²−2t+1)(3t²−3t+1)/(t−1)⁴, c = −t(2t−1)(3t²−3t+1)/(t−1)³."""
    return tate_normal_form(t * (2 * t - 1) * (2 * t * t - 2 * t + 1) * (3 * t * t - 3 * t + 1) / (t - 1) ** 4,
                            -t * (2 * t - 1) * (3 * t * t - 3 * t + 1) / (t - 1) ** 3)


def z2x6(t):
    """Kubert's Z/2 × Z/6 family: c = (10 − 2t)/(t² − 9), b = c + c²."""
    c = (10 - 2 * t) / (t * t - 9)
    return tate_normal_form(c + c * c, c)


FAMILIES = {
    # Groups below order 4 have no Tate normal form; Kubert's Table 3 lists them as these shapes
    # (memory): Z/2 is y² = x³ + ax² + bx with (0, 0) of order 2, Z/3 is y² + a1xy + a3y = x³ with
    # (0, 0) of order 3, Z/2 × Z/2 is y² = x(x + r)(x + s). The trivial group has no family: a
    # curve y² + y = x³ − x + t without the special shape is taken, and the group it has is
    # confirmed by cypari2 alone.
    (): lambda t: (T(0), T(0), T(1), T(-1), t),
    (2,): lambda t: (T(0), t, T(0), t + 1, T(0)),
    (3,): lambda t: (T(1), T(0), t, T(0), T(0)),
    (4,): lambda t: tate_normal_form(t, T(0)),
    (5,): lambda t: tate_normal_form(t, t),
    (6,): lambda t: tate_normal_form(t + t * t, t),
    (7,): lambda t: tate_normal_form(t ** 3 - t ** 2, t ** 2 - t),
    (8,): z8,
    (9,): z9,
    (10,): z10,
    (12,): z12,
    (2, 2): lambda t: (T(0), 2 * t + 1, T(0), t * (t + 1), T(0)),
    (2, 4): lambda t: tate_normal_form(t * t - T(1, 16), T(0)),
    (2, 6): z2x6,
    (2, 8): lambda t: z8(t * (8 * t + 2) / (8 * t * t - 1)),
}

SMALL = {(): T(0), (2,): T(5, 3), (3,): T(7), (4,): T(5, 3), (5,): T(7, 11), (6,): T(5, 3), (7,): T(7, 11),
         (8,): T(5, 3), (9,): T(7, 11), (10,): T(5, 3), (12,): T(7, 11), (2, 2): T(5, 3), (2, 4): T(5, 3),
         (2, 6): T(7, 11), (2, 8): T(5, 3)}
"""Small parameters; any value off the family's degenerate points would do."""

HUGE = T(10 ** 120 + 7)
RATIONAL = T(2 ** 100 + 1, 3 ** 20)
LARGE = {(): HUGE, (2,): HUGE, (3,): HUGE, (4,): HUGE, (5,): HUGE, (6,): T(10 ** 52 + 3), (7,): T(10 ** 52 + 3),
         (8,): T(10 ** 52 + 3), (9,): T(10 ** 52 + 3), (10,): RATIONAL, (12,): T(10 ** 52 + 3),
         (2, 2): HUGE, (2, 4): T(10 ** 52 + 3), (2, 6): T(10 ** 52 + 3), (2, 8): RATIONAL}
"""Parameters giving input coefficients of more than 100 digits (asserted below). Minimal models need
the factorisation of the coefficient denominators and of gcd(c4, c6); these values were picked
among a few tried so that those factorisations are quick (a random 200-digit denominator is not)."""

CASES = [pytest.param(group, t, id=f"{'x'.join(map(str, group)) or '1'}-{size}")
         for size, parameters in (("small", SMALL), ("large", LARGE)) for group, t in parameters.items()]


def test_every_mazur_group_has_a_family():
    """The table above covers exactly the fifteen groups of Mazur's theorem (Mazur 1977)."""
    mazur = {()} | {(n,) for n in range(2, 11)} | {(12,)} | {(2, 2 * n) for n in range(1, 5)}
    assert set(FAMILIES) == mazur == set(SMALL) == set(LARGE)


@pytest.mark.parametrize("group, t", CASES)
def test_family_curve_is_certified_with_its_group(group, t):
    """The certificate of a Kubert-family curve claims the family's group (Kubert 1976), which is the
    group cypari2's elltors finds; the verifier accepts it, and it validates against the schema."""
    a = FAMILIES[group](t)
    cert = certified(a)
    assert [int(n) for n in cert["claim"]["invariants"]] == list(group)
    assert_claim_true(cert)
    schema_validator().validate(cert)
    verify(cert)


@pytest.mark.parametrize("group", sorted(LARGE))
def test_large_parameters_give_coefficients_over_100_digits(group):
    """The large cases really exercise big numbers: some input numerator or denominator has over 100 digits."""
    a = FAMILIES[group](LARGE[group])
    assert max(max(len(str(abs(c.numerator))), len(str(c.denominator))) for c in a) > 100


def test_a_large_denominator_does_not_hang_the_certifier():
    """Kubert's Z/10 curve at t = 2¹⁷⁰ + 1: its coefficients have about 100-digit denominators, far
    inside the documented input limit, so the certifier must either certify Z/10 (Kubert 1976) or
    refuse the input; it must not search forever. The guard gives it 20 s (the other large cases
    take about a second)."""
    cert = certified(z10(T(2 ** 170 + 1)), seconds=20)
    assert [int(n) for n in cert["claim"]["invariants"]] == [10]
