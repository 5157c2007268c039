"""Referee findings on the removal of two verifier checks (element_vector's ``p² | d``, optional's
``isinstance(obj, dict)``), the bundle table's ``digest.short`` and api.verify's UTF-8 serialisation.

The two removals hold: every ``primes`` list reaching element_vector is one side's list of
read_factorisation (strictly increasing, proven prime and checked to be the factorisation of b or of
a² − 4b before check_side runs), and every object reaching ``optional`` was returned by
``field(..., dict, ...)``. The tests below pin that down end to end, on both sides of every descent
certificate of the demo, so that a later change to where the primes come from is caught. The
serialisation change left a size differential between ``api.verify(document)`` (compact JSON) and the
file certify writes for the same document (indented); api.verify now writes the document as certify does."""
from __future__ import annotations

import copy
import json
from pathlib import Path

import pytest

from certify.api import verify as api_verify
from certify.certificates import to_json
from certify.verifier import verify as core_verify
from certify.verifier.errors import Rejection
from certify.verifier.limits import MAX_FILE_BYTES, MAX_LIST_LENGTH, MAX_VALUES

DEMO = Path(__file__).resolve().parent.parent / "certificates-demo"
DESCENT_DEMOS = [f"appendix-curve-{i}.rank.json" for i in (2, 4, 5, 6, 8)]


def load(name: str) -> dict:
    return json.loads((DEMO / name).read_text(encoding="utf-8"))


def side_primes(descent: dict, side: str) -> list:
    """V's primes on a side: those of a² − 4b for "phi" (on Ē), of b for "phi_dual" (on E)."""
    key = "factorisation_b_dual" if side == "phi" else "factorisation_b"
    return [int(entry["prime"]) for entry in descent[key]]


def non_squarefree_variants(name: str):
    """(side, what, d) for every exclusion d0 of every side and every prime p of that side: d0·p², and
    p²·(−1) offered as a local generator."""
    descent = load(name)["evidence"]["descent"]
    for side in ("phi", "phi_dual"):
        for p in side_primes(descent, side):
            for i, exclusion in enumerate(descent[side]["exclusions"]):
                yield side, ("exclusion", i), int(exclusion["d"]) * p * p
            yield side, ("generator", None), -p * p


CASES = [(name, *variant) for name in DESCENT_DEMOS for variant in non_squarefree_variants(name)]


@pytest.mark.parametrize("name, side, what, d", CASES,
                         ids=[f"{c[0].split('.')[0]}-{c[1]}-{c[2][0]}{c[2][1] or ''}-{c[3]}" for c in CASES])
def test_a_non_squarefree_element_is_refused_on_both_sides_of_every_descent(name, side, what, d):
    """Attack on the removal of ``any(d % p² == 0)``: in a genuine descent certificate, replace one
    excluded d0 by d0·p² (the same class in Q*/Q*², so the local test would still pass if the element
    were read), or offer −p² as a local generator, p a prime of that side's V. The verifier must refuse
    the element itself ("descent element"), on either side, before any local test. That d is not
    squarefree is taken from sympy's factorint (the reference library), not from the project's code."""
    import sympy

    assert any(e >= 2 for e in sympy.factorint(abs(d)).values())
    cert = load(name)
    descent = cert["evidence"]["descent"]
    if what[0] == "exclusion":
        descent[side]["exclusions"][what[1]]["d"] = str(d)
    else:
        places = sorted({2} | {int(x["prime"]) for x in descent["factorisation_b"] + descent["factorisation_b_dual"]})
        descent[side]["local_generators"].append(
            {"d": str(d), "membership": [{"prime": str(p), "M": "1", "e": "0"} for p in places]})
    with pytest.raises(Rejection) as caught:
        core_verify(cert)
    assert caught.value.check == "descent element", str(caught.value)


@pytest.mark.parametrize("part, value", [("claim", []), ("claim", "x"), ("claim", None), ("evidence", []),
                                         ("evidence", "1"), ("evidence", None)])
def test_claim_or_evidence_that_is_not_an_object_gets_a_verdict(part, value):
    """Attack on the removal of optional's ``isinstance(obj, dict)``: a rank certificate whose claim or
    evidence is a list, a string or null, given to api.verify (the document path) — a structure
    rejection, not a traceback from ``key in obj`` on a non-object. No mathematical fact is used."""
    cert = load("appendix-curve-6.rank.json")
    cert[part] = value
    verdict = api_verify(cert)
    assert not verdict.accepted
    assert verdict.reason.startswith("structure"), verdict.reason


@pytest.mark.parametrize("part, key", [("claim", "rank_upper"), ("claim", "selmer_dimensions"),
                                       ("evidence", "independence"), ("evidence", "descent"),
                                       ("evidence", "analytic")])
def test_a_missing_optional_field_is_refused_by_name(part, key):
    """``optional`` without its type test still refuses a missing field by name (the schema step runs
    after the checks, so this is the check that decides). No mathematical fact is used."""
    cert = load("appendix-curve-6.rank.json")
    del cert[part][key]
    with pytest.raises(Rejection) as caught:
        core_verify(cert)
    assert caught.value.check == "structure" and repr(key) in str(caught.value), str(caught.value)


def padded_torsion_certificate() -> dict:
    """The demo torsion certificate of curve 1 with 800,000 short strings in ``metadata`` (never read,
    not hashed): compact JSON under MAX_FILE_BYTES, certify's indented file over it."""
    document = load("appendix-curve-1.torsion.json")
    document["metadata"]["pad"] = [["a" * 19] * MAX_LIST_LENGTH for _ in range(80)]
    return document


def test_api_verify_agrees_with_the_file_certify_writes_near_the_size_limit(tmp_path):
    """Parser differential: ``_as_file_bytes`` says it writes the document "as certify writes a file",
    and api.verify says it checks a document "exactly as certify verify does". certify writes a file with
    ``certify.certificates.to_json`` (what Certificate.write uses): one space of indentation per level
    and a line break per value. For a document of 800,000 values the file is about 3 MB larger than the
    API's serialisation, so with the file over MAX_FILE_BYTES and the API's bytes under it,
    ``python -m certify.verifier FILE`` says unreadable (exit 2) and api.verify(document) says accepted.
    The claim itself (E(Q)_tors ≅ Z/5Z for [-2,-3,-3,0,0]) is true by cypari2's elltors, the reference
    library, so only the size limit separates the two verdicts."""
    import cypari2

    pari = cypari2.Pari()
    document = padded_torsion_certificate()
    assert [int(n) for n in pari.elltors(pari.ellinit([int(c) for c in document["curve"]]))[1]] == [5]
    text = to_json(document).encode("utf-8")
    compact = json.dumps(document, ensure_ascii=False).encode("utf-8")
    assert len(compact) <= MAX_FILE_BYTES < len(text)
    assert text.count(b",") + text.count(b"[") + text.count(b"{") <= MAX_VALUES
    path = tmp_path / "padded.torsion.json"
    path.write_bytes(text)
    from_file = api_verify(path)
    from_document = api_verify(copy.deepcopy(document))
    assert from_document.accepted == from_file.accepted, (from_document.reason, from_file.reason)
