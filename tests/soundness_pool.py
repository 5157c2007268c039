"""Shared helpers for the soundness tests (issue 6, items 3 and 5): a pool of valid certificates of both
kinds, the reference oracle ``claim_is_true``, the soundness rule ``assert_sound``, and the mutation
strategies, one small named function each, grouped by the attack class that uses them.

The reference library is cypari2 (PARI): ``elltors`` for E(Q)_tors, ``ellisomat`` for the isogeny
class, ``ellminimalmodel`` for reduced minimal models. Nothing here trusts the verifier under test; the
certifier and the verifier's polynomial builders are used only to *construct* plausible evidence, whose
truth the verifier must judge by itself.
"""
from __future__ import annotations

import copy
import os
import random
import sys
from collections import Counter
from fractions import Fraction

import pytest
from hypothesis import HealthCheck, given, settings, strategies as st

from certify.curves import parse_curve
from certify.isogeny.certificate import certify_isogeny_class
from certify.pari import pari
from certify.torsion import certify_torsion
from certify.verifier import verify
from certify.verifier.errors import Rejection

# --- the pool --------------------------------------------------------------------------------------

TORSION_CURVES = (
    "[1,0,1,-19,26]",                          # Z/2 x Z/6
    "[1,1,1,-10,-10]",                         # Z/2 x Z/4
    "y^2 + x*y - 3/16*y = x^3 - 3/16*x^2",     # Z/2 x Z/4 on a non-integral model
    "y^2 - 7/3*x*y - 10*y = x^3 - 10*x^2",     # Z/2 x Z/8 on a non-integral model
    "[43,-210,-210,0,0]",                      # Kubert's Z/12 family at t = 2 (math notes)
    "[1,-1,1,-3,3]",                           # Z/7
    "[0,-1,1,0,0]",                            # Z/5
    "[0,0,0,0,1]",                             # Z/6, j = 0
    "[0,-1,1,-7820,-263580]",                  # trivial, 5 | every #E(F_p): an l-part for l = 5
    "[1,1,1,-135,-660]",                       # Z/2 x Z/2 with an l-part for l = 2 (three classes)
    "[1,0,1,-454,-544]",                       # Z/2 with l-parts for l = 2 and l = 3
    "[1,1,1,-80,242]",                         # Z/4 with an l-part for l = 2
    "[0,1,1,-2,7]",                            # trivial
    "[1/2,0,0,3,5/4]",                         # trivial on a non-integral model
)
"""Curves (by coefficients) whose torsion certificates form the pool; the comments are orientation only —
every test takes the truth from the reference library."""

ISOGENY_CURVES = (
    "[0,-1,1,-10,-20]",                        # 5-isogenies, three curves
    "[1,1,1,-3,1]",                            # 3- and 5-isogenies, four curves
    "[0,0,0,-1,0]",                            # full 2-torsion, j = 1728
    "[0,0,0,0,5]",                             # a 3-isogeny, j = 0 (division-roots witnesses)
    "[1,1,0,-2,-1]",                           # one 2-isogeny
    "[0,1,1,-2,7]",                            # a class of one curve
    "[0,-1,1,-887,-10143]",                    # an 11-isogeny (j-list witnesses)
    "[1,-1,1,-1,-14]",                         # 2-isogenies, four curves
    "y^2 + x*y - 3/16*y = x^3 - 3/16*x^2",     # non-integral input, six curves
    "[0,0,0,-8497955340,286449078600720]",     # Sutherland 2012: j = 2268945/128, no 7-isogeny over Q
)
"""Curves whose isogeny-class certificates form the pool (small classes, so each full check is cheap)."""

_POOL: dict = {}


def pool(kind: str) -> list:
    """The valid certificates of one kind ('torsion' or 'isogeny'), built once per session; callers get
    deep copies through ``fresh``."""
    if kind not in _POOL:
        make = certify_torsion if kind == "torsion" else certify_isogeny_class
        texts = TORSION_CURVES if kind == "torsion" else ISOGENY_CURVES
        _POOL[kind] = [make(parse_curve(text)) for text in texts]
    return _POOL[kind]


def fresh(kind: str, index: int) -> dict:
    """A deep copy of pool certificate ``index`` (modulo the pool size) of the given kind."""
    certificates = pool(kind)
    return copy.deepcopy(certificates[index % len(certificates)])


def any_certificate(rnd: random.Random) -> dict:
    """A copy of a random pool certificate of either kind."""
    kind = rnd.choice(("torsion", "isogeny"))
    return fresh(kind, rnd.randrange(len(pool(kind))))


# --- the reference oracle (cypari2) ------------------------------------------------------------------

def pari_curve(coefficients):
    """PARI's ellinit of five rational coefficients given as strings or Fractions."""
    return pari.ellinit([pari(str(Fraction(str(c)))) for c in coefficients])


def reduced_minimal(coefficients) -> tuple:
    """The reduced minimal model by cypari2's ellminimalmodel (unique: Cremona, Algorithms, §3.2)."""
    return tuple(int(c) for c in pari.ellminimalmodel(pari_curve(coefficients))[:5])


def torsion_claim_is_true(cert: dict) -> bool:
    """Whether E(Q)_tors ≅ Z/n1 × Z/n2 with generators of orders n1, n2 that generate it, by cypari2's
    elltors (the group and its invariants), ellisoncurve, ellorder and elladd."""
    E = pari_curve(cert["curve"])
    order, cyclic, _ = pari.elltors(E)
    claimed = [int(Fraction(n)) for n in cert["claim"]["invariants"]]
    if claimed != [int(n) for n in reversed(list(cyclic))]:
        return False
    points = [[pari(str(Fraction(c))) for c in P] for P in cert["claim"]["generators"]]
    if len(points) != len(claimed) or not all(pari.ellisoncurve(E, P) for P in points):
        return False
    if any(int(pari.ellorder(E, P)) != n for P, n in zip(points, claimed)):
        return False
    elements = {"O"}
    if len(points) == 1:
        elements |= {str(pari.ellmul(E, points[0], i)) for i in range(claimed[0])}
    elif len(points) == 2:
        elements |= {str(pari.elladd(E, pari.ellmul(E, points[0], i), pari.ellmul(E, points[1], j)))
                     for i in range(claimed[0]) for j in range(claimed[1])}
    elements = {e if e != "[0]" else "O" for e in elements}
    return len(elements) == int(order)


def isogeny_claim_is_true(cert: dict) -> bool:
    """Whether the listed curves are, up to isomorphism over Q, exactly the rational isogeny class of the
    curve with exactly cypari2's ellisomat degree matrix up to reordering; isomorphism is decided by
    equal reduced minimal models (and ellisisom where this PARI has it)."""
    E = pari_curve(cert["curve"])
    curves, matrix = pari.ellisomat(E)
    reference = [reduced_minimal(list(entry[0])) for entry in curves]
    listed = [reduced_minimal(model) for model in cert["claim"]["curves"]]
    if sorted(listed) != sorted(reference) or len(set(listed)) != len(listed):
        return False
    if hasattr(pari, "ellisisom"):
        if not all(pari.ellisisom(pari_curve(model), pari_curve(reference[reference.index(m)]))
                   for model, m in zip(cert["claim"]["curves"], listed)):
            return False
    where = [reference.index(m) for m in listed]
    degrees = cert["claim"]["degrees"]
    return all(int(Fraction(degrees[i][j])) == int(matrix[where[i]][where[j]])
               for i in range(len(listed)) for j in range(len(listed)))


def claim_is_true(cert: dict) -> bool:
    """The reference library's verdict on the certificate's claim about its curve."""
    if cert.get("format") == "certify-torsion":
        return torsion_claim_is_true(cert)
    if cert.get("format") == "certify-isogeny-class":
        return isogeny_claim_is_true(cert)
    raise AssertionError(f"the verifier accepted a certificate of unknown format {cert.get('format')!r}")


# --- the soundness rule ------------------------------------------------------------------------------

TALLY: Counter = Counter()
"""Inputs tried, accepted and rejected, over the whole session (printed by each hypothesis test)."""


def assert_sound(cert) -> "Rejection | None":
    """The soundness rule: ``verify`` either accepts and the reference library confirms the claim, or
    raises the verifier's own Rejection with a check name and a non-empty reason. Any other exception
    propagates and fails the test. Returns the Rejection, or None on acceptance."""
    TALLY["inputs"] += 1
    try:
        verify(cert)
    except Rejection as rejection:
        TALLY["rejected"] += 1
        assert rejection.check and rejection.message and str(rejection).strip(), "a rejection without a reason"
        return rejection
    TALLY["accepted"] += 1
    assert claim_is_true(cert), "FALSE ACCEPT: the verifier accepted a claim the reference library denies"
    return None


def assert_rejected(cert) -> Rejection:
    """``assert_sound`` for a certificate that must not be accepted (its claim is false, or it breaks the
    documented format): returns the Rejection."""
    rejection = assert_sound(cert)
    assert rejection is not None, "the verifier accepted a certificate it must reject"
    return rejection


# --- hypothesis settings: CI run and long run ----------------------------------------------------------

LONG_FACTOR = int(os.environ.get("CERTIFY_SOUNDNESS_EXAMPLES", "12"))
"""The long run (``-m table``) tries this many times the CI examples of each test (default 12)."""

COMMON = dict(derandomize=True, deadline=None, database=None, print_blob=False,
              suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large,
                                     HealthCheck.filter_too_much])


def ci_and_long(ci: int, **strategies):
    """Decorator: the test body under ``@given(**strategies)`` twice — the CI test it returns, with ``ci``
    examples, and a long run ``<name>_long`` with LONG_FACTOR × ``ci`` examples, marked ``table`` and put
    beside it in the test module. Each prints the inputs it tried."""
    def wrap(body):
        def make(examples, suffix):
            inner = settings(max_examples=examples, **COMMON)(given(**strategies)(body))

            def test():
                start = TALLY.copy()
                inner()
                tried = {key: TALLY[key] - start[key] for key in ("inputs", "accepted", "rejected")}
                print(f"{body.__name__}{suffix}: {tried['inputs']} inputs tried, {tried['accepted']} accepted "
                      f"(each checked by the test's oracle), {tried['rejected']} rejected")
            test.__name__ = f"{body.__name__}{suffix}"
            test.__doc__ = body.__doc__
            return test
        long_run = pytest.mark.table(make(ci * LONG_FACTOR, "_long"))
        setattr(sys.modules[body.__module__], long_run.__name__, long_run)
        return make(ci, "")
    return wrap


randoms = st.randoms(use_true_random=False)
"""A derandomised random.Random for the mutation functions below."""


# --- JSON paths ---------------------------------------------------------------------------------------

def paths(value, prefix=()) -> list:
    """Every path (tuple of keys and indices) to a string inside a JSON value."""
    if isinstance(value, dict):
        return [p for key, child in value.items() for p in paths(child, prefix + (key,))]
    if isinstance(value, list):
        return [p for i, child in enumerate(value) for p in paths(child, prefix + (i,))]
    return [prefix] if isinstance(value, str) else []


def number_paths(cert: dict) -> list:
    """The paths of the number strings the verifier reads (curve, claim, evidence; not metadata, not
    relies_on, not the witness method names)."""
    return [p for p in paths({k: cert[k] for k in ("curve", "claim", "evidence")}) if p[-1] != "method"]


def get_at(value, path):
    for key in path:
        value = value[key]
    return value


def put_at(value, path, new) -> None:
    for key in path[:-1]:
        value = value[key]
    value[path[-1]] = new


# --- attack class: false claims ------------------------------------------------------------------------

def group_elements(E, generators: list, orders: list) -> list:
    """The elements Σ k_i·P_i of the group the points generate, as PARI points (cypari2's elladd/ellmul)."""
    elements = [pari([0])]
    for P, n in zip(generators, orders):
        elements = [pari.elladd(E, e, pari.ellmul(E, P, k)) for k in range(n) for e in elements]
    unique = {}
    for e in elements:
        unique.setdefault(str(e), e)
    return list(unique.values())


def point_strings(P) -> list:
    return [str(Fraction(str(c))) for c in P]


def structure_of(E, elements: list) -> tuple:
    """(invariants, generators) of a finite subgroup of E(Q) given by its elements (PARI points)."""
    order = len(elements)
    orders = {str(P): int(pari.ellorder(E, P)) for P in elements if str(P) != "[0]"}
    if not orders:
        return [], []
    n2 = max(orders.values())
    second = next(P for P in elements if orders.get(str(P)) == n2)
    if n2 == order:
        return [n2], [second]
    n1 = order // n2
    first = next(P for P in elements if orders.get(str(P)) == n1
                 and len(group_elements(E, [P, second], [n1, n2])) == order)
    return [n1, n2], [first, second]


def claim_subgroup(cert: dict, rnd: random.Random) -> dict:
    """Claim a random proper subgroup H of the true torsion group (the trivial group included), with
    generators that really generate H and division-polynomial evidence rebuilt exactly for H: only the
    mathematics (the missing ℓ-torsion, or a class of H/ℓH divisible by ℓ) can expose it."""
    E = pari_curve(cert["curve"])
    gens = [[pari(str(Fraction(c))) for c in P] for P in cert["claim"]["generators"]]
    orders = [int(n) for n in cert["claim"]["invariants"]]
    multipliers = [rnd.choice([d for d in range(1, n + 1) if n % d == 0]) for n in orders]
    if all(k == 1 for k in multipliers) and orders:
        multipliers[rnd.randrange(len(orders))] = orders[-1] if len(orders) == 1 else rnd.choice(orders)
    sub = [pari.ellmul(E, P, k) for P, k in zip(gens, multipliers)]
    elements = group_elements(E, sub, [n // k if n % k == 0 else n for n, k in zip(orders, multipliers)])
    invariants, generators = structure_of(E, elements)
    cert["claim"] = {"invariants": [str(n) for n in invariants],
                     "generators": [point_strings(P) for P in generators]}
    cert["evidence"]["generator_orders"] = [str(n) for n in invariants]
    cert["evidence"]["ell_parts"] = honest_ell_parts(cert)
    return cert


def honest_ell_parts(cert: dict) -> list:
    """``ell_parts`` evidence computed exactly for the claimed group (whatever it is): for each ℓ dividing
    B/|G|, the true rational roots (cypari2's nfroots, through the certifier's helper) of the ℓ-torsion
    polynomial and of φ_ℓ − x(Q)ψ_ℓ² for one Q per pair ±C of classes of G/ℓG, each with a valid hint prime."""
    from math import gcd

    from certify.roots import hint_prime, rational_roots
    from certify.torsion import class_representatives
    from certify.verifier.arith import prime_factors
    from certify.verifier.curves import (add, change_point, division_by_ell_polynomial, multiple,
                                         torsion_polynomial)

    change = tuple(Fraction(c) for c in cert["evidence"]["integral_model"]["change"])
    model = tuple(Fraction(c) for c in cert["evidence"]["integral_model"]["curve"])
    gens = [change_point(tuple(Fraction(c) for c in P), change) for P in cert["claim"]["generators"]]
    group = [None]
    for P, n in zip(gens, [int(n) for n in cert["claim"]["invariants"]]):
        group = [add(model, g, multiple(model, k, P)) for k in range(n) for g in group]
    bound = 0
    for entry in cert["evidence"]["primes"]:
        bound = gcd(bound, int(entry["count"]))
    back = (1 / change[0], -change[1] / change[0] ** 2, -change[2] / change[0],
            (change[1] * change[2] - change[3]) / change[0] ** 3)
    parts = []
    for ell in prime_factors(bound // len(group)) if bound % len(group) == 0 else []:
        polynomial = torsion_polynomial(model, ell)
        classes = []
        for q in class_representatives(model, group, ell) if len(group) > 1 else []:
            division = division_by_ell_polynomial(model, ell, q[0])
            classes.append({"point": point_strings(change_point(q, back)), "prime": str(hint_prime(division)),
                            "roots": [str(x) for x in rational_roots(division)]})
        parts.append({"ell": str(ell), "classes": classes,
                      "torsion": {"prime": str(hint_prime(polynomial)),
                                  "roots": [str(x) for x in rational_roots(polynomial)]}})
    return parts


MAZUR_GROUPS = [[n] for n in (2, 3, 4, 5, 6, 7, 8, 9, 10, 12)] + [[2, 2 * n] for n in (1, 2, 3, 4)]
"""The non-trivial torsion groups over Q (Mazur 1977), as invariants."""


def claim_supergroup(cert: dict, rnd: random.Random) -> dict:
    """Claim a group of larger order (one of Mazur's, or an impossible one such as Z/4 × Z/4 or Z/11)
    whose generators are the true ones and other true torsion points, with generator_orders to match."""
    orders = [int(n) for n in cert["claim"]["invariants"]]
    order = orders[0] * orders[-1] if len(orders) == 2 else (orders[0] if orders else 1)
    bigger = [g for g in MAZUR_GROUPS + [[11], [4, 4], [3, 3], [13], [2, 2, 2], [17], [3, 6], [4, 8]]
              if (g[0] * g[-1] if len(g) == 2 else g[0] ** len(g)) > order]
    invariants = rnd.choice(bigger)
    points = cert["claim"]["generators"] + [rnd.choice(cert["claim"]["generators"] or [["0", "0"]])
                                            for _ in range(len(invariants))]
    cert["claim"] = {"invariants": [str(n) for n in invariants], "generators": points[:len(invariants)]}
    cert["evidence"]["generator_orders"] = [str(n) for n in invariants]
    return cert


def claim_wrong_generators(cert: dict, rnd: random.Random) -> dict:
    """Keep the invariants and replace one generator by another true torsion point of the same order that
    does not generate the group with the other one, or by a rational point of infinite order or a point
    off the curve when no such torsion point exists."""
    E = pari_curve(cert["curve"])
    gens = [[pari(str(Fraction(c))) for c in P] for P in cert["claim"]["generators"]]
    orders = [int(n) for n in cert["claim"]["invariants"]]
    i = rnd.randrange(len(gens))
    everything = group_elements(E, gens, orders)
    others = [P for P in everything if str(P) != "[0]" and int(pari.ellorder(E, P)) == orders[i]
              and len(group_elements(E, gens[:i] + [P] + gens[i + 1:], orders)) < len(everything)]
    if others:
        replacement = point_strings(rnd.choice(others))
    else:
        replacement = non_torsion_point(E, rnd) or off_curve_point(E, cert["claim"]["generators"][i])
    cert["claim"]["generators"][i] = replacement
    return cert


def off_curve_point(E, point: list) -> list:
    """The point with its y-coordinate moved until it is off the curve (cypari2's ellisoncurve)."""
    x, y = Fraction(point[0]), Fraction(point[1])
    while pari.ellisoncurve(E, [pari(str(x)), pari(str(y))]):
        y += Fraction(1, 7)
    return [str(x), str(y)]


def non_torsion_point(E, rnd: random.Random):
    """A rational point of infinite order with a small integer x, if cypari2 finds one (ellordinate)."""
    for x in rnd.sample(range(-30, 60), 40):
        for y in pari.ellordinate(E, x):
            if int(pari.ellorder(E, [x, y])) == 0:
                return [str(x), str(Fraction(str(y)))]
    return None


def renumber_isogeny(cert: dict, keep: list) -> dict:
    """The certificate restricted to the curves at the indices ``keep`` (in that order): curves, degree
    rows and columns, minimality hints, edges and witnesses between kept curves, all renumbered."""
    new = {old: i for i, old in enumerate(keep)}
    claim, evidence = cert["claim"], cert["evidence"]
    claim["curves"] = [claim["curves"][k] for k in keep]
    claim["degrees"] = [[claim["degrees"][r][c] for c in keep] for r in keep]
    evidence["minimality"] = [evidence["minimality"][k] for k in keep]
    evidence["edges"] = [dict(e, source=str(new[int(e["source"])]), target=str(new[int(e["target"])]))
                         for e in evidence["edges"] if int(e["source"]) in new and int(e["target"]) in new]
    evidence["completeness"] = [dict(w, curve=str(new[int(w["curve"])])) for w in evidence["completeness"]
                                if int(w["curve"]) in new]
    return cert


def drop_class_curve(cert: dict, rnd: random.Random) -> dict:
    """Leave out one curve other than the input's (and everything about it), so that the claim misses a
    member of the class while every remaining edge, hint and witness is the honest one."""
    size = len(cert["claim"]["curves"])
    dropped = rnd.randrange(1, size)
    return renumber_isogeny(cert, [k for k in range(size) if k != dropped])


def add_foreign_class(cert: dict, other: dict) -> dict:
    """Append a whole other isogeny class — its curves, honest edges, hints and witnesses renumbered —
    with off-diagonal degrees copied from a real entry: every local check passes, only the link between the
    two classes is missing."""
    claim, evidence = cert["claim"], cert["evidence"]
    shift, size = len(claim["curves"]), len(other["claim"]["curves"])
    filler = claim["degrees"][0][-1] if shift > 1 else "2"
    claim["curves"] += other["claim"]["curves"]
    claim["degrees"] = ([row + [filler] * size for row in claim["degrees"]]
                        + [[filler] * shift + row for row in other["claim"]["degrees"]])
    evidence["minimality"] += other["evidence"]["minimality"]
    evidence["edges"] += [dict(e, source=str(int(e["source"]) + shift), target=str(int(e["target"]) + shift))
                          for e in other["evidence"]["edges"]]
    evidence["completeness"] += [dict(w, curve=str(int(w["curve"]) + shift))
                                 for w in other["evidence"]["completeness"]]
    return cert


def wrong_degree_entry(cert: dict, rnd: random.Random) -> dict:
    """Change one cyclic degree (and, half the time, its symmetric entry) to another plausible value."""
    degrees = cert["claim"]["degrees"]
    size = len(degrees)
    i, j = rnd.randrange(size), rnd.randrange(size)
    old = int(degrees[i][j])
    value = rnd.choice([v for v in (1, 2, 3, 4, 5, 6, 7, 8, 9, 11, 16, 25, old * 2, old * 3) if v != old])
    degrees[i][j] = str(value)
    if rnd.random() < 0.5:
        degrees[j][i] = str(value)
    return cert


def permute_degrees_only(cert: dict, rnd: random.Random) -> dict:
    """Permute the rows and columns of the degree matrix without the curves (false unless the permutation
    is a symmetry of the class, which the reference decides)."""
    degrees = cert["claim"]["degrees"]
    order = list(range(len(degrees)))
    rnd.shuffle(order)
    cert["claim"]["degrees"] = [[degrees[r][c] for c in order] for r in order]
    return cert


# --- attack class: foreign evidence -------------------------------------------------------------------

def swap_curve(cert: dict, other: dict) -> dict:
    """The curve of another certificate under this certificate's claim and evidence."""
    cert["curve"] = copy.deepcopy(other["curve"])
    return cert


def swap_claim(cert: dict, other: dict) -> dict:
    """Another certificate's claim over this certificate's curve and evidence."""
    cert["claim"] = copy.deepcopy(other["claim"])
    return cert


def swap_evidence_field(cert: dict, other: dict, rnd: random.Random) -> dict:
    """One evidence field (or the whole evidence) taken from another certificate of the same kind."""
    keys = [k for k in cert["evidence"] if k in other["evidence"]] + [None]
    key = rnd.choice(keys)
    if key is None:
        cert["evidence"] = copy.deepcopy(other["evidence"])
    else:
        cert["evidence"][key] = copy.deepcopy(other["evidence"][key])
    return cert


def swap_evidence_entry(cert: dict, other: dict, rnd: random.Random) -> dict:
    """One entry of an evidence list (a prime, an ℓ-part, an edge, a witness, a hint) replaced by an
    entry of the same list in another certificate."""
    lists = [k for k, v in cert["evidence"].items() if isinstance(v, list) and v and other["evidence"].get(k)]
    if not lists:
        return swap_evidence_field(cert, other, rnd)
    key = rnd.choice(lists)
    cert["evidence"][key][rnd.randrange(len(cert["evidence"][key]))] = copy.deepcopy(rnd.choice(other["evidence"][key]))
    return cert


def foreign_kernel(cert: dict, other: dict, rnd: random.Random) -> dict:
    """An edge's kernel polynomial replaced by the kernel of an edge of the same degree from another class
    or another curve of this class (or, when there is none, by its own with the constant term moved).
    The certificate must have an edge."""
    edge = rnd.choice(cert["evidence"]["edges"])
    donors = [e["kernel"] for e in other["evidence"]["edges"] + cert["evidence"]["edges"]
              if e["degree"] == edge["degree"] and e["kernel"] != edge["kernel"]]
    edge["kernel"] = copy.deepcopy(rnd.choice(donors)) if donors else [str(Fraction(edge["kernel"][0]) + 1)] + edge["kernel"][1:]
    return cert


TWISTS = (-4, 8, -8, 12, -3, 5, -7, 13)
"""Fundamental discriminants for elltwist."""


def twist_curve(cert: dict, rnd: random.Random) -> dict:
    """The curve replaced by a quadratic twist (same j-invariant, same isogeny graph shape, cypari2's
    elltwist), the claim and evidence kept."""
    E = pari_curve(cert["curve"])
    twisted = pari.elltwist(E, rnd.choice(TWISTS))
    cert["curve"] = [str(Fraction(str(c))) for c in twisted[:5]]
    return cert


def isomorphic_input(cert: dict, rnd: random.Random) -> dict:
    """The curve replaced by an isomorphic model under a random change [u, r, s, t], the claim and evidence
    kept (the evidence then speaks of a different model)."""
    from certify.verifier.curves import change_model

    change = (Fraction(rnd.choice((1, -1, 2, 3, Fraction(1, 2)))), Fraction(rnd.randint(-3, 3)),
              Fraction(rnd.randint(-2, 2)), Fraction(rnd.randint(-3, 3), rnd.choice((1, 2))))
    if change == (1, 0, 0, 0):
        change = (Fraction(2), Fraction(1), Fraction(0), Fraction(0))
    cert["curve"] = [str(c) for c in change_model(tuple(Fraction(c) for c in cert["curve"]), change)]
    return cert


# --- attack class: witnesses that do not witness --------------------------------------------------------

def odd_primes_dividing(n: int) -> list:
    """The odd prime factors of a non-zero integer (cypari2's factor)."""
    n = abs(int(n))
    return [int(p) for p in pari.factor(n)[0] if int(p) > 2] if n > 1 else []


def model_discriminant(model) -> int:
    return int(pari_curve(model).disc())


def card_mod_p(model, p: int) -> int:
    """p + 1 − a_p by cypari2's ellap: #E(F_p) at a good prime, the count of the reduction's smooth part
    plus one at a bad one (a plausible-looking number either way)."""
    return p + 1 - int(pari.ellap(pari_curve(model), p))


def bad_reduction_prime(cert: dict, rnd: random.Random) -> dict:
    """Torsion: add an odd prime of bad reduction of the integral model (or p = 2, or an odd composite),
    with the point count of the reduction, at a random place in the list."""
    model = cert["evidence"]["integral_model"]["curve"]
    bad = odd_primes_dividing(model_discriminant(model))
    p = rnd.choice(bad + [2, 9, 15, 1]) if bad else rnd.choice([2, 9, 1])
    count = card_mod_p(model, p) if p in bad or p == 2 else p + 1
    primes = cert["evidence"]["primes"]
    primes.insert(rnd.randrange(len(primes) + 1), {"p": str(p), "count": str(count)})
    return cert


def count_off_by_one(cert: dict, rnd: random.Random) -> dict:
    """Torsion: one stated #E(F_p) moved by ±1 (or by the group order, keeping the divisibility)."""
    entry = rnd.choice(cert["evidence"]["primes"])
    entry["count"] = str(int(entry["count"]) + rnd.choice((-1, 1, 2, -2)))
    return cert


def root_lists(cert: dict) -> list:
    """Every evidence dict carrying a 'roots' list: ℓ-part torsion and class hints, x0/division witnesses."""
    found = []
    if cert["format"] == "certify-torsion":
        for part in cert["evidence"]["ell_parts"]:
            found += [part["torsion"]] + part["classes"]
    else:
        found += [w for w in cert["evidence"]["completeness"] if "roots" in w]
    return found


def alter_root_list(cert: dict, rnd: random.Random) -> dict:
    """A root list with a root missing, a root added (a nearby rational, or 0), a root repeated, or a root
    moved; the hint prime kept."""
    hint = rnd.choice(root_lists(cert))
    roots = hint["roots"]
    move = rnd.choice(("drop", "add", "repeat", "shift") if roots else ("add",))
    if move == "drop":
        roots.pop(rnd.randrange(len(roots)))
    elif move == "add":
        roots.append(str(Fraction(rnd.randint(-50, 50), rnd.choice((1, 2, 3, 4)))))
    elif move == "repeat":
        roots.append(rnd.choice(roots))
    else:
        k = rnd.randrange(len(roots))
        roots[k] = str(Fraction(roots[k]) + rnd.choice((1, -1, Fraction(1, 2))))
    return cert


def hint_polynomial(cert: dict, hint: dict) -> list:
    """The integer polynomial the verifier solves from this hint (built with the verifier's formulas)."""
    from certify.verifier.curves import (change_point, division_by_ell_polynomial, division_polynomials,
                                         torsion_polynomial, two_division_polynomial)
    from certify.verifier.isogeny import X0_NUMERATORS, j_invariant
    from certify.verifier.arith import poly_scale, poly_sub

    if cert["format"] == "certify-torsion":
        model = tuple(Fraction(c) for c in cert["evidence"]["integral_model"]["curve"])
        change = tuple(Fraction(c) for c in cert["evidence"]["integral_model"]["change"])
        for part in cert["evidence"]["ell_parts"]:
            ell = int(part["ell"])
            if hint is part["torsion"]:
                return torsion_polynomial(model, ell)
            if any(hint is c for c in part["classes"]):
                q = change_point(tuple(Fraction(c) for c in hint["point"]), change)
                return division_by_ell_polynomial(model, ell, q[0])
    model = tuple(Fraction(c) for c in cert["claim"]["curves"][int(hint["curve"])])
    ell = int(hint["degree"])
    if hint["method"] == "division-roots":
        return two_division_polynomial(model) if ell == 2 else division_polynomials(model, 3)[3]
    j = j_invariant(model)
    return poly_sub(poly_scale(j.denominator, X0_NUMERATORS[ell]), [0, j.numerator])


def hint_prime_dividing_leading(cert: dict, rnd: random.Random) -> dict:
    """A hint prime that divides the leading coefficient of its polynomial (so roots can be lost at
    infinity), or, when no odd prime does, one at which a root is multiple, or one over the limit, or 2."""
    from certify.verifier.arith import simple_roots_mod, trim

    hint = rnd.choice(root_lists(cert))
    f = trim(hint_polynomial(cert, hint))
    while f and f[0] == 0:
        f = f[1:]
    choices = odd_primes_dividing(f[-1]) if f else []
    if not choices and len(f) > 1:
        choices = [p for p in (3, 5, 7, 11, 13, 17, 19, 23, 29, 31) if f[-1] % p and simple_roots_mod(f, p) is None]
    hint["prime"] = str(rnd.choice(choices or [2, 100_003, 1, 9]))
    return cert


def frobenius_witnesses(cert: dict) -> list:
    return [w for w in cert["evidence"]["completeness"] if w["method"] == "frobenius"]


def frobenius_prime_that_fails(cert: dict, rnd: random.Random) -> dict:
    """Isogeny: a Frobenius witness moved to a prime that does not witness: one of bad reduction, p = ℓ,
    or a good p at which a_p² − 4p is zero or a square mod ℓ (found with cypari2's ellap)."""
    witness = rnd.choice(frobenius_witnesses(cert))
    model = cert["claim"]["curves"][int(witness["curve"])]
    ell, E = int(witness["degree"]), pari_curve(model)
    delta = model_discriminant(model)
    squares = [p for p in [int(q) for q in pari.primes(60)][1:]
               if delta % p and p != ell and (pow((int(pari.ellap(E, p)) ** 2 - 4 * p) % ell, (ell - 1) // 2, ell)
                                              in (0, 1) or (int(pari.ellap(E, p)) ** 2 - 4 * p) % ell == 0)]
    choices = squares + odd_primes_dividing(delta) + [ell]
    witness["prime"] = str(rnd.choice(choices))
    return cert


def deny_listed_isogeny(cert: dict, rnd: random.Random) -> dict:
    """Isogeny: for a curve with listed ℓ-edges, drop those edges and replace its witness for ℓ by a
    Frobenius witness at a random good prime (or by a j-list witness): a claim that no ℓ-isogeny exists
    where one does. By the Frobenius argument no prime can witness it."""
    edges = cert["evidence"]["edges"]
    if not edges:
        return frobenius_prime_that_fails(cert, rnd)
    edge = rnd.choice(edges)
    source, ell = edge["source"], edge["degree"]
    cert["evidence"]["edges"] = [e for e in edges if not (e["source"] == source and e["degree"] == ell)]
    model = cert["claim"]["curves"][int(source)]
    delta = model_discriminant(model)
    good = [p for p in [int(q) for q in pari.primes(40)][1:] if delta % p and p != int(ell)]
    for w in cert["evidence"]["completeness"]:
        if w["curve"] == source and w["degree"] == ell:
            w.clear()
            w.update({"curve": source, "degree": ell, **rnd.choice(
                [{"method": "frobenius", "prime": str(rnd.choice(good))}, {"method": "j-list"},
                 {"method": "division-roots", "prime": str(rnd.choice(good)), "roots": []},
                 {"method": "x0-roots", "prime": str(rnd.choice(good)), "roots": []}])})
    return cert


def perturb_kernel(cert: dict, rnd: random.Random) -> dict:
    """Isogeny: one coefficient of a kernel polynomial (not the leading 1) moved by a small rational."""
    edges = cert["evidence"]["edges"]
    if not edges:
        return frobenius_prime_that_fails(cert, rnd) if frobenius_witnesses(cert) else cert
    kernel = rnd.choice(edges)["kernel"]
    k = rnd.randrange(len(kernel) - 1)
    kernel[k] = str(Fraction(kernel[k]) + rnd.choice((1, -1, Fraction(1, 4), 7)))
    return cert


def alter_minimality_hint(cert: dict, rnd: random.Random) -> dict:
    """Isogeny: the primes of gcd(c4, c6) in a minimality hint with one dropped, or with a composite, a
    prime below 5 or an unrelated prime added."""
    hint = rnd.choice(cert["evidence"]["minimality"])
    if hint["primes"] and rnd.random() < 0.5:
        hint["primes"].pop(rnd.randrange(len(hint["primes"])))
    else:
        hint["primes"].append(str(rnd.choice((25, 3, 2, 35, 7, 11, 1))))
    return cert


def alter_change(cert: dict, rnd: random.Random) -> dict:
    """A change of variables (torsion's integral model, the isogeny input change or an edge's change) with
    one entry moved, or u = 0."""
    if cert["format"] == "certify-torsion":
        change = cert["evidence"]["integral_model"]["change"]
    else:
        holders = [cert["evidence"]["input_change"]] + [e["change"] for e in cert["evidence"]["edges"]]
        change = rnd.choice(holders)
    k = rnd.randrange(4)
    change[k] = "0" if k == 0 and rnd.random() < 0.3 else str(Fraction(change[k]) + rnd.choice((1, -1, Fraction(1, 2))))
    return cert


# --- attack class: duplicates and reordering ----------------------------------------------------------

def evidence_lists(cert: dict) -> list:
    """(holder, key) for every non-empty list of entries in the evidence and in relies_on."""
    found = [(cert, "relies_on")]
    stack = [cert["evidence"], cert["claim"]]
    while stack:
        node = stack.pop()
        for key, value in node.items():
            if isinstance(value, list) and value:
                found.append((node, key))
                stack += [v for v in value if isinstance(v, dict)]
            elif isinstance(value, dict):
                stack.append(value)
    return found


def duplicate_entry(cert: dict, rnd: random.Random) -> dict:
    """An entry of some list (a prime, an ℓ-part, a class, a root, an edge, a witness, a generator, a
    curve, a theorem) repeated at a random place."""
    holder, key = rnd.choice(evidence_lists(cert))
    entries = holder[key]
    entries.insert(rnd.randrange(len(entries) + 1), copy.deepcopy(rnd.choice(entries)))
    return cert


def reorder_entries(cert: dict, rnd: random.Random) -> dict:
    """The entries of some list shuffled (a different order whenever the list has two distinct entries)."""
    holder, key = rnd.choice(evidence_lists(cert))
    entries = holder[key]
    rnd.shuffle(entries)
    return cert


def duplicate_class_curve(cert: dict, rnd: random.Random) -> dict:
    """Isogeny: one curve listed twice, consistently — the copy with its own minimality hint, witnesses,
    degree row and column (degree 1 to its original) and copies of its outgoing edges — so that only the
    distinctness of the listed models can catch it."""
    claim, evidence = cert["claim"], cert["evidence"]
    size = len(claim["curves"])
    k = rnd.randrange(size)
    claim["curves"].append(copy.deepcopy(claim["curves"][k]))
    claim["degrees"] = [row + [row[k]] for row in claim["degrees"]]
    claim["degrees"].append(claim["degrees"][k][:size] + ["1"])
    evidence["minimality"].append(copy.deepcopy(evidence["minimality"][k]))
    evidence["completeness"] += [dict(w, curve=str(size)) for w in evidence["completeness"] if w["curve"] == str(k)]
    evidence["edges"] += [dict(e, source=str(size)) for e in evidence["edges"] if e["source"] == str(k)]
    return cert


def permute_class(cert: dict, rnd: random.Random) -> dict:
    """Isogeny: the curves listed in another order with everything renumbered consistently (a true claim
    when the input's model stays first; otherwise the input model check applies)."""
    order = list(range(len(cert["claim"]["curves"])))
    rnd.shuffle(order)
    return renumber_isogeny(cert, order)


# --- attack class: spellings --------------------------------------------------------------------------

def respellings(text: str) -> list:
    """Other spellings of the canonical number ``text`` that are not canonical: leading zeros, a plus
    sign, exponent form, an unreduced fraction, '-0', spaces, a JSON number, a float, non-ASCII digits."""
    value = Fraction(text)
    n, d = value.numerator, value.denominator
    sign = "-" if value < 0 else ""
    body = text.lstrip("-")
    out = [f"{sign}00{body}", f"+{text}", f" {text}", f"{text} ", f"{text}\n", f"{sign}{abs(n) * 2}/{d * 2}",
           text.replace("1", "\u0661") if "1" in text else f"\uff10{text}", text.replace("-", "\u2212") if sign else f"{text}_0"]
    if d == 1:
        out += [f"{n}e0", f"{n}.0", f"{n}.", int(n), float(n), f"0x{abs(n):x}" if not sign else f"-0x{abs(n):x}"]
        out += [f"{n // 10}e1"] if n % 10 == 0 and n else []
        out += ["-0", "-00", "+0"] if n == 0 else []
    else:
        out += [f"{sign}{abs(n)}/{d}.0", f"{n}/{-d}" if not sign else f"{-n}/{-d}", float(value), f"{sign}{abs(n)} / {d}"]
    return out


def respell_number(cert: dict, rnd: random.Random) -> tuple:
    """(certificate, path, spelling): one number the verifier reads, respelled non-canonically."""
    path = rnd.choice(number_paths(cert))
    spelling = rnd.choice(respellings(get_at(cert, path)))
    put_at(cert, path, spelling)
    return cert, path, spelling


def oversized_number(cert: dict, rnd: random.Random, digits: int) -> tuple:
    """(certificate, path, spelling): one number replaced by one of ``digits`` digits (the integer, its
    negative, or as numerator or denominator of a fraction)."""
    path = rnd.choice(number_paths(cert))
    huge = "1" + "0" * (digits - 2) + "7"
    spelling = rnd.choice((huge, "-" + huge, f"1/{huge}", f"{huge}/3"))
    put_at(cert, path, spelling)
    return cert, path, spelling


# --- random input ----------------------------------------------------------------------------------------

CERTIFICATE_WORDS = ["format", "version", "curve", "claim", "evidence", "relies_on", "metadata", "invariants",
                     "generators", "primes", "p", "count", "ell_parts", "ell", "torsion", "classes", "prime",
                     "roots", "point", "integral_model", "change", "generator_orders", "curves", "degrees",
                     "edges", "completeness", "minimality", "input_change", "kernel", "source", "target",
                     "degree", "method", "key", "statement", "reference", "manifest", "members", "name",
                     "certify-torsion", "certify-isogeny-class", "certify-bundle", "1", "0", "-1", "2", "frobenius",
                     "j-list", "x0-roots", "division-roots"]
"""Keys and values of the certificate vocabulary, so that random documents reach past the first checks."""

json_scalars = (st.none() | st.booleans() | st.integers(-10 ** 30, 10 ** 30) | st.floats(allow_nan=True)
                | st.sampled_from(CERTIFICATE_WORDS) | st.text(max_size=12))
json_values = st.recursive(
    json_scalars,
    lambda children: st.lists(children, max_size=6)
    | st.dictionaries(st.sampled_from(CERTIFICATE_WORDS) | st.text(max_size=6), children, max_size=7),
    max_leaves=40)
"""Arbitrary JSON values, biased towards the certificate vocabulary."""


def certificate_shaped(draw_value, rnd: random.Random) -> dict:
    """A pool certificate with one random subtree replaced by an arbitrary JSON value."""
    cert = any_certificate(rnd)
    node, trail = cert, []
    while isinstance(node, (dict, list)) and node and rnd.random() < 0.7:
        key = rnd.choice(list(node) if isinstance(node, dict) else range(len(node)))
        trail.append(key)
        node = node[key]
    if trail:
        put_at(cert, trail, draw_value)
    return cert


def damage_bytes(data: bytes, rnd: random.Random) -> bytes:
    """Bytes with a few random flips, deletions, insertions or a truncation."""
    data = bytearray(data)
    for _ in range(rnd.randint(1, 4)):
        move = rnd.choice(("flip", "delete", "insert", "truncate"))
        k = rnd.randrange(len(data)) if data else 0
        if move == "flip" and data:
            data[k] ^= 1 << rnd.randrange(8)
        elif move == "delete" and data:
            del data[k]
        elif move == "insert":
            data.insert(k, rnd.randrange(256))
        elif data:
            del data[k:]
    return bytes(data)
