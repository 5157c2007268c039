"""The descent via 2-isogeny for the rank certificate: models, Selmer-group bookkeeping, quartic point
search, exclusions by disc covers and local membership witnesses.

Mathematics (Silverman–Tate, *Rational Points on Elliptic Curves*, 2nd ed., III.4–III.6; Silverman,
*The Arithmetic of Elliptic Curves*, 2nd ed., X.4; Cremona, *Algorithms for Modular Elliptic Curves*,
2nd ed., 3.6). A rational 2-torsion point moved to (0, 0) gives E: y² = x³ + A x² + B x with A, B
integers; Ē: y² = x³ − 2A x² + (A² − 4B) x is 2-isogenous to it by φ(x, y) = (y²/x², y(B − x²)/x²),
with dual φ̂(X, Y) = (Y²/(4X²), Y(B̄ − X²)/(8X²)). The map α(O) = 1, α(0, 0) = B, α(x, y) = x mod Q*²
is a homomorphism E(Q) → V = ⟨−1, p | B⟩ ⊆ Q*/Q*², and #α(E(Q))·#ᾱ(Ē(Q)) = 2^(r+2). An element d of V
is an image exactly when C_d: N² = d M⁴ + A M² e² + (B/d) e⁴ has a rational point with (M, e) ≠ (0, 0),
which then gives the point (d M²/e², d M N/e³) of E. The d with C_d soluble at every place of
T = {∞, 2} ∪ {odd p | B(A² − 4B)} form a group S_T ⊇ α(E(Q)), so rank ≤ dim S_T + dim S̄_T − 2.

For each side the certifier builds W ⊆ S_T from images of points (torsion included) and from elements
shown soluble at every place of T, and excludes one element of every non-zero coset of V/W: at ∞ by the
sign rule, or at a prime p by a cover of Z_p (chart t = M/e) and pZ_p (chart s = e/M) by discs on each
of which the leaf test of ``certify.verifier.descent.leaf_verdict`` shows the quartic a non-square. The
cover is found by splitting a disc into its p sub-discs while the test is inconclusive; a disc on which
the quartic is a square (Hensel) instead shows d soluble at p, and its centre is the membership witness.
"""
from __future__ import annotations

import functools
import json
import time
from collections import deque
from dataclasses import dataclass, field
from fractions import Fraction

from certify.curves import FactoringTooHard, _primes_dividing, format_rational, inverse_change
from certify.pari import pari
from certify.roots import rational_roots
from certify.verifier.arith import valuation
from certify.verifier.curves import b_invariants, change_point, on_curve
from certify.verifier.descent import (INFINITY, echelon, element_vector, image_vector, is_local_square, leaf_cost,
                                      leaf_verdict, membership_cost, quartics, real_soluble, reduce_vector)
from certify.verifier.limits import (MAX_DESCENT_ELEMENTS, MAX_DESCENT_PRIMES, MAX_DISC_DEPTH, MAX_DISC_PRIME, MAX_DISCS,
                                     MAX_RANK_WORK)

LOCAL_WORK_SHARE = MAX_RANK_WORK // 2
"""The most of the verifier's rank budget a descent's local tests may take: the rest is left for the point
counts, the primality proofs and an analytic witness."""

QUARTIC_HEIGHT = 10_000
"""Bound on the numerator and denominator of M/e in the search for points on a quartic C_d."""

WIDER_QUARTIC_HEIGHT = 30_000
"""Bound of the later search on the quartics of the local generators, made once when the points found are
fewer than the descent's bound. The cost grows as the square of the bound: on one quartic of a curve of
conductor 66, 0.01 s at 10⁴, 0.13 s at 10⁵ and 11 s at 10⁶."""

DEEP_QUARTIC_HEIGHTS = (100_000, 300_000, 1_000_000)
"""Bounds of the searches on the quartics of the local generators when a point is known to be missing or
probably is (``certify.rank.certificate.DEEP_SEARCH_SECONDS`` bounds their time)."""

CHART_DISCS = 5000
"""Most discs examined in one chart of one disc cover before the prime is given up for that element: an
exclusion at p lists at least p discs unless the whole chart is one leaf, so the primes of b(a² − 4b)
up to about this size can exclude (the verifier takes MAX_DISCS in all)."""

WITNESS_TRIES = 24
"""Small values of M (with e = 1, and of e with M = 1) tried for a membership witness before any disc is split."""

COSET_TRIES = 8
"""Elements of one coset of V/W tried for an exclusion before the descent is given up."""


@dataclass(frozen=True)
class DescentModel:
    """y² = x³ + A x² + B x, and the change [u, r, s, t] taking the integral model to it."""

    A: int
    B: int
    change: tuple


def descent_models(model) -> list:
    """One model y² = x³ + A x² + B x for each rational 2-torsion point of the integral model.

    With X = 4x, Y = 8y + 4a1x + 4a3 the model becomes Y² = X³ + b2 X² + 8b4 X + 16b6, monic and integral,
    so its 2-torsion points have integer X = e; moving e to 0 gives A = 3e + b2, B = 3e² + 2b2 e + 8b4.
    Then X = w² X' with w the largest integer such that w² | A and w⁴ | B keeps A, B integral and smaller.
    In all, x = (w/2)² x' + e/4 and y = (w/2)³ y' − (a1/2)(w/2)² x' − (a1 e/4 + a3)/2: the change
    [w/2, e/4, −a1/2, −(a1 e/4 + a3)/2] (Silverman III.1, Table 3.1)."""
    a1, _, a3, _, _ = model
    b2, b4, b6, _ = (int(v) for v in b_invariants(model))
    out = []
    for root in rational_roots([16 * b6, 8 * b4, b2, 1]):
        e = int(root)
        A, B = 3 * e + b2, 3 * e * e + 2 * b2 * e + 8 * b4
        w = 1
        try:
            primes = _primes_dividing(B, "to factor b for the descent")
        except FactoringTooHard:
            primes = [2]
        for p in primes:
            while A % (w * p) ** 2 == 0 and B % (w * p) ** 4 == 0:
                w *= p
        change = (Fraction(w, 2), Fraction(e, 4), Fraction(-a1, 2), -Fraction(a1 * e + 4 * a3, 8))
        out.append(DescentModel(A // w ** 2, B // w ** 4, change))
    return out


def compose(first: tuple, second: tuple) -> tuple:
    """The change [u, r, s, t] of ``first`` followed by ``second``: with x = u1²x1 + r1, y = u1³y1 + s1u1²x1 + t1
    and x1 = u2²x2 + r2, y1 = u2³y2 + s2u2²x2 + t2, it is [u1u2, u1²r2 + r1, u1s2 + s1, u1³t2 + s1u1²r2 + t1]."""
    u1, r1, s1, t1 = first
    u2, r2, s2, t2 = second
    return u1 * u2, u1 * u1 * r2 + r1, u1 * s2 + s1, u1 ** 3 * t2 + s1 * u1 * u1 * r2 + t1


def phi_dual(B_dual: int, point):
    """φ̂: Ē → E, (X, Y) ↦ (Y²/(4X²), Y(B̄ − X²)/(8X²)) (Silverman–Tate III.4)."""
    if point is None or point[0] == 0:
        return None
    X, Y = point
    return Y * Y / (4 * X * X), Y * (B_dual - X * X) / (8 * X * X)


def two_torsion(A: int, B: int) -> list:
    """The rational points of order 2 of y² = x³ + A x² + B x: (0, 0) and the rational roots of x² + A x + B."""
    roots = rational_roots([B, A, 1])
    return [(Fraction(0), Fraction(0))] + [(x, Fraction(0)) for x in roots]


def quartic_point(A: int, B: int, d: int, height: int = QUARTIC_HEIGHT):
    """A point (d M², d M N) of y² = x³ + A x² + B x from a point (M, N) of N² = d M⁴ + A M² + B/d with
    M ≠ 0 and M of height at most ``height`` (PARI's hyperellratpoints), or None."""
    quartic = pari.Polrev([B // d, 0, A, 0, d])
    for found in pari.hyperellratpoints(quartic, height):
        M, N = Fraction(str(found[0])), Fraction(str(found[1]))
        if M:
            point = (d * M * M, d * M * N)
            if on_curve((0, A, 0, B, 0), point):
                return point
    return None


# --- one prime: a disc cover, or a membership witness ---

@functools.lru_cache(maxsize=65536)
def local_verdict(A: int, B: int, d: int, p: int) -> tuple:
    """('soluble', M, e) with d M⁴ + A M² e² + (B/d) e⁴ a non-zero square in Q_p; ('excluded', t_discs,
    s_discs), covers of Z_p and pZ_p by discs on which f1 and f2 are non-squares; or ('unknown',).
    Remembered: the three descents of a curve with full 2-torsion, and the two passes, share elements."""
    quotient = B // d
    for M, e in [(m, 1) for m in range(min(p, WITNESS_TRIES))] + [(1, p * k) for k in range(WITNESS_TRIES // 4)]:
        n = d * M ** 4 + A * M * M * e * e + quotient * e ** 4
        if n and is_local_square(n, p):
            return "soluble", M, e
    f1, f2 = quartics(A, B, d)
    t = cover(f1, p, 0)
    if t[0] == "square":
        return "soluble", t[1], 1
    s = cover(f2, p, 1)
    if s[0] == "square":
        return "soluble", 1, s[1]
    if t[0] == s[0] == "non-square" and p <= MAX_DISC_PRIME:
        return "excluded", t[1], s[1]
    return ("unknown",)


def cover(f: list, p: int, depth: int) -> tuple:
    """Split p^depth Z_p, breadth first, into discs until the leaf test is conclusive on each:
    ('square', c) as soon as f is a square on some c + p^k Z_p; ('non-square', [[c, k], …]) when it is a
    non-square on every disc; ('unknown',) past CHART_DISCS discs or MAX_DISC_DEPTH."""
    queue, leaves, examined = deque([(0, depth)]), [], 0
    while queue:
        c, k = queue.popleft()
        examined += 1
        verdict = leaf_verdict(f, p, c, k)
        if verdict == "square":
            return "square", c
        if verdict == "non-square":
            leaves.append((c, k))
            continue
        if k == MAX_DISC_DEPTH or examined + len(queue) + p > CHART_DISCS:
            return ("unknown",)
        step = p ** k
        queue.extend((c + j * step, k + 1) for j in range(p))
    return "non-square", sorted(leaves, key=lambda disc: (disc[1], disc[0]))


# --- one side ---

@dataclass
class Side:
    """One side y² = x³ + A x² + B x of a descent: V from −1 and the primes of B, W and its evidence."""

    A: int
    B: int
    primes: list
    points: list = field(default_factory=list)
    generators: list = field(default_factory=list)
    exclusions: list = field(default_factory=list)
    basis: list = field(default_factory=list)

    @property
    def dimension(self) -> int:
        return 1 + len(self.primes)

    def element(self, vector: int) -> int:
        """The squarefree integer of a vector of V."""
        d = -1 if vector & 1 else 1
        for i, p in enumerate(self.primes):
            if vector >> (i + 1) & 1:
                d *= p
        return d

    def add_point(self, point) -> bool:
        """List the point when its image is not yet in W."""
        return self._enlarge(image_vector(point, self.B, self.primes), lambda: self.points.append(point))

    def add_generator(self, d: int, membership: list) -> None:
        self._enlarge(element_vector(d, self.primes, "a local generator"),
                      lambda: self.generators.append({"d": str(d), "membership": membership}))

    def _enlarge(self, vector: int, record) -> bool:
        if reduce_vector(vector, self.basis) == 0:
            return False
        self.basis = echelon(self.basis + [vector])
        record()
        return True

    def coset_representatives(self) -> list:
        """The canonical representatives of the non-zero cosets of V/W: sums of the unit vectors that are
        no leading bit of the basis."""
        leading = {1 << (b.bit_length() - 1) for b in self.basis}
        free = [1 << i for i in range(self.dimension) if 1 << i not in leading]
        representatives = [0]
        for unit in free:
            representatives += [r | unit for r in representatives]
        return representatives[1:]

    def coset(self, representative: int, limit: int) -> list:
        """Up to ``limit`` elements of the coset representative + W, smallest |d| first (smaller covers)."""
        elements = [representative]
        for b in self.basis:
            elements += [e ^ b for e in elements]
            if len(elements) >= 4 * limit:
                break
        return sorted(elements, key=lambda v: (abs(self.element(v)), v))[:limit]

    def entry(self) -> dict:
        return {"points": [[format_rational(x), format_rational(y)] for x, y in self.points],
                "local_generators": self.generators, "exclusions": self.exclusions}


class DescentGivenUp(Exception):
    """A coset of V/W could be neither excluded nor shown soluble within the caps, or time ran out."""


def complete_side(side: Side, places: list, deadline: float, found_point) -> None:
    """Make W = S_T on the side: exclude one element of every non-zero coset of V/W, or enlarge W by an
    element soluble at every place of T — by a rational point of its quartic when ``found_point(d)``
    returns one (on this side's curve), else as a local generator. Raises DescentGivenUp."""
    excluded = {}   # vector -> exclusion entry
    while True:
        if (1 << (side.dimension - len(side.basis))) - 1 > MAX_DESCENT_ELEMENTS:
            raise DescentGivenUp("V/W too large")
        covered = {reduce_vector(v, side.basis) for v in excluded}
        pending = [r for r in side.coset_representatives() if r not in covered]
        if not pending:
            break
        for representative in pending:
            if time.monotonic() > deadline:
                raise DescentGivenUp("time")
            outcome = decide_coset(side, representative, places)
            if outcome[0] == "excluded":
                excluded[outcome[1]] = outcome[2]
                continue
            d, membership = outcome[1], outcome[2]
            point = found_point(d)
            if point is None or not side.add_point(point):
                side.add_generator(d, membership)
            break   # W grew: the cosets change
    chosen = {}
    for vector, entry in excluded.items():
        chosen.setdefault(reduce_vector(vector, side.basis), entry)
    side.exclusions = [chosen[r] for r in sorted(chosen)]


def decide_coset(side: Side, representative: int, places: list) -> tuple:
    """('excluded', vector, entry) for an element of the coset excluded at some place of T, or
    ('soluble', d, membership) for one soluble at every place; raises DescentGivenUp when neither is found
    among COSET_TRIES elements."""
    for vector in side.coset(representative, COSET_TRIES):
        d = side.element(vector)
        if not real_soluble(side.A, side.B, d):
            return "excluded", vector, {"d": str(d), "place": INFINITY}
        membership, unknown = [], False
        for p in places:
            verdict = local_verdict(side.A, side.B, d, p)
            if verdict[0] == "excluded":
                return "excluded", vector, {"d": str(d), "place": str(p),
                                            "t_discs": [[str(c), str(k)] for c, k in verdict[1]],
                                            "s_discs": [[str(c), str(k)] for c, k in verdict[2]]}
            if verdict[0] == "soluble":
                membership.append({"prime": str(p), "M": str(verdict[1]), "e": str(verdict[2])})
            else:
                unknown = True
        if not unknown:
            return "soluble", d, membership
    raise DescentGivenUp("a coset undecided")


# --- a whole descent ---

@dataclass
class Descent:
    """A descent on one model: both sides complete, its bound and Selmer dimensions, the points found on the
    way (integral model), and the length of its JSON text."""

    model: DescentModel
    entry: dict
    bound: int
    dimensions: tuple
    new_points: list
    size: int


def model_points(descent_model: DescentModel, points: list, dual_points: list) -> list:
    """Points of the integral model: the points of E (descent coordinates) and the images under φ̂ of the
    points of Ē; None and the kernel of φ̂ are left out."""
    B_dual = descent_model.A ** 2 - 4 * descent_model.B
    images = [P for P in points + [phi_dual(B_dual, Q) for Q in dual_points if Q is not None] if P is not None]
    return [change_point(P, inverse_change(descent_model.change)) for P in images]


def generator_points(descent: Descent, height: int) -> list:
    """Points of the integral model from the quartics of the local generators of the descent, searched
    up to ``height``: where the descent's bound may still be met by points."""
    A, B = descent.model.A, descent.model.B
    phi_side = [quartic_point(A, B, int(g["d"]), height) for g in descent.entry["phi_dual"]["local_generators"]]
    dual_side = [quartic_point(-2 * A, A * A - 4 * B, int(g["d"]), height)
                 for g in descent.entry["phi"]["local_generators"]]
    return model_points(descent.model, phi_side, dual_side)


def factorisation(n: int) -> list:
    """[(p, v_p(n))] for |n|, primes increasing (PARI within FACTORING_SECONDS)."""
    primes = sorted(_primes_dividing(abs(n), "to factor b for the descent"))
    return [(p, valuation(abs(n), p)) for p in primes]


def descend(change, descent_model: DescentModel, known_points: list, deadline: float):
    """The descent on ``descent_model`` of the input curve, whose integral model is reached by ``change``,
    or None when it is given up. ``known_points`` are rational points of the integral model."""
    from certify.conductor import pocklington_certificates

    A, B = descent_model.A, descent_model.B
    A_dual, B_dual = -2 * A, A * A - 4 * B
    try:
        factors, factors_dual = factorisation(B), factorisation(B_dual)
    except FactoringTooHard:
        return None
    if max(len(factors), len(factors_dual)) > MAX_DESCENT_PRIMES:
        return None
    primes, primes_dual = [p for p, _ in factors], [p for p, _ in factors_dual]
    places = sorted({2} | set(primes) | set(primes_dual))
    side, dual = Side(A, B, primes), Side(A_dual, B_dual, primes_dual)
    for point in two_torsion(A, B) + [change_point(P, descent_model.change) for P in known_points]:
        side.add_point(point)
    for point in two_torsion(A_dual, B_dual):
        dual.add_point(point)
    new_points = []

    def on_side(d):
        point = quartic_point(A, B, d)
        new_points.extend(model_points(descent_model, [point], []))
        return point

    def on_dual(d):
        point = quartic_point(A_dual, B_dual, d)
        new_points.extend(model_points(descent_model, [], [point]))
        return point

    try:
        complete_side(side, places, deadline, on_side)
        complete_side(dual, places, deadline, on_dual)
    except DescentGivenUp:
        return None
    entry = {
        "change": [format_rational(v) for v in compose(change, descent_model.change)],
        "a": str(A), "b": str(B),
        "factorisation_b": [{"prime": str(p), "exponent": str(v)} for p, v in factors],
        "factorisation_b_dual": [{"prime": str(p), "exponent": str(v)} for p, v in factors_dual],
        "pocklington": pocklington_certificates(sorted(set(primes) | set(primes_dual))),
        "phi": dual.entry(),        # Sel^φ(E/Q) ⊆ ⟨−1, p | a² − 4b⟩ holds the images of Ē(Q) (Silverman X.4.9)
        "phi_dual": side.entry(),   # Sel^φ̂(Ē/Q) ⊆ ⟨−1, p | b⟩ holds α(E(Q))
    }
    if discs(entry) > MAX_DISCS or local_work(entry) > LOCAL_WORK_SHARE:
        return None
    dimensions = (len(dual.basis), len(side.basis))
    return Descent(descent_model, entry, sum(dimensions) - 2, dimensions, new_points, len(json.dumps(entry)))


def discs(entry: dict) -> int:
    """The number of discs in the covers of a descent entry."""
    return sum(len(x["t_discs"]) + len(x["s_discs"]) for name in ("phi", "phi_dual") for x in entry[name]["exclusions"]
               if x["place"] != INFINITY)


def local_work(entry: dict) -> int:
    """The verifier's charge for the local tests of a descent entry (``leaf_cost``, ``membership_cost``)."""
    A, B = int(entry["a"]), int(entry["b"])
    work = 0
    for name, (A_side, B_side) in (("phi_dual", (A, B)), ("phi", (-2 * A, A * A - 4 * B))):
        for generator in entry[name]["local_generators"]:
            for witness in generator["membership"]:
                work += membership_cost(A_side, B_side, int(witness["M"]), int(witness["e"]), int(witness["prime"]))
        for exclusion in entry[name]["exclusions"]:
            if exclusion["place"] != INFINITY:
                f = quartics(A_side, B_side, int(exclusion["d"]))[0]
                work += sum(leaf_cost(f, int(exclusion["place"]), int(k))
                            for _, k in exclusion["t_discs"] + exclusion["s_discs"])
    return work

