"""Tests written for the mutants of certify/verifier/isogeny.py that survived the mutation run (issue 15;
``tests/mutation_run.py``, ``python bench/bench_mutation.py isogeny.py``). Each test names the mutants it
kills.

Where a weakened check would accept a false claim, the test builds that certificate (from a genuine one
made by the certifier) and asks cypari2's ellisomat (the reference library's isogeny-class routine) that
the claim is false, so the verifier must reject it, naming the check. Where the mutant would refuse a
genuine certificate, the test has the certifier make one, and asks ellisomat that its claim is true.
"""
import copy
from fractions import Fraction
from math import gcd

import pytest

from certify.isogeny.certificate import certify_isogeny_class
from certify.verifier import verify
from certify.verifier.errors import Rejection
from isogeny_reference import claim_matches_reference


def certificate(a) -> dict:
    """The certifier's certificate for the curve with integer coefficients a (a fresh copy)."""
    return copy.deepcopy(certify_isogeny_class(tuple(Fraction(c) for c in a)))


def rejection(cert) -> Rejection:
    with pytest.raises(Rejection) as caught:
        verify(cert)
    return caught.value


def witness(cert: dict, curve: int, ell: int) -> dict:
    """The completeness witness of the listed curve and ℓ."""
    return next(w for w in cert["evidence"]["completeness"]
                if w["curve"] == str(curve) and w["degree"] == str(ell))


def accepted_and_true(cert: dict) -> bool:
    """The verifier accepts, and cypari2's ellisomat gives the same class and degree matrix."""
    verify(cert)
    return claim_matches_reference(cert)


# --- the published constants ---

THIRTEEN = (0, -1, 1, -2, -1)
"""y² + y = x³ − x² − 2x − 1, conductor 147 in Cremona's table (tests/data), whose class ellisomat gives as
two curves joined by a 13-isogeny; no Frobenius witness excludes ℓ = 13 (there is a 13-isogeny), so
the certifier's witness for ℓ = 13 is the root of X_0(13)."""


def test_a_class_with_a_thirteen_isogeny_is_certified_by_its_x0_root():
    """Kills the mutants of X0_NUMERATORS[13] (its key 13 -> 14, and each coefficient of
    P_13 = (t² + 5t + 13)(t⁴ + 7t³ + 20t² + 19t + 1)³, Maier 2009, Table 3): with the key moved the
    x0-roots witness of ℓ = 13 is refused (or cannot be made), and with a coefficient moved P_13(t) − j·t
    has another set of rational roots, so the genuine class (ellisomat) is refused, or a class without its
    13-isogeny is made and accepted — which ellisomat denies."""
    cert = certificate(THIRTEEN)
    for curve in (0, 1):
        assert witness(cert, curve, 13)["method"] == "x0-roots" and len(witness(cert, curve, 13)["roots"]) == 1
    assert accepted_and_true(cert)


# --- reading the claim and the evidence ---

def test_a_missing_minimality_hint_is_refused_as_structure():
    """Kills the deleted raise of ``len(hints) != len(curves)``: one minimality hint per listed curve, so a
    certificate whose last hint is gone is refused for its structure (not with an IndexError)."""
    cert = certificate(THIRTEEN)
    del cert["evidence"]["minimality"][-1]
    failure = rejection(cert)
    assert (failure.check, failure.values) == ("structure", {"entries": 1, "curves": 2})


def test_an_empty_class_is_refused_as_structure():
    """Kills the deleted raise of ``not entries`` in read_models: every class has at least the input curve."""
    cert = certificate(THIRTEEN)
    cert["claim"]["curves"], cert["claim"]["degrees"] = [], []
    failure = rejection(cert)
    assert (failure.check, failure.message) == ("structure", "claim.curves is empty")


def test_a_non_integral_listed_model_is_refused():
    """Kills the deleted raise of ``c.denominator != 1`` in read_models: a listed model with a6 = −3/2 is no
    reduced minimal model (not integral), and is refused as such rather than read as its truncation
    int(−3/2) = −1, which is the genuine listed curve (ellisomat lists y² + y = x³ − x² − 2x − 1)."""
    cert = certificate(THIRTEEN)
    assert cert["claim"]["curves"][0][4] == "-1"
    cert["claim"]["curves"][0][4] = "-3/2"
    failure = rejection(cert)
    assert (failure.check, failure.message) == ("minimal model", "a listed model is not integral")


def test_an_edge_of_degree_outside_mazurs_list_is_refused():
    """Kills the deleted raise of ``ell not in MAZUR_PRIMES`` in read_ell: no elliptic curve over Q has a
    rational isogeny of prime degree 23 (Mazur 1978), so an edge of degree 23 is refused by its degree."""
    cert = certificate(THIRTEEN)
    cert["evidence"]["edges"][0]["degree"] = "23"
    cert["evidence"]["edges"][0]["kernel"] = ["0"] * 11 + ["1"]
    failure = rejection(cert)
    assert (failure.check, failure.values) == ("degree", {"degree": 23})


def test_a_kernel_that_is_not_monic_is_refused_as_such():
    """Kills the deleted raise of ``h[-1] != 1``: the genuine 13-kernel times 2 has the same roots but is not
    the monic kernel polynomial the format asks for."""
    cert = certificate(THIRTEEN)
    edge = cert["evidence"]["edges"][0]
    edge["kernel"] = [str(2 * Fraction(c)) for c in edge["kernel"]]
    failure = rejection(cert)
    assert (failure.check, failure.message) == ("kernel polynomial", "evidence.edges[0].kernel is not monic")


# --- the budgets of the kernels and their identities (certify/verifier/limits.py) ---

def digits_estimate(bits: int) -> int:
    """The verifier's digit count of a number of ``bits`` bits: ⌊bits·log10 2⌋ + 1, log10 2 ≈ 0.30103."""
    return bits * 30103 // 100000 + 1


def crafted_edge(ell: int, kernel: list) -> dict:
    """An edge of degree ℓ from curve 0 to curve 1 with the given kernel (Fractions), the identity change."""
    return {"source": "0", "target": "1", "degree": str(ell), "kernel": [str(c) for c in kernel],
            "change": ["1", "0", "0", "0"]}


def with_edges(edges: list) -> dict:
    cert = certificate(THIRTEEN)
    cert["evidence"]["edges"] = edges
    return cert


def test_a_kernel_denominator_exactly_at_the_limit_passes_that_check():
    """Kills ``>`` -> ``>=`` and the + 1 -> + 2 of the kernel-denominator bound: a 7-kernel x³ + 1/d with d of
    8302 bits has degree × digits of d = 4 × 2500 = MAX_KERNEL_DENOMINATOR exactly, which the documented
    bound allows; the kernel is then refused by its isogeny identity (it is no kernel polynomial)."""
    from certify.verifier import limits

    d = 2 ** 8301 + 1
    assert 4 * digits_estimate(d.bit_length()) == limits.MAX_KERNEL_DENOMINATOR
    assert rejection(with_edges([crafted_edge(7, [Fraction(1, d), 0, 0, 1])])).check == "kernel polynomial"


def test_a_kernel_denominator_just_over_the_limit_is_refused_by_that_check():
    """Kills the deleted raise of the kernel-denominator bound and its 10000 -> 10001: a 5-kernel
    x² + 1/d with d of 11072 bits has degree × digits = 3 × 3334 = 10002 > MAX_KERNEL_DENOMINATOR."""
    from certify.verifier import limits

    d = 2 ** 11071 + 1
    assert 3 * digits_estimate(d.bit_length()) > limits.MAX_KERNEL_DENOMINATOR
    assert rejection(with_edges([crafted_edge(5, [Fraction(1, d), 0, 1])])).check == "kernel denominator"


def integer_kernel(ell: int, digits: int, top: int = 0) -> list:
    """A monic integer polynomial of the degree of an ℓ-kernel, constant term of exactly ``digits`` estimated
    digits, x^(n−1) coefficient ``top`` and the others 0 (no kernel polynomial of any curve in the tests)."""
    bits = next(b for b in range(1, 14000) if digits_estimate(b) == digits)
    n = 1 if ell == 2 else (ell - 1) // 2
    kernel = [2 ** (bits - 1) + 1] + [0] * (n - 1) + [1]
    if n > 1:
        kernel[-2] = top
    return [Fraction(c) for c in kernel]


def test_kernels_exactly_at_twice_the_kernel_size_limit_pass_that_check():
    """Kills ``total > 2 * MAX_KERNEL_SIZE`` -> ``>=``: two 163-kernels of 82 × 1219 and a 2-kernel of
    2 × 42 total 2 × MAX_KERNEL_SIZE = 200,000 exactly, which is allowed; the identities are then too large."""
    from certify.verifier import limits

    edges = [crafted_edge(163, integer_kernel(163, 1219)), crafted_edge(163, integer_kernel(163, 1219, top=1)),
             crafted_edge(2, integer_kernel(2, 42))]
    assert 82 * 1219 * 2 + 2 * 42 == 2 * limits.MAX_KERNEL_SIZE
    assert rejection(with_edges(edges)).check == "identity size"


def test_kernels_over_twice_the_kernel_size_limit_are_refused_by_that_check():
    """Kills the deleted raise of the total kernel size and its 2 -> 3: three 163-kernels of 82 × 1219 digits
    each, each within MAX_KERNEL_SIZE, total 299,874 > 2 × MAX_KERNEL_SIZE."""
    edges = [crafted_edge(163, integer_kernel(163, 1219, top=k)) for k in range(3)]
    assert rejection(with_edges(edges)).check == "kernel size"


def identity_size(cert: dict, edge: dict) -> int:
    """The documented estimate of check_kernel_budget: ℓ × (x_map_digits + digits of the source's F + 8)."""
    from certify.verifier.isogeny import curve_cubic, x_map_digits

    h = [Fraction(c) for c in edge["kernel"]]
    common = 1
    for c in h:
        common = common * c.denominator // gcd(common, c.denominator)
    model = [int(c) for c in cert["claim"]["curves"][int(edge["source"])]]
    model_digits = digits_estimate(max(abs(int(c)).bit_length() for c in curve_cubic(model)))
    return int(edge["degree"]) * (x_map_digits(h, common) + model_digits + 8)


def test_one_identity_over_its_limit_is_refused_though_the_total_is_within():
    """Kills ``size > MAX_IDENTITY_SIZE`` -> False: one 163-kernel whose identity estimate lies between
    MAX_IDENTITY_SIZE and MAX_IDENTITY_TOTAL is refused by the per-edge bound."""
    from certify.verifier import limits

    cert = with_edges([crafted_edge(163, integer_kernel(163, 520))])
    size = identity_size(cert, cert["evidence"]["edges"][0])
    assert limits.MAX_IDENTITY_SIZE < size <= limits.MAX_IDENTITY_TOTAL
    assert rejection(cert).check == "identity size"


def test_identities_over_their_total_are_refused_though_each_is_within():
    """Kills ``identities > MAX_IDENTITY_TOTAL`` -> False: two 163-kernels each within MAX_IDENTITY_SIZE,
    together over MAX_IDENTITY_TOTAL."""
    from certify.verifier import limits

    cert = with_edges([crafted_edge(163, integer_kernel(163, 400, top=k)) for k in range(2)])
    sizes = [identity_size(cert, edge) for edge in cert["evidence"]["edges"]]
    assert max(sizes) <= limits.MAX_IDENTITY_SIZE < limits.MAX_IDENTITY_TOTAL < sum(sizes)
    assert rejection(cert).check == "identity size"


def test_an_identity_exactly_at_its_limit_passes_that_check():
    """Kills ``size > MAX_IDENTITY_SIZE`` -> ``>=``: a 5-kernel x² + n·x + 1/c (c of 3,000 digits, n of
    4,000) from a listed model with a1 of 4,000 digits has the estimate 5 × 32,000 = MAX_IDENTITY_SIZE
    exactly, which is allowed; the certificate is then refused because that model is not the input curve's."""
    from certify.verifier import limits

    cert = certificate(THIRTEEN)
    cert["claim"]["curves"][0] = [str(2 ** 13284 + 1), "0", "1", "0", "0"]
    cert["evidence"]["edges"] = [crafted_edge(5, [Fraction(1, 2 ** 9959 + 1), Fraction(2 ** 13284 + 1), 1])]
    assert identity_size(cert, cert["evidence"]["edges"][0]) == limits.MAX_IDENTITY_SIZE
    assert rejection(cert).check not in ("identity size", "kernel size", "kernel denominator")


def test_identities_exactly_at_their_total_limit_pass_that_check():
    """Kills ``identities > MAX_IDENTITY_TOTAL`` -> ``>=``: two 163-kernels of estimate 163 × 732 and a
    2-kernel of 2 × 5684 total MAX_IDENTITY_TOTAL = 250,000 exactly, which is allowed; the two 163-kernels
    are the same polynomial, which is refused next as a repeated edge."""
    from certify.verifier import limits

    big = integer_kernel(163, 360)
    cert = with_edges([crafted_edge(163, big), crafted_edge(163, big), crafted_edge(2, integer_kernel(2, 1891))])
    sizes = [identity_size(cert, edge) for edge in cert["evidence"]["edges"]]
    assert max(sizes) <= limits.MAX_IDENTITY_SIZE and sum(sizes) == limits.MAX_IDENTITY_TOTAL
    assert rejection(cert).check == "distinct edges"


def test_a_kernel_with_a_singular_velu_codomain_is_refused_as_such():
    """Kills the deleted raise of ``discriminant(codomain) == 0`` and its 0 -> 1: on y² = x³ + 3x + 16
    (Δ = −16(4·27 + 27·256) ≠ 0) the kernel x of degree 1 gives by Vélu's formulas for ℓ = 2 (Vélu 1971,
    t = (6x0² + b2x0 + b4)/2 = 3, w = x0·t = 0, a4′ = a4 − 5t, a6′ = a6 − b2t − 7w) the codomain
    y² = x³ − 12x + 16 = (x − 2)²(x + 4), a singular cubic (sympy factors it), which is no elliptic curve:
    the edge is refused for that reason, before any x-map or identity is built from it."""
    import sympy

    from certify.verifier.isogeny import check_edge, velu_codomain

    source, kernel = (0, 0, 0, 3, 16), [Fraction(0), Fraction(1)]
    codomain = velu_codomain(source, 2, kernel)
    assert codomain == (0, 0, 0, -12, 16)
    x = sympy.Symbol("x")
    assert sympy.factor(x ** 3 - 12 * x + 16) == (x - 2) ** 2 * (x + 4)
    edge = {"where": "evidence.edges[0]", "ell": 2, "kernel": kernel, "source": 0, "target": 1,
            "change": [Fraction(1), Fraction(0), Fraction(0), Fraction(0)]}
    with pytest.raises(Rejection) as caught:
        check_edge([source, (0, 0, 0, -12, 16)], edge)
    assert (caught.value.check, caught.value.message) == ("kernel polynomial",
                                                          "evidence.edges[0]: the Vélu codomain is singular")


def test_a_kernel_through_a_two_torsion_point_is_refused_for_its_common_factor():
    """Kills the deleted raise of ``not coprime_mod(n, d, p)``: on y² = x³ − x the 5-kernel x(x − 2) has the
    root 0 of F = 4x³ − 4x (the point (0, 0) of order 2, sympy), where Vélu's term u_Q = F(x_Q) vanishes
    (Vélu 1971; Kohel 1996, §2.4), so X = N/D has a pole of order 1 only at 0 and N shares the factor x with
    D = κH²: no subgroup of order 5, refused for that common factor (the Vélu codomain
    y² = x³ − 101x − 476 is non-singular, so that check passes first)."""
    import sympy

    from certify.verifier.isogeny import check_edge

    x = sympy.Symbol("x")
    assert (4 * x ** 3 - 4 * x).subs(x, 0) == 0 and sympy.discriminant(x ** 3 - 101 * x - 476) != 0
    edge = {"where": "evidence.edges[0]", "ell": 5, "kernel": [Fraction(0), Fraction(-2), Fraction(1)],
            "source": 0, "target": 1, "change": [Fraction(1), Fraction(0), Fraction(0), Fraction(0)]}
    with pytest.raises(Rejection) as caught:
        check_edge([(0, 0, 0, -1, 0), (0, 0, 0, -101, -476)], edge)
    assert caught.value.check == "kernel polynomial" and "common factor" in caught.value.message


# --- the completeness witnesses ---

def test_two_witnesses_for_one_curve_and_one_ell_are_refused():
    """Kills the deleted raise of ``key in witnesses``: exactly one witness for each curve and ℓ, so a
    witness listed twice (the same genuine one) is refused."""
    cert = certificate(THIRTEEN)
    cert["evidence"]["completeness"].append(copy.deepcopy(witness(cert, 1, 13)))
    failure = rejection(cert)
    assert (failure.check, failure.message) == ("completeness", "two witnesses for one curve and one ℓ")


def test_a_class_without_its_thirteen_isogeny_and_its_witness_is_refused():
    """Kills the deleted raise of a missing witness in read_witnesses: the class of THIRTEEN claimed as the
    curve alone, its ℓ = 13 witness (and the 13-edge, the other curve) left out, every other witness kept.
    ellisomat gives two curves joined by a 13-isogeny, so the claim is false; it is refused because no
    witness bounds the 13-isogenies of the curve."""
    cert = certificate(THIRTEEN)
    cert["claim"]["curves"], cert["claim"]["degrees"] = cert["claim"]["curves"][:1], [["1"]]
    cert["evidence"]["edges"], cert["evidence"]["minimality"] = [], cert["evidence"]["minimality"][:1]
    cert["evidence"]["completeness"] = [w for w in cert["evidence"]["completeness"]
                                        if w["curve"] == "0" and w["degree"] != "13"]
    assert not claim_matches_reference(cert)
    failure = rejection(cert)
    assert (failure.check, failure.values) == ("completeness", {"curve": 0, "ell": 13, "missing": 1})


def test_a_frobenius_witness_at_a_bad_prime_is_refused():
    """Kills ``int(discriminant(model)) % p == 0`` -> False in frobenius_bound and the deleted raise after
    it: THIRTEEN claimed as the curve
    alone (its 13-edge and other curve left out), its ℓ = 13 witness a Frobenius witness at p = 3, which
    divides the discriminant (cypari2), so the reduction there is bad and the point count says nothing
    about Frobenius; ellisomat gives a 13-isogeny, so the claim is false, and it is refused for the prime."""
    from certify.pari import pari
    from soundness_pool import pari_curve

    cert = certificate(THIRTEEN)
    assert int(pari_curve(THIRTEEN).disc()) % 3 == 0
    cert["claim"]["curves"], cert["claim"]["degrees"] = cert["claim"]["curves"][:1], [["1"]]
    cert["evidence"]["edges"], cert["evidence"]["minimality"] = [], cert["evidence"]["minimality"][:1]
    cert["evidence"]["completeness"] = [w for w in cert["evidence"]["completeness"] if w["curve"] == "0"]
    entry = witness(cert, 0, 13)
    entry.clear()
    entry.update({"curve": "0", "degree": "13", "method": "frobenius", "prime": "3"})
    assert not claim_matches_reference(cert)
    failure = rejection(cert)
    assert (failure.check, failure.values) == ("frobenius witness", {"p": 3, "ell": 13})


def test_witness_primes_two_and_nine_are_refused_as_witness_primes():
    """Kills ``2 < p`` -> ``2 <= p`` and ``is_prime(p)`` -> True in witness_prime: a witness prime is an odd
    prime, so 2 and the composite 9 are refused by that rule (not later by the point count)."""
    for p in ("2", "9"):
        cert = certificate(THIRTEEN)
        witness(cert, 0, 3)["prime"] = p
        assert rejection(cert).check == "witness prime", p


def witnesses_of_work(work: int, count: int) -> list:
    """[(method, p)] for ``count`` witnesses whose stated primes cost exactly ``work`` by the weights that
    limits.MAX_WORK documents (Σ p·deg over the polynomials solved from a prime hint: 15·p for the degree-15
    X_0 polynomial of an x0-roots witness, p for a Frobenius point count): three x0-roots witnesses at the
    largest prime below MAX_HINT_PRIME, then Frobenius witnesses at consecutive primes, the last one making
    up the sum (primes by cypari2's precprime, nextprime and isprime)."""
    from certify.pari import pari
    from certify.verifier import limits

    top = int(pari.precprime(limits.MAX_HINT_PRIME))
    rest = work - 15 * 3 * top
    start = rest // (count - 3)
    while True:
        primes, q = [], start
        for _ in range(count - 4):
            q = int(pari.nextprime(q + 1))
            primes.append(q)
        last = rest - sum(primes)
        if 2 < last <= limits.MAX_HINT_PRIME and pari.isprime(last):
            return [("x0-roots", top)] * 3 + [("frobenius", p) for p in primes + [last]]
        start += 2


def test_witness_primes_of_exactly_the_work_limit_pass_that_check():
    """Kills ``work > MAX_WORK`` -> ``>=`` in check_work_budget: 24 witnesses whose primes cost exactly
    MAX_WORK = 5,000,000 are allowed by the documented bound ("checked from the stated hints before any count
    is run"); the certificate, with its last minimality hint removed, is then refused for its structure by
    the next check, before any point count or root search."""
    from certify.verifier import limits

    cert = certificate(THIRTEEN)
    chosen = witnesses_of_work(limits.MAX_WORK, len(cert["evidence"]["completeness"]))
    assert sum((15 if method == "x0-roots" else 1) * p for method, p in chosen) == limits.MAX_WORK
    for entry, (method, p) in zip(cert["evidence"]["completeness"], chosen):
        curve, degree = entry["curve"], entry["degree"]
        entry.clear()
        entry.update({"curve": curve, "degree": degree, "method": method, "prime": str(p)})
    del cert["evidence"]["minimality"][-1]
    failure = rejection(cert)
    assert (failure.check, failure.values) == ("structure", {"entries": 1, "curves": 2})


# --- minimality of the listed models ---

def minimality_rejection(model, primes) -> Rejection:
    from certify.verifier.isogeny import check_reduced_minimal

    with pytest.raises(Rejection) as caught:
        check_reduced_minimal(model, {"primes": primes}, "claim.curves[0]")
    return caught.value


NOT_MINIMAL_AT_5 = (0, 0, 0, -5 ** 4, 5 ** 6)
"""y² = x³ − 5⁴x + 5⁶, in reduced form but not minimal at 5: cypari2's ellminimalmodel gives y² = x³ − x + 1."""


def test_minimality_hints_must_be_primes_from_five_dividing_gcd_c4_c6():
    """Kills ``p < 5`` -> False, ``rest % p`` -> False, the deleted raises after them and after the primality
    test, and the deleted raise of an unexplained gcd(c4, c6): the hint 0 (below 5), 7 (does not divide
    gcd(c4, c6) = 2⁴·3·5⁴ of y² = x³ − 5⁴x + 5⁶, up to 2 and 3), 625 (divides it, not a prime: with it
    the non-minimal model would pass, ellminimalmodel denies it) and no hint at all are refused."""
    from certify.pari import pari
    from soundness_pool import pari_curve

    assert [int(c) for c in pari.ellminimalmodel(pari_curve(NOT_MINIMAL_AT_5))[:5]] == [0, 0, 0, -1, 1]
    assert minimality_rejection(NOT_MINIMAL_AT_5, ["0"]).message.startswith("a listed prime is below 5")
    assert minimality_rejection(NOT_MINIMAL_AT_5, ["7"]).message.startswith("a listed prime is below 5")
    assert "confirm" in minimality_rejection(NOT_MINIMAL_AT_5, ["625"]).message
    assert minimality_rejection(NOT_MINIMAL_AT_5, []).values == {"unexplained": 625}


def scaled_model(a, p: int) -> tuple:
    """The model of the curve a after x = p²x', y = p³y' read backwards (a_i·p^i), then put in reduced form by
    x → x + r, y → y + sx + t (cypari2's ellchangecurve): integral, not minimal at p."""
    from certify.pari import pari
    from soundness_pool import pari_curve

    E = pari.ellchangecurve(pari_curve(a), [pari(1) / p, 0, 0, 0])
    for r in range(-4, 5):
        for s in range(-2, 3):
            for t in range(-30, 31):
                model = [int(c) for c in pari.ellchangecurve(E, [1, r, s, t])[:5]]
                if model[0] in (0, 1) and model[2] in (0, 1) and model[1] in (-1, 0, 1):
                    return tuple(model)
    raise AssertionError("no reduced form found")


@pytest.mark.parametrize("a, p", [((0, -1, 1, -10, -20), 2), ((0, -1, 1, -10, -20), 3)])
def test_a_model_that_scales_down_at_two_or_three_is_not_minimal(a, p):
    """On y² + y = x³ − x² − 10x − 20 (conductor 11 in Cremona's table). Kills the mutants of ``delta % p ** 12 == 0`` (!= 0, 12 -> 13, 0 -> 1), its deleted raise and the
    constants of scales_down_at (the numerators of Silverman's Table 3.1): a minimal curve scaled by u = 1/p
    and put in reduced form is integral with p¹² ‖ Δ at a prime of good reduction, and not minimal at p —
    cypari2's ellminimalmodel gives back the curve — while the curve itself passes."""
    from certify.pari import pari
    from certify.verifier.isogeny import check_reduced_minimal
    from soundness_pool import pari_curve

    model = scaled_model(a, p)
    assert tuple(int(c) for c in pari.ellminimalmodel(pari_curve(model))[:5]) == a
    failure = minimality_rejection(model, [])
    assert (failure.message, failure.values["p"]) == ("claim.curves[0] is not minimal at p", p)
    check_reduced_minimal(a, {"primes": []}, "claim.curves[0]")


def test_a_reduced_model_that_scales_down_at_three_only_with_s_one_is_refused_as_not_minimal():
    """Kills ``(a1 + 2 * s) % p: 2 -> 3`` in scales_down_at: y² + xy + y = x³ − x² − 326x + 5077 is reduced
    (a1 = a3 = 1, a2 = −1) but not minimal at 3: cypari2's ellglobalred (the reference library) gives the
    change [u, r, s, t] = [3, 4, 1, 11] to the minimal model. With a1 = 1, the integrality of
    a1′ = (a1 + 2s)/3 admits s ≡ 1 (mod 3) only; the mutant's (a1 + 3s) % 3 = 1 admits no s, finds no change
    and would let the model pass as minimal."""
    import cypari2

    from certify.verifier.isogeny import check_reduced_minimal

    model = (1, -1, 1, -326, 5077)
    pari = cypari2.Pari()
    change = pari.ellglobalred(pari.ellinit(list(model)))[1]
    assert int(change[0]) == 3
    with pytest.raises(Rejection) as caught:
        check_reduced_minimal(model, {}, "curve 0")
    assert caught.value.check == "minimal model" and caught.value.values["p"] == 3


# --- the guards of the x0-roots and division-roots methods, and the class graph ---

def first_curves(cert: dict, size: int) -> dict:
    """The certificate cut down to its first ``size`` listed curves: their edges among themselves, their
    minimality hints and witnesses, and the matching corner of the degree matrix."""
    kept = {str(i) for i in range(size)}
    claim, evidence = cert["claim"], cert["evidence"]
    claim["curves"] = claim["curves"][:size]
    claim["degrees"] = [row[:size] for row in claim["degrees"][:size]]
    evidence["minimality"] = evidence["minimality"][:size]
    evidence["edges"] = [e for e in evidence["edges"] if e["source"] in kept and e["target"] in kept]
    evidence["completeness"] = [w for w in evidence["completeness"] if w["curve"] in kept]
    return cert


def rational_roots_reference(polynomial) -> list:
    """The rational roots of an integer polynomial (a sympy Poly), by sympy's factorisation over Q."""
    return sorted(-f.nth(0) / f.nth(1) for f, _ in polynomial.factor_list()[1] if f.degree() == 1)


def x0_witness(j: Fraction, ell: int) -> dict:
    """An x0-roots witness for ℓ at j, its roots those of P_ℓ(t) − j·t by sympy (P_ℓ: j = P_ℓ(t)/t, Maier 2009,
    Table 3 — the Hauptmoduln written out here, not taken from the verifier), its prime the least odd prime
    not dividing the leading coefficient at which the squarefree part stays squarefree."""
    import sympy

    t = sympy.symbols("t")
    hauptmodul = {2: (t + 16) ** 3, 3: (t + 27) * (t + 3) ** 3, 5: (t ** 2 + 10 * t + 5) ** 3,
                  7: (t ** 2 + 13 * t + 49) * (t ** 2 + 5 * t + 1) ** 3}[ell]
    f = sympy.Poly(j.denominator * hauptmodul - j.numerator * t, t)
    core = sympy.Poly(sympy.quo(f, sympy.gcd(f, f.diff(t))), t)
    p = next(q for q in sympy.primerange(3, 1000)
             if f.LC() % q and sympy.Poly(core.as_expr(), t, modulus=q).discriminant() != 0)
    return {"method": "x0-roots", "prime": str(p), "roots": [str(r) for r in rational_roots_reference(f)]}


def with_witness(cert: dict, curve: int, ell: int, replacement: dict) -> dict:
    witness(cert, curve, ell).update(replacement)
    for key in set(witness(cert, curve, ell)) - set(replacement) - {"curve", "degree"}:
        del witness(cert, curve, ell)[key]
    return cert


CONGRUENT_ONE = (0, 0, 0, -1, 0)
"""y² = x³ − x, j = 1728: ellisomat gives four curves, y² = x³ − x joined by 2-isogenies to the three
others, one through each of its rational 2-torsion points (0, 0), (1, 0), (−1, 0)."""


def test_an_x0_witness_at_j_1728_is_refused_so_a_class_missing_a_curve_is_refused():
    """Kills ``j in (0, 1728)`` -> False, its 1728 -> 1729, and the deleted raise of x0_roots_bound: at
    j = 1728 the curves y² = x³ + ax have one or three rational 2-isogenies as −a is a square or not, while
    P_2(t) − 1728t = (t − 8)²(t + 64) has two rational roots whatever the twist, so the count from j is wrong
    there. The class of y² = x³ − x without its last curve, with the 2-witness of y² = x³ − x replaced by
    the roots 8 and −64, lists two 2-isogenies for that curve, as many as the roots: the mutants accept
    it, though ellisomat gives four curves."""
    cert = first_curves(certificate(CONGRUENT_ONE), 3)
    with_witness(cert, 0, 2, x0_witness(Fraction(1728), 2))
    assert witness(cert, 0, 2)["roots"] == ["-64", "8"]
    assert not claim_matches_reference(cert)
    failure = rejection(cert)
    assert (failure.check, failure.values) == ("x0 witness", {"j": Fraction(1728), "ell": 2})


def curve_with_j(j: Fraction) -> tuple:
    """y² + xy = x³ − 36x/(j − 1728) − 1/(j − 1728), of j-invariant j (Silverman III.1.4(c))."""
    return (1, 0, 0, -36 / (j - 1728), -1 / (j - 1728))


@pytest.mark.parametrize("j", [Fraction(1), Fraction(1729)])
def test_x0_witnesses_next_to_the_excluded_j_are_accepted(j):
    """Kills the constants of ``j in (0, 1728)`` moved to 1 and 1729: the x0 method is valid at every j but 0
    and 1728 (there X_0(ℓ) → X(1) ramifies and the count depends on the twist), so the certificate of the
    curve of j = 1 (of j = 1729), its witnesses for ℓ = 2, 3, 5, 7 of every listed curve with the same j
    (j by cypari2's ellinit) replaced by x0-roots witnesses whose roots sympy computes, is accepted, and ellisomat agrees."""
    from certify.pari import pari

    cert = certificate(tuple(Fraction(c) for c in curve_with_j(j)))
    replaced = 0
    for i, model in enumerate(cert["claim"]["curves"]):
        if Fraction(str(pari.ellinit([int(c) for c in model]).j())) == j:
            for ell in (2, 3, 5, 7):
                with_witness(cert, i, ell, x0_witness(j, ell))
                replaced += 1
    assert replaced >= 4
    assert accepted_and_true(cert)


def test_an_x0_witness_for_eleven_is_refused_by_its_method():
    """Kills ``ell not in X0_NUMERATORS`` -> False: the x0 method needs the genus-0 levels 2, 3, 5, 7, 13
    (X_0(11) has genus 1 and no Hauptmodul), so an x0-roots witness for ℓ = 11 is refused by its own check,
    not by a missing table entry."""
    cert = with_witness(certificate(THIRTEEN), 0, 11, {"method": "x0-roots", "prime": "5", "roots": []})
    failure = rejection(cert)
    assert failure.check == "x0 witness" and failure.values["ell"] == 11


def test_a_division_witness_for_five_is_refused_so_a_class_missing_its_five_isogenies_is_refused():
    """Kills the deleted raise of ``ell not in (2, 3)`` in division_roots_bound: on y² + y = x³ − x² − 10x − 20
    (conductor 11 in Cremona's table; ellisomat: three curves joined by 5-isogenies) ψ_3 has no rational
    root (no rational 3-isogeny), so the curve alone, its 5-witness replaced by the roots of ψ_3, would be
    accepted by the mutant with no 5-isogeny at all; the division method is for ℓ = 2 or 3 only."""
    cert = first_curves(certificate((0, -1, 1, -10, -20)), 1)
    with_witness(cert, 0, 5, {"method": "division-roots", "prime": "7", "roots": []})
    assert not claim_matches_reference(cert)
    failure = rejection(cert)
    assert (failure.check, failure.values) == ("division witness", {"ell": 5})


def test_two_classes_listed_as_one_are_refused_as_not_connected():
    """Kills the deleted raise of check_connected: the class of y² + y = x³ − x² − 10x − 20 (three curves)
    and the curve y² + y = x³ − x (conductor 37 in Cremona's table; ellisomat: alone in its class) listed as
    one class, each with its own complete evidence: every witness passes, but no edge reaches the fourth
    curve. (The degree matrix would refuse it next, having no finite degree for that pair.)"""
    cert = certificate((0, -1, 1, -10, -20))
    other = certificate((0, 0, 1, -1, 0))
    size = len(cert["claim"]["curves"])
    cert["claim"]["curves"] += other["claim"]["curves"]
    cert["claim"]["degrees"] = [row + ["1"] for row in cert["claim"]["degrees"]] + [["1"] * (size + 1)]
    cert["evidence"]["minimality"] += other["evidence"]["minimality"]
    cert["evidence"]["completeness"] += [dict(w, curve=str(size)) for w in other["evidence"]["completeness"]]
    assert not claim_matches_reference(cert)
    failure = rejection(cert)
    assert (failure.check, failure.values) == ("connected class", {"unreached": [size]})
