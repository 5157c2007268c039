"""Rational kernel polynomials of the ℓ-isogenies of a curve over Q.

A rational ℓ-subgroup C has a rational kernel polynomial h = Π (x − x(P)) over the pairs ±P of C − O,
of degree 1 for ℓ = 2 and (ℓ − 1)/2 for ℓ odd, dividing the ℓ-division polynomial (Kohel 1996, §2.4).
For ℓ ≤ 13 h is found among the products of irreducible factors of ψ_ℓ; Galois acts on the x(P) of C
through a cyclic quotient of (Z/ℓ)*/±1, freely, so the factors of one kernel have one degree. For the
larger ℓ of the finite j-lists the codomain is found first (certify.isogeny.modular) and the kernel
from it (certify.isogeny.series)."""
import math
from fractions import Fraction
from itertools import combinations

from certify.curves import Curve
from certify.isogeny.modular import codomain_candidates
from certify.isogeny.series import kernel_from_codomain
from certify.pari import pari
from certify.verifier.curves import division_polynomials
from certify.verifier.errors import Rejection
from certify.verifier.isogeny import check_isogeny_identity, velu_codomain


def linear_kernels(roots: list) -> list:
    """The kernel polynomials x − x0 (constant term first) for the rational roots x0 of F or ψ_3."""
    return [[-x0, Fraction(1)] for x0 in roots]


def is_kernel(model: Curve, ell: int, h: list) -> bool:
    """Whether h defines a rational ℓ-isogeny from the model (the verifier's own identity check)."""
    try:
        check_isogeny_identity(model.a, velu_codomain(model.a, ell, h), ell, h, "candidate kernel")
    except Rejection:
        return False
    return True


def kernels_by_factoring(model: Curve, ell: int, expected: int) -> list:
    """The ``expected`` rational kernel polynomials of degree (ℓ − 1)/2 among products of factors of ψ_ℓ."""
    psi = division_polynomials(model.a, ell)[ell]
    x = pari("x")
    factors = pari.factor(sum(c * x ** i for i, c in enumerate(psi)))[0]
    by_degree = {}
    for factor in factors:
        monic = factor / pari.pollead(factor)
        by_degree.setdefault(int(pari.poldegree(monic)), []).append(
            [Fraction(str(monic.polcoef(i))) for i in range(int(pari.poldegree(monic)) + 1)])
    half, found = (ell - 1) // 2, []
    for degree, group in sorted(by_degree.items()):
        if half % degree:
            continue
        for choice in combinations(group, half // degree):
            h = [Fraction(1)]
            for factor in choice:
                h = _multiply(h, factor)
            if is_kernel(model, ell, h):
                found.append(h)
                if len(found) == expected:
                    return found
    raise RuntimeError(f"found {len(found)} of {expected} rational {ell}-isogeny kernels")


def kernel_by_codomain(model: Curve, ell: int) -> list:
    """The kernel polynomial of the one rational ℓ-isogeny of a curve whose j is in the list for ℓ.
    ``kernel_from_codomain`` has checked exactly that Vélu's formulas take it to the codomain; the
    isogeny identity, which costs seconds at ℓ = 163, is left to the verifier."""
    b2 = model.b[0]
    for A2, B2 in codomain_candidates(model, ell):
        short = kernel_from_codomain(-27 * model.c4, -54 * model.c6, A2, B2, ell)
        if short is not None:
            return _substitute_affine(short, Fraction(36), 3 * b2)
    raise RuntimeError(f"no rational {ell}-isogeny found from a curve with j in the list")


def _multiply(f: list, g: list) -> list:
    out = [Fraction(0)] * (len(f) + len(g) - 1)
    for i, a in enumerate(f):
        for k, b in enumerate(g):
            out[i + k] += a * b
    return out


def _substitute_affine(h: list, scale: Fraction, shift: Fraction) -> list:
    """h(scale·x + shift)/scale^deg h, monic again: the kernel polynomial after x_short = scale·x + shift
    (x_short = 36x + 3b2 takes a model to its short model y² = x³ − 27c4x − 54c6). With q the common
    denominator of scale and shift, S = q·scale and T = q·shift, and d that of the c_i,
    d·q^n·h(scale·x + shift) = Σ d·c_i·q^(n−i)·(Sx + T)^i, by Horner's rule in integers."""
    q = math.lcm(Fraction(scale).denominator, Fraction(shift).denominator)
    S, T = int(scale * q), int(shift * q)
    d = math.lcm(*(Fraction(c).denominator for c in h))
    n = len(h) - 1
    out = [int(h[n] * d)]
    for i in range(n - 1, -1, -1):
        out = [T * a + S * b for a, b in zip(out + [0], [0] + out)]
        out[0] += int(h[i] * d) * q ** (n - i)
    return [Fraction(c, out[-1]) for c in out]
