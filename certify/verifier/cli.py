"""``python -m certify.verifier SOURCE…`` and ``certify verify SOURCE…``: one verdict per certificate.

A SOURCE is a certificate file, a bundle, a referee's kit (``.pyz``), a directory of certificate files,
a ``.sqlite`` store or ``-`` for standard input (see ``certify.verifier.sources``). By default each
certificate gets a readable report — for a bundle a summary table first — then the theorems assumed,
each once, and a closing line; ``--quiet`` gives one line each, ``--jsonl`` one JSON object each with
exactly the keys file, accepted, reason, digest (and, for a bundle, one more object with the key members
added). ``--expect DIGEST`` (repeatable) names a digest that must be among those of the sources checked:
a bundle's canonical digest or the SHA-256 of its file, a certificate's digest.

Exit status: 0 if every certificate is accepted, 1 if any is rejected or an expected digest is not
found, 2 if a source cannot be read as certificates (unreadable, too large, not JSON, not a store, a
bundle whose manifest does not match) or the output is closed before every verdict is written.
"""
import argparse
import json
import os
import re
import sys
import time
from itertools import islice

from certify.verifier import VERSION, verify_shaped
from certify.verifier.digest import NotCanonical, claim_digest, digest
from certify.verifier.errors import Rejection, show
from certify.verifier.kit import package_files, source_digest
from certify.verifier.limits import MAX_NAME_BYTES
from certify.verifier.report import (assumptions, bundle_summary, claim_lines, closing_line, describe_claim, one_line,
                                     printable, printable_name, report)
from certify.verifier.sources import Unreadable, check_recorded, documents, tasks
from certify.verifier.theorems import THEOREMS

JSONL_KEYS = ("file", "accepted", "reason", "digest")
WINDOW = 1000
"""Tasks handed to the worker processes at a time, so that a large store is never all in memory."""

DIGEST = re.compile(r"sha256:[0-9a-f]{64}")


def check(name: str, document, recorded: dict, label=None) -> dict:
    """The verdict on one certificate: {"file", "label", "accepted", "reason", "readable"} and, for a readable
    one, "seconds", "digest", "curve", "relies_on" (keys) and, when accepted, "checks" (what was checked)
    and "claim digest", "claim lines" (the claim in full). Names are made ``printable_name``, reasons
    ``printable``."""
    name, label = printable_name(name), printable(label) if label else None
    if isinstance(document, Unreadable):
        return {"file": name, "label": label, "accepted": False, "reason": printable(f"unreadable: {document}"),
                "readable": False, "digest": None}
    started = time.perf_counter()
    result = {"file": name, "label": label, "accepted": False, "readable": True, "checks": None, "digest": None}
    try:
        result["checks"] = verify_shaped(document)["checks"]   # read by sources.parse, shape checked
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
        if result["digest"] is None:
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


def entries(task) -> tuple:
    """(entries, bundle) for one unit of work (see ``sources.documents``)."""
    if task[0] == "unreadable":
        return [(task[1], Unreadable(task[2]), {}, None)], None
    return documents(task)


def run_task(task) -> tuple:
    """(verdicts, bundle) for one unit of work: one verdict per certificate, a bundle's facts or None."""
    found, bundle = entries(task)
    return [check(name, document, recorded, label=label)
            for name, document, recorded, label in found], bundle


def all_tasks(paths):
    """The units of work for every source; a source that cannot be opened becomes one 'unreadable' task."""
    for path in paths:
        try:
            yield from tasks(path)
        except Unreadable as error:
            yield ("unreadable", path, str(error))


def task_results(paths, workers: int):
    """(verdicts, bundle) for every unit of work, in source order; with workers > 1 the checks run in that
    many processes."""
    if workers <= 1:
        for task in all_tasks(paths):
            yield run_task(task)
        return
    import multiprocessing  # only here: importing it registers a module alias, __mp_main__

    pending = all_tasks(paths)
    with multiprocessing.Pool(workers) as pool:
        while True:
            window = list(islice(pending, WINDOW))
            if not window:
                break
            yield from pool.imap(run_task, window, chunksize=8)


def verdicts(paths, workers: int = 1):
    """Every certificate's verdict, in source order (bundles flattened to their members)."""
    for results, _ in task_results(paths, workers):
        yield from results


def bundle_verdict(bundle: dict, results: list) -> dict:
    """The JSONL object of a bundle: accepted when every member is."""
    accepted = sum(result["accepted"] for result in results)
    return {"file": printable_name(bundle["file"]), "accepted": accepted == len(results),
            "reason": f"bundle of {plural(len(results), 'certificate')}: {accepted} accepted",
            "digest": bundle["digest"], "members": len(results)}


def plural(n: int, noun: str) -> str:
    return f"{n} {noun}" + ("" if n == 1 else "s")


def main(argv=None, program="certify verify") -> int:
    parser = argparse.ArgumentParser(prog=program, description=(
        "Recheck certificates from scratch. SOURCE is a certificate, a bundle, a kit (.pyz), a directory of "
        "certificates, a .sqlite store, or - for standard input."))
    parser.add_argument("sources", nargs="+", metavar="SOURCE")
    style = parser.add_mutually_exclusive_group()
    style.add_argument("--jsonl", action="store_true",
                       help="one JSON object per certificate (and per bundle): file, accepted, reason, digest")
    style.add_argument("--quiet", action="store_true", help="one line per certificate")
    parser.add_argument("--expect", action="append", default=[], metavar="DIGEST",
                        help="a digest (sha256:…) that must be that of a bundle, bundle file or certificate checked")
    parser.add_argument("--workers", type=int, default=1, metavar="N", help="check in N processes (default 1)")
    parser.add_argument("--version", action="version", version=f"certify verifier {VERSION}")
    args = parser.parse_args(argv)
    if args.workers < 1:
        parser.error("--workers must be at least 1")
    wrong = [d for d in args.expect if not DIGEST.fullmatch(d)]
    if wrong:
        parser.error(f"--expect takes a digest sha256: followed by 64 lowercase hexadecimal digits, not {wrong[0]!r}")
    started = time.perf_counter()
    tally, bundles, seen, keys = {"accepted": 0, "rejected": 0, "unreadable": 0}, [], set(), []
    sys.stdout.reconfigure(errors="backslashreplace")  # names from files may hold unpaired surrogates
    try:
        for results, bundle in task_results(args.sources, args.workers):
            for result in results:
                tally["accepted" if result["accepted"] else "rejected" if result["readable"] else "unreadable"] += 1
                seen.add(result["digest"])
                keys += [key for key in result.get("relies_on", []) if key not in keys]
            if bundle:
                bundles.append(bundle)
                seen.update((bundle["digest"], bundle["file digest"]))
            print_results(results, bundle, args)
        missing = [d for d in args.expect if d not in seen]
        if not args.jsonl:
            if not args.quiet and keys:
                print("theorems assumed (each once, in the verifier's own wording):")
                print("\n".join("  " + line for line in assumptions(keys)) + "\n")
            print(closing_line(tally, bundles, VERSION, source_digest(package_files()), time.perf_counter() - started),
                  flush=True)
    except BrokenPipeError:  # the reader (| head) has gone: stop quietly, without a verdict on the rest
        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        return 2
    for expected in missing:
        print(f"expect: {expected} is not the digest of any bundle, bundle file or certificate checked",
              file=sys.stderr)
    if tally["unreadable"]:
        return 2
    return 1 if tally["rejected"] or missing else 0


def print_results(results: list, bundle, args) -> None:
    """The verdicts of one unit of work in the chosen style."""
    if args.jsonl:
        for result in results:
            print(json.dumps({key: result[key] for key in JSONL_KEYS}, ensure_ascii=False), flush=True)
        if bundle:
            print(json.dumps(bundle_verdict(bundle, results), ensure_ascii=False), flush=True)
    elif args.quiet:
        for result in results:
            print(one_line(result), flush=True)
        if bundle:
            verdict = bundle_verdict(bundle, results)
            print(f"bundle: {verdict['file']} — {verdict['reason']}, digest {bundle['digest']}", flush=True)
    else:
        if bundle:
            print("\n".join(bundle_summary(bundle, results)) + "\n", flush=True)
        for result in results:
            print(report(result) + "\n", flush=True)
