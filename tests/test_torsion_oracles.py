"""Two classical theorems as independent oracles on random curves.

Nagell–Lutz (Silverman–Tate, Rational Points on Elliptic Curves, II.4): on y² = x³ + ax² + bx + c
with integer coefficients and D = −4a³c + a²b² + 18abc − 4b³ − 27c², every rational point of
finite order has integer coordinates with y = 0 or y² | D. So the certified group must consist of
such points, and, conversely, since the finitely many points allowed by the theorem contain all the
torsion, the torsion points among them must be exactly the certified group.

Hasse (1933; Silverman, AEC V.1.1): |p + 1 − #E(F_p)| ≤ 2√p at a prime p of good reduction. The
verifier's own point count must obey it and agree with cypari2's ``ellap`` (#E(F_p) = p + 1 − a_p).
"""
from fractions import Fraction

from hypothesis import given, settings, strategies as st

from certify.verifier.curves import count_points
from torsion_pool import certified, group_generated, pari, pari_curve

ORACLE_SETTINGS = settings(max_examples=150, derandomize=True, deadline=None)

small = st.integers(min_value=-60, max_value=60)


def cubic_discriminant(a: int, b: int, c: int) -> int:
    """D of x³ + ax² + bx + c as Silverman–Tate write it (II.4)."""
    return -4 * a ** 3 * c + a * a * b * b + 18 * a * b * c - 4 * b ** 3 - 27 * c * c


@st.composite
def integral_cubic_curves(draw):
    """(a, b, c) with y² = x³ + ax² + bx + c non-singular (D ≠ 0). Half of the time c is chosen to
    put a small integer point (x0, y0) on the curve, which makes non-trivial torsion far more common."""
    a, b = draw(small), draw(small)
    if draw(st.booleans()):
        x0, y0 = draw(st.integers(-6, 6)), draw(st.integers(0, 6))
        c = y0 * y0 - x0 ** 3 - a * x0 * x0 - b * x0
    else:
        c = draw(small)
    while cubic_discriminant(a, b, c) == 0:
        c += 1
    return a, b, c


def nagell_lutz_candidates(a: int, b: int, c: int) -> set:
    """The affine points Nagell–Lutz allows: integer points with y = 0 or y² | D.

    For each admissible y ≥ 0 the x are the integer roots of x³ + ax² + bx + c − y², found by
    cypari2 (``nfroots``); D is factored by cypari2 to list the y with y² | D.
    """
    # |D| = core·f² with core squarefree (cypari2's core), so y² | D exactly when y | f.
    ys = [0] + [int(y) for y in pari.divisors(pari.core(abs(cubic_discriminant(a, b, c)), 1)[1])]
    points = set()
    x = pari("x")
    for y in ys:
        for root in pari.nfroots(None, x ** 3 + a * x ** 2 + b * x + c - y * y):
            if Fraction(str(root)).denominator == 1:
                points |= {(int(root), y), (int(root), -y)}
    return points


@ORACLE_SETTINGS
@given(integral_cubic_curves())
def test_discriminant_formula_matches_the_reference(abc):
    """Silverman–Tate's D (as recalled in cubic_discriminant) is Δ/16 for y² = f(x), Δ from cypari2:
    the Nagell–Lutz oracle below would be worthless with a wrong D."""
    a, b, c = abc
    assert 16 * cubic_discriminant(a, b, c) == int(pari_curve([0, a, 0, b, c]).disc())


@ORACLE_SETTINGS
@given(integral_cubic_curves())
def test_certified_torsion_obeys_nagell_lutz(abc):
    """Every non-zero element of the certified group (all sums of the generators, by cypari2's group
    law) is an integer point with y = 0 or y² | D, and the torsion points among the Nagell–Lutz
    candidates (cypari2's ``ellorder`` > 0) are exactly the certified group."""
    a, b, c = abc
    curve = pari_curve([0, a, 0, b, c])
    cert = certified((0, a, 0, b, c))
    orders = [int(n) for n in cert["claim"]["invariants"]]
    points = [pari([pari(x), pari(y)]) for x, y in cert["claim"]["generators"]]
    affine = [P for P in group_generated(curve, points, orders) if len(P) == 2]
    assert all(Fraction(str(v)).denominator == 1 for P in affine for v in P), f"non-integral torsion point on {abc}"
    group = {(int(P[0]), int(P[1])) for P in affine}
    d = cubic_discriminant(a, b, c)
    for x, y in group:
        assert y == 0 or d % (y * y) == 0, f"{(x, y)} breaks Nagell–Lutz on {abc}"
    torsion = {P for P in nagell_lutz_candidates(a, b, c) if int(pari.ellorder(curve, list(P))) > 0}
    assert torsion == group


@st.composite
def curves_and_good_primes(draw):
    """An integral model [a1, a2, a3, a4, a6] and an odd prime p < 3000 of good reduction."""
    a = [draw(st.integers(-2, 2)), draw(st.integers(-2, 2)), draw(st.integers(-2, 2)),
         draw(st.integers(-10 ** 6, 10 ** 6)), draw(st.integers(-10 ** 9, 10 ** 9))]
    while len(pari_curve(a)) == 0:  # cypari2's ellinit gives [] for a singular curve
        a[4] += 1
    delta = int(pari_curve(a).disc())
    p = int(pari.nextprime(draw(st.integers(3, 3000))))
    while delta % p == 0:
        p = int(pari.nextprime(p + 1))
    return a, p


@ORACLE_SETTINGS
@given(curves_and_good_primes())
def test_point_counts_obey_hasse_and_agree_with_the_reference(case):
    """The verifier's naive count #E(F_p) satisfies Hasse's bound (p + 1 − N)² ≤ 4p and equals
    p + 1 − a_p with a_p from cypari2's ``ellap``."""
    a, p = case
    count = count_points(tuple(Fraction(c) for c in a), p)
    assert (p + 1 - count) ** 2 <= 4 * p
    assert count == p + 1 - int(pari.ellap(pari_curve(a), p))
