"""Curves in: parsing the CURVE argument, Weierstrass invariants, changes of variables, models.

A curve is given by Weierstrass coefficients a1, a2, a3, a4, a6 in Q,

    E : y² + a1·xy + a3·y = x³ + a2·x² + a4·x + a6,

with Tate's quantities b2, b4, b6, b8, c4, c6, the discriminant Δ and j = c4³/Δ
(Silverman, *The Arithmetic of Elliptic Curves*, III.1). A change of variables [u, r, s, t],
u ≠ 0, means x = u²x' + r, y = u³y' + su²x' + t (Silverman III.1, Table 3.1).
"""
from __future__ import annotations

import functools
import math
import re
import signal
import time
from dataclasses import dataclass
from fractions import Fraction
from functools import cached_property

from certify.verifier.curves import b_invariants, c_invariants, change_model, discriminant

MAX_COEFFICIENT_DIGITS = 1000
"""Largest number of decimal digits accepted in the numerator or denominator of a coefficient."""

MAX_INPUT_LENGTH = 20000
"""Longest CURVE argument accepted, in characters."""


FACTORING_SECONDS = 5
"""Longest time PARI may spend factoring one integer (denominators, gcd(c4, c6)) before certify gives up."""


class CurveInputError(ValueError):
    """The CURVE argument is malformed, singular, not over Q, or over the documented size limits."""


class FactoringTooHard(CurveInputError):
    """An integer the minimal model needs could not be factored within FACTORING_SECONDS."""


Change = tuple  # (u, r, s, t) as Fractions


def _check_size(value: Fraction) -> Fraction:
    """``value`` itself, once its numerator and denominator are known to be within MAX_COEFFICIENT_DIGITS
    (compared as integers: no decimal conversion of a huge number is ever attempted)."""
    if abs(value.numerator) >= _DIGIT_BOUND or value.denominator >= _DIGIT_BOUND:
        raise CurveInputError(TOO_MANY_DIGITS)
    return value


_DIGIT_BOUND = 10 ** MAX_COEFFICIENT_DIGITS
TOO_MANY_DIGITS = f"a coefficient has more than {MAX_COEFFICIENT_DIGITS} digits in its numerator or denominator, the limit"


def _rational(token: str) -> Fraction:
    """Parse one coefficient written as an integer or a fraction p/q, within the size limit."""
    token = token.strip()
    match = re.fullmatch(r"([+-]?)(\d+)(?:/(\d+))?", token)
    if not match:
        raise CurveInputError(f"not a rational number: {token!r}")
    sign, numerator, denominator = match.groups()
    if max(len(numerator), len(denominator or "")) > MAX_COEFFICIENT_DIGITS:
        raise CurveInputError(TOO_MANY_DIGITS)
    if denominator is not None and int(denominator) == 0:
        raise CurveInputError(f"zero denominator in {token!r}")
    value = Fraction(int(numerator), int(denominator or 1))
    return -value if sign == "-" else value


# --- the Weierstrass-equation syntax: polynomials in x and y over Q on each side of '=' ---
Polynomial = dict  # {(i, j): coefficient of x^i y^j}, no zero coefficients

_SPELLINGS = str.maketrans({"\u2212": "-", "\u2013": "-", "\u00b7": "*", "\u22c5": "*", "\u00d7": "*",
                            "X": "x", "Y": "y"})
"""Other ways of writing minus, times and the variables, read as -, * and x, y."""

_SUPERSCRIPTS = str.maketrans("\u2070\u00b9\u00b2\u00b3\u2074\u2075\u2076\u2077\u2078\u2079", "0123456789")
_TOKEN = re.compile(r"\s*(?:(\d+)|([xy])|(\*\*|[-+*/^()=]))")

MAX_EXPONENT = 3
"""Highest power accepted: no monomial of a Weierstrass equation has degree over 3."""


def _tokens(text: str) -> list:
    """[(kind, text)] with kind 'number', 'variable' or the operator itself; superscript digits become ^n."""
    text = re.sub("[\u2070\u00b9\u00b2\u00b3\u2074-\u2079]+", lambda m: "^" + m.group().translate(_SUPERSCRIPTS),
                  text.translate(_SPELLINGS))
    out, position = [], 0
    while position < len(text):
        if text[position:].strip() == "":
            break
        match = _TOKEN.match(text, position)
        if not match:
            raise CurveInputError(f"cannot read the equation near {text[position:].strip()[:40]!r}")
        number, variable, operator = match.groups()
        out.append(("number", number) if number else ("variable", variable) if variable
                   else ("^" if operator == "**" else operator, operator))
        position = match.end()
    return out


def _multiply(f: Polynomial, g: Polynomial) -> Polynomial:
    """The product, refused as soon as a power of x over 3 or of y over 2 appears."""
    product: Polynomial = {}
    for (i, j), c in f.items():
        for (k, l), d in g.items():
            if i + k > 3 or j + l > 2:
                raise CurveInputError(f"x^{i + k}*y^{j + l} does not occur in a Weierstrass equation"
                                      if j + l else f"x^{i + k} does not occur in a Weierstrass equation")
            product[(i + k, j + l)] = _check_size(product.get((i + k, j + l), Fraction(0)) + c * d)
    return {m: c for m, c in product.items() if c}


def _add(f: Polynomial, g: Polynomial, sign: int = 1) -> Polynomial:
    total = dict(f)
    for m, c in g.items():
        total[m] = _check_size(total.get(m, Fraction(0)) + sign * c)
    return {m: c for m, c in total.items() if c}


class _EquationReader:
    """Recursive descent over the tokens of one side of the equation:

        sum     := [+|-] product {(+|-) product}
        product := power {[*|/] power}        (no sign: implicit multiplication, as in 2x, xy, (3/16)y, x(x-1))
        power   := atom [^ n]                  (n ≤ MAX_EXPONENT for x and y)
        atom    := integer | x | y | ( sum )

    Division is by a non-zero constant only; products and quotients go from left to right, so
    3/16y is (3/16)·y, as the coefficient notation of a printed equation means."""

    def __init__(self, tokens: list):
        self.tokens, self.position = tokens, 0

    def peek(self):
        return self.tokens[self.position][0] if self.position < len(self.tokens) else None

    def take(self):
        self.position += 1
        return self.tokens[self.position - 1]

    def rest(self) -> str:
        return " ".join(text for _, text in self.tokens[self.position:])[:40]

    def side(self) -> Polynomial:
        if self.peek() is None:
            raise CurveInputError("empty side in the equation")
        value = self.sum()
        if self.peek() is not None:
            raise CurveInputError(f"cannot read the equation near {self.rest()!r}")
        return value

    def sum(self) -> Polynomial:
        sign = -1 if self.peek() == "-" else 1
        if self.peek() in ("+", "-"):
            self.take()
        total = _add({}, self.product(), sign)
        while self.peek() in ("+", "-"):
            sign = -1 if self.take()[0] == "-" else 1
            total = _add(total, self.product(), sign)
        return total

    def product(self) -> Polynomial:
        value = self.power()
        while self.peek() in ("*", "/", "number", "variable", "("):
            if self.peek() == "number":
                raise CurveInputError(f"missing * or an operator before {self.tokens[self.position][1]!r}")
            operator = self.take()[0] if self.peek() in ("*", "/") else "*"
            factor = self.power()
            if operator == "*":
                value = _multiply(value, factor)
            elif set(factor) - {(0, 0)}:
                raise CurveInputError("division by a polynomial in x or y (only by a number)")
            elif not factor:
                raise CurveInputError("division by zero in the equation")
            else:
                value = _multiply(value, {(0, 0): 1 / factor[(0, 0)]})
        return value

    def power(self) -> Polynomial:
        base = self.atom()
        if self.peek() != "^":
            return base
        self.take()
        if self.peek() != "number":
            raise CurveInputError(f"an exponent must be a whole number, not {self.rest()!r}")
        digits = self.take()[1]
        exponent = int(digits) if len(digits) <= 3 else MAX_EXPONENT + 1
        if exponent > MAX_EXPONENT:
            raise CurveInputError(f"the power {exponent} does not occur in a Weierstrass equation")
        value = {(0, 0): Fraction(1)}
        for _ in range(exponent):
            value = _multiply(value, base)
        return value

    def atom(self) -> Polynomial:
        kind = self.peek()
        if kind is None:
            raise CurveInputError("the equation ends in the middle of a term")
        kind, text = self.take()
        if kind == "number":
            return {(0, 0): _rational(text)} if text.strip("0") else {}
        if kind == "variable":
            return {(1, 0) if text == "x" else (0, 1): Fraction(1)}
        if kind == "(":
            inner = self.sum()
            if self.peek() != ")":
                raise CurveInputError("a '(' is not closed")
            self.take()
            return inner
        raise CurveInputError(f"cannot read the equation near {text + ' ' + self.rest()!r}")


def _from_equation(text: str) -> tuple[Fraction, ...]:
    """Coefficients of an equation y² + a1xy + a3y = x³ + a2x² + a4x + a6 written in any arrangement."""
    if text.count("=") != 1:
        raise CurveInputError("a Weierstrass equation needs exactly one '='")
    left, right = text.split("=")
    terms = _add(_EquationReader(_tokens(left)).side(), _EquationReader(_tokens(right)).side(), -1)
    if terms.get((0, 2)) is None or terms.get((3, 0)) is None or terms[(0, 2)] != -terms[(3, 0)]:
        raise CurveInputError("the equation must have the form y^2 + a1*x*y + a3*y = x^3 + a2*x^2 + a4*x + a6")
    scale = terms.pop((0, 2))
    terms.pop((3, 0))
    allowed = {(1, 1): 0, (0, 1): 2, (2, 0): 1, (1, 0): 3, (0, 0): 4}
    a = [Fraction(0)] * 5
    for monomial, coefficient in terms.items():
        if monomial not in allowed:
            raise CurveInputError(f"the term x^{monomial[0]}*y^{monomial[1]} does not occur in a Weierstrass equation")
        index = allowed[monomial]
        a[index] = _check_size(coefficient / scale if index in (0, 2) else -coefficient / scale)
    return tuple(a)


def _from_list(text: str) -> tuple[Fraction, ...]:
    """Coefficients of [a1,a2,a3,a4,a6] or [A,B] (y² = x³ + Ax + B)."""
    entries = text[1:-1].split(",")
    if len(entries) > 1 and not entries[-1].strip():
        raise CurveInputError(f"a trailing comma after the last coefficient in {text[:60]!r}: remove it")
    if any(not entry.strip() for entry in entries):
        raise CurveInputError(f"an empty coefficient (two commas in a row?) in {text[:60]!r}")
    return curve_from_numbers(entries)


def curve_from_numbers(values) -> tuple[Fraction, ...]:
    """a1..a6 from a list of 5 numbers [a1, a2, a3, a4, a6] or 2 [A, B] (y² = x³ + Ax + B), each an int, a
    Fraction or a string '-3' or '3/16'; floats (inexact) and bools are refused, and so is a singular curve."""
    if not isinstance(values, (list, tuple)):
        raise CurveInputError(f"a curve is CURVE text or a list of 5 or 2 numbers, not a {type(values).__name__}")
    if len(values) not in (2, 5):
        raise CurveInputError(f"expected 5 coefficients [a1,a2,a3,a4,a6] or 2 [A,B], got {len(values)}")
    numbers = []
    for value in values:
        if isinstance(value, str):
            numbers.append(_rational(value))
        elif isinstance(value, (int, Fraction)) and not isinstance(value, bool):
            numbers.append(_check_size(Fraction(value)))
        else:
            raise CurveInputError(f"not a rational number: {value!r} (give an int, a Fraction or a string "
                                  "such as '3/16')")
    return _nonsingular(tuple(numbers) if len(numbers) == 5 else (Fraction(0), Fraction(0), Fraction(0), *numbers))


def _nonsingular(a: tuple) -> tuple:
    """``a`` itself, once its discriminant is known not to be 0."""
    if Curve(a).discriminant == 0:
        raise CurveInputError("the curve is singular (its discriminant is 0)")
    return a


def parse_curve(text: str) -> tuple[Fraction, ...]:
    """Read CURVE: ``[a1,a2,a3,a4,a6]``, ``[A,B]`` (y² = x³ + Ax + B) or a Weierstrass equation, written
    as people type it (``y^2 + xy - (3/16)y = x^3 - (3/16)x^2``, ``y² = x(x-1)(x+1)``, ``Y**2 = X**3 - X/4``).

    Returns the five coefficients a1..a6 as Fractions; raises CurveInputError with a one-line
    reason for anything else, including singular curves.
    """
    if len(text) > MAX_INPUT_LENGTH:
        raise CurveInputError(f"the curve is {len(text)} characters long; the limit is {MAX_INPUT_LENGTH}")
    stripped = text.strip()
    if stripped.startswith("[") and stripped.endswith("]"):
        return _from_list(stripped)
    if "=" not in stripped:
        raise CurveInputError("expected [a1,a2,a3,a4,a6], [A,B] or an equation such as y^2 + xy = x^3 - x^2 + 3")
    return _nonsingular(_from_equation(stripped))


def format_rational(value: Fraction) -> str:
    """The decimal string of a rational: '-3', '5/4'."""
    return str(value.numerator) if value.denominator == 1 else f"{value.numerator}/{value.denominator}"


@dataclass(frozen=True)
class Curve:
    """A Weierstrass model over Q given by its coefficients (a1, a2, a3, a4, a6)."""

    a: tuple

    def __post_init__(self):
        object.__setattr__(self, "a", tuple(c if type(c) is Fraction else Fraction(c) for c in self.a))

    @cached_property
    def b(self) -> tuple:
        """(b2, b4, b6, b8) of Silverman III.1."""
        return tuple(Fraction(v) for v in b_invariants(_plain(self.a)))

    @cached_property
    def c4(self) -> Fraction:
        return Fraction(self._c[0])

    @cached_property
    def c6(self) -> Fraction:
        return Fraction(self._c[1])

    @cached_property
    def _c(self) -> tuple:
        return c_invariants(_plain(self.a))

    @cached_property
    def discriminant(self) -> Fraction:
        return Fraction(discriminant(_plain(self.a)))

    @cached_property
    def j(self) -> Fraction:
        return self.c4 ** 3 / self.discriminant

    def change(self, change: Change) -> "Curve":
        """The model obtained by x = u²x' + r, y = u³y' + su²x' + t (Silverman III.1, Table 3.1)."""
        u, r, s, t = change
        return Curve(change_model(_plain(self.a), (Fraction(u), *_plain((r, s, t)))))

    def integral_model(self) -> tuple["Curve", Change]:
        """An integral model [1/d, 0, 0, 0]: d the least integer making every d^i·a_i integral, or the lcm
        of the denominators itself when it cannot be factored in time (still integral, not least)."""
        return self._integral

    @cached_property
    def _integral(self) -> tuple["Curve", Change]:
        denominators = math.lcm(*(c.denominator for c in self.a))
        if denominators == 1:
            return self, (Fraction(1), Fraction(0), Fraction(0), Fraction(0))
        try:
            d = 1
            for p in _primes_dividing(denominators):
                d *= p ** max(-(-_valuation(c.denominator, p) // i) for i, c in zip((1, 2, 3, 4, 6), self.a))
        except FactoringTooHard:
            d = denominators
        change = (Fraction(1, d), Fraction(0), Fraction(0), Fraction(0))
        return self.change(change), change

    def minimal_model(self) -> tuple["Curve", Change]:
        """The reduced minimal model and the change [u, r, s, t] from this model to it.

        Minimal at p ≥ 5 means not (p⁴ | c4 and p⁶ | c6); at 2 and 3 the scaled invariants must
        keep Δ integral and satisfy Kraus's conditions (Kraus 1989; Cremona, *Algorithms*, §3.2): v3(c6) ≠ 2, and
        c6 ≡ −1 (mod 4) or (16 | c4 and c6 ≡ 0, 8 (mod 32)). The reduced model with a1, a3 ∈ {0, 1},
        a2 ∈ {−1, 0, 1} is then rebuilt from (c4, c6) with b2 ≡ −c6 (mod 12) (Cremona §3.2).
        The torsion and the isogeny-class certificate of one curve share the computation (a cache).
        """
        return _minimal_model(self)

    def _minimal_model(self) -> tuple["Curve", Change]:
        integral, to_integral = self.integral_model()
        c4, c6, discriminant = int(integral.c4), int(integral.c6), int(integral.discriminant)
        u = 1
        # p⁴ | c4 and p⁶ | c6 force p⁴ | gcd(c4, c6): only that (small) number needs factoring.
        for p in _primes_dividing(math.gcd(c4, c6)):
            e = min(_valuation(c4, p) // 4 if c4 else 10 ** 9, _valuation(c6, p) // 6 if c6 else 10 ** 9)
            while e > 0 and not (_valuation(discriminant, p) >= 12 * e
                                 and _kraus_at(p, c4 // p ** (4 * e), c6 // p ** (6 * e))):
                e -= 1
            u *= p ** e
        c4, c6 = c4 // u ** 4, c6 // u ** 6
        b2 = (-c6) % 12
        if b2 > 6:
            b2 -= 12
        b4 = (b2 * b2 - c4) // 24
        b6 = (-b2 ** 3 + 36 * b2 * b4 - c6) // 216
        a1, a3 = b2 % 2, b6 % 2
        minimal = Curve((a1, (b2 - a1) // 4, a3, (b4 - a1 * a3) // 2, (b6 - a3) // 4))
        return minimal, self.change_to(minimal, to_integral[0] * u)

    def change_to(self, other: "Curve", u: Fraction) -> Change:
        """The change [u, r, s, t] taking this model to the isomorphic model ``other``, given u.

        With u fixed, r, s, t are forced by the formulas for a1', a2', a3' (Silverman III.1, Table 3.1)."""
        (a1, a2, a3, _, _), (b1, b2, b3, _, _) = _plain(self.a), _plain(other.a)
        s = Fraction(u * b1 - a1, 2)
        r = (u * u * b2 - a2 + s * a1 + s * s) / 3
        t = (u ** 3 * b3 - a3 - r * a1) / 2
        if self.change((u, r, s, t)) != other:
            raise ArithmeticError("the models are not isomorphic by a change with this u")
        return (u, r, s, t)

    def equation(self) -> str:
        """The model as mathematicians write it: y^2 + xy + y = x^3 - x^2 - 10x - 20."""
        from certify.verifier.report import equation

        return equation(self.a)


_minimal_model = functools.lru_cache(maxsize=256)(Curve._minimal_model)


def _plain(values) -> tuple:
    """The rationals with the integers among them as int, for fast exact arithmetic (the results of
    +, −, × on them are the same numbers)."""
    return tuple(v.numerator if v.denominator == 1 else v for v in values)


def _kraus_at(p: int, c4: int, c6: int) -> bool:
    """Kraus's local condition at p for (c4, c6) to be the invariants of a model integral at p."""
    if p == 3:
        return _valuation(c6, 3) != 2 if c6 else True
    if p == 2:
        return c6 % 4 == 3 or (c4 % 16 == 0 and c6 % 32 in (0, 8))
    return True


def _valuation(n: int, p: int) -> int:
    """The exponent of p in the non-zero integer n."""
    n, v = abs(n), 0
    while n % p == 0:
        n //= p
        v += 1
    return v


def _primes_dividing(n: int, purpose: str = "to find the minimal model") -> list[int]:
    """The prime factors of n, by PARI within FACTORING_SECONDS (the certifier may use generic algebra);
    ``purpose`` ends the message of FactoringTooHard. An alarm already set by the caller (the batch's
    ``--timeout``) is kept: if it rings first it is the caller's AlarmInterrupt, else it is set again
    afterwards for the time it had left."""
    if abs(n) <= 1:
        return []
    from cysignals.alarm import AlarmInterrupt, alarm, cancel_alarm

    from certify.pari import pari

    outer, started = signal.getitimer(signal.ITIMER_REAL)[0], time.monotonic()
    if outer and outer <= FACTORING_SECONDS:
        return [int(p) for p in pari.factor(abs(n))[0]]
    try:
        alarm(FACTORING_SECONDS)
        return [int(p) for p in pari.factor(abs(n))[0]]
    except AlarmInterrupt:
        raise FactoringTooHard(f"cannot factor a {abs(n).bit_length() * 30103 // 100000 + 1}-digit integer within {FACTORING_SECONDS} s "
                               + purpose) from None
    finally:
        cancel_alarm()
        if outer:
            alarm(max(outer - (time.monotonic() - started), 0.001))


def inverse_change(change: Change) -> Change:
    """The inverse of [u, r, s, t]: [1/u, −r/u², −s/u, (rs − t)/u³] (Silverman III.1)."""
    u, r, s, t = change
    return 1 / u, -r / u ** 2, -s / u, (r * s - t) / u ** 3
