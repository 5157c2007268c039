"""The conductor certifier: the conductor, minimal discriminant and local data at every bad prime, with the
evidence the verifier needs to recompute them.

The claim is computed by the verifier's own Tate's algorithm (``certify.verifier.tate``) on the reduced
minimal model; PARI only factors: the minimal discriminant (whose primes are the bad primes), and, for
each prime above the deterministic Miller–Rabin bound, enough of p − 1 for a Pocklington certificate.
Each factorisation gets FACTORING_SECONDS; past that the curve is refused with one line.
"""
from __future__ import annotations

from math import gcd

from certify.curves import Curve, _primes_dividing, format_rational
from certify.verifier import theorems
from certify.verifier.conductor import FORMAT, RELIES_ON
from certify.verifier.primality import MILLER_RABIN_BOUND
from certify.verifier.arith import valuation
from certify.verifier.tate import local_data

BASE_TRIALS = 1000
"""Bases tried for one factor q of a Pocklington certificate before the prime is taken for composite."""


def certify_conductor(a, given=None) -> dict:
    """The conductor certificate of the curve with coefficients ``a`` (Fractions); ``given`` are the
    coefficients as typed, kept in ``curve`` (their canonical forms when not given)."""
    reduced, change = Curve(a).minimal_model()
    model = tuple(int(c) for c in reduced.a)
    delta = int(reduced.discriminant)
    primes = sorted(_primes_dividing(delta, "to find the bad primes"))
    data = [local_data(model, p) for p in primes]
    conductor = 1
    for entry in data:
        conductor *= entry.prime ** entry.exponent
    return {
        "format": FORMAT,
        "version": "1",
        "curve": list(given) if given is not None else [format_rational(c) for c in a],
        "claim": {
            "conductor": str(conductor),
            "minimal_discriminant": str(delta),
            "bad_primes": [{"prime": str(d.prime), "conductor_exponent": str(d.exponent),
                            "kodaira_symbol": d.kodaira, "tamagawa_number": str(d.tamagawa),
                            "reduction": d.reduction} for d in data],
        },
        "evidence": {
            "minimal_model": {"change": [format_rational(v) for v in change], "curve": [str(c) for c in model]},
            "discriminant_factorisation": [{"prime": str(p), "exponent": str(valuation(delta, p))} for p in primes],
            "pocklington": pocklington_certificates(primes),
        },
        "relies_on": theorems.entries(RELIES_ON),
    }


def pocklington_certificates(primes: list) -> list:
    """Pocklington certificates for every prime above the Miller–Rabin bound and, in turn, for the factors
    of n − 1 they use that are above it too; smallest first."""
    pending, certificates = [p for p in primes if p >= MILLER_RABIN_BOUND], {}
    while pending:
        n = pending.pop()
        if n in certificates:
            continue
        factors = pocklington_factors(n)
        certificates[n] = [{"factor": str(q), "base": str(pocklington_base(n, q))} for q in factors]
        pending += [q for q in factors if q >= MILLER_RABIN_BOUND]
    return [{"prime": str(n), "factors": certificates[n]} for n in sorted(certificates)]


def pocklington_factors(n: int) -> list:
    """The smallest primes q of n − 1 whose q-parts multiply to F with (F + 1)² > n: the small ones
    first, so that few of them need certificates of their own."""
    candidates = iter(sorted(_primes_dividing(n - 1, "to prove a prime factor of the discriminant prime")))
    factored, chosen = 1, []
    while (factored + 1) ** 2 <= n:   # ends: with every prime of n − 1 taken, F = n − 1
        q = next(candidates)
        chosen.append(q)
        factored *= q ** valuation(n - 1, q)
    return chosen


def pocklington_base(n: int, q: int) -> int:
    """The least a ≥ 2 with a^(n−1) ≡ 1 (mod n) and gcd(a^((n−1)/q) − 1, n) = 1: for a prime n all but a
    fraction 1/q of the residues qualify."""
    for a in range(2, BASE_TRIALS + 2):
        partial = pow(a, (n - 1) // q, n)
        if pow(partial, q, n) == 1 and gcd(partial - 1, n) == 1:
            return a
    raise ArithmeticError(f"no Pocklington base below {BASE_TRIALS + 2} for a factor of the discriminant: "
                          "PARI's probable prime is composite")
