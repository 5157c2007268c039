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
