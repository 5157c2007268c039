"""certify bundle and certify verify on bundles: per-member verdicts, a manifest that pins the members."""
import json
import subprocess
import sys

import pytest

from certify.certificates import to_json
from certify.curves import parse_curve
from certify.torsion import certify_torsion
from certify.verifier.digest import digest
from certify.verifier.report import describe_claim

CURVES = ["[0,2,0,-15,0]", "[0,1,1,-2,7]", "y^2 - x*y - 6*y = x^3 - 6*x^2"]


def certify(*args):
    return subprocess.run([sys.executable, "-m", "certify", *args], capture_output=True, text=True)


@pytest.fixture()
def bundle(tmp_path):
    paths = []
    for i, curve in enumerate(CURVES):
        paths.append(tmp_path / f"curve-{i}.json")
        paths[-1].write_text(to_json(certify_torsion(parse_curve(curve))))
    run = certify("bundle", *map(str, paths), "-o", str(tmp_path / "appendix.json"))
    assert run.returncode == 0, run.stderr
    return tmp_path / "appendix.json", paths, run.stderr


def verdicts(path):
    run = certify("verify", "--jsonl", str(path))
    return run.returncode, [row for row in map(json.loads, run.stdout.splitlines()) if "members" not in row]


def test_manifest_describes_each_member_and_verify_reports_per_member(bundle):
    path, members, printed = bundle
    document = json.loads(path.read_text())
    originals = [json.loads(member.read_text()) for member in members]
    assert document["manifest"]["count"] == str(len(CURVES))
    assert [entry["digest"] for entry in document["manifest"]["members"]] == [digest(c) for c in originals]
    assert [entry["claim"] for entry in document["manifest"]["members"]] == [describe_claim(c) for c in originals]
    assert digest(document) in printed
    code, rows = verdicts(path)
    assert code == 0
    assert [row["file"] for row in rows] == [f"{path}#curve-{i}.json" for i in range(len(CURVES))]
    assert all(row["accepted"] for row in rows)


def test_a_tampered_member_is_rejected_alone(bundle):
    path = bundle[0]
    document = json.loads(path.read_text())
    document["members"][1]["claim"]["invariants"] = ["3"]
    path.write_text(json.dumps(document))
    code, rows = verdicts(path)
    assert code == 1 and [row["accepted"] for row in rows] == [True, False, True]


def test_a_member_swapped_for_another_accepted_certificate_is_rejected(bundle):
    """Each member is a valid certificate, but the manifest pins which: the digest check catches the swap."""
    path = bundle[0]
    document = json.loads(path.read_text())
    document["members"][0], document["members"][2] = document["members"][2], document["members"][0]
    path.write_text(json.dumps(document))
    code, rows = verdicts(path)
    assert code == 1 and [row["accepted"] for row in rows] == [False, True, False]
    assert rows[0]["reason"].startswith("recorded")


def test_metadata_does_not_change_the_bundle_digest(bundle):
    path = bundle[0]
    document = json.loads(path.read_text())
    before = digest(document)
    document["metadata"] = {"written": "never"}
    document["members"][0]["metadata"] = {"written": "never"}
    assert digest(document) == before
    path.write_text(json.dumps(document))
    assert verdicts(path)[0] == 0


@pytest.mark.parametrize("damage", ["count", "drop member", "version"])
def test_a_manifest_that_does_not_match_makes_the_bundle_unreadable(bundle, damage):
    path = bundle[0]
    document = json.loads(path.read_text())
    if damage == "count":
        document["manifest"]["count"] = "4"
    elif damage == "drop member":
        document["members"].pop()
    else:
        document["version"] = "7"
    path.write_text(json.dumps(document))
    code, rows = verdicts(path)
    assert code == 2 and len(rows) == 1 and rows[0]["reason"].startswith("unreadable")


def test_every_kind_of_certificate_goes_into_a_bundle(tmp_path):
    """A bundle of one certificate of each kind of the default set for y² = x³ − 25x (rank 1 by cypari2's
    ellrank, conductor 800 by its ellglobalred): each member accepted under its own claim, in the manifest
    in the verifier's wording, and the bundle's report opens with a row per member."""
    from certify.certificates import certifiers, certify_checked
    from certify.pari import pari

    curve = pari.ellinit([0, 0, 0, -25, 0])
    paths = []
    for kind in certifiers():
        cert = certify_checked(kind, parse_curve("[0,0,0,-25,0]"))
        if kind == "rank":
            assert int(cert["claim"]["rank_lower"]) <= int(pari.ellrank(curve)[1])
        if kind == "conductor":
            assert int(cert["claim"]["conductor"]) == int(pari.ellglobalred(curve)[0])
        paths.append(tmp_path / f"{kind}.json")
        paths[-1].write_text(to_json(cert))
    assert {"conductor", "rank"} <= set(certifiers())
    run = certify("bundle", *map(str, paths), "-o", str(tmp_path / "all.json"))
    assert run.returncode == 0, run.stderr
    document = json.loads((tmp_path / "all.json").read_text())
    originals = [json.loads(path.read_text()) for path in paths]
    assert [entry["format"] for entry in document["manifest"]["members"]] == [c["format"] for c in originals]
    assert [entry["claim"] for entry in document["manifest"]["members"]] == [describe_claim(c) for c in originals]
    code, rows = verdicts(tmp_path / "all.json")
    assert code == 0 and len(rows) == len(paths) and all(row["accepted"] for row in rows)
    report = certify("verify", str(tmp_path / "all.json")).stdout
    assert sum(line.startswith("  accepted  ") for line in report.splitlines()) == len(paths)
