"""``python -m certify.verifier SOURCE…`` and ``certify verify SOURCE…``: one verdict per certificate.

A SOURCE is a certificate file, a bundle, a directory of certificate files, or a ``.sqlite`` store
(see ``certify.verifier.sources``). By default each certificate gets a readable report; ``--quiet``
gives one line each, ``--jsonl`` one JSON object each with exactly the keys file, accepted, reason.

Exit status: 0 if every certificate is accepted, 1 if any is rejected, 2 if a source cannot be read
as certificates (unreadable, too large, not JSON, not a store, a bundle whose manifest does not match)
or the output is closed before every verdict is written.
"""
import argparse
import functools
import json
import os
import sys
import time
from itertools import islice

from certify.verifier import verify
from certify.verifier.digest import NotCanonical, claim_digest, digest
from certify.verifier.errors import Rejection, show
from certify.verifier.limits import MAX_NAME_BYTES
from certify.verifier.report import claim_lines, describe_claim, one_line, printable, report
from certify.verifier.sources import Unreadable, check_recorded, documents, tasks
from certify.verifier.theorems import THEOREMS

JSONL_KEYS = ("file", "accepted", "reason")
WINDOW = 1000
"""Tasks handed to the worker processes at a time, so that a large store is never all in memory."""


def check(name: str, document, recorded: dict, precheck=None) -> dict:
    """The verdict on one certificate: {"file", "accepted", "reason", "readable"} and, for a readable
    one, "seconds", "digest", "curve", "relies_on" (keys) and, when accepted, "checks" (counts) and
    "claim digest", "claim lines" (the claim in full). ``precheck(document)``, if given, returns
    structural violations (``certify verify`` passes the JSON-Schema check); any of them rejects."""
    name = printable(name)
    if isinstance(document, Unreadable):
        return {"file": name, "accepted": False, "reason": printable(f"unreadable: {document}"), "readable": False}
    started = time.perf_counter()
    result = {"file": name, "accepted": False, "readable": True, "checks": None}
    try:
        violations = precheck(document) if precheck else []
        if violations:
            raise Rejection("schema", "; ".join(violations))
        result["checks"] = verify(document)["checks"]
        result["reason"] = describe_claim(document)
        result["digest"] = check_recorded(document, recorded, result["reason"])
        result["claim digest"] = claim_digest(document)
        result["claim lines"] = claim_lines(document)
        result["accepted"] = True
    except Rejection as rejection:
        result["reason"] = str(rejection)
    except NotCanonical as error:
        result["reason"] = f"digest: {error}"
    except RecursionError:
        result["reason"] = "structure: the document is nested too deeply"
    result["seconds"] = time.perf_counter() - started
    result["reason"] = printable(result["reason"])
    if isinstance(document, dict):
        result["curve"] = document.get("curve") if result["accepted"] else None
        relies_on = document.get("relies_on")
        result["relies_on"] = [theorem_key(entry.get("key")) for entry in relies_on if isinstance(entry, dict)] \
            if isinstance(relies_on, list) else []
        if "digest" not in result:
            try:
                result["digest"] = digest(document)
            except (NotCanonical, RecursionError):
                pass
    return result


def theorem_key(key) -> str:
    """A ``relies_on`` key for the report: a key of ``THEOREMS`` as it is, anything else quoted, escaped
    and cut, so that the report can name it without letting it speak."""
    if isinstance(key, str) and key in THEOREMS:
        return key
    return printable(show(key))[:MAX_NAME_BYTES]


def entries(task) -> list:
    """[(name, certificate or Unreadable, recorded fields)] for one unit of work."""
    if task[0] == "unreadable":
        return [(task[1], Unreadable(task[2]), {})]
    return documents(task)


def run_task(task, precheck=None) -> list:
    """The verdicts for one unit of work (a bundle gives one per member)."""
    return [check(*entry, precheck=precheck) for entry in entries(task)]


def all_tasks(paths):
    """The units of work for every source; a source that cannot be opened becomes one 'unreadable' task."""
    for path in paths:
        try:
            yield from tasks(path)
        except Unreadable as error:
            yield ("unreadable", path, str(error))


def verdicts(paths, workers: int, precheck=None):
    """Every verdict, in source order; with workers > 1 the checks run in that many processes."""
    if workers <= 1:
        for task in all_tasks(paths):
            yield from run_task(task, precheck)
        return
    import multiprocessing  # only here: importing it registers a module alias, __mp_main__

    tasks = all_tasks(paths)
    with multiprocessing.Pool(workers) as pool:
        while window := list(islice(tasks, WINDOW)):
            for results in pool.imap(functools.partial(run_task, precheck=precheck), window, chunksize=8):
                yield from results


def main(argv=None, precheck=None) -> int:
    parser = argparse.ArgumentParser(prog="certify verify", description=(
        "Recheck certificates from scratch. SOURCE is a certificate, a bundle, a directory of "
        "certificates or a .sqlite store."))
    parser.add_argument("sources", nargs="+", metavar="SOURCE")
    style = parser.add_mutually_exclusive_group()
    style.add_argument("--jsonl", action="store_true", help="one JSON object per certificate: file, accepted, reason")
    style.add_argument("--quiet", action="store_true", help="one line per certificate")
    parser.add_argument("--workers", type=int, default=1, metavar="N", help="check in N processes (default 1)")
    args = parser.parse_args(argv)
    if args.workers < 1:
        parser.error("--workers must be at least 1")
    tally = {"accepted": 0, "rejected": 0, "unreadable": 0}
    sys.stdout.reconfigure(errors="backslashreplace")  # names from files may hold unpaired surrogates
    try:
        for result in verdicts(args.sources, args.workers, precheck):
            tally["accepted" if result["accepted"] else "rejected" if result["readable"] else "unreadable"] += 1
            if args.jsonl:
                print(json.dumps({key: result[key] for key in JSONL_KEYS}, ensure_ascii=False), flush=True)
            else:
                print(one_line(result) if args.quiet else report(result) + "\n", flush=True)
    except BrokenPipeError:  # the reader (| head) has gone: stop quietly, without a verdict on the rest
        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        return 2
    if not args.jsonl and sum(tally.values()) > 1:
        print(f"{sum(tally.values())} certificates: " + ", ".join(f"{n} {key}" for key, n in tally.items()))
    if tally["unreadable"]:
        return 2
    return 1 if tally["rejected"] else 0
