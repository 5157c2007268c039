"""Rational points for the rank certificate: the search, a maximal independent subset, and the primes
that prove the subset independent.

Search (PARI, generic algebra on a curve): ``ellratpoints`` lists the points of small naive height of
the integral model. Canonical heights (PARI's ``ellheightmatrix``) choose among them a set whose Gram
matrix — the height pairing — is non-singular; by the Néron–Tate theorem (Silverman, *The Arithmetic
of Elliptic Curves*, 2nd ed., Theorem VIII.9.3 and Prop. VIII.9.6) that holds exactly when the points
are independent modulo torsion. Heights are floating point and only guide the choice: the proof the
certificate carries is by reduction.

Proof by reduction (Silverman VII.2 for the homomorphism E(Q) → Ẽ(F_q)): for a prime ℓ and an odd
good prime q with ℓ ∥ N_q = #Ẽ(F_q), the ℓ-part of Ẽ(F_q) is cyclic of order ℓ and
χ_q(P) = (N_q/ℓ)·P̃ is a homomorphism E(Q) → Z/ℓ. If ℓ ∤ #E(Q)_tors (seen at one odd good prime p with
ℓ ∤ N_p, since torsion injects into Ẽ(F_p)) and the matrix (χ_q(P_i)) over F_ℓ has rank r, then
P_1 … P_r are independent modulo torsion: a relation Σ n_i P_i = T with some n_i ≢ 0 mod ℓ (divide
by ℓ while every n_i is a multiple) gives a non-zero vector killed by every χ_q.
"""
from __future__ import annotations

from fractions import Fraction

from certify.curves import Curve
from certify.pari import frobenius_trace, odd_primes, pari
from certify.verifier.limits import MAX_CHARACTER_ELL, MAX_PRIMES
from certify.verifier.rank import characters

SEARCH_HEIGHT = 10_000
"""Bound on the numerator and denominator of x in the first point search on the integral model."""

WIDER_HEIGHTS = (100_000, 1_000_000)
"""Bounds of the later searches, made while the points found are fewer than a descent's upper bound
(only the first of them when there is no upper bound). PARI's sieve takes about 1.5 ms and 25 ms per
curve for these on the curves of conductor below 1000."""

DEEP_HEIGHTS = (3_000_000, 10_000_000)
"""Bounds of the searches on the curve when a point is known to be missing or probably is."""

HEIGHT_CANDIDATES = 40
"""Points of least naive height among which a maximal independent set is chosen by canonical heights."""

INDEPENDENCE_TOLERANCE = 1e-8
"""A point is taken for independent of those chosen when the height of its component orthogonal to
their span (Gram–Schmidt in the height pairing) exceeds this fraction of its own height."""

TORSION_PRIME_TRIES = 20
"""Odd good primes tried, from the least, as the prime showing ℓ ∤ #E(Q)_tors; when ℓ divides every count
among them it almost surely divides #E(Q)_tors, and the next ℓ is tried."""

CHARACTER_PRIME_LIMIT = 5000
"""Largest odd prime tried as a character prime."""

ELLS = tuple(ell for ell in (2, 3, 5, 7, 11, 13) if ell <= MAX_CHARACTER_ELL)
"""The primes ℓ tried, in order; ℓ divides #E(Q)_tors for at most two of them (Mazur)."""


def to_pari(point) -> str:
    """A pair of Fractions as GP text [x, y]."""
    return f"[{point[0]}, {point[1]}]"


def naive_size(point) -> tuple:
    """A sort key: the naive height max(|num x|, den x) first, then the coordinates."""
    x, y = point
    return max(abs(x.numerator), x.denominator), x, y


def search(curve, height: int) -> list:
    """The affine rational points of the integral model (PARI's ellinit ``curve``) with x = m/n,
    |m|, n ≤ height, one of each pair ±P (PARI's ellratpoints)."""
    found = {}
    for point in curve.ellratpoints(height):
        x = str(point[0])
        if x not in found:
            found[x] = (Fraction(x), Fraction(str(point[1])))
    return list(found.values())


def independent_subset(curve, points: list) -> list:
    """A maximal subset of the points (of least naive height first) independent modulo torsion
    according to the canonical height pairing on the model (PARI's ellinit ``curve``): greedy
    Gram–Schmidt over the Gram matrix."""
    candidates = sorted({P[0]: P for P in points}.values(), key=naive_size)[:HEIGHT_CANDIDATES]
    if not candidates:
        return []
    gram = pari.ellheightmatrix(curve, pari("[" + ", ".join(to_pari(P) for P in candidates) + "]"))
    pairing = [[float(gram[i][j]) for j in range(len(candidates))] for i in range(len(candidates))]
    chosen, orthogonal = [], []   # orthogonal: the Gram–Schmidt vectors, as coefficient rows over the candidates
    for i, point in enumerate(candidates):
        if pairing[i][i] <= 0:
            continue
        vector = [0.0] * len(candidates)
        vector[i] = 1.0
        for w in orthogonal:
            projection = _pair(pairing, vector, w) / _pair(pairing, w, w)
            vector = [v - projection * c for v, c in zip(vector, w)]
        if _pair(pairing, vector, vector) > INDEPENDENCE_TOLERANCE * pairing[i][i]:
            chosen.append(point)
            orthogonal.append(vector)
    return chosen


def _pair(pairing, u, v) -> float:
    """⟨Σ u_i P_i, Σ v_j P_j⟩ from the Gram matrix."""
    return sum(u[i] * pairing[i][j] * v[j] for i in range(len(u)) if u[i] for j in range(len(v)) if v[j])


def point_count(model, p: int) -> int:
    """#Ẽ(F_p) at a good prime (PARI's ellap; the verifier recounts)."""
    return p + 1 - frobenius_trace(model, p)


def prove_independent(model, points: list) -> tuple:
    """(proven, evidence): the largest subset of the points (in their order) that characters prove
    independent, and the ``independence`` evidence for it (None when it is empty).

    Tries the ℓ of ELLS in order and keeps the first ℓ that proves every point, or else
    the one that proves the most. For each ℓ: a torsion prime, then character primes in increasing order,
    each kept only when it raises the rank of the character matrix."""
    if not points:
        return [], None
    delta = int(Curve(model).discriminant)
    best = None
    for ell in ELLS:
        attempt = _characters_for(model, points, ell, delta)
        if attempt is not None and (best is None or len(attempt[0]) > len(best[0])):
            best = attempt
        if best is not None and len(best[0]) == len(points):
            break
    if best is None or not best[0]:
        return [], None
    rows, ell, torsion_prime, primes = best
    proven = [points[i] for i in rows]
    return proven, {"ell": str(ell), "torsion_prime": str(torsion_prime),
                    "character_primes": [str(q) for q in primes]}


def _characters_for(model, points: list, ell: int, delta: int):
    """(independent row indices, ℓ, torsion prime, character primes) for one ℓ, or None when no torsion
    prime is found among TORSION_PRIME_TRIES (then ℓ probably divides #E(Q)_tors)."""
    tried = zip(range(TORSION_PRIME_TRIES), _good_primes(delta, CHARACTER_PRIME_LIMIT))
    torsion_prime = next((p for _, p in tried if point_count(model, p) % ell), None)
    if torsion_prime is None:
        return None
    columns, primes, basis = [], [], {}   # basis: an echelon basis of the column space, {pivot row: column}
    for q in _good_primes(delta, CHARACTER_PRIME_LIMIT):
        if len(basis) == len(points) or len(primes) + 2 > MAX_PRIMES:
            break
        if q == torsion_prime:
            continue
        count = point_count(model, q)
        if count % ell or count % (ell * ell) == 0:
            continue
        column = characters(model, points, ell, q, count)
        if _insert(basis, column, ell):
            columns.append(column)
            primes.append(q)
    rows = _independent_rows(columns, len(points), ell)
    return rows, ell, torsion_prime, primes


def _insert(basis: dict, column: list, ell: int) -> bool:
    """Reduce the column against the echelon basis {pivot: column}; add it when it is not in the span."""
    column = [c % ell for c in column]
    for pivot, vector in basis.items():
        if column[pivot]:
            factor = column[pivot] * pow(vector[pivot], -1, ell) % ell
            column = [(c - factor * v) % ell for c, v in zip(column, vector)]
    pivot = next((i for i, c in enumerate(column) if c), None)
    if pivot is None:
        return False
    basis[pivot] = column
    return True


def _independent_rows(columns: list, rows: int, ell: int) -> list:
    """Indices of a maximal set of rows of the matrix (given by its columns) independent over F_ℓ,
    earliest rows first."""
    chosen, basis = [], {}
    for i in range(rows):
        if _insert(basis, [column[i] for column in columns], ell):
            chosen.append(i)
    return chosen


def _good_primes(delta: int, limit: int):
    """The odd primes up to ``limit`` not dividing Δ, increasing."""
    for p in odd_primes():
        if p > limit:
            return
        if delta % p:
            yield p
