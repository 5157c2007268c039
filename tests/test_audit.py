"""certify audit: every verdict checked against cypari2 as reference library, certificates for every
disagreement, CSV and JSONL alike, and clear errors for bad claims; issue 11, item 6 (audit for
regression suites): groups compared as groups, empty input refused, progress, --store, native JSONL."""
import csv
import io
import json
import subprocess
import sys
from pathlib import Path

import pytest

from certify.audit import FIELDS, verdict
from certify.curves import parse_curve
from certify.pari import pari
from certify.verifier.digest import digest

DEMO_CLAIMS = Path(__file__).resolve().parent.parent / "certificates-demo" / "claims-from-another-program.csv"


def audit(*args):
    return subprocess.run([sys.executable, "-m", "certify", "audit", *args], capture_output=True, text=True)


def reference(field: str, coefficients: list):
    """The true value of a field by cypari2 (elltors, ellisomat, ellminimalmodel, ellglobalred, ellrank),
    normalised as the report gives it (JSON values); the rank as ellrank's proven bounds (lower, upper)."""
    curve = pari.ellinit([str(c) for c in coefficients])
    if field == "torsion_group":
        return sorted(int(n) for n in pari.elltors(curve)[1])
    if field == "conductor":
        return int(pari.ellglobalred(curve)[0])
    if field == "rank":
        lower, upper = pari.ellrank(curve)[:2]
        return int(lower), int(upper)
    members, matrix = pari.ellisomat(curve)
    if field == "curves_in_class":
        return len(members)
    if field == "cyclic_degrees_from_curve":
        return sorted(int(d) for d in matrix[0])
    return sorted([int(c) for c in pari.ellminimalmodel(pari.ellinit(member[0]))[:5]] for member in members)


def bounds(value) -> tuple:
    """(lower, upper or None) of a rank as the report writes it: 2, '2', '1..3' or '1..'."""
    if isinstance(value, int) or "." not in value:
        return int(value), int(value)
    lower, upper = value.split("..")
    return int(lower), int(upper) if upper else None


def check_rank_record(record: dict) -> None:
    """A rank record against cypari2's ellrank: the certified bounds contain its proven bounds; 'agree'
    only when the certified bounds lie inside the claimed ones (so the true rank does), 'disagree' only
    when they exclude the claimed range (so the claim is false), 'unknown' only when neither holds."""
    lower, upper = bounds(record["certified"])
    true_lower, true_upper = reference("rank", [str(c) for c in parse_curve(record["curve"])])
    assert lower <= true_upper and (upper is None or true_lower <= upper), record
    claimed_lower, claimed_upper = bounds(record["claimed"])
    inside = claimed_lower <= lower and (claimed_upper is None or (upper is not None and upper <= claimed_upper))
    apart = (upper is not None and upper < claimed_lower) or (claimed_upper is not None and claimed_upper < lower)
    assert record["verdict"] == ("agree" if inside else "disagree" if apart else "unknown"), record
    if record["verdict"] == "agree":
        assert claimed_lower <= true_lower and (claimed_upper is None or true_upper <= claimed_upper), record
    if record["verdict"] == "disagree":
        assert true_upper < claimed_lower or (claimed_upper is not None and claimed_upper < true_lower), record
    if record["verdict"] == "unknown":
        assert "neither proves nor excludes" in record["reason"], record


def check_record(record: dict, certified, claimed) -> None:
    """One record of the demo's audit: the certified value is cypari2's and the verdict follows from it
    (check_rank_record for the rank)."""
    if record["field"] == "rank":
        check_rank_record({**record, "certified": certified, "claimed": claimed})
        return
    truth = reference(record["field"], [str(c) for c in parse_curve(record["curve"])])
    assert certified == truth, record
    assert (record["verdict"] == "agree") == (claimed == truth), record


def test_demo_claims_every_verdict_agrees_with_the_reference_library(tmp_path):
    """The invented program's claims: each certified value is cypari2's, each verdict follows, each
    disagreement (and each undecided rank) has a certificate the verifier accepts, and the exit status is
    1 (2 when a rank is left undecided)."""
    run = audit(str(DEMO_CLAIMS), "--certificates", str(tmp_path / "certs"))
    records = list(csv.DictReader(io.StringIO(run.stdout)))
    verdicts = {r["verdict"] for r in records}
    assert records and {"agree", "disagree"} <= verdicts <= {"agree", "disagree", "unknown"}
    assert run.returncode == (2 if "unknown" in verdicts else 1), run.stderr
    assert {r["field"] for r in records} == set(csv.DictReader(DEMO_CLAIMS.open()).fieldnames) - {"curve", "label"}
    for record in records:
        lists = record["field"] not in ("rank", "conductor", "curves_in_class")
        certified = json.loads(record["certified"]) if lists else record["certified"]
        claimed = json.loads(record["claimed"]) if lists else record["claimed"]
        if record["field"] in ("conductor", "curves_in_class"):
            certified, claimed = int(certified), int(claimed)
        check_record(record, certified, claimed)
        if record["verdict"] != "agree":
            cert = json.loads(Path(record["certificate"]).read_text())
            assert digest(cert) == record["digest"]
            verdict = subprocess.run([sys.executable, "-m", "certify.verifier", "--jsonl", record["certificate"]],
                                     capture_output=True, text=True)
            assert json.loads(verdict.stdout)["accepted"] is True
        else:
            assert record["certificate"] == "" and record["digest"] == ""


def test_jsonl_claims_and_report_match_csv_with_native_types(tmp_path):
    """The same claims as JSONL (lists as JSON lists) give the same verdicts, written as JSONL whose values
    keep their types: the row and the class size as numbers, lists as lists, null where nothing is."""
    rows = list(csv.DictReader(DEMO_CLAIMS.open()))
    claims = tmp_path / "claims.jsonl"
    lists = ("cyclic_degrees_from_curve", "class_members")
    claims.write_text("".join(json.dumps({k: (json.loads(v) if k in lists else v) for k, v in row.items() if v}) + "\n"
                              for row in rows))
    as_csv = list(csv.DictReader(io.StringIO(audit(str(DEMO_CLAIMS), "--certificates", str(tmp_path / "a")).stdout)))
    run = audit(str(claims), "-o", str(tmp_path / "report.jsonl"), "--certificates", str(tmp_path / "b"))
    as_jsonl = [json.loads(line) for line in (tmp_path / "report.jsonl").read_text().splitlines()]
    assert run.returncode == (2 if any(r["verdict"] == "unknown" for r in as_jsonl) else 1)
    assert [(r["row"] + 1, r["field"], r["verdict"]) for r in as_jsonl] == \
        [(int(r["row"]), r["field"], r["verdict"]) for r in as_csv]  # the CSV's line 1 is its header
    for record in as_jsonl:
        assert isinstance(record["row"], int) and (record["reason"] is None) == (record["verdict"] != "unknown")
        if record["field"] == "rank":  # a number when the bounds meet, else the text 'lo..hi'
            assert isinstance(record["certified"], int if bounds(record["certified"])[0] ==
                              bounds(record["certified"])[1] else str)
        elif record["field"] in ("conductor", "curves_in_class"):
            assert isinstance(record["certified"], int)
        check_record(record, record["certified"], record["claimed"])  # lists as lists, counts as numbers
        assert (record["certificate"] is None) == (record["verdict"] == "agree")


def test_class_curves_are_compared_up_to_isomorphism(tmp_path):
    """A class listed in other models (u = 2 scalings of the reduced minimal models) agrees."""
    models = reference("class_members", [0, 2, 0, -15, 0])
    scaled = [[c * 2 ** k for c, k in zip(a, (1, 2, 3, 4, 6))] for a in models]
    claims = tmp_path / "c.csv"
    claims.write_text("curve,class_members\n\"[0,2,0,-15,0]\",\"" + json.dumps(scaled) + "\"\n")
    run = audit(str(claims), "--certificates", str(tmp_path / "certs"))
    assert run.returncode == 0, run.stdout + run.stderr
    assert list(csv.DictReader(io.StringIO(run.stdout)))[0]["verdict"] == "agree"


@pytest.mark.parametrize("content, message", [
    ("curve,torsoin\n\"[0,2,0,-15,0]\",[2]\n", "unknown columns torsoin"),
    ("label,torsion_group\nx,[2]\n", "a header naming the columns, 'curve' among them"),
    ("", "no claims to check (the file is empty)"),                                    # empty
    ("curve,label,torsion_group\n", "no claims to check — only a header"),            # header only
    ("\"[0,2,0,-15,0]\",[2]\n\"[0,1]\",[6]\n", "the first line must be a header"),  # headerless
    ("curve,torsion,class_size\n\"[0,1]\",[6],1\n", "unknown columns class_size, torsion"),  # the old names
])
def test_unreadable_or_empty_claims_exit_2_with_one_line(tmp_path, content, message):
    """An empty, header-only or headerless file claims nothing a CI job could rely on: status 2."""
    claims = tmp_path / "c.csv"
    claims.write_text(content)
    run = audit(str(claims))
    assert run.returncode == 2 and run.stdout == ""
    assert len(run.stderr.strip().splitlines()) == 1 and message in run.stderr, run.stderr


def test_an_empty_jsonl_file_is_refused(tmp_path):
    claims = tmp_path / "c.jsonl"
    claims.write_text("\n")
    run = audit(str(claims))
    assert run.returncode == 2 and "no claims to check" in run.stderr


def test_invalid_rows_are_reported_and_exit_2(tmp_path):
    claims = tmp_path / "c.csv"
    claims.write_text("curve,torsion_group\nnonsense,[2]\n\"[0,2,0,-15,0]\",\"[2,\"\n\"[0,1,1,-2,7]\",[]\n")
    run = audit(str(claims), "--certificates", str(tmp_path / "certs"))
    assert run.returncode == 2
    verdicts = [(r["row"], r["verdict"]) for r in csv.DictReader(io.StringIO(run.stdout))]
    assert verdicts == [("2", "invalid"), ("3", "invalid"), ("4", "agree")]


@pytest.mark.parametrize("curve, claims", [
    ("[0,1]", ["[2,3]", "[3,2]", "[1,6]", "[6]", "Z/6Z", "Z/2Z x Z/3Z", "C6", "ℤ/6ℤ"]),   # y² = x³ + 1
    ("[0,2,0,-15,0]", ["[2,2]", "Z/2Z x Z/2Z", "Z/2Z × Z/2Z", "[1,2,2]"]),
    ("[0,1,1,-2,7]", ["[]", "trivial", "0", "[1]", "Z/1Z"]),
    ("[0,0,0,-1,0]", ["[2,2]"]),
])
def test_torsion_is_compared_as_a_group(tmp_path, curve, claims):
    """Every spelling of the true group agrees (truth: cypari2's elltors); Z/4Z, which has as many elements
    as Z/2Z × Z/2Z, and [4] for Z/6Z disagree."""
    truth = reference("torsion_group", [str(c) for c in parse_curve(curve)])
    wrong = ["Z/4Z"] if truth == [2, 2] else ["[4]"]
    path = tmp_path / "c.csv"
    path.write_text("curve,torsion_group\n" + "".join(f'"{curve}","{claim}"\n' for claim in claims + wrong))
    run = audit(str(path), "--certificates", str(tmp_path / "certs"), "--workers", "1")
    assert run.returncode == 1, run.stderr
    records = list(csv.DictReader(io.StringIO(run.stdout)))
    assert [r["verdict"] for r in records] == ["agree"] * len(claims) + ["disagree"]
    assert {r["certified"] for r in records} == {json.dumps(truth, separators=(",", ":"))}


def test_progress_is_reported_as_in_batch(tmp_path):
    run = audit(str(DEMO_CLAIMS), "--certificates", str(tmp_path / "certs"))
    rows = len(list(csv.DictReader(DEMO_CLAIMS.open())))
    assert f"audit: {rows}/{rows} curves" in run.stderr and "curves/s" in run.stderr


@pytest.mark.parametrize("store_name", ["out", "out.sqlite"])
def test_store_reuses_batch_certificates_once_verified_again(tmp_path, store_name):
    """--store: the demo's curves certified by certify batch are reused, not recomputed, with the same
    report; a store row whose certificate was altered is not reused (it is made afresh)."""
    rows = list(csv.DictReader(DEMO_CLAIMS.open()))
    source = tmp_path / "curves.txt"
    source.write_text("".join(row["curve"] + "\t" + row["label"] + "\n" for row in rows))
    store = tmp_path / store_name
    assert subprocess.run([sys.executable, "-m", "certify", "batch", str(source), "-o", str(store)],
                          capture_output=True).returncode == 0
    fresh = audit(str(DEMO_CLAIMS), "--certificates", str(tmp_path / "a"))
    reused = audit(str(DEMO_CLAIMS), "--certificates", str(tmp_path / "b"), "--store", str(store))
    wanted = sum(len({FIELDS[field] for field, value in row.items() if field in FIELDS and value}) for row in rows)
    assert reused.returncode == fresh.returncode and f"{wanted} certificates taken from" in reused.stderr
    assert "0 made" in reused.stderr
    strip = lambda text: [{k: v for k, v in r.items() if k != "certificate"} for r in csv.DictReader(io.StringIO(text))]
    assert strip(reused.stdout) == strip(fresh.stdout)
    if store_name == "out":
        victim = next(store.glob("0,1,1,-2,7.torsion.json"))
        cert = json.loads(victim.read_text())
        cert["claim"]["invariants"] = ["2"]
        victim.write_text(json.dumps(cert))
        again = audit(str(DEMO_CLAIMS), "--certificates", str(tmp_path / "c"), "--store", str(store))
        assert f"{wanted - 1} certificates taken from" in again.stderr and "1 made" in again.stderr
        assert strip(again.stdout) == strip(fresh.stdout)


def test_a_missing_store_exits_2_with_one_line(tmp_path):
    run = audit(str(DEMO_CLAIMS), "--store", str(tmp_path / "none.sqlite"))
    assert run.returncode == 2 and len(run.stderr.strip().splitlines()) == 1 and "cannot use" in run.stderr


@pytest.mark.parametrize("certified, claimed, expected", [
    ((2, 2), "2", "agree"), ((2, 2), "1..3", "agree"), ((2, 2), "2..", "agree"), ((2, 2), "3", "disagree"),
    ((2, 2), "0..1", "disagree"), ((1, 3), "1..3", "agree"), ((1, 3), "0..", "agree"), ((1, 3), "2", "unknown"),
    ((1, 3), "0..1", "unknown"), ((1, 3), "4..", "disagree"), ((1, 3), "0", "disagree"), ((1, None), "1", "unknown"),
    ((1, None), "0", "disagree"), ((1, None), "≥ 1", "agree"), ((1, None), "1–5", "unknown"), ((0, 0), "0", "agree"),
])
def test_rank_verdicts_follow_from_the_bounds(certified, claimed, expected):
    """The claim 'lo <= rank <= hi' is proven when the certified bounds lie inside it, refuted when the two
    ranges are disjoint, and undecided otherwise (interval logic; the end-to-end cases against cypari2 are
    in test_rank_and_conductor_claims_against_the_reference_library)."""
    shown = certified[0] if certified[0] == certified[1] else f"{certified[0]}..{certified[1] or ''}"
    assert verdict("rank", claimed, shown) == expected


@pytest.mark.parametrize("claimed", ["-1", "3..1", "two", "1.5", "[1]", "1..2..3"])
def test_unreadable_rank_claims_are_invalid(tmp_path, claimed):
    claims = tmp_path / "c.csv"
    claims.write_text(f"curve,rank\n\"[0,0,0,-1,0]\",{claimed}\n")
    run = audit(str(claims), "--certificates", str(tmp_path / "certs"))
    assert run.returncode == 2, run.stderr
    (record,) = csv.DictReader(io.StringIO(run.stdout))
    assert record["verdict"] == "invalid" and record["reason"].startswith("cannot read the claim"), record


def test_rank_and_conductor_claims_against_the_reference_library(tmp_path):
    """Right and wrong conductors (truth: cypari2's ellglobalred) and ranks claimed as numbers and ranges on
    curves of rank 0, 1 and 2 (the congruent-number curves y² = x³ − n²x for n = 1, 5, 34; a curve without a
    rational point of order 2, y² + y = x³ − x): every verdict checked against cypari2's ellrank
    (check_rank_record)."""
    rows = [("[0,0,0,-1,0]", "32", ["0", "1", "0..2"]), ("[0,0,0,-25,0]", "800", ["1", "0", "2..3", "1.."]),
            ("[0,0,0,-1156,0]", "18496", ["2", "1..2", "3"]), ("[0,0,1,-1,0]", "36", ["1", "0", "1..", "0..5"])]
    claims = tmp_path / "c.csv"
    claims.write_text("curve,conductor,rank\n" + "".join(f'"{curve}",{conductor},{rank}\n'
                                                         for curve, conductor, ranks in rows for rank in ranks))
    run = audit(str(claims), "--certificates", str(tmp_path / "certs"))
    records = list(csv.DictReader(io.StringIO(run.stdout)))
    assert len(records) == 2 * sum(len(ranks) for _, _, ranks in rows)
    for record in records:
        if record["field"] == "conductor":
            truth = reference("conductor", [str(c) for c in parse_curve(record["curve"])])
            assert int(record["certified"]) == truth
            assert record["verdict"] == ("agree" if int(record["claimed"]) == truth else "disagree"), record
        else:
            check_rank_record(record)
    verdicts = {record["verdict"] for record in records}
    assert "disagree" in verdicts and run.returncode == (2 if "unknown" in verdicts else 1)
    assert {r["verdict"] for r in records if r["curve"] == "[0,0,1,-1,0]" and r["field"] == "conductor"} == {"disagree"}
