"""certificates-demo/ is what `certify demo --out certificates-demo` writes today."""
import json
import pathlib

from certify.demo import run_demo
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
