"""Writing certificates: canonical JSON text and atomic files."""
from __future__ import annotations

import json
import os
import tempfile


def to_json(cert: dict) -> str:
    """The certificate as indented JSON text with a final newline (all numbers are already strings)."""
    return json.dumps(cert, indent=1, ensure_ascii=False) + "\n"


def write_atomically(path: str, text: str) -> None:
    """Write ``text`` to ``path`` through a temporary file in the same folder and a rename, so that an
    interrupt or a full disk never leaves a half-written file under ``path``."""
    folder = os.path.dirname(os.path.abspath(path))
    handle, temporary = tempfile.mkstemp(dir=folder, prefix=".certify-", suffix=".tmp")
    try:
        with os.fdopen(handle, "w", encoding="utf-8") as out:
            out.write(text)
            out.flush()
            os.fsync(out.fileno())
        os.replace(temporary, path)
    except BaseException:
        os.unlink(temporary)
        raise
