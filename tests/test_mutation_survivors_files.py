"""Tests written for the mutants of the verifier's file-handling modules that survived the first mutation run
(issue 15; ``tests/mutation_run.py``, ``python bench/bench_mutation.py``): the entry point (``__init__.py``),
shape limits and fields (``certificate.py``), the standard-library schema step (``schema.py``), the one JSON
reading (``sources.py``), digests, printing, the kit and every documented limit (``limits.py``). Each test
names the mutants it kills.

The outside sources: for a limit, the README's table of documented limits (section "Limits, and what a
rejection looks like"), read here, so that a limit shifted in ``limits.py`` no longer matches the documented
value the test builds its document from (exactly one past the limit: refused by the check that names it; at
the limit: accepted, or refused by another check); for the schema step, the reference library jsonschema
(``tests/schema_reference.py``); for printing, Unicode's character categories (``unicodedata``, as in
``tests/hostile_run.py``).
"""
import copy
import json
import re
from fractions import Fraction
from pathlib import Path

import pytest

from certify.verifier import verify
from certify.verifier.errors import Rejection
from hostile_run import assert_answered, run
from schema_reference import schema_violations as reference_violations
from soundness_pool import fresh

README = Path(__file__).resolve().parent.parent / "README.md"


def documented_limits() -> dict:
    """{row label: value} of the README's table of the verifier's limits."""
    text = README.read_text(encoding="utf-8")
    section = text.split("## Limits, and what a rejection looks like", 1)[1].split("\n## ", 1)[0]
    rows = {}
    for line in section.splitlines():
        cells = [cell.strip() for cell in line.strip().strip("|").split("|")]
        if line.startswith("| ") and len(cells) == 2 and cells[0] not in ("limit", "---"):
            rows[cells[0]] = cells[1]
    return rows


def documented(label: str, index: int = 0) -> int:
    """The ``index``-th number of the value of the README row whose label starts with ``label`` ('200 MB' is
    200,000,000 bytes)."""
    (value,) = [value for name, value in documented_limits().items() if name.startswith(label)]
    numbers = [(int(number.rstrip(",").replace(",", "")), unit)
               for number, unit in re.findall(r"(\d[\d,]*)\s*(MB)?", value)]
    number, unit = numbers[index]
    return number * 10 ** 6 if unit else number


def honest() -> dict:
    """An accepted torsion certificate (y² + xy + y = x³ − 19x + 26, Z/2 × Z/6 by cypari2's elltors: the
    pool's claim is checked against it in tests/test_soundness_false_claims.py)."""
    return fresh("torsion", 0)


def rejection(document, check: str = None) -> Rejection:
    with pytest.raises(Rejection) as caught:
        verify(document)
    if check is not None:
        assert caught.value.check == check, str(caught.value)
    return caught.value


def command_line(tmp_path, documents: dict) -> dict:
    """{name: verdict} of the bare verifier (``python -S -m certify.verifier --jsonl``) on one file per
    document (a JSON value, or the file's text), all in one run."""
    paths = {}
    for i, (name, document) in enumerate(documents.items()):
        path = tmp_path / f"document-{i}.json"
        path.write_text(document if isinstance(document, str) else json.dumps(document), encoding="utf-8")
        paths[str(path)] = name
    verdicts = assert_answered(run("bare verifier", "--jsonl", *paths), certificates=len(paths), jsonl=True)
    return {paths[verdict["file"]]: verdict for verdict in verdicts}


def with_metadata(value) -> dict:
    """The honest certificate carrying ``value`` in its metadata block, which the schemas leave free and the
    checks never read: only the shape limits can refuse it."""
    cert = honest()
    cert["metadata"] = {"note": value}
    return cert


def nested(depth: int) -> dict:
    """The honest certificate with its deepest array or object at ``depth`` (the document itself at 1): lists
    nested in the metadata block (at depth 2)."""
    value = []
    for _ in range(depth - 3):
        value = [value]
    cert = with_metadata(value)
    assert deepest(cert) == depth
    return cert


def deepest(value, depth: int = 1) -> int:
    """The nesting depth of the deepest array or object of a JSON value (0 for a scalar), by recursion."""
    if isinstance(value, dict):
        return max([depth] + [deepest(child, depth + 1) for child in value.values()])
    if isinstance(value, list):
        return max([depth] + [deepest(child, depth + 1) for child in value])
    return 0


# --- __init__.py ---

def test_an_unknown_format_is_refused_by_name():
    """Kills the deleted raise for an unknown format in verify_shaped (the lookup of its checker would fail
    with a KeyError): refused as "format", naming it, on the Python API and the command line alike."""
    failure = rejection({"format": "certify-something", "version": "1"}, "format")
    assert failure.values["format"] == "certify-something"


def test_an_unknown_format_on_the_command_line(tmp_path):
    """The same document as a file: one rejected verdict naming the check, no traceback."""
    verdict = command_line(tmp_path, {"unknown": {"format": "certify-something", "version": "1"}})["unknown"]
    assert not verdict["accepted"] and verdict["reason"].startswith("format: unknown certificate format"), verdict


def test_a_field_outside_the_schema_is_refused_by_the_schema_step(tmp_path):
    """Kills the deleted raise of the schema step in verify_shaped: an honest certificate with one top-level
    field its schema does not allow (additionalProperties false) passes every mathematical check, and is
    refused only as "schema" — as the reference library jsonschema finds it in violation."""
    cert = honest()
    cert["comment"] = "1"
    assert reference_violations(cert), "jsonschema accepts the document"
    assert "comment" in str(rejection(cert, "schema"))
    verdict = command_line(tmp_path, {"extra": cert})["extra"]
    assert not verdict["accepted"] and verdict["reason"].startswith("schema: "), verdict


@pytest.mark.parametrize("document", [["format", "version"], "certify-torsion", None])
def test_a_document_that_is_not_an_object_is_refused_as_such(document):
    """Kills the deleted raise of require_object: a JSON array, string or null is refused with the reason
    that a certificate is a JSON object (not as an object that lacks a field), naming the type found."""
    failure = rejection(document, "structure")
    assert failure.message == "a certificate is a JSON object", str(failure)


# --- certificate.py and limits.py: the shape limits ---

def test_nesting_at_the_documented_limit_is_accepted_and_one_past_is_refused(tmp_path):
    """Kills ``depth >= MAX_DEPTH`` in check_shape and MAX_DEPTH 12 -> 13: the README documents 12 levels;
    the honest certificate nested exactly that deep (in its free metadata) is accepted, one level deeper is
    refused as "nesting depth", by the Python API and the command line."""
    depth = documented("nesting of JSON arrays and objects")
    assert verify(nested(depth))
    assert str(depth) in str(rejection(nested(depth + 1), "nesting depth"))
    verdicts = command_line(tmp_path, {"at": nested(depth), "past": nested(depth + 1)})
    assert verdicts["at"]["accepted"], verdicts["at"]
    assert verdicts["past"]["reason"].startswith("unreadable: nesting depth"), verdicts["past"]


def test_lists_and_objects_at_the_documented_length_are_accepted_and_one_past_refused(tmp_path):
    """Kills the deleted raise and ``len(value) >= MAX_LIST_LENGTH`` of check_shape, and MAX_LIST_LENGTH
    10,000 -> 10,001: the README documents 10,000 entries in one list or object; a metadata list and a
    metadata object of exactly that many are accepted, one more entry is refused as "list size"."""
    most = documented("entries in one list or object")
    documents = {"list at": with_metadata(["x"] * most), "list past": with_metadata(["x"] * (most + 1)),
                 "object at": with_metadata({str(i): "" for i in range(most)}),
                 "object past": with_metadata({str(i): "" for i in range(most + 1)})}
    for name, document in documents.items():
        if name.endswith("at"):
            assert verify(document), name
        else:
            assert str(most) in str(rejection(document, "list size")), name
    verdicts = command_line(tmp_path, documents)
    assert verdicts["list at"]["accepted"] and verdicts["object at"]["accepted"], verdicts
    assert all(verdicts[name]["reason"].startswith("unreadable: list size") for name in ("list past", "object past"))


def test_strings_at_the_documented_length_are_accepted_and_one_past_refused(tmp_path):
    """Kills the deleted raise and ``len(text) >= MAX_STRING_LENGTH`` of check_string, and MAX_STRING_LENGTH
    10,000 -> 10,001: the README documents 10,000 characters in one string; a metadata string (and a key) of
    exactly that length is accepted, one character more is refused as "string size"."""
    most = documented("characters in one string")
    documents = {"string at": with_metadata("é" * most), "string past": with_metadata("é" * (most + 1)),
                 "key at": with_metadata({"k" * most: ""}), "key past": with_metadata({"k" * (most + 1): ""})}
    for name, document in documents.items():
        if name.endswith("at"):
            assert verify(document), name
        else:
            assert str(most) in str(rejection(document, "string size")), name
    verdicts = command_line(tmp_path, documents)
    assert verdicts["string at"]["accepted"] and verdicts["key at"]["accepted"], verdicts
    assert all(verdicts[name]["reason"].startswith("unreadable: string size") for name in ("string past", "key past"))


def test_an_object_key_that_is_not_a_string_is_refused():
    """Kills the deleted raise for a key that is not a string in check_string (len() of an integer would
    fail): a hand-built dict given to the Python API with an integer key (JSON has only string keys)."""
    failure = rejection(with_metadata({1: "x"}), "structure")
    assert failure.values["found"] == "int", str(failure)


def test_a_list_field_over_the_length_limit_is_refused_by_verify_shaped():
    """Kills the deleted raise of ``field``'s own length test: ``verify_shaped`` (public, for documents whose
    shape was checked) still refuses a list field of more than the documented 10,000 entries by that field's
    name, before the check that reads it (read_primes would refuse it only as more than 64 primes)."""
    from certify.verifier import verify_shaped

    cert = honest()
    cert["evidence"]["primes"] = cert["evidence"]["primes"][:1] * (documented("entries in one list or object") + 1)
    with pytest.raises(Rejection) as caught:
        verify_shaped(cert)
    assert caught.value.check == "list size" and "evidence.primes has more than" in caught.value.message


def test_a_long_string_field_is_not_taken_for_a_long_list():
    """Kills ``isinstance(value, list) -> True`` in ``field``: a string field longer than the documented
    10,000 entries of a list is refused as the string it is (here an unknown format), not as a list, by
    ``verify_shaped``, which leaves string lengths to check_shape."""
    from certify.verifier import verify_shaped

    cert = honest()
    cert["format"] = "x" * (documented("entries in one list or object") + 1)
    with pytest.raises(Rejection) as caught:
        verify_shaped(cert)
    assert caught.value.check == "format", str(caught.value)


def test_a_singular_curve_is_refused_as_singular():
    """Kills the deleted raise of read_curve: y² = x³ (discriminant 0: Silverman, III.1.4, a singular cubic is
    no elliptic curve) in place of the honest curve is refused as "curve"."""
    cert = honest()
    cert["curve"] = ["0", "0", "0", "0", "0"]
    assert "singular" in str(rejection(cert, "curve"))


def test_a_point_spelled_as_a_string_is_refused_as_structure():
    """Kills ``not isinstance(values, list) -> False`` in rationals: a generator written "12" (a string of
    two characters) is refused as not a list of two numbers, not read as the point (1, 2)."""
    cert = honest()
    cert["claim"]["generators"][0] = "12"
    failure = rejection(cert, "structure")
    assert "must be a list of 2 numbers" in failure.message, str(failure)


def test_relies_on_entries_that_are_not_objects_are_refused_as_structure():
    """Kills ``not isinstance(obj, dict) -> False`` in ``field``: a relies_on entry that is the string "key"
    (which contains 'key') or a number is refused as an entry without the field, not indexed as an object."""
    for entry in ("key statement reference", 7):
        cert = honest()
        cert["relies_on"][0] = entry
        assert "relies_on[0] has no field 'key'" in rejection(cert, "structure").message


# --- schema.py, against the reference library jsonschema ---

def ours(document) -> list:
    from certify.verifier.schema import schema_violations

    return schema_violations(document)


def test_a_string_where_an_object_is_required_is_a_violation_for_both():
    """Kills ``out.get("type") == "string" -> !=`` in compiled: the metadata block must be an object; a string
    there (which a node marked as a plain string would let through unexamined) is a violation for the
    reference library jsonschema and for the verifier's schema step, and the certificate is refused."""
    cert = honest()
    cert["metadata"] = "written by hand"
    assert reference_violations(cert) and ours(cert)
    assert "/metadata" in str(rejection(cert, "schema"))


def message(violation: str) -> str:
    """'path: message' → message."""
    return violation.split(": ", 1)[1]


def test_messages_for_short_lists_are_the_reference_librarys():
    """Kills ``node["minItems"] == 1 -> !=`` in check_node: an empty list where at least one entry is required
    "should be non-empty", a list of four coefficients where five are required "is too short", in the words
    of the reference library jsonschema."""
    empty, four = honest(), honest()
    empty["evidence"]["primes"] = []
    four["curve"] = four["curve"][:4]
    for document in (empty, four):
        assert [message(v) for v in ours(document)[:1]] == [message(v) for v in reference_violations(document)[:1]]


def test_a_value_of_sixty_characters_is_shown_whole_as_the_reference_library_shows_it():
    """Kills ``len(text) <= 60 -> <`` in short: a coefficient whose repr is exactly 60 characters is quoted
    whole in the violation, as the reference library jsonschema quotes it; one of 61 is cut."""
    cert = honest()
    cert["curve"][0] = "x" * 58
    assert len(repr(cert["curve"][0])) == 60
    assert message(ours(cert)[0]) == message(reference_violations(cert)[0])
    cert["curve"][0] = "x" * 59
    assert message(ours(cert)[0]).startswith(repr("x" * 59)[:59] + "…")


# --- sources.py and limits.py: the one reading of a file ---

def padded(size: int) -> str:
    """The honest certificate's JSON text padded with spaces (insignificant in JSON, RFC 8259 §2) to ``size``
    bytes."""
    text = json.dumps(honest())
    return text[:-1] + " " * (size - len(text)) + "}"


def test_a_file_of_the_documented_size_is_read_and_one_byte_more_is_not(tmp_path):
    """Kills ``len(data) >= MAX_FILE_BYTES`` in read and in parse, and MAX_FILE_BYTES 20,000,000 -> 20,000,001:
    the README documents files of 20,000,000 bytes; the honest certificate padded to exactly that is accepted,
    one byte more is unreadable, naming the limit — from a file and from standard input."""
    size = documented("file size")
    verdicts = command_line(tmp_path, {"at": padded(size), "past": padded(size + 1)})
    assert verdicts["at"]["accepted"], verdicts["at"]
    assert verdicts["past"]["reason"].startswith("unreadable: ") and f"{size} bytes" in verdicts["past"]["reason"]
    import subprocess
    import sys

    for text, accepted in ((padded(size), True), (padded(size + 1), False)):
        result = subprocess.run([sys.executable, "-S", "-m", "certify.verifier", "--jsonl", "-"], capture_output=True,
                                input=text.encode(), env=dict(__import__("os").environ, PYTHONPATH=str(README.parent)))
        (verdict,) = assert_answered(result, jsonl=True)
        assert verdict["accepted"] is accepted, verdict


def with_value_count(count: int) -> str:
    """The honest certificate's JSON text with exactly ``count`` of the bytes ',', '[' and '{' (what the
    verifier counts before parsing), the excess as commas inside metadata strings."""
    def text_of(strings):
        return json.dumps(with_metadata(strings))

    def counted(text):
        return text.count(",") + text.count("[") + text.count("{")

    width = documented("characters in one string")
    strings = []
    while counted(text_of(strings + [","])) <= count:
        strings.append("," * width)
        if counted(text_of(strings)) > count:
            strings[-1] = "," * (width - (counted(text_of(strings)) - count))
            break
    text = text_of(strings)
    assert counted(text) == count
    return text


def test_a_document_with_the_documented_number_of_values_is_read_and_one_more_is_not(tmp_path):
    """Kills ``values >= MAX_VALUES`` in parse and MAX_VALUES 1,000,000 -> 1,000,001: the README documents
    1,000,000 JSON values counted from the bytes before parsing; exactly that many is accepted, one more is
    unreadable, naming the limit."""
    most = documented("JSON values in one document")
    verdicts = command_line(tmp_path, {"at": with_value_count(most), "past": with_value_count(most + 1)})
    assert verdicts["at"]["accepted"], verdicts["at"]
    assert verdicts["past"]["reason"] == f"unreadable: the document may hold more than {most} JSON values"


def test_a_duplicate_key_is_named(tmp_path):
    """Kills ``key in seen -> key not in seen`` in _object: the rejection names the key given twice (RFC 8259
    §4: names should be unique), not the object's first key."""
    text = json.dumps(with_metadata({"first": "1", "twice": "1"})).replace('"twice": "1"', '"twice": "1", "twice": "2"')
    verdict = command_line(tmp_path, {"duplicate": text})["duplicate"]
    assert verdict["reason"] == "unreadable: duplicate key: the object gives 'twice' twice", verdict


def test_a_json_number_of_the_documented_digits_is_read_and_one_digit_more_is_not(tmp_path):
    """Kills ``len(text) >= MAX_DIGITS`` in _integer and MAX_DIGITS 4,000 -> 4,001: the README documents
    4,000 digits in one number; a JSON integer of exactly that many in the free metadata is read (and the
    certificate accepted), one digit more is unreadable; a decimal-string coefficient one digit over is
    refused as "number size" by the Python API."""
    most = documented("digits in one number")
    verdicts = command_line(tmp_path, {"at": json.dumps(with_metadata("@")).replace('"@"', "9" * most),
                                       "past": json.dumps(with_metadata("@")).replace('"@"', "9" * (most + 1))})
    assert verdicts["at"]["accepted"], verdicts["at"]
    assert verdicts["past"]["reason"] == f"unreadable: a JSON number has more than {most} digits", verdicts["past"]
    at, past = honest(), honest()
    at["curve"][4], past["curve"][4] = "1" + "0" * (most - 1), "1" + "0" * most
    assert rejection(at).check != "number size"   # another curve: refused by a later check
    assert str(most) in str(rejection(past, "number size"))


def test_a_bundle_that_cannot_be_read_is_one_verdict_without_a_bundle_line(tmp_path):
    """Kills ``len(entries) == 1 -> !=`` and ``entries[0][0] == name -> !=`` in documents: a bundle of an
    unknown version is one unreadable verdict under the bundle's own name, and no bundle object (with its
    digest and member count) follows it in the --jsonl output, as for any source that cannot be read."""
    from certify.bundle import build_bundle
    from certify.verifier.digest import digest

    cert = honest()
    bundle = build_bundle([("c.json", cert, {"digest": digest(cert), "reason": "r"})])
    bundle["version"] = "2"
    path = tmp_path / "bundle.json"
    path.write_text(json.dumps(bundle))
    result = run("bare verifier", "--jsonl", str(path))
    lines = result.stdout.decode().splitlines()
    assert len(lines) == 1 and result.returncode == 2, lines
    verdict = json.loads(lines[0])
    assert verdict["file"] == str(path) and verdict["reason"].startswith("unreadable: unknown bundle version")


def test_a_name_from_a_bundle_is_cut_at_the_documented_length(tmp_path):
    """Kills MAX_NAME_BYTES 200 -> 201: the README documents names printed from inside a source cut to 200
    characters; a member named with 250 letters is printed with its first 200."""
    from certify.bundle import build_bundle
    from certify.verifier.digest import digest

    most = documented("names printed from inside a source")
    cert = honest()
    bundle = build_bundle([("c.json", cert, {"digest": digest(cert), "reason": "r"})])
    bundle["manifest"]["members"][0]["name"] = "n" * (most + 50)
    path = tmp_path / "bundle.json"
    path.write_text(json.dumps(bundle))
    (verdict,) = assert_answered(run("bare verifier", "--jsonl", str(path)), jsonl=True)
    assert verdict["file"] == f"{path}#" + "n" * most, verdict["file"]


def one_row_store(path) -> str:
    import sqlite3

    from certify.verifier.digest import digest

    cert = honest()
    with sqlite3.connect(path) as connection:
        connection.execute("CREATE TABLE certificates (curve, kind, label, document, digest)")
        connection.execute("INSERT INTO certificates VALUES (?, 'torsion', '', ?, ?)",
                           ("[" + ",".join(cert["curve"]) + "]", json.dumps(cert), digest(cert)))
    return str(path)


class CountedSteps:
    """A store connection on which fetching a row of the certificate query takes exactly ``steps`` SQLite
    virtual-machine steps: the progress handler is called once per ``n`` steps and a true answer interrupts
    the fetch, as Python's sqlite3 documents set_progress_handler(handler, n)."""

    def __init__(self, connection, steps: int):
        self.connection, self.steps, self.handler = connection, steps, None

    def __getattr__(self, name):
        return getattr(self.connection, name)

    def __setattr__(self, name, value):
        if name == "text_factory":
            self.connection.text_factory = value
        object.__setattr__(self, name, value)

    def set_progress_handler(self, handler, n):
        self.handler, self.every = handler, n

    def execute(self, query, *args):
        cursor = self.connection.execute(query, *args)
        if not query.startswith("SELECT substr"):
            return cursor
        outer = self

        class Fetching:
            def fetchone(self):
                import sqlite3

                if any(outer.handler() for _ in range(outer.steps // outer.every)):
                    raise sqlite3.OperationalError("interrupted")
                return cursor.fetchone()
        return Fetching()


def test_a_row_fetched_in_the_documented_number_of_steps_is_read_and_one_more_handler_call_is_not(tmp_path, monkeypatch):
    """Kills ``steps[0] >= MAX_STORE_STEPS`` in store_rows: the README documents 50,000,000 SQLite steps to fetch
    one row; a fetch of exactly that many is read, one of a thousand steps more (the next call of the progress
    handler) makes the store unreadable."""
    import sqlite3

    from certify.verifier import sources

    most, path, real = documented("a store", 0), one_row_store(tmp_path / "store.sqlite"), sqlite3.connect

    def fetch_in(steps):
        monkeypatch.setattr(sqlite3, "connect", lambda *a, **k: CountedSteps(real(*a, **k), steps))
        return list(sources.store_rows(path))

    ((kind, _, document, _),) = fetch_in(most)
    assert kind == "row" and not isinstance(document, sources.Unreadable)
    with pytest.raises(sources.Unreadable, match="interrupted"):
        fetch_in(most + 1000)


def test_a_store_is_read_under_the_documented_memory_limit(tmp_path):
    """Kills MAX_STORE_MEMORY 200,000,000 -> 200,000,001: the README documents 200 MB of SQLite memory while a
    store is read; SQLite reports that heap limit (PRAGMA hard_heap_limit, process-wide) once one is read."""
    import sqlite3

    from certify.verifier import sources

    list(sources.store_rows(one_row_store(tmp_path / "store.sqlite")))
    with sqlite3.connect(":memory:") as connection:
        assert connection.execute("PRAGMA hard_heap_limit").fetchone() == (documented("a store", 1),)


# --- digest.py ---

def test_a_short_digest_has_the_documented_twelve_hex_digits():
    """Kills SHORT 12 -> 13: the README ("certify table") cites a certificate by "the first 12 hex digits of
    its digest"."""
    from certify.verifier.digest import digest, short

    assert "the first 12 hex digits of its digest" in README.read_text(encoding="utf-8")
    full = digest(honest())
    assert short(full) == full[len("sha256:"):][:12] and len(short(full)) == 12


# --- limits.py: the limits of the mathematical checks ---

def test_one_point_count_over_the_documented_number_of_primes_is_refused():
    """Kills MAX_PRIMES 64 -> 65: the README documents 64 primes with point counts in one certificate; the
    honest certificate with 65 listed primes (3, 5, 7, … of good reduction; counts from cypari2's ellcard
    are not needed: the list is refused before any count) is refused as "list size", naming 64."""
    from test_soundness_limits import good_primes

    most = documented("primes with point counts in one certificate")
    cert = honest()
    cert["evidence"]["primes"] = [{"p": str(p), "count": "1"} for p in good_primes("[1,0,1,-19,26]", most + 1, 3)]
    assert f"more than {most} primes" in rejection(cert, "list size").message


def test_a_point_count_prime_one_past_the_documented_largest_is_refused_by_the_limit():
    """Kills MAX_HINT_PRIME 100,000 -> 100,001: the README documents 100,000 as the largest prime counted
    through; a point count listed at 100,001 (= 11 · 9091, so no prime lies strictly between) is refused by the
    limit's own check, "good reduction", naming 100,000 — not left to the point count."""
    most = documented("largest prime counted through")
    cert = honest()
    cert["evidence"]["primes"].insert(0, {"p": str(most + 1), "count": "1"})
    assert str(most) in str(rejection(cert, "good reduction"))


CONGRUENT_FIVE = ("0", "0", "0", "-25", "0")
"""y² = x³ − 25x, the congruent-number curve of 5: rank 1 by cypari2's ellrank (tests/rank_reference.py), with a
descent via 2-isogeny in its certificate."""


def rank_certificate() -> dict:
    """The certifier's rank certificate of CONGRUENT_FIVE (accepted: tests/test_rank_examples.py)."""
    from fractions import Fraction

    from certify.rank.certificate import certify_rank

    return copy.deepcopy(certify_rank(tuple(Fraction(c) for c in CONGRUENT_FIVE), seconds=5))


def test_one_point_over_the_documented_number_in_a_rank_claim_is_refused():
    """Kills MAX_RANK_POINTS 64 -> 65: the README documents 64 points in a rank claim; 65 copies of the
    generator are refused as "list size", naming 65 points, before any is reduced."""
    most = documented("points in a rank claim")
    cert = rank_certificate()
    cert["claim"]["points"] *= most + 1
    cert["claim"]["rank_lower"] = str(most + 1)
    failure = rejection(cert, "list size")
    assert failure.values["points"] == most + 1 and str(most) in failure.message


def test_one_prime_over_the_documented_number_in_a_descent_factorisation_is_refused():
    """Kills MAX_DESCENT_PRIMES 64 -> 65: the README documents 64 primes of b in a descent; the factorisation
    of b replaced by the first 65 primes (cypari2's primes) is refused as "descent size"."""
    from certify.pari import pari

    most = documented("primes of b, or of a² − 4b, in a descent")
    cert = rank_certificate()
    cert["evidence"]["descent"]["factorisation_b"] = [{"prime": str(p), "exponent": "1"} for p in pari.primes(most + 1)]
    failure = rejection(cert, "descent size")
    assert failure.values["primes"] == most + 1 and str(most) in failure.message


def test_one_disc_over_the_documented_number_is_refused():
    """Kills MAX_DISCS 20,000 -> 20,001: the README documents 20,000 discs in all the disc covers of one
    certificate; an exclusion put first whose covers bring the count to 20,001 is refused as "descent size",
    before any of its discs is read."""
    most, width = documented("discs in all the disc covers"), documented("entries in one list or object")
    cert = rank_certificate()
    descent = cert["evidence"]["descent"]
    present = sum(len(exclusion.get(key, [])) for side in ("phi", "phi_dual") for exclusion in descent[side]["exclusions"]
                  if exclusion["place"] != "infinity" for key in ("t_discs", "s_discs"))
    room = most + 1 - present
    descent["phi"]["exclusions"].insert(0, {"d": "0", "place": "2", "t_discs": [["0", "0"]] * min(room, width),
                                            "s_discs": [["0", "1"]] * (room - min(room, width))})
    failure = rejection(cert, "descent size")
    assert failure.values["discs"] == most + 1 and str(most) in failure.message


def test_a_disc_one_past_the_documented_depth_is_refused_by_the_depth_limit():
    """Kills MAX_DISC_DEPTH 40 -> 41: the README documents the depth k of a disc c + p^k Z_p up to 40; a disc
    [0, 41] added to the first disc cover of the descent is refused as "disc cover", naming 40."""
    most = documented("depth k of a disc")
    cert = rank_certificate()
    exclusion = next(e for side in ("phi", "phi_dual") for e in cert["evidence"]["descent"][side]["exclusions"]
                     if e["place"] != "infinity" and e.get("t_discs"))
    exclusion["t_discs"].insert(0, ["0", str(most + 1)])
    failure = rejection(cert, "disc cover")
    assert f"<= k <= {most}," in failure.message and failure.values["k"] == most + 1


@pytest.mark.parametrize("key, label", [("points", "points, and local generators, on one side of a descent"),
                                        ("local_generators", "points, and local generators, on one side of a descent"),
                                        ("exclusions", "exclusions on one side of a descent")])
def test_one_entry_over_the_documented_size_of_a_descent_side_is_refused(key, label):
    """Kills MAX_DESCENT_GENERATORS 65 -> 66 and MAX_DESCENT_ELEMENTS 4,096 -> 4,097: the README documents 65
    points and local generators and 4,096 exclusions on one side of a descent; one more entry (copies of the
    side's first entry, or (0, 0)) is refused as "descent size", naming the documented number, before any
    entry is examined."""
    most = documented(label)
    cert = rank_certificate()
    side = cert["evidence"]["descent"]["phi"]
    filler = side[key][0] if side[key] else ["0", "0"]
    side[key] = (side[key] + [copy.deepcopy(filler) for _ in range(most + 1)])[:most + 1]
    failure = rejection(cert, "descent size")
    assert failure.values["entries"] == most + 1 and f"more than {most} entries" in failure.message


def lifting_certificate(a6: int, small_prime: int) -> dict:
    """A one-curve isogeny-class certificate of y² + y = x³ + (10^3849 + 1)x + a6 whose first two completeness
    witnesses are root searches: ℓ = 2 by the 2-division cubic 4x³ + 4a4·x + 4a6 + 1 with the hint
    ``small_prime``, at which it splits (3 roots), then ℓ = 13 by P_13(t) − j·t with the hint 5 (2 roots). The
    other witnesses are the pool certificate's (refused later, if reached)."""
    from soundness_pool import pool

    members = pool("isogeny")
    cert = fresh("isogeny", members.index(next(c for c in members if len(c["claim"]["curves"]) == 1)))
    model = ["0", "0", "1", str(10 ** 3849 + 1), str(a6)]
    cert["curve"], cert["claim"]["curves"] = model, [model]
    evidence = cert["evidence"]
    evidence["completeness"] = [
        {"curve": "0", "degree": "2", "method": "division-roots", "prime": str(small_prime), "roots": []},
        {"curve": "0", "degree": "13", "method": "x0-roots", "prime": "5", "roots": []}] + \
        [w for w in evidence["completeness"] if w["degree"] not in ("2", "13")]
    return cert


def test_hensel_lifting_one_unit_past_the_documented_budget_is_refused():
    """Kills MAX_LIFTING_WORK 15,000 -> 15,001: the README documents 15,000 units of Hensel lifting per
    certificate (Σ roots mod p × degree × digits² / 10⁶, each search charged before it is lifted). In the
    certificate of ``lifting_certificate`` (a6 = 10^2579 + 3, found by a search) the ℓ = 2 search is charged 60
    units, and is genuine: the cubic has no rational root (cypari2's nfroots), so the curve has no rational
    2-isogeny, as the witness states; the ℓ = 13 search then brings the total to 15,001, refused as "lifting
    work" naming 15,000 before that search is lifted (a model whose total is exactly 15,000 is left out: it
    lifts the full budget, about two seconds)."""
    from certify.pari import pari

    most = documented("Hensel lifting per certificate")
    a4, a6 = 10 ** 3849 + 1, 10 ** 2579 + 3
    assert list(pari(f"nfroots(, 4*x^3 + 4*({a4})*x + 4*({a6}) + 1)")) == []
    failure = rejection(lifting_certificate(a6, 31), "lifting work")
    assert failure.values["spent"] == most + 1 and f"limit of {most}" in failure.message, str(failure)
    assert "ℓ = 13" in failure.message and failure.values["roots_mod_p"] == 2


# --- limits.py: the conductor certificates' limits ---

CUBE_PLUS_ONE = (0, 0, 0, 0, 1)
"""y² = x³ + 1, minimal discriminant −432 = −2^4·3^3 (cypari2's ellglobalred, in the conductor tests)."""


def conductor_certificate() -> dict:
    """The certifier's conductor certificate of CUBE_PLUS_ONE (accepted: tests/test_conductor_local.py)."""
    from test_mutation_survivors_conductor import certificate

    return certificate(CUBE_PLUS_ONE)


def test_one_prime_over_the_documented_number_in_a_factorisation_is_refused():
    """Kills MAX_DISCRIMINANT_PRIMES 1,000 -> 1,001: the README documents 1,000 primes in one factorisation;
    the discriminant's factorisation replaced by the first 1,001 primes (cypari2's primes) is refused as
    "list size" naming 1,000, and by the first 1,000 primes only as a factorisation that is not the
    discriminant's."""
    from certify.pari import pari

    most = documented("primes in one factorisation")
    for count, check in ((most + 1, "list size"), (most, "factorisation")):
        cert = conductor_certificate()
        cert["evidence"]["discriminant_factorisation"] = [{"prime": str(p), "exponent": "1"} for p in pari.primes(count)]
        failure = rejection(cert, check)
        if check == "list size":
            assert f"more than {most} primes" in failure.message and failure.values["primes"] == most + 1


def made_up_pocklington(count: int, digits: int = 30) -> list:
    """``count`` Pocklington certificates for distinct odd numbers of ``digits`` digits above the Miller–Rabin
    bound (3.3·10²⁴), each listing the factor 2 with base 3: well formed, but no proof (2 alone is far below
    the square root)."""
    start = 10 ** (digits - 1) + 1
    return [{"prime": str(start + 2 * i), "factors": [{"factor": "2", "base": "3"}]} for i in range(count)]


def test_one_pocklington_certificate_over_the_documented_number_is_refused():
    """Kills MAX_POCKLINGTON_CERTIFICATES 500 -> 501: the README documents 500 Pocklington certificates in one
    certificate; 501 are refused as "primality limit" naming 500, before any is checked; 500 are read, and
    refused only by the first certificate's own check ("pocklington": the factored part is too small)."""
    most = documented("Pocklington certificates in one certificate")
    past, at = conductor_certificate(), conductor_certificate()
    past["evidence"]["pocklington"] = made_up_pocklington(most + 1)
    at["evidence"]["pocklington"] = made_up_pocklington(most)
    failure = rejection(past, "primality limit")
    assert failure.message == f"more than {most} Pocklington certificates" and failure.values["certificates"] == most + 1
    assert "too small" in rejection(at, "pocklington").message


def test_a_pocklington_number_one_digit_over_the_documented_length_is_refused():
    """Kills MAX_POCKLINGTON_DIGITS 1,000 -> 1,001: the README documents 1,000 digits for a number proven prime
    by a Pocklington certificate; a certificate for a number of 1,001 digits is refused as "primality limit"
    naming 1,000, one of 1,000 digits is read and refused only by its own check ("pocklington")."""
    most = documented("digits of a number proven prime by a Pocklington certificate")
    past, at = conductor_certificate(), conductor_certificate()
    past["evidence"]["pocklington"] = made_up_pocklington(1, most + 1)
    at["evidence"]["pocklington"] = made_up_pocklington(1, most)
    failure = rejection(past, "primality limit")
    assert f"of at most {most} digits" in failure.message
    assert "too small" in rejection(at, "pocklington").message


# --- limits.py: the analytic witnesses' limits ---

def analytic_entry(truncation: int, bits: int, test_point: str, hints=()) -> dict:
    """A witness of order 0 on the genuine conductor evidence of the curve of conductor 11 (rank 0 in
    Cremona's table: tests/test_mutation_survivors_analytic.py)."""
    from test_mutation_survivors_analytic import CONDUCTOR_11, entry

    return entry(CONDUCTOR_11, 0, truncation, bits, test_point, hints)


def analytic_rejection(witness) -> Rejection:
    from test_mutation_survivors_analytic import CONDUCTOR_11, rejection as refused

    return refused(CONDUCTOR_11, witness)


def test_a_truncation_point_one_past_the_documented_largest_is_refused_by_that_limit():
    """Kills MAX_TRUNCATION 12,000 -> 12,001: the README documents M up to 12,000; M = 12,001 (with b = 1, so
    within the series work) is refused as "analytic limit" naming 12,000; M = 12,000 passes that test and is
    refused only by the count work (Σ p ≤ 12,000 is over 5,000,000 without hints)."""
    most = documented("truncation point M of an analytic witness")
    failure = analytic_rejection(analytic_entry(most + 1, 1, "6/5"))
    assert failure.check == "analytic limit" and failure.message == f"the truncation point must lie between 1 and {most}"
    failure = analytic_rejection(analytic_entry(most, 1, "6/5"))
    assert failure.check == "analytic limit" and "residue evaluations" in failure.message, str(failure)


def test_a_test_point_denominator_one_past_the_documented_largest_is_refused():
    """Kills MAX_TEST_POINT_DENOMINATOR 1,000 -> 1,001: the README documents a denominator of A up to 1,000;
    A = 1002/1001 is refused as "analytic limit" naming 1,000, A = 1001/1000 passes the reading."""
    from certify.verifier import lseries

    most = documented("denominator of the test point A")
    failure = analytic_rejection(analytic_entry(30, 32, f"{most + 2}/{most + 1}"))
    assert failure.check == "analytic limit" and f"denominator of at most {most}" in failure.message
    assert lseries.read_witness(analytic_entry(30, 32, f"{most + 1}/{most}"), "evidence.analytic")[4] == \
        Fraction(most + 1, most)


def count_work_hints(target: int, per_hint: int) -> tuple:
    """(M, two hints) with Σ_{p ≤ M} p − p − q + 2·per_hint = ``target`` (the README's rule for the count work:
    Σ p over the primes p ≤ M without a Frobenius hint, plus ``per_hint`` per hint), M the first prime with
    Σ_{p ≤ M} p above ``target`` for which primes p < q ≤ M exist; the hints' traces and points are checked only
    after the reading."""
    from sympy import primerange

    primes, total = list(primerange(2, 12_001)), 0
    for i, m in enumerate(primes):
        total += m
        pair = total + 2 * per_hint - target
        below = set(primes[:i + 1])
        if total > target:
            found = [p for p in primes[:i + 1] if pair - p in below and pair - p > p]
            if found:
                return m, [{"prime": str(v), "trace": "0", "point": ["0", "0"]} for v in (found[0], pair - found[0])]
    raise AssertionError("no such M")


def test_count_work_one_past_the_documented_budget_is_refused_and_at_it_is_read():
    """Kills MAX_ANALYTIC_COUNT_WORK 5,000,000 -> 5,000,001 and FROBENIUS_HINT_WORK 1,500 -> 1,501: the README
    documents at most 5,000,000 residue evaluations, Σ p over the primes p ≤ M without a Frobenius hint plus
    1,500 per hint (primes by sympy). Two hints chosen to make that exactly 5,000,001 are refused as "analytic
    limit" naming 5,000,000; two chosen to make it 5,000,000 pass the reading (at 1,501 per hint they would
    count 5,000,002)."""
    from certify.verifier import lseries

    label = next(name for name in documented_limits() if name.startswith("point counts of an analytic witness"))
    most, per_hint = documented("point counts of an analytic witness"), int(re.search(r"plus ([\d,]+) per hint",
                                                                                     label).group(1).replace(",", ""))
    assert per_hint == 1500
    m, hints = count_work_hints(most + 1, per_hint)
    failure = analytic_rejection(analytic_entry(m, 1, "6/5", hints))
    assert failure.check == "analytic limit" and f"more than {most} residue evaluations" in failure.message
    assert failure.values["work"] == most + 1
    m, hints = count_work_hints(most, per_hint)
    assert lseries.read_witness(analytic_entry(m, 1, "6/5", hints), "evidence.analytic")[2] == m


# --- limits.py: the rank certificates' combined budget ---

def rank_work_certificate(target: int) -> dict:
    """The certifier's rank certificate of y² + y = x³ − x² − 10x − 20 (conductor 11, rank 0 in Cremona's
    table; its upper bound is an analytic witness) with the witness set to M = 6,000 and b = 64 (series
    384,000, within 400,000), a Frobenius hint at 2 when needed for parity, and made-up Pocklington certificates
    in its conductor evidence, sized so that the first charge of the rank budget — by limits.MAX_RANK_WORK's
    documented rule: a unit per 300 residue evaluations of the counts (Σ p ≤ M without a hint, plus 1,500 per
    hint), two per Pocklington unit (⌈(digits / 100)³⌉ + 1 per listed factor, weighed by sizes alone), a unit
    per 30 of M × b — is exactly ``target``. Nothing is counted, lifted or proven before that charge."""
    from fractions import Fraction as F

    from sympy import primerange

    from certify.rank.certificate import certify_rank

    cert = copy.deepcopy(certify_rank(tuple(F(c) for c in (0, -1, 1, -10, -20)), seconds=5))
    truncation, bits = 6000, 64
    for hints in ([], [{"prime": "2", "trace": "0", "point": ["0", "0"]}]):
        counts = sum(primerange(2, truncation + 1)) - 2 * len(hints) + 1500 * len(hints)
        rest = target - counts // 300 - truncation * bits // 30
        if rest % 2 == 0:
            break
    primality = rest // 2
    assert 3 <= primality <= documented("Pocklington work")
    factor = {"factor": "2", "base": "3"}
    # a one-digit n weighs 2 units a factor, a 110-digit one 3 (⌈(111/100)³⌉ + 1 as sized from its length)
    listed = [{"prime": "7", "factors": [factor] * (primality // 2)}] if primality % 2 == 0 else \
        [{"prime": "7", "factors": [factor] * ((primality - 3) // 2)}, {"prime": "1" * 110, "factors": [factor]}]
    witness = cert["evidence"]["analytic"]
    witness.update(truncation=str(truncation), precision_bits=str(bits), frobenius_hints=hints)
    witness["conductor"]["pocklington"] = listed
    return cert


def test_rank_work_one_unit_past_the_documented_budget_is_refused():
    """Kills MAX_RANK_WORK 40,000 -> 40,001: the README documents 40,000 units for all the costly steps of one
    rank certificate together; a certificate whose counts, primality proofs and series are charged 40,001 is
    refused as "rank work" naming 40,000 before any of them runs; one charged exactly 40,000 passes the budget
    and is refused by the first check that runs: the reading of its made-up Pocklington certificates (a
    one-digit n is below the Miller–Rabin bound)."""
    most = documented("work of one rank certificate")
    failure = rejection(rank_work_certificate(most + 1), "rank work")
    assert failure.values["spent"] == most + 1 and f"limit of {most}" in failure.message, str(failure)
    at = rejection(rank_work_certificate(most))
    assert at.check != "rank work" and "Pocklington certificate is for a number above the Miller–Rabin bound" in \
        at.message, str(at)


# --- limits.py: bounds the compared quantity steps over, killed through the limit the rejection states ---

def big_coefficient_torsion(digits: int) -> dict:
    """A torsion certificate of y² = x³ + (10^(digits − 1) + 1)x + 1 claiming the trivial group, its integral
    model the curve itself, with one ℓ-part for ℓ = 13 (hint prime 3) and one point count: the division
    polynomials for 13 are then sized from a model of ``digits`` digits before anything is counted."""
    cert = honest()
    model = ["0", "0", "0", str(10 ** (digits - 1) + 1), "1"]
    cert["curve"] = model
    cert["claim"]["invariants"], cert["claim"]["generators"] = [], []
    cert["evidence"]["integral_model"] = {"change": ["1", "0", "0", "0"], "curve": model}
    cert["evidence"]["generator_orders"] = []
    cert["evidence"]["primes"] = [{"p": "7", "count": "1"}]
    cert["evidence"]["ell_parts"] = [{"ell": "13", "torsion": {"prime": "3"}, "classes": []}]
    return cert


def test_a_division_polynomial_over_the_documented_size_is_refused_naming_the_limit():
    """Kills MAX_POLYNOMIAL_SIZE 2,000,000 -> 2,000,001. No certificate is refused by one bound and not the
    other: the verifier's size is ℓ²(ℓ² × model digits + 1) for a prime ℓ ≤ 13, a multiple of ℓ², and
    2,000,001 = 3 × 666,667 (sympy's factorint) is divisible by no square of a prime, so the size never equals
    it. The mutant differs in what the rejection states: the README documents 2,000,000 as the size of a
    division polynomial to be built; ℓ = 13 on a model of 71 digits (169 × (169 × 71 + 1) = 2,028,000) is
    refused as "polynomial size" stating that limit, on one of 70 digits (1,999,439) it is not (the certificate
    is refused later)."""
    import sympy

    most = documented("size of a division polynomial to be built")
    assert max(sympy.factorint(most + 1).values()) == 1
    assert 169 * (169 * 71 + 1) > most >= 169 * (169 * 70 + 1)
    failure = rejection(big_coefficient_torsion(71), "polynomial size")
    assert failure.values["limit"] == most and failure.values["model_digits"] == 71, str(failure)
    assert rejection(big_coefficient_torsion(70)).check != "polynomial size"


def test_an_exclusion_at_a_prime_over_the_documented_largest_is_refused_naming_it():
    """Kills MAX_DISC_PRIME 1,000,000,000 -> 1,000,000,001. No certificate is refused by one bound and not the
    other: the place of an exclusion by discs must be 2 or a prime of the factorisations, every one of them
    proven prime before any exclusion is read, and 1,000,000,001 = 7 · 11 · 13 · 19 · 52579 (sympy's
    factorint) is not prime. The mutant differs in what the rejection states: the README documents
    1,000,000,000 as the largest prime of an exclusion by a disc cover; the genuine exclusion of d = p at p for
    y² = x³ + px, p = 1,000,000,007 (built as in tests/test_mutation_survivors_rank.py, where the verifier
    accepts it once the limit is raised to p) is refused as "exclusion place" stating 1,000,000,000."""
    import sympy
    from test_mutation_survivors_rank import exclusion_of_p_at_p

    most = documented("largest prime p of an exclusion by a disc cover")
    assert not sympy.isprime(most + 1)
    p = 1_000_000_007
    assert sympy.isprime(p) and p > most
    cert = copy.deepcopy(exclusion_of_p_at_p(p))
    failure = rejection(cert, "exclusion place")
    assert failure.message.endswith(f"disc covers are checked only at primes up to {most}"), str(failure)


# --- limits.py: the isogeny budgets, one step past the documented values ---

def test_kernels_one_unit_past_twice_the_documented_kernel_size_are_refused():
    """Kills MAX_KERNEL_SIZE 100,000 -> 100,001 by behaviour (the isogeny group's tests compare their inputs with
    the constant itself): the README documents 100,000 for one kernel polynomial (degree × coefficient digits),
    and check_kernel_budget's docstring twice that for the kernels together. Two 163-kernels of 82 × 1,219,
    a 2-kernel of 2 × 41 and a 5-kernel of 3 × 1 total 200,001 and are refused as "kernel size" for the kernels
    together, naming 200,000 (one 5-kernel of 3 × 1 fewer is the isogeny tests' case exactly at the limit)."""
    from test_mutation_survivors_isogeny import crafted_edge, integer_kernel, with_edges

    most = 2 * documented("size of a kernel polynomial")
    edges = [crafted_edge(163, integer_kernel(163, 1219)), crafted_edge(163, integer_kernel(163, 1219, top=1)),
             crafted_edge(2, integer_kernel(2, 41)), crafted_edge(5, integer_kernel(5, 1))]
    assert 2 * 82 * 1219 + 2 * 41 + 3 * 1 == most + 1
    failure = rejection(with_edges(edges), "kernel size")
    assert "together" in failure.message and failure.values == {"size": most + 1, "limit": most}, str(failure)


def test_isogeny_identities_one_unit_past_the_documented_total_are_refused():
    """Kills MAX_IDENTITY_TOTAL 250,000 -> 250,001 by behaviour: the README documents 250,000 for all the isogeny
    identities of one certificate (each ℓ × estimated digits of its x-map, the isogeny tests' ``identity_size``).
    Two equal 163-kernels of 352 digits (116,708 each), a 2-kernel of 1,999 digits (12,016) and a 3-kernel of
    504 digits (4,569; found by a search) total 250,001: refused as "identity size" at the last edge, naming
    250,000; under a limit of 250,001 they would pass to the check of repeated edges."""
    from test_mutation_survivors_isogeny import crafted_edge, identity_size, integer_kernel, with_edges

    most = documented("all isogeny identities of one certificate")
    big = integer_kernel(163, 352)
    cert = with_edges([crafted_edge(163, big), crafted_edge(163, big), crafted_edge(2, integer_kernel(2, 1999)),
                       crafted_edge(3, integer_kernel(3, 504))])
    sizes = [identity_size(cert, edge) for edge in cert["evidence"]["edges"]]
    assert sum(sizes) == most + 1 and sum(sizes[:-1]) <= most and max(sizes) <= documented("one isogeny identity")
    failure = rejection(cert, "identity size")
    assert failure.values["total"] == most + 1 and failure.values["total_limit"] == most, str(failure)
    assert failure.message.startswith("evidence.edges[3]:")


def test_an_identity_over_the_documented_size_is_refused_naming_it():
    """Kills MAX_IDENTITY_SIZE 160,000 -> 160,001 through the limit the rejection states (the isogeny group's
    tests compare their inputs with the constant itself). No certificate is refused by one bound and not the
    other: an identity's size is ℓ × (estimated digits + 8) for ℓ of Mazur's list (ℓ ≤ 163), and 160,001 is
    prime (sympy), so no size equals it. The README documents 160,000 for one isogeny identity; a 163-kernel
    of 520 digits (within the total) is refused as "identity size" stating that limit."""
    import sympy
    from test_mutation_survivors_isogeny import crafted_edge, identity_size, integer_kernel, with_edges

    most = documented("one isogeny identity")
    assert sympy.isprime(most + 1) and most + 1 > 163
    cert = with_edges([crafted_edge(163, integer_kernel(163, 520))])
    assert most < identity_size(cert, cert["evidence"]["edges"][0]) <= documented("all isogeny identities")
    failure = rejection(cert, "identity size")
    assert failure.values["limit"] == most, str(failure)


def test_a_kernel_denominator_over_the_documented_size_is_refused_naming_it():
    """Kills MAX_KERNEL_DENOMINATOR 10,000 -> 10,001 through the limit the rejection states. No certificate is
    refused by one bound and not the other: the size is len(h) × digits of the denominator, len(h) =
    (ℓ − 1)/2 + 1 (2 for ℓ = 2) for ℓ of Mazur's list, that is 2, 3, 4, 6, 7, 9, 10, 19, 22, 34 or 82, and
    10,001 = 73 × 137 (sympy) is a multiple of none of them. The README documents 10,000 for the common
    denominator of a kernel polynomial (degree × its digits); the 5-kernel x² + 1/d, d of 3,334 digits
    (3 × 3,334 = 10,002), is refused as "kernel denominator" stating that limit."""
    import sympy
    from test_mutation_survivors_isogeny import crafted_edge, with_edges

    most = documented("common denominator of a kernel polynomial")
    mazur = (2, 3, 5, 7, 11, 13, 17, 19, 37, 43, 67, 163)   # Mazur 1978, the primes of rational isogenies over Q
    lengths = {2 if ell == 2 else (ell - 1) // 2 + 1 for ell in mazur}
    assert sympy.factorint(most + 1) == {73: 1, 137: 1} and all((most + 1) % n for n in lengths)
    d = 10 ** 3333 + 1
    failure = rejection(with_edges([crafted_edge(5, [Fraction(1, d), 0, 1])]), "kernel denominator")
    assert failure.values["limit"] == most, str(failure)


def zip_of(count: int, size: int = 1) -> bytes:
    """A plain zip archive of ``count`` members of ``size`` zero bytes each (deflated, so that large members
    stay small on disk), as the standard library's zipfile writes it."""
    import io
    import zipfile

    buffer = io.BytesIO()
    with zipfile.ZipFile(buffer, "w", zipfile.ZIP_DEFLATED) as archive:
        for i in range(count):
            archive.writestr(f"m{i:03d}", bytes(size))
    return buffer.getvalue()


def test_a_kit_archive_of_the_documented_member_count_is_laid_out_and_one_more_is_refused():
    """Kills MAX_KIT_MEMBERS 100 -> 101: the README documents at most 100 members in a referee's kit; the
    layout check reads an archive of 100 members that zipfile wrote (all 100 listed, as zipfile lists them)
    and refuses one of 101 at its end record, before reading any entry."""
    import zipfile
    import io

    from certify.verifier.kit import KitError, check_layout

    most = documented("members of a referee's kit")
    data = zip_of(most)
    assert [name for name, _ in check_layout(data)] == zipfile.ZipFile(io.BytesIO(data)).namelist()
    with pytest.raises(KitError, match=f"at most {most} members"):
        check_layout(zip_of(most + 1))


def test_an_empty_archive_of_22_bytes_is_laid_out_plainly():
    """Kills ``len(data) < 22`` -> ``<=``: an archive with no member is its 22-byte end record alone (the zip
    format's end of central directory record, as zipfile writes it), a plain layout with no members; the kit
    is then refused for holding no bundle, not for its layout."""
    from certify.verifier.kit import check_layout

    data = zip_of(0)
    assert len(data) == 22 and check_layout(data) == []


def test_kit_members_of_the_documented_file_size_in_all_are_read_and_one_byte_more_is_not():
    """Kills ``sum(member sizes) > MAX_FILE_BYTES`` -> ``>=``: the README documents 20,000,000 bytes for a file;
    the members of a kit may come to that much together (two deflated members of 10,000,000 zero bytes), and
    not one byte more."""
    from certify.verifier.kit import KitError, check_layout

    most = documented("file size")
    assert [size for _, size in check_layout(zip_of(2, most // 2))] == [most // 2, most // 2]
    with pytest.raises(KitError, match=f"more than {most} bytes"):
        check_layout(zip_of(1, most + 1))


def test_a_reason_of_85_characters_wraps_within_100_columns():
    """Kills WIDTH 100 -> 101: a report is laid out for a terminal of 100 columns, a 16-column label and its
    text; a reason of 85 characters (80 letters, a space, 4 letters) no longer fits on the label's line and
    is wrapped (as the standard library's textwrap does at 84), so no line is wider than 100."""
    import textwrap

    from certify.verifier.report import report

    reason = "x" * 80 + " abcd"
    lines = report({"file": "a.json", "accepted": False, "reason": reason}).splitlines()
    assert max(len(line) for line in lines) <= 100
    assert [line[16:] for line in lines[1:]] == textwrap.wrap(reason, 84) == ["x" * 80, "abcd"]


def test_a_second_space_in_ascii_text_is_escaped():
    """Kills ``"  " not in text`` -> ``in``: printable escapes every space that follows a space, so that a
    name cannot pad itself until the rest of a line leaves the screen; ASCII text with two spaces together
    does not take the shortcut for text with nothing to escape."""
    from certify.verifier.report import printable

    assert printable("a  b") == "a \\x20b"
    assert printable("a b") == "a b"


def test_only_the_first_curve_of_a_class_is_marked_as_e():
    """Kills ``i == 0`` -> ``!=`` in claim_lines: the report marks the first listed curve, and only it, as the
    input curve's model (y² + y = x³ − x² − 10x − 20 has a class of 3 curves, cypari2's ellisomat)."""
    from certify.isogeny.certificate import certify_isogeny_class
    from certify.verifier.report import claim_lines

    lines = claim_lines(certify_isogeny_class(tuple(Fraction(c) for c in (0, -1, 1, -10, -20))))
    marked = [line for line in lines if line.endswith("(≅ E)")]
    assert len([line for line in lines if line.startswith("E")]) == 3
    assert marked == [next(line for line in lines if line.startswith("E1: "))]


@pytest.mark.parametrize("a", [(0, -1, 1, -10, -20), (1, 0, 1, 4, -6), (0, 1, 0, -1, 0)])
def test_the_conductor_line_writes_n_as_its_prime_factorisation(a):
    """Kills ``conductor_exponent != "1"`` -> ``==`` and ``factored != conductor`` -> ``==`` in
    conductor_claim_lines: N is written ``N = 2^4 · 3`` as sympy's factorint factors it (exponent 1
    written as the bare prime), and a prime N as ``N = 11`` alone (cypari2's ellglobalred gives N)."""
    import sympy

    from certify.conductor import certify_conductor
    from certify.pari import pari
    from certify.verifier.report import conductor_claim_lines

    N = int(pari.ellglobalred(pari.ellinit(list(a)))[0])
    text = " ".join(conductor_claim_lines(certify_conductor(tuple(Fraction(c) for c in a))["claim"]))
    factors = sympy.factorint(N)
    factored = " · ".join(f"{p}^{e}" if e > 1 else str(p) for p, e in sorted(factors.items()))
    expected = f"N = {N}" + (f" = {factored}" if factored != str(N) else "") + " and minimal discriminant"
    assert expected in text


def test_a_rank_claim_without_an_upper_bound_is_a_lower_bound_alone():
    """Kills ``upper is None`` -> ``is not None`` in rank_claim: with no proven upper bound the claim reads
    'rank E(Q) ≥ 1' (a bound that is not proven is never printed as a value); with equal bounds, the rank."""
    from certify.verifier.report import rank_claim

    assert rank_claim({"rank_lower": "1", "rank_upper": None}) == "rank E(Q) ≥ 1"
    assert rank_claim({"rank_lower": "1", "rank_upper": "1"}) == "E(Q) has rank 1"
    assert rank_claim({"rank_lower": "0", "rank_upper": "2"}) == "0 ≤ rank E(Q) ≤ 2"


RANK_REPORTS = {
    (0, 0, 0, -1, 0): "E(Q) has rank 0 (E(Q) is finite): the descent via 2-isogeny bounds the rank by 0.",
    (0, 2, 0, -15, 0): "E(Q) has rank 1: the point P1 below has infinite order, and the descent via 2-isogeny bounds "
                       "the rank by 1.",
    (0, 5, 0, -12, 0): "E(Q) has rank 2: the points P1, P2 below are independent modulo torsion, and the descent via "
                       "2-isogeny bounds the rank by 2.",
}
"""The first sentence of the report of a rank certificate, for curves whose rank cypari2's ellrank proves
(y² = x³ − x is also Fermat's n = 1, not congruent: rank 0)."""


@pytest.mark.parametrize("a", list(RANK_REPORTS))
def test_a_rank_report_says_which_witness_gives_each_bound(a):
    """Kills ``len(points) > 1`` -> ``>=``, ``descent_bound is None`` -> ``is not None``, ``upper is None`` ->
    ``is not None`` and ``upper == "0"`` -> ``!=`` in rank_claim_lines: the report's first sentence names the
    points (one point has infinite order, several are independent), the descent's bound, and a finite E(Q) at
    rank 0; without an upper bound it says that none is proven."""
    from certify.pari import pari
    from certify.rank.certificate import certify_rank
    from certify.verifier.report import rank_claim_lines

    low, high, _ = (int(v) for v in pari.ellrank(pari.ellinit(list(a)))[:3])
    cert = certify_rank(tuple(Fraction(c) for c in a))
    assert cert["claim"]["rank_upper"] == str(low) == str(high)
    assert " ".join(rank_claim_lines(cert)).startswith(RANK_REPORTS[a])
    cert["claim"].update(rank_upper=None, selmer_dimensions=None)
    cert["evidence"].update(descent=None, analytic=None)
    assert " ".join(rank_claim_lines(cert)).startswith(f"rank E(Q) ≥ {low}: ")
    assert "No upper bound is proven" in " ".join(rank_claim_lines(cert))
    assert "does not determine" not in " ".join(rank_claim_lines(cert))


def test_a_rank_report_whose_bounds_do_not_meet_says_so_and_why():
    """Kills the conditions of the sentence for bounds that do not meet in rank_claim_lines: the rank-1 curve
    y² = x³ + 2x² − 15x (cypari2's ellrank) certified without its point proves 0 ≤ rank ≤ 1 by the descent,
    whose failure to close the report names; with an analytic witness of order 1 as the upper bound, it names
    the missing point instead; when the bounds meet neither sentence appears."""
    from certify.rank.certificate import certify_rank
    from certify.verifier.report import rank_claim_lines

    cert = certify_rank(tuple(Fraction(c) for c in (0, 2, 0, -15, 0)))
    assert "do not meet" not in " ".join(rank_claim_lines(cert)) and "did not close" not in " ".join(rank_claim_lines(cert))
    cert["claim"].update(rank_lower="0", points=[])
    text = " ".join(rank_claim_lines(cert))
    assert text.startswith("0 ≤ rank E(Q) ≤ 1: the descent via 2-isogeny bounds the rank by 1.")
    assert "The descent did not close, so this certificate does not determine the rank" in text
    cert["evidence"]["analytic"] = {"order": "1"}
    text = " ".join(rank_claim_lines(cert))
    assert "The bounds do not meet, so this certificate does not determine the rank" in text
    assert "did not close" not in text


CHECK_WORDS = {
    "torsion": ("1 generator on E with the claimed orders, generating 5 points;", "1 generator, 1 prime recounted, 0 polynomials solved"),
    "isogeny-class": ("3 listed curves shown to be reduced minimal models, no two isomorphic;",
                      "3 curves, 4 kernels rechecked, 36 witnesses"),
    "rank": ("no points listed, so the lower bound is 0;", "0 independent points, 0 character primes, order of "
             "vanishing proven"),
    "conductor": ("1 bad primes classified, 1 primes proven, 0 Pocklington certificates checked.",
                  "1 bad primes classified, 1 primes proven, 0 Pocklington certificates checked"),
}
"""What the report says the checks established, for y² + y = x³ − x² − 10x − 20: torsion Z/5Z (one
generator, five points), a class of 3 curves with 4 edges of degree 5 (cypari2's ellisomat), 3 × 12
completeness witnesses (Mazur 1978: 12 primes), rank 0 by L(E, 1) ≠ 0, conductor 11."""


@pytest.mark.parametrize("kind", list(CHECK_WORDS))
def test_the_checks_of_each_kind_are_put_in_that_kinds_words(kind):
    """Kills the comparisons of check_sentences and counts that pick a certificate kind by its checks (such
    as ``"witnesses" in checks`` -> ``not in``), and those of the rank summary's suffixes: each kind's checks
    are described in that kind's sentences and summed up in its words, and nothing more."""
    from certify.certificates import certifiers
    from certify.conductor import certify_conductor
    from certify.verifier.report import check_sentences, counts

    build = {**certifiers(), "conductor": certify_conductor}[kind]
    checks = verify(build(tuple(Fraction(c) for c in (0, -1, 1, -10, -20))))["checks"]
    sentence, summary = CHECK_WORDS[kind]
    assert check_sentences(checks)[0] == sentence and "no upper bound" not in " ".join(check_sentences(checks))
    assert counts(checks) == summary


@pytest.mark.parametrize("a", list(RANK_REPORTS))
def test_a_rank_certificate_with_a_descent_reports_the_descent_and_nothing_analytic(a):
    """Kills ``EXCLUDED in checks`` -> ``not in`` and the like in rank_sentences and counts: the curves of
    RANK_REPORTS have a rational point of order 2 and a descent that proves the rank, and no analytic
    witness; the report describes the descent and its excluded cosets, and no analytic witness."""
    from certify.rank.certificate import certify_rank
    from certify.verifier.report import check_sentences, counts

    checks = verify(certify_rank(tuple(Fraction(c) for c in a)))["checks"]
    text = " ".join(check_sentences(checks))
    assert "the descent via 2-isogeny rechecked" in text and "L(E, s)" not in text and "no upper bound" not in text
    assert "excluded" in counts(checks) and "vanishing" not in counts(checks) and "no upper" not in counts(checks)


def test_a_cell_of_the_bundle_table_fits_its_width_exactly_and_one_more_is_cut():
    """Kills ``len(text) <= width`` -> ``<`` in cut: a bundle table cell of exactly its width is shown whole,
    one character longer is cut to the width with an ellipsis."""
    from certify.verifier.report import cut

    assert cut("x" * 16, 16) == "x" * 16
    assert cut("x" * 17, 16) == "x" * 15 + "…"


# --- errors.py: values in rejection messages ---

def test_rejection_values_are_abbreviated_beyond_300_bits_and_cut_beyond_200_characters():
    """Kills ``value.bit_length() > 300`` -> ``>=``, the same for a rational's numerator and denominator, and
    ``len(text) <= 200`` -> ``<`` in errors.show: its documented rule shows a number of exactly 300 bits
    whole and abbreviates one of 301 bits to its size (an integer, and a rational by the larger of its two
    parts), and shows a value whose text has exactly 200 characters whole, cutting one of 201."""
    def shown(value) -> str:
        return str(Rejection("check", "message", value=value)).removeprefix("check: message (value=")[:-1]

    at, over = 2 ** 299 + 1, 2 ** 300 + 1
    assert (at.bit_length(), over.bit_length()) == (300, 301)
    assert shown(at) == str(at) and shown(over) == "<301-bit integer>"
    assert shown(Fraction(at, 5)) == f"{at}/5" and shown(Fraction(over, 5)) == "<rational of 301 bits>"
    assert shown(Fraction(5, at)) == f"5/{at}" and shown(Fraction(5, over)) == "<rational of 301 bits>"
    assert shown("a" * 198) == repr("a" * 198) and len(shown("a" * 198)) == 200
    assert shown("a" * 199) == repr("a" * 199)[:200] + "…"


# --- cli.py: the --jsonl lines ---

def test_a_rejected_certificate_has_its_digest_in_the_jsonl_line(tmp_path):
    """Kills ``result["digest"] is None`` -> ``is not None`` in cli.check: the README documents a digest in
    every --jsonl object, and a certificate refused by its checks (here the honest one claiming Z/2 × Z/4,
    which cypari2's elltors denies in tests/test_soundness_false_claims.py) still has its digest, the
    SHA-256 of its canonical content, so a table can cite the file it refused."""
    from certify.verifier.digest import digest

    cert = honest()
    cert["claim"]["invariants"] = ["2", "4"]
    verdict = command_line(tmp_path, {"false": cert})["false"]
    assert verdict["accepted"] is False and verdict["digest"] == digest(cert)


def bundle_lines(tmp_path, members: list) -> list:
    """The --jsonl objects of the bare verifier on a bundle of the given certificates, the manifest recording
    each one's own digest and claim (so that only the checks can refuse a member)."""
    from certify.bundle import build_bundle
    from certify.verifier.digest import digest
    from certify.verifier.report import describe_claim

    bundle = build_bundle([(f"c{i}.json", cert, {"digest": digest(cert), "reason": describe_claim(cert)})
                           for i, cert in enumerate(members)])
    tmp_path.mkdir()
    path = tmp_path / "bundle.json"
    path.write_text(json.dumps(bundle))
    return [json.loads(line) for line in run("bare verifier", "--jsonl", str(path)).stdout.decode().splitlines()]


def test_a_bundle_is_accepted_in_jsonl_exactly_when_every_member_is(tmp_path):
    """Kills ``accepted == len(results)`` -> ``!=`` in bundle_verdict and ``n == 1`` -> ``!=`` in plural: the
    bundle's --jsonl object says accepted when every member is (one honest member), not accepted when one is
    refused (beside it, the honest certificate claiming Z/2 × Z/4, which cypari2's elltors denies), with
    'certificate' singular for one member and plural for two."""
    one = bundle_lines(tmp_path / "one", [honest()])
    assert [(line["accepted"], line["reason"]) for line in one[1:]] == [(True, "bundle of 1 certificate: 1 accepted")]
    assert one[-1]["members"] == 1
    false = honest()
    false["claim"]["invariants"] = ["2", "4"]
    two = bundle_lines(tmp_path / "two", [honest(), false])
    assert [line["accepted"] for line in two] == [True, False, False]
    assert (two[-1]["reason"], two[-1]["members"]) == ("bundle of 2 certificates: 1 accepted", 2)
