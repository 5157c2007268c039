"""Hostile input, mechanism *stores read defensively*: SQLite stores whose rows hold a document of the wrong
type (BLOB, NULL, integer, real), oversized or non-UTF-8 values, odd key columns, and stores that are not
certify stores at all (a view that computes without end, a missing table, missing columns, a file that is
not SQLite). Each bad row gets its own one-line verdict and the run goes on to the next; a store that
cannot be read at all is one unreadable verdict — within 10 s and 500 MB, no traceback, on both entry
points (tests/hostile_run.py)."""
from __future__ import annotations

import json
import sqlite3

import pytest

from certify.verifier.digest import digest
from hostile_run import ENTRY_POINTS, assert_answered, run
from soundness_pool import fresh

CREATE = "CREATE TABLE certificates (curve, kind, label, document, digest)"
"""The store's table without column types: SQLite then keeps each value in whatever type it is given."""


def good_row(index: int) -> tuple:
    cert = fresh("torsion", index)
    return ("[" + ",".join(cert["curve"]) + "]", "torsion", "", json.dumps(cert), digest(cert))


BAD_ROWS = {
    "document as a BLOB": ("[9]", "torsion", "", json.dumps(fresh("torsion", 1)).encode(), "x"),
    "document NULL": ("[9]", "torsion", "", None, None),
    "document an integer": ("[9]", "torsion", "", 12345, 7),
    "document a real": ("[9]", "torsion", "", 1.5, 2.5),
    "document not JSON": ("[9]", "torsion", "", "{not json", "x"),
    "document not UTF-8 text": ("[9]", "torsion", "", sqlite3.Binary(b"\xff\xfe{}"), "x"),
    "curve a BLOB with control bytes": (b"\x1b[2J\x00\xff", "torsion", "", json.dumps(fresh("torsion", 2)), "x"),
    "kind NULL, curve an integer": (5, None, None, json.dumps(fresh("torsion", 3)), None),
    "curve of a megabyte": ("9" * 1_000_000, "torsion", "", json.dumps(fresh("torsion", 4)), "x"),
}
"""Rows that must each give a rejected or unreadable verdict of their own."""


def make_store(path: str, rows: list) -> str:
    with sqlite3.connect(path) as connection:
        connection.execute(CREATE)
        connection.executemany("INSERT INTO certificates VALUES (?, ?, ?, ?, ?)", rows)
    return path


@pytest.mark.parametrize("entry", sorted(ENTRY_POINTS))
def test_each_bad_row_gets_its_verdict_and_the_run_goes_on(tmp_path, entry):
    """Every bad row between two good ones: one verdict each, only the good rows accepted, exit status 2
    (some rows unreadable) or 1."""
    rows = [good_row(0)] + list(BAD_ROWS.values()) + [good_row(5)]
    path = make_store(str(tmp_path / "rows.sqlite"), rows)
    verdicts = assert_answered(run(entry, "--jsonl", path), certificates=len(rows), jsonl=True)
    assert sum(v["accepted"] for v in verdicts) == 2
    assert all(len(v["file"]) < 1000 for v in verdicts)


def recursive_view(path: str) -> str:
    with sqlite3.connect(path) as connection:
        connection.execute("CREATE VIEW certificates AS WITH RECURSIVE n(i) AS (SELECT 1 UNION ALL SELECT i + 1 FROM n) "
                           "SELECT 'c' AS curve, 'k' AS kind, '' AS label, '{}' AS document, '' AS digest FROM n")
    return path


def table_without_columns(path: str) -> str:
    with sqlite3.connect(path) as connection:
        connection.execute("CREATE TABLE certificates (x)")
        connection.execute("INSERT INTO certificates VALUES (1)")
    return path


def not_sqlite(path: str) -> str:
    with open(path, "wb") as handle:
        handle.write(b"SQLite format 3\x00" + b"\xff" * 4000)
    return path


def no_table(path: str) -> str:
    with sqlite3.connect(path) as connection:
        connection.execute("CREATE TABLE other (x)")
    return path


@pytest.mark.parametrize("entry", sorted(ENTRY_POINTS))
@pytest.mark.parametrize("build", [recursive_view, table_without_columns, not_sqlite, no_table])
def test_a_store_that_cannot_be_read_is_one_unreadable_verdict(tmp_path, entry, build):
    """A view that would compute rows without end, a table without the columns, a damaged file, a missing
    table: one unreadable verdict, exit status 2."""
    result = run(entry, "--jsonl", build(str(tmp_path / "store.sqlite")))
    (verdict,) = assert_answered(result, jsonl=True)
    assert result.returncode == 2 and verdict["reason"].startswith("unreadable: "), verdict
