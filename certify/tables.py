"""``certify table CERT… --format latex|markdown|csv``: accepted certificates as a table for a paper.

One row per curve (its certificates share the row, matched by the curve's coefficients as given),
in the order of the sources — or, when every certificate comes from ``certify batch``, in the order
of the lines of the batch file (the ``input_line`` of its metadata) — with the batch label when there
is one, the curve as a Weierstrass equation, then for each kind of certificate its facts and a column
with its digest (short in LaTeX and Markdown, full in CSV): E(Q)_tors as Z/n1Z × Z/n2Z ("trivial"
for the trivial group), the size of the isogeny class and the sorted degrees of the cyclic isogenies
from the curve to its members, the conductor N, the rank of E(Q) ("2" when proven, "1–3" for proven
bounds, "≥ 1" without an upper bound). A later kind of certificate adds its facts and its
digest column by one entry in KINDS, as the conductor did. Only certificates the verifier accepts are
tabulated.

The LaTeX is a ``longtable`` with ``booktabs`` rules that breaks across pages, repeats its head on
each page, wraps long equations (between terms, and inside numbers of many digits) within the text
width, and carries a caption naming the certify version and the digest of each bundle tabulated; it
needs the packages amsmath, amssymb, array, booktabs and longtable.
"""
from __future__ import annotations

import csv
import io
import re
from dataclasses import dataclass
from typing import Callable

from certify import __version__
from certify.verifier.digest import BUNDLE_FORMAT, digest, short
from certify.verifier.report import class_facts, equation, group_name
from certify.verifier.sources import Unreadable, parse, read

FORMATS = ("latex", "markdown", "csv")
LATEX_PACKAGES = "amsmath,amssymb,array,booktabs,longtable"


@dataclass(frozen=True)
class Fact:
    """One column of facts read from a kind of certificate, with its writer in each format; ``csv`` lists
    the CSV columns it fills, each (name, writer)."""
    heading: str
    latex_heading: str
    latex_width: int
    """The column's share of the text width, in hundredths."""
    latex_narrow: int
    """Its share when more than three kinds are shown: as wide as its longest heading word, no wider."""
    read: Callable[[dict], object]
    text: Callable[[object], str]
    latex: Callable[[object], str]
    csv: tuple


@dataclass(frozen=True)
class Kind:
    """A kind of certificate as the table shows it: what the caption calls its claims, its facts and the
    heading of its digest column (in LaTeX ``latex_name``, as narrow as four hex digits or little more)."""
    name: str
    plural: str
    digest_heading: str
    facts: tuple
    latex_name: str


def group_in_words(invariants) -> str:
    """Z/2Z × Z/4Z for [2, 4]; 'trivial' for the trivial group."""
    return group_name(invariants) if invariants else "trivial"


def latex_group(invariants) -> str:
    """$\\mathbb{Z}/2\\mathbb{Z} \\times \\mathbb{Z}/4\\mathbb{Z}$; 'trivial' for the trivial group."""
    if not invariants:
        return "trivial"
    return "$" + " \\times ".join(f"\\mathbb{{Z}}/{n}\\mathbb{{Z}}" for n in invariants) + "$"


def listed(values) -> str:
    """[2,4] as CSV writes a list."""
    return "[" + ",".join(map(str, values)) + "]"


TORSION = Kind("torsion", "torsion subgroups", "torsion certificate", (
    Fact("E(Q)_tors", "$E(\\mathbb{Q})_{\\mathrm{tors}}$", 15, 10,
         lambda cert: [int(n) for n in cert["claim"]["invariants"]], group_in_words, latex_group,
         (("torsion", group_in_words), ("torsion_invariants", listed))),
), "torsion")
ISOGENY_CLASS = Kind("class", "isogeny classes", "class certificate", (
    Fact("class size", "class size", 6, 6, lambda cert: class_facts(cert)[0], str, str, (("class_size", str),)),
    Fact("isogeny degrees from E", "isogeny degrees from $E$", 11, 8, lambda cert: class_facts(cert)[1],
         lambda d: ", ".join(map(str, d)), lambda d: ", ".join(map(str, d)), (("degrees", listed),)),
), "class")
CONDUCTOR = Kind("conductor", "conductors", "conductor certificate", (
    Fact("conductor N", "conductor $N$", 11, 11, lambda cert: int(cert["claim"]["conductor"]), str, str,
         (("conductor", str),)),
), "cond.")


def rank_bounds(cert: dict) -> tuple:
    """(rank_lower, rank_upper or None) of a rank certificate's claim."""
    claim = cert["claim"]
    return int(claim["rank_lower"]), None if claim["rank_upper"] is None else int(claim["rank_upper"])


def rank_text(bounds: tuple) -> str:
    """The rank as a table cell: '2' when the bounds meet, '1–3' for bounds, '≥ 1' without an upper bound."""
    lower, upper = bounds
    return str(lower) if lower == upper else f"≥ {lower}" if upper is None else f"{lower}–{upper}"


def latex_rank(bounds: tuple) -> str:
    """rank_text in LaTeX: 2, 1--3, $\\geq 1$."""
    lower, upper = bounds
    return str(lower) if lower == upper else f"$\\geq {lower}$" if upper is None else f"{lower}--{upper}"


RANK = Kind("rank", "ranks", "rank certificate", (
    Fact("rank", "rank", 5, 5, rank_bounds, rank_text, latex_rank,
         (("rank", rank_text), ("rank_lower", lambda bounds: str(bounds[0])),
          ("rank_upper", lambda bounds: "" if bounds[1] is None else str(bounds[1])))),
), "rank")
KINDS = {"certify-torsion": TORSION, "certify-isogeny-class": ISOGENY_CLASS, "certify-conductor": CONDUCTOR,
         "certify-rank": RANK}
"""Certificate format → how the table shows it, in column order."""


class TableError(ValueError):
    """A certificate the verifier accepts is of a kind the table has no columns for (not yet in KINDS)."""


def table_rows(certificates) -> list:
    """[{"curve", "label", "line", kind name: {"facts": [...], "digest"}}] from (name, certificate,
    verdict) triples: one row per curve, in order of first appearance, or in the order of the batch
    file's lines when every certificate records its line."""
    rows = {}
    for name, cert, verdict in certificates:
        metadata = cert.get("metadata") if isinstance(cert.get("metadata"), dict) else {}
        row = rows.setdefault(tuple(cert["curve"]), {"curve": cert["curve"], "label": "", "line": None})
        row["label"] = row["label"] or str(metadata.get("label") or "")
        line = str(metadata.get("input_line") or "")
        row["line"] = int(line) if line.isdigit() else row["line"]
        kind = KINDS.get(cert["format"])
        if kind is None:
            raise TableError(f"{name}: certify table has no columns for {cert['format']} certificates")
        row[kind.name] = {"facts": [fact.read(cert) for fact in kind.facts], "digest": verdict["digest"]}
    ordered = list(rows.values())
    if all(row["line"] is not None for row in ordered):
        ordered.sort(key=lambda row: row["line"])
    return ordered


def shown_kinds(rows: list) -> list:
    """The kinds of certificate present in the rows, in KINDS order."""
    return [kind for kind in KINDS.values() if any(kind.name in row for row in rows)]


def cells(row: dict, kinds: list, fact_writer: str, digest_writer, missing: str) -> list:
    """The fact and digest cells of a row, kind by kind; ``missing`` where the row has no such certificate."""
    out = []
    for kind in kinds:
        entry = row.get(kind.name)
        out += [missing if entry is None else getattr(fact, fact_writer)(value)
                for fact, value in zip(kind.facts, entry["facts"] if entry else [None] * len(kind.facts))]
        out.append(missing if entry is None else digest_writer(entry["digest"]))
    return out


# --- LaTeX ---
LATEX_SPECIALS = {c: "\\" + c for c in "#$%&_{}"} | {"~": "\\textasciitilde{}", "^": "\\textasciicircum{}",
                                                    "\\": "\\textbackslash{}"}


def latex_text(text: str) -> str:
    """Text with LaTeX's special characters escaped."""
    return "".join(LATEX_SPECIALS.get(c, c) for c in text)


BREAK_DIGITS = 10
"""Digits between the break points allowed inside a long number."""


def breakable(number: str) -> str:
    """The digits of a number with a line break allowed after every BREAK_DIGITS of them."""
    return "\\allowbreak ".join(number[i:i + BREAK_DIGITS] for i in range(0, len(number), BREAK_DIGITS))


def latex_coefficient(value, monomial: str) -> str:
    """A positive coefficient in LaTeX: 2, \\tfrac{1}{3}; a fraction with more than BREAK_DIGITS digits
    in its numerator or denominator as (n/d), which can break across lines."""
    numerator, denominator = str(value.numerator), str(value.denominator)
    if value.denominator == 1:
        return breakable(numerator)
    if max(len(numerator), len(denominator)) <= BREAK_DIGITS:
        return f"\\tfrac{{{numerator}}}{{{denominator}}}"
    fraction = f"{breakable(numerator)}/\\allowbreak {breakable(denominator)}"
    return f"({fraction})" if monomial else fraction


def latex_curve(coefficients) -> str:
    """The equation in inline math, which a paragraph cell breaks after its + and − signs."""
    return "$" + equation(coefficients, latex_coefficient) + "$"


def hex_breaks(full: str) -> str:
    """A full digest 'sha256:…' in typewriter type, breakable after its prefix and every 16 hex digits."""
    prefix, _, hex_digits = full.rpartition(":")
    groups = [prefix + ":"] if prefix else []
    groups += [hex_digits[i:i + 16] for i in range(0, len(hex_digits), 16)]
    return "\\texttt{" + "\\allowbreak ".join(groups) + "}"


def latex_caption(kinds: list, bundles: list) -> str:
    """What the table shows, the certify version, and the digest of each bundle it tabulates."""
    where = (" The certificates are in the bundle" + ("s" if len(bundles) > 1 else "") + " with digest "
             + ", ".join(hex_breaks(d) for d in bundles) + ".") if bundles else ""
    shown = [kind.plural for kind in kinds]
    what = ", ".join(shown[:-1]) + " and " + shown[-1] if len(shown) > 1 else "".join(shown)
    return (f"{what[:1].upper()}{what[1:]} certified by certify {__version__}; each certificate "
            f"column gives the first 12 hex digits of that certificate's SHA-256 digest.{where}")


def latex_digest(full: str, lines: int) -> str:
    """The first 12 hex digits of a digest in typewriter type, breakable into ``lines`` lines."""
    digits, step = short(full), 12 // lines
    return "\\texttt{" + "\\allowbreak ".join(digits[i:i + step] for i in range(0, 12, step)) + "}"


def digest_width(kind: Kind, digits: int) -> list:
    """LaTeX setting the length \\certify<kind>digest: as wide as ``digits`` hex digits, or as the kind's
    name heading the column, whichever is wider."""
    length = f"\\certify{kind.name}digest"
    return [f"\\ifdefined{length}\\else\\newlength{{{length}}}\\fi",
            f"\\settowidth{{{length}}}{{\\texttt{{{'0' * digits}}}}}",
            f"\\settowidth{{\\certifyword}}{{{kind.latex_name}}}",
            f"\\ifdim\\certifyword>{length}\\setlength{{{length}}}{{\\certifyword}}\\fi"]


def latex(rows: list, document: bool, bundles: list = ()) -> str:
    """A longtable for ``\\input`` (or, with ``document``, a whole article that compiles with pdflatex):
    the facts of each kind of certificate, then under "certificate digests" one column per kind, named
    for it; with more than two kinds the 12 digits of a digest go on three lines of 4, and with more than
    three the fact columns take their narrow widths and the columns sit closer."""
    kinds = shown_kinds(rows)
    lines_per_digest = 1 if len(kinds) <= 2 else 3
    narrow = len(kinds) > 3
    labelled = any(row["label"] for row in rows)
    ragged = ">{\\raggedright\\arraybackslash}p"
    facts = [fact for kind in kinds for fact in kind.facts]
    widths = [fact.latex_narrow if narrow else fact.latex_width for fact in facts]
    shares = sum(widths) + (9 if labelled else 0)
    columns = labelled + 1 + len(facts) + len(kinds)
    curve_width = (f"\\dimexpr\\linewidth*{100 - shares}/100"
                   + "".join(f"-\\certify{kind.name}digest" for kind in kinds)
                   + f"-{2 * (columns - 1)}\\tabcolsep\\relax")
    spec = ([f"{ragged}{{\\dimexpr\\linewidth*9/100\\relax}}"] if labelled else []) + [f"{ragged}{{{curve_width}}}"]
    spec += [f"{ragged}{{\\dimexpr\\linewidth*{width}/100\\relax}}" for width in widths]
    spec += [f"{ragged}{{\\certify{kind.name}digest}}" for kind in kinds]
    first_digest = columns - len(kinds) + 1
    head = [" & " * (first_digest - 1) + f"\\multicolumn{{{len(kinds)}}}{{c}}"
            "{\\begin{tabular}{@{}c@{}}certificate\\\\digests\\end{tabular}} \\\\",
            f"\\cmidrule(l){{{first_digest}-{columns}}}",
            " & ".join((["label"] if labelled else []) + ["curve $E$"] + [fact.latex_heading for fact in facts]
                       + [kind.latex_name for kind in kinds]) + " \\\\"]
    lines = ["% certify table: a longtable (packages " + LATEX_PACKAGES + ")",
             "\\begingroup", "\\footnotesize", f"\\setlength{{\\tabcolsep}}{{{2 if narrow else 3}pt}}",
             "\\ifdefined\\certifyword\\else\\newlength{\\certifyword}\\fi",
             *(line for kind in kinds for line in digest_width(kind, 12 // lines_per_digest)),
             "\\begin{longtable}{@{}" + "".join(spec) + "@{}}",
             "\\caption{" + latex_caption(kinds, list(bundles)) + "}\\\\",
             "\\toprule", *head, "\\midrule", "\\endfirsthead",
             "\\multicolumn{" + str(columns) + "}{@{}l}{\\emph{(continued)}}\\\\", "\\toprule", *head, "\\midrule",
             "\\endhead", "\\bottomrule", "\\endfoot"]
    for row in rows:
        row_cells = ([latex_text(row["label"])] if labelled else []) + [latex_curve(row["curve"])]
        for kind in kinds:
            entry = row.get(kind.name)
            row_cells += ["--" if entry is None else fact.latex(value)
                          for fact, value in zip(kind.facts, entry["facts"] if entry else [None] * len(kind.facts))]
        row_cells += ["--" if row.get(kind.name) is None else latex_digest(row[kind.name]["digest"], lines_per_digest)
                      for kind in kinds]
        lines.append(" & ".join(row_cells) + " \\\\")
    lines += ["\\end{longtable}", "\\endgroup"]
    if document:
        lines = ["\\documentclass{article}", f"\\usepackage{{{LATEX_PACKAGES}}}", "\\begin{document}",
                 *lines, "\\end{document}"]
    return "\n".join(lines) + "\n"


# --- Markdown and CSV ---
def markdown(rows: list) -> str:
    """A pipe table; equations and digests in code spans so that Markdown leaves them alone."""
    kinds = shown_kinds(rows)
    labelled = any(row["label"] for row in rows)
    heading = (["label"] if labelled else []) + ["curve"]
    for kind in kinds:
        heading += [fact.heading for fact in kind.facts] + [kind.digest_heading]
    lines = ["| " + " | ".join(heading) + " |", "|" + " --- |" * len(heading)]
    for row in rows:
        row_cells = ([row["label"].replace("|", "\\|")] if labelled else []) + [f"`{equation(row['curve'])}`"]
        row_cells += cells(row, kinds, "text", lambda d: f"`{short(d)}`", "—")
        lines.append("| " + " | ".join(row_cells) + " |")
    return "\n".join(lines) + "\n"


def csv_columns() -> list:
    """label, curve, coefficients, then each kind's fact columns and its ``<kind>_digest``."""
    columns = ["label", "curve", "coefficients"]
    for kind in KINDS.values():
        columns += [name for fact in kind.facts for name, _ in fact.csv] + [f"{kind.name}_digest"]
    return columns


def comma_separated(rows: list) -> str:
    """CSV with the columns csv_columns(); lists as '[2,4]', full digests, empty cells for absent facts."""
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow(csv_columns())
    for row in rows:
        values = [row["label"], equation(row["curve"]), listed(row["curve"])]
        for kind in KINDS.values():
            entry = row.get(kind.name)
            for index, fact in enumerate(kind.facts):
                values += ["" if entry is None else write(entry["facts"][index]) for _, write in fact.csv]
            values.append("" if entry is None else entry["digest"])
        writer.writerow(values)
    return out.getvalue()


def bundle_digests(sources) -> list:
    """The digests of the sources that are bundles, in order (certify table's caption names them)."""
    out = []
    for source in sources:
        try:
            document = parse(read(source))
        except Unreadable:
            continue
        if isinstance(document, dict) and document.get("format") == BUNDLE_FORMAT:
            out.append(digest(document))
    return out


def render(certificates, form: str, document: bool = False, bundles=()) -> str:
    """The table of the accepted certificates in the format ``form`` (one of FORMATS); ``bundles``, the
    digests of the bundles they come from, go into the LaTeX caption."""
    rows = table_rows(certificates)
    if form == "latex":
        return latex(rows, document, bundles)
    return markdown(rows) if form == "markdown" else comma_separated(rows)
