"""Digests: canonical serialisation of the mathematical content, stable across processes and input
forms, blind to metadata, sensitive to every number of the claim."""
import json
import os
import subprocess
import sys

from fractions import Fraction

import pytest

from certify.certificates import stamp
from certify.curves import parse_curve
from certify.torsion import certify_torsion
from certify.verifier.digest import NotCanonical, canonical, claim_digest, digest, short


def certify(curve: str, seed: str):
    """`certify torsion CURVE` in a fresh process with the given hash seed: (certificate, printed digest)."""
    environment = {**os.environ, "PYTHONHASHSEED": seed}
    run = subprocess.run([sys.executable, "-m", "certify", "torsion", curve], capture_output=True, text=True,
                         env=environment, check=True)
    printed = [line.split()[1] for line in run.stderr.splitlines() if line.startswith("digest ")]
    return json.loads(run.stdout), printed[0]


def test_canonical_form_is_sorted_compact_ascii_json():
    """The specification of the module docstring, on a value with nesting, unicode and unsorted keys."""
    assert canonical({"b": ["1", "é", {"d": "", "c": True}], "a": None}) == \
        b'{"a":null,"b":["1","\\u00e9",{"c":true,"d":""}]}'


def test_floats_have_no_canonical_form():
    with pytest.raises(NotCanonical):
        canonical({"claim": {"invariants": [2.0]}})


def test_same_curve_same_digest_across_processes_and_input_forms():
    """One model written three ways (equation, [A,B], [a1,...,a6]), certified in processes with different
    hash seeds: the digests printed by certify agree, and equal the digest recomputed here and the one
    printed by the standalone verifier on a bare interpreter."""
    forms = ["y^2 = x^3 - 11/3*x + 70/27", "[-11/3,70/27]", "[0,0,0,-11/3,70/27]"]
    results = [certify(form, seed) for form, seed in zip(forms, ["0", "1", "random"])]
    certificates = [cert for cert, _ in results]
    assert len({printed for _, printed in results}) == 1
    assert {digest(cert) for cert in certificates} == {results[0][1]}
    assert len({claim_digest(cert) for cert in certificates}) == 1
    assert all("metadata" in cert for cert in certificates)
    path = os.path.join(os.environ.get("TMPDIR", "/tmp"), f"digest-{os.getpid()}.json")
    with open(path, "w", encoding="utf-8") as out:
        json.dump(certificates[0], out)
    bare = {key: value for key, value in os.environ.items() if not key.startswith("PYTHON")}
    run = subprocess.run([sys.executable, "-S", "-m", "certify.verifier", path], capture_output=True, text=True,
                         env=bare, cwd=os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
    os.unlink(path)
    assert results[0][1] in run.stdout


def test_digest_ignores_metadata_key_order_and_layout():
    cert = stamp(certify_torsion(parse_curve("[1,0,1,-19,26]")))
    relaid = json.loads(json.dumps(dict(reversed(list(cert.items()))), indent=7))
    relaid["metadata"] = {"written": "another day", "certify": "9.9"}
    assert digest(relaid) == digest(cert)
    del relaid["metadata"]
    assert digest(relaid) == digest(cert)


@pytest.mark.parametrize("path", [("claim", "invariants", 0), ("claim", "generators", 0, 0), ("curve", 4),
                                  ("evidence", "primes", 0, "count"), ("relies_on", 0, "key")])
def test_digest_changes_with_any_entry_of_the_content(path):
    cert = certify_torsion(parse_curve("[1,0,1,-19,26]"))
    changed = json.loads(json.dumps(cert))
    place = changed
    for step in path[:-1]:
        place = place[step]
    place[path[-1]] = place[path[-1]] + "0"
    assert digest(changed) != digest(cert)
    assert (claim_digest(changed) != claim_digest(cert)) == (path[0] == "claim")


def test_isomorphic_input_models_share_the_claim_digest():
    """y^2 + xy - (3/16)y = x^3 - (3/16)x^2 and its images under [u, r, s, t] = [1/2, 1, 3, -2] and
    [3, 0, 0, 0] (Silverman III.1) are one curve: the certificates differ, the claim digests agree, and
    the group is the one cypari2's elltors finds."""
    from certify.curves import Curve
    from certify.pari import pari

    base = Curve(parse_curve("[1,-3/16,-3/16,0,0]"))
    models = [base, base.change((Fraction(1, 2), 1, 3, -2)), base.change((3, 0, 0, 0))]
    certificates = [certify_torsion(model.a) for model in models]
    assert len({digest(cert) for cert in certificates}) == 3
    assert len({claim_digest(cert) for cert in certificates}) == 1
    reference = [str(n) for n in sorted(int(n) for n in pari.elltors(pari.ellinit([str(c) for c in base.a]))[1])]
    assert {tuple(cert["claim"]["invariants"]) for cert in certificates} == {tuple(reference)}


def test_short_digest_is_a_prefix_of_the_full_one():
    full = digest(certify_torsion(parse_curve("[0,2,0,-15,0]")))
    assert full.startswith("sha256:" + short(full)) and len(full) == 7 + 64
