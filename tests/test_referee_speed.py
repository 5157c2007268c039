"""Referee findings on the verifier speed change (issue 14): ``certify.api.verify`` on a document writes
it out and reads it back with the verifier's file limits. Written with ASCII escapes (six bytes for each
non-ASCII character), a document that ``certify verify`` accepts from its UTF-8 file was refused by the
API as larger than MAX_FILE_BYTES. The API's docstring says it checks a document "exactly as ``certify
verify`` does"; the reference here is the command-line path itself (``verify`` on the file)."""
from __future__ import annotations

import copy
import json
from pathlib import Path

from certify.api import verify
from certify.verifier.limits import MAX_FILE_BYTES, MAX_STRING_LENGTH

DEMO = Path(__file__).resolve().parent.parent / "certificates-demo" / "appendix-curve-1.torsion.json"


def test_api_verify_agrees_with_the_file_on_non_ascii_text(tmp_path):
    document = json.loads(DEMO.read_text(encoding="utf-8"))
    padded = copy.deepcopy(document)
    statement = "é" * (MAX_STRING_LENGTH - 1000)          # 2 bytes in UTF-8, 6 as a JSON escape
    entries = MAX_FILE_BYTES // (4 * len(statement)) + 1  # about 8 MB of UTF-8, about 24 MB escaped
    padded["relies_on"] += [{"key": f"extra-{i}", "statement": statement, "reference": "none"}
                            for i in range(entries)]
    path = tmp_path / "padded.json"
    path.write_text(json.dumps(padded, ensure_ascii=False, separators=(",", ":")), encoding="utf-8")
    assert path.stat().st_size <= MAX_FILE_BYTES
    from_file = verify(path)
    assert from_file.accepted, from_file.reason
    assert verify(padded).accepted == from_file.accepted, verify(padded).reason


def test_api_verify_refuses_a_lone_surrogate_as_the_file_written_with_escapes_is_refused(tmp_path):
    """A lone surrogate has no UTF-8 form: the API writes the document with JSON escapes, as
    ``json.dumps`` would for a file, and the verdict is the file's, not an exception."""
    document = json.loads(DEMO.read_text(encoding="utf-8"))
    document["relies_on"][0]["statement"] += "\ud800"
    path = tmp_path / "surrogate.json"
    path.write_text(json.dumps(document), encoding="ascii")
    from_file = verify(path)
    from_api = verify(document)
    assert (from_api.accepted, from_api.reason) == (from_file.accepted, from_file.reason)
