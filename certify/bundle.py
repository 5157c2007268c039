"""``certify bundle CERT… -o appendix.json``: many accepted certificates in one file a journal can host.

A bundle is a JSON object: ``format`` "certify-bundle", ``version`` "1", a ``manifest`` with the
member ``count`` and, per member in order, its ``name``, ``format``, ``digest`` and ``claim`` (in the
verifier's wording), the ``members`` themselves, and an unhashed ``metadata`` block. The bundle's
digest covers format, version and manifest; since the manifest holds each member's digest, and the
verifier rejects a member whose digest, format or claim differ from its manifest entry, the bundle's
digest pins every member.
"""
from __future__ import annotations

import os

from certify.certificates import stamp
from certify.verifier.digest import BUNDLE_FORMAT
from certify.verifier.sources import BUNDLE_VERSION


def member_name(source: str, taken: set) -> str:
    """A name for a member from where it came (file name, or the part after '#'), made unique."""
    base = source.rsplit("#", 1)[1] if "#" in source else os.path.basename(source)
    name, n = base, 1
    while name in taken:
        n += 1
        name = f"{base}~{n}"
    taken.add(name)
    return name


def build_bundle(certificates) -> dict:
    """The bundle of (name, certificate, verdict) triples, each already accepted by the verifier."""
    taken, manifest = set(), []
    for source, cert, verdict in certificates:
        manifest.append({"name": member_name(source, taken), "format": cert["format"],
                         "digest": verdict["digest"], "claim": verdict["reason"]})
    return stamp({"format": BUNDLE_FORMAT, "version": BUNDLE_VERSION,
                  "manifest": {"count": str(len(manifest)), "members": manifest},
                  "members": [cert for _, cert, _ in certificates]})
