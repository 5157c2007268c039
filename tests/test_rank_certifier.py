"""Unit tests of the rank certifier's own search code (certify/rank): descent models and changes of
variables, the dual isogeny, quartic points, disc covers and membership witnesses, the choice of
independent points and of the primes proving them, the time budget, and ``certify rank``.

Outside sources, named at each check: cypari2 as reference library (``ellchangecurve``, ``ellisoncurve``,
``ellmul``, ``ellisogeny``, ``ellheightmatrix``, ``ellcard``, ``ellrank`` and p-adic ``issquare``), and
Cremona's tables through the fixture tests/data/rank_lt_1000.txt. The certificates of whole curves are
tested against the tables in test_rank_table.py and test_rank_examples.py.
"""
import json
import random
from fractions import Fraction

import pytest

from certify.cli import main
from certify.curves import Curve
from certify.rank.certificate import certify_rank
from certify.rank.descent import (Side, compose, cover, descend, descent_models, local_verdict, phi_dual,
                                  quartic_point, two_torsion)
from certify.rank.points import independent_subset, prove_independent, search
from certify.verifier import verify
from certify.verifier.descent import element_vector, image_vector, quartics
from rank_reference import ellrank_bounds, fixture_rows, pari, pari_curve, two_torsion_points

TABLE = fixture_rows("rank_lt_1000.txt")

CURVES = [(0, 0, 0, -1, 0), (0, 0, 0, -25, 0), (0, 0, 0, -1156, 0), (0, -1, 0, -900, -10098),
          (1, 1, 1, -352, -2689), (1, 0, 0, -9887980, -11965158280), (0, 0, 0, 0, 8), (0, 0, 0, -4, 0),
          (1, -1, 1, -3, 3), (0, 1, 0, -1, 0)]
"""Curves with rational 2-torsion: congruent-number curves, j = 0 and j = 1728, a curve of conductor 66 whose
2-isogeny descent is not sharp, one whose b has the prime 2081 (an exclusion needs over 2,000 discs), and table curves."""


def pari_point(P):
    return [pari(str(P[0])), pari(str(P[1]))]


def model_of(a):
    return tuple(int(c) for c in Curve(tuple(Fraction(c) for c in a)).minimal_model()[0].a)


@pytest.mark.parametrize("a", CURVES)
def test_descent_models_reach_the_short_form(a):
    """One model y² = x³ + A x² + B x per rational point of order 2 (cypari2 elldivpol via rank_reference),
    each reached from the integral model by the stated change (cypari2 ellchangecurve)."""
    model = model_of(a)
    found = descent_models(model)
    assert len(found) == len(two_torsion_points(model))
    for m in found:
        changed = pari.ellchangecurve(pari.ellinit(list(model)), [pari(str(v)) for v in m.change])
        assert [int(changed[i]) for i in range(5)] == [0, m.A, 0, m.B, 0]
        assert m.B * (m.A * m.A - 4 * m.B) != 0


def test_compose_is_one_change_after_the_other():
    """compose(c1, c2) takes a curve where c1 then c2 take it (cypari2 ellchangecurve, random changes)."""
    generator = random.Random(7)
    curve = pari.ellinit([1, -1, 1, -3, 3])
    for _ in range(20):
        first, second = ([Fraction(generator.choice([-3, -2, -1, 1, 2, 3]), generator.randint(1, 3))]
                         + [Fraction(generator.randint(-9, 9), generator.randint(1, 4)) for _ in range(3)]
                         for _ in range(2))
        both = pari.ellchangecurve(pari.ellchangecurve(curve, [pari(str(v)) for v in first]),
                                   [pari(str(v)) for v in second])
        once = pari.ellchangecurve(curve, [pari(str(v)) for v in compose(first, second)])
        assert [str(both[i]) for i in range(5)] == [str(once[i]) for i in range(5)]


@pytest.mark.parametrize("a", [(0, 0, 0, -1156, 0), (0, 1, 0, -1, 0), (0, -1, 0, -900, -10098), (0, 0, 0, 0, 8)])
def test_dual_isogeny_formula(a):
    """For points Q of Ē: y² = x³ − 2A x² + (A² − 4B) x, φ̂(Q) lies on E, and φ̂(φ(P)) = 2P for points P of E,
    with φ(x, y) = (y²/x², y(B − x²)/x²) (Silverman–Tate III.4, recalled from memory: checked here with
    cypari2's ellisoncurve and ellmul on the points of small height found by cypari2's ellratpoints)."""
    for m in descent_models(model_of(a)):
        E, dual = pari.ellinit([0, m.A, 0, m.B, 0]), pari.ellinit([0, -2 * m.A, 0, m.A ** 2 - 4 * m.B, 0])
        B_dual = m.A ** 2 - 4 * m.B
        for Q in pari.ellratpoints(dual, 200)[:10]:
            image = phi_dual(B_dual, (Fraction(str(Q[0])), Fraction(str(Q[1]))))
            assert image is None or pari.ellisoncurve(E, pari_point(image))
        for P in pari.ellratpoints(E, 200)[:10]:
            x, y = Fraction(str(P[0])), Fraction(str(P[1]))
            if x == 0:
                continue
            there = (y * y / (x * x), y * (m.B - x * x) / (x * x))
            back = phi_dual(B_dual, there)
            doubled = pari.ellmul(E, P, 2)
            assert (back is None and doubled == pari([0])) or pari_point(back) == list(doubled)


def test_two_torsion_points():
    """The points of order 2 of y² = x³ + A x² + B x (cypari2 elldivpol via rank_reference)."""
    for A, B in [(0, -1), (0, -25), (-1, -900), (3, 2), (5, 1)]:
        assert sorted(two_torsion(A, B)) == sorted((x, y) for x, y in two_torsion_points((0, A, 0, B, 0)))


def test_quartic_points_have_their_image():
    """A point found on C_d lies on y² = x³ + A x² + B x (cypari2 ellisoncurve) with α = d."""
    found = 0
    for A, B, d in [(0, -1156, 2), (0, -1156, -17), (0, 4624, -1), (0, -25, -1), (0, -25, 5)]:
        point = quartic_point(A, B, d)
        if point is None:
            continue
        found += 1
        primes = [p for p in (2, 3, 5, 17) if B % p == 0]
        assert pari.ellisoncurve(pari.ellinit([0, A, 0, B, 0]), pari_point(point))
        assert image_vector(point, B, primes) == element_vector(d, primes, "test")
    assert found >= 3


def padic_square(n: int, p: int) -> bool:
    """Whether n is a square in Q_p (cypari2 issquare on n + O(p^k), k beyond the valuation)."""
    return bool(pari.issquare(pari(n) + pari(f"O({p}^{4 + 2 * max(1, abs(n)).bit_length()})")))


def sample_values(f: list, p: int, depth: int, count: int, generator) -> list:
    """f at ``count`` random integers of p^depth Z, and at small ones."""
    points = [p ** depth * t for t in range(count)] + [p ** depth * generator.randint(0, p ** 12) for _ in range(count)]
    return [sum(c * t ** i for i, c in enumerate(f)) for t in points]


@pytest.mark.parametrize("A, B", [(0, 4624), (-1, -900), (388, 37632), (0, 144), (41, 400), (-67, -32)])
def test_local_verdicts_against_padic_squares(A, B):
    """For every d in V and every prime of T: an exclusion's quartics take no non-zero square value in Q_p
    on random points of Z_p and pZ_p, and a membership witness's value is a square in Q_p (cypari2 p-adic
    issquare). Each of these curves has both outcomes."""
    generator = random.Random(A * 1000 + B)
    primes = [p for p in range(2, 100) if all(p % q for q in range(2, p)) and B * (A * A - 4 * B) % p == 0]
    side = Side(A, B, [p for p in primes if B % p == 0])
    outcomes = set()
    for vector in range(1, 1 << side.dimension):
        d = side.element(vector)
        for p in sorted({2} | set(primes)):
            verdict = local_verdict(A, B, d, p)
            outcomes.add(verdict[0])
            if verdict[0] == "soluble":
                _, M, e = verdict
                assert padic_square(d * M ** 4 + A * M * M * e * e + (B // d) * e ** 4, p)
            elif verdict[0] == "excluded":
                f1, f2 = quartics(A, B, d)
                for f, depth in ((f1, 0), (f2, 1)):
                    assert not any(n and padic_square(n, p) for n in sample_values(f, p, depth, 60, generator))
    assert outcomes == {"soluble", "excluded"}


@pytest.mark.parametrize("A, B, d, p", [(41, 400, 2, 2), (388, 37632, 7, 7), (-287, -288, 3, 17), (-67, -32, -1, 3),
                                        (-199, -256, 2, 5), (0, 4624, 3, 3)])
def test_cover_partitions_the_chart(A, B, d, p):
    """Exclusions met on table curves (several discs deep): each chart's cover has total measure 1 (1/p),
    every point of the chart up to p^4 lies in exactly one disc, and on random points of each disc the
    quartic is not a square in Q_p (cypari2 p-adic issquare)."""
    generator = random.Random(p)
    verdict = local_verdict(A, B, d, p)
    assert verdict[0] == "excluded"
    for f, depth, discs in zip(quartics(A, B, d), (0, 1), verdict[1:]):
        assert sum(Fraction(1, p ** k) for _, k in discs) == Fraction(1, p ** depth)
        for t in range(0, p ** 4, p ** depth):
            assert sum(1 for c, k in discs if (t - c) % p ** k == 0) == 1
        for c, k in discs:
            for _ in range(5):
                t = c + p ** k * generator.randint(0, p ** 8)
                n = sum(coefficient * t ** i for i, coefficient in enumerate(f))
                assert n and not padic_square(n, p)


def test_a_sharp_descent_of_congruent_number_curve_34():
    """y² = x³ − 34²x has rank 2 (Koblitz, Introduction to Elliptic Curves and Modular Forms, Ch. I;
    cypari2 ellrank): some 2-isogeny descent gives the bound 2 and points of both sides."""
    model = model_of((0, 0, 0, -1156, 0))
    results = [descend((1, 0, 0, 0), m, [], float("inf")) for m in descent_models(model)]
    assert min(r.bound for r in results if r is not None) == 2 == ellrank_bounds(model)[1]


def test_independent_subset_against_table_ranks():
    """On the first table curves of rank ≥ 1 the points of small height contain as many independent ones as
    the table's rank (Cremona's tables), and cypari2's regulator of the chosen points is non-zero."""
    for *_, rank, a in [row for row in TABLE if row[2] > 0][:40]:
        model = model_of(a)
        curve = pari.ellinit(list(model))
        chosen = independent_subset(curve, search(curve, 10_000))
        assert len(chosen) == rank
        assert float(pari.matdet(pari.ellheightmatrix(curve, [pari_point(P) for P in chosen]))) > 1e-6


def test_prove_independent_chooses_valid_primes():
    """The chosen ℓ, torsion prime and character primes satisfy what the spec asks: ℓ ∤ #Ẽ(F_p) and ℓ ∥ #Ẽ(F_q)
    (cypari2 ellcard), and the rank-3 curve y² + y = x³ − 7x + 6 (cypari2 ellrank) keeps all three points."""
    model = (0, 0, 1, -7, 6)
    curve = pari.ellinit(list(model))
    chosen = independent_subset(curve, search(curve, 1000))
    proven, evidence = prove_independent(model, chosen)
    assert len(proven) == 3 == ellrank_bounds(model)[0]
    ell = int(evidence["ell"])
    assert int(pari.ellcard(curve, int(evidence["torsion_prime"]))) % ell
    for q in evidence["character_primes"]:
        count = int(pari.ellcard(curve, int(q)))
        assert count % ell == 0 and count % ell ** 2


def test_dependent_points_are_not_all_proven():
    """P, 2P and P + Q are not independent: heights keep two of them (cypari2 ellmul and elladd make the points)."""
    model = (0, 0, 1, -7, 6)
    curve = pari.ellinit(list(model))
    P, Q = pari("[1, 0]"), pari("[2, 0]")
    points = [(Fraction(str(R[0])), Fraction(str(R[1]))) for R in (P, pari.ellmul(curve, P, 2), pari.elladd(curve, P, Q))]
    assert len(independent_subset(curve, points)) == 2


def test_no_time_no_descent_but_an_accepted_certificate():
    """With no time left the descents are given up: no descent bound, and the certificate is still accepted
    (an upper bound then comes from an analytic witness alone, if any)."""
    cert = certify_rank(tuple(Fraction(c) for c in (0, 0, 0, -25, 0)), seconds=0)
    verify(cert)
    assert cert["evidence"]["descent"] is None and cert["claim"]["selmer_dimensions"] is None
    assert (cert["claim"]["rank_upper"] is None) == (cert["evidence"].get("analytic") is None)


@pytest.mark.parametrize("a", [(0, 0, 0, Fraction(-1, 16), 0), (Fraction(1, 2), 0, Fraction(1, 3), -7, 6),
                               (0, 0, 0, -400, 0), (0, 0, 0, 0, 17 * 2 ** 6)])
def test_rational_and_non_minimal_input(a):
    """Points are claimed on the input model (cypari2 ellisoncurve) and the bounds contain cypari2 ellrank's."""
    cert = certify_rank(tuple(Fraction(c) for c in a))
    verify(cert)
    curve = pari_curve(a)
    assert all(pari.ellisoncurve(curve, [pari(x), pari(y)]) for x, y in cert["claim"]["points"])
    low, high = ellrank_bounds(a)
    assert int(cert["claim"]["rank_lower"]) == low == high
    assert cert["claim"]["rank_upper"] is None or int(cert["claim"]["rank_upper"]) >= high


def test_command_line(tmp_path, capsys):
    """certify rank CURVE -o FILE writes a certificate the verifier accepts; y² = x³ − 36x has rank 1
    (6 is a congruent number: Koblitz, Ch. I; cypari2 ellrank)."""
    out = tmp_path / "rank.json"
    assert main(["rank", "[0,0,0,-36,0]", "-o", str(out)]) == 0
    cert = json.loads(out.read_text())
    verify(cert)
    assert (cert["claim"]["rank_lower"], cert["claim"]["rank_upper"]) == ("1", "1")
    assert "rank 1" in capsys.readouterr().err
