"""certify table: LaTeX (compiled when pdflatex is present), Markdown and CSV from accepted certificates;
issue 11, item 1 (tables for a journal): labels and input order, named digest columns, the trivial group
in words, a longtable that breaks across pages inside the text width, with a caption."""
import csv
import io
import json
import random
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from certify import __version__
from certify.certificates import to_json
from certify.curves import Curve, parse_curve
from certify.pari import pari
from certify.isogeny.certificate import certify_isogeny_class
from certify.torsion import certify_torsion
from certify.verifier.digest import digest, short

CURVES = ["y^2 + x*y - 3/16*y = x^3 - 3/16*x^2", "[0,2,0,-15,0]", "[0,1,1,-2,7]", "y^2 - 5*x*y - 18*y = x^3 - 18*x^2"]
TABLE = Path(__file__).resolve().parent / "data" / "conductor_lt_1000.txt"
DEMO_BUNDLE = Path(__file__).resolve().parent.parent / "certificates-demo" / "appendix.json"
PDFLATEX = pytest.mark.skipif(shutil.which("pdflatex") is None,
                              reason="pdflatex is not installed (Debian: texlive-latex-base texlive-latex-recommended)")


def certify(*args):
    return subprocess.run([sys.executable, "-m", "certify", *args], capture_output=True, text=True)


def table(*args):
    return certify("table", *args)


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


def fixture_curves(count: int, start: int = 0) -> list:
    """Coefficient lists of Cremona's table (the fixture: conductor, class index, a1 … a6)."""
    rows = [line.split() for line in TABLE.read_text().splitlines() if not line.startswith("#")]
    return ["[" + ",".join(row[2:7]) + "]" for row in rows[start:start + count]]


@pytest.fixture(scope="module")
def labelled_batch(tmp_path_factory):
    """100 curves of the fixture in a shuffled order, each with an invented label after two spaces,
    certified by certify batch into a directory and bundled: (curve lines, labels, folder, bundle)."""
    folder = tmp_path_factory.mktemp("batch")
    curves = fixture_curves(100, start=300)
    random.Random(11).shuffle(curves)
    labels = [f"T{i} #{100 - i}" for i in range(len(curves))]  # '#' inside a label is part of the label
    (folder / "curves.txt").write_text("".join(f"{c}  {label}\n" for c, label in zip(curves, labels)))
    run = certify("batch", str(folder / "curves.txt"), "-o", str(folder / "out"), "--workers", "2")
    assert run.returncode == 0, run.stderr
    bundle = certify("bundle", str(folder / "out"), "-o", str(folder / "bundle.json"))
    assert bundle.returncode == 0, bundle.stderr
    return curves, labels, folder / "out", folder / "bundle.json"


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


def test_trivial_group_is_written_as_trivial(certificates):
    """[0,1,1,-2,7] has trivial torsion (cypari2's elltors): the tables say 'trivial', not '0'."""
    (cert,) = [c for c in torsion_certificates(certificates) if c["curve"] == ["0", "1", "1", "-2", "7"]]
    assert reference_invariants(cert) == []
    paths = [path for path, c in certificates if c["curve"] == cert["curve"]]
    markdown = table(*paths, "--format", "markdown").stdout.splitlines()[2]
    latex = table(*paths, "--format", "latex").stdout
    rows = list(csv.DictReader(io.StringIO(table(*paths, "--format", "csv").stdout)))
    assert "| trivial |" in markdown and "& trivial &" in latex and rows[0]["torsion"] == "trivial"


def test_markdown_has_one_row_per_curve_with_short_digests_in_named_columns(certificates):
    lines = table(*(path for path, _ in certificates), "--format", "markdown").stdout.splitlines()
    assert len(lines) == 2 + len(CURVES)
    headings = [cell.strip() for cell in lines[0].strip("|").split("|")]
    assert headings == ["curve", "E(Q)_tors", "torsion certificate", "class size", "isogeny degrees from E",
                        "class certificate"]
    by_curve = {tuple(cert["curve"]): cert for _, cert in certificates if cert["format"] != "certify-torsion"}
    for line, cert in zip(lines[2:], torsion_certificates(certificates)):
        cells = [cell.strip() for cell in line.strip("|").split("|")]
        assert cells[2] == f"`{short(digest(cert))}`"
        assert cells[5] == f"`{short(digest(by_curve[tuple(cert['curve'])]))}`"
        assert cells[1] == (" × ".join(f"Z/{n}Z" for n in reference_invariants(cert)) or "trivial")


def test_latex_digest_columns_are_named_for_their_kind(certificates):
    """Under the heading "certificate digests", a column per kind named for it, each digest in its own."""
    text = table(*(path for path, _ in certificates), "--format", "latex").stdout
    lines = text.splitlines()
    head = next(line for line in lines if line.startswith("curve $E$"))
    assert head.endswith("& torsion & class \\\\") and "certificate\\\\digests" in text
    for cert in torsion_certificates(certificates):
        row = next(line for line in lines if f"\\texttt{{{short(digest(cert))}}}" in line)
        assert row.split(" & ")[-2] == f"\\texttt{{{short(digest(cert))}}}"


def test_labels_and_the_batch_files_order_are_kept(labelled_batch):
    """Rows in the order of curves.txt (not file-name order) with each label whole, from the directory of
    the batch and from its bundle alike, in all three formats."""
    curves, labels, out, bundle = labelled_batch
    expected = [(label, Curve(parse_curve(c)).equation()) for c, label in zip(curves, labels)]
    for source in (str(out), str(bundle)):
        rows = list(csv.DictReader(io.StringIO(table(source, "--format", "csv").stdout)))
        assert [(row["label"], row["curve"]) for row in rows] == expected
        markdown = table(source, "--format", "markdown").stdout.splitlines()[2:]
        assert [line.split(" | ")[0].lstrip("| ") for line in markdown] == labels
        latex_rows = [line for line in table(source, "--format", "latex").stdout.splitlines() if line.startswith("T")]
        assert [line.split(" & ")[0] for line in latex_rows] == [label.replace("#", "\\#") for label in labels]


def test_latex_caption_names_the_bundle_digest_and_the_version(labelled_batch):
    _, _, _, bundle = labelled_batch
    text = table(str(bundle), "--format", "latex").stdout
    caption = next(line for line in text.splitlines() if line.startswith("\\caption{"))
    assert f"certify {__version__}" in caption
    assert caption.replace("\\allowbreak ", "").count(digest(json.loads(bundle.read_text()))) == 1


def compile_latex(tmp_path, text: str) -> tuple:
    """pdflatex on the document; (its log, number of pages)."""
    (tmp_path / "table.tex").write_text(text)
    run = subprocess.run(["pdflatex", "-interaction=nonstopmode", "-halt-on-error", "table.tex"],
                         cwd=tmp_path, capture_output=True, text=True, timeout=180)
    log = (tmp_path / "table.log").read_text(errors="replace")
    assert run.returncode == 0, log[-3000:]
    return log, int(re.search(r"Output written on table\.pdf \((\d+) pages?", log).group(1))


@PDFLATEX
def test_latex_of_the_demo_compiles_without_overfull_boxes(tmp_path):
    log, pages = compile_latex(tmp_path, table(str(DEMO_BUNDLE), "--format", "latex", "--document").stdout)
    assert "Overfull" not in log and pages == 1


@PDFLATEX
def test_latex_of_100_curves_breaks_across_pages_without_overfull_boxes(labelled_batch, tmp_path):
    _, _, _, bundle = labelled_batch
    log, pages = compile_latex(tmp_path, table(str(bundle), "--format", "latex", "--document").stdout)
    assert "Overfull" not in log and pages >= 3


@PDFLATEX
def test_latex_of_a_curve_with_60_digit_coefficients_stays_inside_the_text_width(tmp_path):
    """Random 60-digit a4 and a6/7 (invented data): the equation wraps inside its cell, no overfull box."""
    rnd = random.Random(60)
    a4, a6 = (rnd.randrange(10 ** 59, 10 ** 60) for _ in range(2))
    paths = []
    for kind in ("torsion", "isogeny-class"):
        paths.append(str(tmp_path / f"{kind}.json"))
        assert certify(kind, f"[1,-1,1,-{a4},{a6}/7]", "-o", paths[-1]).returncode == 0
    log, _ = compile_latex(tmp_path, table(*paths, "--format", "latex", "--document").stdout)
    assert "Overfull" not in log


@pytest.fixture(scope="module")
def three_kinds(certificates, tmp_path_factory):
    """The module's certificates and a conductor certificate of each curve (certify conductor)."""
    folder = tmp_path_factory.mktemp("conductor")
    paths = [path for path, _ in certificates]
    for i, curve in enumerate(CURVES):
        paths.append(str(folder / f"c{i}.conductor.json"))
        assert certify("conductor", curve, "-o", paths[-1]).returncode == 0
    return paths


def test_a_later_kind_adds_its_columns_the_same_way(three_kinds):
    """The conductor certificate brings its column and its digest column; each conductor is cypari2's
    (ellglobalred) for the curve."""
    rows = list(csv.DictReader(io.StringIO(table(*three_kinds, "--format", "csv").stdout)))
    assert len(rows) == len(CURVES)
    for row in rows:
        assert int(row["conductor"]) == int(pari.ellglobalred(pari.ellinit([str(c) for c in parse_curve(row["coefficients"])]))[0])
        assert row["conductor_digest"].startswith("sha256:") and row["torsion_digest"] and row["class_digest"]
    head = table(*three_kinds, "--format", "markdown").stdout.splitlines()[0]
    assert head.endswith("| conductor N | conductor certificate |")


@PDFLATEX
def test_latex_with_three_kinds_of_certificate_stays_inside_the_text_width(three_kinds, tmp_path):
    log, _ = compile_latex(tmp_path, table(*three_kinds, "--format", "latex", "--document").stdout)
    assert "Overfull" not in log


RANK_CURVES = ["[0,0,0,-25,0]", "[0,0,0,-1156,0]", "[0,0,1,-1,0]"]
"""y² = x³ − n²x for n = 5 and 34 (congruent-number curves of rank 1 and 2), and y² + y = x³ − x (rank 1,
no rational point of order 2); ranks by cypari2's ellrank."""


@pytest.fixture(scope="module")
def rank_certificates(tmp_path_factory):
    """A conductor and a rank certificate of each curve of CURVES and RANK_CURVES, each checked by the
    verifier as certify writes it (certify_checked)."""
    from certify.certificates import certify_checked

    folder = tmp_path_factory.mktemp("rank")
    paths = []
    for i, curve in enumerate(CURVES + RANK_CURVES):
        for kind in ("conductor", "rank"):
            paths.append(str(folder / f"c{i}.{kind}.json"))
            Path(paths[-1]).write_text(to_json(certify_checked(kind, parse_curve(curve))))
    return paths


@pytest.mark.parametrize("bounds, text, latex", [((2, 2), "2", "2"), ((1, None), "≥ 1", "$\\geq 1$"),
                                                 ((1, 3), "1–3", "1--3"), ((0, 0), "0", "0")])
def test_rank_cells_are_the_number_or_the_bounds(bounds, text, latex):
    """The three forms of a rank cell: proven, bounded above and below, bounded below only."""
    from certify.tables import latex_rank, rank_text

    assert (rank_text(bounds), latex_rank(bounds)) == (text, latex)


def test_the_rank_column_holds_the_certified_bounds(rank_certificates):
    """One row per curve with its rank cell and digest column; the bounds contain cypari2's proven rank
    (ellrank), the CSV's rank_lower and rank_upper are the claim's, and a curve without a descent reads
    '≥ n'."""
    rows = list(csv.DictReader(io.StringIO(table(*rank_certificates, "--format", "csv").stdout)))
    assert len(rows) == len(CURVES + RANK_CURVES)
    for row in rows:
        lower, upper = (int(b) for b in pari.ellrank(pari.ellinit([str(c) for c in parse_curve(row["coefficients"])]))[:2])
        claimed_lower = int(row["rank_lower"])
        claimed_upper = int(row["rank_upper"]) if row["rank_upper"] else None
        assert claimed_lower <= upper and (claimed_upper is None or lower <= claimed_upper), row
        expected = (str(claimed_lower) if claimed_lower == claimed_upper else f"≥ {claimed_lower}"
                    if claimed_upper is None else f"{claimed_lower}–{claimed_upper}")
        assert row["rank"] == expected and row["rank_digest"].startswith("sha256:") and row["conductor_digest"]
        assert row["torsion_digest"] == ""
    markdown = table(*rank_certificates, "--format", "markdown").stdout.splitlines()
    assert markdown[0].endswith("| conductor N | conductor certificate | rank | rank certificate |")
    assert [line.split(" | ")[-2] for line in markdown[2:]] == [row["rank"] for row in rows]


@PDFLATEX
def test_latex_with_four_kinds_of_certificate_stays_inside_the_text_width(three_kinds, rank_certificates, tmp_path):
    log, _ = compile_latex(tmp_path, table(*three_kinds, *rank_certificates[1::2], "--format", "latex",
                                           "--document").stdout)
    assert "Overfull" not in log


def test_a_rejected_certificate_is_not_tabulated(certificates, tmp_path):
    first = certificates[0][1]
    bad = dict(first, claim={"invariants": ["8"], "generators": [first["claim"]["generators"][1]]})
    (tmp_path / "bad.json").write_text(to_json(bad))
    run = table(certificates[1][0], str(tmp_path / "bad.json"))
    assert run.returncode == 2 and run.stdout == ""
    assert len(run.stderr.strip().splitlines()) == 1 and "bad.json: rejected" in run.stderr
