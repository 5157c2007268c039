"""Extract the fixture ``conductor_100000_499999_local.txt``: 500 curves of conductor 100,000–499,999
drawn at random (seed 1975) from Cremona's elliptic-curve tables, on which the conductor certificates'
local data are compared with cypari2's ``elllocalred`` at every bad prime.

Source: J. E. Cremona's tables as shipped in PARI's curve-data package (Debian package
``pari-elldata``, ``/usr/share/pari/elldata/ell100.gz`` … ``ell499.gz``), drawn by the reservoir
sampling of ``extract_sample.py`` with a seed and size of its own. Run by hand to rebuild it::

    python tests/data/extract_conductor_sample.py /usr/share/pari/elldata > tests/data/conductor_100000_499999_local.txt
"""
import pathlib
import sys

from extract_sample import sample

SEED = 1975
SIZE = 500


def main() -> None:
    folder = pathlib.Path(sys.argv[1] if len(sys.argv) > 1 else "/usr/share/pari/elldata")
    print(f"# Cremona's elliptic-curve tables, conductor 100000-499999: {SIZE} curves drawn at random (seed {SEED}),")
    print("# from PARI's curve-data package (Debian pari-elldata, ell100.gz ... ell499.gz); "
          "extracted by tests/data/extract_conductor_sample.py")
    print("# conductor class_index a1 a2 a3 a4 a6")
    for conductor, class_index, coeffs in sample(folder, SEED, SIZE):
        print(conductor, class_index, *coeffs)


if __name__ == "__main__":
    main()
