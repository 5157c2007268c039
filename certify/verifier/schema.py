"""The structural check of a certificate against its JSON Schema, with the standard library only, so that
the bare verifier and ``certify verify`` refuse the same documents.

The schemas (``certify/verifier/schemas/``, JSON Schema draft 2020-12; ``schemas/`` at the top of the
repository is the same folder) use only these keywords, and this module implements exactly them: type,
properties, required, additionalProperties, items, minItems, maxItems, minLength, pattern (searched, as
the draft prescribes, with ECMA-262's '$' at the end: see ``ecma_pattern``), const, enum, and $ref to "#/$defs/NAME"; the annotations
$schema, $id, title and description are skipped. Any other keyword makes the schema unusable here (it is
refused when the schema is first used), which the tests check, along with agreement with the reference
library jsonschema on every hostile-test document.
"""
import json
import os
import re

SCHEMA_FILES = {
    "certify-torsion": "torsion.schema.json",
    "certify-isogeny-class": "isogeny-class.schema.json",
    "certify-conductor": "conductor.schema.json",
    "certify-rank": "rank.schema.json",
}

ANNOTATIONS = {"$schema", "$id", "title", "description", "$defs"}
KEYWORDS = {"type", "properties", "required", "additionalProperties", "items", "minItems", "maxItems",
            "minLength", "pattern", "const", "enum", "$ref"}

JSON_TYPES = {"object": dict, "array": list, "string": str, "boolean": bool, "null": type(None)}

_SCHEMAS = {}


def schema(format_name: str) -> dict:
    """The parsed schema of a certificate format, read once through this package's loader (from the file
    system or from inside a kit)."""
    if format_name not in _SCHEMAS:
        if hasattr(__loader__, "archive"):  # inside a kit: the member's name in the archive
            path = "certify/verifier/schemas/" + SCHEMA_FILES[format_name]
        else:
            path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "schemas", SCHEMA_FILES[format_name])
        _SCHEMAS[format_name] = json.loads(__loader__.get_data(path).decode("utf-8"))
    return _SCHEMAS[format_name]


_COMPILED = {}
PLAIN_STRING = {"type", "minLength", "pattern", "compiled pattern", "plain string"}
"""The keys of a compiled node that asks only for a string (of some length, matching some pattern): most
leaves of the schemas, tested in one step by ``conforms`` (see ``check_node``)."""


def compiled(format_name: str) -> dict:
    """The schema with every $ref replaced by the definition it names (the definitions do not refer to
    themselves), every pattern compiled (with ``ecma_pattern``'s '$') and every keyword checked to be one
    implemented here; done once per format."""
    if format_name not in _COMPILED:
        root = schema(format_name)

        def resolve(node):
            if isinstance(node, list):
                return [resolve(item) for item in node]
            if not isinstance(node, dict):
                return node
            if "$ref" in node:
                ref = node["$ref"]
                if not ref.startswith("#/$defs/"):
                    raise ValueError(f"the schema of {format_name} refers outside itself: {ref}")
                merged = dict(root["$defs"][ref[len("#/$defs/"):]])
                merged.update((k, v) for k, v in node.items() if k not in ANNOTATIONS and k != "$ref")
                return resolve(merged)
            unknown = set(node) - KEYWORDS - ANNOTATIONS
            if unknown:
                raise ValueError(f"the schema of {format_name} uses keywords not implemented here: {sorted(unknown)}")
            out = {}
            for key, value in node.items():
                if key in ("properties",):
                    out[key] = {name: resolve(child) for name, child in value.items()}
                elif key in ("items", "additionalProperties"):
                    out[key] = resolve(value)
                elif key == "pattern":
                    out[key] = value
                    out["compiled pattern"] = re.compile(ecma_pattern(value))
                elif key not in ANNOTATIONS:
                    out[key] = value
            out["plain string"] = out.get("type") == "string" and set(out) <= PLAIN_STRING
            return out
        _COMPILED[format_name] = resolve(root)
    return _COMPILED[format_name]


def schema_violations(document, most: int = 3) -> list:
    """The first ``most`` violations of the document's schema, each as 'path: message', in document order;
    a document of no known format gets none (the verifier rejects it by name)."""
    if not (isinstance(document, dict) and isinstance(document.get("format"), str)
            and document["format"] in SCHEMA_FILES):
        return []
    found = []
    stack = [(document, compiled(document["format"]), None)]
    while stack and len(found) < most:
        value, node, path = stack.pop()
        violations, children = check_node(value, node, path)
        found += violations
        stack += reversed(children)
    return found[:most]


def check_node(value, node: dict, path) -> tuple:
    """([violation, …], [(child value, child schema, child path), …]) for one value against one compiled
    schema node; a child that ``conforms`` is left out. A path is None (the document) or (parent path,
    key), spelled out only for a violation."""
    if "type" in node and not has_type(value, node["type"]):
        return [f"{spelled(path)}: {short(value)} is not of type {node['type']!r}"], []
    out, children = [], []
    if "const" in node and value != node["const"]:
        out.append(f"{spelled(path)}: {node['const']!r} was expected")
    if "enum" in node and value not in node["enum"]:
        out.append(f"{spelled(path)}: {short(value)} is not one of {node['enum']!r}")
    if isinstance(value, str):
        if len(value) < node.get("minLength", 0):
            out.append(f"{spelled(path)}: {short(value)} is too short")
        if "pattern" in node and not node["compiled pattern"].search(value):
            out.append(f"{spelled(path)}: {short(value)} does not match {node['pattern']!r}")
    elif isinstance(value, list):
        if len(value) < node.get("minItems", 0):
            out.append(f"{spelled(path)}: {short(value)} should be non-empty" if node["minItems"] == 1
                       else f"{spelled(path)}: {short(value)} is too short")
        if "maxItems" in node and len(value) > node["maxItems"]:
            out.append(f"{spelled(path)}: {short(value)} is too long")
        if "items" in node:
            items = node["items"]
            children = [(item, items, (path, i)) for i, item in enumerate(value) if not conforms(item, items)]
    elif isinstance(value, dict):
        missing = [key for key in node.get("required", ()) if key not in value]
        if missing:
            out.append(f"{spelled(path)}: {missing[0]!r} is a required property")
        properties = node.get("properties", {})
        extra = [key for key in value if key not in properties]
        if extra and node.get("additionalProperties", True) is False:
            out.append(f"{spelled(path)}: additional properties are not allowed ({short(extra[0])} was unexpected)")
        children = [(value[key], properties[key], (path, key)) for key in value
                    if key in properties and not conforms(value[key], properties[key])]
        if isinstance(node.get("additionalProperties"), dict):
            children += [(value[key], node["additionalProperties"], (path, key)) for key in extra]
    return out, children


def conforms(value, node: dict) -> bool:
    """True when the node asks only for a string and the value is one that it accepts: then check_node
    would find no violation and no child in it, and the walk can leave it out."""
    return (node["plain string"] and isinstance(value, str) and len(value) >= node.get("minLength", 0)
            and ("pattern" not in node or node["compiled pattern"].search(value) is not None))


def spelled(path) -> str:
    """'/' for the document, else '/key/index/…' from the root."""
    keys = []
    while path is not None:
        path, key = path
        keys.append(f"/{key}")
    return "".join(reversed(keys)) or "/"


def ecma_pattern(pattern: str) -> str:
    """The pattern for Python's re with ECMA-262's meaning of a final '$' (the end of the string; Python's
    '$' also matches before a final newline, so that "1\\n" would pass '^[0-9]+$')."""
    return pattern[:-1] + "\\Z" if pattern.endswith("$") and not pattern.endswith("\\$") else pattern


def has_type(value, name) -> bool:
    """JSON Schema's types for a parsed JSON value (a boolean is not an integer or a number)."""
    if isinstance(name, list):
        return any(has_type(value, n) for n in name)
    if name in ("integer", "number"):
        return isinstance(value, int) and not isinstance(value, bool)
    return isinstance(value, JSON_TYPES[name]) and not (name != "boolean" and isinstance(value, bool))


def short(value) -> str:
    text = repr(value)
    return text if len(text) <= 60 else text[:59] + "…"
