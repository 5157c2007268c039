"""Vélu/Kohel codomains and x-maps from kernel polynomials, against published formulas and cypari2."""
import math
from fractions import Fraction

import pytest
from hypothesis import given
from hypothesis import strategies as st

from certify.curves import Curve
from certify.isogeny.kernels import kernels_by_factoring
from certify.isogeny.series import kernel_from_codomain
from certify.pari import pari
from certify.verifier.errors import Rejection
from certify.verifier.isogeny import check_isogeny_identity, power_sums, velu_codomain


def pari_polynomial(h):
    x = pari("x")
    return sum(pari(str(c)) * x ** i for i, c in enumerate(h))


@pytest.mark.parametrize("a, b", [(1, 1), (-3, 2), (5, -7), (Fraction(1, 2), Fraction(-3, 5)), (0, 9)])
def test_two_isogeny_matches_silverman_iii_4_5(a, b):
    """Silverman, The Arithmetic of Elliptic Curves, III.4.5: on y² = x³ + ax² + bx the 2-isogeny with
    kernel (0, 0) has codomain Y² = X³ − 2aX² + (a² − 4b)X."""
    a, b = Fraction(a), Fraction(b)
    codomain = Curve(velu_codomain((0, a, 0, b, 0), 2, [Fraction(0), Fraction(1)]))
    published = Curve((0, -2 * a, 0, a * a - 4 * b, 0))
    assert codomain.minimal_model()[0] == published.minimal_model()[0]  # isomorphic over Q


@pytest.mark.parametrize("model, ell", [((0, -1, 1, -10, -20), 5), ((1, 0, 1, 4, -6), 3), ((1, 1, 1, -10, -10), 2),
                                        ((0, 0, 1, -1, 0), None), ((1, -1, 1, -3, 3), 7), ((0, 1, 1, -9, -15), 3),
                                        ((1, 1, 1, -80, 242), 2), ((0, 1, 0, -1, 0), 2)])
def test_codomains_equal_cypari2_ellisogeny(model, ell):
    """cypari2's ellisogeny (Vélu's formulas in PARI) gives the same codomain, coefficient for coefficient,
    for every rational kernel polynomial found from the division polynomials (any Weierstrass model)."""
    curve = Curve(model)
    E = pari.ellinit(list(model))
    for degree in ([ell] if ell else [3, 5, 7]):
        if degree == 2:
            kernels = [[-Fraction(str(r)), Fraction(1)] for r in pari(f"nfroots(,{pari.elldivpol(E, 2)})")]
        else:
            expected = len(_isogenies_of_degree(E, degree))
            kernels = kernels_by_factoring(curve, degree, expected) if expected else []
        assert len(kernels) == len(_isogenies_of_degree(E, degree))
        for h in kernels:
            ours = velu_codomain(curve.a, degree, h)
            reference = pari.ellisogeny(E, pari_polynomial(h), 1)
            assert ours == tuple(Fraction(str(c)) for c in reference[:5])


def _isogenies_of_degree(E, ell):
    """The ℓ-isogenies from E per cypari2's ellisomat (first row of its degree matrix)."""
    matrix = pari.ellisomat(E)[1]
    return [k for k in range(len(matrix)) if int(matrix[0][k]) == ell]


def test_power_sums_by_newton_identities():
    """Newton's identities: the roots 1, 2, 3 of x³ − 6x² + 11x − 6 have power sums 6, 14, 36, 98."""
    assert power_sums([Fraction(-6), Fraction(11), Fraction(-6), Fraction(1)], 4) == [6, 14, 36, 98]


def test_non_kernel_polynomial_is_refused():
    """A degree-2 factor of ψ_5 that is not a subgroup (x² + 1) fails the isogeny identity (Silverman III.4.8)."""
    a = (0, -1, 1, -10, -20)
    for h in ([Fraction(1), Fraction(0), Fraction(1)], [Fraction(5), Fraction(-3), Fraction(1)]):
        with pytest.raises(Rejection):
            check_isogeny_identity(a, velu_codomain(a, 5, h), 5, h, "test")


@pytest.mark.parametrize("u", [1, 11, Fraction(1, 3), Fraction(7, 10)])
def test_kernel_from_codomain_equals_ellisogeny_kernel(u):
    """Stark's method (Stark 1972; Bostan–Morain–Salvy–Schost 2008) recovers the kernel polynomial that
    cypari2's ellisogeny reports for the 5-isogeny of y² + y = x³ − x² − 10x − 20 in short form, scaled
    by u (y² = x³ + A/u⁴·x + B/u⁶): an integral kernel for u = 1 and 1/3, and kernels with denominators,
    which need the rational reconstruction, for u = 11 and 7/10."""
    E = pari.ellinit([0, -1, 1, -10, -20])
    A, B = Fraction(-27 * int(E[9])) / u ** 4, Fraction(-54 * int(E[10])) / u ** 6
    short = pari.ellinit([str(A), str(B)])
    image, (_, _, kernel) = pari.ellisogeny(short, pari.elltors(short)[2][0])
    found = kernel_from_codomain(A, B, Fraction(str(image[3])), Fraction(str(image[4])), 5)
    expected = [Fraction(str(kernel.polcoef(i))) for i in range(3)]
    assert found == expected
    assert any(c.denominator > 1 for c in expected) == (u in (11, Fraction(7, 10)))


def _x_map_degrees(a, ell, h):
    """(deg N, leading coefficient of N, deg of κH^m, c) for the verifier's x-map of h."""
    from certify.verifier.isogeny import x_map
    n, H, kappa, m = x_map(a, ell, h)
    common = 1
    for c in h:
        common = common * c.denominator // math.gcd(common, c.denominator)
    return len(n) - 1, n[-1], m * (len(H) - 1), common


@pytest.mark.parametrize("model, ell", [((0, -1, 1, -10, -20), 5), ((1, 0, 1, 4, -6), 3), ((1, 1, 1, -10, -10), 2),
                                        ((1, -1, 1, -3, 3), 7), ((0, 0, 1, -2174420, 1234136692), 163)])
def test_x_map_matches_cypari2_and_has_degree_ell(model, ell):
    """Vélu 1971 and cypari2's ellisogeny: for each rational kernel polynomial (the 163-kernel from our
    certificate), the verifier's x-map N/(κH^m) equals the x-coordinate map cypari2 returns, at ten rational
    points, and deg N = ℓ, deg κH^m = ℓ − 1, with the leading coefficient 2c³ of N for ℓ odd (c the common
    denominator of h): check_isogeny_identity relies on these instead of checking them."""
    from certify.isogeny.certificate import certify_isogeny_class
    from certify.verifier.isogeny import x_map
    curve, E = Curve(model), pari.ellinit(list(model))
    if ell == 2:
        kernels = [[-Fraction(str(r)), Fraction(1)] for r in pari(f"nfroots(,{pari.elldivpol(E, 2)})")]
    elif ell == 163:
        cert = certify_isogeny_class(tuple(Fraction(c) for c in model))
        kernels = [[Fraction(c) for c in edge["kernel"]] for edge in cert["evidence"]["edges"] if edge["source"] == "0"]
    else:
        kernels = kernels_by_factoring(curve, ell, len(_isogenies_of_degree(E, ell)))
    assert kernels
    for h in kernels:
        n, H, kappa, m = x_map(curve.a, ell, h)
        numerator, _, denominator = pari.ellisogeny(E, pari_polynomial(h))[1]   # x ↦ X/Z² (PARI's convention)
        for x in (Fraction(k, 7) + 1000 for k in range(10)):
            ours = sum(c * x ** i for i, c in enumerate(n)) / (kappa * sum(c * x ** i for i, c in enumerate(H)) ** m)
            at = pari(str(x))
            assert ours == Fraction(str(pari.substpol(numerator, "x", at) / pari.substpol(denominator, "x", at) ** 2))
        degree, leading, denominator_degree, common = _x_map_degrees(curve.a, ell, h)
        assert (degree, denominator_degree) == (ell, ell - 1)
        assert ell == 2 or leading == 2 * common ** 3


@given(st.sampled_from([3, 5, 7, 13]), st.lists(st.fractions(max_denominator=10 ** 6), min_size=6, max_size=6))
def test_x_map_of_any_admitted_kernel_has_degree_ell(ell, coefficients):
    """Vélu's formulas (Vélu 1971) for a made-up monic h of degree (ℓ − 1)/2, the only shape read_edge
    admits: deg N = ℓ with leading coefficient 2c³, and deg κH² = ℓ − 1, whatever the coefficients."""
    h = [Fraction(c) for c in coefficients[:(ell - 1) // 2]] + [Fraction(1)]
    degree, leading, denominator_degree, common = _x_map_degrees((1, -1, 1, -3, 3), ell, h)
    assert (degree, leading, denominator_degree) == (ell, 2 * common ** 3, ell - 1)
