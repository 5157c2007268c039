"""Checks of a descent via 2-isogeny, which bounds the rank of E(Q) from above.

The mathematics (Silverman–Tate, *Rational Points on Elliptic Curves*, 2nd ed., III.4–III.6; Silverman,
*The Arithmetic of Elliptic Curves*, X.4): on E: y² = x³ + A x² + B x (A, B integers, B(A² − 4B) ≠ 0)
the map α(O) = 1, α(0, 0) = B, α(x, y) = x mod Q*² is a homomorphism E(Q) → Q*/Q*² whose image lies in
V = ⟨−1, p | B⟩; d ∈ V is an image only if C_d: N² = d M⁴ + A M² e² + (B/d) e⁴ has a point over R and
every Q_p. For a set T of places the d ∈ V with a point on C_d over every Q_v, v ∈ T, form a subgroup
S_T ⊇ α(E(Q)) (at each place the soluble d are the image of a local connecting homomorphism). The same
holds on Ē: y² = x³ − 2A x² + (A² − 4B) x, and #α(E(Q))·#ᾱ(Ē(Q)) = 2^(r+2), so

    r ≤ dim S_T + dim S̄_T − 2.

One side's evidence names W ⊆ S_T (images of rational points, and elements shown soluble at every place
of T) and excludes at a place of T one representative of every non-zero coset of V/W; as S_T is a group
containing W, a coset meets S_T only if its representative lies in it, so S_T = W. Here
T = {∞, 2} ∪ {odd p | B(A² − 4B)}, for which S_T is the Selmer group (Silverman X.4.9).

Elements of V are squarefree integers ±∏p (p | B), written as F_2-vectors in bits: bit 0 the sign,
bit i + 1 the i-th prime of B.

A point of C_d over Q_p has coprime p-adic (M, e): either t = M/e ∈ Z_p with f1(t) = d t⁴ + A t² + B/d
a square, or s = e/M ∈ pZ_p with f2(s) = d + A s² + (B/d) s⁴ a square. An exclusion at p is a partition
of Z_p (for f1) and of pZ_p (for f2) into discs c + p^k Z_p on each of which the leaf test shows f is
not a square.
"""
from fractions import Fraction

from certify.verifier.arith import Budget, parse_integer, valuation
from certify.verifier.certificate import field, rationals, read_point
from certify.verifier.curves import change_model
from certify.verifier.errors import Rejection
from certify.verifier.limits import (MAX_DESCENT_ELEMENTS, MAX_DESCENT_PRIMES, MAX_DISC_DEPTH, MAX_DISC_PRIME,
                                     MAX_DISCS, MAX_LOCAL_WORK)
from certify.verifier.primality import (check_factorisation, check_primes_proven, exponentiation_cost, proven_primes,
                                        read_factorisation, read_pocklington)

INFINITY = "infinity"


def check_descent(a, entry: dict) -> tuple:
    """The descent of ``evidence.descent`` on the curve a; returns (dim S_T, dim S̄_T, cosets excluded)."""
    where = "evidence.descent"
    change = rationals(field(entry, "change", list, where), 4, f"{where}.change")
    A = parse_integer(field(entry, "a", str, where), f"{where}.a")
    B = parse_integer(field(entry, "b", str, where), f"{where}.b")
    check_descent_model(a, change, A, B)
    primes_b = read_factorisation(field(entry, "factorisation_b", list, where), f"{where}.factorisation_b")
    primes_dual = read_factorisation(field(entry, "factorisation_b_dual", list, where), f"{where}.factorisation_b_dual")
    check_descent_primes(primes_b, primes_dual)
    proven = proven_primes(read_pocklington(field(entry, "pocklington", list, where)))
    check_primes_proven(primes_b, proven, "a prime of b")
    check_primes_proven(primes_dual, proven, "a prime of a^2 - 4b")
    check_factorisation(B, primes_b, "b")
    check_factorisation(A * A - 4 * B, primes_dual, "a^2 - 4b")
    places = sorted({2} | {p for p, _ in primes_b + primes_dual})
    sides = [field(entry, name, dict, where) for name in ("phi", "phi_dual")]
    check_descent_size(sides)
    budget = Budget(MAX_LOCAL_WORK, "local work")
    return (check_side(A, B, [p for p, _ in primes_b], sides[0], places, budget, f"{where}.phi"),
            check_side(-2 * A, A * A - 4 * B, [p for p, _ in primes_dual], sides[1], places, budget,
                       f"{where}.phi_dual"), sum(len(side["exclusions"]) for side in sides))


def check_descent_model(a, change, A: int, B: int) -> None:
    """The stated change of variables takes the input curve to y² = x³ + A x² + B x (which is then
    non-singular, its discriminant 16B²(A² − 4B) being the input's times u^−12)."""
    if change_model(a, change) != (0, A, 0, B, 0):
        raise Rejection("descent model", "the change of variables does not take the curve to y^2 = x^3 + a x^2 + b x",
                        change=[str(v) for v in change], a=A, b=B)


def check_descent_primes(primes_b: list, primes_dual: list) -> None:
    """Each factorisation has at most MAX_DESCENT_PRIMES primes (dim V ≤ MAX_DESCENT_PRIMES + 1)."""
    for name, primes in (("b", primes_b), ("a^2 - 4b", primes_dual)):
        if len(primes) > MAX_DESCENT_PRIMES:
            raise Rejection("descent size", f"{name} has more than {MAX_DESCENT_PRIMES} prime factors listed",
                            primes=len(primes))


def check_descent_size(sides: list) -> None:
    """Before any local test: at most MAX_DESCENT_ELEMENTS points, generators and exclusions on each side,
    and at most MAX_DISCS discs in all, each at depth at most MAX_DISC_DEPTH."""
    discs = 0
    for side in sides:
        for key in ("points", "local_generators", "exclusions"):
            if len(field(side, key, list, "descent side")) > MAX_DESCENT_ELEMENTS:
                raise Rejection("descent size", f"more than {MAX_DESCENT_ELEMENTS} entries in {key}",
                                entries=len(side[key]))
        for exclusion in side["exclusions"]:
            if isinstance(exclusion, dict) and exclusion.get("place") != INFINITY:
                discs += sum(len(field(exclusion, key, list, "exclusion")) for key in ("t_discs", "s_discs"))
    if discs > MAX_DISCS:
        raise Rejection("descent size", f"the disc covers have more than {MAX_DISCS} discs in all", discs=discs)


# --- one side: V, W, exclusions ---

def check_side(A: int, B: int, primes: list, side: dict, places: list, budget: Budget, where: str) -> int:
    """S_T = W on the side y² = x³ + A x² + B x; returns dim W."""
    curve = (0, A, 0, B, 0)
    images = [image_vector(read_point(curve, P, f"{where}.points[{i}]"), B, primes)
              for i, P in enumerate(field(side, "points", list, where))]
    for i, generator in enumerate(field(side, "local_generators", list, where)):
        here = f"{where}.local_generators[{i}]"
        d = parse_integer(field(generator, "d", str, here), f"{here}.d")
        images.append(element_vector(d, primes, here))
        check_soluble_over_reals(A, B, d, here)
        check_membership(A, B, d, field(generator, "membership", list, here), places, budget, here)
    basis = echelon(images)
    representatives = []
    for i, exclusion in enumerate(field(side, "exclusions", list, where)):
        here = f"{where}.exclusions[{i}]"
        d = parse_integer(field(exclusion, "d", str, here), f"{here}.d")
        representatives.append(element_vector(d, primes, here))
        place = field(exclusion, "place", str, here)
        if place == INFINITY:
            check_excluded_over_reals(A, B, d, here)
        else:
            p = parse_integer(place, f"{here}.place")
            check_exclusion_place(p, places, here)
            t_discs = read_discs(field(exclusion, "t_discs", list, here), p, 0, f"{here}.t_discs")
            s_discs = read_discs(field(exclusion, "s_discs", list, here), p, 1, f"{here}.s_discs")
            f1, f2 = quartics(A, B, d)
            for name, f, discs in (("t", f1, t_discs), ("s", f2, s_discs)):
                for c, k in discs:
                    check_non_square_disc(f, p, c, k, budget, f"{here}.{name}_discs", d=d)
    check_cosets(basis, representatives, 1 + len(primes), where)
    return len(basis)


def image_vector(point, B: int, primes: list) -> int:
    """α(P) as a vector: B for (0, 0), else x(P). α(E(Q)) ⊆ V (Silverman–Tate III.5), so x(P) is ±∏p^e
    (p | B) times a square, and its class is read off from the sign and the parities of the v_p(x)."""
    value = Fraction(B) if point[0] == 0 else point[0]
    vector = 1 if value < 0 else 0
    for i, p in enumerate(primes):
        if (valuation(value.numerator, p) + valuation(value.denominator, p)) % 2:
            vector |= 2 << i
    return vector


def element_vector(d: int, primes: list, where: str) -> int:
    """The vector of d ∈ V, which must be a squarefree ±∏p over the primes of B."""
    if d == 0:
        raise Rejection("descent element", f"{where}: d must be a non-zero squarefree product of primes of b", d=d)
    vector, rest = (1 if d < 0 else 0), abs(d)
    for i, p in enumerate(primes):
        if rest % p == 0:
            rest //= p
            vector |= 2 << i
    if rest != 1 or any(d % (p * p) == 0 for p in primes):
        raise Rejection("descent element", f"{where}: d is not a squarefree product of -1 and primes of b", d=d)
    return vector


def echelon(vectors: list) -> list:
    """A basis of the F_2-span of the vectors (bit masks), with distinct leading bits, largest first."""
    basis = []
    for v in vectors:
        v = reduce_vector(v, basis)
        if v:
            basis.append(v)
            basis.sort(reverse=True)
    return basis


def reduce_vector(v: int, basis: list) -> int:
    """The canonical representative of v modulo the span of an echelon basis."""
    for b in basis:
        v = min(v, v ^ b)
    return v


def check_cosets(basis: list, representatives: list, dimension: int, where: str) -> None:
    """The excluded elements lie in distinct non-zero cosets of V/W, one in each: 2^(dim V − dim W) − 1."""
    needed = (1 << (dimension - len(basis))) - 1
    seen = set()
    for i, v in enumerate(representatives):
        coset = reduce_vector(v, basis)
        if coset == 0:
            raise Rejection("cosets", f"{where}.exclusions[{i}] lies in W, which holds images of points and soluble "
                            "elements", index=i)
        if coset in seen:
            raise Rejection("cosets", f"{where}.exclusions[{i}] lies in the coset of an earlier exclusion", index=i)
        seen.add(coset)
    if len(seen) != needed:
        raise Rejection("cosets", f"{where}: not every non-zero coset of V/W has an excluded representative",
                        dim_V=dimension, dim_W=len(basis), needed=needed, excluded=len(seen))


# --- the real place ---

def real_soluble(A: int, B: int, d: int) -> bool:
    """Whether C_d(R) ≠ ∅. With X = M², Y = e² ≥ 0 the quartic is the form q(X, Y) = d X² + A XY + (B/d) Y²;
    q(1, 0) = d and q(0, 1) = B/d, so a real point exists when d > 0 or B/d > 0. Otherwise d < 0 < B and
    q < 0 on the open quadrant unless q has a root there, i.e. A > 0 and A² − 4B > 0 (its roots X/Y have
    product B/d² > 0 and sum −A/d, positive iff A > 0; real iff A² ≥ 4B, and A² ≠ 4B)."""
    return not (d < 0 < B and (A < 0 or A * A < 4 * B))


def check_soluble_over_reals(A: int, B: int, d: int, where: str) -> None:
    if not real_soluble(A, B, d):
        raise Rejection("real solubility", f"{where}: C_d has no real point, so d is not in the Selmer group", d=d)


def check_excluded_over_reals(A: int, B: int, d: int, where: str) -> None:
    if real_soluble(A, B, d):
        raise Rejection("exclusion at infinity", f"{where}: C_d has real points", d=d, a=A, b=B)


# --- p-adic places: squares, membership, disc covers ---

def is_local_square(n: int, p: int) -> bool:
    """Whether the integer n ≠ 0 is a square in Q_p: v_p(n) even and the unit part a square, i.e. a
    quadratic residue mod p for p odd (Euler's criterion) and ≡ 1 mod 8 for p = 2 (Serre, *A Course in
    Arithmetic*, II.3.3, Theorems 3 and 4)."""
    v = valuation(n, p)
    if v % 2:
        return False
    w = n // p ** v
    return w % 8 == 1 if p == 2 else pow(w % p, (p - 1) // 2, p) == 1


def quartics(A: int, B: int, d: int) -> tuple:
    """(f1, f2): f1(t) = d t⁴ + A t² + B/d and f2(s) = d + A s² + (B/d) s⁴, constant term first."""
    return [B // d, 0, A, 0, d], [d, 0, A, 0, B // d]


def check_membership(A: int, B: int, d: int, witnesses: list, places: list, budget: Budget, where: str) -> None:
    """d ∈ S_T: at each prime p of T, in order, integers (M, e) ≠ (0, 0) with n = d M⁴ + A M² e² + (B/d) e⁴
    a non-zero square in Q_p, so that (M, e, √n) is a Q_p-point of C_d."""
    primes = [parse_integer(field(w, "prime", str, f"{where}.membership[{i}]"), f"{where}.membership[{i}].prime")
              for i, w in enumerate(witnesses)]
    if primes != places:
        raise Rejection("membership", f"{where}: one witness is needed at each prime of T, in order", listed=primes,
                        places=places)
    for i, (p, witness) in enumerate(zip(places, witnesses)):
        here = f"{where}.membership[{i}]"
        M = parse_integer(field(witness, "M", str, here), f"{here}.M")
        e = parse_integer(field(witness, "e", str, here), f"{here}.e")
        budget.spend(1 + local_size(max(abs(M), abs(e), 1) ** 4 * (abs(A) + abs(B) + 1)) + exponentiation_cost(p),
                     f"{here}: the membership test", p=p)
        n = d * M ** 4 + A * M * M * e * e + (B // d) * e ** 4
        if n == 0 or not is_local_square(n, p):
            raise Rejection("membership", f"{here}: the quartic's value is not a non-zero square in Q_p", p=p, d=d,
                            M=M, e=e, value=n)


def check_exclusion_place(p: int, places: list, where: str) -> None:
    """An exclusion at a prime of T (2 or a prime of the factorisations) up to MAX_DISC_PRIME."""
    if p not in places:
        raise Rejection("exclusion place", f"{where}: the place is neither 2, a prime of b or of a^2 - 4b, nor "
                        "'infinity'", place=p)
    if p > MAX_DISC_PRIME:
        raise Rejection("exclusion place", f"{where}: disc covers are checked only at primes up to {MAX_DISC_PRIME}",
                        place=p)


def read_discs(entries: list, p: int, depth: int, where: str) -> list:
    """The discs [c, k] of a partition of p^depth Z_p: checked to be one before any leaf test."""
    discs = []
    for i, entry in enumerate(entries):
        if not isinstance(entry, list) or len(entry) != 2:
            raise Rejection("structure", f"{where}[{i}] must be a list [c, k]", found=entry)
        c, k = (parse_integer(v, f"{where}[{i}]") for v in entry)
        if not depth <= k <= MAX_DISC_DEPTH or not 0 <= c < p ** k or c % p ** depth:
            raise Rejection("disc cover", f"{where}[{i}]: a disc c + p^k Z_p needs {depth} <= k <= {MAX_DISC_DEPTH}, "
                            f"0 <= c < p^k and p^{depth} | c", c=c, k=k, p=p)
        discs.append((c, k))
    check_partition(discs, p, depth, where)
    return discs


def check_partition(discs: list, p: int, depth: int, where: str) -> None:
    """The discs partition p^depth Z_p. Two p-adic discs are nested or disjoint, so the list is a partition
    exactly when, merging from the deepest level up, every disc's p siblings are all present and no merged
    parent is also listed, until only the disc p^depth Z_p itself is left."""
    levels = {}
    for c, k in discs:
        if c in levels.setdefault(k, set()):
            raise Rejection("disc cover", f"{where}: a disc is listed twice (an overlap)", c=c, k=k, p=p)
        levels[k].add(c)
    for k in range(max(levels, default=depth), depth, -1):
        children = {}
        for c in levels.get(k, ()):
            children[c % p ** (k - 1)] = children.get(c % p ** (k - 1), 0) + 1
        for parent, count in children.items():
            if count != p:
                raise Rejection("disc cover", f"{where}: the discs leave a gap (a disc with only some of its p "
                                "sub-discs)", c=parent, k=k - 1, p=p, present=count)
            if parent in levels.setdefault(k - 1, set()):
                raise Rejection("disc cover", f"{where}: a disc is listed together with its sub-discs (an overlap)",
                                c=parent, k=k - 1, p=p)
            levels[k - 1].add(parent)
    if levels.get(depth) != {0}:
        raise Rejection("disc cover", f"{where}: the discs do not cover p^{depth} Z_p", p=p)


def local_size(bound: int) -> int:
    """Work units of one local test on numbers up to ``bound``: (digits / 1000)², a product of two such numbers
    taking about a unit."""
    return (bound.bit_length() // 3322) ** 2


def shifted(f: list, c: int, m: int) -> list:
    """The coefficients of g(u) = f(c + m u), by Taylor's formula g_i = m^i Σ_j binom(j, i) c^(j−i) f_j."""
    g = list(f)
    for i in range(len(g)):   # synthetic division by u − c, repeated: the Taylor coefficients at c
        for j in range(len(g) - 2, i - 1, -1):
            g[j] += c * g[j + 1]
    return [coefficient * m ** i for i, coefficient in enumerate(g)]


def leaf_verdict(f: list, p: int, c: int, k: int):
    """The leaf test on the disc c + p^k Z_p: 'non-square' or 'square' when it is conclusive, else None.

    With g(u) = f(c + p^k u) = Σ g_i u^i, v = v_p(g_0) and g_0 ≠ 0: if v_p(g_i) ≥ v + 1 (p odd) or v + 3
    (p = 2) for every i ≥ 1, then f = p^v (w + p Z_p) (resp. p^v (w + 8 Z_2)) on the disc, w = g_0/p^v, so f is
    a square everywhere on it or nowhere, as g_0 is (Serre, *A Course in Arithmetic*, II.3.3)."""
    g = shifted(f, c, p ** k)
    if g[0] == 0:
        return None
    modulus = p ** (valuation(g[0], p) + (3 if p == 2 else 1))
    if any(coefficient % modulus for coefficient in g[1:]):
        return None
    return "square" if is_local_square(g[0], p) else "non-square"


def check_non_square_disc(f: list, p: int, c: int, k: int, budget: Budget, where: str, **values) -> None:
    """The leaf test proves f a non-square on c + p^k Z_p."""
    budget.spend(1 + local_size(max(abs(x) for x in f) * p ** (4 * k + 1)), f"{where}: the leaf test", p=p)
    verdict = leaf_verdict(f, p, c, k)
    if verdict != "non-square":
        raise Rejection("leaf test", f"{where}: the leaf test does not show f a non-square on c + p^k Z_p",
                        c=c, k=k, p=p, outcome=verdict or "inconclusive", **values)
