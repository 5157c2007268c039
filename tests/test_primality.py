"""The verifier's primality proofs against sympy's isprime (a second reference library): deterministic
Miller–Rabin below 3.3·10²⁴ (Sorenson and Webster 2017) and Pocklington certificates above it."""
import random

import pytest
import sympy

from certify.conductor import pocklington_certificates
from certify.verifier.errors import Rejection
from certify.verifier.primality import (MILLER_RABIN_BOUND, check_prime, is_probable_prime_certain, proven_primes,
                                        read_pocklington)


def test_miller_rabin_agrees_with_sympy_on_random_numbers():
    generator = random.Random(1975)
    numbers = list(range(0, 3000)) + [generator.randrange(10 ** k, 10 ** (k + 1)) | 1 for k in range(3, 25)
                                      for _ in range(60)]
    for n in numbers:
        if n < MILLER_RABIN_BOUND:
            assert is_probable_prime_certain(n) == sympy.isprime(n), n


# Strong pseudoprimes to many small bases, recalled from memory (Jaeschke 1993; Sorenson and Webster 2017):
# each is composite (sympy says so), and only the full set of 13 bases catches the last two.
STRONG_PSEUDOPRIMES = [2047, 3215031751, 3825123056546413051, 318665857834031151167461]


@pytest.mark.parametrize("n", STRONG_PSEUDOPRIMES)
def test_strong_pseudoprimes_are_not_taken_for_primes(n):
    assert not sympy.isprime(n)
    assert not is_probable_prime_certain(n)


def test_above_the_bound_a_prime_needs_a_certificate():
    """The bound itself is a strong pseudoprime to the first 13 prime bases (memory; sympy: composite)."""
    assert not sympy.isprime(MILLER_RABIN_BOUND)
    p = sympy.nextprime(MILLER_RABIN_BOUND)
    with pytest.raises(Rejection):
        check_prime(p, set(), "p")
    entries = pocklington_certificates([p])
    check_prime(p, proven_primes(read_pocklington(entries)), "p")


@pytest.mark.parametrize("digits", [26, 40, 55])
def test_certificates_of_random_primes(digits):
    """Random primes (sympy's nextprime after a seeded random number): the certifier's certificates prove them, each factor of p − 1 above
    the bound proven by its own entry of the flat list."""
    p = sympy.nextprime(random.Random(digits).randrange(10 ** (digits - 1), 10 ** digits))
    entries = pocklington_certificates([p])
    proven = proven_primes(read_pocklington(entries))
    assert p in proven and all(sympy.isprime(n) for n in proven)


def test_trial_division_agrees_with_sympy_beyond_the_hint_limit():
    """arith.is_prime (trial division by 2, 3 and 6k ± 1 up to √n), which decides the hint primes and the
    primes of point counts, against sympy (reference library): on every n below 20,000 and within 2,000 of
    MAX_HINT_PRIME, on the products of two primes near √MAX_HINT_PRIME, and on the range above 10⁶ where
    the isogeny identity looks for its evaluation prime."""
    import sympy

    from certify.verifier.arith import is_prime
    from certify.verifier.limits import MAX_HINT_PRIME

    numbers = [*range(-3, 20_000), *range(MAX_HINT_PRIME - 2000, MAX_HINT_PRIME + 2000),
               *range(10 ** 6, 10 ** 6 + 3000)]
    reference = set(sympy.primerange(0, 10 ** 6 + 3000))
    assert [n for n in numbers if is_prime(n) != (n in reference)] == []
    primes = list(sympy.primerange(290, 340))
    assert not any(is_prime(p * q) for p in primes for q in primes)
