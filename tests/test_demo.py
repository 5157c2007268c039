"""certificates-demo/ is what `certify demo --out certificates-demo` writes today, and its claims are true."""
import json
import pathlib

from certify.certificates import certifiers
from certify.demo import appendix_curves, run_demo
from certify.curves import parse_curve
from certify.pari import pari
from certify.verifier.digest import digest

DEMO = pathlib.Path(__file__).resolve().parent.parent / "certificates-demo"
STATIC = ("README.md", "claims-from-another-program.csv")
"""Files of the demo folder written by hand, not by `certify demo`."""


def test_demo_folder_is_current(tmp_path, capsys):
    """Regenerate into a fresh folder: the same files, the same digests (metadata aside), the same tables."""
    assert run_demo(str(tmp_path)) == 0
    made = {path.name for path in tmp_path.iterdir()}
    kept = {path.name for path in DEMO.iterdir() if path.name not in STATIC}
    assert made == kept, "run `certify demo --out certificates-demo` and commit the result"
    for name in sorted(made):
        fresh, committed = (tmp_path / name).read_text(), (DEMO / name).read_text()
        if name.endswith(".json"):
            assert digest(json.loads(fresh)) == digest(json.loads(committed)), name
        else:
            assert fresh == committed, name
    assert "accepted by the verifier" in capsys.readouterr().out


def test_each_curve_has_a_certificate_of_every_kind_and_they_agree_with_cypari2():
    """Every curve of the appendix has a certificate of each kind; the conductors are cypari2's
    (ellglobalred), the rank bounds contain its proven ones (ellrank), and the appendix has curves of rank
    0, 1 and 2 (by ellrank) among them."""
    ranks = set()
    for index, line in enumerate(appendix_curves(), 1):
        curve = pari.ellinit([str(c) for c in parse_curve(line)])
        for kind in certifiers():
            assert (DEMO / f"appendix-curve-{index}.{kind}.json").is_file(), (index, kind)
        conductor = json.loads((DEMO / f"appendix-curve-{index}.conductor.json").read_text())["claim"]
        assert int(conductor["conductor"]) == int(pari.ellglobalred(curve)[0])
        claim = json.loads((DEMO / f"appendix-curve-{index}.rank.json").read_text())["claim"]
        lower, upper = (int(b) for b in pari.ellrank(curve)[:2])
        assert int(claim["rank_lower"]) <= upper and (claim["rank_upper"] is None or lower <= int(claim["rank_upper"]))
        if lower == upper:
            ranks.add(lower)
    assert {0, 1, 2} <= ranks
