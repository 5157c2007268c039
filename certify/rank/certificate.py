"""The rank certifier: rank_lower ≤ rank E(Q) ≤ rank_upper, with independent points for the lower bound
and, for the upper bound, a descent via 2-isogeny (curves with a rational 2-torsion point) or an analytic
witness of the order of vanishing of L(E, s) at s = 1.

Order of work: points of small height on the reduced minimal model (PARI's ellratpoints); for each
rational 2-torsion point a descent (``certify.rank.descent``), whose quartic searches may find more
points; the best descent kept (least bound, then shortest); a maximal independent set of the points
chosen by canonical heights; when no descent meets those points, an analytic witness of
ord_{s=1} L(E, s) ≤ 1 (``certify.analytic``), which is then the rank (Gross–Zagier, Kolyvagin), kept only
where the descent does not already prove the rank; while the points are fewer than the least bound (or
there is no bound), wider searches
on the curve and on the quartics of the local generators; the set proven independent by reduction
characters (``certify.rank.points``). A time budget bounds the descents and the wider searches: past
it, what is claimed is what is proven so far, and an unfinished descent claims no bound at all.
"""
from __future__ import annotations

import signal
import time

from certify.analytic import analytic_witness
from certify.curves import Curve, format_rational, inverse_change
from certify.pari import pari
from certify.rank.descent import (DEEP_QUARTIC_HEIGHTS, WIDER_QUARTIC_HEIGHT, descend, descent_models,
                                  generator_points)
from certify.rank.points import (DEEP_HEIGHTS, SEARCH_HEIGHT, WIDER_HEIGHTS, independent_subset, prove_independent,
                                 search)
from certify.verifier import theorems
from certify.verifier.curves import change_point
from certify.verifier.lseries import RELIES_ON as ANALYTIC_RELIES_ON
from certify.verifier.rank import FORMAT, RELIES_ON_DESCENT, RELIES_ON_POINTS

DEFAULT_SECONDS = 60.0
"""Time budget of one rank certificate when none is given."""

DEEP_SEARCH_SECONDS = 3.0
"""The most time spent on the deep searches (``deep_search``)."""

GROWTH = 10
"""How much longer each deep search step is expected to take than the one before (the bounds grow by
about √10, and the sieves' cost as the square of the bound)."""

ALARM_SHARE = 0.75
"""Share of a pending SIGALRM timer (a batch's --timeout) the budget may use: the rest is left for writing
and verifying the certificate before the alarm ends the attempt."""


def certify_rank(a, given=None, seconds: float = DEFAULT_SECONDS) -> dict:
    """The rank certificate of the curve with coefficients ``a`` (five Fractions); ``given`` are the
    coefficients as typed (their canonical forms when not given); ``seconds`` bounds the descents and
    the searches, and so does what is left of a pending SIGALRM timer (``ALARM_SHARE`` of it)."""
    pending = signal.getitimer(signal.ITIMER_REAL)[0]
    deadline = time.monotonic() + (min(seconds, ALARM_SHARE * pending) if pending > 0 else seconds)
    reduced, change = Curve(a).minimal_model()
    model = tuple(int(c) for c in reduced.a)
    curve = pari.ellinit(list(model))
    points = search(curve, SEARCH_HEIGHT)
    descents = []
    for descent_model in descent_models(model):
        if time.monotonic() > deadline:
            break
        descent = descend(change, descent_model, points, deadline)
        if descent is not None:
            points += descent.new_points
            descents.append(descent)
    best = min(descents, key=lambda d: (d.bound, d.size), default=None)
    independent = independent_subset(curve, points)
    analytic = None
    if (best is None or best.bound > len(independent)) and time.monotonic() < deadline:
        analytic = analytic_witness(a)
    bounds = ([best.bound] if best is not None else []) + ([int(analytic["order"])] if analytic else [])
    wider = WIDER_HEIGHTS if bounds else WIDER_HEIGHTS[:1]
    for i, height in enumerate(wider):
        if (bounds and len(independent) >= min(bounds)) or time.monotonic() > deadline:
            break
        points += search(curve, height)
        if best is not None and i == 0:
            points += generator_points(best, WIDER_QUARTIC_HEIGHT)
        independent = independent_subset(curve, points)
    if missing_point(best, analytic, len(independent)):
        points += deep_search(curve, best, min(deadline, time.monotonic() + DEEP_SEARCH_SECONDS))
        independent = independent_subset(curve, points)
    proven, independence = prove_independent(model, independent)
    if bounds and min(bounds) < len(proven):
        raise ArithmeticError("a proven upper bound is below the number of independent points: a certifier bug")
    if analytic is not None and best is not None and best.bound == len(proven):
        analytic = None   # the descent alone proves the rank
        bounds = [best.bound]
    back = inverse_change(change)
    return {
        "format": FORMAT,
        "version": "1",
        "curve": list(given) if given is not None else [format_rational(c) for c in a],
        "claim": {
            "rank_lower": str(len(proven)),
            "rank_upper": str(min(bounds)) if bounds else None,
            "points": [[format_rational(v) for v in change_point(P, back)] for P in proven],
            "selmer_dimensions": None if best is None else {"phi": str(best.dimensions[0]),
                                                            "phi_dual": str(best.dimensions[1])},
        },
        "evidence": {
            "integral_model": {"change": [format_rational(v) for v in change], "curve": [str(c) for c in model]},
            "independence": independence,
            "descent": None if best is None else best.entry,
            "analytic": analytic,
        },
        "relies_on": theorems.entries(dict.fromkeys((RELIES_ON_POINTS if proven else ()) + (RELIES_ON_DESCENT if best else ())
                                                    + (ANALYTIC_RELIES_ON if analytic else ()))),
    }


def missing_point(descent, analytic, found: int) -> bool:
    """Whether a point beyond those found is known to exist (an analytic order above their number: the order
    is the rank), or probably does: a descent bound exceeding their number by an odd amount. The bound is
    rank + dim Sha(E)[φ] + dim Sha(Ē)[φ̂], and by the parity conjecture for these Selmer groups (T. and V.
    Dokchitser, Root numbers and parity of ranks of elliptic curves, J. reine angew. Math. 658 (2011)) the
    bound and the rank have the same parity when Sha is finite, so an odd gap is a missing point and an even
    one most often Sha. Only a guide for the search: nothing claimed depends on it."""
    if analytic is not None:
        return int(analytic["order"]) > found
    return descent is not None and (descent.bound - found) % 2 == 1


def deep_search(curve, descent, until: float) -> list:
    """Points from searches of growing height, on the quartics of the descent's local generators and then on
    the curve; in each sequence a step is made only when it is expected (GROWTH times the one before) to end
    before ``until``."""
    quartic_steps = [lambda h=height: generator_points(descent, h) for height in DEEP_QUARTIC_HEIGHTS] if descent else []
    curve_steps = [lambda h=height: search(curve, h) for height in DEEP_HEIGHTS]
    points = []
    for steps in (quartic_steps, curve_steps):
        previous = 0.0
        for step in steps:
            start = time.monotonic()
            if start + GROWTH * previous >= until:
                break
            points += step()
            previous = time.monotonic() - start
    return points
