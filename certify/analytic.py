"""The analytic rank witness: the order of vanishing of L(E, s) at s = 1 when it is 0 or 1, with the entry
the verifier's ``certify.verifier.lseries.check_analytic_witness`` checks.

The certifier computes in floating point what the verifier will prove with intervals (see the formulas in
``certify.verifier.lseries``): S(r) = Σ (a_n/n) e^(−rn) at r = c/A, c, cA (c = 2π/√N), the root-number tests
G = S(c/A) − S(cA) (zero when w = −1) and D = S(c/A) + S(cA) − 2 S(c) (zero when w = +1), L(E, 1) and
L′(E, 1) = 2 Σ (a_n/n) E₁(cn). The a_n come from a_p by PARI's point counts at the good primes and from the
reduction types at the bad ones; E₁ from mpmath. Then it picks the precision b (enough bits to see the smaller
of the test and the value, with a margin) and the least truncation point M whose tails the verifier's own
``check_truncation`` accepts. Analytic rank 2 or more, or a value too small to separate from 0, gives no
witness: nothing is then proven.

Frobenius hints, so that the verifier need not count Ẽ(F_p) at the larger primes: at each good prime
HINT_THRESHOLD < p ≤ M with N = p + 1 − a_p > 4√p (a_p by PARI's ellap), the first point of order N among
those with x = 0, 1, 2, … (PARI's polrootsmod for y, ellgroup and ellorder over F_p), tried at HINT_ATTEMPTS
abscissae at most; none when Ẽ(F_p) is not cyclic or no such point turns up. The choice is deterministic.
"""
from __future__ import annotations

import math
from fractions import Fraction

import mpmath

from certify.conductor import certify_conductor
from certify.pari import frobenius_trace, pari
from certify.verifier.errors import Rejection
from certify.verifier.limits import MAX_TRUNCATION
from certify.verifier.lseries import (TRACE_AT_BAD_PRIME, check_truncation, dirichlet_coefficients, primes_up_to,
                                      read_witness)

TEST_POINTS = (Fraction(6, 5), Fraction(3, 2), Fraction(2))
"""Functional-equation test points A tried in turn (a larger A separates w = ±1 better and costs a larger M)."""

MIN_BITS = 32
"""Least precision claimed: the enclosures are then narrower than 10⁻⁸."""

MARGIN_BITS = 12
"""Bits of precision beyond those needed to see the smaller of the root-number test and the value."""

ESTIMATE_BITS = 60
"""Tails of the floating-point estimate are below 2^−ESTIMATE_BITS."""

ZERO = 2.0 ** -36
"""A floating-point test or value smaller than this is taken for 0 (the estimate errs by about 10⁻¹³)."""

HINT_THRESHOLD = 300
"""Frobenius hints only at primes above this: below it the verifier counts Ẽ(F_p) as fast as it checks a
hint (a few multiples of a point, each some 30 group operations; see bench/bench_analytic.py)."""

HINT_ATTEMPTS = 12
"""Most abscissae tried for a point of order N = #Ẽ(F_p): in a cyclic group a point is a generator with
probability φ(N)/N, above 1/5 for N < 30,030."""


def analytic_witness(a, conductor_certificate: dict | None = None) -> dict | None:
    """The analytic witness entry for the curve with coefficients ``a`` (Fractions), or None when the analytic
    rank is 2 or more, undecided in floating point, or beyond the verifier's limits. ``conductor_certificate``
    is the curve's conductor certificate when already built."""
    cert = conductor_certificate or certify_conductor(tuple(a))
    conductor = int(cert["claim"]["conductor"])
    model = tuple(int(c) for c in cert["evidence"]["minimal_model"]["curve"])
    bad = {int(entry["prime"]): TRACE_AT_BAD_PRIME[entry["reduction"]] for entry in cert["claim"]["bad_primes"]}
    for test_point in TEST_POINTS:
        found = estimate(model, conductor, bad, test_point)
        if found is None:
            continue
        order, bits = found
        truncation = least_truncation(conductor, bits, test_point)
        entry = {"conductor": cert["evidence"], "order": str(order), "root_number": str((-1) ** order),
                 "truncation": str(truncation), "precision_bits": str(bits), "test_point": str(test_point),
                 "frobenius_hints": frobenius_hints(model, bad, truncation)}
        try:
            read_witness(entry, "analytic")
        except Rejection:
            return None
        return entry
    return None


def frobenius_hints(model, bad, truncation: int, threshold: int = HINT_THRESHOLD) -> list:
    """The hint entries [{"prime", "trace", "point"}] for the good primes threshold < p ≤ M where
    ``frobenius_hint`` finds one."""
    hints = []
    for p in primes_up_to(truncation):
        if p > threshold and p not in bad:
            hint = frobenius_hint(model, p)
            if hint is not None:
                hints.append(hint)
    return hints


def frobenius_hint(model, p: int) -> dict | None:
    """{"prime": p, "trace": a_p, "point": [x, y]} with (x, y) a point of Ẽ(F_p) of order N = p + 1 − a_p on
    the integral model at the good prime p, or None when N ≤ 4√p (the verifier could not single out N), when
    Ẽ(F_p) is not cyclic, or when no point of order N is met at the first HINT_ATTEMPTS abscissae x = 0, 1, …
    that carry points (y the least root of the equation modulo p)."""
    trace = frobenius_trace(model, p)
    count = p + 1 - trace
    if count * count <= 16 * p:
        return None
    curve = pari.ellinit(list(model), p)
    if len(pari.ellgroup(curve)) > 1:
        return None
    a1, a2, a3, a4, a6 = model
    attempts = 0
    for x in range(p):
        roots = pari.polrootsmod(pari.Pol([1, a1 * x + a3, -(x ** 3 + a2 * x * x + a4 * x + a6)]), p)
        if not len(roots):
            continue
        y = int(pari.lift(roots[0]))
        if int(pari.ellorder(curve, [x, y], count)) == count:
            return {"prime": str(p), "trace": str(trace), "point": [str(x), str(y)]}
        attempts += 1
        if attempts == HINT_ATTEMPTS:
            return None
    return None


def coefficients(model, conductor: int, bad: dict, truncation: int) -> list:
    """[0, a_1, …, a_M]: a_p by PARI's point counts at good p, the reduction type at bad p."""
    traces = {p: bad[p] if p in bad else frobenius_trace(model, p) for p in primes_up_to(truncation)}
    return dirichlet_coefficients(traces, set(bad), truncation)


def estimate(model, conductor: int, bad: dict, test_point: Fraction):
    """(order, precision bits) from the floating-point values at the test point A, or None when the root
    number is not separated at this A or the analytic rank is not 0 or 1."""
    c = 2 * math.pi / math.sqrt(conductor)
    slowest = c / float(test_point)
    # Σ_{n>M} e^(−s·n) = e^(−s·M)/(1 − e^(−s)); −log(1 − e^(−s)) as −log(−expm1(−s)), finite for a tiny s
    truncation = math.ceil((ESTIMATE_BITS * math.log(2) - math.log(-math.expm1(-slowest))) / slowest)
    if truncation > 2 * MAX_TRUNCATION:
        return None
    a = coefficients(model, conductor, bad, truncation)
    s = {rate: sum(a[n] / n * math.exp(-rate * n) for n in range(1, truncation + 1))
         for rate in (slowest, c, c * float(test_point))}
    plus_test = s[slowest] - s[c * float(test_point)]
    minus_test = s[slowest] + s[c * float(test_point)] - 2 * s[c]
    if abs(plus_test) > ZERO and abs(minus_test) <= ZERO:
        order, test, value = 0, plus_test, s[slowest] + s[c * float(test_point)]
    elif abs(minus_test) > ZERO and abs(plus_test) <= ZERO:
        order, test = 1, minus_test
        value = 2 * sum(a[n] / n * float(mpmath.e1(c * n)) for n in range(1, truncation + 1) if a[n])
    else:
        return None
    if abs(value) <= ZERO:
        return None
    return order, max(MIN_BITS, math.ceil(-math.log2(min(abs(test), abs(value)))) + MARGIN_BITS)


def least_truncation(conductor: int, bits: int, test_point: Fraction) -> int:
    """The least M whose tails the verifier accepts at b bits, from the floating-point estimate of
    e^(−r(M+1))/(1 − e^(−r)) ≤ 2^−b at r = c/A, stepped up until ``check_truncation`` agrees."""
    rate = 2 * math.pi / math.sqrt(conductor) / float(test_point)
    truncation = max(1, math.floor((bits * math.log(2) - math.log1p(-math.exp(-rate))) / rate) - 2)
    while truncation <= MAX_TRUNCATION:
        try:
            check_truncation(conductor, truncation, bits, test_point)
            return truncation
        except Rejection:
            truncation += 1
    return truncation
