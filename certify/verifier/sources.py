"""Where certificates come from: files, bundles, directories of files, and SQLite stores.

A path names a *source*. A ``.sqlite`` file is a store written by ``certify batch`` (table
``certificates``, one row per certificate, with the digest recorded when it was written); a
directory stands for the ``*.json`` files in it, in name order; any other path is one JSON file,
either a certificate or a bundle (format ``certify-bundle``: a manifest listing each member's
name, format, digest and claim, and the members). A recorded digest (in a manifest or a store) must
equal the digest of the certificate it names, or that certificate is rejected.
"""
import json
import os
import sqlite3

from certify.verifier.digest import BUNDLE_FORMAT, digest
from certify.verifier.errors import Rejection
from certify.verifier.limits import MAX_FILE_BYTES

BUNDLE_VERSION = "1"

MANIFEST_FIELDS = ("name", "format", "digest", "claim")
"""What a bundle's manifest records for each member, in order."""

STORE_SUFFIX = ".sqlite"
STORE_TABLE = "certificates"
STORE_COLUMNS = ("curve", "kind", "label", "document", "digest")
"""The store's table: the curve as '[a1,a2,a3,a4,a6]', the kind ('torsion' or 'isogeny-class'), the
label the batch file gave, the certificate's JSON text and its digest; (curve, kind) is the key."""


class Unreadable(Exception):
    """The source cannot be read as certificates at all."""


def tasks(path: str):
    """The units of work for one source: ('file', path) or ('text', name, JSON text, {"digest": recorded})."""
    if path.endswith(STORE_SUFFIX) and os.path.isfile(path):
        yield from store_rows(path)
    elif os.path.isdir(path):
        names = sorted(name for name in os.listdir(path) if name.endswith(".json") and not name.startswith("."))
        if not names:
            raise Unreadable(f"{path}: the directory holds no .json certificates")
        yield from (("file", os.path.join(path, name)) for name in names)
    else:
        yield ("file", path)


def store_rows(path: str):
    """('text', 'STORE#curve/kind', document, {"digest": recorded digest}) for every row of a store, in key order."""
    try:
        connection = sqlite3.connect(f"file:{path}?mode=ro", uri=True)
        rows = connection.execute(f"SELECT curve, kind, document, digest FROM {STORE_TABLE} ORDER BY curve, kind")
        for curve, kind, document, recorded in rows:
            yield ("text", f"{path}#{curve}/{kind}", document, {"digest": recorded})
    except sqlite3.Error as error:
        raise Unreadable(f"{path}: not a certify store ({error})")
    connection.close()


def documents(task) -> list:
    """[(name, parsed certificate or Unreadable, {field: value recorded beside it})] for one task; a
    bundle gives one entry per member."""
    if task[0] == "text":
        _, name, text, recorded = task
        try:
            return [(name, parse(text.encode("utf-8")), recorded)]
        except Unreadable as error:
            return [(name, error, recorded)]
    path = task[1]
    try:
        document = parse(read(path))
    except Unreadable as error:
        return [(path, error, {})]
    if isinstance(document, dict) and document.get("format") == BUNDLE_FORMAT:
        return bundle_members(path, document)
    return [(path, document, {})]


def read(path: str) -> bytes:
    """The bytes of a file of at most MAX_FILE_BYTES."""
    try:
        with open(path, "rb") as handle:
            data = handle.read(MAX_FILE_BYTES + 1)
    except OSError as error:
        raise Unreadable(f"cannot read the file: {error.strerror}")
    if len(data) > MAX_FILE_BYTES:
        raise Unreadable(f"the file is larger than {MAX_FILE_BYTES} bytes")
    return data


def parse(data: bytes):
    """The parsed JSON of a document."""
    try:
        return json.loads(data.decode("utf-8"))
    except (UnicodeDecodeError, ValueError, RecursionError) as error:
        raise Unreadable(f"not a JSON document: {str(error)[:120]}")


def bundle_members(path: str, bundle: dict) -> list:
    """The members of a bundle as (path#name, certificate, what the manifest records for it). A manifest
    that does not describe the members one to one makes the whole bundle unreadable."""
    manifest, members = bundle.get("manifest"), bundle.get("members")
    if bundle.get("version") != BUNDLE_VERSION:
        return [(path, Unreadable(f"unknown bundle version {bundle.get('version')!r}"), {})]
    listed = manifest.get("members") if isinstance(manifest, dict) else None
    if not isinstance(listed, list) or not isinstance(members, list):
        return [(path, Unreadable("a bundle needs a manifest with a member list, and the members"), {})]
    if manifest.get("count") != str(len(members)) or len(listed) != len(members):
        error = Unreadable(f"the manifest counts {manifest.get('count')!r} members and lists {len(listed)}, "
                           f"the bundle holds {len(members)}")
        return [(path, error, {})]
    out = []
    for entry, member in zip(listed, members):
        entry = entry if isinstance(entry, dict) else {}
        recorded = {key: entry.get(key) for key in MANIFEST_FIELDS if key != "name"}
        out.append((f"{path}#{entry.get('name')}", member, recorded))
    return out


def check_recorded(document, recorded: dict, claim: str) -> str:
    """The document's digest; each field recorded beside it (digest, format, claim) must agree with it."""
    found = {"digest": digest(document), "format": document["format"], "claim": claim}
    for key, value in recorded.items():
        if value != found[key]:
            raise Rejection("recorded " + key, f"the {key} recorded for the certificate is not its {key}",
                            recorded=value, found=found[key])
    return found["digest"]
