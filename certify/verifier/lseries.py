"""Analytic rank witnesses: a proof that ord_{s=1} L(E, s) is 0 or 1, from rigorous enclosures of L(E, 1),
of L′(E, 1) and of a test of the root number, recomputed from the verifier's own point counts.

By modularity (Wiles 1995; Taylor–Wiles 1995; Breuil–Conrad–Diamond–Taylor 2001), L(E, s) = Σ a_n n^−s
continues to C and Λ(s) = N^(s/2) (2π)^−s Γ(s) L(E, s) = w Λ(2 − s) with w = ±1, N the conductor. Write
g(t) = Σ a_n e^(−2πnt/√N), so that Λ(s) = ∫_0^∞ g(t) t^(s−1) dt and g(1/t) = w t² g(t). Splitting the
integral at t = A > 0 and substituting t ↦ 1/t on [0, A] gives, for every A > 0,

    L(E, 1) = S(cA) + w·S(c/A),   c = 2π/√N,   S(r) = Σ_{n ≥ 1} (a_n/n) e^(−rn),

and, when w = −1 (so L(E, 1) = 0), with A = 1: L′(E, 1) = 2 Σ_{n ≥ 1} (a_n/n) E₁(cn), since
∫_1^∞ e^(−ct) ln t dt = E₁(c)/c (J. E. Cremona, *Algorithms for Modular Elliptic Curves*, 2nd ed. (1997),
§2.13; H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138 (1993), §7.5).

The root number needs no local computation: if w = +1 then S(cA) + S(c/A) does not depend on A, and if
w = −1 then S(cA) − S(c/A) = 0 for every A. So, for a test point A > 1,
- order 0: G = S(c/A) − S(cA) ≠ 0 proves w = +1, and then L(E, 1) = S(c/A) + S(cA) ≠ 0 proves order 0;
- order 1: D = S(c/A) + S(cA) − 2·S(c) ≠ 0 proves w = −1, so L(E, 1) = 0, and L′(E, 1) ≠ 0 proves order 1.
By Gross–Zagier (1986) and Kolyvagin (1988, 1990), with the auxiliary twists of Bump–Friedberg–Hoffstein
(1990) and Murty–Murty (1991), rank E(Q) then equals that order.

Frobenius hints spare the verifier most point counts. A hint gives, for a prime p ≤ M of good reduction,
a trace t and a point P = (x, y) of Ẽ(F_p) on the minimal model (residues modulo p). The verifier checks
that P lies on Ẽ modulo p, that N = p + 1 − t satisfies |t| ≤ 2√p (exactly: t² ≤ 4p), that N·P = O and
(N/r)·P ≠ O for every prime r | N (found by trial division, N < 2p + 2), so that P has order exactly N,
and that N > 4√p (exactly: N² > 16p). Then #Ẽ(F_p) = N: by Lagrange's theorem ord(P) = N divides
#Ẽ(F_p), by Hasse's theorem #Ẽ(F_p) lies in [p + 1 − 2√p, p + 1 + 2√p] (H. Hasse 1936; Silverman, *The
Arithmetic of Elliptic Curves*, 2nd ed., V.1.1), an interval of length 4√p < N which therefore holds at
most one multiple of N, and N itself lies in it. So a_p = t, exactly; a wrong trace cannot pass, since
#Ẽ(F_p) = kN with k ≠ 1 would put two multiples of N in the interval. Primes without a hint are counted.

The check, one function each: the entry's sizes within the limits (before any work); the conductor, the
minimal model and the reduction types by the conductor checks (``certify.verifier.conductor``); the
truncation point M large enough that every tail is below 2^−b for the claimed precision b; a_p for p ≤ M
from the Frobenius hints or the verifier's own counts, and from them a_n for n ≤ M; the two enclosures,
each excluding 0.
"""
from fractions import Fraction

from certify.verifier.arith import parse_integer, parse_rational, prime_factors
from certify.verifier.certificate import field
from certify.verifier.conductor import check_conductor_evidence, conductor_of
from certify.verifier.curves import count_points, multiple_mod
from certify.verifier.errors import Rejection
from certify.verifier.intervals import Interval, exp_neg, exponential_integral, pi, square_root
from certify.verifier.limits import (FROBENIUS_HINT_WORK, MAX_ANALYTIC_COUNT_WORK, MAX_ANALYTIC_SERIES_WORK,
                                     MAX_PRECISION_BITS, MAX_TEST_POINT_DENOMINATOR, MAX_TRUNCATION)

RELIES_ON = ("modularity", "l-series-at-one", "hasse-bound", "gross-zagier", "kolyvagin", "interval-bounds",
             "tate-algorithm", "ogg-formula", "reduced-minimal-models", "pocklington-primality",
             "miller-rabin-bound")
"""The theorems an analytic witness rests on, for the ``relies_on`` of the certificate that carries it."""

TRACE_AT_BAD_PRIME = {"split multiplicative": 1, "non-split multiplicative": -1, "additive": 0}
"""a_p = p − #Ẽ_ns(F_p) at a bad prime, from the reduction type: the non-singular points of the reduction
form a group isomorphic to F_p^* (split node), to the norm-one elements of F_(p²)^* (non-split node) or to
F_p^+ (cusp), of orders p − 1, p + 1 and p (Silverman, *The Arithmetic of Elliptic Curves*, 2nd ed.,
Prop. III.2.5 and Exercise 3.5)."""

GUARD_BITS = 10
"""Working precision is b + 2·bits(M) + GUARD_BITS: the powers e^(−rn) lose about log₂(1/r) bits and the
sum of M terms log₂ M more, with r ≥ about 1/M for any truncation that passes ``check_truncation``."""


def check_analytic_witness(a, entry: dict, where: str) -> int:
    """The proven analytic rank, 0 or 1, of the curve a (input coefficients, Fractions) from the witness
    ``entry`` found at ``where`` in a certificate; raises Rejection if any check fails. The entry:

        {"conductor": {"minimal_model": …, "discriminant_factorisation": […], "pocklington": […]},
         "order": "0" | "1", "root_number": "1" | "-1",
         "truncation": "M", "precision_bits": "b", "test_point": "A",
         "frobenius_hints": [{"prime": "p", "trace": "a_p", "point": ["x", "y"]}, …]}

    the conductor fields being those of a conductor certificate's evidence, the hints possibly none."""
    order, root_number, truncation, bits, test_point, hints = read_witness_and_hints(entry, where)
    model, _, local = check_conductor_evidence(a, field(entry, "conductor", dict, where), f"{where}.conductor")
    conductor = conductor_of(local)
    check_root_number_claim(order, root_number)
    bounds = check_truncation(conductor, truncation, bits, test_point)
    coefficients = dirichlet_coefficients(frobenius_traces(model, local, truncation, hints),
                                          {data.prime for data in local}, truncation)
    sign_test, value = analytic_intervals(coefficients, conductor, order, bits, test_point, bounds)
    check_root_number(order, sign_test)
    check_nonvanishing(order, value)
    return order


# --- reading, with the limits first ---

def read_witness(entry: dict, where: str) -> tuple:
    """(order, root number, M, b, A) from the entry, refused at once over any limit (``read_witness_and_hints``,
    whose Frobenius hints it leaves out)."""
    return read_witness_and_hints(entry, where)[:5]


def read_witness_and_hints(entry: dict, where: str) -> tuple:
    """(order, root number, M, b, A, hints) from the entry, refused at once over the limits: M ≤ MAX_TRUNCATION,
    1 ≤ b ≤ MAX_PRECISION_BITS, M·b ≤ MAX_ANALYTIC_SERIES_WORK, 1 < A ≤ 2 with a denominator of at most
    MAX_TEST_POINT_DENOMINATOR, the Frobenius hints as ``read_hints`` reads them, and their count work
    (``hinted_count_work``) within MAX_ANALYTIC_COUNT_WORK."""
    if not isinstance(entry, dict):
        raise Rejection("structure", f"{where} must be an object")
    order = parse_integer(field(entry, "order", str, where), f"{where}.order")
    root_number = parse_integer(field(entry, "root_number", str, where), f"{where}.root_number")
    truncation = parse_integer(field(entry, "truncation", str, where), f"{where}.truncation")
    bits = parse_integer(field(entry, "precision_bits", str, where), f"{where}.precision_bits")
    test_point = parse_rational(field(entry, "test_point", str, where), f"{where}.test_point")
    if order not in (0, 1):
        raise Rejection("analytic order", "an analytic witness proves order 0 or 1 only", order=order)
    if root_number not in (1, -1):
        raise Rejection("root number", "the root number is 1 or -1", root_number=root_number)
    if not 1 <= truncation <= MAX_TRUNCATION:
        raise Rejection("analytic limit", f"the truncation point must lie between 1 and {MAX_TRUNCATION}",
                        truncation=truncation)
    if not 1 <= bits <= MAX_PRECISION_BITS:
        raise Rejection("analytic limit", f"the precision must lie between 1 and {MAX_PRECISION_BITS} bits",
                        precision_bits=bits)
    if truncation * bits > MAX_ANALYTIC_SERIES_WORK:
        raise Rejection("analytic limit", f"truncation x precision exceeds {MAX_ANALYTIC_SERIES_WORK}",
                        truncation=truncation, precision_bits=bits)
    if not 1 < test_point <= 2 or test_point.denominator > MAX_TEST_POINT_DENOMINATOR:
        raise Rejection("analytic limit", "the test point must be a rational in (1, 2] with a denominator of at "
                        f"most {MAX_TEST_POINT_DENOMINATOR}", test_point=str(test_point))
    hints = read_hints(field(entry, "frobenius_hints", list, where), truncation, f"{where}.frobenius_hints")
    work = hinted_count_work(truncation, hints)
    if work > MAX_ANALYTIC_COUNT_WORK:
        raise Rejection("analytic limit", f"the point counts and Frobenius hints up to the truncation point need "
                        f"more than {MAX_ANALYTIC_COUNT_WORK} residue evaluations", truncation=truncation,
                        hints=len(hints), work=work)
    return order, root_number, truncation, bits, test_point, hints


def read_hints(entries: list, truncation: int, where: str) -> list:
    """The Frobenius hints as [(p, t, (x, y))], refused at once unless they are at most as many as the primes
    p ≤ M, each at a prime p ≤ M, the primes strictly increasing (so distinct). Good reduction at p, the
    Hasse bound, the point and its order are checked once the conductor evidence is (``hinted_traces``)."""
    primes = primes_up_to(truncation)
    if len(entries) > len(primes):
        raise Rejection("analytic limit", "more Frobenius hints than primes up to the truncation point",
                        hints=len(entries), primes=len(primes), truncation=truncation)
    allowed, hints = set(primes), []
    for i, hint in enumerate(entries):
        at = f"{where}[{i}]"
        p = parse_integer(field(hint, "prime", str, at), f"{at}.prime")
        trace = parse_integer(field(hint, "trace", str, at), f"{at}.trace")
        point = field(hint, "point", list, at)
        if len(point) != 2:
            raise Rejection("structure", f"{at}.point must be a list of two residues", found=len(point))
        x, y = (parse_integer(v, f"{at}.point[{j}]") for j, v in enumerate(point))
        if p not in allowed:
            raise Rejection("frobenius hint prime", "a Frobenius hint is not at a prime up to the truncation point",
                            p=p, truncation=truncation)
        if hints and p <= hints[-1][0]:
            raise Rejection("frobenius hint prime", "the primes of the Frobenius hints must increase strictly",
                            previous=hints[-1][0], p=p)
        hints.append((p, trace, (x, y)))
    return hints


def hinted_count_work(truncation: int, hints: list) -> int:
    """Residue evaluations of the a_p for p ≤ M: Σ p over the primes without a hint (one count each) plus
    FROBENIUS_HINT_WORK per hint."""
    hinted = {p for p, _, _ in hints}
    return sum(p for p in primes_up_to(truncation) if p not in hinted) + FROBENIUS_HINT_WORK * len(hints)


def count_work(entry: dict, where: str) -> int:
    """The residue evaluations the witness ``entry`` at ``where`` needs for its a_p (``hinted_count_work``),
    after ``read_witness_and_hints`` has refused it over any limit; for a certificate's combined budget."""
    _, _, truncation, _, _, hints = read_witness_and_hints(entry, where)
    return hinted_count_work(truncation, hints)


def check_root_number_claim(order: int, root_number: int) -> None:
    """The claimed root number is the one the claimed order forces: w = (−1)^order (the functional equation
    makes L(E, s) vanish to even order at s = 1 when w = +1 and to odd order when w = −1)."""
    if root_number != (-1) ** order:
        raise Rejection("root number", "the claimed root number is not (-1)^order", order=order,
                        root_number=root_number)


# --- truncation ---

def working_bits(truncation: int, bits: int) -> int:
    return bits + 2 * truncation.bit_length() + GUARD_BITS


def decay_rates(conductor: int, test_point: Fraction, bits: int) -> dict:
    """{"c/A": c/A, "c": c, "cA": c·A} as intervals, c = 2π/√N, rounded outward to 2^−bits."""
    c = (2 * pi(bits) / square_root(conductor, bits)).outward(bits)
    return {"c/A": (c * (1 / test_point)).outward(bits), "c": c, "cA": (c * test_point).outward(bits)}


def tail_bound(rate: Interval, truncation: int, bits: int):
    """An upper bound for Σ_{n > M} (|a_n|/n) e^(−rn) ≤ Σ_{n > M} e^(−rn) = e^(−r(M+1))/(1 − e^(−r)); None when
    r is not proven positive at this precision (no finite bound).

    |a_n| ≤ n for every n ≥ 1. The a_n are multiplicative, so it suffices that |a_(p^k)| ≤ p^k. At a bad
    prime |a_(p^k)| ≤ 1. At a good prime 1 − a_p T + p T² = (1 − αT)(1 − βT) with |α| = |β| = √p (Hasse
    1936; Silverman, *The Arithmetic of Elliptic Curves*, V.1.1), so a_(p^k) = Σ_{j=0}^{k} α^j β^(k−j) and
    |a_(p^k)| ≤ (k + 1) p^(k/2) ≤ p^k when k + 1 ≤ p^(k/2): for every k ≥ 1 when p ≥ 5, every k ≥ 2 when
    p = 3 and every k ≥ 6 when p = 2. The rest: |a_3| ≤ ⌊2√3⌋ = 3; for p = 2 the integer a_2 lies in
    [−2, 2], and the recursion a_(2^(k+1)) = a_2 a_(2^k) − 2 a_(2^(k−1)) gives, over the five cases, at most
    2, 2, 3, 4, 8 for |a_2|, |a_4|, |a_8|, |a_16|, |a_32|.
    """
    if rate.lo <= 0:
        return None
    denominator = 1 - exp_neg(rate.lo, bits).hi
    if denominator <= 0:
        return None
    return exp_neg(rate.lo * (truncation + 1), bits).hi / denominator


def derivative_tail_bound(rate: Interval, truncation: int, bits: int):
    """An upper bound for Σ_{n > M} (|a_n|/n) E₁(rn) ≤ Σ_{n > M} e^(−rn)/(rn) ≤ tail_bound/(r(M + 1)),
    from E₁(x) < e^−x/x (Abramowitz and Stegun 5.1.20) and |a_n| ≤ n."""
    tail = tail_bound(rate, truncation, bits)
    return None if tail is None else tail / (rate.lo * (truncation + 1))


def check_truncation(conductor: int, truncation: int, bits: int, test_point: Fraction) -> dict:
    """The truncation point M suffices for the claimed precision b: the tails of S(c/A), S(c), S(cA) and of
    the series for L′(E, 1), bounded at the working precision, are at most 2^−b. Returns those bounds."""
    work = working_bits(truncation, bits)
    bounds = tails(conductor, truncation, work, test_point)
    for name, tail in bounds.items():
        if tail is None or tail > Fraction(1, 1 << bits):
            raise Rejection("truncation", f"the tail of {name} beyond the truncation point exceeds 2^-b",
                            truncation=truncation, precision_bits=bits, conductor=conductor,
                            tail=None if tail is None else float(tail))
    return bounds


def tails(conductor: int, truncation: int, work: int, test_point: Fraction) -> dict:
    """The tail bounds of the four series at the working precision, by name (None where none is finite)."""
    rates = decay_rates(conductor, test_point, work)
    bounds = {f"S({name})": tail_bound(rates[name], truncation, work) for name in ("c/A", "c", "cA")}
    bounds["L'(E,1)"] = derivative_tail_bound(rates["c"], truncation, work)
    return bounds


# --- the coefficients ---

def primes_up_to(bound: int) -> list:
    """The primes p ≤ bound (sieve of Eratosthenes)."""
    sieve = bytearray([1]) * (bound + 1)
    sieve[:2] = b"\x00\x00"[:bound + 1]
    for p in range(2, int(bound ** 0.5) + 1):
        if sieve[p]:
            sieve[p * p::p] = bytes(len(range(p * p, bound + 1, p)))
    return [p for p in range(bound + 1) if sieve[p]]


def points_mod_2(model) -> int:
    """#Ẽ(F_2) of an integral model, by trying the four points of the affine plane over F_2 (and O)."""
    a1, a2, a3, a4, a6 = model
    return 1 + sum(1 for x in (0, 1) for y in (0, 1)
                   if (y * y + a1 * x * y + a3 * y - x ** 3 - a2 * x * x - a4 * x - a6) % 2 == 0)


def frobenius_traces(model, local: list, truncation: int, hints: list = ()) -> dict:
    """{p: a_p} for the primes p ≤ M: +1, −1, 0 at the bad primes for split, non-split multiplicative and
    additive reduction (``TRACE_AT_BAD_PRIME``); at good p the trace of its Frobenius hint, once checked
    (``hinted_traces``, all before any count), else a_p = p + 1 − #Ẽ(F_p) counted on the minimal model
    (``count_points``; ``points_mod_2`` at p = 2)."""
    bad = {data.prime: TRACE_AT_BAD_PRIME[data.reduction] for data in local}
    hinted = hinted_traces(model, set(bad), hints)
    traces = {}
    for p in primes_up_to(truncation):
        if p in bad:
            traces[p] = bad[p]
        elif p in hinted:
            traces[p] = hinted[p]
        else:
            traces[p] = p + 1 - (points_mod_2(model) if p == 2 else count_points(model, p))
    return traces


# --- Frobenius hints ---

def hinted_traces(model, bad: set, hints: list) -> dict:
    """{p: a_p} from the Frobenius hints [(p, t, (x, y))] on the minimal model, each proven a_p = t by the
    checks below (the argument in the module's docstring); ``bad`` is the set of primes of bad reduction."""
    traces = {}
    for p, trace, point in hints:
        check_hint_reduction(p, bad)
        count = check_hint_trace(p, trace)
        check_hint_point(model, p, point)
        check_hint_order(model, p, point, count)
        traces[p] = trace
    return traces


def check_hint_reduction(p: int, bad: set) -> None:
    """p is a prime of good reduction: it is not among the primes of the minimal discriminant, which the
    conductor checks have proven to be all of them."""
    if p in bad:
        raise Rejection("frobenius hint prime", "a Frobenius hint is at a prime of bad reduction", p=p)


def check_hint_trace(p: int, trace: int) -> int:
    """N = p + 1 − t, returned, with t² ≤ 4p (Hasse's bound, so N lies in the Hasse interval) and N² > 16p
    (N > 4√p, longer than the interval, so it holds no other multiple of N)."""
    if trace * trace > 4 * p:
        raise Rejection("frobenius hint trace", "the trace of a Frobenius hint exceeds Hasse's bound 2 sqrt(p)",
                        p=p, trace=trace)
    count = p + 1 - trace
    if count * count <= 16 * p:
        raise Rejection("frobenius hint trace", "N = p + 1 - trace is not above 4 sqrt(p), so the order of a point "
                        "cannot single it out in the Hasse interval", p=p, trace=trace, count=count)
    return count


def check_hint_point(model, p: int, point: tuple) -> None:
    """The point is a pair of residues 0 ≤ x, y < p on the minimal model modulo p."""
    if not all(0 <= v < p for v in point):
        raise Rejection("frobenius hint point", "the coordinates of a Frobenius hint's point are not residues "
                        "modulo p", p=p, point=list(point))
    x, y = point
    a1, a2, a3, a4, a6 = model
    if (y * y + a1 * x * y + a3 * y - x ** 3 - a2 * x * x - a4 * x - a6) % p:
        raise Rejection("frobenius hint point", "the point of a Frobenius hint is not on the minimal model "
                        "modulo p", p=p, point=list(point))


def check_hint_order(model, p: int, point: tuple, count: int) -> None:
    """ord(P) = N in Ẽ(F_p): (N/r)·P ≠ O for each prime r | N (trial division) and N·P = O, the latter as
    r·((N/r)·P) for the least r."""
    multiples = {r: multiple_mod(model, count // r, point, p) for r in prime_factors(count)}
    least = min(multiples)
    if multiple_mod(model, least, multiples[least], p) is not None:
        raise Rejection("frobenius hint order", "N·P is not O for the point of a Frobenius hint (N = p + 1 - trace)",
                        p=p, count=count, point=list(point))
    for r, multiple in multiples.items():
        if multiple is None:
            raise Rejection("frobenius hint order", "the point of a Frobenius hint has order a proper divisor of N: "
                            "(N/r)·P = O", p=p, count=count, r=r, point=list(point))


def dirichlet_coefficients(traces: dict, bad: set, truncation: int) -> list:
    """[a_0 = 0, a_1, …, a_M] from a_p for the primes p ≤ M (``traces``) and the set of bad primes: a_1 = 1,
    a_(p^(k+1)) = a_p a_(p^k) − p a_(p^(k−1)) at good p and a_(p^k) = a_p^k at bad p, and a_(mn) = a_m a_n for
    coprime m, n (the Euler product of L(E, s); Silverman, *The Arithmetic of Elliptic Curves*, C.16)."""
    smallest = list(range(truncation + 1))
    for p in traces:
        for n in range(p * p, truncation + 1, p):
            if smallest[n] == n:
                smallest[n] = p
    a = [0, 1] + [0] * (truncation - 1)
    for n in range(2, truncation + 1):
        p = smallest[n]
        power, cofactor = p, n // p
        while cofactor % p == 0:
            power, cofactor = power * p, cofactor // p
        if cofactor > 1:
            a[n] = a[power] * a[cofactor]
        elif power == p:
            a[n] = traces[p]
        else:
            a[n] = traces[p] * a[n // p] - (0 if p in bad else p * a[n // (p * p)])
    return a


# --- the series ---

def partial_sum(coefficients: list, rate: Interval, bits: int) -> Interval:
    """Σ_{n ≤ M} (a_n/n) e^(−rn) for r in the interval ``rate``: q = e^(−r) enclosed once, its powers q^n by
    repeated multiplication, all in fixed point (integers in units of 2^−bits) with every product and
    quotient rounded down for the lower end and up for the upper end."""
    one = 1 << bits
    q_low, q_high = _units(exp_neg(rate.hi, bits).lo, bits)[0], _units(exp_neg(rate.lo, bits).hi, bits)[1]
    power_low = power_high = one
    lower = upper = 0
    for n in range(1, len(coefficients)):
        power_low, power_high = power_low * q_low // one, -(-power_high * q_high // one)
        a = coefficients[n]
        if a > 0:
            lower, upper = lower + a * power_low // n, upper - (-a * power_high // n)
        elif a < 0:
            lower, upper = lower + a * power_high // n, upper - (-a * power_low // n)
    return Interval(Fraction(lower, one), Fraction(upper, one))


def _units(x: Fraction, bits: int) -> tuple:
    """(⌊x·2^bits⌋, ⌈x·2^bits⌉)."""
    return (x.numerator << bits) // x.denominator, -((-x.numerator << bits) // x.denominator)


def derivative_sum(coefficients: list, rate: Interval, bits: int) -> Interval:
    """Σ_{n ≤ M} (a_n/n) E₁(rn) for r in the interval ``rate`` (r.lo > 0): E₁ is decreasing with
    |E₁′(t)| = e^−t/t ≤ 1/(n·r.lo) for t ≥ n·r.lo, so E₁(rn) lies in [E₁(n·r.lo) − (r.hi − r.lo)/r.lo,
    E₁(n·r.lo)], and E₁(n·r.lo) is enclosed by ``exponential_integral``."""
    slack = rate.width / rate.lo
    total = Interval(0)
    for n in range(1, len(coefficients)):
        if coefficients[n]:
            e1 = exponential_integral(rate.lo * n, bits)
            total += (Interval(e1.lo - slack, e1.hi) * Fraction(coefficients[n], n)).outward(bits)
    return total


def with_tail(value: Interval, tail: Fraction) -> Interval:
    return Interval(value.lo - tail, value.hi + tail)


def analytic_intervals(coefficients: list, conductor: int, order: int, bits: int, test_point: Fraction,
                       bounds: dict) -> tuple:
    """(the root-number test, the value) as intervals, for a truncation M = len(coefficients) − 1 that has
    passed ``check_truncation``, which gave the tail ``bounds``: for order 0, (G, L(E, 1)) with
    G = S(c/A) − S(cA) and L(E, 1) = S(c/A) + S(cA) (valid once w = +1); for order 1, (D, L′(E, 1)) with
    D = S(c/A) + S(cA) − 2 S(c) and L′(E, 1) = 2 Σ (a_n/n) E₁(cn) (valid once w = −1). Each series is
    widened by its tail bound."""
    truncation = len(coefficients) - 1
    work = working_bits(truncation, bits)
    rates = decay_rates(conductor, test_point, work)
    sums = {name: with_tail(partial_sum(coefficients, rates[name], work), bounds[f"S({name})"])
            for name in (("c/A", "cA") if order == 0 else ("c/A", "cA", "c"))}
    if order == 0:
        return sums["c/A"] - sums["cA"], sums["c/A"] + sums["cA"]
    derivative = with_tail(derivative_sum(coefficients, rates["c"], work), bounds["L'(E,1)"])
    return sums["c/A"] + sums["cA"] - 2 * sums["c"], 2 * derivative


def check_root_number(order: int, sign_test: Interval) -> None:
    """The root number is proven: for order 0, G ≠ 0 excludes w = −1 (which makes G vanish); for order 1,
    D ≠ 0 excludes w = +1 (which makes D vanish)."""
    if not sign_test.excludes_zero():
        raise Rejection("root number", f"the functional-equation test does not prove w = {(-1) ** order}: its "
                        "interval contains 0", order=order, lower=float(sign_test.lo), upper=float(sign_test.hi))


def check_nonvanishing(order: int, value: Interval) -> None:
    """L(E, 1) ≠ 0 (order 0) or L′(E, 1) ≠ 0 (order 1): the enclosure excludes 0."""
    if not value.excludes_zero():
        name = "L(E,1)" if order == 0 else "L'(E,1)"
        raise Rejection("L-value", f"the enclosure of {name} contains 0", order=order, lower=float(value.lo),
                        upper=float(value.hi))
