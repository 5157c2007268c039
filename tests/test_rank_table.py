"""Rank certificates for the curves of conductor < 1000, against Cremona's tables and the reference library.

The curves and their ranks are those of Cremona's tables (*Algorithms for Modular Elliptic Curves*,
2nd ed.), as shipped in PARI's curve-data package (Debian pari-elldata) and extracted into
tests/data/rank_lt_1000.txt (the rank of a curve is the number of generators the table lists; the
table's ranks are proven). Every curve is certified and its certificate verified; then

- the accepted bounds contain the table's rank (soundness);
- the lower bound reaches the table's rank on at least 99% of the curves (shortfalls listed);
- on the curves with a rational point of order 2 the bounds meet on at least 95% (shortfalls listed
  with their reason, judged by cypari2's ``ell2cover``: see tests/rank_reference.py);
- the descent's bound (dim of the two Selmer groups − 2) is the best 2-isogeny descent bound wherever
  cypari2 determines that bound, and it is rank_upper unless an analytic witness proves less;
- the listed points are independent by their regulator (cypari2's ``ellheightmatrix``).

The default suite runs a fixed sample spread over the table (every 10th curve, 512 curves); all
5,113 run with ``-m table``.
"""
from __future__ import annotations

import dataclasses
from fractions import Fraction

import pytest
from cysignals.alarm import AlarmInterrupt, alarm, cancel_alarm

from certify.rank.certificate import certify_rank
from certify.verifier import Rejection, verify
from conductor_reference import fixture_rows as conductor_rows
from rank_reference import (descent_bounds, ellrank_bounds, fixture_header, fixture_rows, has_rational_two_torsion,
                            independent, on_curve, sha_two_rank)

TABLE = fixture_rows("rank_lt_1000.txt")
SAMPLE = TABLE[::10]
"""The default suite's sample: every 10th curve of the table, so all conductors below 1000 are spread over."""

LOWER_SHARE = 0.99
TWO_TORSION_SHARE = 0.95

HANG_SECONDS = 300
"""A certification that runs this long is stuck, not slow: the guard turns a hang into a failure naming
the curve. Not a timing target."""


def certify_and_verify(a, seconds: int = HANG_SECONDS) -> tuple:
    """(certificate, None) when certify_rank(a) finishes within ``seconds`` and the verifier accepts the
    certificate; (None, what went wrong) otherwise."""
    try:
        alarm(seconds)
        cert = certify_rank(tuple(Fraction(c) for c in a))
    except AlarmInterrupt:
        return None, f"certify_rank did not finish within {seconds} s"
    except Exception as error:  # the certifier failing on a curve is an outcome to report, not a crash of the survey
        return None, f"certify_rank raised {type(error).__name__}: {error}"
    finally:
        cancel_alarm()
    try:
        verify(cert)
    except Rejection as rejection:
        return None, f"rejected: {rejection}"
    return cert, None


def descent_bound(cert: dict):
    """dim S + dim S' − 2 from the claimed Selmer dimensions (the verifier checks them against the
    descent), or None without a descent."""
    dimensions = cert["claim"]["selmer_dimensions"]
    return None if dimensions is None else int(dimensions["phi"]) + int(dimensions["phi_dual"]) - 2


def has_analytic_witness(cert: dict) -> bool:
    return cert["evidence"].get("analytic") is not None


def certified(a) -> dict:
    """The accepted certificate for a; the test fails, naming the curve, if there is none."""
    cert, problem = certify_and_verify(a)
    if problem:
        pytest.fail(f"{[str(c) for c in a]}: {problem}")
    return cert


@dataclasses.dataclass
class Outcome:
    """One table curve: its row, its certificate (None if there was a problem) and the bounds."""
    conductor: int
    class_index: int
    rank: int
    a: tuple
    cert: dict | None
    problem: str | None
    two_torsion: bool

    @property
    def lower(self) -> int:
        return int(self.cert["claim"]["rank_lower"])

    @property
    def upper(self):
        upper = self.cert["claim"]["rank_upper"]
        return None if upper is None else int(upper)

    @property
    def descent_bound(self):
        return descent_bound(self.cert)

    @property
    def points(self) -> list:
        return self.cert["claim"]["points"]

    def name(self) -> str:
        return f"{self.conductor}-{self.class_index} {list(self.a)} (rank {self.rank})"


def outcome(row) -> Outcome:
    conductor, class_index, rank, a = row
    cert, problem = certify_and_verify(a)
    return Outcome(conductor, class_index, rank, a, cert, problem, has_rational_two_torsion(a))


def shortfall_reason(result: Outcome) -> str:
    """Why the bounds of a curve with a rational point of order 2 do not meet, judged by cypari2."""
    if result.lower < result.rank:
        return f"point search: {result.lower} independent points of rank {result.rank}"
    if result.upper is None:
        return "no upper bound in the certificate"
    bounds = descent_bounds(result.a, result.rank)
    if bounds is None:
        dimension = sha_two_rank(result.a, result.rank)
        return f"Sha(E)[2] has dimension {dimension} (cypari2 ell2cover): no 2-isogeny descent closes"
    if min(bounds) > result.rank:
        return f"every 2-isogenous curve has Sha[2] != 0 (cypari2 ell2cover): descent bounds {bounds}"
    return f"the certified bound {result.upper} exceeds the best 2-isogeny descent bound {min(bounds)}"



def accepted(survey) -> list:
    return [result for result in survey if result.cert is not None]


@pytest.fixture(scope="module", params=["sample", pytest.param("whole table", marks=pytest.mark.table)])
def survey(request) -> list:
    """Outcomes for the sample (default suite) or for all 5,113 curves (``-m table``), computed once."""
    return [outcome(row) for row in (SAMPLE if request.param == "sample" else TABLE)]


def test_fixture_is_the_table_it_names():
    """The fixture's header names its source; it has the 5,113 curves of conductor < 1000 in the order
    (and with the keys) of tests/data/conductor_lt_1000.txt, with 3,081 curves of rank 0, 2,014 of rank 1
    and 18 of rank 2 (the counts of Cremona's tables, recalled from memory)."""
    header = fixture_header("rank_lt_1000.txt")
    assert "Cremona" in header[0] and "pari-elldata" in header[1]
    assert [(n, a) for n, _, _, a in TABLE] == conductor_rows("conductor_lt_1000.txt")
    ranks = [rank for _, _, rank, _ in TABLE]
    assert (len(ranks), ranks.count(0), ranks.count(1), ranks.count(2)) == (5113, 3081, 2014, 18)


def test_fixture_of_large_conductors():
    """The 500 random curves of conductor 100,000–499,999 (for bench/bench_rank.py): distinct, in range,
    in the table's order, with the source named."""
    rows = fixture_rows("rank_100000_499999.txt")
    header = fixture_header("rank_100000_499999.txt")
    assert "Cremona" in header[0] and "pari-elldata" in header[1]
    assert len(rows) == 500 == len({a for *_, a in rows})
    assert all(100_000 <= n <= 499_999 and 0 <= rank <= 3 for n, _, rank, _ in rows)
    assert [n for n, *_ in rows] == sorted(n for n, *_ in rows)


def test_fixture_ranks_within_ellrank():
    """The extracted ranks of the sample lie within cypari2's ellrank bounds (an outside check of the
    extraction, independent of the table's own generators)."""
    outside = [(n, a, rank, ellrank_bounds(a)) for n, _, rank, a in SAMPLE]
    outside = [entry for entry in outside if not entry[3][0] <= entry[2] <= entry[3][1]]
    assert not outside, outside


def test_certificates_accepted(survey):
    """Every curve gets a certificate the verifier accepts."""
    problems = [f"{result.name()}: {result.problem}" for result in survey if result.problem]
    assert not problems, "\n".join(problems)


def test_bounds_contain_the_table_rank(survey):
    """Soundness: rank_lower <= rank <= rank_upper (Cremona's table) for every accepted certificate."""
    false = [f"{result.name()}: [{result.lower}, {result.upper}]" for result in accepted(survey)
             if not (result.lower <= result.rank and (result.upper is None or result.rank <= result.upper))]
    assert not false, "\n".join(false)


def test_lower_bound_reaches_the_rank(survey):
    """rank_lower equals Cremona's rank on at least 99% of the curves."""
    short = [f"{result.name()}: lower bound {result.lower}"
             for result in accepted(survey) if result.lower < result.rank]
    share = 1 - len(short) / len(survey) - sum(1 for result in survey if result.problem) / len(survey)
    assert share >= LOWER_SHARE, f"share {share:.4f}; shortfalls:\n" + "\n".join(short)


def test_two_torsion_curves_closed(survey):
    """On the curves with a rational point of order 2 (cypari2 elldivpol) the bounds meet on at least 95%."""
    with_two_torsion = [result for result in survey if result.two_torsion]
    open_ = [f"{result.name()}: [{result.lower}, {result.upper}] — {shortfall_reason(result)}"
             for result in accepted(with_two_torsion) if result.lower != result.upper]
    failed = sum(1 for result in with_two_torsion if result.problem)
    share = 1 - (len(open_) + failed) / len(with_two_torsion)
    assert share >= TWO_TORSION_SHARE, f"share {share:.4f} of {len(with_two_torsion)}; open:\n" + "\n".join(open_)


def test_upper_bound_is_the_best_descent(survey):
    """A certificate proves its Selmer groups exactly, so its descent bound is the bound of the 2-isogeny
    it used, never below the best one (that would be false) and equal to it when the certifier tries every
    2-isogeny. cypari2 determines the bounds (rank + dim Sha(E')[2]) when Sha(E)[2] = 0; otherwise every
    bound is at least rank + dim Sha(E)[2] (tests/rank_reference.py). A descent needs a rational point of
    order 2; without an analytic witness, rank_upper is the descent's bound (null without a descent)."""
    wrong = []
    for result in accepted(survey):
        bound = result.descent_bound
        if not has_analytic_witness(result.cert) and result.upper != bound:
            wrong.append(f"{result.name()}: rank_upper {result.upper} but descent bound {bound}")
        if not result.two_torsion:
            if bound is not None:
                wrong.append(f"{result.name()}: a descent bound {bound} without a point of order 2")
            continue
        if bound is None:
            wrong.append(f"{result.name()}: no descent")
            continue
        bounds = descent_bounds(result.a, result.rank)
        least = result.rank + sha_two_rank(result.a, result.rank) if bounds is None else min(bounds)
        if (bound != least) if bounds is not None else (bound < least):
            wrong.append(f"{result.name()}: descent bound {bound}, best 2-isogeny descent bound {least}"
                         f" (descent bounds {bounds})")
    assert not wrong, "\n".join(wrong)


def test_listed_points_independent(survey):
    """The certificate's points lie on the curve and are independent modulo torsion: their regulator
    (cypari2 ellheightmatrix) is non-zero."""
    dependent = [f"{result.name()}: {result.points}" for result in accepted(survey)
                 if len(result.points) != result.lower or not (on_curve(result.a, result.points)
                                                               and independent(result.a, result.points))]
    assert not dependent, "\n".join(dependent)
