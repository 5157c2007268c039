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
