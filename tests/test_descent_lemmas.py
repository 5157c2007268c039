"""The local facts the descent checks of ``certify.verifier.descent`` rest on, each tested against an outside
reference before the verifier relies on it: p-adic squares (Serre, *A Course in Arithmetic*, II.3.3, with
cypari2's p-adic ``issquare`` as reference library), the leaf test on a disc, the partition check (against a
brute-force count of residue classes), the rule for real points (sympy's real-root count as reference), and
the fact that only the places of T can exclude an element of V (Silverman, *The Arithmetic of Elliptic
Curves*, X.4.9), on curves of Cremona's table (the fixture from Debian pari-elldata)."""
import itertools
import random
from pathlib import Path

import pytest
import sympy

from certify.pari import pari
from certify.verifier.descent import check_partition, is_local_square, leaf_verdict, real_soluble
from certify.verifier.errors import Rejection

TABLE = Path(__file__).parent / "data" / "conductor_lt_1000.txt"


def pari_is_square(n: int, p: int) -> bool:
    """cypari2 as reference: is n ≠ 0 a square in Q_p (to precision well beyond v_p(n) + 3)?"""
    v = 0
    while n % p ** (v + 1) == 0:
        v += 1
    return bool(pari(f"issquare({n} + O({p}^{v + 6}))"))


def test_local_squares_agree_with_pari():
    """Serre II.3.3 (Theorems 3 and 4) as implemented, against cypari2's p-adic issquare."""
    rng = random.Random(11)
    for _ in range(3000):
        p = rng.choice([2, 3, 5, 7, 11, 13, 101])
        n = rng.choice([-1, 1]) * rng.randint(1, 10 ** 6) * p ** rng.randint(0, 5)
        assert is_local_square(n, p) == pari_is_square(n, p), (n, p)


def random_quartic(rng) -> list:
    return [rng.randint(-60, 60) for _ in range(5)]


def test_conclusive_leaf_tests_hold_on_the_whole_disc():
    """A conclusive leaf test on c + p^k Z_p: every sampled point of the disc has f(t) a square (resp. a
    non-square) in Q_p, judged by cypari2."""
    rng = random.Random(12)
    conclusive = 0
    for _ in range(3000):
        p = rng.choice([2, 3, 5, 7])
        k = rng.randint(0, 3)
        f, c = random_quartic(rng), rng.randrange(p ** k)
        verdict = leaf_verdict(f, p, c, k)
        if verdict is None:
            continue
        conclusive += 1
        for _ in range(4):
            t = c + p ** k * rng.randrange(p ** 6)
            value = sum(coefficient * t ** i for i, coefficient in enumerate(f))
            assert value != 0 and pari_is_square(value, p) == (verdict == "square"), (f, p, c, k, t)
    assert conclusive > 500


def random_partition(rng, p: int, depth: int) -> list:
    """A partition of p^depth Z_p made by splitting random discs."""
    discs = [(0, depth)]
    for _ in range(rng.randint(0, 6)):
        c, k = discs.pop(rng.randrange(len(discs)))
        if k < 4:
            discs += [(c + j * p ** k, k + 1) for j in range(p)]
        else:
            discs.append((c, k))
    return discs


def is_partition_by_residues(discs: list, p: int, depth: int) -> bool:
    """Brute force: each residue class modulo p^K of p^depth Z_p (K the deepest level) lies in exactly one disc."""
    K = max([k for _, k in discs] + [depth])
    return all(sum(1 for c, k in discs if x % p ** k == c) == 1 for x in range(0, p ** K, p ** depth))


@pytest.mark.parametrize("p", [2, 3, 5])
@pytest.mark.parametrize("depth", [0, 1])
def test_partition_check_agrees_with_brute_force(p, depth):
    """check_partition accepts exactly the partitions of p^depth Z_p (brute force over residue classes), on
    random partitions and on each of them with a disc removed, duplicated, merged back into its parent, or moved
    to another place of the same size (which keeps the total measure)."""
    rng = random.Random(p * 10 + depth)
    for _ in range(150):
        discs = random_partition(rng, p, depth)
        variants = [discs, discs[:-1], discs + [discs[0]]]
        i = rng.randrange(len(discs))
        c, k = discs[i]
        if k > depth:
            variants.append(discs + [(c % p ** (k - 1), k - 1)])
            moved = (c + p ** depth * rng.randrange(1, p ** (k - depth))) % p ** k   # the same size elsewhere
            variants.append(discs[:i] + [(moved, k)] + discs[i + 1:])
        for variant in variants:
            try:
                check_partition(variant, p, depth, "test")
                accepted = True
            except Rejection:
                accepted = False
            assert accepted == is_partition_by_residues(variant, p, depth), (variant, p, depth)


def test_real_place_rule_agrees_with_sympy():
    """real_soluble: C_d(R) ≠ ∅ exactly when d > 0, or f1(t) = d t⁴ + A t² + B/d is ≥ 0 somewhere — for d < 0,
    when B/d > 0 or f1 has a real root (sympy's count of real roots as reference)."""
    t = sympy.Symbol("t")
    for A, B, d in itertools.product(range(-13, 14), range(-40, 41), (-6, -3, -2, -1, 1, 2, 5)):
        if B % d or B * (A * A - 4 * B) == 0:
            continue
        expected = d > 0 or B // d > 0 or sympy.Poly(d * t ** 4 + A * t ** 2 + B // d, t).count_roots() > 0
        assert real_soluble(A, B, d) == expected, (A, B, d)


def descent_models(count: int) -> list:
    """(A, B) of y² = x³ + A x² + B x for the first table curves with a rational 2-torsion point: with x' = 4x,
    the model is y'² = x'³ + b2 x'² + 8 b4 x' + 16 b6 (Silverman III.1), whose 2-torsion point x'₀ (an integer
    root, found by sympy) moves to 0."""
    x = sympy.Symbol("x")
    out = []
    for line in TABLE.read_text().splitlines():
        if line.startswith("#"):
            continue
        a1, a2, a3, a4, a6 = (int(v) for v in line.split()[2:])
        b2, b4, b6 = a1 * a1 + 4 * a2, 2 * a4 + a1 * a3, a3 * a3 + 4 * a6
        roots = sympy.roots(x ** 3 + b2 * x ** 2 + 8 * b4 * x + 16 * b6, filter="Z")
        if roots:
            x0 = int(min(roots))
            out.append((3 * x0 + b2, 3 * x0 * x0 + 2 * b2 * x0 + 8 * b4))
        if len(out) == count:
            return out
    return out


def soluble_at(A: int, B: int, d: int, p: int) -> bool:
    """A Q_p-point of C_d exhibited by search: t = M/e with e = 1 and 0 <= M < p², or s = e/M with M = 1 and
    e = p·j (j < p), where the quartic's value is a non-zero p-adic square (is_local_square, tested above)."""
    values = [d * t ** 4 + A * t * t + B // d for t in range(p * p)]
    values += [d + A * (p * j) ** 2 + (B // d) * (p * j) ** 4 for j in range(p)]
    return any(n and is_local_square(n, p) for n in values)


def test_places_outside_T_exclude_nothing():
    """Silverman X.4.9 (recalled; tested here before the Selmer dimensions rely on it): for p odd not dividing
    B(A² − 4B), every d of V has a Q_p-point on C_d — on 20 table curves with a rational 2-torsion point,
    every d of V, and the odd primes p < 20 outside T."""
    models = descent_models(20)
    assert len(models) == 20
    for A, B in models:
        assert B * (A * A - 4 * B) != 0
        primes = sympy.primefactors(abs(B))
        elements = [sign * int(sympy.prod(subset)) for sign in (1, -1)
                    for r in range(len(primes) + 1) for subset in itertools.combinations(primes, r)]
        for p in (3, 5, 7, 11, 13, 17, 19):
            if B * (A * A - 4 * B) % p:
                for d in elements:
                    assert soluble_at(A, B, d, p), (A, B, d, p)
