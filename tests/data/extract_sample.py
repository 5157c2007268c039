"""Extract the fixture ``conductor_100000_499999_sample.txt``: a fixed random sample of 2,000 curves of
conductor 100,000–499,999 from Cremona's elliptic-curve tables, the benchmark of what most of a table
looks like (large conductors, small classes, mostly trivial torsion).

Source: J. E. Cremona's tables as shipped in PARI's curve-data package (Debian package
``pari-elldata``, files ``/usr/share/pari/elldata/ell100.gz`` … ``ell499.gz``). Run by hand when the
fixture must be rebuilt::

    python tests/data/extract_sample.py /usr/share/pari/elldata > tests/data/conductor_100000_499999_sample.txt

The sample is drawn uniformly over the curves (not the classes) by reservoir sampling (Vitter 1985,
Algorithm R) in the table's order with ``random.Random(SEED)``, then printed in the table's order.
Each line is ``conductor class_index a1 a2 a3 a4 a6`` as in ``extract_table.py``; class_index counts
the classes of that conductor in the whole table, so it is comparable across the two fixtures.
"""
import pathlib
import random
import sys

from extract_table import rows

SEED = 14
SIZE = 2000
FILES = range(100, 500)
"""ellK.gz holds the conductors 1000K to 1000K + 999: these are 100,000 to 499,999."""


def sample(folder: pathlib.Path, seed: int = SEED, size: int = SIZE) -> list:
    """``size`` curves (conductor, class_index, coefficients), uniform over the files' curves, in their order."""
    chosen, generator, seen = [], random.Random(seed), 0
    for number in FILES:
        for row in rows(folder, max_conductor=10 ** 9, name=f"ell{number}.gz"):
            if len(chosen) < size:
                chosen.append((seen, row))
            else:
                slot = generator.randrange(seen + 1)
                if slot < size:
                    chosen[slot] = (seen, row)
            seen += 1
    return [row for _, row in sorted(chosen)]


def main() -> None:
    folder = pathlib.Path(sys.argv[1] if len(sys.argv) > 1 else "/usr/share/pari/elldata")
    print(f"# Cremona's elliptic-curve tables, conductor 100000-499999: {SIZE} curves drawn at random (seed {SEED}),")
    print("# from PARI's curve-data package (Debian pari-elldata, ell100.gz ... ell499.gz); extracted by tests/data/extract_sample.py")
    print("# conductor class_index a1 a2 a3 a4 a6")
    for conductor, class_index, coeffs in sample(folder):
        print(conductor, class_index, *coeffs)


if __name__ == "__main__":
    main()
