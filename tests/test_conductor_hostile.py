"""Hostile conductor certificates: hypothesis mutates valid certificates; the verifier must either reject
with its own Rejection or accept a claim that is true according to the reference library (cypari2's
ellglobalred, elllocalred and ellap, through conductor_reference.claim_is_true). Any other exception, or
a false claim accepted, fails the test. The limits are refused by name before the work they bound."""
import copy
from fractions import Fraction

import pytest
from hypothesis import HealthCheck, given, settings, strategies as st

from certify.conductor import certify_conductor, pocklington_base
from certify.pari import pari
from certify.verifier import verify
from certify.verifier.errors import Rejection
from certify.verifier.limits import (MAX_DISCRIMINANT_PRIMES, MAX_POCKLINGTON_CERTIFICATES, MAX_POCKLINGTON_DIGITS,
                                     MAX_PRIMALITY_WORK)
from certify.verifier.primality import MILLER_RABIN_BOUND
from conductor_reference import claim_is_true, fixture_rows
from seeded_certificates import SeededPool

SEEDS = [(0, -1, 1, -10, -20), (0, 0, 0, 0, 1), (Fraction(1, 2), 0, 0, 3, Fraction(-5, 4)), (0, 0, 0, -1, 0),
         (0, 0, 1, -1, 10 ** 30 + 7), (0, 0, 1, -1, 5224141144273181513418447124275393811521945597),
         *(a for _, a in fixture_rows("conductor_lt_1000.txt")[100::700])]
"""Split and non-split multiplicative reduction, additive reduction at 2 and 3, a rational model, primes
above the Miller–Rabin bound (one with a nested Pocklington certificate), and curves of Cremona's table."""

SETTINGS = settings(max_examples=80, deadline=None, suppress_health_check=list(HealthCheck), derandomize=True)

KODAIRA = ["I1", "I2", "I5", "I10", "II", "III", "IV", "I0*", "I1*", "I2*", "IV*", "III*", "II*", "I0", "i1", ""]
REDUCTIONS = ["split multiplicative", "non-split multiplicative", "additive", "good", "multiplicative"]
NUMBERS = ["0", "1", "2", "3", "4", "5", "6", "7", "8", "9", "10", "11", "12", "-1", "37", "64"]


POOL = SeededPool(certify_conductor, SEEDS, claim_is_true)
fresh, outcome = POOL.fresh, POOL.outcome


seeds = st.integers(0, len(SEEDS) - 1)
POCKLINGTON_SEEDS = [i for i in range(len(SEEDS)) if fresh(i)["evidence"]["pocklington"]]


@SETTINGS
@given(seeds, st.integers(0, 20), st.sampled_from(["conductor_exponent", "kodaira_symbol", "tamagawa_number",
                                                    "reduction"]), st.data())
def test_wrong_local_data(seed, k, key, data):
    """A wrong conductor exponent, Kodaira symbol, Tamagawa number or reduction at one bad prime."""
    cert = fresh(seed)
    entry = cert["claim"]["bad_primes"][k % len(cert["claim"]["bad_primes"])]
    pool = {"kodaira_symbol": KODAIRA, "reduction": REDUCTIONS}.get(key, NUMBERS)
    entry[key] = data.draw(st.sampled_from(pool))
    outcome(cert)


@SETTINGS
@given(seeds, st.sampled_from(["times", "divide", "replace"]), st.integers(-3, 40))
def test_wrong_conductor_or_discriminant(seed, how, value):
    """The conductor or the minimal discriminant multiplied, divided or replaced."""
    cert = fresh(seed)
    key = "conductor" if value % 2 else "minimal_discriminant"
    n = int(cert["claim"][key])
    cert["claim"][key] = str(n * value if how == "times" else n // (value or 1) if how == "divide" else value)
    outcome(cert)


@SETTINGS
@given(seeds, st.integers(0, 20), st.sampled_from(["exponent+1", "exponent-1", "drop", "add", "replace", "merge",
                                                    "swap"]), st.booleans())
def test_forged_factorisation(seed, k, how, with_claim):
    """The discriminant's factorisation changed — an exponent, a prime dropped, added or replaced, two primes
    merged into their (composite) product — optionally with the claim's bad primes changed to match."""
    cert = fresh(seed)
    factors, bad = cert["evidence"]["discriminant_factorisation"], cert["claim"]["bad_primes"]
    i = k % len(factors)
    if how.startswith("exponent"):
        factors[i]["exponent"] = str(int(factors[i]["exponent"]) + (1 if how == "exponent+1" else -1))
    elif how == "drop":
        del factors[i]
        if with_claim:
            del bad[i]
    elif how in ("add", "replace"):
        p = int(pari.nextprime(int(factors[-1]["prime"]) + 1 + k))
        entry = {"prime": str(p), "exponent": "1"}
        factors.append(entry) if how == "add" else factors.__setitem__(i, entry)
        if with_claim:
            local = dict(bad[i], prime=str(p))
            bad.append(local) if how == "add" else bad.__setitem__(i, local)
    elif how == "merge" and len(factors) > 1:
        p, q = factors[0], factors[1]
        factors[:2] = [{"prime": str(int(p["prime"]) * int(q["prime"])), "exponent": p["exponent"]}]
        if with_claim:
            bad[:2] = [dict(bad[0], prime=factors[0]["prime"])]
    else:
        factors.reverse()
        if with_claim:
            bad.reverse()
    outcome(cert)


def composite_with_forged_certificate(digits: int) -> dict:
    """A composite n = p·q above the Miller–Rabin bound with a Pocklington-shaped certificate: every prime
    factor of n − 1 (cypari2's factor), each with the first base that passes the gcd test alone."""
    p = int(pari.nextprime(10 ** (digits // 2)))
    n = p * int(pari.nextprime(10 ** (digits - digits // 2) + 12345))
    factors = []
    for q in (int(q) for q in pari.factor(n - 1)[0]):
        base = next(a for a in range(2, 1000) if pari.gcd(pow(a, (n - 1) // q, n) - 1, n) == 1)
        factors.append({"factor": str(q), "base": str(base)})
    return {"prime": str(n), "factors": factors}


@pytest.mark.parametrize("digits", [26, 40, 60])
def test_composite_claimed_prime_with_a_forged_certificate(digits):
    """A composite listed as a prime of the discriminant, with a forged Pocklington certificate: rejected
    (Pocklington's theorem: no valid certificate exists for a composite)."""
    cert = fresh(SEEDS.index((0, 0, 1, -1, 10 ** 30 + 7)))
    forged = composite_with_forged_certificate(digits)
    cert["evidence"]["pocklington"].insert(0, forged)
    factorisation = cert["evidence"]["discriminant_factorisation"]
    factorisation.append({"prime": forged["prime"], "exponent": "1"})
    factorisation.sort(key=lambda entry: int(entry["prime"]))
    with pytest.raises(Rejection) as rejection:
        verify(cert)
    assert rejection.value.check == "pocklington"


@SETTINGS
@given(st.sampled_from(POCKLINGTON_SEEDS), st.integers(0, 30), st.sampled_from(
    ["base", "base+1", "factor", "drop factor", "add factor", "prime", "drop certificate", "duplicate factor",
     "base n-1", "base 1"]), st.integers(2, 10 ** 6))
def test_bad_pocklington_certificate(seed, k, how, value):
    """A Pocklington certificate changed: a base or factor replaced, a factor dropped, added or repeated, the
    prime changed, a (nested) certificate dropped, degenerate bases."""
    cert = fresh(seed)
    certificates = cert["evidence"]["pocklington"]
    entry = certificates[k % len(certificates)]
    item = entry["factors"][k % len(entry["factors"])]
    n = int(entry["prime"])
    if how == "base":
        item["base"] = str(value)
    elif how == "base+1":
        item["base"] = str(int(item["base"]) + 1)
    elif how == "factor":
        item["factor"] = str(int(pari.nextprime(value)))
    elif how == "drop factor":
        entry["factors"].remove(item)
    elif how == "add factor":
        entry["factors"].append({"factor": str(int(pari.nextprime(value))), "base": "2"})
    elif how == "prime":
        entry["prime"] = str(n + 2 * value)
    elif how == "drop certificate":
        certificates.remove(entry)
    elif how == "duplicate factor":
        entry["factors"].append(dict(item))
    else:
        item["base"] = str(n - 1 if how == "base n-1" else 1)
    outcome(cert)


def paths(document, prefix=()):
    """Every (path, value) inside a JSON document."""
    yield prefix, document
    if isinstance(document, dict):
        for key, value in document.items():
            yield from paths(value, prefix + (key,))
    elif isinstance(document, list):
        for i, value in enumerate(document):
            yield from paths(value, prefix + (i,))


LEAVES = st.one_of(st.none(), st.booleans(), st.integers(-10 ** 30, 10 ** 30), st.text(max_size=6),
                   st.sampled_from(["0", "-0", "1/1", "2/4", "01", "1e9", "9" * 5000, "-", "3/0", "I5", "[]"]),
                   st.lists(st.sampled_from(["1", "2", "x"]), max_size=3), st.just({}))


@settings(max_examples=160, deadline=None, suppress_health_check=list(HealthCheck), derandomize=True)
@given(seeds, st.integers(0, 10 ** 6), st.sampled_from(["replace", "delete"]), LEAVES)
def test_structural_mutations_never_crash(seed, k, how, leaf):
    """Any field of the certificate replaced by junk, or deleted: a Rejection or a true claim, never a crash."""
    cert = fresh(seed)
    candidates = [path for path, _ in paths(cert) if path and path[0] != "relies_on"]
    path = candidates[k % len(candidates)]
    parent = cert
    for part in path[:-1]:
        parent = parent[part]
    if how == "delete":
        del parent[path[-1]]
    else:
        parent[path[-1]] = copy.deepcopy(leaf)
    outcome(cert)


@SETTINGS
@given(seeds, seeds, st.sampled_from(["model", "change", "curve", "evidence", "claim"]))
def test_foreign_parts(seed, other, part):
    """A part of another curve's certificate substituted: its minimal model, its change of variables, its
    curve, all its evidence or its claim."""
    cert, donor = fresh(seed), fresh(other)
    if part == "model":
        cert["evidence"]["minimal_model"]["curve"] = donor["evidence"]["minimal_model"]["curve"]
    elif part == "change":
        cert["evidence"]["minimal_model"]["change"] = donor["evidence"]["minimal_model"]["change"]
    elif part == "curve":
        cert["curve"] = donor["curve"]
    else:
        cert[part] = donor[part]
    outcome(cert)


def rejected_by(cert) -> str:
    with pytest.raises(Rejection) as rejection:
        verify(cert)
    return rejection.value.check


def test_too_many_discriminant_primes_are_refused_at_once():
    cert = fresh(0)
    cert["evidence"]["discriminant_factorisation"] = [{"prime": str(p), "exponent": "1"} for p in
                                                      (int(q) for q in pari.primes(MAX_DISCRIMINANT_PRIMES + 1))]
    assert rejected_by(cert) == "list size"


def test_too_many_pocklington_certificates_are_refused_at_once():
    cert = fresh(0)
    cert["evidence"]["pocklington"] = [{"prime": str(MILLER_RABIN_BOUND + 2 * i), "factors": [
        {"factor": "2", "base": "3"}]} for i in range(MAX_POCKLINGTON_CERTIFICATES + 1)]
    assert rejected_by(cert) == "primality limit"


def test_a_pocklington_number_over_the_digit_limit_is_refused_at_once():
    cert = fresh(0)
    cert["evidence"]["pocklington"] = [{"prime": "1" + "0" * MAX_POCKLINGTON_DIGITS + "7",
                                        "factors": [{"factor": "2", "base": "3"}]}]
    assert rejected_by(cert) == "primality limit"


def expensive_certificates(count: int) -> list:
    """``count`` Pocklington-shaped certificates of 1000-digit numbers n with n − 1 divisible by each of the
    40 listed primes and the factored part F of n − 1 larger than √n: everything short of the modular
    exponentiations passes, so only the budget stands between them and 40 exponentiations each."""
    small = [int(q) for q in pari.primes(40)]
    smooth = 2 ** 1700
    for q in small[1:]:
        smooth *= q
    numbers = [smooth * k + 1 for k in range(10 ** 400, 10 ** 400 + 4 * count, 2)][:count]
    return [{"prime": str(n), "factors": [{"factor": str(q), "base": "3"} for q in small]} for n in numbers]


def test_pocklington_work_over_the_budget_is_refused_before_any_exponentiation(monkeypatch):
    """Certificates whose exponentiations would take seconds each: refused by the budget before the first
    exponentiation (pow is replaced by a function that fails the test if it is called)."""
    from certify.verifier import primality

    def no_exponentiation(*args):
        raise AssertionError("an exponentiation ran before the budget was checked")

    cost = 40 * primality.exponentiation_cost(int(expensive_certificates(1)[0]["prime"]))
    cert = fresh(0)
    cert["evidence"]["pocklington"] = expensive_certificates(MAX_PRIMALITY_WORK // cost + 1)
    monkeypatch.setattr(primality, "pow", no_exponentiation, raising=False)
    assert rejected_by(cert) == "primality limit"
    monkeypatch.setattr(primality, "MAX_PRIMALITY_WORK", 2 * cost)   # one certificate within the budget:
    cert["evidence"]["pocklington"] = expensive_certificates(1)       # its exponentiations run
    with pytest.raises(AssertionError, match="an exponentiation ran"):
        verify(cert)


def test_a_genuine_pocklington_certificate_of_a_large_prime_is_accepted():
    """Pocklington's criterion on a prime p of about 300 digits with p − 1 = k·(product of the primes below
    700) (cypari2's isprime proves p prime independently); the bases are the certifier's own search."""
    from certify.verifier.primality import proven_primes

    smooth = 1
    for q in pari.primes(125):
        smooth *= int(q)
    p = next(k * smooth + 1 for k in range(2, 10 ** 5, 2) if pari.ispseudoprime(k * smooth + 1))
    assert p > 10 ** 290 and pari.isprime(p)
    factors = [(int(q), pocklington_base(p, int(q))) for q in pari.factor(p - 1)[0]]
    assert proven_primes({p: factors}) == {p}
    with pytest.raises(Rejection):                         # and p + 2, composite or not certified so
        proven_primes({p + 2: factors})
