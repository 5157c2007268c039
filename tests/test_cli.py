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
    assert [set(row) for row in rows] == [{"file", "accepted", "reason", "digest"}] * 2
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


# --- issue 11, items 3, 4 and 7 ---

def test_without_output_the_answer_goes_to_stderr_and_stdout_holds_the_json_alone():
    """Item 3: the readable answer on stderr (its group agrees with cypari2's elltors), the certificate
    alone on stdout, parseable as it is."""
    from certify.pari import pari

    run = certify("torsion", "y^2 + xy - (3/16)y = x^3 - (3/16)x^2")
    assert run.returncode == 0
    cert = json.loads(run.stdout)
    group = " × ".join(f"Z/{n}Z" for n in sorted(int(n) for n in pari.elltors(pari.ellinit(cert["curve"]))[1]))
    first, second = run.stderr.splitlines()
    assert first.startswith("y^2 + xy - (3/16)y = x^3 - (3/16)x^2: E(Q)_tors ≅ " + group)
    assert second.startswith("digest sha256:")


def read_only_folder(tmp_path):
    """A folder nobody may create files in: chmod 500 for an ordinary user; for root, whom permissions do not
    stop, the read-only /sys."""
    import os

    if os.geteuid() == 0:
        return "/sys"
    folder = tmp_path / "read-only"
    folder.mkdir()
    folder.chmod(0o500)
    return str(folder)


@pytest.fixture(scope="module")
def one_certificate(tmp_path_factory):
    path = tmp_path_factory.mktemp("one") / "c.json"
    assert certify("torsion", "[0,1]", "-o", str(path)).returncode == 0
    return str(path)


@pytest.mark.parametrize("command, where", [
    (command, where) for command in ("torsion", "isogeny-class", "bundle", "table", "audit", "demo")
    for where in ("read-only folder", "a directory", "missing folder")
    if (command, where) != ("demo", "missing folder")])  # demo --out creates its folder, parents included
def test_every_unwritable_output_path_exits_2_with_one_line(command, where, tmp_path, one_certificate):
    """Item 4: for each command that writes, each kind of unwritable path gives status 2 (for audit, not the
    1 of a disagreement) and one line naming the path, no traceback; for demo, a file where its folder
    should be."""
    target = {"read-only folder": f"{read_only_folder(tmp_path)}/out.json", "a directory": str(tmp_path),
              "missing folder": str(tmp_path / "missing" / "out.json")}[where]
    claims = tmp_path / "claims.csv"
    claims.write_text('curve,torsion_group\n"[0,1]",[2]\n')  # a disagreement: the truth is Z/6Z
    args = {"torsion": ["torsion", "[0,1]", "-o", target], "isogeny-class": ["isogeny-class", "[0,1]", "-o", target],
            "bundle": ["bundle", one_certificate, "-o", target], "table": ["table", one_certificate, "-o", target],
            "audit": ["audit", str(claims), "-o", target, "--workers", "1",
                      "--certificates", str(tmp_path / "audit-certificates")],
            "demo": ["demo", "--out", target if where != "a directory" else one_certificate]}[command]
    run = certify(*args)
    assert run.returncode == 2, run.stderr
    lines = run.stderr.strip().splitlines()
    assert "Traceback" not in run.stderr and lines[-1].startswith("certify: ") and "cannot write" in lines[-1]
    assert len([line for line in lines if line.startswith("certify: ")]) == 1


@pytest.mark.parametrize("command", ["batch", "audit"])
@pytest.mark.parametrize("address, reason", [("notanaddress", "not a scheduler address"),
                                             ("tcp://127.0.0.1:1", "cannot reach")])
def test_a_bad_cluster_address_exits_2_with_one_line(command, address, reason, tmp_path):
    source = tmp_path / "input.csv"
    source.write_text("curve\n[0,1]\n" if command == "audit" else "[0,1]\n")
    run = certify(command, str(source), *(["-o", str(tmp_path / "out")] if command == "batch" else []),
                  "--cluster", address)
    assert run.returncode == 2 and len(run.stderr.strip().splitlines()) == 1 and reason in run.stderr, run.stderr


def test_an_input_whose_certificate_would_exceed_the_verifiers_limits_exits_2_with_one_line():
    """Item 4: a 1,000-digit denominator (inside certify's input limit) gives an integral model far over the
    verifier's MAX_DIGITS: one line and status 2, not Python's int-to-text error or a refused certificate."""
    denominator = "7" * 999 + "1"
    for kind in ("torsion", "isogeny-class"):
        run = certify(kind, f"[0,0,0,1,1/{denominator}]")
        assert run.returncode == 2 and run.stdout == "" and "Traceback" not in run.stderr
        assert len(run.stderr.strip().splitlines()) == 1 and "4000 digits" in run.stderr


def test_certifys_limits_are_kept_within_the_verifiers():
    """Item 4: every number certify reads fits the verifier's digit limit, every curve argument its file
    size, and a certificate is only returned once the verifier itself accepts it, over the largest curve
    certify reads in the [A,B] form whose integral model is itself (so nothing is scaled)."""
    from certify.certificates import certify_checked
    from certify.curves import MAX_COEFFICIENT_DIGITS, MAX_INPUT_LENGTH, parse_curve
    from certify.verifier import verify
    from certify.verifier.limits import MAX_DIGITS, MAX_FILE_BYTES

    assert MAX_COEFFICIENT_DIGITS <= MAX_DIGITS and MAX_INPUT_LENGTH <= MAX_FILE_BYTES
    largest = "[" + "-" + "9" * MAX_COEFFICIENT_DIGITS + "," + "9" * MAX_COEFFICIENT_DIGITS + "]"
    cert = certify_checked("torsion", parse_curve(largest))
    verify(cert)  # raises Rejection if not accepted
    assert max(len(c) for c in cert["evidence"]["integral_model"]["curve"]) <= MAX_DIGITS


def test_version_names_the_installed_release():
    """Item 7: `certify --version` prints the version of the installed package's metadata."""
    from importlib.metadata import version

    run = certify("--version")
    assert run.returncode == 0 and run.stdout.strip() == f"certify {version('certify')}"
