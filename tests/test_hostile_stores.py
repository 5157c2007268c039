"""Hostile input, mechanism *stores read defensively*: SQLite stores whose rows hold a document of the wrong
type (BLOB, NULL, integer, real), oversized or non-UTF-8 values, odd key columns, and stores that are not
certify stores at all (a view that computes without end, a missing table, missing columns, a file that is
not SQLite, a generated column, a virtual table), and a named pipe in a directory of certificates. Each bad
row gets its own one-line verdict and the run goes on to the next; a store that cannot be read at all is one
unreadable verdict — within 10 s and 500 MB, no traceback, on both entry points (tests/hostile_run.py)."""
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


def generated_column(path: str) -> str:
    """A table whose curve column is computed on every read. Here the expression is a constant; a referee's
    8 KB store made it instr() of 10⁵ a's and a b in 10⁷ a's, about 10¹² byte comparisons inside one SQLite
    step, where the step limit never runs (43 s), so every generated column is refused, whatever it computes."""
    with sqlite3.connect(path) as connection:
        connection.execute("CREATE TABLE certificates (kind, label, document, digest, "
                           "curve AS ('[0,1,1,-2,7]') VIRTUAL)")
        cert = fresh("torsion", 0)
        connection.execute("INSERT INTO certificates VALUES (?, ?, ?, ?)",
                           ("torsion", "", json.dumps(cert), digest(cert)))
    return path


def virtual_table(path: str) -> str:
    """The table a virtual table of SQLite's full-text module, whose code runs on every read."""
    with sqlite3.connect(path) as connection:
        connection.execute("CREATE VIRTUAL TABLE certificates USING fts5(curve, kind, label, document, digest)")
        connection.execute("INSERT INTO certificates VALUES (?, ?, ?, ?, ?)", good_row(0))
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
@pytest.mark.parametrize("build", [recursive_view, generated_column, virtual_table, table_without_columns, not_sqlite,
                                   no_table])
def test_a_store_that_cannot_be_read_is_one_unreadable_verdict(tmp_path, entry, build):
    """A view that would compute rows without end, a generated column, a virtual table, a table without the
    columns, a damaged file, a missing table: one unreadable verdict, exit status 2."""
    result = run(entry, "--jsonl", build(str(tmp_path / "store.sqlite")))
    (verdict,) = assert_answered(result, jsonl=True)
    assert result.returncode == 2 and verdict["reason"].startswith("unreadable: "), verdict


@pytest.mark.parametrize("entry", sorted(ENTRY_POINTS))
def test_a_named_pipe_in_a_directory_is_passed_over(tmp_path, entry):
    """A directory stands for its regular *.json files: a named pipe called b.json beside a certificate
    would make a read wait for a writer without end (a referee's finding); it is passed over, and the
    certificate beside it gets its verdict."""
    import os

    (tmp_path / "a.json").write_text(json.dumps(fresh("torsion", 0)))
    os.mkfifo(tmp_path / "b.json")
    (verdict,) = assert_answered(run(entry, "--jsonl", str(tmp_path)), certificates=1, jsonl=True)
    assert verdict["accepted"] and verdict["file"].endswith("a.json")


@pytest.mark.parametrize("build, reason", [(generated_column, "'certificates' has a generated column"),
                                           (virtual_table, "'certificates' is a virtual table")])
def test_a_table_that_computes_on_reading_is_refused_by_name(tmp_path, build, reason):
    """The generated column and the virtual table are refused for what they are, before any row is read."""
    path = build(str(tmp_path / "store.sqlite"))
    (verdict,) = assert_answered(run("bare verifier", "--jsonl", path), jsonl=True)
    assert verdict["reason"] == f"unreadable: {path}: not a certify store ({reason})"
