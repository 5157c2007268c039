"""The reference structural check for the tests: certificates against the JSON Schemas in ``schemas/``
(draft 2020-12) with the reference library jsonschema, to which the verifier's own standard-library
schema step (``certify.verifier.schema``) must agree."""
from __future__ import annotations

import functools
import itertools
import json
from importlib import resources

import jsonschema

from certify.verifier.schema import SCHEMA_FILES


@functools.cache
def validator(format_name: str) -> jsonschema.Draft202012Validator:
    """The validator for one certificate format."""
    text = resources.files("certify.verifier").joinpath("schemas", SCHEMA_FILES[format_name]).read_text(encoding="utf-8")
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
