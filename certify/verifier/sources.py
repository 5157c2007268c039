"""Where certificates come from: files, bundles, directories of files, and SQLite stores.

A path names a *source*. A ``.sqlite`` file is a store written by ``certify batch`` (table
``certificates``, one row per certificate, with the digest recorded when it was written); a
directory stands for the regular ``*.json`` files in it, in name order (a named pipe there would wait for
a writer without end); a ``.pyz`` file is a referee's kit (``certify.verifier.kit``), read for the bundle
it carries; ``-`` is standard input; any other path is one JSON file, either a certificate or a bundle
(format ``certify-bundle``: a manifest listing each member's name, label, format, digest and claim, and
the members). A recorded digest (in a manifest or a store) must equal the digest of the certificate it
names, or that certificate is rejected.
"""
import hashlib
import json
import os
import sqlite3
import sys

from certify.verifier.certificate import check_shape
from certify.verifier.digest import BUNDLE_FORMAT, NotCanonical, digest
from certify.verifier.errors import Rejection, show
from certify.verifier.kit import KIT_SUFFIX, KitError, read_kit
from certify.verifier.limits import (MAX_DEPTH, MAX_DIGITS, MAX_FILE_BYTES, MAX_NAME_BYTES, MAX_STORE_MEMORY,
                                     MAX_STORE_STEPS, MAX_VALUES)

BUNDLE_VERSION = "1"

MANIFEST_FIELDS = ("name", "label", "format", "digest", "claim")
"""What a bundle's manifest records for each member, in order (the label, from the author's list of
curves, may be empty)."""

STORE_SUFFIX = ".sqlite"
STORE_TABLE = "certificates"
STORE_COLUMNS = ("curve", "kind", "label", "document", "digest")
"""The store's table: the curve as '[a1,a2,a3,a4,a6]', the kind ('torsion' or 'isogeny-class'), the
label the batch file gave, the certificate's JSON text and its digest; (curve, kind) is the key."""


class Unreadable(Exception):
    """The source cannot be read as certificates at all."""


def tasks(path: str):
    """The units of work for one source: ('file', path), ('data', name, bytes) for standard input ('-')
    and the bundle inside a kit, or ('row', name, bytes or Unreadable, {"digest": recorded}) per store row."""
    if path == "-":
        yield ("data", "<stdin>", sys.stdin.buffer.read(MAX_FILE_BYTES + 1))
    elif path.endswith(STORE_SUFFIX) and os.path.isfile(path):
        yield from store_rows(path)
    elif path.endswith(KIT_SUFFIX) and os.path.isfile(path):
        try:
            bundle, data, _ = read_kit(read(path))
        except (KitError, Unreadable) as error:
            raise Unreadable(f"{path}: {error}")
        yield ("data", f"{path}#{bundle}", data)
    elif os.path.isdir(path):
        names = sorted(name for name in os.listdir(path) if name.endswith(".json") and not name.startswith(".")
                       and os.path.isfile(os.path.join(path, name)))
        if not names:
            raise Unreadable(f"{path}: the directory holds no .json certificates")
        yield from (("file", os.path.join(path, name)) for name in names)
    else:
        yield ("file", path)


STORE_QUERY = (f"SELECT substr(CAST(curve AS BLOB), 1, {MAX_NAME_BYTES}), "
               f"substr(CAST(kind AS BLOB), 1, {MAX_NAME_BYTES}), typeof(document), "
               f"CASE WHEN typeof(document) = 'text' AND length(CAST(document AS BLOB)) <= {MAX_FILE_BYTES} "
               f"THEN CAST(document AS BLOB) END, "
               f"CASE WHEN typeof(digest) = 'text' THEN substr(CAST(digest AS BLOB), 1, {MAX_NAME_BYTES}) END "
               f"FROM {STORE_TABLE} ORDER BY curve, kind")
"""Each row as bytes, every column cut to size inside SQLite: a column of any type, NULL or oversized
reaches Python as at most MAX_NAME_BYTES (names and digest) or MAX_FILE_BYTES (the document) bytes."""


def store_rows(path: str):
    """('row', 'STORE#curve/kind', document bytes or Unreadable, {"digest": recorded digest}) for every row
    of a store, in key order. The store is opened read-only; ``certificates`` must be a plain table
    (``check_plain_table``: a view, a virtual table or a generated column could compute without end),
    SQLite's own work is cut off after MAX_STORE_STEPS virtual-machine steps per row and its memory at
    MAX_STORE_MEMORY bytes, and a row with a document that is not text of at most MAX_FILE_BYTES is one
    unreadable verdict; the run goes on."""
    try:
        connection = sqlite3.connect(f"file:{path}?mode=ro", uri=True)
    except sqlite3.Error as error:
        raise Unreadable(f"{path}: not a certify store ({error})")
    try:
        connection.text_factory = bytes
        connection.execute(f"PRAGMA hard_heap_limit = {MAX_STORE_MEMORY}")
        steps = [0]

        def interrupt() -> int:
            steps[0] += 1000
            return steps[0] > MAX_STORE_STEPS
        connection.set_progress_handler(interrupt, 1000)
        check_plain_table(connection, path)
        rows = connection.execute(STORE_QUERY)
        while True:
            steps[0] = 0
            row = rows.fetchone()
            if row is None:
                break
            curve, kind, type_name, document, recorded = row
            name = f"{path}#{_text(curve)}/{_text(kind)}"
            if document is None:
                document = Unreadable(f"the store holds no JSON text for this row (a {_text(type_name)} value, "
                                      f"or more than {MAX_FILE_BYTES} bytes)")
            yield ("row", name, document, {"digest": _text(recorded) if recorded is not None else None})
    except sqlite3.Error as error:
        raise Unreadable(f"{path}: not a certify store ({error})")
    finally:
        connection.close()


def check_plain_table(connection, path: str) -> None:
    """``certificates`` is an ordinary table with ordinary columns, so that reading a row computes nothing:
    not a view, not a virtual table (a module's code runs on every read), and no generated column (its
    expression is evaluated on every read, inside one SQLite step, where the step limit cannot cut it off)."""
    entry = connection.execute("SELECT type, sql FROM sqlite_master WHERE name = ?", (STORE_TABLE,)).fetchone()
    if entry is None or entry[0] != b"table":
        raise Unreadable(f"{path}: not a certify store (no table {STORE_TABLE!r})")
    if not (entry[1] or b"").lstrip().upper().startswith(b"CREATE TABLE"):
        raise Unreadable(f"{path}: not a certify store ({STORE_TABLE!r} is a virtual table)")
    if any(column[6] for column in connection.execute(f"PRAGMA table_xinfo({STORE_TABLE})")):
        raise Unreadable(f"{path}: not a certify store ({STORE_TABLE!r} has a generated column)")


def _text(value) -> str:
    """A store column read as bytes, as text (invalid UTF-8 replaced)."""
    return value.decode("utf-8", errors="replace") if isinstance(value, bytes) else str(value)


def documents(task) -> tuple:
    """(entries, bundle) for one task: entries [(name, parsed certificate or Unreadable, {field: value
    recorded beside it}, label)], one per member for a bundle; bundle None, or for a bundle
    {"file", "digest", "file digest", "members"} (its canonical digest, the SHA-256 of its bytes)."""
    if task[0] == "row":
        _, name, data, recorded = task
        try:
            return [(name, data if isinstance(data, Unreadable) else parse(data), recorded, None)], None
        except Unreadable as error:
            return [(name, error, recorded, None)], None
    name = task[1]
    try:
        data = task[2] if task[0] == "data" else read(name)
        document = parse(data)
    except Unreadable as error:
        return [(name, error, {}, None)], None
    if isinstance(document, dict) and document.get("format") == BUNDLE_FORMAT:
        entries = bundle_members(name, document)
        if not entries:
            return [(name, Unreadable("the bundle has no members"), {}, None)], None
        if isinstance(entries[0][1], Unreadable) and len(entries) == 1 and entries[0][0] == name:
            return entries, None
        try:
            bundle_digest = digest(document)
        except NotCanonical as error:
            return [(name, Unreadable(f"the bundle has no digest: {error}"), {}, None)], None
        return entries, {"file": name, "digest": bundle_digest, "members": len(entries),
                         "file digest": "sha256:" + hashlib.sha256(data).hexdigest()}
    return [(name, document, {}, None)], None


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
    """The one reading of a JSON document (RFC 8259), refusing what two JSON readers could read
    differently: an object key given twice (readers keep the first or the last), NaN and Infinity (not
    JSON), floating-point numbers (no canonical text), lone surrogates (not Unicode). Every size limit
    is applied here, before any other step sees the document: the file size and the number of values
    before parsing, the size of JSON numbers while parsing, then nesting, list and string lengths."""
    if len(data) > MAX_FILE_BYTES:
        raise Unreadable(f"the document is larger than {MAX_FILE_BYTES} bytes")
    values = data.count(b",") + data.count(b"[") + data.count(b"{")
    if values > MAX_VALUES:
        raise Unreadable(f"the document may hold more than {MAX_VALUES} JSON values")
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as error:
        raise Unreadable(f"not UTF-8 text: {str(error)[:120]}")
    try:
        document = json.loads(text, object_pairs_hook=_object, parse_constant=_not_json,
                              parse_int=_integer, parse_float=_floating)
    except Unreadable:
        raise
    except RecursionError:
        raise Unreadable(f"the document nests deeper than {MAX_DEPTH} levels")
    except ValueError as error:
        raise Unreadable(f"not a JSON document: {str(error)[:120]}")
    try:
        check_shape(document)
    except Rejection as rejection:
        raise Unreadable(str(rejection))
    return document


def _object(pairs: list) -> dict:
    """A JSON object whose keys are distinct."""
    result = dict(pairs)
    if len(result) != len(pairs):
        seen = set()
        key = next(key for key, _ in pairs if key in seen or seen.add(key))
        raise Unreadable(f"duplicate key: the object gives {show(key)} twice")
    return result


def _not_json(name: str):
    raise Unreadable(f"{name} is not JSON")


def _integer(text: str) -> int:
    if len(text) > MAX_DIGITS:
        raise Unreadable(f"a JSON number has more than {MAX_DIGITS} digits")
    return int(text)


def _floating(text: str):
    raise Unreadable(f"the floating-point number {show(text)} has no canonical form; numbers are written as strings")


def bundle_members(path: str, bundle: dict) -> list:
    """The members of a bundle as (path#name, certificate, what the manifest records for it). A manifest
    that does not describe the members one to one makes the whole bundle unreadable."""
    manifest, members = bundle.get("manifest"), bundle.get("members")
    if bundle.get("version") != BUNDLE_VERSION:
        return [(path, Unreadable(f"unknown bundle version {show(bundle.get('version'))}"), {}, None)]
    listed = manifest.get("members") if isinstance(manifest, dict) else None
    if not isinstance(listed, list) or not isinstance(members, list):
        return [(path, Unreadable("a bundle needs a manifest with a member list, and the members"), {}, None)]
    if manifest.get("count") != str(len(members)) or len(listed) != len(members):
        error = Unreadable(f"the manifest counts {show(manifest.get('count'))} members and lists {len(listed)}, "
                           f"the bundle holds {len(members)}")
        return [(path, error, {}, None)]
    out = []
    for entry, member in zip(listed, members):
        entry = entry if isinstance(entry, dict) else {}
        recorded = {key: entry.get(key) for key in MANIFEST_FIELDS if key not in ("name", "label")}
        name, label = (value if isinstance(value, str) else show(value) for value in (entry.get("name"),
                                                                                        entry.get("label", "")))
        out.append((f"{path}#{name[:MAX_NAME_BYTES]}", member, recorded, label[:MAX_NAME_BYTES] or None))
    return out


def check_recorded(document, recorded: dict, claim: str) -> str:
    """The document's digest; each field recorded beside it (digest, format, claim) must agree with it."""
    found = {"digest": digest(document), "format": document["format"], "claim": claim}
    for key, value in recorded.items():
        if value != found[key]:
            raise Rejection("recorded " + key, f"the {key} recorded for the certificate is not its {key}",
                            recorded=value, found=found[key])
    return found["digest"]
