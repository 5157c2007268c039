"""The isogeny-class certificate: the class of reduced minimal models, its matrix of cyclic degrees,
and the evidence certify.verifier.isogeny rechecks (kernels, changes of variables, witnesses)."""
from fractions import Fraction

from certify.curves import Curve, format_rational
from certify.isogeny.enumerate import close_class
from certify.pari import pari
from certify.verifier import theorems
from certify.verifier.isogeny import FORMAT, RELIES_ON, cyclic_degrees


def strings(values) -> list:
    return [format_rational(Fraction(v)) for v in values]


def degree_matrix(size: int, edges: list) -> list:
    """The cyclic degrees: least products of degrees along paths (every rational isogeny between two
    curves is a multiple of one cyclic isogeny, of least degree; see the verifier's prime-degree-factorisation)."""
    return cyclic_degrees(size, [{"source": s, "target": t, "ell": ell} for s, t, ell, _, _ in edges])


def minimality_primes(model: Curve) -> list:
    """The primes p ≥ 5 dividing gcd(c4, c6): the hint for the verifier's minimality check."""
    from math import gcd

    common = abs(gcd(int(model.c4), int(model.c6)))
    return [str(p) for p in (int(q) for q in pari.factor(common)[0]) if p >= 5] if common > 1 else []


def witness_entry(index: int, ell: int, witness: dict) -> dict:
    entry = {"curve": str(index), "degree": str(ell), "method": witness["method"]}
    if "prime" in witness:
        entry["prime"] = str(witness["prime"])
    if "roots" in witness:
        entry["roots"] = strings(witness["roots"])
    return entry


def certify_isogeny_class(a, given=None) -> dict:
    """The certificate for the isogeny class of the curve with coefficients a (Fractions); ``given`` are
    the coefficients as typed, kept in ``curve`` (their canonical forms when not given)."""
    first, change = Curve(a).minimal_model()
    found = close_class(first)
    return {
        "format": FORMAT,
        "version": "1",
        "curve": list(given) if given is not None else strings(a),
        "claim": {"curves": [strings(model.a) for model in found.curves],
                  "degrees": [[str(d) for d in row] for row in degree_matrix(len(found.curves), found.edges)]},
        "evidence": {
            "input_change": strings(change),
            "minimality": [{"primes": minimality_primes(model)} for model in found.curves],
            "edges": [{"source": str(s), "target": str(t), "degree": str(ell), "kernel": strings(h),
                       "change": strings(c)} for s, t, ell, h, c in found.edges],
            "completeness": [witness_entry(i, ell, w) for (i, ell), w in sorted(found.witnesses.items())],
        },
        "relies_on": theorems.entries(RELIES_ON),
    }
