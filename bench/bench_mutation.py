"""Mutation testing of the verifier, full mode (issue 15): every mutant of ``tests/mutation_run.py``
against the tests of its module, one process at a time; prints each survivor and the per-module table
(mutants made, killed, timeout, equivalent, survivors, seconds).

    python bench/bench_mutation.py                     # every verifier module
    python bench/bench_mutation.py torsion.py tate.py  # some modules
    python bench/bench_mutation.py --jsonl out.jsonl   # also one JSON line per mutant
    python bench/bench_mutation.py --only ids.txt      # the mutants listed (e.g. an earlier run's survivors)
    python bench/bench_mutation.py --shard 1/2 --jsonl b.jsonl   # every second mutant, from the second on
    python bench/bench_mutation.py --report a.jsonl --report b.jsonl [MODULES]   # earlier runs' table

With ``--report`` the outcome of each current mutant is the last one the files record (a later file, say
a rerun of the survivors after new tests, overrides an earlier one); a survivor that a
``mutation_equivalent*.txt`` file now explains counts as equivalent; mutants no file records are listed as
not run, and so are mutants whose identifier changed with the code since.
"""
import argparse
import json
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent / "tests"))
import mutation_run  # noqa: E402


def table(results: list) -> str:
    rows = {}
    for mutant, outcome, seconds in results:
        row = rows.setdefault(mutant.module, {"made": 0, "killed": 0, "timeout": 0, "killed by new test": 0,
                                              "equivalent": 0, "survived": 0, "seconds": 0.0})
        row["made"] += 1
        row[outcome] += 1
        row["seconds"] += seconds
    total = {key: sum(row[key] for row in rows.values()) for key in next(iter(rows.values()))} if rows else {}
    lines = ["Before the new tests, a mutant killed only by tests/test_mutation_survivors.py survived; after them,",
             "the survivors are those neither killed nor explained in the tests/mutation_equivalent*.txt files.",
             "| module | mutants | killed | timeout | survivors before | killed by new tests | equivalent "
             "| survivors after | seconds |",
             "| --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: |"]
    for module, row in list(rows.items()) + [("total", total)]:
        before = row["killed by new test"] + row["equivalent"] + row["survived"]
        lines.append(f"| {module} | {row['made']} | {row['killed']} | {row['timeout']} | {before} | "
                     f"{row['killed by new test']} | {row['equivalent']} | {row['survived']} | {row['seconds']:.0f} |")
    return "\n".join(lines)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("modules", nargs="*", help="verifier modules (default: all, mathematical ones first)")
    parser.add_argument("--jsonl", help="write one JSON line per mutant to this file")
    parser.add_argument("--only", help="run only the mutants whose identifiers this file lists, one a line")
    parser.add_argument("--timeout", type=float, help="seconds per mutant (default: twice the unmutated run of "
                        "all the tests involved, plus 20)")
    parser.add_argument("--resume", action="store_true", help="keep the outcomes already in the --jsonl file "
                        "and run only the other mutants")
    parser.add_argument("--shard", metavar="K/N", help="run only the mutants K, K + N, K + 2N, … (from 0) of the "
                        "selection: N such runs side by side, one a core, together make the whole run")
    parser.add_argument("--report", action="append", metavar="JSONL",
                        help="print the table of this earlier run (repeat for several, later ones override)")
    args = parser.parse_args()
    if args.report:
        return report(args.report, args.modules)
    modules = args.modules or list(mutation_run.MATHEMATICAL) + [m for m in mutation_run.TESTS
                                                                  if m not in mutation_run.MATHEMATICAL]
    extra = [name for name in mutation_run.SURVIVOR_TESTS if (mutation_run.ROOT / name).exists()]
    workspace = mutation_run.Workspace(extra=extra)
    selected = mutation_run.mutants(workspace.directory, modules)
    if args.only:
        wanted = set(Path(args.only).read_text().splitlines())
        selected = [mutant for mutant in selected if mutant.identifier in wanted]
    if args.shard:
        index, count = map(int, args.shard.split("/"))
        selected = selected[index::count]
    print(f"{len(selected)} mutants of {len(modules)} modules", flush=True)
    earlier = {}
    if args.resume and args.jsonl and Path(args.jsonl).exists():
        earlier = {row["id"]: row for row in map(json.loads, Path(args.jsonl).read_text().splitlines())}
    out = open(args.jsonl, "a" if earlier else "w") if args.jsonl else None

    def progress(mutant, outcome, seconds):
        if outcome in ("survived", "killed by new test", "equivalent"):
            print(f"{outcome}: {mutant.identifier} (line {mutant.line})", flush=True)
        if out:
            out.write(json.dumps({"id": mutant.identifier, "module": mutant.module, "line": mutant.line,
                                  "outcome": outcome, "seconds": round(seconds, 2)}) + "\n")
            out.flush()

    start = time.perf_counter()
    try:
        results = mutation_run.run([m for m in selected if m.identifier not in earlier], workspace, progress,
                                   args.timeout)
        results += [(m, earlier[m.identifier]["outcome"], earlier[m.identifier]["seconds"])
                    for m in selected if m.identifier in earlier]
    finally:
        workspace.close()
    print(table(results))
    print(f"run: {time.perf_counter() - start:.0f} s, one process" + (f", shard {args.shard}" if args.shard else ""))


def report(paths: list, modules: list) -> None:
    """The table, the unexplained survivors and the mutants not run, from the JSON lines of earlier runs."""
    recorded = {}
    for path in paths:
        for row in map(json.loads, Path(path).read_text().splitlines()):
            recorded[row["id"]] = row
    reasons = mutation_run.equivalent_reasons()
    results, missing = [], []
    for mutant in mutation_run.mutants(mutation_run.ROOT, modules or None):
        row = recorded.get(mutant.identifier)
        if row is None:
            missing.append(mutant)
            continue
        outcome = "equivalent" if row["outcome"] == "survived" and mutant.identifier in reasons else row["outcome"]
        results.append((mutant, outcome, row["seconds"]))
    print(table(results))
    for mutant, outcome, _ in results:
        if outcome == "survived":
            print(f"unexplained survivor: {mutant.identifier} (line {mutant.line})")
    for mutant in missing:
        print(f"not run: {mutant.identifier} (line {mutant.line})")
    print(f"{len(results)} mutants recorded, {len(missing)} not run; {sum(s for _, _, s in results):.0f} s of runs")


if __name__ == "__main__":
    main()
