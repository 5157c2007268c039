"""Issue 11, item 2 (input as people type it): the CURVE syntax against sympy's own parser as the
reference, the round trip of every equation certify prints over the whole fixture of Cremona's table,
and clear messages for what cannot be read."""
import random
import re
from fractions import Fraction
from pathlib import Path

import pytest
import sympy
from sympy.parsing.sympy_parser import (convert_xor, implicit_multiplication_application, parse_expr,
                                        standard_transformations)

from certify.curves import Curve, CurveInputError, parse_curve

TABLE = Path(__file__).resolve().parent / "data" / "conductor_lt_1000.txt"
X, Y = sympy.symbols("x y")


def sympy_coefficients(equation: str) -> tuple:
    """a1..a6 read by sympy (parse_expr with implicit multiplication and ^ as power) from an ASCII equation:
    the coefficients of left − right = y² + a1xy + a3y − x³ − a2x² − a4x − a6."""
    left, right = equation.split("=")
    transformations = standard_transformations + (implicit_multiplication_application, convert_xor)
    difference = sympy.Poly(sympy.expand(parse_expr(left, transformations=transformations, local_dict={"x": X, "y": Y})
                                         - parse_expr(right, transformations=transformations,
                                                      local_dict={"x": X, "y": Y})), X, Y)
    scale = difference.coeff_monomial(Y ** 2)
    coefficient = lambda monomial, sign: Fraction(str(sign * difference.coeff_monomial(monomial) / scale))
    return (coefficient(X * Y, 1), coefficient(X ** 2, -1), coefficient(Y, 1), coefficient(X, -1), coefficient(1, -1))


@pytest.mark.parametrize("typed, ascii_spelling", [
    ("y^2 + xy - (3/16)y = x^3 - (3/16)x^2", None),   # exactly how certify prints the curve
    ("y^2 + 2xy = x^3 - x + 1", None),                 # 2x
    ("y^2 + x y + y = x^3 - x^2", None),               # x y
    ("y^2 + (1/4)x y = x^3 + (1/4)x + 1", None),       # (1/4)x
    ("y^2 = x(x-1)(x+1) + 1", None),                   # x(x-1)(x+1)
    ("y^2 = x^3 + x^2/3 - x/4 + 2", None),             # x^2/3, x/4
    ("y^2 = x^3 + (-5/2)x + (7/3)", None),             # parenthesised rationals
    ("y**2 + x*y = x**3 - x**2 + 3", None),            # **
    ("y² + xy = x³ − x² + 3", "y^2 + xy = x^3 - x^2 + 3"),   # superscript digits, the minus sign
    ("Y^2 + XY = X^3 - X^2 + 3", "y^2 + xy = x^3 - x^2 + 3"),  # upper-case variables
    ("2y^2 + 2y = 2x^3 + 4x", None),                   # a common factor on both sides
    ("y^2 - x^3 = -y + 7x - 1", None),                 # terms on either side
])
def test_equations_as_people_type_them(typed, ascii_spelling):
    assert parse_curve(typed) == sympy_coefficients(ascii_spelling or typed)


def test_a_trailing_comma_has_a_message_of_its_own():
    with pytest.raises(CurveInputError, match="trailing comma"):
        parse_curve("[0,0,0,-1,0,]")


@pytest.mark.parametrize("text, reason", [
    ("y^2 = x^3 + 1/x", "division by a polynomial"),
    ("y^2 = x^3 + x/0 + 1", "division by zero"),
    ("y^2 = (x + 1", "not closed"),
    ("y^2 = x^3 + 2 3", "missing * or an operator"),
    ("y^2 = x^2 x^2", "x^4 does not occur"),
    ("y^2 = x^3 + x^", "exponent"),
    ("y^2 = x^3 + " + "*".join(["10" * 300] * 4), "digits"),
])
def test_unreadable_equations_say_why(text, reason):
    with pytest.raises(CurveInputError, match=re.escape(reason)):
        parse_curve(text)


def fixture_models() -> list:
    """a1..a6 of every curve of Cremona's table (the fixture)."""
    rows = [line.split() for line in TABLE.read_text().splitlines() if not line.startswith("#")]
    return [tuple(Fraction(int(c)) for c in row[2:7]) for row in rows]


def test_every_equation_certify_prints_parses_back_over_the_whole_fixture():
    """All 5,113 curves of Cremona's table as given, and each in a rational model by a random change of
    variables [u, r, s, t] (fractional coefficients, brackets, signs): printed, then read back."""
    rnd = random.Random(2)
    models = fixture_models()
    assert len(models) == 5113
    for a in models:
        assert parse_curve(Curve(a).equation()) == a
        change = tuple(Fraction(rnd.randint(-9, 9) or 1, rnd.randint(1, 9)) for _ in range(4))
        b = Curve(a).change(change).a
        assert parse_curve(Curve(b).equation()) == b
