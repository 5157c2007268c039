"""The front end's structural check against the JSON Schemas (jsonschema, draft 2020-12)."""
import copy

import pytest

from certify.certificates import stamp
from certify.curves import parse_curve
from certify.isogeny.certificate import certify_isogeny_class
from schema_reference import schema_violations
from certify.torsion import certify_torsion

CURVES = ["[1,0,1,-19,26]", "[0,-1,1,-10,-20]", "y^2 + x*y - 3/16*y = x^3 - 3/16*x^2", "[1,0,1,-171,-874]"]


@pytest.fixture(scope="module")
def certificates():
    """Real certificates of both kinds (the certifier's own output)."""
    return [build(parse_curve(text)) for text in CURVES for build in (certify_torsion, certify_isogeny_class)]


def test_every_certificate_written_validates(certificates):
    """As built, and as the command line writes it (with its unhashed metadata block)."""
    for cert in certificates:
        assert schema_violations(cert) == [], cert["curve"]
        assert schema_violations(stamp(copy.deepcopy(cert))) == [], cert["curve"]


@pytest.mark.parametrize("damage, path", [
    (lambda c: c["curve"].__setitem__(0, 7), "/curve/0"),
    (lambda c: c["curve"].__setitem__(1, "+1"), "/curve/1"),
    (lambda c: c.pop("claim"), "/"),
    (lambda c: c["evidence"].update(extra="1"), "/evidence"),
])
def test_violations_are_reported_by_path(certificates, damage, path):
    """A number as a JSON number, a non-canonical spelling, a missing block, an unknown field: each is
    reported with the JSON path of the offending value."""
    for cert in certificates[:2]:
        broken = copy.deepcopy(cert)
        damage(broken)
        violations = schema_violations(broken)
        assert violations and violations[0].split(":")[0] == path, violations


def test_unknown_formats_are_left_to_the_verifier():
    """No schema is guessed for an unknown format: the verifier rejects it and names the format."""
    assert schema_violations({"format": "something-else", "version": "1"}) == []
    assert schema_violations([1, 2]) == []
