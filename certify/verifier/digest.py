"""Digests: the SHA-256 of a canonical serialisation of what a certificate or bundle says.

The canonical serialisation of a JSON value is its ASCII JSON text with object keys sorted by code
point, no whitespace, strings escaped as the standard library escapes them, and integers in decimal;
floating-point numbers are refused, since their text is not unique. It depends on nothing but the
value, so the digest is the same on every run, machine and Python version.

What is hashed: for a certificate, every top-level field except ``metadata`` (so format, version,
curve, claim, evidence, relies_on); for a bundle, its format, version and manifest (the manifest
holds each member's digest, so it pins the members). ``metadata`` (times, tool versions) is never
hashed and never read by the checks.
"""
import hashlib
import json
from fractions import Fraction

from certify.verifier.curves import change_point

BUNDLE_FORMAT = "certify-bundle"
UNHASHED = "metadata"
SHORT = 12
"""Hexadecimal digits in a short digest, the form tables and footnotes cite."""


class NotCanonical(ValueError):
    """The value has no canonical serialisation (it holds a float, or a non-string key)."""


def canonical(value) -> bytes:
    """The canonical serialisation of a JSON value (see the module docstring)."""
    stack = [value]
    while stack:
        item = stack.pop()
        if isinstance(item, float):
            raise NotCanonical(f"the floating-point number {item!r} has no canonical form; write numbers as strings")
        if isinstance(item, dict):
            stack.extend(item.values())
        elif isinstance(item, list):
            stack.extend(item)
    return json.dumps(value, sort_keys=True, separators=(",", ":"), ensure_ascii=True).encode("ascii")


def hashed_content(document: dict) -> dict:
    """The part of a certificate or bundle that its digest covers."""
    if document.get("format") == BUNDLE_FORMAT:
        return {key: document[key] for key in ("format", "version", "manifest") if key in document}
    return {key: value for key, value in document.items() if key != UNHASHED}


def digest(document: dict) -> str:
    """'sha256:' and the 64 hexadecimal digits of the SHA-256 of the canonical hashed content."""
    return "sha256:" + hashlib.sha256(canonical(hashed_content(document))).hexdigest()


def claim_digest(document: dict) -> str:
    """The digest of the claim alone, stated on the integral model the evidence names (for certify's
    certificates the reduced minimal model; an isogeny-class claim is already stated on reduced
    minimal models), whatever model the curve was given in and whatever evidence proves it:
    certificates for isomorphic models of one curve share it. Meaningful for an accepted certificate only."""
    claim = document["claim"]
    if document["format"] == "certify-torsion":
        model = document["evidence"]["integral_model"]
        change = [Fraction(v) for v in model["change"]]
        points = [[str(c) for c in change_point(tuple(Fraction(c) for c in P), change)] for P in claim["generators"]]
        content = {"model": model["curve"], "claim": {"invariants": claim["invariants"], "generators": points}}
    else:  # an isogeny class is stated on reduced minimal models, the first that of the curve
        content = {"claim": claim}
    return digest({"format": document["format"], "version": document["version"], **content})


def short(full: str) -> str:
    """The first SHORT hexadecimal digits of a digest, for tables: 'sha256:3f2a9c0e1b7d' → '3f2a9c0e1b7d'."""
    return full.split(":", 1)[1][:SHORT]
