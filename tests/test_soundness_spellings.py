"""Soundness, attack class *numbers in other spellings*: every number is a decimal string in canonical
form (README, "The certificate"; ``certify.verifier.arith``: integers without '+', leading zeros or '-0',
rationals 'n/d' in lowest terms with d > 1). A respelled number — "007", "+5", "1e3", "2/4", "-0", " 5",
"5\\n", 5 as a JSON number, 5.0, "0x5", non-ASCII digits, "3/-4" — is a different certificate text for
the same value, so the digest would no longer pin the content: the verifier must reject it, never accept
and never crash. Numbers over MAX_DIGITS digits must be refused by the size check before any arithmetic."""
import pytest
from hypothesis import strategies as st

from certify.verifier.limits import MAX_DIGITS
from soundness_pool import (assert_rejected, ci_and_long, fresh, get_at, number_paths, oversized_number,
                            put_at, randoms, respell_number)

kinds = st.sampled_from(("torsion", "isogeny"))
indices = st.integers(0, 10 ** 6)

STRING_COMPARED = ("generator_orders",)
"""Fields the torsion verifier compares as strings with the invariants instead of parsing them; a
respelling there is refused by that comparison ('generator orders')."""


@ci_and_long(120, kind=kinds, index=indices, rnd=randoms)
def test_non_canonical_spelling_is_rejected(kind, index, rnd):
    """One number the verifier reads, anywhere in curve, claim or evidence, in a non-canonical spelling."""
    mutant, path, spelling = respell_number(fresh(kind, index), rnd)
    rejection = assert_rejected(mutant)
    expected = ("generator orders",) if STRING_COMPARED[0] in path else ("number syntax", "structure")
    assert rejection.check in expected, (path, spelling, str(rejection))


@ci_and_long(40, kind=kinds, index=indices, rnd=randoms)
def test_number_over_the_digit_limit_is_rejected_by_size(kind, index, rnd):
    """One number replaced by one of MAX_DIGITS + 1 digits (numerator or denominator): refused by the
    'number size' check (a fraction in an integer field by the syntax check; for string-compared fields,
    by the comparison), not after arithmetic on it."""
    mutant, path, spelling = oversized_number(fresh(kind, index), rnd, MAX_DIGITS + 1)
    rejection = assert_rejected(mutant)
    expected = ("generator orders",) if STRING_COMPARED[0] in path else (
        ("number size", "number syntax") if "/" in spelling else ("number size",))
    assert rejection.check in expected, (path, str(rejection))


def unit_denominator_paths(cert: dict) -> list:
    """The paths of rational-valued entries (curve coefficients, point coordinates, changes, kernels, roots)."""
    rational = ("curve", "generators", "change", "kernel", "roots", "point", "curves")
    return [p for p in number_paths(cert) if any(key in p for key in rational) and "minimality" not in p
            and "degrees" not in p and not (p[0] == "evidence" and p[1] == "integral_model" and p[2] == "curve")]


def test_denominator_one_is_rejected_in_an_isogeny_certificate():
    """'5/1' for 5 (Fraction('5/1') == 5): the canonical form n/d needs d > 1 (certify.verifier.arith's
    parse_rational docstring), so this spelling must be refused like '2/4'. Minimal input: the first
    curve coefficient of the isogeny certificate of [0,-1,1,-10,-20] written '0/1'. (The torsion side of
    the same bug is tests/test_torsion_hostile.py's test_denominator_one_is_not_a_canonical_spelling.)
    Found by this module and fixed in 77660eb; kept as a regression test."""
    cert = fresh("isogeny", 0)
    path = unit_denominator_paths(cert)[0]
    put_at(cert, path, f"{get_at(cert, path)}/1")
    assert assert_rejected(cert).check == "number syntax"


VERSION_SPELLINGS = ["2", "0", "1.0", "01", "v1", "", " 1", "1 ", "+1", "１", "1\n", "10"]
"""Versions a future or a careless writer might put: other versions and other spellings of "1"."""


@pytest.mark.parametrize("kind", ["torsion", "isogeny"])
@pytest.mark.parametrize("version", VERSION_SPELLINGS)
def test_unknown_format_version_is_rejected_with_the_version_named(kind, version):
    """Issue 6, item 1: a certificate of a known format but an unknown version (evidence is versioned with
    the format, so version-1 checks prove nothing about another version's evidence) is refused by the
    'format' check, which names the version it found."""
    cert = fresh(kind, 0)
    cert["version"] = version
    rejection = assert_rejected(cert)
    assert rejection.check == "format" and rejection.values.get("version") == version
    assert repr(version) in str(rejection)


@pytest.mark.parametrize("version", [1, 1.0, None, ["1"]])
def test_version_that_is_not_a_string_is_rejected(version):
    """A version given as a JSON number, null or a list: refused as a structure error, never compared
    loosely with "1"."""
    cert = fresh("torsion", 0)
    cert["version"] = version
    assert assert_rejected(cert).check == "structure"


@ci_and_long(30, kind=st.sampled_from(("torsion", "isogeny")), version=st.text(max_size=8).filter(lambda v: v != "1"))
def test_random_versions_are_rejected_with_the_version_named(kind, version):
    """Any other version string, named in the rejection (its repr, so control characters stay visible)."""
    cert = fresh(kind, 0)
    cert["version"] = version
    rejection = assert_rejected(cert)
    assert rejection.check == "format" and repr(version)[:150] in str(rejection)


def test_unknown_bundle_version_is_named():
    """A bundle of an unknown version is unreadable as a whole, with its version named (the verifier's
    sources.bundle_members)."""
    from certify.verifier import sources

    bundle = {"format": "certify-bundle", "version": "7", "manifest": {"count": "0", "members": []}, "members": []}
    ((_, verdict, _, _),) = sources.bundle_members("appendix.json", bundle)
    assert isinstance(verdict, sources.Unreadable) and "'7'" in str(verdict)
