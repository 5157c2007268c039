"""The verifier is the trusted core: it must stand on the standard library alone."""
import ast
import os
import pathlib
import subprocess
import sys

import pytest

from certify.torsion import certify_torsion
from certify.curves import parse_curve
from certify.certificates import to_json

ROOT = pathlib.Path(__file__).resolve().parent.parent
VERIFIER = ROOT / "certify" / "verifier"


def imported_modules(path: pathlib.Path):
    """Every module name an import statement in the file names (relative imports resolved to certify.verifier)."""
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            yield from (alias.name for alias in node.names)
        elif isinstance(node, ast.ImportFrom):
            yield "certify.verifier" if node.level else node.module


@pytest.mark.parametrize("path", sorted(VERIFIER.rglob("*.py")), ids=lambda p: p.name)
def test_verifier_imports_only_the_standard_library(path):
    """Every import is of the standard library (sys.stdlib_module_names) or of certify.verifier itself."""
    for name in imported_modules(path):
        assert name.startswith("certify.verifier") or name.split(".")[0] in sys.stdlib_module_names, (path, name)


def test_verifier_runs_on_a_bare_interpreter(tmp_path):
    """`python -S -m certify.verifier FILE` from the project folder: no site-packages, nothing installed."""
    certificate = tmp_path / "cert.json"
    certificate.write_text(to_json(certify_torsion(parse_curve("[1,0,1,-19,26]"))))
    environment = {key: value for key, value in os.environ.items() if not key.startswith("PYTHON")}
    run = subprocess.run([sys.executable, "-S", "-m", "certify.verifier", str(certificate)],
                         capture_output=True, text=True, env=environment, cwd=ROOT)
    assert run.returncode == 0, run.stderr
    assert "accepted" in run.stdout
    probe = ("import sys, certify.verifier.cli, certify.verifier.torsion; "
             "print([m for m in sys.modules if m.split('.')[0] not in sys.stdlib_module_names])")
    loaded = subprocess.run([sys.executable, "-S", "-c", probe], capture_output=True, text=True,
                            env=environment, cwd=ROOT).stdout
    assert all(name in ("__main__", "certify") or name.startswith("certify.verifier") for name in eval(loaded)), loaded
