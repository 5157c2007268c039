"""The readable verification report, --quiet and --jsonl, from certify verify and python -m certify.verifier."""
import json
import re
import subprocess
import sys

from certify.certificates import to_json
from certify.curves import Curve, parse_curve
from certify.torsion import certify_torsion
from certify.verifier.digest import digest
from certify.verifier.theorems import THEOREMS


def run(*args):
    return subprocess.run([sys.executable, *args], capture_output=True, text=True)


def write(tmp_path, name, cert):
    path = tmp_path / name
    path.write_text(to_json(cert))
    return str(path)


def test_report_states_curve_claim_checks_theorems_digest_and_time(tmp_path):
    cert = certify_torsion(parse_curve("[1,0,1,-19,26]"))
    for entry in cert["relies_on"]:
        entry["statement"] = "WORDING OF THE CERTIFICATE"
    path = write(tmp_path, "c.json", cert)
    report = run("-m", "certify", "verify", path)
    assert report.returncode == 0
    text = report.stdout
    assert f"accepted: {path}" in text
    assert "E: " + Curve(parse_curve("[1,0,1,-19,26]")).equation() in text
    assert "E(Q)_tors ≅ " + " × ".join(f"Z/{n}Z" for n in cert["claim"]["invariants"]) in text
    assert "recounted at" in text and digest(cert) in text and re.search(r"time\s+\d+\.\d{3} s", text)
    assert "WORDING OF THE CERTIFICATE" not in text
    flat = " ".join(text.split())
    for entry in cert["relies_on"]:
        statement, reference = THEOREMS[entry["key"]]
        assert " ".join(statement.split()) in flat and " ".join(reference.split()) in flat


def test_rejected_report_names_the_failed_check(tmp_path):
    cert = certify_torsion(parse_curve("[1,0,1,-19,26]"))
    cert["evidence"]["primes"][0]["count"] = str(int(cert["evidence"]["primes"][0]["count"]) + 1)
    report = run("-m", "certify", "verify", write(tmp_path, "bad.json", cert))
    assert report.returncode == 1
    assert "rejected: " in report.stdout and "failed" in report.stdout and "point count" in report.stdout


def test_quiet_one_line_each_jsonl_exact_keys_and_standalone_same_report(tmp_path):
    paths = [write(tmp_path, f"c{i}.json", certify_torsion(parse_curve(curve)))
             for i, curve in enumerate(["[0,2,0,-15,0]", "[0,1,1,-2,7]"])]
    quiet = run("-m", "certify", "verify", "--quiet", *paths).stdout.splitlines()
    assert len(quiet) == 3 and all(line.startswith("accepted: " + path) for line, path in zip(quiet, paths))
    lines = run("-m", "certify", "verify", "--jsonl", *paths).stdout.splitlines()
    assert [set(json.loads(line)) for line in lines] == [{"file", "accepted", "reason", "digest"}] * 2
    without_time = lambda text: re.sub(r"\d+\.\d+ s", "", text)
    assert without_time(run("-m", "certify.verifier", *paths).stdout) == \
        without_time(run("-m", "certify", "verify", *paths).stdout)


def test_isogeny_class_report_lists_the_curves_and_the_degree_matrix(tmp_path):
    """The class of [0,2,0,-15,0] against cypari2's ellisomat: every member's equation and every degree."""
    from certify.isogeny.certificate import certify_isogeny_class
    from certify.pari import pari

    cert = certify_isogeny_class(parse_curve("[0,2,0,-15,0]"))
    text = run("-m", "certify.verifier", write(tmp_path, "class.json", cert)).stdout
    curves, matrix = pari.ellisomat(pari.ellinit([0, 2, 0, -15, 0]))
    assert f"consists of {len(curves)} curves" in text
    for i, a in enumerate(cert["claim"]["curves"]):
        assert f"E{i + 1}: {Curve(parse_curve('[' + ','.join(a) + ']')).equation()}" in text
    rows = [line.split() for line in text.splitlines() if re.fullmatch(r"\s+[\d ]+", line)]
    assert sorted(sorted(map(int, row)) for row in rows) == sorted(sorted(int(d) for d in row) for row in matrix)


def test_a_theorem_the_verifier_does_not_know_is_flagged_not_echoed(tmp_path):
    cert = certify_torsion(parse_curve("[0,2,0,-15,0]"))
    cert["relies_on"].append({"key": "wishful-thinking", "statement": "Every claim is true.", "reference": "none"})
    text = run("-m", "certify.verifier", write(tmp_path, "c.json", cert)).stdout
    assert "'wishful-thinking': not a result this verifier knows" in text and "Every claim is true." not in text
