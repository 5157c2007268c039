"""Hostile input, mechanism *memory before the limits*: files that are small on disk but large once parsed
or once checked — a million short bad strings, one list far over the list limit, twenty megabytes of empty
lists, deep nesting, and a file of many lists each just under the limit — given to both entry points
(tests/hostile_run.py). The limits of certify/verifier/limits.py must refuse each before the JSON-Schema
step or any check keeps work proportional to the content: within 10 s and 500 MB, one verdict, no traceback."""
from __future__ import annotations

import json

import pytest

from certify.verifier import limits
from hostile_run import ENTRY_POINTS, assert_answered, run, write_files


def torsion_shell(**fields) -> dict:
    """The outer fields of a torsion certificate, with the given fields put in."""
    return dict({"format": "certify-torsion", "version": "1"}, **fields)


FILES = {
    "a million short bad strings": (lambda: json.dumps(torsion_shell(curve=["x"] * 1_200_000)), "unreadable"),
    "one list of 700,000 entries": (lambda: json.dumps(torsion_shell(curve=["1"] * 700_000)), "unreadable"),
    "twenty megabytes of empty lists": (lambda: "[" + ",".join(["[]"] * 6_000_000) + "]", "unreadable"),
    "nesting 100,000 deep": (lambda: "[" * 100_000 + "]" * 100_000, "unreadable"),
    "a JSON number of 100,000 digits": (lambda: json.dumps(torsion_shell())[:-1] + ', "n": ' + "7" * 100_000 + "}",
                                        "unreadable"),
    "ninety lists just under the list limit": (
        lambda: json.dumps(torsion_shell(curve=["0"] * 5, evidence={f"e{i}": ["bad"] * (limits.MAX_LIST_LENGTH - 1)
                                                                     for i in range(90)})), None),
}
"""Each file's text, and how its verdict must begin (None: a rejection by any check)."""


@pytest.fixture(scope="module")
def files(tmp_path_factory) -> dict:
    return write_files(tmp_path_factory.mktemp("memory"), FILES, "memory")


@pytest.mark.parametrize("entry", sorted(ENTRY_POINTS))
@pytest.mark.parametrize("name", list(FILES))
def test_each_large_file_is_refused_within_the_bounds(files, name, entry):
    """Within 10 s and 500 MB; never accepted; unreadable where a limit on the whole document applies."""
    (verdict,) = assert_answered(run(entry, "--jsonl", files[name]), jsonl=True)
    assert verdict["accepted"] is False
    if FILES[name][1]:
        assert verdict["reason"].startswith(FILES[name][1]), verdict["reason"]


def test_the_schema_step_stops_at_the_first_few_violations():
    """A certificate with 9,999 schema violations in one list: the verifier's schema step reports at most three
    and stops there, so its cost and memory do not grow with the number of faults."""
    from certify.verifier.schema import schema_violations

    cert = torsion_shell(curve=["bad"] * (limits.MAX_LIST_LENGTH - 1), claim={}, evidence={}, relies_on=[])
    assert 1 <= len(schema_violations(cert)) <= 3
