"""Fuzz targets (issue 6, item 5), hypothesis-driven and bounded by example counts: the curve parser on
arbitrary and grammar-shaped text — any text gives five rational coefficients of a non-singular curve or
a CurveInputError, never another exception — and the verifier's loader and ``verify`` on arbitrary bytes:
the loader returns JSON or raises Unreadable, and every parsed value is accepted (confirmed by cypari2)
or rejected with the verifier's own Rejection. Each run prints how many inputs it tried."""
import json
from fractions import Fraction

from hypothesis import strategies as st

from certify.curves import CurveInputError, parse_curve
from certify.verifier import sources
from certify.verifier.curves import discriminant
from soundness_pool import TALLY, any_certificate, assert_sound, ci_and_long, damage_bytes, randoms

CURVE_ALPHABET = "0123456789+-*/^xy=[], .e\t"
curve_pieces = st.sampled_from(["y^2", "x^3", "x*y", "x^2", "y", "x", "*", "+", "-", "=", "[", "]", ",", "/",
                                "^", "1", "0", "-3/16", "7", "9" * 1001, "  ", "**", "x**3", "y**2", "1/0"])
curve_texts = (st.text(max_size=60) | st.text(CURVE_ALPHABET, max_size=60)
               | st.lists(curve_pieces, max_size=14).map("".join)
               | st.lists(st.integers(-10 ** 6, 10 ** 6), max_size=7).map(str))
"""Arbitrary text, text over the equation alphabet, equation-shaped concatenations and coefficient lists."""


@ci_and_long(300, text=curve_texts)
def test_curve_parser_gives_a_curve_or_curve_input_error(text):
    """parse_curve on any text: five Fractions of a non-singular curve (Δ ≠ 0, Silverman III.1), or the
    documented CurveInputError (README, "Curves in"); any other exception is a crash."""
    TALLY["inputs"] += 1
    try:
        a = parse_curve(text)
    except CurveInputError as error:
        assert str(error)
        TALLY["rejected"] += 1
        return
    TALLY["accepted"] += 1
    assert len(a) == 5 and all(isinstance(c, Fraction) for c in a) and discriminant(a) != 0


def load_and_verify(data: bytes) -> None:
    """The loader on bytes: Unreadable, or a JSON value that then meets the soundness rule."""
    try:
        document = sources.parse(data)
    except sources.Unreadable as error:
        TALLY["inputs"] += 1
        TALLY["rejected"] += 1
        assert str(error)
        return
    assert_sound(document)


@ci_and_long(200, data=st.binary(max_size=300))
def test_loader_and_verify_on_arbitrary_bytes(data):
    """Arbitrary bytes through the loader (sources.parse) and verify."""
    load_and_verify(data)


@ci_and_long(150, rnd=randoms)
def test_loader_and_verify_on_damaged_certificates(rnd):
    """The JSON text of a valid certificate with random bit flips, deletions, insertions or a truncation:
    most damage breaks the JSON; the rest must be rejected or, if harmless (a changed space), accepted with
    a claim cypari2 confirms."""
    load_and_verify(damage_bytes(json.dumps(any_certificate(rnd)).encode(), rnd))
