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
"""
from __future__ import annotations

import math
from fractions import Fraction

import mpmath

from certify.conductor import certify_conductor
from certify.pari import frobenius_trace
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
                 "truncation": str(truncation), "precision_bits": str(bits), "test_point": str(test_point)}
        try:
            read_witness(entry, "analytic")
        except Rejection:
            return None
        return entry
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
    truncation = math.ceil((ESTIMATE_BITS * math.log(2) - math.log1p(-math.exp(-slowest))) / slowest)
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
