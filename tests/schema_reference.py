"""The front end's structural check: certificates against the JSON Schemas in ``schemas/`` (draft
2020-12, with jsonschema). ``certify verify`` runs it before the standard-library verifier, which
repeats its own structural checks so that it stays safe without jsonschema."""
from __future__ import annotations

import functools
import itertools
import json
from importlib import resources

import jsonschema

SCHEMA_FILES = {
    "certify-torsion": "torsion.schema.json",
    "certify-isogeny-class": "isogeny-class.schema.json",
    "certify-conductor": "conductor.schema.json",
}


@functools.cache
def validator(format_name: str) -> jsonschema.Draft202012Validator:
    """The validator for one certificate format."""
    text = resources.files("certify").joinpath("schemas", SCHEMA_FILES[format_name]).read_text(encoding="utf-8")
    return jsonschema.Draft202012Validator(json.loads(text))


def schema_violations(cert, most: int = 3) -> list[str]:
    """The first ``most`` violations of the certificate's schema, each as 'path: message'; the search
    stops at the ``most``-th, so a document with a million faults costs no more than one with three.

    A document of no known format gets none here: the verifier rejects it by name.
    """
    if not isinstance(cert, dict) or not isinstance(cert.get("format"), str) or cert["format"] not in SCHEMA_FILES:
        return []
    errors = itertools.islice(validator(cert["format"]).iter_errors(cert), most)
    return ["/" + "/".join(str(part) for part in error.absolute_path)[:200] + f": {error.message[:160]}"
            for error in errors]
