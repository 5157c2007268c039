"""A pool of genuine rank certificates and the mutations of them that the hostile rank tests throw at the
verifier (tests/test_rank_hostile.py), with the soundness oracle they are judged by.

The pool: curves of Cremona's tables (the fixture tests/data/rank_lt_1000.txt, from Debian pari-elldata,
whose ranks are proven), certified by ``certify.rank.certificate.certify_rank``, chosen to cover every
kind of evidence the format has (exclusions at infinity, at 2 and at odd primes, deep disc covers, local
generators, open bounds, rank 2, no descent), plus rational models of some of them (isomorphic curves,
the same rank). The truth for a curve outside the pool comes from cypari2's ``ellrank`` (reference library).

The oracle (``assert_sound``): a mutant is either rejected with the verifier's ``Rejection`` (never another
exception), or its bounds contain the true rank; and when it carries a descent with the same
y² = x³ + a x² + b x as a genuine certificate, its Selmer dimensions are the genuine ones, since the group
S_T of the verifier's docstring is a function of a and b alone (T = {∞, 2} ∪ {p | b(a² − 4b)}, V and the
local conditions all come from a and b), and a genuine certificate proves S_T = W exactly.
"""
from __future__ import annotations

import copy
import functools
import random
from fractions import Fraction

from certify.rank.certificate import certify_rank
from certify.verifier import verify
from certify.verifier.curves import add, change_model, multiple, negate
from certify.verifier.errors import Rejection
from rank_reference import ellrank_bounds, fixture_rows, two_torsion_points
from soundness_pool import get_at, paths, put_at

TABLE = fixture_rows("rank_lt_1000.txt")

POOL_CURVES = (
    (11, 0, (0, -1, 1, -10, -20)), (15, 0, (1, 1, 1, -110, -880)), (19, 0, (0, 1, 1, -9, -15)),
    (21, 0, (1, 0, 0, -4, -1)), (24, 0, (0, -1, 0, -24, -36)), (26, 0, (1, 0, 1, 0, 0)), (30, 0, (1, 0, 1, 1, 2)),
    (40, 0, (0, 0, 0, -2, 1)), (42, 0, (1, 1, 1, 386, 1277)), (45, 0, (1, -1, 0, -90, 175)),
    (52, 0, (0, 0, 0, -4, -3)), (61, 0, (1, 0, 0, -2, 1)), (63, 0, (1, -1, 0, -351, -2430)), (64, 0, (0, 0, 0, 1, 0)),
    (82, 0, (1, 0, 1, -12, -16)), (102, 0, (1, 1, 0, 8, 10)), (117, 0, (1, -1, 1, -176, -768)),
    (123, 0, (0, 1, 1, 20, -890)), (128, 2, (0, -1, 0, 1, -1)), (162, 0, (1, -1, 0, 39, -19)),
    (170, 0, (1, 0, 1, -8, 6)), (220, 0, (0, 1, 0, -445, -3720)), (240, 0, (0, -1, 0, -15, -18)),
    (256, 0, (0, 1, 0, -13, -21)), (315, 1, (1, -1, 1, -68, 182)), (342, 2, (1, -1, 0, -72, 0)),
    (342, 4, (1, -1, 0, -33, -65)), (640, 4, (0, -1, 0, -66, 230)), (640, 7, (0, 1, 0, -265, 1575)),
    (664, 0, (0, 0, 0, -7, 10)), (707, 0, (0, 1, 1, -12, 12)), (768, 5, (0, -1, 0, -7, -5)),
    (780, 2, (0, 1, 0, -81, 0)), (997, 2, (0, -1, 1, -24, 54)),
    (438, 4, (1, 0, 1, -130, -556)), (442, 0, (1, -1, 1, 36, 1193)), (582, 3, (1, 0, 0, -14, -12)),
)
"""Table curves (conductor, class index, coefficients) of the pool: up to three for each combination of
evidence features that the certifier produces on every 7th curve of the table, among those it certifies
in a fraction of a second, and three whose descents do not close and use local generators (found by a
survey of the table; the features are asserted by a test)."""

CONGRUENT_CURVES = ((0, 0, 0, -25, 0), (0, 0, 0, -1156, 0))
"""y² = x³ − n²x for n = 5 and 34 (ranks 1 and 2, cypari2 ellrank; full 2-torsion, two descents)."""

RATIONAL_CHANGES = ((Fraction(2), Fraction(1), Fraction(0), Fraction(0)),
                    (Fraction(1, 3), Fraction(-1, 2), Fraction(1), Fraction(0)))
"""Changes of variables [u, r, s, t] (Silverman III.1) giving rational, non-minimal models of pool curves."""


def features(cert: dict) -> tuple:
    """What kinds of evidence a certificate uses, as a sorted tuple of words."""
    found = {f"rank {cert['claim']['rank_lower']}"}
    descent = cert["evidence"]["descent"]
    if descent is None:
        return tuple(sorted(found | {"no descent"}))
    if cert["claim"]["rank_upper"] != cert["claim"]["rank_lower"]:
        found.add("open")
    for side in ("phi", "phi_dual"):
        if descent[side]["local_generators"]:
            found.add("generators")
        for exclusion in descent[side]["exclusions"]:
            place = exclusion["place"]
            found.add("at infinity" if place == "infinity" else "at 2" if place == "2" else "at an odd prime")
            if any(k not in ("0", "1") for _, k in exclusion.get("t_discs", []) + exclusion.get("s_discs", [])):
                found.add("deep discs")
    return tuple(sorted(found))


def rational_model(a: tuple, change: tuple) -> tuple:
    """The coefficients of the model that ``change`` takes the curve a to (an isomorphic curve)."""
    return change_model(tuple(Fraction(c) for c in a), change)


@functools.cache
def pool() -> tuple:
    """((certificate, rank), …): genuine certificates, each accepted by the verifier, with the rank from
    Cremona's tables (cypari2's ellrank for the congruent-number curves, where it is determined)."""
    ranks = {a: rank for _, _, rank, a in TABLE}
    curves = [(a, ranks[a]) for _, _, a in POOL_CURVES]
    for a in CONGRUENT_CURVES:
        low, high = ellrank_bounds(a)
        assert low == high
        curves.append((a, low))
    chosen = [(certify_rank(tuple(Fraction(c) for c in a), seconds=5), rank) for a, rank in curves]
    with_descent = [(cert, rank) for cert, rank in chosen if cert["evidence"]["descent"]]
    for (cert, rank), change in zip(with_descent, RATIONAL_CHANGES):
        chosen.append((certify_rank(rational_model(tuple(Fraction(c) for c in cert["curve"]), change), seconds=5),
                       rank))
    for cert, _ in chosen:
        verify(cert)
    return tuple(chosen)


def fresh(index: int) -> dict:
    return copy.deepcopy(pool()[index][0])


@functools.cache
def genuine_dimensions() -> dict:
    """{(a, b): (dim S_T, dim S̄_T)} from the pool's descents."""
    return {(cert["evidence"]["descent"]["a"], cert["evidence"]["descent"]["b"]):
            tuple(cert["claim"]["selmer_dimensions"][k] for k in ("phi", "phi_dual"))
            for cert, _ in pool() if cert["evidence"]["descent"]}


@functools.cache
def true_rank_bounds(curve: tuple) -> tuple:
    """(r_lo, r_hi) with r_lo ≤ rank ≤ r_hi: the table's rank for a pool curve, else cypari2's ellrank."""
    for cert, rank in pool():
        if tuple(cert["curve"]) == curve:
            return rank, rank
    return ellrank_bounds([Fraction(c) for c in curve])


def assert_sound(cert) -> "Rejection | None":
    """The soundness rule: rejected by Rejection, or accepted with true bounds and Selmer dimensions."""
    try:
        verify(cert)
    except Rejection as rejection:
        return rejection
    claim = cert["claim"]
    low, high = true_rank_bounds(tuple(cert["curve"]))
    lower = int(claim["rank_lower"])
    assert lower <= high, f"accepted rank_lower {lower} above the rank (at most {high})"
    if claim["rank_upper"] is not None:
        assert int(claim["rank_upper"]) >= low, f"accepted rank_upper {claim['rank_upper']} below the rank ({low})"
    descent = cert["evidence"]["descent"]
    if descent is not None and (descent["a"], descent["b"]) in genuine_dimensions():
        claimed = tuple(claim["selmer_dimensions"][k] for k in ("phi", "phi_dual"))
        assert claimed == genuine_dimensions()[(descent["a"], descent["b"])], "accepted Selmer dimensions differ"
    return None


# --- mutations: each takes (certificate, random) and changes the certificate in place -----------------------

def respelled(text: str, rnd: random.Random, cert: dict) -> str:
    """A nearby or borrowed value for a number string."""
    leaves = [get_at(cert["evidence"], p) for p in paths(cert["evidence"])] or ["1"]
    try:
        value = Fraction(text)
    except (ValueError, ZeroDivisionError):
        return rnd.choice(leaves)
    choices = [value + 1, value - 1, -value, 2 * value, value / 2 if value else Fraction(1), Fraction(0),
               Fraction(1), Fraction(2), Fraction(-1), value + 8, value * 4, value + 3, value * 9]
    return rnd.choice([str(rnd.choice(choices))] * 4 + [rnd.choice(leaves)])


def change_number(cert: dict, rnd: random.Random) -> None:
    path = rnd.choice(paths({k: cert[k] for k in ("curve", "claim", "evidence")}))
    put_at(cert, path, respelled(get_at(cert, path), rnd, cert))


def lists_in(value, prefix=()) -> list:
    """Every (path, list) inside a JSON value."""
    out = []
    if isinstance(value, list):
        out.append((prefix, value))
    children = value.items() if isinstance(value, dict) else enumerate(value) if isinstance(value, list) else ()
    for key, child in children:
        out += lists_in(child, prefix + (key,))
    return out


def evidence_lists(cert: dict) -> list:
    return [(path, value) for path, value in lists_in({"claim": cert["claim"], "evidence": cert["evidence"]})
            if value and not all(isinstance(v, str) for v in value)]


def drop_entry(cert: dict, rnd: random.Random) -> None:
    lists = evidence_lists(cert)
    if lists:
        _, target = rnd.choice(lists)
        target.pop(rnd.randrange(len(target)))


def duplicate_entry(cert: dict, rnd: random.Random) -> None:
    lists = evidence_lists(cert)
    if lists:
        _, target = rnd.choice(lists)
        target.append(copy.deepcopy(rnd.choice(target)))


def swap_entries(cert: dict, rnd: random.Random) -> None:
    lists = [(p, v) for p, v in evidence_lists(cert) if len(v) > 1]
    if lists:
        _, target = rnd.choice(lists)
        i, j = rnd.sample(range(len(target)), 2)
        target[i], target[j] = target[j], target[i]


def lower_upper_bound(cert: dict, rnd: random.Random) -> None:
    """rank_upper one less, the Selmer dimensions lowered to match, and the exclusion list of one side
    cut or not: a false bound stated consistently."""
    claim, descent = cert["claim"], cert["evidence"]["descent"]
    if descent is None:
        claim["rank_upper"], claim["selmer_dimensions"] = str(int(claim["rank_lower"])), {"phi": "1", "phi_dual": "1"}
        return
    side = rnd.choice(("phi", "phi_dual"))
    claim["rank_upper"] = str(int(claim["rank_upper"]) - 1)
    claim["selmer_dimensions"][side] = str(int(claim["selmer_dimensions"][side]) - 1)
    if rnd.random() < 0.5 and descent[side]["points"]:
        descent[side]["points"].pop(rnd.randrange(len(descent[side]["points"])))


def raise_lower_bound(cert: dict, rnd: random.Random) -> None:
    """One more claimed point: a multiple, a negative, a sum with a point of order 2 or with another point,
    or a point of the descent's curves; rank_lower raised to match."""
    a = tuple(Fraction(c) for c in cert["curve"])
    points = [tuple(Fraction(v) for v in P) for P in cert["claim"]["points"]]
    torsion = [tuple(P) for P in two_torsion_points(a)]
    candidates = []
    if points:
        P = rnd.choice(points)
        candidates += [multiple(a, rnd.choice((2, 3, 5)), P), negate(a, P)]
        candidates += [add(a, P, T) for T in torsion]
        if len(points) > 1:
            candidates.append(add(a, points[0], points[1]))
    candidates += torsion
    descent = cert["evidence"]["descent"]
    borrowed = [P for side in ("phi", "phi_dual") for P in (descent[side]["points"] if descent else [])]
    candidates = [[str(v) for v in P] for P in candidates if P is not None] + borrowed
    if candidates:
        cert["claim"]["points"].append(rnd.choice(candidates))
        cert["claim"]["rank_lower"] = str(len(cert["claim"]["points"]))
        if descent and int(cert["claim"]["rank_upper"]) < len(cert["claim"]["points"]):
            cert["claim"]["rank_upper"] = cert["claim"]["rank_lower"]


def move_exclusion(cert: dict, rnd: random.Random) -> None:
    """An exclusion's place, element or discs changed: another place of T, infinity, or the other chart."""
    descent = cert["evidence"]["descent"]
    if descent is None:
        return
    exclusions = descent["phi"]["exclusions"] + descent["phi_dual"]["exclusions"]
    if not exclusions:
        return
    exclusion = rnd.choice(exclusions)
    places = ["infinity", "2"] + [f["prime"] for f in descent["factorisation_b"] + descent["factorisation_b_dual"]]
    how = rnd.randrange(4)
    if how == 0:
        exclusion["place"] = rnd.choice(places)
        exclusion.setdefault("t_discs", [["0", "0"]])
        exclusion.setdefault("s_discs", [["0", "1"]])
    elif how == 1:
        exclusion["d"] = str(-int(exclusion["d"]))
    elif how == 2 and "t_discs" in exclusion:
        exclusion["t_discs"], exclusion["s_discs"] = exclusion["s_discs"], exclusion["t_discs"]
    elif "t_discs" in exclusion:
        exclusion["t_discs"] = [["0", "0"]]


def swap_sides(cert: dict, rnd: random.Random) -> None:
    descent = cert["evidence"]["descent"]
    if descent is not None:
        descent["phi"], descent["phi_dual"] = descent["phi_dual"], descent["phi"]
        if rnd.random() < 0.5:
            dims = cert["claim"]["selmer_dimensions"]
            dims["phi"], dims["phi_dual"] = dims["phi_dual"], dims["phi"]


def foreign_part(cert: dict, rnd: random.Random) -> None:
    """A part of another pool certificate put in: its curve, claim, descent, one descent side or its
    independence evidence."""
    other = copy.deepcopy(rnd.choice(pool())[0])
    what = rnd.randrange(5)
    if what == 0:
        cert["curve"] = other["curve"]
    elif what == 1:
        cert["claim"] = other["claim"]
    elif what == 2:
        cert["evidence"]["descent"] = other["evidence"]["descent"]
    elif what == 3 and cert["evidence"]["descent"] and other["evidence"]["descent"]:
        side = rnd.choice(("phi", "phi_dual"))
        cert["evidence"]["descent"][side] = other["evidence"]["descent"][side]
    else:
        cert["evidence"]["independence"] = other["evidence"]["independence"]


def wrong_type(cert: dict, rnd: random.Random) -> None:
    """A value replaced by one of another JSON type, or an object's key removed."""
    path = rnd.choice(paths({k: cert[k] for k in ("curve", "claim", "evidence")}))
    cut = rnd.randrange(1, len(path) + 1)
    target = path[:cut]
    if rnd.random() < 0.3 and isinstance(get_at(cert, target[:-1]), dict):
        get_at(cert, target[:-1]).pop(target[-1])
    else:
        put_at(cert, target, rnd.choice((None, 7, True, [], {}, "", [["0", "0"]], {"prime": "2"})))


MUTATIONS = (change_number, change_number, change_number, drop_entry, duplicate_entry, swap_entries,
             lower_upper_bound, raise_lower_bound, move_exclusion, swap_sides, foreign_part, wrong_type)
"""The mutation operators, number changes weighted three times."""


def mutant(seed: int) -> tuple:
    """(index of the pool certificate, the mutated certificate, names of the mutations) for one seed:
    one to three random mutations of one pool certificate."""
    rnd = random.Random(seed)
    index = rnd.randrange(len(pool()))
    cert, names = fresh(index), []
    for _ in range(rnd.choice((1, 1, 2, 3))):
        mutation = rnd.choice(MUTATIONS)
        try:
            mutation(cert, rnd)
        except (KeyError, TypeError, AttributeError, IndexError, ValueError, ZeroDivisionError):
            break   # an earlier mutation broke the shape this one reads: the mutant stays as it is
        names.append(mutation.__name__)
    return index, cert, names


@functools.cache
def side_on_e() -> str:
    """The name of the descent side ("phi" or "phi_dual") whose curve is E: y² = x³ + a x² + b x itself (the other
    is Ē: y² = x³ − 2a x² + (a² − 4b) x), found by offering the verifier, on each side of a genuine
    certificate, the image on E of a point of the input curve: only E's side accepts it."""
    from certify.verifier.curves import change_point
    for cert, _ in pool():
        descent = cert["evidence"]["descent"]
        if descent is None or not cert["claim"]["points"]:
            continue
        change = tuple(Fraction(v) for v in descent["change"])
        point = [str(v) for v in change_point(tuple(Fraction(v) for v in cert["claim"]["points"][0]), change)]
        for side in ("phi", "phi_dual"):
            probe = copy.deepcopy(cert)
            probe["evidence"]["descent"][side]["points"].append(point)
            try:
                verify(probe)
                return side
            except Rejection:
                continue
    raise AssertionError("neither side of a descent takes a point of E")


def side_curve(cert: dict, side: str) -> tuple:
    """(A, B, the key of the factorisation of B) of one side of the certificate's descent."""
    descent = cert["evidence"]["descent"]
    a, b = int(descent["a"]), int(descent["b"])
    if side == side_on_e():
        return a, b, "factorisation_b"
    return -2 * a, a * a - 4 * b, "factorisation_b_dual"
