"""Tests written for the mutants of tate.py, conductor.py, primality.py and models.py that survived the first
mutation run (issue 15; ``tests/mutation_run.py``). Each test names the mutants it kills.

Where a weakened check would accept a false claim, the test builds that certificate (from the certifier's, by
editing it) and asks cypari2 (ellglobalred, elllocalred, ellap through conductor_reference) or sympy that the
claim is false, so the verifier must reject it. Where the weakened check would only let a malformed certificate
through to a later check, or refuse a genuine one, the test holds the verifier to its documented rule.
"""
import copy
import functools
from fractions import Fraction

import pytest
import sympy

from certify.conductor import certify_conductor, pocklington_base, pocklington_certificates
from certify.pari import pari
from certify.verifier import verify
from certify.verifier.curves import change_model, discriminant, translate
from certify.verifier.errors import Rejection
from certify.verifier.limits import (MAX_DISCRIMINANT_PRIMES, MAX_POCKLINGTON_CERTIFICATES, MAX_POCKLINGTON_DIGITS,
                                     MAX_PRIMALITY_WORK)
from certify.verifier.primality import (MILLER_RABIN_BOUND, digits, exponentiation_cost, is_probable_prime_certain,
                                        proven_primes, read_factorisation, read_pocklington)
from certify.verifier.tate import local_data
from conductor_reference import claim_is_true


@functools.lru_cache(maxsize=None)
def _certificate_text(a: tuple) -> dict:
    return certify_conductor(tuple(Fraction(c) for c in a))


def certificate(a) -> dict:
    """A fresh copy of the certifier's conductor certificate for the curve a."""
    return copy.deepcopy(_certificate_text(tuple(a)))


def rejection(cert) -> Rejection:
    with pytest.raises(Rejection) as caught:
        verify(cert)
    return caught.value


def local_entry(data) -> dict:
    return {"prime": str(data.prime), "conductor_exponent": str(data.exponent), "kodaira_symbol": data.kodaira,
            "tamagawa_number": str(data.tamagawa), "reduction": data.reduction}


def with_local_data(cert: dict, model, local: list) -> dict:
    """The claim replaced by the one the given local data make (bad primes, and N = ∏ p^f_p)."""
    conductor = 1
    for data in local:
        conductor *= data.prime ** data.exponent
    cert["claim"]["bad_primes"] = [local_entry(data) for data in local]
    cert["claim"]["conductor"] = str(conductor)
    return cert


def composite_as_prime(c: int, pocklington=()) -> dict:
    """The certificate of y² + xy = x³ + c (discriminant −c(1 + 432c), c4 = 1, so minimal everywhere) with the
    composite c listed as one prime of the discriminant in place of its prime factors, the claim made as the
    verifier's Tate's algorithm computes it at c, and the given Pocklington entries added: false, since c is
    no prime (sympy), whatever else holds."""
    assert not sympy.isprime(c)
    cert = certificate((1, 0, 0, 0, c))
    model = tuple(int(v) for v in cert["evidence"]["minimal_model"]["curve"])
    factors = [entry for entry in cert["evidence"]["discriminant_factorisation"] if c % int(entry["prime"])]
    factors = sorted(factors + [{"prime": str(c), "exponent": "1"}], key=lambda entry: int(entry["prime"]))
    cert["evidence"]["discriminant_factorisation"] = factors
    cert["evidence"]["pocklington"] = [entry for entry in cert["evidence"]["pocklington"]
                                       if c % int(entry["prime"])] + list(pocklington)
    with_local_data(cert, model, [local_data(model, int(entry["prime"])) for entry in factors])
    assert not claim_is_true(cert)
    return cert


# --- tate.py ---

def test_a_model_past_type_two_star_is_not_minimal():
    """Kills ``a[4] % p ** 6: 6 -> 7`` and the deleted raise in starred_exceptional. y² = x³ + 5⁴x + 5⁶ is
    y² = x³ + x + 1 scaled by u = 5 (Silverman III.1): not minimal at 5; Tate's algorithm passes type II*
    there (Silverman IV.9.4, step 11). The certificate names it as the minimal model and claims type II* at
    5, as the first mutant computes; cypari2 (ellminimalmodel, ellglobalred) says the claim is false."""
    a = (0, 0, 0, 5 ** 4, 5 ** 6)
    cert = certificate(a)
    cert["evidence"]["minimal_model"] = {"change": ["1", "0", "0", "0"], "curve": [str(c) for c in a]}
    delta = int(discriminant(a))
    primes = [int(p) for p in pari.factor(abs(delta))[0]]
    cert["evidence"]["discriminant_factorisation"] = [{"prime": str(p), "exponent": str(int(pari.valuation(delta, p)))}
                                                       for p in primes]
    cert["claim"]["minimal_discriminant"] = str(delta)
    local = [local_data(a, p) for p in primes if p != 5]
    with_local_data(cert, a, local)
    cert["claim"]["bad_primes"].insert(1, {"prime": "5", "conductor_exponent": str(12 - 8), "kodaira_symbol": "II*",
                                           "tamagawa_number": "1", "reduction": "additive"})
    cert["claim"]["conductor"] = str(int(cert["claim"]["conductor"]) * 5 ** 4)
    assert [entry["prime"] for entry in cert["claim"]["bad_primes"]] == ["2", "5", "31"]
    assert not claim_is_true(cert)
    failure = rejection(cert)
    assert (failure.check, failure.values["p"]) == ("minimal model", 5)


# --- conductor.py ---

def test_a_bad_prime_left_out_of_the_claim_is_refused():
    """Kills the deleted raise of check_local_data for the list of bad primes: y² = x³ + 1 has bad primes 2
    and 3 (cypari2); the claim without 3's entry is false, though each listed entry and the conductor are right."""
    cert = certificate((0, 0, 0, 0, 1))
    del cert["claim"]["bad_primes"][-1]
    assert not claim_is_true(cert)
    assert rejection(cert).check == "bad primes"


def test_a_reduction_outside_the_three_kinds_is_refused_when_read():
    """Kills the deleted raise of read_local_data: 'good' is no kind of bad reduction (the format lists split
    multiplicative, non-split multiplicative and additive), refused as malformed before Tate's algorithm runs."""
    cert = certificate((0, -1, 1, -10, -20))
    cert["claim"]["bad_primes"][0]["reduction"] = "good"
    failure = rejection(cert)
    assert (failure.check, failure.values["reduction"]) == ("structure", "good")


def test_a_rational_minimal_model_is_refused_as_not_integral():
    """Kills the deleted raise of check_minimal_model: a minimal model is integral (Silverman VII.1), so a
    rational model stated as the minimal one is refused by that check, naming it."""
    a = ("1/2", "0", "0", "3", "-5/4")
    cert = certificate(tuple(Fraction(c) for c in a))
    cert["evidence"]["minimal_model"] = {"change": ["1", "0", "0", "0"], "curve": list(a)}
    failure = rejection(cert)
    assert (failure.check, failure.message) == ("minimal model", "the stated model is not integral")


# --- models.py ---

@pytest.mark.parametrize("r, s, t", [(0, 1, 0), (0, 0, 1), (1, 0, 0)], ids=["a1=2", "a3=3", "a2=3"])
def test_a_minimal_model_that_is_not_reduced_is_refused(r, s, t):
    """Kills the three dropped operands and the deleted raise of check_reduced_form: y² + y = x³ − x moved by
    x ↦ x + r, y ↦ y + sx + t (u = 1) is still minimal, with the same discriminant and local data, but it has
    a1 = 2, a3 = 3 or a2 = 3 (the others in range), so it is not the reduced model (Cremona, Algorithms, §3.2)."""
    a = (0, 0, 1, -1, 0)
    cert = certificate(a)
    moved = translate(a, r, s, t)
    assert change_model(a, (1, r, s, t)) == moved
    cert["evidence"]["minimal_model"] = {"change": ["1", str(r), str(s), str(t)], "curve": [str(c) for c in moved]}
    assert claim_is_true(cert)
    failure = rejection(cert)
    assert failure.check == "minimal model" and "not reduced" in failure.message


# --- primality.py: composites listed as primes of the discriminant ---

def test_a_composite_below_the_bound_is_not_a_prime_of_the_discriminant():
    """Kills the deleted 'is not prime' raise of check_prime: 35 = 5·7 listed as one prime."""
    failure = rejection(composite_as_prime(35))
    assert (failure.check, failure.values["p"]) == ("primality", 35)


def test_the_miller_rabin_bound_is_composite_and_no_prime_of_the_discriminant():
    """Kills MILLER_RABIN_BOUND + 1 and ``n >= MILLER_RABIN_BOUND -> n > ...`` in is_probable_prime_certain:
    3317044064679887385961981 is a strong pseudoprime to the first 13 prime bases (Sorenson and Webster 2016;
    sympy: composite), so Miller–Rabin must not be trusted at it."""
    assert not sympy.isprime(MILLER_RABIN_BOUND)
    assert not is_probable_prime_certain(MILLER_RABIN_BOUND)
    failure = rejection(composite_as_prime(MILLER_RABIN_BOUND))
    assert (failure.check, failure.values["p"]) == ("primality", MILLER_RABIN_BOUND)


def test_a_prime_above_the_bound_without_certificate_is_reported_as_such():
    """Kills the deleted first raise of check_prime: with the Pocklington certificates removed, the prime
    10^30-sized factor of the discriminant of y² + y = x³ − x + 10^30 + 7 (prime by sympy) is refused for
    want of a certificate, not called composite."""
    cert = certificate((0, 0, 1, -1, 10 ** 30 + 7))
    cert["evidence"]["pocklington"] = []
    failure = rejection(cert)
    assert failure.check == "primality" and sympy.isprime(failure.values["p"])
    assert "no Pocklington certificate" in failure.message


@functools.lru_cache(maxsize=None)
def chernick_carmichael() -> int:
    """(6k + 1)(12k + 1)(18k + 1) with the three factors prime, above the Miller–Rabin bound: a Carmichael
    number (Chernick 1939), so a^(n−1) ≡ 1 (mod n) for every a prime to n."""
    k = 14 * 10 ** 6
    while not all(sympy.isprime(m * k + 1) for m in (6, 12, 18)):
        k += 1
    return (6 * k + 1) * (12 * k + 1) * (18 * k + 1)


def test_a_composite_factor_of_n_minus_1_does_not_prove_a_carmichael_number_prime():
    """Kills the deleted 'not proven prime' raise of check_pocklington: for a Carmichael number n, q = n − 1
    (composite) with base 2 meets every other condition (2^(n−1) ≡ 1, gcd(2 − 1, n) = 1, F = n − 1)."""
    n = chernick_carmichael()
    cert = composite_as_prime(n, [{"prime": str(n), "factors": [{"factor": str(n - 1), "base": "2"}]}])
    failure = rejection(cert)
    assert (failure.check, failure.message) == ("pocklington", "a listed factor of n - 1 is not proven prime")


@functools.lru_cache(maxsize=None)
def two_prime_composite() -> tuple:
    """(n, q, a): n = (2q + 1)(6q + 1) above the bound with q, 2q + 1, 6q + 1 prime (cypari2's isprime), and a
    of order q modulo both factors, so that a^(n−1) ≡ 1 and gcd(a^((n−1)/q) − 1, n) = 1 with q ‖ n − 1 =
    4q(3q + 2): only the size of F = q (√n ≈ 3.5q) stands between n and a false proof."""
    q = int(pari.nextprime(53 * 10 ** 10))
    while q % 3 != 2 or not (pari.isprime(2 * q + 1) and pari.isprime(6 * q + 1)):
        q = int(pari.nextprime(q + 1))
    p1, p2 = 2 * q + 1, 6 * q + 1
    order_q_mod_p2 = next(x ** 6 % p2 for x in range(2, 100) if pow(x, 6, p2) != 1)
    a = int(pari.lift(pari.chinese(pari.Mod(4, p1), pari.Mod(order_q_mod_p2, p2))))
    return p1 * p2, q, a


def test_a_factored_part_below_the_square_root_proves_nothing():
    """Kills the deleted 'too small' raise of check_pocklington and ``(factored + 1) ** 2: 2 -> 3``:
    Pocklington's criterion needs (F + 1)² > n (Brillhart, Lehmer and Selfridge 1975, Theorem 4); here
    (F + 1)³ > n, and n is composite (sympy)."""
    n, q, a = two_prime_composite()
    assert (q + 1) ** 3 > n >= (q + 1) ** 2 and n >= MILLER_RABIN_BOUND
    cert = composite_as_prime(n, [{"prime": str(n), "factors": [{"factor": str(q), "base": str(a)}]}])
    failure = rejection(cert)
    assert failure.check == "pocklington" and "too small" in failure.message


def test_a_base_that_is_one_modulo_a_factor_of_n_proves_nothing():
    """Kills the deleted gcd raise and ``gcd(partial - 1, n)``: ``1 -> 2`` in check_pocklington: n = p1·p2 (sympy:
    composite), every prime factor of n − 1 listed (cypari2's factor), and a ≡ −1 mod p1, 1 mod p2, so that
    a^(n−1) ≡ 1 (mod n) but p2 divides a^((n−1)/q) − 1 for every q."""
    p1 = int(pari.nextprime(10 ** 12))
    p2 = int(pari.nextprime(MILLER_RABIN_BOUND // p1 + 1000))
    n = p1 * p2
    assert MILLER_RABIN_BOUND <= n < 2 * MILLER_RABIN_BOUND   # so every q <= (n - 1)/2 is below the bound
    a = int(pari.lift(pari.chinese(pari.Mod(-1, p1), pari.Mod(1, p2))))
    factors = [{"factor": str(int(q)), "base": str(a)} for q in pari.factor(n - 1)[0]]
    failure = rejection(composite_as_prime(n, [{"prime": str(n), "factors": factors}]))
    assert (failure.check, failure.message) == ("pocklington", "gcd(a^((n-1)/q) - 1, n) is not 1")


# --- primality.py: the rules of a Pocklington certificate ---

def large_prime_certificate(cert_seed=(0, 0, 1, -1, 10 ** 30 + 7)) -> dict:
    cert = certificate(cert_seed)
    assert cert["evidence"]["pocklington"]
    return cert


def test_a_pocklington_certificate_below_the_bound_is_refused():
    """Kills ``n < MILLER_RABIN_BOUND -> False`` in read_pocklington: a valid certificate for the prime 1000003
    (sympy) is refused, since below the bound Miller–Rabin decides (the format's rule)."""
    cert = large_prime_certificate()
    n = 1000003
    cert["evidence"]["pocklington"].append({"prime": str(n), "factors": [
        {"factor": str(q), "base": str(pocklington_base(n, q))} for q in sympy.primefactors(n - 1)]})
    failure = rejection(cert)
    assert (failure.check, failure.values["prime"]) == ("primality limit", n)


def test_a_pocklington_certificate_listed_twice_is_refused():
    """Kills ``n in certificates -> False`` in read_pocklington: each number is listed once."""
    cert = large_prime_certificate()
    cert["evidence"]["pocklington"].append(copy.deepcopy(cert["evidence"]["pocklington"][0]))
    assert rejection(cert).check == "primality limit"


def test_a_factor_of_n_minus_1_listed_twice_is_refused():
    """Kills the deleted 'listed twice' raise of check_pocklington."""
    cert = large_prime_certificate()
    factors = cert["evidence"]["pocklington"][0]["factors"]
    factors.append(dict(factors[0]))
    failure = rejection(cert)
    assert (failure.check, failure.message) == ("pocklington", "a factor of n - 1 is listed twice")


@pytest.mark.parametrize("factor", ["0", "7919"])
def test_a_factor_that_does_not_divide_n_minus_1_is_refused(factor):
    """Kills ``q < 2 -> False`` (the factor 0 would divide by zero), ``cofactor % q -> False`` and the deleted
    'does not divide' raise of check_pocklington: 0 and a prime not dividing p − 1 (checked) are no factors."""
    cert = large_prime_certificate()
    entry = cert["evidence"]["pocklington"][0]
    assert (int(entry["prime"]) - 1) % 7919
    entry["factors"].append({"factor": factor, "base": "2"})
    failure = rejection(cert)
    assert (failure.check, failure.message) == ("pocklington", "a listed factor does not divide n - 1")


@functools.lru_cache(maxsize=None)
def prime_seven_mod_eight() -> tuple:
    """(p, certifier's entries): the first prime above the bound with p ≡ 7 (mod 8) (sympy), so that
    (−1)^((p−1)/2) = −1 and (−2 | p) = −1 (the supplementary laws of quadratic reciprocity)."""
    p = sympy.nextprime(MILLER_RABIN_BOUND)
    while p % 8 != 7:
        p = sympy.nextprime(p)
    return p, pocklington_certificates([p])


def with_base_for_two(base_of) -> tuple:
    p, entries = prime_seven_mod_eight()
    entries = copy.deepcopy(entries)
    entry = next(e for e in entries if int(e["prime"]) == p)
    item = next(i for i in entry["factors"] if i["factor"] == "2")
    item["base"] = str(base_of(p))
    return p, entries


def test_the_base_n_minus_1_is_refused():
    """Kills ``1 < a < n - 1 -> 1 < a <= n - 1`` and the deleted base-range raise: for q = 2 and p ≡ 3 (mod 4)
    the base p − 1 passes both conditions (partial −1), yet the certificate's bases lie strictly between 1 and
    p − 1 (the format's rule)."""
    p, entries = with_base_for_two(lambda p: p - 1)
    with pytest.raises(Rejection) as caught:
        proven_primes(read_pocklington(entries))
    assert caught.value.message == "a base must lie strictly between 1 and n - 1"


def test_the_base_n_minus_2_is_accepted():
    """Kills ``1 < a < n - 1: 1 -> 2`` (the second constant): the base p − 2 ≡ −2 has
    (−2)^((p−1)/2) = (−2 | p) = −1 (Euler's criterion), so it proves the q = 2 part; p is prime (sympy)."""
    p, entries = with_base_for_two(lambda p: p - 2)
    assert p in proven_primes(read_pocklington(entries)) and sympy.isprime(p)


def test_a_factored_part_just_below_the_square_root_is_refused():
    """Kills ``(factored + 1) ** 2 <= n: 1 -> 2``: n = q² + 3q + 1 prime (sympy) with q prime, F = q, so that
    (F + 1)² ≤ n < (F + 2)²: Pocklington's criterion as stated needs (F + 1)² > n."""
    q = int(pari.nextprime(2 * 10 ** 12))
    while not pari.isprime(q * q + 3 * q + 1):
        q = int(pari.nextprime(q + 1))
    n = q * q + 3 * q + 1
    assert sympy.isprime(n) and n >= MILLER_RABIN_BOUND and (q + 1) ** 2 <= n < (q + 2) ** 2
    with pytest.raises(Rejection) as caught:
        proven_primes({n: [(q, pocklington_base(n, q))]})
    assert "too small" in caught.value.message


# --- primality.py: the limits, exactly at them (limits.py) ---

def test_a_pocklington_number_of_exactly_the_digit_limit_is_read():
    """Kills ``digits(n) > MAX_POCKLINGTON_DIGITS -> >=``: a number of MAX_POCKLINGTON_DIGITS digits is within
    the limit (the test of 10**1000 + 7 over it is in test_conductor_hostile)."""
    n = 10 ** (MAX_POCKLINGTON_DIGITS - 1) + 7
    assert digits(n) == MAX_POCKLINGTON_DIGITS
    assert read_pocklington([{"prime": str(n), "factors": [{"factor": "2", "base": "3"}]}]) == {n: [(2, 3)]}


def test_pocklington_work_exactly_at_the_budget_is_read():
    """Kills ``work > MAX_PRIMALITY_WORK -> >=``: certificates of total work exactly MAX_PRIMALITY_WORK."""
    big, middle, small = 10 ** 999 + 7, 10 ** 110 + 7, MILLER_RABIN_BOUND + 2
    rest = MAX_PRIMALITY_WORK - 9 * exponentiation_cost(big) - exponentiation_cost(middle)
    assert rest > 0 and rest % exponentiation_cost(small) == 0
    sizes = [(big, 9), (middle, 1), (small, rest // exponentiation_cost(small))]
    entries = [{"prime": str(n), "factors": [{"factor": "2", "base": "3"}] * count} for n, count in sizes]
    assert sum(count * exponentiation_cost(n) for n, count in sizes) == MAX_PRIMALITY_WORK
    assert sorted(read_pocklington(entries)) == sorted(n for n, _ in sizes)


def test_exactly_max_pocklington_certificates_are_read():
    """Kills ``len(entries) > MAX_POCKLINGTON_CERTIFICATES -> >=`` in check_certificate_count."""
    entries = [{"prime": str(MILLER_RABIN_BOUND + 2 * i), "factors": [{"factor": "2", "base": "3"}]}
               for i in range(MAX_POCKLINGTON_CERTIFICATES)]
    assert len(read_pocklington(entries)) == MAX_POCKLINGTON_CERTIFICATES


def test_exactly_max_discriminant_primes_are_read():
    """Kills ``len(entries) > MAX_DISCRIMINANT_PRIMES -> >=`` in read_factorisation."""
    entries = [{"prime": str(int(p)), "exponent": "1"} for p in pari.primes(MAX_DISCRIMINANT_PRIMES)]
    assert len(read_factorisation(entries, "f")) == MAX_DISCRIMINANT_PRIMES


# --- primality.py: the stated factorisation ---

def test_a_factorisation_missing_a_prime_is_refused():
    """Kills the deleted 'do not account for the whole' raise of check_factorisation: y² = x³ + 1 with 3 left
    out of the discriminant's factorisation and of the claim (whose conductor drops 3's part): false (cypari2)."""
    cert = certificate((0, 0, 0, 0, 1))
    cert["evidence"]["discriminant_factorisation"].pop()
    dropped = cert["claim"]["bad_primes"].pop()
    cert["claim"]["conductor"] = str(int(cert["claim"]["conductor"]) // 3 ** int(dropped["conductor_exponent"]))
    assert dropped["prime"] == "3" and not claim_is_true(cert)
    assert rejection(cert).check == "factorisation"


def test_a_wrong_exponent_in_the_factorisation_is_refused():
    """Kills the deleted 'stated exponent' raise of check_factorisation."""
    cert = certificate((0, -1, 1, -10, -20))
    entry = cert["evidence"]["discriminant_factorisation"][0]
    entry["exponent"] = str(int(entry["exponent"]) + 1)
    failure = rejection(cert)
    assert (failure.check, failure.message) == ("factorisation", "a stated exponent is not the valuation of the "
                                                "discriminant")


@pytest.mark.parametrize("prime, exponent", [("1", "1"), ("7", "0")])
def test_a_factorisation_entry_below_prime_or_exponent_one_is_refused_when_read(prime, exponent):
    """Kills ``p < 2 -> False`` and ``e < 1 -> False`` in read_factorisation: 1 is no prime, and an exponent 0
    lists a prime that does not divide the discriminant of y² + y = x³ − x² − 10x − 20 (−11⁵, cypari2)."""
    cert = certificate((0, -1, 1, -10, -20))
    factors = cert["evidence"]["discriminant_factorisation"]
    factors.insert(0, {"prime": prime, "exponent": exponent})
    failure = rejection(cert)
    assert failure.check == "factorisation" and "increase strictly" in failure.message
