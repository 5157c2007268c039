"""Soundness, attack class *absurd sizes*: each documented limit of ``certify/verifier/limits.py``, exceeded
by a crafted certificate, must produce its own rejection at once — before the work the limit guards.
"At once" is measured by counting work, never by timing: the functions that do the guarded work (point
counts, division polynomials, squarefree parts, roots modulo a prime, the isogeny identity, the loader's
JSON parse) are replaced by tripwires that fail the test if they are called."""
import copy

import pytest

from certify.curves import parse_curve
from certify.torsion import certify_torsion
from certify.verifier import arith, curves, isogeny, limits, sources, torsion, verify
from certify.verifier.errors import Rejection
from soundness_pool import fresh, pool


class WorkStarted(AssertionError):
    """Raised by a tripwire: the verifier started the work a limit should have refused."""


def tripwire(monkeypatch, module, name: str, allowed=lambda *args: False) -> list:
    """Replace module.name by a wrapper that records each call and fails unless ``allowed(*args)``."""
    original, calls = getattr(module, name), []

    def wrapper(*args, **kwargs):
        calls.append(args)
        if not allowed(*args):
            raise WorkStarted(f"{module.__name__}.{name} was called")
        return original(*args, **kwargs)
    monkeypatch.setattr(module, name, wrapper)
    return calls


def forbid_counting(monkeypatch) -> None:
    """From now on, point counts, division polynomials and isogeny identities may not run at all."""
    for module in (torsion, isogeny):
        tripwire(monkeypatch, module, "count_points")
    for name in ("torsion_polynomial", "division_by_ell_polynomial"):
        tripwire(monkeypatch, torsion, name)
    tripwire(monkeypatch, curves, "division_polynomials")
    for name in ("x_map", "check_isogeny_identity"):
        tripwire(monkeypatch, isogeny, name)


def rejected(cert) -> Rejection:
    with pytest.raises(Rejection) as caught:
        verify(cert)
    return caught.value


def torsion_cert(text="[1,0,1,-19,26]") -> dict:
    return copy.deepcopy(certify_torsion(parse_curve(text)))


def good_primes(model_text: str, count: int, start: int) -> list:
    """``count`` odd primes from ``start`` up that do not divide the discriminant of the (integral) model."""
    from certify.verifier.curves import discriminant

    delta, found, p = int(discriminant(parse_curve(model_text))), [], start
    while len(found) < count:
        p += 1
        if arith.is_prime(p) and p > 2 and delta % p:
            found.append(p)
    return found


# --- one crafted certificate per limit: (limit name, builder, expected check) ---

def over_depth():
    cert = torsion_cert()
    nested = []
    for _ in range(limits.MAX_DEPTH + 1):
        nested = [nested]
    cert["evidence"]["ell_parts"] = nested
    return cert


def over_list_length():
    cert = torsion_cert()
    cert["evidence"]["primes"] = cert["evidence"]["primes"] * (limits.MAX_LIST_LENGTH + 1)
    return cert


def over_digits():
    cert = fresh("isogeny", 0)
    cert["curve"][4] = "9" * (limits.MAX_DIGITS + 1)
    return cert


def over_primes():
    cert = torsion_cert()
    primes = good_primes("[1,0,1,-19,26]", limits.MAX_PRIMES + 1, 3)
    cert["evidence"]["primes"] = [{"p": str(p), "count": "1"} for p in primes]
    return cert


def over_hint_prime_count():
    """A point-count prime over MAX_HINT_PRIME, listed first."""
    cert = torsion_cert()
    big = good_primes("[1,0,1,-19,26]", 1, limits.MAX_HINT_PRIME)[0]
    cert["evidence"]["primes"].insert(0, {"p": str(big), "count": str(big + 1)})
    return cert


def over_hint_prime_witness():
    """A Frobenius witness prime over MAX_HINT_PRIME."""
    cert = fresh("isogeny", 0)
    witness = next(w for w in cert["evidence"]["completeness"] if w["method"] == "frobenius")
    witness["prime"] = str(good_primes("[0,-1,1,-10,-20]", 1, limits.MAX_HINT_PRIME)[0])
    return cert


def over_ell():
    cert = torsion_cert()
    cert["evidence"]["ell_parts"].append({"ell": "17", "torsion": {"prime": "3", "roots": []}, "classes": []})
    return cert


def over_work_torsion():
    cert = torsion_cert()
    start = limits.MAX_HINT_PRIME - 3000
    primes = good_primes("[1,0,1,-19,26]", limits.MAX_WORK // start + 1, start)
    cert["evidence"]["primes"] = [{"p": str(p), "count": "1"} for p in primes]
    return cert


def over_work_isogeny():
    cert = fresh("isogeny", pool("isogeny").index(max(pool("isogeny"), key=lambda c: len(c["claim"]["curves"]))))
    model = cert["claim"]["curves"]
    assert len(cert["evidence"]["completeness"]) * (limits.MAX_HINT_PRIME - 200) > limits.MAX_WORK
    for w in cert["evidence"]["completeness"]:
        prime = good_primes("[" + ",".join(model[int(w["curve"])]) + "]", 1, limits.MAX_HINT_PRIME - 200)[0]
        curve, degree = w["curve"], w["degree"]
        w.clear()
        w.update({"curve": curve, "degree": degree, "method": "frobenius", "prime": str(prime)})
    return cert


def over_polynomial_size():
    """An ℓ = 13 part on a curve with 80-digit coefficients: ψ_13 would have degree 84 and huge coefficients."""
    big = ["0", "0", "0", str(10 ** 80 + 1), str(10 ** 80 + 3)]
    return {"format": "certify-torsion", "version": "1", "curve": big,
            "claim": {"invariants": [], "generators": []},
            "evidence": {"generator_orders": [], "integral_model": {"change": ["1", "0", "0", "0"], "curve": big},
                         "primes": [{"p": "3", "count": "4"}],
                         "ell_parts": [{"ell": "13", "torsion": {"prime": "3", "roots": []}, "classes": []}]},
            "relies_on": torsion_cert()["relies_on"]}


def over_kernel_size():
    """An ℓ = 163 edge (kernel of degree 81) whose coefficients have nearly MAX_DIGITS digits, on a class of
    one curve: building the x-map N/D and the degree-163 identity from it would take minutes."""
    cert = fresh("isogeny", pool("isogeny").index(next(c for c in pool("isogeny") if len(c["claim"]["curves"]) == 1)))
    digits = "7" * (limits.MAX_DIGITS - 1)
    kernel = [f"{digits}{k % 10}/{digits[:-1]}3" for k in range(81)] + ["1"]
    cert["evidence"]["edges"] = [{"source": "0", "target": "0", "degree": "163", "kernel": kernel,
                                  "change": ["1", "0", "0", "0"]}]
    return cert


LIMITS = {
    "MAX_DEPTH": (over_depth, "nesting depth"),
    "MAX_LIST_LENGTH": (over_list_length, "list size"),
    "MAX_DIGITS": (over_digits, "number size"),
    "MAX_PRIMES": (over_primes, "list size"),
    "MAX_HINT_PRIME": (over_hint_prime_count, "good reduction"),
    "MAX_HINT_PRIME/witness": (over_hint_prime_witness, "witness prime"),
    "MAX_ELL": (over_ell, "ell part"),
    "MAX_WORK": (over_work_torsion, "work limit"),
    "MAX_WORK/isogeny": (over_work_isogeny, "work budget"),
    "MAX_POLYNOMIAL_SIZE": (over_polynomial_size, "polynomial size"),
    "MAX_KERNEL_SIZE": (over_kernel_size, "kernel size"),
}
"""Each documented limit (the isogeny side where it has its own check), the certificate that exceeds it,
and the check that must refuse it."""


@pytest.mark.parametrize("name", sorted(LIMITS))
def test_each_limit_is_refused_at_once_by_its_own_check(name, monkeypatch):
    """The crafted certificate is refused by the limit's own check, naming the limit's value, and no point
    count or division polynomial is started (the tripwires would fail the test)."""
    build, check = LIMITS[name]
    cert = build()
    forbid_counting(monkeypatch)
    rejection = rejected(cert)
    assert rejection.check == check, str(rejection)
    assert str(getattr(limits, name.split("/")[0])) in str(rejection), str(rejection)


def test_hint_prime_over_the_limit_in_an_ell_part_is_refused_before_any_root_search(monkeypatch):
    """An ℓ-part hint prime over MAX_HINT_PRIME (the roots mod p would cost O(p·deg)): refused naming the
    limit, and no root search modulo that prime is run."""
    cert = fresh("torsion", pool("torsion").index(next(c for c in pool("torsion") if c["evidence"]["ell_parts"])))
    cert["evidence"]["ell_parts"][0]["torsion"]["prime"] = "100003"
    tripwire(monkeypatch, arith, "simple_roots_mod", allowed=lambda f, p: p <= limits.MAX_HINT_PRIME)
    rejection = rejected(cert)
    assert rejection.check == "rational roots" and str(limits.MAX_HINT_PRIME) in str(rejection)


def squarefree_case() -> dict:
    """A torsion certificate whose ℓ = 7 hint polynomial (ψ_7, degree 24 > MAX_SQUAREFREE_DEGREE) has a
    multiple root modulo the stated hint prime."""
    cert = torsion_cert("[1,-1,1,-213,-1257]")
    f = torsion.torsion_polynomial(tuple(parse_curve("[1,-1,1,-213,-1257]")), 7)
    assert len(f) - 1 > limits.MAX_SQUAREFREE_DEGREE
    part = next(p for p in cert["evidence"]["ell_parts"] if p["ell"] == "7")
    part["torsion"]["prime"] = str(next(p for p in range(3, 200) if arith.is_prime(p) and f[-1] % p
                                        and arith.simple_roots_mod(f, p) is None))
    return cert


def test_squarefree_part_over_the_degree_limit_is_not_computed(monkeypatch):
    """A hint prime with a multiple root for a polynomial of degree over MAX_SQUAREFREE_DEGREE: the verifier
    must refuse the hint rather than run Euclid's algorithm over Q on it."""
    cert = squarefree_case()
    tripwire(monkeypatch, arith, "squarefree_part", allowed=lambda f: len(f) - 1 <= limits.MAX_SQUAREFREE_DEGREE)
    assert rejected(cert).check == "rational roots"


def test_squarefree_limit_is_named_in_its_rejection():
    """Issue 6, item 2: each documented limit has its own rejection message (found missing by this module,
    fixed in 77660eb; kept as a regression test)."""
    assert str(limits.MAX_SQUAREFREE_DEGREE) in str(rejected(squarefree_case()))


def test_file_over_the_size_limit_is_not_parsed(tmp_path, monkeypatch):
    """A file of MAX_FILE_BYTES + 1 bytes (sparse, so the test writes nothing): unreadable, naming the
    limit, and the JSON parser is never called."""
    path = tmp_path / "huge.json"
    with open(path, "wb") as handle:
        handle.truncate(limits.MAX_FILE_BYTES + 1)
    tripwire(monkeypatch, sources, "parse")
    ((_, document, _, _),), _ = sources.documents(("file", str(path)))
    assert isinstance(document, sources.Unreadable) and str(limits.MAX_FILE_BYTES) in str(document)


def repeated_edge_cert() -> dict:
    """A valid class certificate whose first edge is repeated until the edge list is MAX_LIST_LENGTH long."""
    cert = fresh("isogeny", pool("isogeny").index(next(c for c in pool("isogeny") if c["evidence"]["edges"])))
    edges = cert["evidence"]["edges"]
    cert["evidence"]["edges"] = edges + [copy.deepcopy(edges[0])] * (limits.MAX_LIST_LENGTH - len(edges))
    return cert


def test_repeated_edges_are_refused_before_their_identities_are_checked(monkeypatch):
    """The edge list of a valid certificate padded to MAX_LIST_LENGTH with copies of one edge: a repeat is
    refused — by the repeat, or earlier by the total size of the identities — and the verifier does not
    check more identities than there are distinct edges (it checked all 10,000 before 77660eb, minutes for
    ℓ = 163; kept as a regression test)."""
    cert = repeated_edge_cert()
    distinct = len({str(e) for e in cert["evidence"]["edges"]})
    calls_seen = tripwire(monkeypatch, isogeny, "check_isogeny_identity",
                          allowed=lambda *args: len(calls_seen) <= distinct)
    assert rejected(cert).check in ("distinct edges", "identity size")
