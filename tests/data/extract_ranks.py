"""Extract the rank fixtures ``rank_lt_1000.txt`` and ``rank_100000_499999.txt`` from Cremona's
elliptic-curve tables.

Source: J. E. Cremona, *Algorithms for Modular Elliptic Curves*, 2nd ed. (CUP 1997), tables as
shipped in PARI's curve-data package (Debian package ``pari-elldata``, files
``/usr/share/pari/elldata/ell*.gz``). Every entry of those tables lists generators of
E(Q)/E(Q)_tors; the rank is their number. Run by hand when the fixtures must be rebuilt::

    python tests/data/extract_ranks.py /usr/share/pari/elldata

which writes both files next to this script:

- ``rank_lt_1000.txt``: every curve of conductor < 1000, in the order of ``conductor_lt_1000.txt``;
- ``rank_100000_499999.txt``: 500 curves of conductor 100,000–499,999 drawn at random (seed 2014)
  by the reservoir sampling of ``extract_sample.py``, in the table's order.

Each line is ``conductor class_index rank a1 a2 a3 a4 a6`` (class_index as in ``extract_table.py``).
The table's own labels are not kept: curves are identified by their coefficients.
"""
import gzip
import pathlib
import sys

from extract_sample import sample
from extract_table import rows

SEED = 2014
SIZE = 500
HERE = pathlib.Path(__file__).resolve().parent


def generator_counts(folder: pathlib.Path, name: str) -> dict:
    """{(a1, ..., a6): number of generators listed} for every curve of the table file ``name``.

    Entries are ``[label, [a1, ..., a6], generators]`` (the layout ``extract_table.rows`` reads); a
    curve's coefficients are its reduced minimal model, which identifies it.
    """
    import cypari2

    table = cypari2.Pari()(gzip.open(folder / name, "rt").read())
    return {tuple(int(c) for c in entry[1]): len(entry[2]) for block in table for entry in list(block)[1:]}


def with_ranks(folder: pathlib.Path, curves: list) -> list:
    """(conductor, class_index, rank, coefficients) for curves (conductor, class_index, coefficients)."""
    counts = {}
    result = []
    for conductor, class_index, coefficients in curves:
        name = f"ell{conductor // 1000}.gz"
        if name not in counts:
            counts[name] = generator_counts(folder, name)
        result.append((conductor, class_index, counts[name][tuple(coefficients)], coefficients))
    return result


def write(path: pathlib.Path, header: list, lines: list) -> None:
    text = [f"# {line}" for line in header] + ["# conductor class_index rank a1 a2 a3 a4 a6"]
    text += [" ".join(str(v) for v in (n, k, r, *a)) for n, k, r, a in lines]
    path.write_text("\n".join(text) + "\n")


def main() -> None:
    folder = pathlib.Path(sys.argv[1] if len(sys.argv) > 1 else "/usr/share/pari/elldata")
    write(HERE / "rank_lt_1000.txt",
          ["Cremona, Algorithms for Modular Elliptic Curves (2nd ed.), conductor < 1000, rank = number of generators,",
           "from PARI's curve-data package (Debian pari-elldata, ell0.gz); extracted by tests/data/extract_ranks.py"],
          with_ranks(folder, list(rows(folder))))
    write(HERE / "rank_100000_499999.txt",
          [f"Cremona's elliptic-curve tables, conductor 100000-499999: {SIZE} curves drawn at random (seed {SEED}),",
           "from PARI's curve data (Debian pari-elldata, ell100.gz ... ell499.gz), rank = number of generators;",
           "extracted by tests/data/extract_ranks.py"],
          with_ranks(folder, sample(folder, SEED, SIZE)))


if __name__ == "__main__":
    main()
