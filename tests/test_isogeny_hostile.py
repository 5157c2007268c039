"""Hostile isogeny-class certificates: hypothesis mutates valid certificates; the verifier must either
reject with its own Rejection or accept a claim that is true according to the reference library
(cypari2's ellisomat). Any other exception, or a false claim accepted, fails the test."""
import copy

from hypothesis import HealthCheck, given, settings, strategies as st

from certify.isogeny.certificate import certify_isogeny_class
from certify.verifier import verify
from isogeny_reference import claim_matches_reference
from seeded_certificates import SeededPool

SEEDS = [(1, 1, 1, -10, -10), (0, -1, 1, -10, -20), (1, 0, 1, 4, -6), (0, 0, 0, -1, 0), (0, 0, 0, 0, 1),
         (0, -1, 1, -7, 10), (0, 0, 1, 0, -7), (1, -1, 1, -3, 3)]
"""Classes with 2-, 3-, 5-, 11- and 27-structure, j = 0 and 1728, and 8 curves (Cremona's table)."""

SETTINGS = settings(max_examples=120, deadline=None, suppress_health_check=list(HealthCheck), derandomize=True)


POOL = SeededPool(certify_isogeny_class, SEEDS, claim_matches_reference)
fresh, outcome = POOL.fresh, POOL.outcome


seeds = st.integers(0, len(SEEDS) - 1)


def remove_curve(cert: dict, k: int) -> None:
    """Drop curve k from the claim, with its row and column of degrees."""
    curves, degrees = cert["claim"]["curves"], cert["claim"]["degrees"]
    k %= len(curves)
    del curves[k]
    del degrees[k]
    for row in degrees:
        del row[k]


@SETTINGS
@given(seeds, st.integers(0, 7), st.booleans())
def test_drop_a_curve(seed, k, keep_evidence):
    """Dropping a listed curve (with or without its evidence) is never accepted as a complete class."""
    cert = fresh(seed)
    remove_curve(cert, k)
    if not keep_evidence:
        cert["evidence"]["minimality"] = cert["evidence"]["minimality"][:len(cert["claim"]["curves"])]
    outcome(cert)


@SETTINGS
@given(seeds, seeds, st.integers(0, 7))
def test_add_a_curve(seed, other, k):
    """Adding a curve of another class (with a degree row copied from an existing one) is rejected."""
    cert, donor = fresh(seed), fresh(other)
    extra = donor["claim"]["curves"][k % len(donor["claim"]["curves"])]
    cert["claim"]["curves"].append(extra)
    for row in cert["claim"]["degrees"]:
        row.append(row[-1])
    cert["claim"]["degrees"].append(list(cert["claim"]["degrees"][-1]))
    cert["evidence"]["minimality"].append(donor["evidence"]["minimality"][k % len(donor["claim"]["curves"])])
    outcome(cert)


@SETTINGS
@given(seeds, st.integers(0, 63), st.sampled_from(["1", "2", "3", "4", "5", "6", "9", "25", "27", "0", "-2"]))
def test_change_a_degree(seed, cell, value):
    """Changing one entry of the degree matrix is accepted only if it did not change."""
    cert = fresh(seed)
    size = len(cert["claim"]["curves"])
    cert["claim"]["degrees"][(cell // 8) % size][cell % size] = value
    outcome(cert)


@SETTINGS
@given(seeds, st.integers(0, 200))
def test_drop_a_completeness_witness(seed, k):
    """Any missing witness (one curve, one ℓ) is a rejection."""
    cert = fresh(seed)
    del cert["evidence"]["completeness"][k % len(cert["evidence"]["completeness"])]
    outcome(cert)


@SETTINGS
@given(seeds, st.integers(0, 40), st.integers(0, 40), st.sampled_from(["kernel", "change", "target", "source"]))
def test_swap_between_edges(seed, i, k, key):
    """Swapping kernels (or changes, targets, sources) between two edges."""
    cert = fresh(seed)
    edges = cert["evidence"]["edges"]
    if edges:
        first, second = edges[i % len(edges)], edges[k % len(edges)]
        first[key], second[key] = second[key], first[key]
    outcome(cert)


@SETTINGS
@given(seeds, st.integers(0, 200), st.sampled_from([3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37, 41, 97, 101, 2, 1, 4]))
def test_replace_a_witness_prime(seed, k, prime):
    """Replacing the prime of a witness by another, which need not witness anything."""
    cert = fresh(seed)
    with_prime = [w for w in cert["evidence"]["completeness"] if "prime" in w]
    with_prime[k % len(with_prime)]["prime"] = str(prime)
    outcome(cert)


@SETTINGS
@given(seeds, st.integers(0, 200), st.sampled_from(["frobenius", "j-list", "x0-roots", "division-roots", "none"]))
def test_change_a_witness_method(seed, k, method):
    """Replacing the method of a witness (keeping its values)."""
    cert = fresh(seed)
    witnesses = cert["evidence"]["completeness"]
    witnesses[k % len(witnesses)]["method"] = method
    outcome(cert)


def leaves(value, path=()):
    """Every (path, string) leaf of a JSON value."""
    if isinstance(value, dict):
        for key, item in value.items():
            yield from leaves(item, path + (key,))
    elif isinstance(value, list):
        for index, item in enumerate(value):
            yield from leaves(item, path + (index,))
    elif isinstance(value, str):
        yield path, value


def set_path(document, path, value):
    for step in path[:-1]:
        document = document[step]
    document[path[-1]] = value


@SETTINGS
@given(seeds, st.integers(0, 10 ** 6),
       st.one_of(st.integers(-30, 30).map(str), st.sampled_from(["1/2", "-7/3", "", "x", "0", "10" * 30]),
                 st.just(None), st.just([]), st.just({})))
def test_replace_any_value(seed, k, value):
    """Any one leaf of the evidence or claim replaced by a small number, junk or a wrong JSON type."""
    cert = fresh(seed)
    targets = [(path, text) for path, text in leaves(cert) if path[0] in ("claim", "evidence", "curve")]
    path, _ = targets[k % len(targets)]
    set_path(cert, path, value)
    outcome(cert)


@SETTINGS
@given(seeds, st.integers(0, 10 ** 6))
def test_delete_any_entry(seed, k):
    """Deleting one key of any object, or one element of any list."""
    cert = fresh(seed)
    containers = []

    def walk(value):
        if isinstance(value, (dict, list)) and value:
            containers.append(value)
            for item in (value.values() if isinstance(value, dict) else value):
                walk(item)

    walk(cert)
    container = containers[k % len(containers)]
    if isinstance(container, dict):
        del container[sorted(container)[k % len(container)]]
    else:
        del container[k % len(container)]
    outcome(cert)


def test_unmutated_certificates_are_accepted():
    """The seeds themselves verify and are true (a mutation test that could never accept is no test)."""
    for index in range(len(SEEDS)):
        cert = copy.deepcopy(fresh(index))
        verify(cert)
        assert claim_matches_reference(cert)


def test_a_wrong_change_on_an_edge_is_refused_showing_the_changed_codomain():
    """An edge whose change of variables is [−1, 0, 0, 0] instead of the identity: by Silverman III.1,
    Table 3.1, u = −1 takes a3 to −a3 and keeps a1 = 0, a2, a4, a6 of y² + y = x³ − x² − 7820x − 263580
    (the 5-isogenous curve of y² + y = x³ − x² − 10x − 20, cypari2's ellisomat), so the rejection shows the
    Vélu codomain, the model the change makes of it (a3 = −1) and the target, which differ."""
    from fractions import Fraction

    from certify.verifier.errors import Rejection

    cert = certify_isogeny_class(tuple(Fraction(c) for c in (0, -1, 1, -10, -20)))
    edge = next(e for e in cert["evidence"]["edges"] if e["change"] == ["1", "0", "0", "0"])
    edge["change"] = ["-1", "0", "0", "0"]
    try:
        verify(cert)
    except Rejection as rejection:
        assert rejection.check == "edge target"
        codomain, changed = rejection.values["codomain"], rejection.values["changed"]
        assert changed == [codomain[0], codomain[1], -codomain[2], codomain[3], codomain[4]] != codomain
        assert rejection.values["target"] != changed
    else:
        raise AssertionError("a wrong change of variables was accepted")
