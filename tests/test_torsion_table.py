"""Torsion of the curves of conductor < 1000, against Cremona's tables and the reference library.

The curves are those of Cremona's tables (Algorithms for Modular Elliptic Curves, 2nd ed.), as
shipped in PARI's curve-data package (Debian pari-elldata) and extracted into the fixture
tests/data/conductor_lt_1000.txt. For each curve the certified group must equal cypari2's
``elltors``, the generators must generate it (judged by cypari2's group law), the verifier must
accept, and the certificate must validate against the schema.

A curve is a curve in every model: the same curves given by random non-minimal and non-integral
models (changes of variables [u, r, s, t] with rational entries, Silverman III.1) must get the same
group, with generators that, carried back to the table's model, lie on it with the right orders
and generate the same group.
"""
import random
from fractions import Fraction

import pytest

from certify.verifier import verify
from torsion_pool import FIXTURE, assert_claim_true, certified, schema_validator, table_curves

CI_CURVES = 1000
"""How many curves, from the start of the table, the default suite certifies."""

CHANGED_MODELS = 500
"""How many curves of the whole table are also certified in a random changed model."""


def check_table_curve(a) -> None:
    """The certificate for a table curve is true by the reference library, accepted, and schema-valid."""
    cert = certified(a)
    assert cert["curve"] == [str(c) for c in a], "the certificate must carry the input model exactly"
    assert_claim_true(cert)
    schema_validator().validate(cert)
    verify(cert)


def random_change(rng: random.Random, integral: bool) -> tuple:
    """A change [u, r, s, t] with small entries. With ``integral``, u = 1/k and r, s, t integers: the
    new model is integral but not minimal at the primes of k. Otherwise u, r, s, t are rationals and
    the new model is in general not integral."""
    def entry():
        return Fraction(rng.randint(-30, 30), 1 if integral else rng.choice([1, 2, 3, 4, 6, 9, 25]))

    u = Fraction(1, rng.randint(2, 12)) if integral else Fraction(rng.randint(1, 12), rng.randint(1, 12))
    return (u * rng.choice([1, -1]), entry(), entry(), entry())


def changed_model(a, change) -> tuple:
    """The coefficients after x = u²x' + r, y = u³y' + su²x' + t (Silverman, AEC III.1, Table 3.1)."""
    u, r, s, t = change
    a1, a2, a3, a4, a6 = (Fraction(c) for c in a)
    return ((a1 + 2 * s) / u,
            (a2 - s * a1 + 3 * r - s * s) / u ** 2,
            (a3 + r * a1 + 2 * t) / u ** 3,
            (a4 - s * a3 + 2 * r * a2 - (t + r * s) * a1 + 3 * r * r - 2 * s * t) / u ** 4,
            (a6 + r * a4 + r * r * a2 + r ** 3 - t * a3 - t * t - r * t * a1) / u ** 6)


def point_in_old_model(point, change) -> list:
    """A point (x', y') of the changed model in the table's coordinates: x = u²x' + r, y = u³y' + su²x' + t."""
    u, r, s, t = change
    x, y = (Fraction(v) for v in point)
    return [str(u * u * x + r), str(u ** 3 * y + s * u * u * x + t)]


def test_halving_a_point_of_order_two():
    """[1,1,1,-135,-660] is a table curve with E(Q)_tors = Z/2 × Z/2 (cypari2's elltors), but 16
    divides its first point counts, so each point Q of order 2 needs the rational roots of
    φ_2 − x(Q)ψ_2². That polynomial is always a square (if 2P = Q then −P = P + Q, so x(P) is a
    double root), so no prime makes its roots simple: the root-list evidence must come from its
    squarefree part. (The certifier once searched forever for a hint prime here; about one curve in
    five of the first thousand has this shape.)
    """
    check_table_curve((1, 1, 1, -135, -660))


def test_fixture_is_the_table_it_names():
    """The fixture's header names its source, and it has the 5,113 curves of conductor < 1000
    (the count of Cremona's table, recalled from memory) in isogeny classes keyed by conductor."""
    header = [line for line in FIXTURE.read_text().splitlines() if line.startswith("#")]
    assert "Cremona" in header[0] and "pari-elldata" in header[1]
    rows = table_curves()
    assert len(rows) == 5113
    assert all(0 < key[0] < 1000 for key, _ in rows)


def test_first_curves_of_the_table():
    """The first CI_CURVES curves of the table: certified group = elltors, certificate accepted."""
    for _, a in table_curves()[:CI_CURVES]:
        check_table_curve(a)


def check_changed_model(a, change) -> None:
    """The curve a in the model given by ``change``: the certificate there is accepted and true
    (reference library), and its generators, carried back to a, generate a's torsion group."""
    cert = certified(changed_model(a, change))
    assert_claim_true(cert)
    verify(cert)
    carried = [point_in_old_model(P, change) for P in cert["claim"]["generators"]]
    assert_claim_true({"curve": [str(c) for c in a],
                       "claim": {"invariants": cert["claim"]["invariants"], "generators": carried}})


def test_changed_models_give_the_same_group():
    """A random sample of table curves, each in a random non-minimal integral model or a random
    non-integral one: the same group, generators transported correctly."""
    rng = random.Random(20240601)
    for i, (_, a) in enumerate(rng.sample(table_curves(), CHANGED_MODELS)):
        check_changed_model(a, random_change(rng, integral=i % 2 == 0))


@pytest.mark.table
def test_whole_table():
    """All 5,113 curves of the fixture, in the table's model and in one random changed model each
    (run with ``-m table``)."""
    rng = random.Random(5113)
    for i, (_, a) in enumerate(table_curves()):
        check_table_curve(a)
        check_changed_model(a, random_change(rng, integral=i % 2 == 0))
