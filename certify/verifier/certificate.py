"""Reading the parts every certificate shares: structure, the curve, points, and ``relies_on``."""
from certify.verifier.arith import parse_rational
from certify.verifier.curves import discriminant, on_curve
from certify.verifier.errors import Rejection
from certify.verifier.limits import MAX_DEPTH, MAX_LIST_LENGTH, MAX_STRING_LENGTH


def check_shape(document) -> None:
    """The limits every JSON value must meet before any check looks at it, walked without recursion:
    arrays and objects nested at most MAX_DEPTH deep, at most MAX_LIST_LENGTH entries in each, strings
    (keys included) of at most MAX_STRING_LENGTH characters and valid Unicode (no lone surrogate)."""
    stack = [(document, 1)]
    while stack:
        value, depth = stack.pop()
        if isinstance(value, str):
            check_string(value)
        elif isinstance(value, (list, dict)):
            if depth > MAX_DEPTH:
                raise Rejection("nesting depth", f"the document nests deeper than {MAX_DEPTH} levels")
            if len(value) > MAX_LIST_LENGTH:
                raise Rejection("list size", f"a list or object has more than {MAX_LIST_LENGTH} entries",
                                length=len(value))
            if isinstance(value, dict):
                for key in value:
                    check_string(key)
            stack.extend((child, depth + 1) for child in (value.values() if isinstance(value, dict) else value))


def check_string(text) -> None:
    """A string within MAX_STRING_LENGTH characters that UTF-8 can encode (JSON escapes such as
    \\ud800 can spell a lone surrogate, which is not a character)."""
    if not isinstance(text, str):
        raise Rejection("structure", "an object key is not a string", found=type(text).__name__)
    if len(text) > MAX_STRING_LENGTH:
        raise Rejection("string size", f"a string has more than {MAX_STRING_LENGTH} characters", length=len(text))
    try:
        text.encode("utf-8")
    except UnicodeEncodeError:
        raise Rejection("string syntax", "a string holds a lone surrogate, which is not a Unicode character")


def field(obj, key: str, kind, where: str):
    """obj[key], which must exist and have the JSON type ``kind`` (dict, list or str)."""
    if not isinstance(obj, dict) or key not in obj:
        raise Rejection("structure", f"{where} has no field {key!r}")
    value = obj[key]
    if not isinstance(value, kind):
        raise Rejection("structure", f"{where}.{key} must be a {kind.__name__}", found=type(value).__name__)
    if isinstance(value, list) and len(value) > MAX_LIST_LENGTH:
        raise Rejection("list size", f"{where}.{key} has more than {MAX_LIST_LENGTH} entries", length=len(value))
    return value


def rationals(values, count: int, what: str) -> tuple:
    """A list of exactly ``count`` canonical rational strings."""
    if not isinstance(values, list) or len(values) != count:
        raise Rejection("structure", f"{what} must be a list of {count} numbers", found=values)
    return tuple(parse_rational(v, f"{what}[{i}]") for i, v in enumerate(values))


def read_curve(coefficients, what: str) -> tuple:
    """Five coefficients [a1, a2, a3, a4, a6] of a non-singular curve."""
    a = rationals(coefficients, 5, what)
    if discriminant(a) == 0:
        raise Rejection("curve", f"{what} is singular (discriminant 0)", curve=coefficients)
    return a


def read_point(a, value, what: str):
    """An affine point [x, y] that lies on the curve a."""
    point = rationals(value, 2, what)
    if not on_curve(a, point):
        raise Rejection("point on curve", f"{what} does not lie on the curve", point=value)
    return point


def check_relies_on(cert: dict, required: dict) -> list:
    """Every theorem the checks use must be listed, by key, in ``relies_on``; returns the entries."""
    entries = field(cert, "relies_on", list, "certificate")
    listed = {}
    for i, entry in enumerate(entries):
        for key in ("key", "statement", "reference"):
            field(entry, key, str, f"relies_on[{i}]")
        listed[entry["key"]] = entry
    missing = sorted(set(required) - set(listed))
    if missing:
        raise Rejection("relies_on", "the certificate does not list every theorem its checks use", missing=missing)
    return [listed[key] for key in required]
