"""Proofs that integers are prime: deterministic Miller–Rabin below 3.3·10²⁴, and Pocklington
certificates above it.

A Pocklington certificate for n lists primes q dividing n − 1, each with a base a_q. Pocklington's
criterion (Pocklington 1914; Brillhart, Lehmer and Selfridge 1975, Theorem 4): if
a_q^(n−1) ≡ 1 (mod n) and gcd(a_q^((n−1)/q) − 1, n) = 1 for every listed q, then every prime
factor p of n satisfies p ≡ 1 (mod F), F the largest divisor of n − 1 made of the listed q; so
(F + 1)² > n proves n prime (a composite n has a prime factor p ≤ √n). Each q must itself be
proven prime: by Miller–Rabin when it is small, otherwise by another certificate of the same flat
list. Since q < n, certificates are checked in increasing order of n and no recursion is needed.
"""
from math import gcd

from certify.verifier.arith import parse_integer, valuation
from certify.verifier.certificate import field
from certify.verifier.errors import Rejection
from certify.verifier.limits import MAX_DISCRIMINANT_PRIMES, MAX_POCKLINGTON_CERTIFICATES, MAX_POCKLINGTON_DIGITS, MAX_PRIMALITY_WORK

MILLER_RABIN_BOUND = 3_317_044_064_679_887_385_961_981
"""Miller–Rabin to the first 13 prime bases is deterministic below this number (Sorenson and Webster 2016)."""

MILLER_RABIN_BASES = (2, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37, 41)


def is_probable_prime_certain(n: int) -> bool:
    """Primality, proved: Miller–Rabin to the first 13 prime bases is deterministic below 3.3·10²⁴
    (Sorenson and Webster 2016); larger numbers are refused."""
    if n < 2 or n >= MILLER_RABIN_BOUND:
        return False
    if n in MILLER_RABIN_BASES:
        return True
    if any(n % b == 0 for b in MILLER_RABIN_BASES):
        return False
    d, s = n - 1, 0
    while d % 2 == 0:
        d, s = d // 2, s + 1
    for b in MILLER_RABIN_BASES:
        x = pow(b, d, n)
        if x in (1, n - 1):
            continue
        for _ in range(s - 1):
            x = x * x % n
            if x == n - 1:
                break
        else:
            return False
    return True


def digits(n: int) -> int:
    """An upper bound for the number of decimal digits of n > 0, from its bit length."""
    return n.bit_length() * 30103 // 100000 + 1


def exponentiation_cost(n: int) -> int:
    """The cost of checking one listed factor q of n − 1, in units of about one modular exponentiation
    modulo a 100-digit number (0.2 ms): ⌈(digits/100)³⌉ for a^((n−1)/q) mod n (d squarings of d-digit
    numbers; measured, the cost grows as d^2.7), plus 1 for the proof that q is prime."""
    return -(-digits(n) ** 3 // 10 ** 6) + 1


def read_pocklington(entries: list) -> dict:
    """{n: [(q, a_q), …]} from the evidence, refused at once over the documented limits: at most
    MAX_POCKLINGTON_CERTIFICATES certificates, each n of at most MAX_POCKLINGTON_DIGITS digits, and
    Σ (number of listed q) × exponentiation_cost(n) at most MAX_PRIMALITY_WORK."""
    certificates, work = {}, 0
    check_certificate_count(entries)
    for i, entry in enumerate(entries):
        where = f"evidence.pocklington[{i}]"
        n = parse_integer(field(entry, "prime", str, where), f"{where}.prime")
        if n < MILLER_RABIN_BOUND or digits(n) > MAX_POCKLINGTON_DIGITS or n in certificates:
            raise Rejection("primality limit", f"{where}: a Pocklington certificate is for a number above the "
                            f"Miller–Rabin bound of at most {MAX_POCKLINGTON_DIGITS} digits, each listed once",
                            prime=n)
        factors = []
        for k, item in enumerate(field(entry, "factors", list, where)):
            factors.append((parse_integer(field(item, "factor", str, f"{where}.factors[{k}]"), "factor"),
                            parse_integer(field(item, "base", str, f"{where}.factors[{k}]"), "base")))
        work += len(factors) * exponentiation_cost(n)
        if work > MAX_PRIMALITY_WORK:
            raise Rejection("primality limit", "the Pocklington certificates need more work than the verifier allows",
                            limit=MAX_PRIMALITY_WORK)
        certificates[n] = factors
    return certificates


def check_certificate_count(entries: list) -> None:
    if len(entries) > MAX_POCKLINGTON_CERTIFICATES:
        raise Rejection("primality limit", f"more than {MAX_POCKLINGTON_CERTIFICATES} Pocklington certificates",
                        certificates=len(entries))


def pocklington_work(lists: list) -> int:
    """Σ (listed factors) × exponentiation_cost(n) over several lists of Pocklington certificates, from their
    sizes alone (each n's length, each list's length), so that a certificate carrying more than one list can
    be refused at once when together they exceed MAX_PRIMALITY_WORK."""
    work = 0
    for entries in lists:
        check_certificate_count(entries)
        for entry in entries:
            prime, factors = (entry.get(key) if isinstance(entry, dict) else None for key in ("prime", "factors"))
            if isinstance(prime, str) and isinstance(factors, list):
                work += len(factors) * exponentiation_cost(10 ** min(len(prime), MAX_POCKLINGTON_DIGITS + 1))
    return work


def check_pocklington(n: int, factors: list, proven: set) -> None:
    """n is prime by Pocklington's criterion (module docstring), every listed q being in ``proven``
    or below the Miller–Rabin bound and proven there."""
    if len({q for q, _ in factors}) != len(factors):
        raise Rejection("pocklington", "a factor of n - 1 is listed twice", prime=n)
    cofactor = n - 1
    for q, a in factors:
        if q < 2 or cofactor % q:
            raise Rejection("pocklington", "a listed factor does not divide n - 1", prime=n, factor=q)
        if q not in proven and not is_probable_prime_certain(q):
            raise Rejection("pocklington", "a listed factor of n - 1 is not proven prime", prime=n, factor=q)
        while cofactor % q == 0:
            cofactor //= q
    factored = (n - 1) // cofactor
    if (factored + 1) ** 2 <= n:
        raise Rejection("pocklington", "the factored part F of n - 1 is too small: (F + 1)^2 <= n", prime=n,
                        factored=factored)
    for q, a in factors:
        if not 1 < a < n - 1:
            raise Rejection("pocklington", "a base must lie strictly between 1 and n - 1", prime=n, base=a)
        partial = pow(a, (n - 1) // q, n)
        if pow(partial, q, n) != 1:
            raise Rejection("pocklington", "a^(n-1) is not 1 modulo n: n is not prime", prime=n, base=a)
        if gcd(partial - 1, n) != 1:
            raise Rejection("pocklington", "gcd(a^((n-1)/q) - 1, n) is not 1", prime=n, factor=q, base=a)


def proven_primes(certificates: dict) -> set:
    """The numbers the Pocklington certificates prove prime, checked in increasing order so that a
    factor q of n − 1 above the Miller–Rabin bound is proven before n."""
    proven = set()
    for n in sorted(certificates):
        check_pocklington(n, certificates[n], proven)
        proven.add(n)
    return proven


def check_prime(p: int, proven: set, what: str) -> None:
    """p is prime: proven by a Pocklington certificate, or by deterministic Miller–Rabin below the bound."""
    if p in proven:
        return
    if p >= MILLER_RABIN_BOUND:
        raise Rejection("primality", f"{what} is above the Miller–Rabin bound and has no Pocklington certificate",
                        p=p)
    if not is_probable_prime_certain(p):
        raise Rejection("primality", f"{what} is not prime", p=p)


# --- factorisations stated in the evidence ---

def read_factorisation(entries: list, where: str) -> list:
    """[(p, e)] from the evidence: at most MAX_DISCRIMINANT_PRIMES entries, primes strictly increasing
    from 2 on, exponents at least 1."""
    if len(entries) > MAX_DISCRIMINANT_PRIMES:
        raise Rejection("list size", f"more than {MAX_DISCRIMINANT_PRIMES} primes in {where}", primes=len(entries))
    out = []
    for i, entry in enumerate(entries):
        p = parse_integer(field(entry, "prime", str, f"{where}[{i}]"), f"{where}[{i}].prime")
        e = parse_integer(field(entry, "exponent", str, f"{where}[{i}]"), f"{where}[{i}].exponent")
        if p < 2 or e < 1 or (out and p <= out[-1][0]):
            raise Rejection("factorisation", f"{where}: the primes must increase strictly from 2 on, with "
                            "exponents >= 1", prime=p, exponent=e)
        out.append((p, e))
    return out


def check_primes_proven(factorisation: list, proven: set, what: str) -> None:
    """Every prime of the factorisation is proven prime (Pocklington certificates already checked)."""
    for p, _ in factorisation:
        check_prime(p, proven, what)


def check_factorisation(n: int, factorisation: list, what: str) -> None:
    """Each stated exponent is v_p(n), and n/∏ p^e is ±1. Each division is checked before the next, so
    the work is at most the number of bits of n."""
    rest = abs(n)
    for p, e in factorisation:
        v = valuation(rest, p)
        if v != e:
            raise Rejection("factorisation", f"a stated exponent is not the valuation of {what}",
                            prime=p, stated=e, valuation=v)
        rest //= p ** v
    if rest != 1:
        raise Rejection("factorisation", f"the listed primes do not account for the whole of {what}",
                        unexplained=rest)
