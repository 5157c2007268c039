"""The verifier: rechecks certify's certificates from the curve alone, with the standard library only.

``verify(certificate)`` returns a summary of the checks run, or raises ``Rejection`` naming the check
that failed and the values involved. Nothing here imports the rest of certify.
"""
from certify.verifier.errors import Rejection
from certify.verifier.certificate import check_shape, field
from certify.verifier.schema import schema_violations

VERSION = "0.1.0"
"""The verifier's version; certify's own version is the same (tests/test_kit.py checks it)."""


def checkers() -> dict:
    """format name → (accepted versions, check function)."""
    from certify.verifier import conductor, isogeny, rank, torsion

    return {torsion.FORMAT: (torsion.VERSIONS, torsion.check_torsion_certificate),
            isogeny.FORMAT: (isogeny.VERSIONS, isogeny.check_isogeny_certificate),
            conductor.FORMAT: (conductor.VERSIONS, conductor.check_conductor_certificate),
            rank.FORMAT: (rank.VERSIONS, rank.check_rank_certificate)}


def verify(cert) -> dict:
    """Check one certificate (parsed JSON); returns {"format": ..., "checks": {...}} or raises Rejection."""
    require_object(cert)
    check_shape(cert)
    return verify_shaped(cert)


def verify_shaped(cert) -> dict:
    """``verify`` for a document whose shape ``check_shape`` has passed already: every document that
    ``sources.parse`` returns (the command line reads each file, store row and bundle through it)."""
    require_object(cert)
    name = field(cert, "format", str, "certificate")
    version = field(cert, "version", str, "certificate")
    known = checkers()
    if name not in known:
        raise Rejection("format", "unknown certificate format", format=name, known=sorted(known))
    versions, check = known[name]
    if version not in versions:
        raise Rejection("format", "unknown version of the format", format=name, version=version, known=list(versions))
    checks = check(cert)
    violations = schema_violations(cert)
    if violations:
        raise Rejection("schema", "; ".join(violations))
    return {"format": name, "checks": checks}


def require_object(cert) -> None:
    if not isinstance(cert, dict):
        raise Rejection("structure", "a certificate is a JSON object", found=type(cert).__name__)


__all__ = ["Rejection", "verify", "verify_shaped"]
