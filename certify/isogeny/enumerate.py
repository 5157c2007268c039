"""Closing the isogeny class: every rational isogeny of prime degree from every curve reached.

Every isogeny over Q is a composite of isogenies of prime degree over Q (Silverman III.4.11), and the
prime degrees are those of Mazur's list (Mazur 1978), so the class is the closure of the input curve
under them. For each curve and each ℓ the search also keeps the witness that it found them all."""
from dataclasses import dataclass, field

from certify.curves import Curve
from certify.isogeny.kernels import kernel_by_codomain, kernels_by_factoring, linear_kernels
from certify.isogeny.modular import frobenius_witnesses, x0_polynomial
from certify.roots import rational_roots, roots_with_hint
from certify.verifier.curves import division_polynomials, two_division_polynomial
from certify.verifier.isogeny import FINITE_J, MAZUR_PRIMES, velu_codomain

FROBENIUS_ELLS = (3, 5, 7, 13)
"""The ℓ for which a Frobenius witness is tried first; for the ℓ of the finite j-lists, the list is the
cheaper witness, and for ℓ = 2 no Frobenius witness exists (every non-zero class mod 2 is a square)."""


@dataclass
class IsogenyClass:
    curves: list = field(default_factory=list)          # reduced minimal models (Curve), input's first
    edges: list = field(default_factory=list)           # (source, target, ℓ, kernel, change)
    witnesses: dict = field(default_factory=dict)       # (curve index, ℓ) → witness dict (exact values)


def isogenies_of_degree(model: Curve, ell: int, frobenius: dict) -> tuple:
    """(kernel polynomials of all rational ℓ-isogenies from the model, completeness witness)."""
    j = model.j
    special = j in (0, 1728)
    if ell in frobenius:
        return [], {"method": "frobenius", "prime": frobenius[ell]}
    if ell in FINITE_J:
        if j in FINITE_J[ell]:
            return [kernel_by_codomain(model, ell)], {"method": "j-list"}
        return [], {"method": "j-list"}
    if special:
        if ell not in (2, 3):
            raise RuntimeError(f"no Frobenius witness for ℓ = {ell} on a curve with j = {j}")
        roots, p = roots_with_hint(_division_polynomial(model, ell))
        return linear_kernels(roots), {"method": "division-roots", "prime": p, "roots": roots}
    t_roots, p = roots_with_hint(x0_polynomial(ell, j))
    witness = {"method": "x0-roots", "prime": p, "roots": t_roots}
    if not t_roots:
        return [], witness
    if ell in (2, 3):
        kernels = linear_kernels(rational_roots(_division_polynomial(model, ell)))
        if len(kernels) != len(t_roots):
            raise RuntimeError(f"X_0({ell}) and the division polynomial disagree")
        return kernels, witness
    return kernels_by_factoring(model, ell, len(t_roots)), witness


def _division_polynomial(model: Curve, ell: int) -> list:
    """The 2-division polynomial F (its roots are the x(P) of the points of order 2) or ψ_3."""
    return two_division_polynomial(model.a) if ell == 2 else division_polynomials(model.a, 3)[3]


def close_class(first: Curve) -> IsogenyClass:
    """The isogeny class of a reduced minimal model, with kernels, changes of variables and witnesses."""
    result = IsogenyClass(curves=[first])
    frobenius = frobenius_witnesses(first, FROBENIUS_ELLS)
    index = {first.a: 0}
    position = 0
    while position < len(result.curves):
        source = result.curves[position]
        for ell in MAZUR_PRIMES:
            kernels, witness = isogenies_of_degree(source, ell, frobenius)
            result.witnesses[(position, ell)] = witness
            for h in kernels:
                target, change = Curve(velu_codomain(source.a, ell, h)).minimal_model()
                if target.a not in index:
                    index[target.a] = len(result.curves)
                    result.curves.append(target)
                result.edges.append((position, index[target.a], ell, h, change))
        position += 1
    return result
