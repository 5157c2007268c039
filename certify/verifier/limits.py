"""The verifier's documented limits. A certificate over any of them is rejected at once, before the
work it would cause, with a message naming the limit: no file can make the verifier take
exponential time or unbounded memory."""

MAX_FILE_BYTES = 20_000_000
"""Largest certificate file read."""

MAX_DEPTH = 12
"""Deepest nesting of JSON arrays and objects in a certificate."""

MAX_LIST_LENGTH = 10_000
"""Most entries in one list or object anywhere in a document."""

MAX_STRING_LENGTH = 10_000
"""Longest string (or object key) anywhere in a document: room for a rational of two MAX_DIGITS parts."""

MAX_VALUES = 1_000_000
"""Most JSON values in one document, bounded before parsing by the count of the bytes ',', '[' and '{'
(an over-count, since those bytes may stand inside strings): a file of MAX_FILE_BYTES made of tiny
values would otherwise take gigabytes once parsed. A bundle of 1,000 certificates holds about 400,000."""

MAX_NAME_BYTES = 200
"""Longest name printed from inside a source (a bundle member's name, a store's curve and kind columns);
longer ones are cut, and every name is printed escaped (``report.printable``)."""

MAX_STORE_STEPS = 50_000_000
"""Most SQLite virtual-machine steps to fetch one row of a store (the first fetch includes the sort of a
store written without its key index); a store over it is unreadable."""

MAX_STORE_MEMORY = 200_000_000
"""SQLite's heap limit, in bytes, while a store is read (``PRAGMA hard_heap_limit``)."""

MAX_DIGITS = 4000
"""Most decimal digits in one number (numerator or denominator)."""

MAX_HINT_PRIME = 100_000
"""Largest prime the verifier runs through: point counts and roots modulo p cost O(p) each."""

MAX_PRIMES = 64
"""Most primes with point counts in one certificate."""

MAX_SQUAREFREE_DEGREE = 4
"""Largest degree of a polynomial whose squarefree part the verifier computes (by Euclid over Q; at most
0.4 s at MAX_DIGITS). Of the polynomials the verifier solves, only φ_2 − x(Q)ψ_2² with 2Q = O (degree 4)
can have multiple roots: ψ_ℓ, the 2-division cubic and P_ℓ(t) − j·t (j ≠ 0, 1728) are squarefree for a
non-singular curve, and φ_ℓ − x(Q)ψ_ℓ² is squarefree unless 2Q = O, a class the ℓ-parts for odd ℓ never
list. Every other hint prime must leave the polynomial squarefree and the leading coefficient a unit."""

MAX_LIFTING_WORK = 15_000
"""Budget per certificate for Hensel lifting: Σ over its root searches of (roots modulo the hint prime) ×
degree × D² / 10⁶, D the digits of the lifting modulus (about 2·lc(f)·f(0)); about 0.13 s per 1,000 units,
so two seconds at the limit. Each search is charged once its roots modulo p are known, before any is
lifted, since the author of the hint chooses how many there are; genuine certificates spend a few units."""

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

MAX_IDENTITY_SIZE = 160_000
"""Largest ℓ × estimated digits of the x-map N/D (``isogeny.x_map_digits`` + model digits + 8)
for which an isogeny identity is checked exactly, about two seconds at the limit for ℓ = 163. The two
genuine 163-isogenies of the class of j = −2^18·3^3·5^3·23^3·29^3 need 81,000 and 141,000."""

MAX_IDENTITY_TOTAL = 250_000
"""Largest sum of those sizes over the edges of one certificate."""

MAX_KERNEL_DENOMINATOR = 10_000
"""Largest degree × digits of the common denominator of a kernel polynomial's coefficients: the exact
isogeny identity carries its cube (kernels from reduced minimal models have denominators of a digit or two)."""

# --- conductor certificates (certify/verifier/conductor.py, certify/verifier/primality.py) ---

MAX_DISCRIMINANT_PRIMES = 1000
"""Most distinct primes listed in one factorisation of the evidence: the minimal discriminant, or b and
a² − 4b of a descent (each prime costs a primality proof, and at the discriminant one run of Tate's
algorithm; a number within MAX_DIGITS has fewer than 1,300 distinct prime factors)."""

MAX_POCKLINGTON_CERTIFICATES = 500
"""Most Pocklington certificates in one certificate. They form one flat list, checked smallest first, so
that no proof recurses: there is no recursion depth to bound."""

MAX_POCKLINGTON_DIGITS = 1000
"""Most decimal digits of a number proven prime by a Pocklington certificate."""

MAX_PRIMALITY_WORK = 10_000
"""Budget for the Pocklington certificates: Σ over them of (listed factors of n − 1) × ``exponentiation_cost(n)``
= ⌈(digits of n / 100)³⌉ + 1 units, each about one exponentiation modulo a 100-digit number (0.2 ms), so
about two seconds at the limit. Checked before any is run; genuine certificates need a few dozen units."""

# --- rank certificates (certify/verifier/rank.py, certify/verifier/descent.py) ---

MAX_RANK_POINTS = 64
"""Most points in a rank claim (each is reduced and multiplied at every character prime)."""

MAX_CHARACTER_ELL = 97
"""Largest prime ℓ of the reduction characters (a discrete logarithm in a group of order ℓ is found by ℓ steps)."""

MAX_DESCENT_PRIMES = 64
"""Most primes in the factorisation of b, or of a² − 4b, of a descent: dim V is at most 65."""

MAX_DESCENT_GENERATORS = 65
"""Most points, and most local generators, on one side of a descent: W lies in V, of dimension at most
MAX_DESCENT_PRIMES + 1, so more are never needed."""

MAX_DESCENT_ELEMENTS = 4096
"""Most exclusions on one side of a descent (they number |V/W| − 1, so W may have codimension at most 12 in V)."""

MAX_DISCS = 20_000
"""Most discs in all the disc covers of one certificate, counted before any is tested."""

MAX_DISC_DEPTH = 40
"""Largest k of a disc c + p^k Z_p."""

MAX_DISC_PRIME = 1_000_000_000
"""Largest prime p at which an exclusion by a disc cover is checked (membership witnesses, one Euler test
each, are checked at any prime of the factorisations)."""

MAX_RANK_WORK = 40_000
"""Budget per rank certificate for all its costly steps together, in units of about 0.1 ms (so about four
seconds at the limit): the point counts (a unit per 300 residue evaluations), the Pocklington certificates
(two units per ``exponentiation_cost`` unit), the analytic series (a unit per 30 of truncation × precision
bits), all charged before any check runs, and the local tests of a descent (a leaf test 1 + (D/1000)² units,
D the digits of the numbers it multiplies; a membership witness the same plus an Euler test), each charged
before it runs. Each step also keeps its own limit above."""

# --- analytic rank witnesses (certify/verifier/lseries.py, certify/verifier/intervals.py) ---

MAX_TRUNCATION = 12_000
"""Largest truncation point M of the L-series: a_p is needed at every prime up to M, counted or read from a
Frobenius hint. At 32 bits and the test point 6/5, a conductor of 500,000 needs M ≈ 3,650, one of 10⁶
M = 5,239 and one of 3·10⁶ M = 9,256 (MAX_ANALYTIC_COUNT_WORK stops counts alone at M ≈ 9,300; hints at the
larger primes reach further)."""

MAX_PRECISION_BITS = 128
"""Largest claimed precision b (the tails must be below 2^−b; the series are summed with b + 2·bits(M) + 10
bits). L-values of rank 0 and 1 curves are proven non-zero with 30 to 60 bits."""

MAX_ANALYTIC_SERIES_WORK = 400_000
"""Largest M × b: the series for L′(E, 1) takes one exponential integral per n ≤ M, each a series of about
b terms; one to two seconds at the limit."""

MAX_ANALYTIC_COUNT_WORK = 5_000_000
"""Budget for the a_p of an analytic witness, in residue evaluations: Σ p over the primes p ≤ M without a
Frobenius hint (one count each) plus FROBENIUS_HINT_WORK per hint, computed from M and the hinted primes
before any count or hint check (about two seconds at the limit). A witness lists at most one hint per prime
p ≤ M, the primes strictly increasing (so at most π(MAX_TRUNCATION) = 1,438 hints), each refused at once
otherwise."""

FROBENIUS_HINT_WORK = 1_500
"""Residue evaluations charged for one Frobenius hint, a bound for its check at any p ≤ MAX_TRUNCATION:
N = p + 1 − a_p < 2p + 2 < 2^15 is factored by trial division (under 160 steps) and multiplied into the
point at most ω(N) + 1 ≤ 6 times by numbers below 2^15, each at most 30 group operations of Ẽ(F_p)
costing about seven residue evaluations; a genuine hint, with ω(N) of 2 or 3, takes about a quarter of that."""

MAX_TEST_POINT_DENOMINATOR = 1000
"""Largest denominator of the functional-equation test point A, which must lie in (1, 2]."""
