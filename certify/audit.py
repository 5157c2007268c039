"""``certify audit CLAIMS``: check another program's answers against certified ones.

CLAIMS is a CSV file with a header row, or a JSONL file (one object per line, by the suffix
``.jsonl``). Columns (every one but ``curve`` optional, empty cells meaning "not claimed"):

- ``curve`` — the curve, in the CURVE syntax;
- ``label`` — any text, copied to the report;
- ``torsion`` — the invariants [n1, n2] of E(Q)_tors (``[2,4]``, ``[5]``, ``[]``);
- ``class_size`` — the number of curves in the isogeny class (up to isomorphism over Q);
- ``degrees`` — the degrees of the cyclic isogenies from E to each member of its class, 1 for E
  itself, as a list (compared as a multiset, so their order does not matter);
- ``class_curves`` — the members of the class, a list of [a1,a2,a3,a4,a6] (or [A,B]) in any models
  (compared as a set of isomorphism classes, through reduced minimal models).

For each claimed field the truth is certified and the report gets one record: ``row`` (line of
CLAIMS), ``label``, ``curve`` ([a1,...,a6]), ``field``, ``claimed``, ``certified``, ``verdict``
(``agree``, ``disagree``, ``invalid``: the claim cannot be read, or ``unknown``: certification failed),
``certificate`` (for a disagreement, the file of the certificate that proves the certified value),
``digest`` (that certificate's digest) and ``reason`` (for invalid and unknown). Exit status: 0 when
every field agrees, 1 when any disagrees, 2 when a claim is invalid or undecided or CLAIMS unreadable.
"""
from __future__ import annotations

import csv
import io
import json
import os
import sys

from certify.batch import Task, certify_all, curve_key
from certify.certificates import emit, write_atomically
from certify.curves import Curve, CurveInputError, parse_curve
from certify.store import file_stem

FIELDS = {"torsion": "torsion", "class_size": "isogeny-class", "degrees": "isogeny-class",
          "class_curves": "isogeny-class"}
"""Each claimable field and the kind of certificate that decides it."""

COLUMNS = ("row", "label", "curve", "field", "claimed", "certified", "verdict", "certificate", "digest", "reason")


class AuditInputError(Exception):
    """The claims file cannot be read at all."""


def read_claims(path: str) -> list:
    """[(line number, {column: value})] of the claims file (CSV with a header, or JSONL)."""
    try:
        with open(path, encoding="utf-8", newline="") as handle:
            text = handle.read()
    except (OSError, UnicodeDecodeError) as error:
        raise AuditInputError(f"cannot read {path}: {getattr(error, 'strerror', None) or error}")
    if path.endswith(".jsonl"):
        rows = []
        for number, line in enumerate(text.splitlines(), 1):
            if line.strip():
                try:
                    row = json.loads(line)
                except ValueError as error:
                    raise AuditInputError(f"{path}, line {number}: not JSON ({error})")
                if not isinstance(row, dict):
                    raise AuditInputError(f"{path}, line {number}: each line must be a JSON object")
                rows.append((number, row))
    else:
        reader = csv.DictReader(io.StringIO(text))
        rows = [(reader.line_num, dict(row)) for row in reader]
    if rows and not all("curve" in row for _, row in rows):
        raise AuditInputError(f"{path}: every row needs a 'curve' column")
    unknown = {column for _, row in rows for column in row} - set(FIELDS) - {"curve", "label"}
    if unknown:
        raise AuditInputError(f"{path}: unknown columns {', '.join(sorted(map(str, unknown)))}")
    return rows


def as_list(value) -> list:
    """A claimed list: a JSON list, or its text."""
    parsed = json.loads(value) if isinstance(value, str) else value
    if not isinstance(parsed, list):
        raise ValueError("not a list")
    return parsed


def minimal_key(curve) -> str:
    """The reduced minimal model of a curve given as a list of coefficients or as CURVE text."""
    text = curve if isinstance(curve, str) else "[" + ",".join(str(c) for c in curve) + "]"
    return curve_key(Curve(parse_curve(text)).minimal_model()[0].a)


def normalise(field: str, value):
    """The claimed or certified value in the form the report shows and compares."""
    if field == "class_size":
        return str(int(value))
    values = as_list(value)
    if field == "torsion":
        return "[" + ",".join(str(int(n)) for n in values) + "]"
    if field == "degrees":
        return "[" + ",".join(str(d) for d in sorted(int(d) for d in values)) + "]"
    return "[" + ",".join(sorted(minimal_key(curve) for curve in values)) + "]"


def certified_value(field: str, cert: dict) -> str:
    """What the accepted certificate says about the field, normalised."""
    claim = cert["claim"]
    if field == "torsion":
        return normalise(field, claim["invariants"])
    if field == "class_size":
        return str(len(claim["curves"]))
    return normalise(field, claim["degrees"][0] if field == "degrees" else claim["curves"])


def claimed_fields(row: dict) -> dict:
    """{field: raw claimed value} for the fields the row claims."""
    return {field: row[field] for field in FIELDS if row.get(field) not in (None, "")}


def run_audit(path: str, output: str | None, form: str, folder: str, workers: int | None = None,
              cluster: str | None = None, timeout: float | None = None) -> int:
    """Audit the claims; the report goes to ``output`` (atomically) or stdout. Returns the exit status."""
    rows, records, wanted = read_claims(path), [], {}
    for number, row in rows:
        base = {"row": str(number), "label": str(row.get("label") or "")}
        try:
            key = curve_key(parse_curve(str(row["curve"])))
        except CurveInputError as error:
            records.append({**base, "curve": str(row["curve"]), "field": "curve", "verdict": "invalid",
                            "reason": str(error)})
            continue
        for field, value in claimed_fields(row).items():
            try:
                claimed = normalise(field, value)
            except (ValueError, TypeError, CurveInputError) as error:
                records.append({**base, "curve": key, "field": field, "claimed": str(value), "verdict": "invalid",
                                "reason": f"cannot read the claim: {error}"})
                continue
            wanted.setdefault((key, FIELDS[field]), []).append({**base, "curve": key, "field": field, "claimed": claimed})
    tasks = [Task(key, kind, "", timeout) for key, kind in wanted]
    for result in certify_all(tasks, workers, cluster):
        task = result["task"]
        if "error" in result:
            records += [{**claim, "verdict": "unknown", "reason": result["error"]} for claim in wanted[(task.key, task.kind)]]
            continue
        cert = json.loads(result["document"])
        for claim in wanted[(task.key, task.kind)]:
            certified = certified_value(claim["field"], cert)
            record = {**claim, "certified": certified, "verdict": "agree" if certified == claim["claimed"] else "disagree"}
            if record["verdict"] == "disagree":
                os.makedirs(folder, exist_ok=True)
                record["certificate"] = os.path.join(folder, f"{file_stem(task.key)}.{task.kind}.json")
                record["digest"] = result["digest"]
                write_atomically(record["certificate"], result["document"])
            records.append(record)
    records.sort(key=lambda record: (int(record["row"]), list(FIELDS).index(record["field"])
                                     if record["field"] in FIELDS else -1))
    records = [{column: record.get(column, "") for column in COLUMNS} for record in records]
    write_report(records, form, output)
    verdicts = [record["verdict"] for record in records]
    print(f"audit: {len(rows)} rows, {len(records)} fields: " +
          ", ".join(f"{verdicts.count(v)} {v}" for v in ("agree", "disagree", "invalid", "unknown")), file=sys.stderr)
    if "invalid" in verdicts or "unknown" in verdicts:
        return 2
    return 1 if "disagree" in verdicts else 0


def write_report(records: list, form: str, output: str | None) -> None:
    """The records as CSV (header COLUMNS) or JSONL (one object per record, the same keys)."""
    if form == "jsonl":
        text = "".join(json.dumps(record, ensure_ascii=False) + "\n" for record in records)
    else:
        buffer = io.StringIO()
        writer = csv.DictWriter(buffer, COLUMNS, lineterminator="\n")
        writer.writeheader()
        writer.writerows(records)
        text = buffer.getvalue()
    emit(text, output)
