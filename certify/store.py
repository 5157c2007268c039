"""Where ``certify batch`` keeps certificates: a directory (one file per certificate) or a SQLite store.

Both are written by one process only (the batch's main process) and hold only complete
certificates: a directory gets each file through a temporary file and a rename, a store gets its
rows in transactions, so an interrupt loses at most the certificates not yet written and never
leaves a partial one. The SQLite layout is the one the verifier reads (``certify.verifier.sources``);
failures are kept in a second table, ``failures``, until a later run succeeds.
"""
from __future__ import annotations

import hashlib
import json
import os
import sqlite3
import time

from certify.certificates import write_atomically
from certify.verifier.limits import MAX_FILE_BYTES
from certify.verifier.sources import STORE_COLUMNS, STORE_SUFFIX, STORE_TABLE

LONGEST_STEM = 100
"""Longest file-name stem spelt out from the coefficients; longer ones are cut and end in a hash."""

FAILURES_FILE = "failures.jsonl"


def file_stem(key: str) -> str:
    """A file-name stem for the curve '[a1,a2,a3,a4,a6]': '1,-3_16,-3_16,0,0' ('/' becomes '_'), with an 'E'
    in front when it would begin with '-' ('E-7_3,-10,-10,0,0'), so that no command mistakes the file for
    an option; when longer than LONGEST_STEM, its start and 16 hex digits of the key's SHA-256."""
    stem = key.strip("[]").replace("/", "_")
    if stem.startswith("-"):
        stem = "E" + stem
    if len(stem) <= LONGEST_STEM:
        return stem
    return stem[:LONGEST_STEM - 17] + "~" + hashlib.sha256(key.encode("ascii")).hexdigest()[:16]


def file_name(key: str, kind: str) -> str:
    """The file of the certificate of this kind for the curve '[a1,a2,a3,a4,a6]': '<stem>.<kind>.json'."""
    return f"{file_stem(key)}.{kind}.json"


class StoreError(Exception):
    """OUT cannot be opened as a store."""


class StoreReader:
    """Reading certificates back from a store or directory that ``certify batch`` wrote (``certify audit
    --store``): ``get(key, kind)`` gives (document text, {"digest": recorded digest} or {}) or None."""

    def __init__(self, path: str):
        self.path, self.connection = path, None
        if path.endswith(STORE_SUFFIX):
            if not os.path.isfile(path):
                raise StoreError(f"cannot use {path} as a store: no such file")
            try:
                self.connection = sqlite3.connect(f"file:{path}?mode=ro", uri=True)
                self.connection.execute(f"SELECT document, digest FROM {STORE_TABLE} LIMIT 1").fetchall()
            except sqlite3.Error as error:
                raise StoreError(f"cannot use {path} as a store: {error}") from None
        elif not os.path.isdir(path):
            raise StoreError(f"cannot use {path} as a store: not a directory or a {STORE_SUFFIX} file")

    def get(self, key: str, kind: str):
        if self.connection is not None:
            row = self.connection.execute(f"SELECT document, digest FROM {STORE_TABLE} WHERE curve = ? AND kind = ?",
                                          (key, kind)).fetchone()
            return None if row is None else (row[0], {"digest": row[1]})
        try:
            with open(os.path.join(self.path, file_name(key, kind)), encoding="utf-8") as handle:
                text = handle.read(MAX_FILE_BYTES + 1)
        except (OSError, UnicodeDecodeError):
            return None
        return (text, {}) if 0 < len(text) <= MAX_FILE_BYTES else None

    def __enter__(self):
        return self

    def __exit__(self, *_):
        if self.connection is not None:
            self.connection.close()


def open_store(path: str):
    """The store named by OUT: a SQLite store when it ends in .sqlite, a directory otherwise."""
    try:
        return SqliteStore(path) if path.endswith(STORE_SUFFIX) else DirectoryStore(path)
    except (OSError, sqlite3.Error) as error:
        raise StoreError(f"cannot use {path} as a store: {getattr(error, 'strerror', None) or error}")


class DirectoryStore:
    """One file ``<stem>.<kind>.json`` per certificate; the failures of the last run in failures.jsonl.
    An empty file (what a power cut can leave of a file not yet on disk) counts as absent."""

    def __init__(self, path: str):
        os.makedirs(path, exist_ok=True)
        self.path, self.failures = path, []
        self.present = {entry.name for entry in os.scandir(path) if entry.stat().st_size > 0}

    def name(self, key: str, kind: str) -> str:
        return file_name(key, kind)

    def has(self, key: str, kind: str) -> bool:
        """Whether the certificate of this curve and kind is already stored."""
        return self.name(key, kind) in self.present

    def put(self, key: str, kind: str, label: str, document: str, digest: str) -> None:
        write_atomically(os.path.join(self.path, self.name(key, kind)), document, durable=False)

    def fail(self, key: str, kind: str, label: str, reason: str) -> None:
        self.failures.append({"curve": key, "kind": kind, "label": label, "reason": reason})

    def close(self) -> None:
        """Write (or remove) failures.jsonl: the failures of this run, which a rerun retries; then wait
        for the disk once for all the files written (an fsync per file would make the writer, not the
        certifiers, the bottleneck)."""
        target = os.path.join(self.path, FAILURES_FILE)
        if self.failures:
            write_atomically(target, "".join(json.dumps(f, ensure_ascii=False) + "\n" for f in self.failures))
        elif os.path.exists(target):
            os.unlink(target)
        os.sync()


class SqliteStore:
    """Table ``certificates`` (see ``certify.verifier.sources.STORE_COLUMNS``, key (curve, kind)) and
    table ``failures`` (curve, kind, label, reason); rows are committed at least every COMMIT_SECONDS."""

    COMMIT_SECONDS = 2.0

    def __init__(self, path: str):
        self.connection = sqlite3.connect(path)
        self.connection.execute("PRAGMA journal_mode=WAL")
        self.connection.execute(f"CREATE TABLE IF NOT EXISTS {STORE_TABLE} (curve TEXT NOT NULL, kind TEXT NOT NULL, "
                                "label TEXT, document TEXT NOT NULL, digest TEXT NOT NULL, PRIMARY KEY (curve, kind))")
        self.connection.execute("CREATE TABLE IF NOT EXISTS failures (curve TEXT NOT NULL, kind TEXT NOT NULL, "
                                "label TEXT, reason TEXT NOT NULL, PRIMARY KEY (curve, kind))")
        self.connection.commit()
        self.present = set(self.connection.execute(f"SELECT curve, kind FROM {STORE_TABLE}"))
        self.committed = time.monotonic()

    def has(self, key: str, kind: str) -> bool:
        """Whether the certificate of this curve and kind is already stored."""
        return (key, kind) in self.present

    def put(self, key: str, kind: str, label: str, document: str, digest: str) -> None:
        self.connection.execute(f"INSERT OR REPLACE INTO {STORE_TABLE} ({', '.join(STORE_COLUMNS)}) "
                                "VALUES (?, ?, ?, ?, ?)", (key, kind, label, document, digest))
        self.connection.execute("DELETE FROM failures WHERE curve = ? AND kind = ?", (key, kind))
        self._maybe_commit()

    def fail(self, key: str, kind: str, label: str, reason: str) -> None:
        self.connection.execute("INSERT OR REPLACE INTO failures VALUES (?, ?, ?, ?)", (key, kind, label, reason))
        self._maybe_commit()

    def _maybe_commit(self) -> None:
        if time.monotonic() - self.committed >= self.COMMIT_SECONDS:
            self.connection.commit()
            self.committed = time.monotonic()

    def close(self) -> None:
        """Commit what is written and close the file."""
        self.connection.commit()
        self.connection.close()
