"""``certify batch FILE -o OUT [--workers N] [--only KIND ...] [--cluster ADDRESS] [--timeout S]``.

FILE has one curve per line in the CURVE syntax; blank lines and lines beginning with ``#`` are
skipped. An optional label follows the curve — after a tab, after two or more spaces, or after the
closing ``]`` of a coefficient list (with optional punctuation such as ``:`` or ``,``) — and is the
whole rest of the line. Each curve gets a certificate of every kind this installation writes (torsion,
isogeny class, conductor, rank: ``certify.certificates.certifiers``), or those ``--only`` names (the option
may be repeated: ``--only torsion --only isogeny-class``), kept in OUT
(see ``certify.store``) under the curve's coefficients as given, with the label and the line number
in the certificate's ``metadata``. A curve given on two lines is certified once and reported with
both labels. A rerun skips what OUT holds and retries the rest, failures included.
The certificates are computed in N local processes (default: all cores) or, with ``--cluster``, by
the workers of a Dask distributed scheduler; only the main process writes to OUT.
"""
from __future__ import annotations

import json
import os
import re
import signal
import sqlite3
import subprocess
import sys
import threading
import time
from collections import Counter
from concurrent.futures import FIRST_COMPLETED, ThreadPoolExecutor, wait
from dataclasses import dataclass
from itertools import islice

from certify.certificates import certifiers, stamp, to_json
from certify.curves import CurveInputError, format_rational, parse_curve
from certify.store import open_store
from certify.verifier.digest import digest

class BatchInputError(Exception):
    """The batch file cannot be read at all."""


@dataclass(frozen=True)
class Task:
    """One certificate to make: the curve '[a1,a2,a3,a4,a6]', its kind, its label, the time limit, and the
    line of the batch file it comes from (None outside a batch)."""
    key: str
    kind: str
    label: str
    timeout: float | None
    line: int | None = None


LABEL_LEAD = re.compile(r"[\s:;,|]*(?:[-\u2013\u2014]\s+)?")
"""What may separate a label from the closing ']': spaces, ':', ';', ',', '|', or a dash and a space."""


def _is_curve(text: str) -> bool:
    try:
        parse_curve(text)
    except CurveInputError:
        return False
    return True


def split_line(line: str) -> tuple[str, str] | None:
    """(CURVE text, label) of a batch line, or None for a blank or comment line. The label is the whole
    rest of the line after a tab, after the closing ']' of a coefficient list, or after the first run of
    two or more spaces that ends a readable curve."""
    line = line.strip()
    if not line or line.startswith("#"):
        return None
    if "\t" in line:
        curve, _, label = line.partition("\t")
        return curve.strip(), label.strip()
    if line.startswith("["):
        end = line.find("]") + 1 or len(line)
        return line[:end], line[end:][LABEL_LEAD.match(line[end:]).end():].strip()
    for gap in re.finditer(r" {2,}", line):
        if _is_curve(line[:gap.start()]):
            return line[:gap.start()], line[gap.end():]
    return line, ""


def curve_key(a) -> str:
    """The curve as stored: '[a1,a2,a3,a4,a6]' with the coefficients as given, in lowest terms."""
    return "[" + ",".join(format_rational(c) for c in a) + "]"


def read_batch(path: str):
    """[(line number, curve key or None, label, error or None)] for the curve lines of the file."""
    try:
        with open(path, encoding="utf-8") as handle:
            lines = handle.read().splitlines()
    except (OSError, UnicodeDecodeError) as error:
        raise BatchInputError(f"cannot read {path}: {getattr(error, 'strerror', None) or error}")
    out = []
    for number, line in enumerate(lines, 1):
        parts = split_line(line)
        if parts is None:
            continue
        try:
            out.append((number, curve_key(parse_curve(parts[0])), parts[1], None))
        except CurveInputError as error:
            out.append((number, None, parts[1], f"line {number}: {parts[0][:60]!r}: {error}"))
    return out


def certify_one(task: Task) -> dict:
    """{"task", "document" (JSON text), "digest"} for one certificate, or {"task", "error"}: any failure of
    the certifier, or the time limit, becomes a one-line reason instead of stopping the batch. The limit
    is a SIGALRM, which reaches PARI only in a process's main thread: in the batch, a ChildCertifier's."""
    from cysignals.alarm import alarm, cancel_alarm
    from cysignals.signals import AlarmInterrupt

    timed = task.timeout is not None and threading.current_thread() is threading.main_thread()
    try:
        if timed:
            alarm(task.timeout)
        cert = stamp(certifiers()[task.kind](parse_curve(task.key)))
        if timed:
            cancel_alarm()
    except AlarmInterrupt:
        return {"task": task, "error": f"timed out after {task.timeout:g} s"}
    except Exception as error:  # a certifier bug on one curve must not stop a table of thousands
        if timed:
            cancel_alarm()
        return {"task": task, "error": f"{type(error).__name__}: {str(error).splitlines()[0][:200] if str(error) else ''}"}
    if task.label:
        cert["metadata"]["label"] = task.label
    if task.line is not None:
        cert["metadata"]["input_line"] = str(task.line)
    return {"task": task, "document": to_json(cert), "digest": digest(cert)}


def run_local(tasks, workers: int):
    """The results of certify_one over the tasks, in completion order, from ``workers`` child processes
    (see ChildCertifier), at most four tasks each in flight. The main process computes nothing, so
    that it can note a Ctrl-C at once and stop between two writes."""
    tasks = iter(tasks)
    with ThreadPoolExecutor(workers) as pool:
        pending = {pool.submit(ChildCertifier.run, task) for task in islice(tasks, 4 * workers)}
        try:
            while pending:
                done, pending = wait(pending, return_when=FIRST_COMPLETED)
                for future in done:
                    yield future.result()
                    pending |= {pool.submit(ChildCertifier.run, task) for task in islice(tasks, 1)}
        finally:
            for future in pending:
                future.cancel()
            ChildCertifier.stop_all()


class ChildCertifier:
    """certify_one in a private child process (``python -m certify.batch``), talking JSON lines over
    pipes; each thread that certifies has a child of its own. PARI may only be used from the thread
    that started it, and Dask workers run tasks in threads: the child's main thread runs them (so
    ``--timeout`` applies there too). Children run in a session of their own, so a Ctrl-C at the
    terminal reaches only the main process, which stops them (``stop_all``) when it is done."""

    local = threading.local()
    children: list = []

    @classmethod
    def run(cls, task: Task) -> dict:
        """certify_one(task), computed in this thread's child (started on first use)."""
        child = getattr(cls.local, "child", None)
        if child is None or child.poll() is not None:
            child = cls.local.child = subprocess.Popen([sys.executable, "-m", "certify.batch"], text=True,
                                                       stdin=subprocess.PIPE, stdout=subprocess.PIPE,
                                                       start_new_session=True)
            cls.children.append(child)
        try:
            child.stdin.write(json.dumps(task.__dict__) + "\n")
            child.stdin.flush()
            answer = child.stdout.readline()
        except (BrokenPipeError, ValueError):  # stopped by stop_all meanwhile
            answer = ""
        if not answer:
            return {"task": task, "error": f"the certifying process died (exit status {child.wait()})"}
        return {"task": task, **json.loads(answer)}

    @classmethod
    def run_all(cls, tasks: list) -> list:
        """[certify_one(task) for each task], computed in this thread's child."""
        return [cls.run(task) for task in tasks]

    @classmethod
    def stop_all(cls) -> None:
        """End every child this process started and wait for each."""
        while cls.children:
            child = cls.children.pop()
            child.kill()
            child.wait()


def serve() -> None:
    """The child's loop: one task as JSON per line in, one result as JSON per line out."""
    for line in sys.stdin:
        result = certify_one(Task(**json.loads(line)))
        del result["task"]
        print(json.dumps(result), flush=True)


CLUSTER_CHUNK = 16
"""Certificates per Dask task: one scheduler round trip per chunk, not per certificate."""


def run_cluster(tasks, address: str):
    """The results of certify_one over the tasks, from the workers of the Dask scheduler at ``address``;
    the tasks go in chunks of CLUSTER_CHUNK, at most four chunks per worker thread in flight, so a
    table of millions is never all submitted at once."""
    from distributed import Client, as_completed

    tasks = iter(tasks)
    chunks = iter(lambda: list(islice(tasks, CLUSTER_CHUNK)), [])
    with Client(address) as client:
        window = 4 * max(1, sum(client.nthreads().values()))
        pending = {client.submit(ChildCertifier.run_all, chunk, pure=False): chunk for chunk in islice(chunks, window)}
        running = as_completed(list(pending))
        for future in running:
            chunk = pending.pop(future)
            try:
                yield from future.result()
            except Exception as error:  # a worker lost while running the chunk
                yield from ({"task": task, "error": f"cluster: {type(error).__name__}: {error}"} for task in chunk)
            for chunk in islice(chunks, 1):
                future = client.submit(ChildCertifier.run_all, chunk, pure=False)
                pending[future] = chunk
                running.add(future)


def certify_all(tasks, workers: int | None, cluster: str | None):
    """The results of certify_one over the tasks: on the Dask scheduler ``cluster`` if given, else in
    ``workers`` local processes (default: one per core)."""
    return run_cluster(tasks, cluster) if cluster else run_local(tasks, workers or os.cpu_count() or 1)


class Progress:
    """Curves done, rate and time left: a bar redrawn on a terminal, a log line every 10 s otherwise,
    each beginning with the command's ``name``."""

    def __init__(self, total: int, done: int, stream=sys.stderr, name: str = "batch"):
        self.total, self.done, self.stream, self.name = total, done, stream, name
        self.start, self.first, self.logged = time.monotonic(), done, 0.0
        self.terminal = stream.isatty()

    def line(self) -> str:
        elapsed = time.monotonic() - self.start
        rate = (self.done - self.first) / elapsed if elapsed > 0 else 0.0
        left = f"{(self.total - self.done) / rate:.0f} s left" if rate > 0 else "time left unknown"
        return f"{self.done}/{self.total} curves, {rate:.1f} curves/s, {left}"

    def advance(self) -> None:
        self.done += 1
        now = time.monotonic()
        if self.terminal:
            filled = int(30 * self.done / max(self.total, 1))
            self.stream.write(f"\r[{'#' * filled}{'.' * (30 - filled)}] {self.line()}   ")
            self.stream.flush()
        elif now - self.logged >= 10 or self.done == self.total:
            self.logged = now
            print(f"{self.name}: {self.line()}", file=self.stream, flush=True)

    def close(self) -> None:
        if self.terminal:
            self.stream.write("\n")


def write_results(results, store, failures: list, open_kinds: Counter, progress, interrupted: list) -> int:
    """Store each result as it comes (a certificate, or a failure with its reason) and return how many
    certificates were written; stops after the result in hand when ``interrupted`` is set."""
    written = 0
    try:
        for result in results:
            task = result["task"]
            if "error" in result:
                store.fail(task.key, task.kind, task.label, result["error"])
                failures.append(f"{task.key}{' (' + task.label + ')' if task.label else ''} {task.kind}: {result['error']}")
            else:
                store.put(task.key, task.kind, task.label, result["document"], result["digest"])
                written += 1
            open_kinds[task.key] -= 1
            if open_kinds[task.key] == 0:
                progress.advance()
            if interrupted:
                break
    finally:
        results.close()
        progress.close()
        store.close()
    return written


def run_batch(path: str, out: str, workers: int | None = None, only: str | list | None = None,
              cluster: str | None = None, timeout: float | None = None) -> int:
    """Certify the table into OUT; returns the exit status (0 all done, 1 some failed, 2 the store could not
    be written, a full disk say, 130 interrupted). ``only``: a kind or a list of kinds (default: all)."""
    kinds = ([only] if isinstance(only, str) else list(dict.fromkeys(only))) if only else list(certifiers())
    lines = read_batch(path)
    store = open_store(out)
    tasks, failures, labels, first_line = [], [], {}, {}
    for number, key, label, error in lines:
        if error:
            failures.append(error)
        elif key in labels:
            print(f"batch: line {number} repeats the curve {key} of line {first_line[key]} (labels "
                  f"{labels[key]!r} and {label!r}); it is certified once, labelled {labels[key]!r}", file=sys.stderr)
        else:
            labels[key], first_line[key] = label, number
            tasks += [Task(key, kind, label, timeout, number) for kind in kinds if not store.has(key, kind)]
    open_kinds = Counter(task.key for task in tasks)
    progress = Progress(len(labels), len(labels) - len(open_kinds))
    interrupted = []
    results = certify_all(tasks, workers, cluster)
    # Ctrl-C is noted, not raised: the run stops between two writes, so none is ever cut short.
    previous = signal.signal(signal.SIGINT, lambda *_: interrupted.append(True))
    try:
        written = write_results(results, store, failures, open_kinds, progress, interrupted)
    except (OSError, sqlite3.Error) as error:  # a full disk: what is written is complete, the rest is not
        print(f"certify: cannot write to {out}: {error}; the certificates already there are complete, "
              "rerun to continue", file=sys.stderr)
        return 2
    finally:
        signal.signal(signal.SIGINT, previous)
    if interrupted:
        print(f"batch: interrupted; {written} certificates written to {out} are complete, rerun to continue",
              file=sys.stderr)
        return 130
    skipped = len(labels) * len(kinds) - len(tasks)
    print(f"batch: {len(labels)} curves, {written} certificates written, {skipped} already in {out}, "
          f"{len(failures)} failures", file=sys.stderr)
    for failure in failures:
        print(f"  failed: {failure}", file=sys.stderr)
    return 1 if failures else 0


if __name__ == "__main__":
    serve()
