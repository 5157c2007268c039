"""The verifier's readable report of rank certificates (certify/verifier/report.py): the claim in words, one
plain sentence when the bounds do not meet, the points, the Selmer dimensions, the checks, the theorems."""
import subprocess
import sys

import pytest

from certify.certificates import certify_checked, to_json
from certify.curves import parse_curve
from certify.pari import pari
from certify.verifier.report import claim_lines, describe_claim
from certify.verifier.theorems import THEOREMS

CURVES = {
    "[0,0,0,-1,0]": "rank 0, the congruent-number curve for n = 1 (Fermat)",
    "[0,0,0,-1156,0]": "rank 2, the congruent-number curve for n = 34",
    "[0,-10,0,2,0]": "rank 0 by cypari2's ellrank, with a 2-isogeny Selmer group larger than E(Q)/2E(Q) needs "
                     "(the analytic witness proves the rank)",
    "[0,0,1,-1,0]": "rank 1, no rational point of order 2 (no descent via 2-isogeny; the analytic witness)",
    "[0,0,1,-7,6]": "rank 3, no rational point of order 2 and analytic rank 3: a lower bound alone",
    "[1,-1,1,-1639,-25157]": "rank 1 by cypari2's ellrank, its generator beyond the point search: bounds 0 and 1",
}
"""Curves whose rank certificates show each form of the claim; ranks by cypari2's ellrank."""

NOT_CLOSED = "The descent did not close"
NO_POINT = "no point of infinite order was found to match the order of vanishing"


def verify(*args):
    return subprocess.run([sys.executable, "-m", "certify", "verify", *args], capture_output=True, text=True)


@pytest.fixture(scope="module")
def certificates(tmp_path_factory):
    """{curve: (path, certificate)} for CURVES, each as certify writes it (checked by the verifier)."""
    folder = tmp_path_factory.mktemp("rank-report")
    out = {}
    for i, curve in enumerate(CURVES):
        cert = certify_checked("rank", parse_curve(curve))
        (folder / f"r{i}.json").write_text(to_json(cert))
        out[curve] = (str(folder / f"r{i}.json"), cert)
    return out


@pytest.mark.parametrize("curve", CURVES)
def test_the_report_states_the_bounds_the_points_and_the_selmer_dimensions(certificates, curve):
    """The report of an accepted rank certificate: its claim as the one-line verdict says it, each point, the
    Selmer dimensions exactly when there is a descent, the sentence on an open gap exactly when the bounds
    differ, and each theorem of relies_on in the verifier's wording; the bounds contain cypari2's ellrank."""
    path, cert = certificates[curve]
    claim = cert["claim"]
    lower, upper = (int(b) for b in pari.ellrank(pari.ellinit([str(c) for c in parse_curve(curve)]))[:2])
    assert int(claim["rank_lower"]) <= upper and (claim["rank_upper"] is None or lower <= int(claim["rank_upper"]))
    run = verify(path)
    assert run.returncode == 0, run.stdout + run.stderr
    text = " ".join(run.stdout.split())
    assert describe_claim(cert) in text
    for i, (x, y) in enumerate(claim["points"], 1):
        assert f"P{i} = ({x}, {y})" in text
    dimensions = claim["selmer_dimensions"]
    assert ("dim Sel^φ(E) = " in text) == (dimensions is not None)
    if dimensions is not None:
        assert f"dim Sel^φ(E) = {dimensions['phi']}, dim Sel^ψ(Ē) = {dimensions['phi_dual']}" in text
        assert "descent via 2-isogeny rechecked" in text
    assert text.count(NOT_CLOSED) + text.count(NO_POINT) == (claim["rank_upper"] not in (None, claim["rank_lower"]))
    assert ("No upper bound is proven" in text) == (claim["rank_upper"] is None)
    analytic = cert["evidence"]["analytic"]
    assert ("L(E, s) vanishes to order exactly" in text) == (analytic is not None)
    if analytic is not None:
        assert "the order of vanishing of L(E, s) at s = 1 proven" in text
    for entry in cert["relies_on"]:
        statement, reference = THEOREMS[entry["key"]]
        assert " ".join(statement.split()) in text and " ".join(reference.split()) in text


def test_the_curves_show_every_form_of_the_claim(certificates):
    """Among the certificates: a proven rank, bounds that do not meet, and a lower bound alone."""
    claims = [cert["claim"] for _, cert in certificates.values()]
    assert any(c["rank_lower"] == c["rank_upper"] for c in claims)
    assert any(c["rank_upper"] not in (None, c["rank_lower"]) for c in claims)
    assert any(c["rank_upper"] is None for c in claims)


def test_quiet_gives_the_claim_and_the_checks_on_one_line(certificates):
    path, cert = certificates["[0,0,0,-1156,0]"]
    run = verify("--quiet", path)
    line = run.stdout.splitlines()[0]
    assert line.startswith(f"accepted: {path} — {describe_claim(cert)} [")
    assert f"{len(cert['claim']['points'])} independent points" in line and "character prime" in line
    assert ("cosets excluded" in line) == (cert["evidence"]["descent"] is not None)


@pytest.mark.parametrize("claim, analytic, first", [
    ({"rank_lower": "2", "rank_upper": "2", "points": [["1", "2"], ["3", "4"]],
      "selmer_dimensions": {"phi": "2", "phi_dual": "2"}}, None,
     "E(Q) has rank 2: the points P1, P2 below are independent modulo torsion, and the descent via 2-isogeny "
     "bounds the rank by 2."),
    ({"rank_lower": "0", "rank_upper": "0", "points": [], "selmer_dimensions": {"phi": "1", "phi_dual": "1"}}, None,
     "E(Q) has rank 0 (E(Q) is finite): the descent"),
    ({"rank_lower": "1", "rank_upper": "3", "points": [["1", "2"]], "selmer_dimensions": {"phi": "3", "phi_dual": "2"}},
     None, "1 ≤ rank E(Q) ≤ 3: the point P1 below has infinite order"),
    ({"rank_lower": "1", "rank_upper": None, "points": [["0", "0"]], "selmer_dimensions": None}, None,
     "rank E(Q) ≥ 1: the point P1 below has infinite order. No upper bound is proven"),
    ({"rank_lower": "1", "rank_upper": "1", "points": [["0", "0"]], "selmer_dimensions": None}, "1",
     "E(Q) has rank 1: the point P1 below has infinite order, and L(E, s) vanishes to order exactly 1 at s = 1"),
    ({"rank_lower": "0", "rank_upper": "0", "points": [], "selmer_dimensions": {"phi": "1", "phi_dual": "3"}}, "0",
     "E(Q) has rank 0 (E(Q) is finite): the descent via 2-isogeny bounds the rank by 2 and L(E, s) vanishes to "
     "order exactly 0"),
    ({"rank_lower": "0", "rank_upper": "1", "points": [], "selmer_dimensions": None}, "1",
     "0 ≤ rank E(Q) ≤ 1: L(E, s) vanishes to order exactly 1"),
    ({"rank_lower": "0", "rank_upper": "1", "points": [], "selmer_dimensions": {"phi": "1", "phi_dual": "2"}}, "1",
     "0 ≤ rank E(Q) ≤ 1: the descent via 2-isogeny bounds the rank by 1 and L(E, s) vanishes to order exactly 1"),
])
def test_claim_lines_in_words(claim, analytic, first):
    """The sentence opening each form of the claim, with the witness of each upper bound; when the bounds
    differ, one sentence on the gap: missing points when the order of vanishing gives the upper bound (the
    rank is that order, by Gross–Zagier and Kolyvagin, so nothing else can be missing), else the descent's;
    the descent's own bound as the formula gives it (Silverman–Tate III.6: dim Sel^φ + dim Sel^ψ − 2),
    even where an analytic witness does better."""
    cert = {"format": "certify-rank", "claim": claim,
            "evidence": {"analytic": None if analytic is None else {"order": analytic}}}
    text = " ".join(claim_lines(cert))
    assert text.startswith(first), text
    gap = claim["rank_upper"] not in (None, claim["rank_lower"])
    dimensions = claim["selmer_dimensions"]
    descent_bound = None if dimensions is None else int(dimensions["phi"]) + int(dimensions["phi_dual"]) - 2
    assert text.count(NOT_CLOSED) == (gap and analytic != claim["rank_upper"])
    assert text.count(NO_POINT) == (gap and analytic == claim["rank_upper"])
    if dimensions:
        phi, dual = dimensions["phi"], dimensions["phi_dual"]
        assert f"rank E(Q) ≤ {phi} + {dual} − 2 = {descent_bound}" in text
