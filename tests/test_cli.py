"""The command line's contracts: exit codes, one-line errors, --jsonl fields, atomic output."""
import json
import subprocess
import sys

import pytest


def certify(*args, cwd=None):
    return subprocess.run([sys.executable, "-m", "certify", *args], capture_output=True, text=True, cwd=cwd)


@pytest.mark.parametrize("curve, reason", [
    ("[0,0,0,0,0]", "singular"),
    ("[1,2,3]", "expected 5 coefficients"),
    ("[1,x]", "not a rational number"),
    ("[1/0,2]", "zero denominator"),
    ("[1.5,2]", "not a rational number"),
    ("y^2 = x^3 + sqrt(2)", "cannot read"),
    ("y^2 = x^4 + 1", "does not occur"),
    ("[" + "9" * 1001 + ",1]", "digits"),
    ("y^2 + x*y = x^3 - x^2", "singular"),
])
def test_bad_curves_exit_2_with_one_line(curve, reason):
    """Malformed, singular, non-rational and over-large input: status 2, one line on stderr, no traceback."""
    run = certify("torsion", curve)
    assert run.returncode == 2
    assert run.stdout == ""
    lines = run.stderr.strip().splitlines()
    assert len(lines) == 1 and reason in lines[0] and "Traceback" not in run.stderr


def test_equation_input_matches_coefficient_input():
    """The equation y^2 + x*y = x^3 - x^2 + 3 and the list [1,-1,0,0,3] are the same curve."""
    by_equation = json.loads(certify("torsion", "y^2 + x*y = x^3 - x^2 + 3").stdout)
    by_list = json.loads(certify("torsion", "[1,-1,0,0,3]").stdout)
    assert by_equation["curve"] == by_list["curve"] == ["1", "-1", "0", "0", "3"]


def test_short_form_input_is_expanded_to_five_coefficients():
    assert json.loads(certify("torsion", "[-1/4,5]").stdout)["curve"] == ["0", "0", "0", "-1/4", "5"]


def test_verify_exit_codes_and_jsonl(tmp_path):
    """0 when all are accepted, 1 when one is rejected, 2 when a file is not a certificate at all."""
    good = tmp_path / "good.json"
    assert certify("torsion", "[1,0,1,-19,26]", "-o", str(good)).returncode == 0
    cert = json.loads(good.read_text())
    cert["claim"]["invariants"] = ["12"]
    bad = tmp_path / "bad.json"
    bad.write_text(json.dumps(cert))
    broken = tmp_path / "broken.json"
    broken.write_text("{not json")
    assert certify("verify", str(good)).returncode == 0
    run = certify("verify", "--jsonl", str(good), str(bad))
    assert run.returncode == 1
    rows = [json.loads(line) for line in run.stdout.splitlines()]
    assert [set(row) for row in rows] == [{"file", "accepted", "reason"}] * 2
    assert [row["accepted"] for row in rows] == [True, False]
    assert rows[1]["reason"].startswith("generators") or rows[1]["reason"].startswith("generator orders")
    assert certify("verify", str(good), str(broken)).returncode == 2
    assert certify("verify", str(tmp_path / "missing.json")).returncode == 2


def test_output_file_leaves_no_temporary_files(tmp_path):
    assert certify("torsion", "[0,2,0,-15,0]", "-o", str(tmp_path / "c.json")).returncode == 0
    assert [p.name for p in tmp_path.iterdir()] == ["c.json"]


def test_demo_certifies_and_verifies_its_appendix(tmp_path):
    run = certify("demo", "--out", str(tmp_path))
    assert run.returncode == 0, run.stderr
    assert "accepted by the verifier" in run.stdout
    assert len(list(tmp_path.glob("*.json"))) >= 5


@pytest.mark.parametrize("curve, written", [
    # the first curve of Cremona's table (the fixture), written as his book writes equations (from memory)
    ("[0,-1,1,-10,-20]", "y^2 + y = x^3 - x^2 - 10x - 20"),
    ("[1/4,-3/2,1/8,5,7/2]", "y^2 + (1/4)xy + (1/8)y = x^3 - (3/2)x^2 + 5x + 7/2"),
    ("[-1,0]", "y^2 = x^3 - x"),
])
def test_curves_print_as_weierstrass_equations(curve, written):
    """Zero terms dropped, unit coefficients omitted, signs folded, fractional coefficients bracketed."""
    from certify.curves import Curve, parse_curve

    assert Curve(parse_curve(curve)).equation() == written
