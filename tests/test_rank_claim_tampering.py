"""Claims of genuine rank certificates changed one field at a time, each a false or unproven claim that the
verifier must refuse by its named check (the mutation run of certify/verifier/rank.py found these checks
untested). Ranks of the curves: cypari2 ellrank as reference library; y^2 = x^3 - 1156x is the congruent-number
curve of 34 (rank 2), y^2 = x^3 - 25x that of 5 (rank 1), y^2 + y = x^3 - x that of Cremona's table
(conductor 37, rank 1, no rational point of order 2)."""
import copy
from fractions import Fraction

import pytest

from certify.certificates import certify_checked
from certify.pari import pari
from certify.verifier import verify
from certify.verifier.errors import Rejection

CURVES = {"[0,0,0,-1156,0]": 2, "[0,0,0,-25,0]": 1, "[0,0,1,-1,0]": 1}


@pytest.fixture(scope="module")
def certificates():
    out = {}
    for text, rank in CURVES.items():
        a = tuple(Fraction(int(v)) for v in text.strip("[]").split(","))
        assert int(pari.ellrank(pari.ellinit([int(v) for v in a]))[0]) == rank   # cypari2 as reference
        out[text] = certify_checked("rank", a)
    return out


def rejection(cert) -> Rejection:
    with pytest.raises(Rejection) as caught:
        verify(cert)
    return caught.value


@pytest.mark.parametrize("curve", CURVES)
def test_rank_upper_lowered_is_refused(certificates, curve):
    cert = copy.deepcopy(certificates[curve])
    cert["claim"]["rank_upper"] = str(int(cert["claim"]["rank_upper"]) - 1)
    assert rejection(cert).check == "upper bound"


@pytest.mark.parametrize("curve", CURVES)
def test_rank_upper_dropped_while_witnesses_prove_one_is_refused(certificates, curve):
    cert = copy.deepcopy(certificates[curve])
    cert["claim"]["rank_upper"] = None
    assert rejection(cert).check == "upper bound"


@pytest.mark.parametrize("curve", CURVES)
def test_rank_lower_raised_is_refused(certificates, curve):
    cert = copy.deepcopy(certificates[curve])
    cert["claim"]["rank_lower"] = str(int(cert["claim"]["rank_lower"]) + 1)
    assert rejection(cert).check == "lower bound"


@pytest.mark.parametrize("curve", ["[0,0,0,-1156,0]", "[0,0,0,-25,0]"])
def test_selmer_dimensions_changed_or_dropped_are_refused(certificates, curve):
    for change in ({"phi": "9", "phi_dual": "0"}, None):
        cert = copy.deepcopy(certificates[curve])
        dims = cert["claim"]["selmer_dimensions"]
        cert["claim"]["selmer_dimensions"] = change if change is None else {"phi": dims["phi_dual"], "phi_dual": "9"}
        assert rejection(cert).check == "selmer dimensions"


def test_a_point_listed_twice_is_refused(certificates):
    """rank 2 claimed with a point of the rank-1 curve y^2 = x^3 - 25x and its negative."""
    cert = copy.deepcopy(certificates["[0,0,0,-25,0]"])
    x, y = cert["claim"]["points"][0]
    cert["claim"]["points"].append([x, str(-Fraction(y))])
    cert["claim"]["rank_lower"] = "2"
    assert rejection(cert).check in ("independence", "upper bound")


def test_an_element_of_W_offered_as_an_exclusion_is_refused(certificates):
    """The image of a listed point offered as an excluded coset representative."""
    cert = copy.deepcopy(certificates["[0,0,0,-1156,0]"])
    side = cert["evidence"]["descent"]["phi_dual"]
    x = Fraction(side["points"][-1][0])
    for p in (2, 17):
        while x.numerator % (p * p) == 0:
            x /= p * p
    d = x.numerator if x.denominator == 1 else None
    if d is None or d == 1:
        pytest.skip("the point's image is trivial")
    side["exclusions"].append({"d": str(d), "place": "infinity"})
    assert rejection(cert).check in ("cosets", "exclusion at infinity", "descent element")
