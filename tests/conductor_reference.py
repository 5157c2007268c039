"""Reference values for the conductor tests: cypari2 as reference library — ``ellglobalred`` (the
conductor), ``ellminimalmodel`` (the minimal discriminant), ``elllocalred`` (f_p, Kodaira symbol, c_p)
and ``ellap`` at a bad prime (+1 split multiplicative, −1 non-split, 0 additive) — and the fixtures
from Cremona's tables (Debian pari-elldata)."""
import functools
import pathlib
from fractions import Fraction

from certify.pari import pari

DATA = pathlib.Path(__file__).resolve().parent / "data"
REDUCTION_BY_TRACE = {1: "split multiplicative", -1: "non-split multiplicative", 0: "additive"}


def fixture_rows(name: str) -> list:
    """[(conductor, (a1, a2, a3, a4, a6))] from a fixture of lines 'conductor class_index a1 … a6'."""
    rows = []
    for line in (DATA / name).read_text().splitlines():
        if line.startswith("#") or not line.strip():
            continue
        n, _, *a = (int(v) for v in line.split())
        rows.append((n, tuple(a)))
    return rows


def kodaira_text(code: int) -> str:
    """PARI's Kodaira code (elllocalred) as plain text: 1 → I0, m + 4 → Im, 2, 3, 4 → II, III, IV,
    −1 → I0*, −m − 4 → Im*, −2, −3, −4 → II*, III*, IV* (PARI's documentation of elllocalred)."""
    if code == 1:
        return "I0"
    if code > 4:
        return f"I{code - 4}"
    if code < -4:
        return f"I{-code - 4}*"
    return {2: "II", 3: "III", 4: "IV", -1: "I0*", -2: "II*", -3: "III*", -4: "IV*"}[code]


def pari_curve(a):
    return pari.ellinit([str(Fraction(c)) for c in a])


def reference_claim(a) -> dict:
    """The claim a correct conductor certificate for the curve a makes, by cypari2."""
    E = pari.ellminimalmodel(pari_curve(a))
    conductor, _, _, factorisation, local = pari.ellglobalred(E)
    bad = []
    for p in (int(q) for q in factorisation[0]):
        f, code, _, c = pari.elllocalred(E, p)
        bad.append({"prime": str(p), "conductor_exponent": str(int(f)), "kodaira_symbol": kodaira_text(int(code)),
                    "tamagawa_number": str(int(c)), "reduction": REDUCTION_BY_TRACE[int(pari.ellap(E, p))]})
    return {"conductor": str(int(conductor)), "minimal_discriminant": str(int(E.disc())), "bad_primes": bad}


def claim_is_true(cert: dict) -> bool:
    """Whether the certificate's claim is, field for field, cypari2's for its curve."""
    try:
        a = [Fraction(c) for c in cert["curve"]]
        if pari_curve(a).disc() == 0:
            return False
    except (ValueError, ZeroDivisionError, TypeError, KeyError):
        return False
    return cert.get("claim") == cached_reference_claim(tuple(a))


@functools.lru_cache(maxsize=None)
def cached_reference_claim(a: tuple) -> dict:
    """reference_claim, once per curve (the hostile tests ask again and again about the same few)."""
    return reference_claim(a)
