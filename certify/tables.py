"""``certify table CERT… --format latex|markdown|csv``: accepted certificates as a table for a paper.

One row per curve (its torsion and isogeny-class certificates share the row, matched by the curve's
coefficients as given): the curve as a Weierstrass equation, E(Q)_tors as Z/n1Z × Z/n2Z, the size of
the isogeny class and the sorted degrees of the cyclic isogenies from the curve to its members, and
the digest of each certificate (short in LaTeX and Markdown, full in CSV). Only certificates the
verifier accepts are tabulated. The LaTeX needs the ``amsmath`` and ``amssymb`` packages alone.
"""
from __future__ import annotations

import csv
import io

from certify.verifier.digest import short
from certify.verifier.report import class_facts, equation, group_name

FORMATS = ("latex", "markdown", "csv")
KINDS = {"certify-torsion": "torsion", "certify-isogeny-class": "class"}


def table_rows(certificates) -> list:
    """[{"curve", "torsion", "torsion digest", "class size", "degrees", "class digest"}] from
    (name, certificate, verdict) triples, one row per curve in order of first appearance; absent
    facts are None."""
    rows = {}
    for _, cert, verdict in certificates:
        row = rows.setdefault(tuple(cert["curve"]), {"curve": cert["curve"], "torsion": None, "torsion digest": None,
                                                      "class size": None, "degrees": None, "class digest": None})
        kind = KINDS[cert["format"]]
        row[f"{kind} digest"] = verdict["digest"]
        if kind == "torsion":
            row["torsion"] = [int(n) for n in cert["claim"]["invariants"]]
        else:
            row["class size"], row["degrees"] = class_facts(cert)
    return list(rows.values())


def latex_coefficient(value, monomial: str) -> str:
    """A positive coefficient in LaTeX: 2, \\tfrac{1}{3}."""
    return str(value) if value.denominator == 1 else f"\\tfrac{{{value.numerator}}}{{{value.denominator}}}"


def latex_group(invariants) -> str:
    """\\mathbb{Z}/2\\mathbb{Z} \\times \\mathbb{Z}/4\\mathbb{Z}; 0 for the trivial group."""
    return " \\times ".join(f"\\mathbb{{Z}}/{n}\\mathbb{{Z}}" for n in invariants) or "0"


def _cells(row: dict, group, curve, digest, missing: str) -> list:
    """The five displayed cells of a row, with the format's writers for group, curve and digest."""
    digests = [digest(row[key]) for key in ("torsion digest", "class digest") if row[key]]
    return [curve(row["curve"]),
            missing if row["torsion"] is None else group(row["torsion"]),
            missing if row["class size"] is None else str(row["class size"]),
            missing if row["degrees"] is None else ", ".join(map(str, row["degrees"])),
            ", ".join(digests)]


def latex(rows: list, document: bool) -> str:
    """A tabular (or, with ``document``, a whole article that compiles with pdflatex)."""
    lines = ["% certify table: digests are the first 12 hex digits of each certificate's SHA-256 digest",
             "\\begin{tabular}{lllll}", "\\hline",
             "$E$ & $E(\\mathbb{Q})_{\\mathrm{tors}}$ & class size & degrees & certificate digests \\\\", "\\hline"]
    for row in rows:
        cells = _cells(row, lambda n: f"${latex_group(n)}$", lambda a: f"${equation(a, latex_coefficient)}$",
                       lambda d: f"\\texttt{{{short(d)}}}", "--")
        lines.append(" & ".join(cells) + " \\\\")
    lines += ["\\hline", "\\end{tabular}"]
    if document:
        lines = ["\\documentclass{article}", "\\usepackage{amsmath,amssymb}", "\\begin{document}",
                 *lines, "\\end{document}"]
    return "\n".join(lines) + "\n"


def markdown(rows: list) -> str:
    """A pipe table; equations and digests in code spans so that Markdown leaves them alone."""
    lines = ["| curve | E(Q)_tors | class size | degrees | certificate digests |", "| --- | --- | --- | --- | --- |"]
    for row in rows:
        cells = _cells(row, group_name, lambda a: f"`{equation(a)}`", lambda d: f"`{short(d)}`", "—")
        lines.append("| " + " | ".join(cells) + " |")
    return "\n".join(lines) + "\n"


CSV_COLUMNS = ("curve", "coefficients", "torsion", "torsion_invariants", "class_size", "degrees",
               "torsion_digest", "class_digest")


def comma_separated(rows: list) -> str:
    """CSV with the columns CSV_COLUMNS; lists as '[2,4]', full digests, empty cells for absent facts."""
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow(CSV_COLUMNS)
    for row in rows:
        listed = lambda values: "" if values is None else "[" + ",".join(map(str, values)) + "]"
        writer.writerow([equation(row["curve"]), listed(row["curve"]),
                         "" if row["torsion"] is None else group_name(row["torsion"]), listed(row["torsion"]),
                         "" if row["class size"] is None else row["class size"], listed(row["degrees"]),
                         row["torsion digest"] or "", row["class digest"] or ""])
    return out.getvalue()


def render(certificates, form: str, document: bool = False) -> str:
    """The table of the accepted certificates in the format ``form`` (one of FORMATS)."""
    rows = table_rows(certificates)
    if form == "latex":
        return latex(rows, document)
    return markdown(rows) if form == "markdown" else comma_separated(rows)
