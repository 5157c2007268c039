"""certify table: LaTeX (compiled when pdflatex is present), Markdown and CSV from accepted certificates."""
import csv
import io
import shutil
import subprocess
import sys

import pytest

from certify.certificates import to_json
from certify.curves import Curve, parse_curve
from certify.pari import pari
from certify.isogeny.certificate import certify_isogeny_class
from certify.torsion import certify_torsion
from certify.verifier.digest import digest, short

CURVES = ["y^2 + x*y - 3/16*y = x^3 - 3/16*x^2", "[0,2,0,-15,0]", "[0,1,1,-2,7]", "y^2 - 5*x*y - 18*y = x^3 - 18*x^2"]


def table(*args):
    return subprocess.run([sys.executable, "-m", "certify", "table", *args], capture_output=True, text=True)


@pytest.fixture(scope="module")
def certificates(tmp_path_factory):
    folder = tmp_path_factory.mktemp("certs")
    out = []
    for i, curve in enumerate(CURVES):
        for kind, build in (("torsion", certify_torsion), ("class", certify_isogeny_class)):
            cert = build(parse_curve(curve))
            (folder / f"c{i}.{kind}.json").write_text(to_json(cert))
            out.append((str(folder / f"c{i}.{kind}.json"), cert))
    return out


def torsion_certificates(certificates):
    return [cert for _, cert in certificates if cert["format"] == "certify-torsion"]


def reference_invariants(cert) -> list:
    """cypari2's elltors group structure (sorted, n1 | n2) on the certificate's curve."""
    return sorted(int(n) for n in pari.elltors(pari.ellinit(cert["curve"]))[1])


def reference_class(cert) -> tuple:
    """cypari2's ellisomat: the class size and the sorted degrees in the row of the curve itself."""
    curves, matrix = pari.ellisomat(pari.ellinit(cert["curve"]))
    return str(len(curves)), "[" + ",".join(map(str, sorted(int(d) for d in matrix[0]))) + "]"


def test_csv_rows_match_the_certificates_and_the_reference_library(certificates):
    run = table(*(path for path, _ in certificates), "--format", "csv")
    assert run.returncode == 0, run.stderr
    rows = list(csv.DictReader(io.StringIO(run.stdout)))
    assert len(rows) == len(CURVES)
    by_curve = {tuple(cert["curve"]): cert for _, cert in certificates if cert["format"] != "certify-torsion"}
    for row, cert in zip(rows, torsion_certificates(certificates)):
        assert row["curve"] == Curve(parse_curve("[" + ",".join(cert["curve"]) + "]")).equation()
        assert row["torsion_invariants"] == "[" + ",".join(map(str, reference_invariants(cert))) + "]"
        assert (row["class_size"], row["degrees"]) == reference_class(cert)
        assert row["torsion_digest"] == digest(cert)
        assert row["class_digest"] == digest(by_curve[tuple(cert["curve"])])


def test_markdown_has_one_row_per_curve_with_short_digests(certificates):
    lines = table(*(path for path, _ in certificates), "--format", "markdown").stdout.splitlines()
    assert len(lines) == 2 + len(CURVES)
    for line, cert in zip(lines[2:], torsion_certificates(certificates)):
        assert f"`{short(digest(cert))}`" in line
        assert (" × ".join(f"Z/{n}Z" for n in reference_invariants(cert)) or "0") in line


def test_latex_uses_only_amsmath_and_amssymb(certificates):
    text = table(*(path for path, _ in certificates), "--format", "latex", "--document").stdout
    assert [line for line in text.splitlines() if "\\usepackage" in line] == ["\\usepackage{amsmath,amssymb}"]
    assert text.count("\\texttt{") == len(certificates)


@pytest.mark.skipif(shutil.which("pdflatex") is None, reason="pdflatex is not installed (Debian: texlive-latex-base)")
def test_latex_document_compiles(certificates, tmp_path):
    (tmp_path / "table.tex").write_text(table(*(path for path, _ in certificates), "--format", "latex", "--document").stdout)
    run = subprocess.run(["pdflatex", "-interaction=nonstopmode", "-halt-on-error", "table.tex"],
                         cwd=tmp_path, capture_output=True, text=True, timeout=120)
    assert run.returncode == 0, run.stdout[-2000:]
    assert (tmp_path / "table.pdf").stat().st_size > 0


def test_a_rejected_certificate_is_not_tabulated(certificates, tmp_path):
    first = certificates[0][1]
    bad = dict(first, claim={"invariants": ["8"], "generators": [first["claim"]["generators"][1]]})
    (tmp_path / "bad.json").write_text(to_json(bad))
    run = table(certificates[1][0], str(tmp_path / "bad.json"))
    assert run.returncode == 2 and run.stdout == ""
    assert len(run.stderr.strip().splitlines()) == 1 and "bad.json: rejected" in run.stderr
