"""Reading the parts every certificate shares: structure, the curve, points, and ``relies_on``."""
from certify.verifier.arith import parse_rational
from certify.verifier.curves import discriminant, on_curve
from certify.verifier.errors import Rejection
from certify.verifier.limits import MAX_DEPTH, MAX_LIST_LENGTH


def check_depth(document) -> None:
    """The JSON document nests arrays and objects at most MAX_DEPTH deep (checked without recursion)."""
    stack = [(document, 1)]
    while stack:
        value, depth = stack.pop()
        if isinstance(value, (list, dict)):
            if depth > MAX_DEPTH:
                raise Rejection("nesting depth", f"the certificate nests deeper than {MAX_DEPTH} levels")
            stack.extend((child, depth + 1) for child in (value.values() if isinstance(value, dict) else value))


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
