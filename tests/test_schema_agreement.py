"""Both verifiers say the same: the verifier's standard-library schema step (certify/verifier/schema.py),
which the bare verifier and ``certify verify`` both run, refuses exactly the documents the reference
library jsonschema (draft 2020-12, tests/schema_reference.py) finds in violation of the schemas in
schemas/ — checked on every document of the hostile-test pools and on structural damage to them: each
string replaced by a value of another type or a non-canonical spelling, each key deleted, an unknown key
added to each object, each list emptied or doubled. The long run (-m table) takes every damage of every
pool certificate.

Beyond these documents the two differ in one known way, where ours is the stricter: a pattern's final $
matches only at the end of the string, as ECMA-262 (which JSON Schema's patterns follow) defines it, while
jsonschema's Python regular expressions let it match before a final newline, so "1\\n" as a coefficient
is refused by ours and passes jsonschema (``test_a_final_newline_is_refused_by_our_schema_step_only``)."""
from __future__ import annotations

import copy
import json
import random

import pytest

from certify.verifier.schema import KEYWORDS, ANNOTATIONS, schema, schema_violations as ours
from schema_reference import schema_violations as reference
from soundness_pool import TALLY, fresh, get_at, pool

REPLACEMENTS = (7, None, True, [], {}, "x", "+1", "1/1", "-0", "")


def objects_and_lists(value, prefix=()):
    """Every path to an object or a list inside a JSON value."""
    if isinstance(value, (dict, list)):
        yield prefix, value
        children = value.items() if isinstance(value, dict) else enumerate(value)
        for key, child in children:
            yield from objects_and_lists(child, prefix + (key,))


def damages(cert: dict) -> list:
    """Every structural damage to one certificate, as functions that make the damaged document."""
    from soundness_pool import paths, put_at

    def replaced(path, new):
        def make():
            damaged = copy.deepcopy(cert)
            put_at(damaged, path, new)
            return damaged
        return make

    def edited(path, edit):
        def make():
            damaged = copy.deepcopy(cert)
            edit(get_at(damaged, path))
            return damaged
        return make

    out = [replaced(path, new) for path in paths(cert) for new in REPLACEMENTS]
    for path, container in objects_and_lists(cert):
        if isinstance(container, dict):
            out.append(edited(path, lambda target: target.update(unexpected="1")))
            out += [edited(path, lambda target, key=key: target.pop(key)) for key in container]
        else:
            out.append(edited(path, lambda target: target.clear()))
            out.append(edited(path, lambda target: target.extend(copy.deepcopy(target))))
    return out


def corpus_certificates() -> list:
    from certify.conductor import certify_conductor
    from certify.curves import parse_curve

    conductors = [certify_conductor(parse_curve(text)) for text in ("[1,0,1,-19,26]", "[0,-1,1,-10,-20]",
                                                                     "[0,0,0,-1,0]")]
    return [fresh(kind, i) for kind in ("torsion", "isogeny") for i in range(len(pool(kind)))] + conductors


def assert_agree(document) -> None:
    TALLY["inputs"] += 1
    mine, theirs = ours(document), reference(document)
    assert bool(mine) == bool(theirs), (mine, theirs, json.dumps(document)[:300])


def test_the_schemas_use_only_the_keywords_implemented():
    """Each schema uses only keywords the standard-library step implements (anything else would be refused
    there, so the two could never agree)."""
    for name in ("certify-torsion", "certify-isogeny-class", "certify-conductor"):
        used, stack = set(), [schema(name)]
        while stack:
            node = stack.pop()
            if isinstance(node, dict):
                used |= {key for key in node if key not in ("properties", "$defs")}
                stack += [v for k, v in node.items() if k not in ("properties", "$defs")]
                stack += list(node.get("properties", {}).values()) + list(node.get("$defs", {}).values())
            elif isinstance(node, list):
                stack += node
        assert used - {"type"} <= KEYWORDS | ANNOTATIONS | {"type"}, used - KEYWORDS - ANNOTATIONS


def test_every_pool_certificate_is_valid_for_both():
    for cert in corpus_certificates():
        assert ours(cert) == [] and reference(cert) == [], cert["format"]


def test_damaged_certificates_sample():
    """A fixed random sample of 1,000 damaged documents (all of them in the long run below)."""
    everything = [make for cert in corpus_certificates() for make in damages(cert)]
    for make in random.Random(9).sample(everything, 1000):
        assert_agree(make())


@pytest.mark.table
def test_damaged_certificates_all():
    count = 0
    for cert in corpus_certificates():
        for make in damages(cert):
            assert_agree(make())
            count += 1
    print(f"{count} damaged documents: the two schema steps agree on each")


def test_a_final_newline_is_refused_by_our_schema_step_only():
    """ECMA-262 (its regular-expression assertions; recalled from memory): without the multiline flag $
    asserts the end of the input, so '^(0|…)$' does not match "1\\n"; Python's re (which jsonschema uses)
    matches $ before a final newline too."""
    cert = fresh("torsion", 0)
    cert["curve"][0] += "\n"
    assert reference(cert) == [] and len(ours(cert)) == 1 and ours(cert)[0].startswith("/curve/0: ")
