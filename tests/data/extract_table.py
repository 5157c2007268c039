"""Extract the fixture ``conductor_lt_1000.txt`` from Cremona's elliptic-curve tables.

Source: J. E. Cremona, *Algorithms for Modular Elliptic Curves*, 2nd ed. (CUP 1997), tables as
shipped in PARI's curve-data package (Debian package ``pari-elldata``, files
``/usr/share/pari/elldata/ell*.gz``). Run by hand when the fixture must be rebuilt::

    python tests/data/extract_table.py /usr/share/pari/elldata > tests/data/conductor_lt_1000.txt

Each output line is ``conductor class_index a1 a2 a3 a4 a6``: the curves of one isogeny class share
``(conductor, class_index)``, where ``class_index`` counts the classes of that conductor from 0 in
the table's order. The table's own labels are deliberately not kept: curves are identified by
their coefficients.
"""
import gzip
import pathlib
import re
import sys

LABEL = re.compile(r"^(\d+)([a-z]+)(\d+)$")


def rows(folder: pathlib.Path, max_conductor: int = 1000, name: str = "ell0.gz"):
    """Yield (conductor, class_index, coefficients) for every curve of the file ``name`` (``ellK.gz``
    holds the conductors 1000K to 1000K + 999) with conductor < max_conductor.

    Each file is a GP vector ``[[N, [label, [a1,...,a6], generators], ...], ...]``; PARI reads it.
    """
    import cypari2

    pari = cypari2.Pari()
    table = pari(gzip.open(folder / name, "rt").read())
    for block in table:
        conductor = int(block[0])
        if conductor >= max_conductor:
            continue
        classes = []
        for entry in list(block)[1:]:
            isogeny_class = LABEL.match(str(entry[0])).group(2)
            if isogeny_class not in classes:
                classes.append(isogeny_class)
            yield conductor, classes.index(isogeny_class), [int(c) for c in entry[1]]


def main() -> None:
    folder = pathlib.Path(sys.argv[1] if len(sys.argv) > 1 else "/usr/share/pari/elldata")
    print("# Cremona, Algorithms for Modular Elliptic Curves (2nd ed.), conductor < 1000,")
    print("# from PARI's curve-data package (Debian pari-elldata, ell0.gz); extracted by tests/data/extract_table.py")
    print("# conductor class_index a1 a2 a3 a4 a6")
    for conductor, class_index, coeffs in rows(folder):
        print(conductor, class_index, *coeffs)


if __name__ == "__main__":
    main()
