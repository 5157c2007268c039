"""Issue 11, item 5: the documented Python API (certify.api), checked against cypari2 as reference
library and against the command line's own messages."""
import json
import subprocess
import sys
from fractions import Fraction

import pytest

from certify import api
from certify.pari import pari


def cli_message(*args) -> str:
    """The one line `certify` prints on stderr for bad input, without its 'certify: ' prefix."""
    run = subprocess.run([sys.executable, "-m", "certify", *args], capture_output=True, text=True, timeout=120)
    assert run.returncode == 2 and len(run.stderr.strip().splitlines()) == 1, run.stderr
    return run.stderr.strip().removeprefix("certify: ")


def test_both_kinds_from_text_and_from_numbers_give_the_same_certificates():
    """The curve as printed and as a list of ints, Fractions and strings: the same digests; the claims in
    Python types agree with cypari2's elltors and ellisomat."""
    text = "y^2 + xy - (3/16)y = x^3 - (3/16)x^2"
    numbers = [1, "-3/16", Fraction(-3, 16), 0, 0]
    torsion = api.certify_torsion(text)
    assert api.certify_torsion(numbers).digest == torsion.digest
    assert torsion.kind == "torsion" and torsion.curve == (1, Fraction(-3, 16), Fraction(-3, 16), 0, 0)
    reference = pari.elltors(pari.ellinit([str(c) for c in torsion.curve]))
    assert torsion.claim.invariants == tuple(sorted(int(n) for n in reference[1]))
    assert torsion.claim.order == int(reference[0])
    assert all(isinstance(c, Fraction) for point in torsion.claim.generators for c in point)
    isogeny = api.certify_isogeny_class(numbers)
    assert api.certify_isogeny_class(text).digest == isogeny.digest
    members, matrix = pari.ellisomat(pari.ellinit([str(c) for c in isogeny.curve]))
    assert isogeny.claim.size == len(members)
    assert isogeny.claim.degrees_from_curve == tuple(sorted(int(d) for d in matrix[0]))


def test_a_conductor_certificate_in_python_types():
    """The conductor and the local data at each bad prime agree with cypari2's ellglobalred (conductor,
    [p, f_p, Kodaira code, c_p] rows) on a curve with additive and multiplicative reduction."""
    cert = api.certify_conductor("y^2 = x^3 + 2x^2 - 15x")
    assert cert.kind == "conductor" and api.verify(cert).accepted
    conductor, _, _, factored, local = pari.ellglobalred(pari.ellinit([0, 2, 0, -15, 0]))[:5]
    assert cert.claim.conductor == int(conductor)
    assert [(p.prime, p.conductor_exponent, p.tamagawa_number) for p in cert.claim.bad_primes] == \
        [(int(p), int(f), int(data[3])) for p, f, data in zip(factored[0], factored[1], local)]


def test_write_serialise_and_verify_an_object_a_document_and_a_file(tmp_path):
    cert = api.certify_torsion([0, 0, 0, -1, 0])
    path = tmp_path / "c.json"
    cert.write(path)
    assert json.loads(path.read_text()) == json.loads(cert.to_json()) == cert.document
    for given in (cert, cert.document, path, str(path)):
        verdict = api.verify(given)
        assert verdict.accepted and verdict.digest == cert.digest, verdict
    assert api.read_certificate(path).claim == cert.claim
    forged = dict(cert.document, claim={**cert.document["claim"], "invariants": ["2", "4"]})
    verdict = api.verify(forged)
    assert not verdict.accepted and verdict.reason


def test_a_document_is_verified_as_its_file_would_be(tmp_path):
    """api.verify on a document applies the limits and refusals of a file (``sources.parse``): a float, an
    over-long string, nesting beyond MAX_DEPTH, a lone surrogate are refused, with the verdict the same
    document gets as a file; a value JSON cannot hold is unreadable, never a traceback."""
    from certify.verifier.limits import MAX_DEPTH, MAX_STRING_LENGTH

    cert = api.certify_torsion([0, 0, 0, -1, 0]).document
    nested = []
    for _ in range(MAX_DEPTH + 1):
        nested = [nested]
    hostile = [dict(cert, claim={**cert["claim"], "invariants": [2.0, "2"]}),
               dict(cert, metadata={"note": "x" * (MAX_STRING_LENGTH + 1)}),
               dict(cert, metadata={"note": nested}),
               dict(cert, metadata={"note": "\ud800"})]
    for document in hostile:
        path = tmp_path / "hostile.json"
        path.write_bytes(json.dumps(document).encode("ascii"))
        verdict, as_file = api.verify(document), api.verify(path)
        assert not verdict.accepted and verdict.reason == as_file.reason and verdict.reason.startswith("unreadable")
    verdict = api.verify(dict(cert, metadata={"note": Fraction(1, 2)}))
    assert not verdict.accepted and verdict.reason.startswith("unreadable")


@pytest.mark.parametrize("spec, cli_spelling", [
    ("[0,0,0,-3,2]", None),                       # singular: 4·(−3)³ + 27·2² = 0
    ([0, 0, 0, -3, 2], "[0,0,0,-3,2]"),
    ("[0,0,0,-1,0,]", None),
    ("y^2 = x^3 + 1/x", None),
    ([0, 0, 0, 1.5, 2], None),
    ([1, 2, 3], "[1,2,3]"),
    ([0, 0, 0, 1, 10 ** 1001], "[0,0,0,1," + "1" + "0" * 1001 + "]"),
], ids=["singular text", "singular list", "trailing comma", "division by x", "float", "three numbers", "1002 digits"])
def test_bad_input_raises_certify_error_with_the_command_lines_message(spec, cli_spelling):
    with pytest.raises(api.CertifyError) as raised:
        api.certify_torsion(spec)
    assert isinstance(raised.value, ValueError)
    if isinstance(spec, str) or cli_spelling:
        assert str(raised.value) == cli_message("torsion", cli_spelling or spec)


def test_a_singular_curve_is_refused_at_once_never_hangs():
    """certify_torsion([0,0,0,-3,2]) hung before issue 11; a child process with a deadline guards the test."""
    code = "from certify.api import certify_torsion, CertifyError\ntry:\n    certify_torsion([0,0,0,-3,2])\n" \
           "except CertifyError as e:\n    print(e)"
    run = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60)
    assert "singular" in run.stdout


def test_unwritable_path_raises_certify_error(tmp_path):
    cert = api.certify_torsion([0, 1])
    with pytest.raises(api.CertifyError, match="cannot write"):
        cert.write(tmp_path / "missing" / "c.json")


# --- the README's example of a maintainer's regression test, verbatim ---
def my_library_torsion(coefficients):
    """Stands for the maintainer's own library: here cypari2's elltors, as reference library."""
    return sorted(int(n) for n in pari.elltors(pari.ellinit(coefficients))[1])


def test_torsion_agrees_with_certified_answers():
    from certify.api import certify_torsion, verify

    for curve in ([0, 0, 0, -1, 0], [1, -1, 1, -14, 29], [0, -1, 1, -10, -20]):
        certificate = certify_torsion(curve)
        assert verify(certificate).accepted
        assert my_library_torsion(curve) == list(certificate.claim.invariants), certificate.digest


def test_a_rank_certificate_in_python_types(tmp_path):
    """certify_rank on the congruent-number curves y² = x³ − n²x, n = 1, 5, 34 (ranks 0, 1 and 2 by
    cypari2's ellrank, which proves them): the bounds contain the rank, the points are independent (a
    non-zero regulator, cypari2's ellheightmatrix), the Selmer dimensions give the upper bound."""
    for n in (1, 5, 34):
        coefficients = [0, 0, 0, -n * n, 0]
        cert = api.certify_rank(coefficients)
        assert cert.kind == "rank" and api.verify(cert).accepted
        claim = cert.claim
        lower, upper = (int(b) for b in pari.ellrank(pari.ellinit(coefficients))[:2])
        assert claim.rank_lower <= upper and (claim.rank_upper is None or lower <= claim.rank_upper)
        assert claim.rank == (claim.rank_lower if claim.rank_lower == claim.rank_upper else None)
        assert len(claim.points) == claim.rank_lower
        assert all(isinstance(c, Fraction) for point in claim.points for c in point)
        if claim.points:
            heights = pari.ellheightmatrix(pari.ellinit(coefficients), [[str(x), str(y)] for x, y in claim.points])
            assert pari.matdet(heights) > 0.001
        if claim.selmer_dimensions is not None:
            assert claim.rank_upper == sum(claim.selmer_dimensions) - 2
        else:
            assert claim.rank_upper is None
        cert.write(tmp_path / f"{n}.json")
        assert api.read_certificate(tmp_path / f"{n}.json").claim == claim



def test_every_name_of_the_api_is_documented_in_the_readme():
    """The README's "Python API" section names every stable name (api.__all__), the rank's among them."""
    from pathlib import Path

    readme = (Path(__file__).resolve().parent.parent / "README.md").read_text(encoding="utf-8")
    section = readme.split("## Python API", 1)[1].split("\n## ", 1)[0]
    assert [name for name in api.__all__ if f"`{name}" not in section] == []
