"""Hostile torsion certificates: hypothesis mutates valid ones, and the verifier must stay sound.

The rule asserted for every mutation: ``verify`` either raises ``Rejection`` (never any other
exception) or accepts, and when it accepts the claim is true — the invariants are those of
cypari2's ``elltors`` for the certificate's own curve and the generators generate that group
(judged by cypari2's group law; see ``torsion_pool.assert_claim_true``). A mutation that changes
nothing essential may be accepted; one that makes the claim false must not be.

The pool holds one certificate for each of Mazur's fifteen groups (the first curve of Cremona's
table with that group, by elltors), certificates that need division-polynomial evidence, and a
non-integral model. Each test attacks one thing: random edits anywhere, a swapped curve, false
group claims, missing evidence, edited evidence, and numbers in other spellings.
"""
import copy
import functools
from fractions import Fraction

from hypothesis import event, given, settings, strategies as st

from certify.verifier import verify
from certify.verifier.errors import Rejection
from torsion_pool import assert_claim_true, certified, group_generated, pari, pari_curve, reference_invariants, \
    table_curves

MAZUR_GROUPS = [[]] + [[n] for n in (2, 3, 4, 5, 6, 7, 8, 9, 10, 12)] + [[2, 2 * n] for n in range(1, 5)]
"""The invariants of the fifteen groups of Mazur's theorem (Mazur 1977)."""

EXTRA_CURVES = [
    (1, 0, 1, -171, -874),   # Z/2, but 3 divides the counts: ell_parts evidence for ℓ = 3
    (1, 1, 1, -135, -660),   # Z/2 × Z/2 with 16 | counts: ell_parts for ℓ = 2 with several classes
]


@functools.lru_cache(maxsize=None)
def pool() -> tuple:
    """Valid certificates: per Mazur group the first table curve having it, the extra curves, and a
    Z/2 × Z/8 curve in a non-integral model (x = x'/4 + 1/3, y = y'/8 + x'/8 − 1/2)."""
    first = {}
    for _, a in table_curves():
        group = tuple(reference_invariants(a))
        first.setdefault(group, a)
        if len(first) == len(MAZUR_GROUPS):
            break
    curves = list(first.values()) + EXTRA_CURVES
    certs = [certified(a) for a in curves]
    u, r, s, t = Fraction(1, 2), Fraction(1, 3), Fraction(1, 2), Fraction(-1, 2)
    a1, a2, a3, a4, a6 = (Fraction(c) for c in first[(2, 8)])
    changed = ((a1 + 2 * s) / u, (a2 - s * a1 + 3 * r - s * s) / u ** 2, (a3 + r * a1 + 2 * t) / u ** 3,
               (a4 - s * a3 + 2 * r * a2 - (t + r * s) * a1 + 3 * r * r - 2 * s * t) / u ** 4,
               (a6 + r * a4 + r * r * a2 + r ** 3 - t * a3 - t * t - r * t * a1) / u ** 6)
    certs.append(certified(changed))
    return tuple(certs)


def test_pool_covers_every_shape():
    """The pool really has all fifteen groups, ell_parts evidence with and without classes, and a
    non-integral input model; and every certificate in it is accepted and true."""
    certs = pool()
    assert {tuple(map(int, c["claim"]["invariants"])) for c in certs} == {tuple(g) for g in MAZUR_GROUPS}
    parts = [p for c in certs for p in c["evidence"]["ell_parts"]]
    assert any(p["classes"] for p in parts) and any(not p["classes"] for p in parts)
    assert any("/" in v for c in certs for v in c["curve"])
    for cert in certs:
        verify(cert)
        assert_claim_true(cert)


def assert_sound(cert) -> None:
    """The soundness rule: only Rejection may be raised, and acceptance implies a true claim.
    (The outcome is recorded as a hypothesis event: ``--hypothesis-show-statistics`` shows which
    checks the attacks reach.)"""
    try:
        verify(cert)
    except Rejection as rejection:
        event(f"rejected: {rejection.check}")
        return
    event("accepted")
    assert_claim_true(cert)


# --- positions in a certificate ---

def positions(tree, path=()):
    """Every path (a tuple of keys and indexes) to a value inside the JSON tree, the root excluded."""
    children = tree.items() if isinstance(tree, dict) else enumerate(tree) if isinstance(tree, list) else ()
    for key, value in children:
        yield path + (key,)
        yield from positions(value, path + (key,))


def at(tree, path):
    for key in path:
        tree = tree[key]
    return tree


def put(tree, path, value):
    at(tree, path[:-1])[path[-1]] = value


def number_leaves(cert) -> list:
    """Paths to the decimal strings of the certificate (outside relies_on, whose texts are prose)."""
    return [p for p in positions(cert) if p[0] != "relies_on" and isinstance(at(cert, p), str)
            and _as_rational(at(cert, p)) is not None]


def _as_rational(text):
    try:
        return Fraction(text)
    except (ValueError, ZeroDivisionError):
        return None


# --- strategies ---

pool_indexes = st.integers(min_value=0, max_value=10 ** 6)


def a_pool_certificate(draw, avoid: dict = None) -> dict:
    """A fresh copy of one of the pool's certificates (other than ``avoid``)."""
    certs = [c for c in pool() if c != avoid]
    return copy.deepcopy(certs[draw(pool_indexes) % len(certs)])


@st.composite
def changed_numbers(draw, text: str) -> str:
    """Another canonical decimal near or far from the given one: ±small, negated, doubled, halved,
    0, 1, or a 60-digit number."""
    value = Fraction(text)
    new = draw(st.sampled_from([value + draw(st.integers(-3, 3)), -value, 2 * value, value / 2, Fraction(0),
                                Fraction(1), Fraction(10 ** 60 + 7), value + Fraction(1, 3)]))
    return str(new.numerator) if new.denominator == 1 else f"{new.numerator}/{new.denominator}"


@st.composite
def other_spellings(draw, text: str):
    """The same number written another way: signs, zeros, decimals, spaces, non-lowest terms,
    non-ASCII digits, or a JSON number instead of a string. The format allows only one spelling."""
    value = Fraction(text)
    n, d = value.numerator, value.denominator
    return draw(st.sampled_from([
        "+" + text, "0" + text, text + ".0", " " + text, text + "\n", f"{2 * n}/{2 * d}", f"{n}/{d}" + "/1",
        text.replace("/", " / "), f"{float(value)!r}", "%de0" % n, text.translate(str.maketrans("0123456789", "٠١٢٣٤٥٦٧٨٩")),
        text.translate(str.maketrans("0123456789", "０１２３４５６７８９")), n if d == 1 else float(value),
        "-0" if n == 0 else f"{n}/1" if d == 1 else f"{n}/+{d}", [text], {"value": text}, None, True,
    ]).filter(lambda spelling: spelling != text))


@st.composite
def random_edit(draw, cert: dict) -> dict:
    """One blind edit anywhere in the tree: change, delete, duplicate or swap values."""
    places = list(positions(cert))
    path = draw(st.sampled_from(places))
    kind = draw(st.sampled_from(["change", "delete", "duplicate", "swap"]))
    container, key = at(cert, path[:-1]), path[-1]
    value = container[key]
    if kind == "change":
        if isinstance(value, str) and _as_rational(value) is not None:
            container[key] = draw(changed_numbers(value))
        else:
            container[key] = draw(st.sampled_from(["", "1", [], {}, None, 0, [value, value]]))
    elif kind == "delete":
        del container[key]
    elif kind == "duplicate":
        if isinstance(container, list):
            container.insert(key, copy.deepcopy(value))
        else:
            container[key] = [value, copy.deepcopy(value)]
    else:
        other = draw(st.sampled_from(places))
        if other[:len(path)] != path and path[:len(other)] != other:  # neither inside the other
            container[key] = copy.deepcopy(at(cert, other))
            put(cert, other, value)
    return cert


@st.composite
def randomly_edited(draw) -> dict:
    """A pool certificate after one to three blind edits."""
    cert = a_pool_certificate(draw)
    for _ in range(draw(st.integers(1, 3))):
        cert = draw(random_edit(cert))
    return cert


@st.composite
def with_another_curve(draw) -> dict:
    """A pool certificate whose curve (and maybe its integral model, or all its evidence) is taken
    from another certificate of the pool: the claim now speaks of a curve it was not made for."""
    cert = a_pool_certificate(draw)
    donor = a_pool_certificate(draw, avoid=cert)
    cert["curve"] = donor["curve"]
    what = draw(st.sampled_from(["curve", "model", "evidence"]))
    if what == "model":
        cert["evidence"]["integral_model"] = donor["evidence"]["integral_model"]
    elif what == "evidence":
        cert["evidence"] = donor["evidence"]
    return cert


@st.composite
def with_another_group(draw) -> dict:
    """A pool certificate claiming another of Mazur's groups, larger or smaller, with generators
    taken from its own true group (or the claimed group's own certificate) and matching orders."""
    cert = a_pool_certificate(draw)
    invariants = draw(st.sampled_from(MAZUR_GROUPS))
    curve = pari_curve(cert["curve"])
    orders = [int(n) for n in cert["claim"]["invariants"]]
    points = [pari([pari(x), pari(y)]) for x, y in cert["claim"]["generators"]]
    elements = [[str(P[0]), str(P[1])] for P in group_generated(curve, points, orders) if len(P) == 2]
    donor = next((c for c in pool() if [int(n) for n in c["claim"]["invariants"]] == invariants), cert)
    candidates = elements + donor["claim"]["generators"]
    generators = [draw(st.sampled_from(candidates)) for _ in invariants] if candidates else []
    if draw(st.booleans()) and len(generators) == len(cert["claim"]["generators"]):
        generators = cert["claim"]["generators"]
    cert["claim"] = {"invariants": [str(n) for n in invariants], "generators": generators}
    cert["evidence"]["generator_orders"] = [str(n) for n in invariants]
    return cert


@st.composite
def without_some_evidence(draw) -> dict:
    """A pool certificate with the entry for one prime p, one ℓ part, or one class of G/ℓG removed."""
    cert = a_pool_certificate(draw)
    evidence = cert["evidence"]
    lists = [evidence["primes"], evidence["ell_parts"]] + [part["classes"] for part in evidence["ell_parts"]]
    lists = [entries for entries in lists if entries]
    entries = draw(st.sampled_from(lists))
    del entries[draw(st.integers(0, len(entries) - 1))]
    return cert


@st.composite
def with_edited_evidence(draw) -> dict:
    """A pool certificate with one piece of evidence changed on purpose: a point count, a prime,
    a hint prime, a root list (a root added, dropped or changed), or an ℓ part's prime or point."""
    cert = a_pool_certificate(draw)
    evidence = cert["evidence"]
    parts = evidence["ell_parts"]
    facts = [part["torsion"] for part in parts] + [c for part in parts for c in part["classes"]]
    targets = ["count", "p"] + (["hint", "roots", "ell", "point"] if parts else [])
    target = draw(st.sampled_from(targets))
    if target in ("count", "p"):
        entry = draw(st.sampled_from(evidence["primes"]))
        entry[target] = draw(changed_numbers(entry[target]))
    elif target == "hint":
        fact = draw(st.sampled_from(facts))
        fact["prime"] = str(draw(st.sampled_from([1, 2, 3, 5, 7, 11, 13, 97, 99991, 100003, 9, 15])))
    elif target == "roots":
        fact = draw(st.sampled_from(facts))
        roots = fact["roots"]
        action = draw(st.sampled_from(["add", "drop", "change"]))
        if action == "add" or not roots:
            roots.insert(0, draw(st.sampled_from(["0", "1", "-1", "13", "-19/3", "1/2"] + roots)))
        elif action == "drop":
            roots.pop(draw(st.integers(0, len(roots) - 1)))
        else:
            i = draw(st.integers(0, len(roots) - 1))
            roots[i] = draw(changed_numbers(roots[i]))
    elif target == "ell":
        part = draw(st.sampled_from(parts))
        part["ell"] = str(draw(st.sampled_from([2, 3, 5, 7, 11, 13, 17, 4, 1])))
    else:
        classes = [c for part in parts for c in part["classes"]] or [parts[0]["torsion"]]
        item = draw(st.sampled_from(classes))
        item["point"] = draw(st.sampled_from(cert["claim"]["generators"] + [["0", "0"], ["1", "1"]]))
    return cert


@st.composite
def respelled(draw) -> dict:
    """A pool certificate with one number, anywhere, written in another spelling."""
    cert = a_pool_certificate(draw)
    path = draw(st.sampled_from(number_leaves(cert)))
    put(cert, path, draw(other_spellings(at(cert, path))))
    return cert


# --- the attacks; each asserts the soundness rule. 310 + 60 + 100 + 60 + 120 + 80 = 730 mutations ---

HOSTILE = dict(derandomize=True, deadline=None)


@settings(max_examples=310, **HOSTILE)
@given(randomly_edited())
def test_blind_edits_never_make_a_false_claim_pass(cert):
    """Changes, deletions, duplications and swaps anywhere in the certificate."""
    assert_sound(cert)


@settings(max_examples=60, **HOSTILE)
@given(with_another_curve())
def test_swapped_curve(cert):
    """The claim and evidence of one curve presented for another."""
    assert_sound(cert)


@settings(max_examples=100, **HOSTILE)
@given(with_another_group())
def test_false_group_claims(cert):
    """Larger or smaller groups claimed with plausible generators of the right orders."""
    assert_sound(cert)


@settings(max_examples=60, **HOSTILE)
@given(without_some_evidence())
def test_missing_evidence(cert):
    """The evidence for one prime, one ℓ, or one class of G/ℓG removed."""
    assert_sound(cert)


@settings(max_examples=120, **HOSTILE)
@given(with_edited_evidence())
def test_edited_evidence(cert):
    """Wrong counts, primes, hint primes, root lists, ℓ's and class points."""
    assert_sound(cert)


def test_denominator_one_is_not_a_canonical_spelling():
    """'n/d' needs d > 1: '1/1' would be a second spelling of 1, and a certificate using it would
    fail the schema, whose rational pattern requires d ≥ 2. (Regression: the verifier once
    accepted it; the hostile spelling test below found it.)"""
    cert = copy.deepcopy(pool()[0])
    cert["evidence"]["integral_model"]["change"][0] = "1/1"
    try:
        verify(cert)
    except Rejection as rejection:
        assert rejection.check == "number syntax"
        return
    raise AssertionError("'1/1' was accepted as a spelling of 1")


@settings(max_examples=80, **HOSTILE)
@given(respelled())
def test_numbers_in_other_spellings(cert):
    """Every number has exactly one accepted spelling; others are rejected, never misread."""
    try:
        verify(cert)
    except Rejection:
        return
    raise AssertionError("a number in a non-canonical spelling was accepted")
