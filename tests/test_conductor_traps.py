"""Traps for conductor certificates, each checked against cypari2 (ellglobalred, elllocalred, ellap) and,
where named, a published source: worked examples, additive reduction at 2 and 3 of every Kodaira type
that occurs there, non-minimal and rational input models, and discriminants with prime factors above
the deterministic Miller–Rabin bound (Pocklington certificates)."""
from fractions import Fraction

import pytest

from certify.conductor import certify_conductor
from certify.curves import Curve
from certify.pari import pari
from certify.verifier import verify
from certify.verifier.primality import MILLER_RABIN_BOUND
from conductor_reference import fixture_rows, kodaira_text, reference_claim

TABLE = fixture_rows("conductor_lt_1000.txt")


def certified(a) -> dict:
    """The certificate for a, accepted by the verifier and equal to cypari2's claim."""
    a = tuple(Fraction(c) for c in a)
    cert = certify_conductor(a)
    verify(cert)
    assert cert["claim"] == reference_claim(a)
    return cert


def local(cert: dict, p: int) -> tuple:
    entry = next(e for e in cert["claim"]["bad_primes"] if e["prime"] == str(p))
    return entry["kodaira_symbol"], entry["reduction"], int(entry["conductor_exponent"]), int(entry["tamagawa_number"])


# Worked examples. The values are recalled from memory (Cremona's tables, Algorithms 2nd ed., Table 1,
# and the examples around Silverman, Advanced Topics IV.9 and Cremona 3.2), with the Kodaira symbols
# derived from N and Δ by Ogg's formula m_p = v_p(Δ) − f_p + 1; cypari2 checks each one as well.
WORKED = [
    ((0, -1, 1, -10, -20), "11", "-161051", {11: ("I5", "split multiplicative", 1, 5)}),
    # y^2 + y = x^3 - x has rank 1, so root number w = −1; for N = p prime, w = a_p, so the reduction is non-split
    # (first recalled as split, which cypari2's ellap corrected).
    ((0, 0, 1, -1, 0), "37", "37", {37: ("I1", "non-split multiplicative", 1, 1)}),
    ((0, 0, 0, -1, 0), "32", "64", {2: ("III", "additive", 5, 2)}),
    ((0, 0, 0, 1, 0), "64", "-64", {2: ("II", "additive", 6, 1)}),
    ((0, 0, 0, 0, 1), "36", "-432", {2: ("IV", "additive", 2, 3), 3: ("III", "additive", 2, 2)}),
]


@pytest.mark.parametrize("a, conductor, discriminant, data", WORKED, ids=lambda v: str(v))
def test_worked_examples(a, conductor, discriminant, data):
    cert = certified(a)
    assert cert["claim"]["conductor"] == conductor
    assert cert["claim"]["minimal_discriminant"] == discriminant
    assert {p: local(cert, p) for p in data} == data


def twists(a, d: int) -> tuple:
    """The reduced minimal model of the quadratic twist of a by d (y² = x³ − 27d²c4·x − 54d³c6)."""
    curve = Curve(a)
    twist = Curve((0, 0, 0, -27 * d * d * curve.c4, -54 * d ** 3 * curve.c6))
    return tuple(int(c) for c in twist.minimal_model()[0].a)


ADDITIVE_AT_2 = ("II", "III", "IV", "I0*", "I1*", "I2*", "I3*", "I4*", "IV*", "III*", "II*")
ADDITIVE_AT_3 = ("II", "III", "IV", "I0*", "I1*", "I2*", "IV*", "III*", "II*")


def first_curves_of_each_type(p: int, types) -> dict:
    """{Kodaira symbol: a curve with that additive type at p}, chosen by cypari2's elllocalred among the
    table's curves and their twists by −1, ±2, ±3, ±6 (the types the test must cover are all found)."""
    found = {}
    for _, a in TABLE[::3]:
        for d in (1, -1, 2, -2, 3, -3, 6, -6):
            model = a if d == 1 else twists(a, d)
            symbol = kodaira_text(int(pari.elllocalred(pari.ellinit(list(model)), p)[1]))
            if symbol in types and symbol not in found:
                found[symbol] = model
        if len(found) == len(types):
            break
    return found


@pytest.mark.parametrize("p, types", [(2, ADDITIVE_AT_2), (3, ADDITIVE_AT_3)])
def test_every_additive_type_at_2_and_3(p, types):
    """Wild ramification at 2 and 3: conductor exponents up to 8 at 2 and 5 at 3 (Brumer–Kramer 1977)."""
    found = first_curves_of_each_type(p, types)
    assert sorted(found) == sorted(types)
    exponents = set()
    for symbol, model in found.items():
        cert = certified(model)
        assert local(cert, p)[0] == symbol
        exponents.add(local(cert, p)[2])
    assert max(exponents) <= (8 if p == 2 else 5)


@pytest.mark.parametrize("row", TABLE[5::400], ids=lambda row: str(row[0]))
@pytest.mark.parametrize("change", [(Fraction(1, 6), Fraction(1, 3), Fraction(-1, 2), Fraction(5, 7)),
                                    (Fraction(5), Fraction(7), Fraction(2), Fraction(-3)),
                                    (Fraction(-2, 3), Fraction(0), Fraction(1, 5), Fraction(0))])
def test_non_minimal_and_rational_models(row, change):
    """A table curve (reduced minimal, Cremona's table) moved by a change of variables — to a rational
    model, or to an integral one that is not minimal: the claim is the table curve's, and the evidence
    names the table model."""
    conductor, a = row
    moved = Curve(a).change(change).a
    cert = certified(moved)
    assert cert["claim"]["conductor"] == str(conductor)
    assert cert["evidence"]["minimal_model"]["curve"] == [str(c) for c in a]
    assert cert["claim"] == certified(a)["claim"]


@pytest.mark.parametrize("b6, nested", [(10 ** 30 + 7, False), (5224141144273181513418447124275393811521945597, True)])
def test_primes_above_the_miller_rabin_bound(b6, nested):
    """y² + y = x³ − x + b6 has a discriminant with prime factors above 3.3·10²⁴ (cypari2's factor says so):
    each needs a Pocklington certificate; for the second curve one certificate uses a factor of p − 1
    that needs its own."""
    a = (0, 0, 1, -1, b6)
    cert = certified(a)
    large = {int(p) for p in pari.factor(abs(int(cert["claim"]["minimal_discriminant"])))[0] if p >= MILLER_RABIN_BOUND}
    certified_primes = {int(entry["prime"]) for entry in cert["evidence"]["pocklington"]}
    assert large and large <= certified_primes
    assert (certified_primes - large != set()) == nested
