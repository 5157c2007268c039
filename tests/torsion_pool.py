"""Shared helpers of the torsion tests: the fixture table, the reference library, the schema, and
the soundness rule "the claim of a certificate is true".

The reference library is cypari2 (PARI's ``elltors``, ``ellorder``, ``elladd``, ``ellmul``), used
here only as an outside source to compare with; certify's own arithmetic is never used to judge
certify.
"""
from __future__ import annotations

import functools
import json
import pathlib
from fractions import Fraction

import cypari2
import jsonschema
import pytest
from cysignals.alarm import AlarmInterrupt, alarm, cancel_alarm

from certify.torsion import certify_torsion

pari = cypari2.Pari()

ROOT = pathlib.Path(__file__).resolve().parent.parent
FIXTURE = ROOT / "tests" / "data" / "conductor_lt_1000.txt"
SCHEMA = ROOT / "schemas" / "torsion.schema.json"

HANG_SECONDS = 60
"""A certification that runs this long is stuck, not slow (the table's curves take milliseconds):
the guard turns a hang into a test failure naming the curve. Not a timing target."""


@functools.lru_cache(maxsize=None)
def table_curves() -> tuple:
    """The fixture's curves in file order: ((conductor, class_index), (a1, a2, a3, a4, a6)) with int entries.

    Source: Cremona's tables (Algorithms for Modular Elliptic Curves, 2nd ed.), conductor < 1000,
    as shipped in PARI's curve-data package; see the fixture's header.
    """
    rows = []
    for line in FIXTURE.read_text().splitlines():
        if line.startswith("#") or not line.strip():
            continue
        conductor, class_index, *coefficients = (int(v) for v in line.split())
        rows.append(((conductor, class_index), tuple(coefficients)))
    return tuple(rows)


def pari_curve(a):
    """The reference library's curve for coefficients given as ints, Fractions or decimal strings."""
    return pari.ellinit([pari(str(Fraction(c))) for c in a])


def reference_invariants(a) -> list:
    """[n1, n2] with n1 | n2 (or [n], or []) from cypari2's ``elltors``, the reference torsion routine.

    PARI lists the invariant factors largest first; the certificates list them smallest first.
    """
    return [int(n) for n in reversed(pari.elltors(pari_curve(a))[1])]


def certified(a, seconds: int = HANG_SECONDS) -> dict:
    """certify_torsion(a), failing the test (instead of hanging the suite) if it runs for ``seconds``."""
    try:
        alarm(seconds)
        return certify_torsion(tuple(Fraction(c) for c in a))
    except AlarmInterrupt:
        pytest.fail(f"certify_torsion did not finish within {seconds} s on {[str(c) for c in a]}")
    finally:
        cancel_alarm()


@functools.lru_cache(maxsize=None)
def schema_validator() -> jsonschema.Draft202012Validator:
    """A validator for schemas/torsion.schema.json, itself checked against the draft 2020-12 metaschema."""
    schema = json.loads(SCHEMA.read_text())
    jsonschema.Draft202012Validator.check_schema(schema)
    return jsonschema.Draft202012Validator(schema)


def group_generated(curve, points, orders) -> list:
    """The n1·n2 sums i·P1 + j·P2 (0 ≤ i < n1, 0 ≤ j < n2), by the reference library's group law;
    [0] is PARI's point at infinity."""
    sums = [pari([0])]
    for point, order in zip(points, orders):
        multiples = [pari.ellmul(curve, point, k) for k in range(order)]
        sums = [pari.elladd(curve, s, m) for s in sums for m in multiples]
    return sums


def assert_claim_true(cert: dict) -> None:
    """The claim of the certificate is true of its own curve, judged by the reference library alone:
    the invariants are those of ``elltors``, each generator lies on the curve with exact order
    n_i (``ellorder``), and the n1·n2 sums i·P1 + j·P2 are distinct, so the generators generate a
    subgroup isomorphic to Z/n1 × Z/n2, which by the order count is all of E(Q)_tors.
    """
    a = cert["curve"]
    curve = pari_curve(a)
    invariants = [int(n) for n in cert["claim"]["invariants"]]
    assert invariants == reference_invariants(a), f"claimed {invariants} for {a}"
    points = [pari([pari(x), pari(y)]) for x, y in cert["claim"]["generators"]]
    assert len(points) == len(invariants)
    for point, order in zip(points, invariants):
        assert pari.ellisoncurve(curve, point), f"generator {point} is not on {a}"
        assert int(pari.ellorder(curve, point)) == order, f"generator {point} does not have order {order}"
    expected = 1
    for n in invariants:
        expected *= n
    assert len({str(P) for P in group_generated(curve, points, invariants)}) == expected, f"generators of {a} are dependent"
