"""`certify conductor CURVE [-o FILE]`: the certificate validates against schemas/conductor.schema.json
(JSON Schema 2020-12, jsonschema as reference), `certify verify` accepts it with the claim cypari2 gives
(conductor_reference), and bad input or a discriminant PARI cannot factor in time ends with one line
and status 2."""
import json
import pathlib
import subprocess
import sys

import jsonschema
import pytest

from conductor_reference import reference_claim

ROOT = pathlib.Path(__file__).resolve().parent.parent
SCHEMA = json.loads((ROOT / "schemas" / "conductor.schema.json").read_text())


def run(*args):
    return subprocess.run([sys.executable, "-m", "certify", *args], capture_output=True, text=True, cwd=ROOT)


@pytest.mark.parametrize("curve", ["[0,-1,1,-10,-20]", "y^2 + 1/2*x*y = x^3 + 3*x - 5/4",
                                   "[0,0,1,-1,1000000000000000000000000000007]"])
def test_certify_and_verify(tmp_path, curve):
    path = tmp_path / "conductor.json"
    made = run("conductor", curve, "-o", str(path))
    assert made.returncode == 0, made.stderr
    assert "conductor N = " in made.stderr and made.stderr.splitlines()[-1].startswith("digest sha256:")
    cert = json.loads(path.read_text())
    jsonschema.Draft202012Validator.check_schema(SCHEMA)
    jsonschema.validate(cert, SCHEMA, cls=jsonschema.Draft202012Validator)
    assert cert["claim"] == reference_claim(cert["curve"])
    checked = run("verify", str(path))
    assert checked.returncode == 0 and "accepted" in checked.stdout
    assert f"E has conductor N = {cert['claim']['conductor']}" in checked.stdout


def test_schema_refuses_a_number_that_is_not_a_string():
    cert = json.loads(run("conductor", "[0,-1,1,-10,-20]").stdout)
    cert["claim"]["bad_primes"][0]["tamagawa_number"] = 5
    with pytest.raises(jsonschema.ValidationError):
        jsonschema.validate(cert, SCHEMA, cls=jsonschema.Draft202012Validator)


@pytest.mark.parametrize("curve, words", [
    ("[0,0,0,0,0]", "singular"),
    # 27·b² − 4 has a 101-digit composite cofactor (cypari2's factor with a bound of 10^6 leaves it),
    # which PARI does not split within the 5-second limit.
    ("[0,0,0,-1,75468248741059190200826018020469156929767101332549]", "to find the bad primes"),
])
def test_bad_input_is_one_line_and_status_2(curve, words):
    result = run("conductor", curve)
    assert result.returncode == 2 and result.stdout == ""
    assert len(result.stderr.strip().splitlines()) == 1 and words in result.stderr
