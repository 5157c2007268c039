"""certify batch: both stores, labels, failures, resuming, interrupts, timeouts, verify on stores, Dask."""
import json
import os
import signal
import sqlite3
import subprocess
import sys
import time
from pathlib import Path

import pytest

from certify.pari import pari

TABLE = Path(__file__).resolve().parent / "data" / "conductor_lt_1000.txt"


def cremona_curves(count: int, start: int = 0) -> list:
    """(coefficients, 'conductor.class-position') of curves of Cremona's table (the fixture's header gives
    the format: conductor, class index, a1 … a6)."""
    rows = [line.split() for line in TABLE.read_text().splitlines() if not line.startswith("#")]
    return [([int(c) for c in row[2:7]], f"{row[0]}.{row[1]}-{i}") for i, row in enumerate(rows[start:start + count], start)]


def batch_file(tmp_path, curves, extra=()) -> str:
    lines = ["# a comment", ""] + ["[" + ",".join(map(str, a)) + "]  " + label for a, label in curves] + list(extra)
    path = tmp_path / "curves.txt"
    path.write_text("\n".join(lines) + "\n")
    return str(path)


def certify(*args, **kwargs):
    return subprocess.run([sys.executable, "-m", "certify", *args], capture_output=True, text=True, **kwargs)


def verified(source, *options):
    run = certify("verify", "--jsonl", *options, source)
    return run.returncode, [json.loads(line) for line in run.stdout.splitlines()]


def store_rows(path):
    with sqlite3.connect(path) as connection:
        return connection.execute("SELECT curve, kind, label, document, digest FROM certificates").fetchall()


def kinds() -> list:
    """The default set of certify batch: every kind this installation writes."""
    from certify.certificates import certifiers

    return list(certifiers())


def pari_rank_bounds(a) -> tuple:
    """cypari2's ellrank (reference library): its proven lower and upper bounds for the rank."""
    lower, upper = pari.ellrank(pari.ellinit(a))[:2]
    return int(lower), int(upper)


def check_against_reference(kind: str, a, cert: dict) -> None:
    """The certificate's claim against cypari2 as reference library: the torsion order (elltors), the
    number of curves in the isogeny class (ellisomat), the conductor (ellglobalred), the rank bounds
    containing ellrank's proven ones."""
    if kind == "isogeny-class":
        assert len(cert["claim"]["curves"]) == len(pari.ellisomat(pari.ellinit(a))[0])
    elif kind == "torsion":
        order = 1
        for n in cert["claim"]["invariants"]:
            order *= int(n)
        assert order == int(pari.elltors(pari.ellinit(a))[0])
    elif kind == "conductor":
        assert int(cert["claim"]["conductor"]) == int(pari.ellglobalred(pari.ellinit(a))[0])
    elif kind == "rank":
        lower, upper = pari_rank_bounds(a)
        claimed_upper = cert["claim"]["rank_upper"]
        assert int(cert["claim"]["rank_lower"]) <= upper and (claimed_upper is None or lower <= int(claimed_upper))


def test_directory_store_certifies_verifies_and_resumes(tmp_path):
    """Twelve curves of Cremona's table, every kind of the default set: accepted files whose claims agree
    with cypari2 (check_against_reference); a rerun writes nothing; a deleted file is remade, alone."""
    curves, default = cremona_curves(12), kinds()
    assert default[:3] == ["torsion", "isogeny-class", "conductor"]
    total = 12 * len(default)
    source, out = batch_file(tmp_path, curves), tmp_path / "out"
    run = certify("batch", source, "-o", str(out), "--workers", "2")
    assert run.returncode == 0, run.stderr
    files = sorted(out.glob("*.json"))
    assert len(files) == total and not list(out.glob(".certify-*"))
    code, rows = verified(str(out), "--workers", "2")
    assert code == 0 and len(rows) == total and all(row["accepted"] for row in rows)
    for a, label in curves:
        for kind in default:
            cert = json.loads((out / (",".join(map(str, a)) + f".{kind}.json")).read_text())
            assert cert["metadata"]["label"] == label
            check_against_reference(kind, a, cert)
    again = certify("batch", source, "-o", str(out))
    assert again.returncode == 0 and f"0 certificates written, {total} already" in again.stderr
    files[3].unlink()
    again = certify("batch", source, "-o", str(out), "--workers", "1")
    assert f"1 certificates written, {total - 1} already" in again.stderr and files[3].exists()


@pytest.mark.parametrize("kind", ["conductor", "rank"])
def test_only_one_kind_writes_that_kind_alone(tmp_path, kind):
    """Only conductor, only rank (run_batch, as ``certify batch --only KIND`` calls it): one certificate per
    curve, of that kind alone, each accepted and agreeing with cypari2 (ellglobalred, ellrank); curves with
    and without a rational point of order 2."""
    from certify.batch import run_batch

    curves = cremona_curves(8, start=500)
    store = str(tmp_path / "table.sqlite")
    assert run_batch(batch_file(tmp_path, curves), store, workers=2, only=kind) == 0
    rows = store_rows(store)
    assert {row[1] for row in rows} == {kind} and len(rows) == len(curves)
    for curve, _, _, document, _ in rows:
        check_against_reference(kind, json.loads(curve), json.loads(document))
    code, verdicts = verified(store)
    assert code == 0 and len(verdicts) == len(curves)


def test_only_repeated_writes_exactly_the_kinds_named(tmp_path):
    """``certify batch --only torsion --only isogeny-class``: one certificate of each named kind per curve and
    none of the others, each accepted and agreeing with cypari2 (elltors, ellisomat)."""
    curves = cremona_curves(4, start=700)
    store = str(tmp_path / "two.sqlite")
    run = certify("batch", batch_file(tmp_path, curves), "-o", store, "--only", "torsion", "--only",
                  "isogeny-class", "--workers", "1")
    assert run.returncode == 0, run.stderr
    rows = store_rows(store)
    assert sorted(row[1] for row in rows) == sorted(["torsion", "isogeny-class"] * len(curves))
    for curve, kind, _, document, _ in rows:
        check_against_reference(kind, json.loads(curve), json.loads(document))


def test_sqlite_store_rows_labels_failures_and_retries(tmp_path):
    """A malformed line is a failure with its line number; a time limit too short for anything makes
    every certificate fail and land in the failures table; the rerun without it retries them all."""
    curves = cremona_curves(5, start=40)
    source, store = batch_file(tmp_path, curves, ["[1,x] broken"]), str(tmp_path / "table.sqlite")
    run = certify("batch", source, "-o", store, "--only", "torsion", "--timeout", "0.0001", "--workers", "1")
    assert run.returncode == 1
    assert "line 8" in run.stderr and "not a rational number" in run.stderr and "timed out" in run.stderr
    with sqlite3.connect(store) as connection:
        assert connection.execute("SELECT count(*) FROM failures").fetchone()[0] == 5
    run = certify("batch", source, "-o", store, "--only", "torsion")
    assert run.returncode == 1 and "5 certificates written" in run.stderr  # the broken line still fails
    rows = store_rows(store)
    assert sorted((curve, label) for curve, _, label, _, _ in rows) == \
        sorted(("[" + ",".join(map(str, a)) + "]", label) for a, label in curves)
    assert {kind for _, kind, _, _, _ in rows} == {"torsion"}
    with sqlite3.connect(store) as connection:
        assert connection.execute("SELECT count(*) FROM failures").fetchone()[0] == 0
    code, verdicts = verified(store)
    assert code == 0 and len(verdicts) == 5
    assert all(row["file"].startswith(store + "#[") and row["file"].endswith("/torsion") for row in verdicts)


def test_verify_rejects_a_store_row_whose_recorded_digest_is_wrong(tmp_path):
    store = str(tmp_path / "t.sqlite")
    assert certify("batch", batch_file(tmp_path, cremona_curves(2)), "-o", store, "--only", "torsion").returncode == 0
    with sqlite3.connect(store) as connection:
        connection.execute("UPDATE certificates SET digest = 'sha256:00' WHERE rowid = (SELECT min(rowid) FROM certificates)")
    code, rows = verified(store)
    assert code == 1 and sorted(row["accepted"] for row in rows) == [False, True]
    assert next(row for row in rows if not row["accepted"])["reason"].startswith("recorded digest")


def test_interrupt_leaves_only_complete_certificates_and_the_rerun_finishes(tmp_path):
    """Ctrl-C in the middle of a run: exit 130 without a traceback, no temporary file, every file present
    is accepted."""
    curves = cremona_curves(300, start=1000)
    source, out = batch_file(tmp_path, curves), tmp_path / "out"
    process = subprocess.Popen([sys.executable, "-m", "certify", "batch", source, "-o", str(out), "--workers", "2",
                                "--only", "torsion"], stderr=subprocess.PIPE, text=True, start_new_session=True)
    deadline = time.monotonic() + 60
    while len(list(out.glob("*.json"))) < 5 and time.monotonic() < deadline:
        time.sleep(0.05)
    os.killpg(process.pid, signal.SIGINT)  # as Ctrl-C on a terminal: the whole process group
    _, stderr = process.communicate(timeout=60)
    assert process.returncode == 130, stderr
    assert "interrupted" in stderr and "Traceback" not in stderr and "Process" not in stderr
    assert not list(out.glob(".certify-*"))
    written = len(list(out.glob("*.json")))
    assert 5 <= written < 300
    code, rows = verified(str(out))
    assert code == 0 and len(rows) == written
    rerun = certify("batch", source, "-o", str(out), "--only", "torsion")
    assert rerun.returncode == 0 and f"{300 - written} certificates written, {written} already" in rerun.stderr


def test_progress_bar_on_a_terminal_and_log_lines_otherwise():
    from certify.batch import Progress

    class Terminal:
        def __init__(self):
            self.text = ""

        def isatty(self):
            return True

        def write(self, text):
            self.text += text

        def flush(self):
            pass

    terminal = Terminal()
    progress = Progress(4, 1, terminal)
    progress.advance()
    progress.close()
    assert terminal.text.startswith("\r[" + "#" * 15 + "." * 15 + "] 2/4 curves") and "left" in terminal.text


def test_cluster_run_on_a_local_dask_cluster(tmp_path):
    """--cluster against a LocalCluster started here (the real distributed package): the same store as a
    local run, certificate for certificate."""
    distributed = pytest.importorskip("distributed", reason="install the test extra: pip install '.[test]'")
    curves = cremona_curves(6, start=200)
    source = batch_file(tmp_path, curves)
    with distributed.LocalCluster(n_workers=2, threads_per_worker=1, dashboard_address=None) as cluster:
        run = certify("batch", source, "-o", str(tmp_path / "cluster.sqlite"), "--cluster", cluster.scheduler_address)
    assert run.returncode == 0, run.stderr
    assert certify("batch", source, "-o", str(tmp_path / "local.sqlite"), "--workers", "2").returncode == 0
    digests = lambda name: sorted((c, k, d) for c, k, _, _, d in store_rows(str(tmp_path / name)))
    assert digests("cluster.sqlite") == digests("local.sqlite") and len(digests("local.sqlite")) == 6 * len(kinds())
    code, rows = verified(str(tmp_path / "cluster.sqlite"), "--workers", "2")
    assert code == 0 and len(rows) == 6 * len(kinds())


@pytest.mark.table
def test_whole_table_into_a_store_verifies_and_matches_cremonas_classes(tmp_path):
    """All 5,113 curves of conductor < 1000, every kind of the default set, into SQLite: every certificate
    accepted, each class size is the number of curves Cremona's table lists in that class, and each
    conductor is the one of its row (fixture: conductor and class index)."""
    curves = cremona_curves(10 ** 6)
    store = str(tmp_path / "table.sqlite")
    assert certify("batch", batch_file(tmp_path, curves), "-o", store).returncode == 0
    code, rows = verified(store, "--workers", "2")
    assert code == 0 and len(rows) == len(kinds()) * len(curves)
    sizes = {}
    for _, label in curves:
        conductor_class = label.rsplit("-", 1)[0]
        sizes[conductor_class] = sizes.get(conductor_class, 0) + 1
    for curve, kind, label, document, _ in store_rows(store):
        if kind == "isogeny-class":
            assert len(json.loads(document)["claim"]["curves"]) == sizes[label.rsplit("-", 1)[0]], curve
        if kind == "conductor":
            assert json.loads(document)["claim"]["conductor"] == label.split(".")[0], curve


@pytest.mark.parametrize("line, parts", [
    ("y^2 = x^3 - x\tC2", ("y^2 = x^3 - x", "C2")),                    # after a tab
    ("y^2 = x^3 - x  C2", ("y^2 = x^3 - x", "C2")),                    # after two spaces
    ("y^2  =  x^3 - x   the curve C2", ("y^2  =  x^3 - x", "the curve C2")),  # spaced equation, then the label
    ("[0,1]  C4", ("[0,1]", "C4")),                                    # after the closing ]
    ("[0,1]: C4", ("[0,1]", "C4")),
    ("[0,1], C4", ("[0,1]", "C4")),
    ("[0,1] - C4", ("[0,1]", "C4")),
    ("[0,1] curve #3 of Table 2", ("[0,1]", "curve #3 of Table 2")),   # the whole rest of the line
    ("y^2 = x^3 + 1", ("y^2 = x^3 + 1", "")),
    ("  # a comment", None),
    ("", None),
])
def test_batch_labels_after_a_tab_two_spaces_or_the_closing_bracket(line, parts):
    """Issue 11, item 2: where a label may start, and that it is the whole rest of the line."""
    from certify.batch import split_line

    assert split_line(line) == parts


def test_a_repeated_curve_is_reported_with_both_labels(tmp_path):
    """Two lines with the same curve: certified once, and stderr names both lines and both labels."""
    source = tmp_path / "curves.txt"
    source.write_text("[0,0,0,-1,0]  C2\ny^2 = x^3 - 1  Z6\ny^2 = x^3 - x\tsame as C2\n")
    run = certify("batch", str(source), "-o", str(tmp_path / "out"), "--only", "torsion", "--workers", "1")
    assert run.returncode == 0, run.stderr
    assert "line 3 repeats the curve [0,0,0,-1,0] of line 1" in run.stderr
    assert "'C2'" in run.stderr and "'same as C2'" in run.stderr
    assert len(list((tmp_path / "out").glob("*.json"))) == 2


def test_file_names_cannot_be_mistaken_for_options(tmp_path):
    """A curve whose first coefficient is negative gets a file that certify verify takes as it is."""
    source = tmp_path / "curves.txt"
    source.write_text("[-7/3,-10,-10,0,0]  C4\n")
    out = tmp_path / "out"
    assert certify("batch", str(source), "-o", str(out), "--only", "torsion").returncode == 0
    (name,) = [path.name for path in out.glob("*.json")]
    assert name == "E-7_3,-10,-10,0,0.torsion.json"
    assert certify("verify", "--quiet", name, cwd=out).returncode == 0


def test_factoring_keeps_the_alarm_of_the_batch_timeout():
    """The batch's --timeout is a SIGALRM timer (cysignals' alarm); the certifier's factoring (PARI, under an
    alarm of its own of FACTORING_SECONDS) must leave it running — it used to cancel it, so that a
    certificate could run past --timeout. A shorter outer alarm rings during the work after the factoring;
    a longer one is set again for the time it had left. The factors agree with sympy.factorint (reference
    library)."""
    import sympy
    from cysignals.alarm import AlarmInterrupt, alarm, cancel_alarm

    from certify.curves import FACTORING_SECONDS, _primes_dividing

    n = 2 ** 64 + 1
    try:
        alarm(0.3)
        started = time.monotonic()
        with pytest.raises(AlarmInterrupt):
            assert _primes_dividing(n) == sorted(sympy.factorint(n))
            while time.monotonic() - started < 5:
                pass
        assert time.monotonic() - started < 2
        alarm(FACTORING_SECONDS + 2)
        assert _primes_dividing(n) == sorted(sympy.factorint(n))
        assert FACTORING_SECONDS < signal.getitimer(signal.ITIMER_REAL)[0] <= FACTORING_SECONDS + 2
    finally:
        cancel_alarm()
