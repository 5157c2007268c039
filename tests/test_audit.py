"""certify audit: every verdict checked against cypari2 as reference library, certificates for every
disagreement, CSV and JSONL alike, and clear errors for bad claims."""
import csv
import io
import json
import subprocess
import sys
from pathlib import Path

import pytest

from certify.curves import parse_curve
from certify.pari import pari
from certify.verifier.digest import digest

DEMO_CLAIMS = Path(__file__).resolve().parent.parent / "certificates-demo" / "claims-from-another-program.csv"


def audit(*args):
    return subprocess.run([sys.executable, "-m", "certify", "audit", *args], capture_output=True, text=True)


def reference(field: str, coefficients: list) -> str:
    """The true value of a field by cypari2 (elltors, ellisomat, ellminimalmodel), normalised as the report
    writes it."""
    curve = pari.ellinit([str(c) for c in coefficients])
    if field == "torsion":
        return "[" + ",".join(str(n) for n in sorted(int(n) for n in pari.elltors(curve)[1])) + "]"
    members, matrix = pari.ellisomat(curve)
    if field == "class_size":
        return str(len(members))
    if field == "degrees":
        return "[" + ",".join(str(d) for d in sorted(int(d) for d in matrix[0])) + "]"
    models = []
    for member in members:
        a = pari.ellminimalmodel(pari.ellinit(member[0]))[:5]
        models.append("[" + ",".join(str(c) for c in a) + "]")
    return "[" + ",".join(sorted(models)) + "]"


def test_demo_claims_every_verdict_agrees_with_the_reference_library(tmp_path):
    """The invented program's claims: each certified value is cypari2's, each verdict follows, each
    disagreement has a certificate the verifier accepts, and the exit status is 1."""
    run = audit(str(DEMO_CLAIMS), "--certificates", str(tmp_path / "certs"))
    assert run.returncode == 1, run.stderr
    records = list(csv.DictReader(io.StringIO(run.stdout)))
    assert records and {r["verdict"] for r in records} == {"agree", "disagree"}
    for record in records:
        truth = reference(record["field"], [str(c) for c in parse_curve(record["curve"])])
        assert record["certified"] == truth, record
        assert (record["verdict"] == "agree") == (record["claimed"] == truth), record
        if record["verdict"] == "disagree":
            cert = json.loads(Path(record["certificate"]).read_text())
            assert digest(cert) == record["digest"]
            verdict = subprocess.run([sys.executable, "-m", "certify.verifier", "--jsonl", record["certificate"]],
                                     capture_output=True, text=True)
            assert json.loads(verdict.stdout)["accepted"] is True
        else:
            assert record["certificate"] == "" and record["digest"] == ""


def test_jsonl_claims_and_report_match_csv(tmp_path):
    """The same claims as JSONL (lists as JSON lists) give the same records, written as JSONL."""
    rows = list(csv.DictReader(DEMO_CLAIMS.open()))
    claims = tmp_path / "claims.jsonl"
    claims.write_text("".join(json.dumps({k: (json.loads(v) if k in ("torsion", "degrees", "class_curves") else v)
                                          for k, v in row.items() if v}) + "\n" for row in rows))
    as_csv = list(csv.DictReader(io.StringIO(audit(str(DEMO_CLAIMS), "--certificates", str(tmp_path / "a")).stdout)))
    run = audit(str(claims), "-o", str(tmp_path / "report.jsonl"), "--certificates", str(tmp_path / "b"))
    assert run.returncode == 1
    as_jsonl = [json.loads(line) for line in (tmp_path / "report.jsonl").read_text().splitlines()]
    strip = lambda records: [{k: v for k, v in r.items() if k not in ("row", "certificate")} for r in records]
    assert strip(as_jsonl) == strip(as_csv)


def test_class_curves_are_compared_up_to_isomorphism(tmp_path):
    """A class listed in other models (u = 2 scalings of the reduced minimal models) agrees."""
    members = reference("class_curves", [0, 2, 0, -15, 0])
    models = [json.loads(m) for m in members[1:-1].replace("],[", "]|[").split("|")]
    scaled = [[c * 2 ** k for c, k in zip(a, (1, 2, 3, 4, 6))] for a in models]
    claims = tmp_path / "c.csv"
    claims.write_text("curve,class_curves\n\"[0,2,0,-15,0]\",\"" + json.dumps(scaled) + "\"\n")
    run = audit(str(claims), "--certificates", str(tmp_path / "certs"))
    assert run.returncode == 0, run.stdout + run.stderr
    assert list(csv.DictReader(io.StringIO(run.stdout)))[0]["verdict"] == "agree"


@pytest.mark.parametrize("content, message", [
    ("curve,torsoin\n\"[0,2,0,-15,0]\",[2]\n", "unknown columns torsoin"),
    ("label,torsion\nx,[2]\n", "needs a 'curve' column"),
])
def test_unreadable_claims_exit_2_with_one_line(tmp_path, content, message):
    claims = tmp_path / "c.csv"
    claims.write_text(content)
    run = audit(str(claims))
    assert run.returncode == 2 and run.stdout == ""
    assert len(run.stderr.strip().splitlines()) == 1 and message in run.stderr


def test_invalid_rows_are_reported_and_exit_2(tmp_path):
    claims = tmp_path / "c.csv"
    claims.write_text("curve,torsion\nnonsense,[2]\n\"[0,2,0,-15,0]\",\"[2,\"\n\"[0,1,1,-2,7]\",[]\n")
    run = audit(str(claims), "--certificates", str(tmp_path / "certs"))
    assert run.returncode == 2
    verdicts = [(r["row"], r["verdict"]) for r in csv.DictReader(io.StringIO(run.stdout))]
    assert verdicts == [("2", "invalid"), ("3", "invalid"), ("4", "agree")]
