"""``certify bundle CERT… -o appendix.json``: many accepted certificates in one file a journal can host;
``-o appendix.pyz`` writes the same bundle inside a referee's kit (``certify.verifier.kit``), a zip
archive with the verifier's own source that a bare ``python3 -S appendix.pyz`` runs.

A bundle is a JSON object: ``format`` "certify-bundle", ``version`` "1", a ``manifest`` with the
member ``count`` and, per member in order, its ``name``, ``label`` (from the author's list of curves,
through the certificate's metadata; may be empty), ``format``, ``digest`` and ``claim`` (in the
verifier's wording), the ``members`` themselves, and an unhashed ``metadata`` block. The bundle's
digest covers format, version and manifest; since the manifest holds each member's digest, and the
verifier rejects a member whose digest, format or claim differ from its manifest entry, the bundle's
digest pins every member.
"""
from __future__ import annotations

import io
import os
import zipfile

from certify.certificates import stamp, to_json
from certify.verifier.digest import BUNDLE_FORMAT
from certify.verifier.kit import KIT_SUFFIX, package_files
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
        label = cert.get("metadata", {}).get("label", "") if isinstance(cert.get("metadata"), dict) else ""
        manifest.append({"name": member_name(source, taken), "label": label, "format": cert["format"],
                         "digest": verdict["digest"], "claim": verdict["reason"]})
    return stamp({"format": BUNDLE_FORMAT, "version": BUNDLE_VERSION,
                  "manifest": {"count": str(len(manifest)), "members": manifest},
                  "members": [cert for _, cert, _ in certificates]})


def kit_bytes(bundle: dict, name: str) -> bytes:
    """The kit for a bundle: a zip archive (deflated, fixed timestamps, members in path order) with the
    verifier's source, its launcher and the bundle as ``name`` (NAME.json for an output NAME.pyz)."""
    files = dict(package_files(), **{name: to_json(bundle).encode("utf-8")})
    buffer = io.BytesIO()
    with zipfile.ZipFile(buffer, "w", zipfile.ZIP_DEFLATED) as archive:
        for path in sorted(files):
            info = zipfile.ZipInfo(path, date_time=(2000, 1, 1, 0, 0, 0))
            info.compress_type = zipfile.ZIP_DEFLATED
            archive.writestr(info, files[path])
    return buffer.getvalue()


def bundle_file(bundle: dict, output: str):
    """What ``certify bundle`` writes to ``output``: the JSON text, or a kit when it ends in .pyz."""
    if output.endswith(KIT_SUFFIX):
        stem = os.path.basename(output)[:-len(KIT_SUFFIX)]
        return kit_bytes(bundle, "".join(c if c.isascii() and (c.isalnum() or c in "-_") else "_" for c in stem) + ".json")
    return to_json(bundle)
