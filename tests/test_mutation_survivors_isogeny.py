"""Tests written for the mutants of certify/verifier/isogeny.py that survived the mutation run (issue 15;
``tests/mutation_run.py``, ``python bench/bench_mutation.py isogeny.py``). Each test names the mutants it
kills.

Where a weakened check would accept a false claim, the test builds that certificate (from a genuine one
made by the certifier) and asks cypari2's ellisomat (the reference library's isogeny-class routine) that
the claim is false, so the verifier must reject it, naming the check. Where the mutant would refuse a
genuine certificate, the test has the certifier make one, and asks ellisomat that its claim is true.
"""
import copy
from fractions import Fraction

import pytest

from certify.isogeny.certificate import certify_isogeny_class
from certify.verifier import verify
from certify.verifier.errors import Rejection
from isogeny_reference import claim_matches_reference


def certificate(a) -> dict:
    """The certifier's certificate for the curve with integer coefficients a (a fresh copy)."""
    return copy.deepcopy(certify_isogeny_class(tuple(Fraction(c) for c in a)))


def rejection(cert) -> Rejection:
    with pytest.raises(Rejection) as caught:
        verify(cert)
    return caught.value


def witness(cert: dict, curve: int, ell: int) -> dict:
    """The completeness witness of the listed curve and ℓ."""
    return next(w for w in cert["evidence"]["completeness"]
                if w["curve"] == str(curve) and w["degree"] == str(ell))


def accepted_and_true(cert: dict) -> bool:
    """The verifier accepts, and cypari2's ellisomat gives the same class and degree matrix."""
    verify(cert)
    return claim_matches_reference(cert)


# --- the published constants ---

THIRTEEN = (0, -1, 1, -2, -1)
"""y² + y = x³ − x² − 2x − 1, conductor 147 in Cremona's table (tests/data), whose class ellisomat gives as
two curves joined by a 13-isogeny; no Frobenius witness excludes ℓ = 13 (there is a 13-isogeny), so
the certifier's witness for ℓ = 13 is the root of X_0(13)."""


def test_a_class_with_a_thirteen_isogeny_is_certified_by_its_x0_root():
    """Kills the mutants of X0_NUMERATORS[13] (its key 13 -> 14, and each coefficient of
    P_13 = (t² + 5t + 13)(t⁴ + 7t³ + 20t² + 19t + 1)³, Maier 2009, Table 3): with the key moved the
    x0-roots witness of ℓ = 13 is refused (or cannot be made), and with a coefficient moved P_13(t) − j·t
    has another set of rational roots, so the genuine class (ellisomat) is refused, or a class without its
    13-isogeny is made and accepted — which ellisomat denies."""
    cert = certificate(THIRTEEN)
    for curve in (0, 1):
        assert witness(cert, curve, 13)["method"] == "x0-roots" and len(witness(cert, curve, 13)["roots"]) == 1
    assert accepted_and_true(cert)
