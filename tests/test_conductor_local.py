"""Conductor certificates against outside sources: the conductor of every curve of Cremona's table
below 1000 (tests/data/conductor_lt_1000.txt, from pari-elldata), and the whole claim — minimal
discriminant, f_p, Kodaira symbol, c_p and the kind of reduction at every bad prime — against
cypari2 (ellglobalred, elllocalred, ellap) on those curves and on 500 random curves of conductor
100,000–499,999 (tests/data/conductor_100000_499999_local.txt, from pari-elldata)."""
from fractions import Fraction

import pytest

from certify.conductor import certify_conductor
from certify.verifier import verify
from conductor_reference import fixture_rows, reference_claim

TABLE = fixture_rows("conductor_lt_1000.txt")
LARGE = fixture_rows("conductor_100000_499999_local.txt")


def check_curve(conductor: int, a) -> None:
    cert = certify_conductor(tuple(Fraction(c) for c in a))
    verify(cert)
    assert cert["claim"]["conductor"] == str(conductor)            # Cremona's table
    assert cert["evidence"]["minimal_model"]["curve"] == [str(c) for c in a]  # table models are reduced minimal
    assert cert["claim"] == reference_claim(a)                     # cypari2 at every bad prime


@pytest.mark.parametrize("row", TABLE[::17], ids=lambda row: f"{row[0]}-{row[1]}")
def test_a_sample_of_the_table(row):
    """301 curves spread over all conductors < 1000."""
    check_curve(*row)


@pytest.mark.parametrize("row", LARGE, ids=lambda row: f"{row[0]}-{row[1]}")
def test_random_curves_of_large_conductor(row):
    """500 curves of conductor 100,000–499,999."""
    check_curve(*row)


@pytest.mark.table
@pytest.mark.parametrize("row", TABLE, ids=lambda row: f"{row[0]}-{row[1]}")
def test_whole_table(row):
    """All 5,113 curves."""
    check_curve(*row)
