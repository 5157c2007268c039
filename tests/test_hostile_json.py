"""Hostile input, mechanism *two readers, two claims*: JSON that two conforming readers may read
differently — an object key given twice (some readers keep the first, some the last), NaN and Infinity
(not JSON at all), floating-point numbers, lone surrogates, a byte-order mark — in a certificate, inside its
evidence, in a bundle's manifest and in a store row. Each is refused by name on both entry points
(tests/hostile_run.py), and a file with a duplicate key is never accepted, whichever copy is the honest one."""
from __future__ import annotations

import json
import sqlite3

import pytest

from certify.verifier.digest import digest
from hostile_run import ENTRY_POINTS, assert_answered, run, write_files
from soundness_pool import fresh


def honest() -> dict:
    return fresh("torsion", 0)


def with_second_claim(first_is_false: bool) -> str:
    """The JSON text of an honest certificate with a second top-level "claim" key holding a false claim
    (trivial torsion), before or after the honest one."""
    cert = honest()
    honest_text = json.dumps(cert["claim"])
    false_text = json.dumps({"invariants": [], "generators": []})
    rest = json.dumps({k: v for k, v in cert.items() if k != "claim"})[1:-1]
    pair = (false_text, honest_text) if first_is_false else (honest_text, false_text)
    return '{"claim": %s, %s, "claim": %s}' % (pair[0], rest, pair[1])


def with_text_replaced(old: str, new: str) -> str:
    text = json.dumps(honest())
    assert old in text
    return text.replace(old, new, 1)


def bundle_with_duplicate_member_key() -> str:
    from certify.bundle import build_bundle

    cert = honest()
    text = json.dumps(build_bundle([("c.json", cert, {"digest": digest(cert), "reason": "r"})]))
    return text.replace('"count": "1"', '"count": "1", "count": "1"', 1)


FILES = {
    "a false claim first, the honest claim last": lambda: with_second_claim(True),
    "the honest claim first, a false claim last": lambda: with_second_claim(False),
    "a key twice inside the evidence": lambda: with_text_replaced('"primes": ', '"primes": [], "primes": '),
    "a key twice in a bundle's manifest": bundle_with_duplicate_member_key,
    "NaN": lambda: with_text_replaced('"version": "1"', '"version": NaN'),
    "Infinity": lambda: with_text_replaced('"version": "1"', '"version": -Infinity'),
    "a floating-point number": lambda: with_text_replaced('"version": "1"', '"version": 1.0'),
    "a lone surrogate in a string": lambda: with_text_replaced('"version": "1"', '"version": "1\\ud800"'),
    "a lone surrogate in a key": lambda: with_text_replaced('"version": "1"', '"version": "1", "\\udc00": "1"'),
    "a byte-order mark": lambda: "\ufeff" + json.dumps(honest()),
    "a bundle with no members": lambda: json.dumps({"format": "certify-bundle", "version": "1",
                                                    "manifest": {"count": "0", "members": []}, "members": []}),
}


@pytest.fixture(scope="module")
def files(tmp_path_factory) -> dict:
    return write_files(tmp_path_factory.mktemp("json"), FILES, "json")


@pytest.mark.parametrize("entry", sorted(ENTRY_POINTS))
@pytest.mark.parametrize("name", list(FILES))
def test_each_ambiguous_file_is_refused_by_name(files, name, entry):
    """Unreadable, exit status 2, with the reason naming what was refused; never accepted."""
    result = run(entry, "--jsonl", files[name])
    (verdict,) = assert_answered(result, jsonl=True)
    assert verdict["accepted"] is False and result.returncode == 2
    assert verdict["reason"].startswith("unreadable: "), verdict["reason"]


@pytest.mark.parametrize("first_is_false", [True, False])
def test_a_store_row_with_a_duplicate_claim_is_refused(tmp_path, first_is_false):
    """The same duplicate-key document as a store row: one reading of every source."""
    path = str(tmp_path / "rows.sqlite")
    with sqlite3.connect(path) as connection:
        connection.execute("CREATE TABLE certificates (curve TEXT, kind TEXT, label TEXT, document TEXT, digest TEXT)")
        connection.execute("INSERT INTO certificates VALUES ('[1,0,1,-19,26]', 'torsion', '', ?, ?)",
                           (with_second_claim(first_is_false), digest(honest())))
    for entry in ENTRY_POINTS:
        (verdict,) = assert_answered(run(entry, "--jsonl", path), jsonl=True)
        assert not verdict["accepted"] and "duplicate key" in verdict["reason"], verdict


def test_the_honest_certificate_alone_is_accepted(tmp_path):
    """The control: the honest certificate without the second key is accepted by both entry points."""
    path = tmp_path / "honest.json"
    path.write_text(json.dumps(honest()))
    for entry in ENTRY_POINTS:
        (verdict,) = assert_answered(run(entry, "--jsonl", str(path)), jsonl=True)
        assert verdict["accepted"], verdict
