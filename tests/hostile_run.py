"""Running both verifier entry points on hostile files, the way a referee's machine would, under the bounds
the hostile-input rules promise: every source answered within SECONDS seconds and MEGABYTES of address
space (set with setrlimit on the child process, generous for slow machines), one verdict line per
certificate in ``--quiet`` mode, valid JSON in ``--jsonl`` mode, no traceback, and nothing in the output
that a terminal would act on instead of showing."""
from __future__ import annotations

import json
import resource
import subprocess
import sys
import time

SECONDS = 10
MEGABYTES = 500

ENTRY_POINTS = {
    "bare verifier": [sys.executable, "-S", "-m", "certify.verifier"],
    "certify verify": [sys.executable, "-m", "certify", "verify"],
}
"""The standard-library verifier on a bare interpreter, and the front end with its JSON-Schema step."""

def terminal_active(text: str):
    """The first character of the text, other than the newline that ends each line, that a terminal may act
    on or show as blank: Unicode's controls, format, surrogate, private-use and unassigned characters (C*),
    separators and spaces other than U+0020 (Z*), combining and enclosing marks (Mn, Me), and the blank
    letters U+115F, U+1160, U+17B4, U+17B5, U+2800, U+3164, U+FFA0; or None."""
    import unicodedata

    blank = {"\u115f", "\u1160", "\u17b4", "\u17b5", "\u2800", "\u3164", "\uffa0"}
    for c in text:
        category = unicodedata.category(c)
        if c != "\n" and (category[0] == "C" or (category[0] == "Z" and c != " ") or category in ("Mn", "Me")
                          or c in blank):
            return c
    return None


def write_files(folder, builders: dict, stem: str) -> dict:
    """{name: path} for files ``stem-i.json`` written in ``folder``, one per name, from ``builders[name]``: a
    function of no arguments returning the file's text, or a JSON value to write; a value (build, check)
    names its build first."""
    paths = {}
    for i, (name, build) in enumerate(builders.items()):
        content = (build[0] if isinstance(build, tuple) else build)()
        paths[name] = str(folder / f"{stem}-{i}.json")
        with open(paths[name], "w", encoding="utf-8", errors="surrogatepass") as handle:
            handle.write(content if isinstance(content, str) else json.dumps(content))
    return paths


def _limit_memory() -> None:
    resource.setrlimit(resource.RLIMIT_AS, (MEGABYTES * 2 ** 20, MEGABYTES * 2 ** 20))


def run(entry: str, *arguments: str, cwd=None) -> subprocess.CompletedProcess:
    """One entry point on the arguments, within SECONDS and MEGABYTES (a timeout fails the test)."""
    import os

    root = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
    environment = dict(os.environ, PYTHONPATH=root)
    started = time.monotonic()
    try:
        result = subprocess.run(ENTRY_POINTS[entry] + list(arguments), capture_output=True, timeout=SECONDS,
                                preexec_fn=_limit_memory, cwd=cwd, env=environment)
    except subprocess.TimeoutExpired:
        raise AssertionError(f"{entry} took more than {SECONDS} s on {arguments}")
    result.seconds = time.monotonic() - started
    return result


def assert_answered(result: subprocess.CompletedProcess, certificates: int = 1, jsonl: bool = False) -> list:
    """Exit status 0, 1 or 2, no traceback, no terminal-active character, and one verdict per certificate
    (``--quiet``: lines starting 'accepted: ' or 'rejected: '; ``--jsonl``: JSON objects with the keys file,
    accepted, reason, digest, and for each bundle one more with members). Returns the verdicts (lines or
    parsed objects), bundle objects left out."""
    stdout = result.stdout.decode("utf-8")
    stderr = result.stderr.decode("utf-8", errors="replace")
    assert result.returncode in (0, 1, 2), (result.returncode, stderr[-2000:])
    assert "Traceback" not in stderr and "Error" not in stderr, stderr[-2000:]
    assert terminal_active(stdout) is None, repr(terminal_active(stdout))
    lines = [line for line in stdout.split("\n") if line]
    if jsonl:
        objects = [json.loads(line) for line in lines]
        verdicts = [v for v in objects if "members" not in v]
        assert all(set(v) == {"file", "accepted", "reason", "digest"} for v in verdicts), verdicts
        assert all(set(v) == {"file", "accepted", "reason", "digest", "members"} for v in objects if "members" in v)
    else:
        verdicts = [line for line in lines if line.startswith(("accepted: ", "rejected: "))]
    assert len(verdicts) == certificates, stdout[-2000:]
    return verdicts
