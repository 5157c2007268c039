"""Isogeny-class certificates validate against schemas/isogeny-class.schema.json (JSON Schema 2020-12)."""
import json
import pathlib
from fractions import Fraction

import jsonschema
import pytest

from certify.certificates import stamp
from certify.isogeny.certificate import certify_isogeny_class

SCHEMA = json.loads((pathlib.Path(__file__).resolve().parent.parent / "schemas" /
                     "isogeny-class.schema.json").read_text())


@pytest.mark.parametrize("a", [(1, 1, 1, -10, -10), (0, 0, 0, 0, 1), (Fraction(1, 2), 0, 0, 3, Fraction(-5, 4)),
                               (0, -1, 1, -7, 10)])
def test_certificates_follow_the_schema(a):
    jsonschema.Draft202012Validator.check_schema(SCHEMA)
    cert = stamp(certify_isogeny_class(tuple(Fraction(c) for c in a)))
    jsonschema.validate(cert, SCHEMA, cls=jsonschema.Draft202012Validator)


def test_schema_refuses_a_number_that_is_not_a_string():
    cert = certify_isogeny_class(tuple(Fraction(c) for c in (0, -1, 1, -10, -20)))
    cert["claim"]["degrees"][0][0] = 1
    with pytest.raises(jsonschema.ValidationError):
        jsonschema.validate(cert, SCHEMA, cls=jsonschema.Draft202012Validator)
