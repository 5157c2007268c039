"""Making and writing certificates: the checked certifiers, canonical JSON text and atomic files."""
from __future__ import annotations

import contextlib
import json
import os
import sys
import tempfile
from json.encoder import encode_basestring

from certify.curves import Curve, CurveInputError
from certify.verifier.limits import MAX_DIGITS


def to_json(cert: dict) -> str:
    """The certificate as indented JSON text with a final newline (all numbers are already strings):
    the text of ``json.dumps(cert, indent=1, ensure_ascii=False)``, built here because the json module
    indents in pure Python, a generator per value, which made it the slowest step of a batch."""
    return _indented(cert, "\n") + "\n"


def _indented(value, newline: str) -> str:
    """A JSON value indented one space per level, its first line not indented; ``newline`` is the
    line break and the indentation of the level the value is at."""
    if isinstance(value, str):
        return encode_basestring(value)
    inner = newline + " "
    if isinstance(value, dict):
        if not value:
            return "{}"
        return ("{" + inner + ("," + inner).join(encode_basestring(key) + ": " + _indented(item, inner)
                                                 for key, item in value.items()) + newline + "}")
    if isinstance(value, (list, tuple)):
        if not value:
            return "[]"
        return "[" + inner + ("," + inner).join(_indented(item, inner) for item in value) + newline + "]"
    return json.dumps(value)


class OutputError(OSError):
    """An output file cannot be written (a read-only or missing folder, a directory in its place, a full
    disk); the message names the path and the reason on one line."""

    def __init__(self, path: str, error: OSError):
        super().__init__(f"cannot write {path}: {error.strerror or error}")


def write_atomically(path: str, text: str, durable: bool = True) -> None:
    """Write ``text`` (str, or bytes as they are) to ``path`` through a temporary file in the same folder and a rename, so that an
    interrupt or a full disk never leaves a half-written file under ``path``. ``durable`` also waits
    for the disk (fsync) before the rename, against power cuts; a writer of many files may instead
    sync once at the end. Raises OutputError when the file cannot be written."""
    folder = os.path.dirname(os.path.abspath(path))
    try:
        handle, temporary = tempfile.mkstemp(dir=folder, prefix=".certify-", suffix=".tmp")
    except OSError as error:
        raise OutputError(path, error) from None
    try:
        with (os.fdopen(handle, "wb") if isinstance(text, bytes) else os.fdopen(handle, "w", encoding="utf-8")) as out:
            out.write(text)
            out.flush()
            if durable:
                os.fsync(out.fileno())
        os.replace(temporary, path)
    except BaseException as error:  # an interrupt may also come just after the rename, when nothing is left to remove
        with contextlib.suppress(FileNotFoundError):
            os.unlink(temporary)
        if isinstance(error, OSError):
            raise OutputError(path, error) from None
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
    """{kind: certify function} for each kind of certificate this installation can write, in the order
    that batch, audit and the demo use: 'torsion', 'isogeny-class' (once ``certify.isogeny`` is
    installed), 'conductor', and 'rank' (once ``certify.rank`` is installed)."""
    from certify.conductor import certify_conductor
    from certify.torsion import certify_torsion

    kinds = {"torsion": certify_torsion}
    try:
        from certify.isogeny.certificate import certify_isogeny_class
    except ImportError:
        pass
    else:
        kinds["isogeny-class"] = certify_isogeny_class
    kinds["conductor"] = certify_conductor
    try:
        from certify.rank.certificate import certify_rank
    except ImportError:
        return kinds
    return {**kinds, "rank": certify_rank}


class NotCertifiable(CurveInputError):
    """The curve is readable and non-singular, but its certificate would fall outside what the verifier
    accepts (``certify.verifier.limits``), so certify refuses it rather than write a certificate the
    verifier would reject."""


def check_model_size(a) -> None:
    """Refuse at once a curve whose integral model — written into every certificate, and scaling a6 by
    up to the sixth power of the denominators — has a coefficient of more than the verifier's MAX_DIGITS."""
    bound = 10 ** MAX_DIGITS
    model, _ = Curve(a).integral_model()
    if any(abs(c.numerator) >= bound for c in model.a):
        raise NotCertifiable(f"the integral model of this curve has a coefficient of over {MAX_DIGITS} digits, "
                             f"more than the verifier reads (certify.verifier.limits.MAX_DIGITS)")


def certify_checked(kind: str, a) -> dict:
    """The stamped certificate of ``kind`` ('torsion', 'isogeny-class' or 'conductor') for the coefficients ``a``
    (five Fractions, as parse_curve returns them), rechecked by the verifier before it is returned:
    a certificate the verifier would reject, over its limits say, raises NotCertifiable with the
    rejection on one line instead."""
    from certify.verifier import verify
    from certify.verifier.errors import Rejection

    from certify.conductor import certify_conductor

    check_model_size(a)
    try:
        cert = stamp({**certifiers(), "conductor": certify_conductor}[kind](a))
    except ValueError as error:
        if "integer string conversion" not in str(error):
            raise
        raise NotCertifiable(f"a number in the {kind} certificate would have over 4300 digits; the verifier "
                             f"reads at most {MAX_DIGITS}") from None
    try:
        verify(cert)
    except Rejection as rejection:
        raise NotCertifiable(f"the {kind} certificate would not be accepted by the verifier: {rejection}") from None
    return cert


class NotAccepted(Exception):
    """A certificate given to a command that builds on certificates is not accepted by the verifier."""


def accepted_certificates(sources) -> list:
    """[(name, certificate, verdict)] for every certificate in the sources (files, bundles, directories,
    stores), in order; raises NotAccepted, naming the first certificate the verifier does not accept."""
    from certify.verifier.cli import all_tasks, check, entries

    out = []
    for task in all_tasks(sources):
        for name, document, recorded, label in entries(task)[0]:
            verdict = check(name, document, recorded, label=label)
            if not verdict["accepted"]:
                raise NotAccepted(f"{name}: rejected — {verdict['reason']}")
            out.append((name, document, verdict))
    return out
