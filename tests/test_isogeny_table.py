"""The conductor < 1000 table (Cremona's tables via tests/data/conductor_lt_1000.txt): each curve's
certified class is the table's class, with cypari2's ellisomat degree matrix."""
from fractions import Fraction

import pytest

from certify.isogeny.certificate import certify_isogeny_class
from certify.verifier import verify
from isogeny_reference import claim_matches_reference, table_classes, table_rows

ROWS = table_rows()
CLASSES = table_classes()


def check_row(row) -> None:
    n, k, a = row
    cert = certify_isogeny_class(tuple(Fraction(c) for c in a))
    verify(cert)
    assert cert["claim"]["curves"][0] == [str(c) for c in a]                      # table models are reduced minimal
    assert {tuple(int(c) for c in m) for m in cert["claim"]["curves"]} == CLASSES[(n, k)]  # Cremona's class
    assert claim_matches_reference(cert)                                          # ellisomat's degrees


@pytest.mark.parametrize("row", ROWS[::10], ids=lambda row: f"{row[0]}-{row[1]}-{row[2]}")
def test_every_tenth_curve_of_the_table(row):
    """512 curves, spread over all conductors < 1000."""
    check_row(row)


@pytest.mark.table
@pytest.mark.parametrize("row", ROWS, ids=lambda row: f"{row[0]}-{row[1]}-{row[2]}")
def test_whole_table(row):
    """All 5,113 curves."""
    check_row(row)
