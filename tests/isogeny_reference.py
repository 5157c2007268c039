"""Reference values for the isogeny tests: the table fixture (Cremona's tables) and cypari2's
ellisomat (the reference library's uncertified isogeny-class routine)."""
import pathlib
from fractions import Fraction

from certify.pari import pari

TABLE = pathlib.Path(__file__).resolve().parent / "data" / "conductor_lt_1000.txt"


def table_rows() -> list:
    """[(conductor, class_index, (a1, a2, a3, a4, a6))] from the fixture, in the table's order."""
    rows = []
    for line in TABLE.read_text().splitlines():
        if line.startswith("#") or not line.strip():
            continue
        n, k, *a = (int(v) for v in line.split())
        rows.append((n, k, tuple(a)))
    return rows


def table_classes() -> dict:
    """{(conductor, class_index): set of models} — Cremona's class membership."""
    classes = {}
    for n, k, a in table_rows():
        classes.setdefault((n, k), set()).add(a)
    return classes


def reference_class(a) -> tuple:
    """(list of reduced minimal models, degree matrix) of the class of a by cypari2's ellisomat, in its order."""
    curves, matrix = pari.ellisomat(pari.ellinit([int(Fraction(c)) if Fraction(c).denominator == 1 else
                                                  str(Fraction(c)) for c in a]))
    models = [tuple(int(c) for c in pari.ellminimalmodel(pari.ellinit(list(entry[0])))[:5]) for entry in curves]
    return models, [[int(matrix[i][j]) for j in range(len(models))] for i in range(len(models))]


def claim_matches_reference(cert: dict) -> bool:
    """Whether the certificate's claim is the class and degree matrix that ellisomat gives."""
    listed = [tuple(int(c) for c in model) for model in cert["claim"]["curves"]]
    degrees = [[int(d) for d in row] for row in cert["claim"]["degrees"]]
    models, matrix = reference_class(cert["curve"])
    if sorted(listed) != sorted(models) or len(set(listed)) != len(listed):
        return False
    where = [models.index(m) for m in listed]
    return all(degrees[i][j] == matrix[where[i]][where[j]] for i in range(len(listed)) for j in range(len(listed)))
