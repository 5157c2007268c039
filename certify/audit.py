"""``certify audit CLAIMS``: check another program's answers against certified ones.

CLAIMS is a CSV file whose first line is a header, or a JSONL file (one object per line, by the suffix
``.jsonl``). Columns (every one but ``curve`` optional, empty cells meaning "not claimed"):

- ``curve`` — the curve, in the CURVE syntax (in JSONL also a list of numbers);
- ``label`` — any text, copied to the report;
- ``torsion_group`` — the group E(Q)_tors, as orders of cyclic factors (``[2,4]``, ``[6]``, ``[2,3]``,
  ``[1,6]``, ``[]``) or written out (``Z/6Z``, ``Z/2Z x Z/4Z``, ``trivial``); compared as a group, through
  its invariant factors, so that [2,3], [1,6], [6] and Z/6Z are the same claim;
- ``curves_in_class`` — the number of curves in the isogeny class (up to isomorphism over Q);
- ``cyclic_degrees_from_curve`` — the degrees of the cyclic isogenies from E to each member of its
  class, 1 for E itself, as a list (compared as a multiset, so their order does not matter);
- ``class_members`` — the members of the class, a list of [a1,a2,a3,a4,a6] (or [A,B]) in any models
  (compared as a set of isomorphism classes, through reduced minimal models);
- ``conductor`` — the conductor N, a positive integer;
- ``rank`` — the rank of E(Q): a number (``2``), or bounds ``lo..hi`` (``1..3``; ``1..`` for no upper
  bound; ``1–3`` and ``≥ 1``, as certify table writes them, are read too). The claim "lo <= rank <= hi"
  agrees when the certified bounds lie inside it (so a number agrees only when the bounds pin it),
  disagrees when they exclude it, and is otherwise unknown, with the certified bounds in the report.

For each claimed field the truth is certified — or, with ``--store OUT``, taken from a certificate
already in a batch store or directory once the verifier accepts it again — and the report gets one
record: ``row`` (line of CLAIMS), ``label``, ``curve`` ([a1,...,a6]), ``field``, ``claimed``,
``certified``, ``verdict`` (``agree``, ``disagree``, ``invalid``: the claim cannot be read, or
``unknown``: certification failed, or the certified rank bounds neither prove nor exclude the claim),
``certificate`` (for a disagreement or undecided rank bounds, the file of the certificate that proves the
certified value), ``digest`` (that certificate's digest) and ``reason`` (for invalid and unknown). In
JSONL the values keep their types (numbers, lists, null for absent). Exit status: 0 when every field
agrees, 1 when any disagrees, 2 when a claim is invalid or undecided, or CLAIMS cannot be read or holds no
claims.
"""
from __future__ import annotations

import csv
import io
import json
import math
import os
import re
import sys
from collections import Counter

from certify.batch import Progress, Task, certify_all, curve_key
from certify.certificates import emit, write_atomically
from certify.curves import Curve, CurveInputError, curve_from_numbers, parse_curve
from certify.store import StoreReader, file_name

FIELDS = {"torsion_group": "torsion", "curves_in_class": "isogeny-class", "cyclic_degrees_from_curve": "isogeny-class",
          "class_members": "isogeny-class", "conductor": "conductor", "rank": "rank"}
"""Each claimable field and the kind of certificate that decides it."""

COLUMNS = ("row", "label", "curve", "field", "claimed", "certified", "verdict", "certificate", "digest", "reason")


class AuditInputError(Exception):
    """The claims file cannot be read at all, or claims nothing."""


def read_claims(path: str) -> list:
    """[(line number, {column: value})] of the claims file (CSV with a header, or JSONL)."""
    try:
        with open(path, encoding="utf-8", newline="") as handle:
            text = handle.read()
    except (OSError, UnicodeDecodeError) as error:
        raise AuditInputError(f"cannot read {path}: {getattr(error, 'strerror', None) or error}")
    rows = read_jsonl(path, text) if path.endswith(".jsonl") else read_csv(path, text)
    if not rows:
        raise AuditInputError(f"{path}: no claims to check" + ("" if text.strip() else " (the file is empty)")
                              + (" — only a header" if text.strip() and not path.endswith(".jsonl") else ""))
    missing = next((number for number, row in rows if row.get("curve") in (None, "")), None)
    if missing is not None:
        raise AuditInputError(f"{path}, line {missing}: no curve (every row needs a 'curve')")
    unknown = {column for _, row in rows for column in row} - set(FIELDS) - {"curve", "label"}
    if unknown:
        raise AuditInputError(f"{path}: unknown columns {', '.join(sorted(map(str, unknown)))} (the columns are "
                              f"curve, label, {', '.join(FIELDS)})")
    return rows


def read_csv(path: str, text: str) -> list:
    """The rows of a CSV file whose first line names the columns, 'curve' among them."""
    try:
        reader = csv.DictReader(io.StringIO(text))
        if reader.fieldnames is not None and "curve" not in reader.fieldnames:
            raise AuditInputError(f"{path}: the first line must be a header naming the columns, 'curve' among "
                                  f"them; it reads {text.splitlines()[0][:60]!r}")
        return [(reader.line_num, {k: v for k, v in row.items() if k is not None}) for row in reader
                if any(value not in (None, "") for value in row.values())]
    except csv.Error as error:
        raise AuditInputError(f"{path}: not readable as CSV: {error}") from None


def read_jsonl(path: str, text: str) -> list:
    """The rows of a JSONL file, one object per non-blank line."""
    rows = []
    for number, line in enumerate(text.splitlines(), 1):
        if line.strip():
            try:
                row = json.loads(line)
            except (ValueError, RecursionError) as error:
                raise AuditInputError(f"{path}, line {number}: not JSON ({str(error)[:80]})") from None
            if not isinstance(row, dict):
                raise AuditInputError(f"{path}, line {number}: each line must be a JSON object")
            rows.append((number, row))
    return rows


def invariant_factors(orders: list) -> list:
    """The invariant factors n1 | n2 | … (all > 1) of Z/a1Z × Z/a2Z × …: each pair (a, b) becomes
    (gcd, lcm), by Z/aZ × Z/bZ ≅ Z/gcd(a,b)Z × Z/lcm(a,b)Z (Chinese remainder theorem)."""
    orders = list(orders)
    for i in range(len(orders)):
        for j in range(i + 1, len(orders)):
            g = math.gcd(orders[i], orders[j])
            orders[i], orders[j] = g, orders[i] * orders[j] // g
    return [n for n in orders if n != 1]


CYCLIC_FACTOR = re.compile(r"\s*(?:(?:Z|ℤ)\s*/\s*(\d{1,9})\s*(?:Z|ℤ)?|C_?(\d{1,9})|(\d{1,9}))\s*")
PRODUCT_SIGNS = re.compile(r"\s*(?:x|×|\*|⊕|\+)\s*")
TRIVIAL = {"0", "1", "trivial", "{0}", "{1}", "{O}"}


def group_orders(value) -> list:
    """The orders of the cyclic factors of a claimed group: a list ([2,4]), its JSON text, or the group
    written out (Z/2Z x Z/4Z, Z/6Z, C2 × C4, trivial)."""
    if isinstance(value, str) and not value.strip().startswith("["):
        if value.strip() in TRIVIAL:
            return []
        orders = []
        for factor in PRODUCT_SIGNS.split(value.strip()):
            match = CYCLIC_FACTOR.fullmatch(factor)
            if not match:
                raise ValueError(f"{factor!r} is not a cyclic group Z/nZ")
            orders.append(int(next(g for g in match.groups() if g is not None)))
        return orders
    return [int(n) for n in as_list(value)]


def as_list(value) -> list:
    """A claimed list: a JSON list, or its text."""
    parsed = json.loads(value) if isinstance(value, str) else value
    if not isinstance(parsed, list):
        raise ValueError("not a list")
    return parsed


def read_curve(value) -> tuple:
    """a1..a6 of a claimed curve: CURVE text, or (from JSONL) a list of numbers."""
    return curve_from_numbers(value) if isinstance(value, list) else parse_curve(str(value))


def minimal_model(curve) -> list:
    """The reduced minimal model [a1,…,a6] (integers) of a curve given as CURVE text or a list."""
    return [int(c) for c in Curve(read_curve(curve)).minimal_model()[0].a]


def whole_number(value) -> int:
    """A claimed count: an int, or its decimal text; refuses booleans and non-integral numbers."""
    if isinstance(value, bool) or (isinstance(value, float) and not value.is_integer()):
        raise ValueError(f"not a whole number: {value!r}")
    return int(value)


RANK_RANGE = re.compile(r"\s*(?:(\d{1,9})\s*(?:\.\.|–)\s*(\d{1,9})?|(?:≥|>=)\s*(\d{1,9}))\s*")
"""Rank bounds as text: 'lo..hi', 'lo..' (no upper bound), 'lo–hi' and '≥ lo' (as certify table writes them)."""


def rank_bounds(value) -> tuple:
    """(lo, hi) for a claimed rank: a number n is (n, n), 'lo..hi' is (lo, hi), 'lo..' and '≥ lo' are
    (lo, None) — no upper bound."""
    if isinstance(value, str):
        match = RANK_RANGE.fullmatch(value)
        if match:
            lower, upper, at_least = match.groups()
            bounds = (int(at_least), None) if at_least else (int(lower), None if upper is None else int(upper))
            if bounds[1] is not None and bounds[1] < bounds[0]:
                raise ValueError(f"the bounds {value!r} are in the wrong order")
            return bounds
    rank = whole_number(value)
    if rank < 0:
        raise ValueError("a rank is not negative")
    return rank, rank


def rank_value(bounds: tuple):
    """Bounds as the report shows them: the number when they meet, else the text 'lo..hi' ('lo..' without
    an upper bound)."""
    lower, upper = bounds
    return lower if lower == upper else f"{lower}..{'' if upper is None else upper}"


def normalise(field: str, value):
    """The claimed or certified value in the native form the report shows and compares: the invariant
    factors of a group, a count, a sorted list of degrees, a sorted list of reduced minimal models, the
    conductor, the rank or its bounds (``rank_value``)."""
    if field in ("curves_in_class", "conductor"):
        number = whole_number(value)
        if field == "conductor" and number < 1:
            raise ValueError("a conductor is a positive integer")
        return number
    if field == "rank":
        return rank_value(rank_bounds(value))
    if field == "torsion_group":
        orders = group_orders(value)
        if any(n < 1 for n in orders):
            raise ValueError("the orders of cyclic groups are positive")
        return invariant_factors(orders)
    values = as_list(value)
    if field == "cyclic_degrees_from_curve":
        return sorted(int(d) for d in values)
    return sorted(minimal_model(curve) for curve in values)


def certified_value(field: str, cert: dict):
    """What the accepted certificate says about the field, normalised."""
    claim = cert["claim"]
    if field == "torsion_group":
        return normalise(field, claim["invariants"])
    if field == "curves_in_class":
        return len(claim["curves"])
    if field == "conductor":
        return int(claim["conductor"])
    if field == "rank":
        upper = claim["rank_upper"]
        return rank_value((int(claim["rank_lower"]), None if upper is None else int(upper)))
    return normalise(field, claim["degrees"][0] if field == "cyclic_degrees_from_curve" else claim["curves"])


def verdict(field: str, claimed, certified) -> str:
    """'agree' when the certified value proves the claim, 'disagree' when it refutes it; for the rank,
    whose certificate may prove bounds only, 'unknown' when the certified bounds meet the claimed range
    without lying inside it."""
    if field != "rank":
        return "agree" if certified == claimed else "disagree"
    (lower, upper), (claimed_lower, claimed_upper) = rank_bounds(certified), rank_bounds(claimed)
    if claimed_lower <= lower and (claimed_upper is None or (upper is not None and upper <= claimed_upper)):
        return "agree"
    if (upper is not None and upper < claimed_lower) or (claimed_upper is not None and claimed_upper < lower):
        return "disagree"
    return "unknown"


def as_text(value) -> str:
    """A value for the CSV report: lists without spaces ([2,4], [[0,1,1,0,0],…]), '' for None."""
    if value is None:
        return ""
    return json.dumps(value, separators=(",", ":")) if isinstance(value, list) else str(value)


def claimed_fields(row: dict) -> dict:
    """{field: raw claimed value} for the fields the row claims."""
    return {field: row[field] for field in FIELDS if row.get(field) not in (None, "")}


def collect(rows: list) -> tuple:
    """(records of unreadable claims, {(curve key, kind): [claims that kind of certificate decides]})."""
    records, wanted = [], {}
    for number, row in rows:
        base = {"row": number, "label": str(row.get("label") or "")}
        try:
            key = curve_key(read_curve(row["curve"]))
        except CurveInputError as error:
            records.append({**base, "curve": str(row["curve"]), "field": "curve", "verdict": "invalid",
                            "reason": str(error)})
            continue
        for field, value in claimed_fields(row).items():
            try:
                claimed = normalise(field, value)
            except (ValueError, TypeError, CurveInputError) as error:
                records.append({**base, "curve": key, "field": field, "claimed": value, "verdict": "invalid",
                                "reason": f"cannot read the claim: {error}"})
                continue
            wanted.setdefault((key, FIELDS[field]), []).append({**base, "curve": key, "field": field, "claimed": claimed})
    return records, wanted


def reused_results(wanted: dict, store_path: str | None) -> list:
    """Results (as certify_one gives them) for the certificates already in the store that the verifier
    accepts again, and whose curve is the one claimed; the rest is certified afresh."""
    if store_path is None:
        return []
    from certify.verifier.cli import check
    from certify.verifier.sources import Unreadable, parse

    out = []
    with StoreReader(store_path) as reader:
        for key, kind in wanted:
            found = reader.get(key, kind)
            if found is None:
                continue
            document, recorded = found
            try:
                cert = parse(document.encode("utf-8"))
            except Unreadable:
                continue
            verdict = check(f"{store_path}#{key}/{kind}", cert, recorded)
            if verdict["accepted"] and "[" + ",".join(cert["curve"]) + "]" == key:
                out.append({"task": Task(key, kind, "", None), "document": document, "digest": verdict["digest"]})
    return out


def run_audit(path: str, output: str | None, form: str, folder: str, workers: int | None = None,
              cluster: str | None = None, timeout: float | None = None, store: str | None = None) -> int:
    """Audit the claims; the report goes to ``output`` (atomically) or stdout. Returns the exit status."""
    rows = read_claims(path)
    records, wanted = collect(rows)
    reused = reused_results(wanted, store)
    taken = {(result["task"].key, result["task"].kind) for result in reused}
    tasks = [Task(key, kind, "", timeout) for key, kind in wanted if (key, kind) not in taken]
    open_kinds = Counter(key for key, _ in wanted)
    progress = Progress(len(open_kinds), 0, name="audit")
    results = certify_all(tasks, workers, cluster)
    try:
        for result in [*reused, *results]:
            task = result["task"]
            records += judged(wanted[(task.key, task.kind)], result, folder)
            open_kinds[task.key] -= 1
            if open_kinds[task.key] == 0:
                progress.advance()
    finally:
        results.close()
        progress.close()
    records.sort(key=lambda record: (record["row"], list(FIELDS).index(record["field"])
                                     if record["field"] in FIELDS else -1))
    records = [{column: record.get(column) for column in COLUMNS} for record in records]
    write_report(records, form, output)
    verdicts = [record["verdict"] for record in records]
    print(f"audit: {len(rows)} rows, {len(records)} fields: " +
          ", ".join(f"{verdicts.count(v)} {v}" for v in ("agree", "disagree", "invalid", "unknown")), file=sys.stderr)
    if store is not None:
        print(f"audit: {len(reused)} certificates taken from {store} and accepted again, {len(tasks)} made",
              file=sys.stderr)
    if "invalid" in verdicts or "unknown" in verdicts:
        return 2
    return 1 if "disagree" in verdicts else 0


def judged(claims: list, result: dict, folder: str) -> list:
    """The records of the claims one certificate decides; for a disagreement, or rank bounds that leave the
    claim undecided, the certificate is written into ``folder`` and named in the record."""
    task = result["task"]
    if "error" in result:
        return [{**claim, "verdict": "unknown", "reason": result["error"]} for claim in claims]
    cert = json.loads(result["document"])
    out = []
    for claim in claims:
        certified = certified_value(claim["field"], cert)
        record = {**claim, "certified": certified, "verdict": verdict(claim["field"], claim["claimed"], certified)}
        if record["verdict"] == "unknown":
            lower, upper = rank_bounds(certified)
            proven = f"rank ≥ {lower}" if upper is None else f"{lower} ≤ rank ≤ {upper}"
            record["reason"] = (f"the certificate proves {proven} only, which neither proves nor excludes the "
                                f"claimed rank {claim['claimed']}")
        if record["verdict"] != "agree":
            record["certificate"] = os.path.join(folder, file_name(task.key, task.kind))
            record["digest"] = result["digest"]
            os.makedirs(folder, exist_ok=True)
            write_atomically(record["certificate"], result["document"])
        out.append(record)
    return out


def write_report(records: list, form: str, output: str | None) -> None:
    """The records as CSV (header COLUMNS, lists as text) or JSONL (one object per record, the same keys,
    native JSON values)."""
    if form == "jsonl":
        text = "".join(json.dumps(record, ensure_ascii=False) + "\n" for record in records)
    else:
        buffer = io.StringIO()
        writer = csv.DictWriter(buffer, COLUMNS, lineterminator="\n")
        writer.writeheader()
        writer.writerows({column: as_text(value) for column, value in record.items()} for record in records)
        text = buffer.getvalue()
    emit(text, output)
