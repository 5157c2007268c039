"""Writing certificates: canonical JSON text and atomic files."""
from __future__ import annotations

import contextlib
import json
import os
import sys
import tempfile


def to_json(cert: dict) -> str:
    """The certificate as indented JSON text with a final newline (all numbers are already strings)."""
    return json.dumps(cert, indent=1, ensure_ascii=False) + "\n"


def write_atomically(path: str, text: str, durable: bool = True) -> None:
    """Write ``text`` to ``path`` through a temporary file in the same folder and a rename, so that an
    interrupt or a full disk never leaves a half-written file under ``path``. ``durable`` also waits
    for the disk (fsync) before the rename, against power cuts; a writer of many files may instead
    sync once at the end."""
    folder = os.path.dirname(os.path.abspath(path))
    handle, temporary = tempfile.mkstemp(dir=folder, prefix=".certify-", suffix=".tmp")
    try:
        with os.fdopen(handle, "w", encoding="utf-8") as out:
            out.write(text)
            out.flush()
            if durable:
                os.fsync(out.fileno())
        os.replace(temporary, path)
    except BaseException:  # an interrupt may also come just after the rename, when nothing is left to remove
        with contextlib.suppress(FileNotFoundError):
            os.unlink(temporary)
        raise


def emit(text: str, output) -> None:
    """Write ``text`` to the file ``output`` atomically, or to stdout when ``output`` is None."""
    if output is None:
        sys.stdout.write(text)
    else:
        write_atomically(output, text)


def stamp(cert: dict) -> dict:
    """The certificate with a ``metadata`` block (UTC time of writing, certify, Python and PARI versions).
    The digest leaves ``metadata`` out and the verifier never reads it, so stamping changes neither."""
    import datetime
    import platform

    from certify import __version__
    from certify.pari import pari

    metadata = {"written": datetime.datetime.now(datetime.timezone.utc).strftime("%Y-%m-%dT%H:%M:%SZ"),
                "certify": __version__, "python": platform.python_version(),
                "pari": ".".join(str(part) for part in pari.version())}
    return {**cert, "metadata": metadata}


def certifiers() -> dict:
    """{kind: certify function} for each kind of certificate this installation can write ('torsion', and
    'isogeny-class' once ``certify.isogeny`` is installed)."""
    from certify.torsion import certify_torsion

    kinds = {"torsion": certify_torsion}
    try:
        from certify.isogeny.certificate import certify_isogeny_class
    except ImportError:
        return kinds
    return {**kinds, "isogeny-class": certify_isogeny_class}


class NotAccepted(Exception):
    """A certificate given to a command that builds on certificates is not accepted by the verifier."""


def accepted_certificates(sources) -> list:
    """[(name, certificate, verdict)] for every certificate in the sources (files, bundles, directories,
    stores), in order; raises NotAccepted, naming the first certificate the verifier does not accept."""
    from certify.verifier.cli import all_tasks, check, entries

    out = []
    for task in all_tasks(sources):
        for name, document, recorded in entries(task):
            verdict = check(name, document, recorded)
            if not verdict["accepted"]:
                raise NotAccepted(f"{name}: rejected — {verdict['reason']}")
            out.append((name, document, verdict))
    return out
