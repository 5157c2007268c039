"""Reference values for the rank tests, from cypari2 as reference library and from the rank fixtures
(Cremona's tables through Debian pari-elldata, tests/data/extract_ranks.py). Nothing here is used by
the certifier, and nothing of the certifier is used here but its PARI instance.

- ``ellrank`` (PARI's 2-descent with point search): bounds r_lo <= rank <= r_hi;
- ``ell2cover`` (a basis of the 2-Selmer group of E as locally soluble 2-covers): its length C;
- ``ellheightmatrix`` (canonical heights): the regulator of a list of points;
- ``elldivpol`` and ``ellisogeny``: the rational points of order 2 and the 2-isogenous curves.

How sharp a 2-isogeny descent can be is derived from these. For an isogeny φ: E → E' of degree 2
with dual φ': E' → E, Silverman, *The Arithmetic of Elliptic Curves*, Theorem X.4.2 gives
0 → E'(Q)/φ(E(Q)) → Sel^φ(E) → Sha(E)[φ] → 0, and with the formula
#E'(Q)/φ(E(Q)) · #E(Q)/φ'(E'(Q)) = 2^(rank + 2) (Silverman–Tate, *Rational Points on Elliptic
Curves*, §III.6) the descent bound is

    dim Sel^φ(E) + dim Sel^φ'(E') − 2 = rank + dim Sha(E)[φ] + dim Sha(E')[φ'].

Here Sha(E)[φ] is the kernel of φ on Sha(E); it lies in Sha(E)[2] (φ'φ = 2), and φ maps Sha(E)[2] into
Sha(E')[φ'], so 0 → Sha(E)[φ] → Sha(E)[2] → Sha(E')[φ'] is exact, and likewise with E, E' exchanged.
Hence dim Sha(E)[2] <= dim Sha(E)[φ] + dim Sha(E')[φ']: every 2-isogeny descent bound is at least
rank + dim Sha(E)[2], and none reaches the rank when Sha(E)[2] ≠ 0. If Sha(E)[2] = 0, then
Sha(E)[φ] = 0 and Sha(E')[φ'] = Sha(E')[2], so the φ-descent bound is exactly rank + dim Sha(E')[2].
The 2-rank of Sha is C − T − rank with T = dim E(Q)[2] (Silverman X.4.2 for the isogeny [2]; the
formula C = T + R + S of PARI's documentation of ``ellrank``).
"""
import math
import pathlib
from fractions import Fraction

from certify.pari import pari

DATA = pathlib.Path(__file__).resolve().parent / "data"

INDEPENDENCE_TOLERANCE = 1e-20
"""Points count as independent when det H > INDEPENDENCE_TOLERANCE · ∏ H_ii for their height matrix H
(Hadamard's inequality det H <= ∏ H_ii for positive semi-definite H makes the ratio scale-free; PARI
computes with 38 digits, so a dependent family gives a ratio near 10^-38, an independent one of table
curves far above 10^-20)."""


def fixture_rows(name: str) -> list:
    """[(conductor, class_index, rank, (a1, a2, a3, a4, a6))] from a fixture of lines
    'conductor class_index rank a1 … a6' (tests/data/rank_*.txt, Cremona's tables)."""
    rows = []
    for line in (DATA / name).read_text().splitlines():
        if line.startswith("#") or not line.strip():
            continue
        conductor, class_index, rank, *a = (int(v) for v in line.split())
        rows.append((conductor, class_index, rank, tuple(a)))
    return rows


def fixture_header(name: str) -> list:
    """The comment lines at the head of a fixture."""
    return [line for line in (DATA / name).read_text().splitlines() if line.startswith("#")]


def pari_curve(a):
    """The reference library's curve for coefficients given as ints, Fractions or decimal strings."""
    return pari.ellinit([pari(str(Fraction(c))) for c in a])


def ellrank_bounds(a, effort: int = 0) -> tuple:
    """(r_lo, r_hi) with r_lo <= rank E(Q) <= r_hi, by cypari2's ``ellrank``."""
    lower, upper, *_ = pari.ellrank(pari_curve(a), effort)
    return int(lower), int(upper)


def two_torsion_points(a) -> list:
    """The rational points of order 2, [x, y] as Fractions, in increasing order of x: x a rational
    root of the 2-division polynomial 4x³ + b2x² + 2b4x + b6 (cypari2 ``elldivpol``, ``factor``),
    y = −(a1x + a3)/2."""
    a1, _, a3, _, _ = (Fraction(c) for c in a)
    points = []
    for factor in pari.factor(pari.elldivpol(pari_curve(a), 2))[0]:
        if int(pari.poldegree(factor)) == 1:
            x = Fraction(str(-pari.polcoef(factor, 0) / pari.polcoef(factor, 1)))
            points.append([x, -(a1 * x + a3) / 2])
    return sorted(points)


def has_rational_two_torsion(a) -> bool:
    return bool(two_torsion_points(a))


def two_isogenous_curves(a) -> list:
    """E/<T> for every rational point T of order 2 (cypari2 ``ellisogeny``), as coefficient tuples, in
    the order of ``two_torsion_points``."""
    curve = pari_curve(a)
    return [tuple(Fraction(str(c)) for c in pari.ellisogeny(curve, [pari(str(x)), pari(str(y))], 1)[:5])
            for x, y in two_torsion_points(a)]


def sha_two_rank(a, rank: int) -> int:
    """dim Sha(E)[2] = C − T − rank, C = dim Sel^2(E) (``ell2cover``), T = dim E(Q)[2]; rank must be
    the true rank (from the tables, or from ``ellrank`` when its bounds meet). Computed on the
    minimal model (the group is the same in every model)."""
    selmer = len(pari.ell2cover(pari.ellminimalmodel(pari_curve(a))))
    torsion = {0: 0, 1: 1, 3: 2}[len(two_torsion_points(a))]
    return selmer - torsion - rank


def descent_bounds(a, rank: int):
    """The bound rank + dim Sha(E')[2] of each 2-isogeny descent E → E' (one per rational point of
    order 2, in the order of ``two_torsion_points``), valid when Sha(E)[2] = 0 (module docstring); None
    when Sha(E)[2] ≠ 0, where every 2-isogeny descent's bound exceeds the rank; [] without a rational
    point of order 2."""
    if sha_two_rank(a, rank) != 0:
        return None
    return [rank + sha_two_rank(target, rank) for target in two_isogenous_curves(a)]


def on_curve(a, points) -> bool:
    """Every point [x, y] (decimal strings) lies on the curve a (cypari2 ``ellisoncurve``)."""
    curve = pari_curve(a)
    return all(bool(pari.ellisoncurve(curve, [pari(x), pari(y)])) for x, y in points)


def height_matrix(a, points) -> list:
    """The matrix of canonical height pairings <P_i, P_j> (cypari2 ``ellheightmatrix``), floats."""
    if not points:
        return []
    matrix = pari.ellheightmatrix(pari_curve(a), [[pari(x), pari(y)] for x, y in points])
    return [[float(matrix[i, j]) for j in range(len(points))] for i in range(len(points))]


def regulator(a, points) -> float:
    """det <P_i, P_j> (1 for no points); non-zero exactly when the points are independent modulo
    torsion (the canonical height is a positive definite quadratic form on E(Q) ⊗ R; Silverman,
    *The Arithmetic of Elliptic Curves*, VIII.9)."""
    if not points:
        return 1.0
    return float(pari.matdet(pari.ellheightmatrix(pari_curve(a), [[pari(x), pari(y)] for x, y in points])))


def independent(a, points) -> bool:
    """The points lie on a and are independent modulo torsion: every height is positive and the
    regulator is non-zero, measured against Hadamard's bound (INDEPENDENCE_TOLERANCE)."""
    if not on_curve(a, points):
        return False
    diagonal = [row[i] for i, row in enumerate(height_matrix(a, points))]
    return all(h > 0 for h in diagonal) and regulator(a, points) > INDEPENDENCE_TOLERANCE * math.prod(diagonal)
