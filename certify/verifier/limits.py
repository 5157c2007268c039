"""The verifier's documented limits. A certificate over any of them is rejected at once, before the
work it would cause, with a message naming the limit: no file can make the verifier take
exponential time or unbounded memory."""

MAX_FILE_BYTES = 20_000_000
"""Largest certificate file read."""

MAX_DEPTH = 12
"""Deepest nesting of JSON arrays and objects in a certificate."""

MAX_LIST_LENGTH = 10_000
"""Longest list read anywhere in a certificate."""

MAX_DIGITS = 4000
"""Most decimal digits in one number (numerator or denominator)."""

MAX_HINT_PRIME = 100_000
"""Largest prime the verifier runs through: point counts and roots modulo p cost O(p) each."""

MAX_PRIMES = 64
"""Most primes with point counts in one certificate."""

MAX_SQUAREFREE_DEGREE = 12
"""Largest degree of a polynomial whose squarefree part the verifier computes (by Euclid over Q)."""

MAX_ELL = 13
"""Largest prime ℓ for which division polynomials (degree about ℓ²) are built."""

MAX_WORK = 5_000_000
"""Budget per certificate, in residue evaluations: Σ p over the point counts, plus Σ p·deg over the
polynomials solved from a prime hint. Checked from the stated hints before any count is run; each
polynomial is reduced mod p once, so an evaluation costs the same whatever the size of its coefficients."""

MAX_POLYNOMIAL_SIZE = 2_000_000
"""Largest degree × coefficient digits of a polynomial to be built (estimated from the model first)."""

MAX_KERNEL_SIZE = 100_000
"""Largest degree × coefficient digits of a kernel polynomial (a genuine 163-isogeny's is about 34,000)."""

MAX_KERNEL_DENOMINATOR = 10_000
"""Largest degree × digits of the common denominator of a kernel polynomial's coefficients: the exact
isogeny identity carries its cube (kernels from reduced minimal models have denominators of a digit or two)."""

# --- conductor certificates (certify/verifier/conductor.py, certify/verifier/primality.py) ---

MAX_DISCRIMINANT_PRIMES = 1000
"""Most distinct primes listed for the minimal discriminant (each costs a primality proof and one run of
Tate's algorithm; a discriminant within MAX_DIGITS has fewer than 1,300 distinct prime factors)."""

MAX_POCKLINGTON_CERTIFICATES = 500
"""Most Pocklington certificates in one certificate. They form one flat list, checked smallest first, so
that no proof recurses: there is no recursion depth to bound."""

MAX_POCKLINGTON_DIGITS = 1000
"""Most decimal digits of a number proven prime by a Pocklington certificate."""

MAX_PRIMALITY_WORK = 50_000
"""Budget for the Pocklington certificates: Σ over them of (listed factors of n − 1) × (digits of n / 100)³
(at least 1 each), about the number of modular exponentiations weighted by their cost relative to a
100-digit modulus (a 1000-digit one costs about 1000 units, some 0.1 s). Checked before any is run."""
