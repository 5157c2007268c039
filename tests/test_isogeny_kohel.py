"""Vélu/Kohel codomains and x-maps from kernel polynomials, against published formulas and cypari2."""
from fractions import Fraction

import pytest

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


def test_kernel_from_codomain_equals_ellisogeny_kernel():
    """Stark's method (Stark 1972; Bostan–Morain–Salvy–Schost 2008) recovers the kernel polynomial that
    cypari2's ellisogeny reports for the 5-isogeny of y² + y = x³ − x² − 10x − 20 in short form."""
    E = pari.ellinit([0, -1, 1, -10, -20])
    A, B = -27 * int(E[9]), -54 * int(E[10])
    short = pari.ellinit([A, B])
    image, (_, _, kernel) = pari.ellisogeny(short, pari.elltors(short)[2][0])
    found = kernel_from_codomain(Fraction(A), Fraction(B), Fraction(str(image[3])), Fraction(str(image[4])), 5)
    assert found == [Fraction(str(kernel.polcoef(i))) for i in range(3)]
