"""Mutation testing of the trusted core ``certify/verifier/`` (issue 15): is every check load-bearing?

Each mutant is the smallest change that weakens (or shifts) one check of the verifier:

- ``delete-raise``: a ``raise Rejection(...)`` becomes ``pass``;
- ``compare``: one comparison of a condition moves across its boundary or turns over
  (< ↔ <=, > ↔ >=, == ↔ !=, in ↔ not in, is ↔ is not);
- ``drop-not``: the ``not`` of a condition leading to a rejection is removed;
- ``drop-operand``: one operand of an ``or`` leading to a rejection becomes False, of an ``and`` True;
- ``constant``: an integer constant goes up by one: every bound of ``limits.py``, every module-level
  constant (Mazur's and Kenku's bounds, the j-lists, the Miller–Rabin bases and bound), and every constant
  in a condition of the mathematical modules (``p <= 2``, ``n < 2``, ``e < 1``). The constants inside the
  formulas (b-invariants, division polynomials) are left out: any accepted certificate kills those.

The mutants are made on the source text from the AST (a mutant replaces the exact span of one node),
in a copy of the repository, so nothing in the working tree changes; for each one the test files that
exercise its module (``TESTS``) run one after the other, up to the first that fails, with
``pytest -x -q -p no:cacheprovider`` under a timeout. A mutant
is *killed* when some test fails, *timeout* when the tests do not end in time (the mutant loops: also
detected), *equivalent* when a ``mutation_equivalent*.txt`` file beside this one gives the reason it computes
the same result, and otherwise a *survivor*.

The maintained mutation-testing libraries (mutmut, cosmic-ray) were set aside: both change the files of
the tree they run in (this checkout is shared by several developers at once), neither has the
per-check operators above (deleting one ``raise``, dropping one operand of the condition leading to
it, shifting a documented limit), and their generic string and operator mutants would bury the
checks among rejection messages.
"""
import ast
import hashlib
import os
import shutil
import subprocess
import sys
import tempfile
import time
from dataclasses import dataclass
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
VERIFIER = "certify/verifier"
EQUIVALENT_FILES = "mutation_equivalent*.txt"
"""Beside this file, one per group of modules: ``identifier | reason`` for each mutant shown equivalent."""

SURVIVOR_TESTS = ("tests/test_mutation_survivors.py", "tests/test_mutation_survivors_core.py",
                  "tests/test_mutation_survivors_isogeny.py",
                  "tests/test_mutation_survivors_rank.py",
                  "tests/test_mutation_survivors_analytic.py", "tests/test_mutation_survivors_conductor.py",
                  "tests/test_mutation_survivors_files.py")
"""The tests written to kill the mutants that survived a first run, one file per group of modules; they
run (those that exist) for a mutant the module's tests do not kill."""

SURVIVOR_GROUP = {"tests/test_mutation_survivors_core.py": ("arith.py", "curves.py", "torsion.py"),
                  "tests/test_mutation_survivors_isogeny.py": ("isogeny.py",),
                  "tests/test_mutation_survivors_rank.py": ("rank.py", "descent.py"),
                  "tests/test_mutation_survivors_analytic.py": ("lseries.py", "intervals.py"),
                  "tests/test_mutation_survivors_conductor.py": ("tate.py", "conductor.py", "primality.py", "models.py")}
"""The survivor-test file of each group of mathematical modules; for the other modules it is
test_mutation_survivors_files.py. A mutant's own group's file runs first among SURVIVOR_TESTS, so that a
mutant those tests kill stops there."""


def survivor_tests(module: str) -> tuple:
    """SURVIVOR_TESTS with the file of the module's group first."""
    own = next((name for name, modules in SURVIVOR_GROUP.items() if module in modules),
               "tests/test_mutation_survivors_files.py")
    return (own,) + tuple(name for name in SURVIVOR_TESTS if name != own)

PRELOADED = ("pytest", "hypothesis", "sympy", "cypari2", "jsonschema")
"""Imported once by a forking runner, before it forks a child per mutant: none of them imports certify."""

_TORSION = ("tests/test_torsion_hostile.py", "tests/test_soundness_false_claims.py",
            "tests/test_soundness_bad_witnesses.py", "tests/test_soundness_foreign_evidence.py",
            "tests/test_soundness_duplicates.py", "tests/test_soundness_spellings.py", "tests/test_torsion_oracles.py",
            "tests/test_soundness_limits.py")
_ISOGENY = ("tests/test_isogeny_kohel.py", "tests/test_isogeny_hostile.py", "tests/test_soundness_false_claims.py",
            "tests/test_soundness_bad_witnesses.py", "tests/test_soundness_foreign_evidence.py",
            "tests/test_soundness_duplicates.py", "tests/test_soundness_spellings.py", "tests/test_soundness_limits.py",
            "tests/test_isogeny_traps.py")
_CONDUCTOR = ("tests/test_conductor_local.py", "tests/test_primality.py", "tests/test_conductor_traps.py",
              "tests/test_conductor_hostile.py")
_RANK = ("tests/test_rank_claim_tampering.py", "tests/test_rank_hostile.py", "tests/test_descent_lemmas.py", "tests/test_rank_hostile_cost.py",
         "tests/test_rank_examples.py")
_ANALYTIC = ("tests/test_analytic.py", "tests/test_frobenius_hints.py", "tests/test_analytic_hostile.py")
_FILES = ("tests/test_hostile_json.py", "tests/test_hostile_stores.py", "tests/test_hostile_printing.py",
          "tests/test_report.py", "tests/test_digest.py", "tests/test_bundle.py", "tests/test_kit.py")



def _files(*groups) -> tuple:
    """The test files of the groups in order, each once."""
    return tuple(dict.fromkeys(name for group in groups for name in group))


TESTS = {
    "arith.py": _files(("tests/test_soundness_spellings.py", "tests/test_torsion_oracles.py",
                        "tests/test_isogeny_kohel.py", "tests/test_primality.py"), _TORSION, _ISOGENY),
    "curves.py": _files(("tests/test_torsion_oracles.py", "tests/test_isogeny_kohel.py",
                         "tests/test_conductor_local.py"), _TORSION, _ISOGENY),
    "torsion.py": _TORSION,
    "isogeny.py": _ISOGENY,
    "models.py": _files(("tests/test_torsion_hostile.py", "tests/test_isogeny_hostile.py",
                         "tests/test_conductor_hostile.py", "tests/test_conductor_traps.py"), _ISOGENY),
    "primality.py": _CONDUCTOR,
    "tate.py": _CONDUCTOR,
    "conductor.py": _CONDUCTOR,
    "rank.py": _RANK,
    "descent.py": _RANK,
    "lseries.py": _ANALYTIC,
    "intervals.py": _ANALYTIC,
    "__init__.py": ("tests/test_structure.py", "tests/test_hostile_json.py", "tests/test_soundness_spellings.py",
                    "tests/test_api.py", "tests/test_schema_agreement.py"),
    "certificate.py": _files(("tests/test_hostile_json.py", "tests/test_soundness_spellings.py"), _TORSION, _ISOGENY),
    "errors.py": ("tests/test_report.py", "tests/test_hostile_printing.py", "tests/test_cli.py"),
    "limits.py": ("tests/test_soundness_limits.py", "tests/test_hostile_cost.py", "tests/test_hostile_memory.py",
                  "tests/test_hostile_json.py", "tests/test_hostile_stores.py", "tests/test_hostile_printing.py",
                  "tests/test_conductor_hostile.py", "tests/test_isogeny_hostile.py", "tests/test_torsion_hostile.py"),
    "schema.py": ("tests/test_structure.py", "tests/test_isogeny_schema.py", "tests/test_schema_agreement.py"),
    "sources.py": _FILES,
    "digest.py": ("tests/test_digest.py", "tests/test_bundle.py", "tests/test_kit.py"),
    "kit.py": ("tests/test_kit.py", "tests/test_bundle.py"),
    "report.py": ("tests/test_report.py", "tests/test_hostile_printing.py", "tests/test_kit.py", "tests/test_cli.py"),
    "cli.py": ("tests/test_hostile_printing.py", "tests/test_kit.py", "tests/test_report.py", "tests/test_cli.py"),
}
"""Verifier module → the test files that exercise it (theorems.py, which holds statements and no check, is left
out), the most direct first (``-x`` stops at the first failure).
Left out for time, since a surviving mutant costs the whole list: the table and family runs
(test_torsion_families, test_isogeny_table, test_minimality_lemma) and the command-line tests of the
mathematical modules; test_hostile_cost runs for limits.py."""

MATHEMATICAL = ("arith.py", "curves.py", "torsion.py", "isogeny.py", "models.py", "primality.py", "tate.py",
                "conductor.py", "rank.py", "descent.py", "lseries.py", "intervals.py")
"""The modules whose constants in conditions are mutated (elsewhere only the module-level constants), and
from which the quick sample is drawn."""

_FLIP = {ast.Lt: ast.LtE, ast.LtE: ast.Lt, ast.Gt: ast.GtE, ast.GtE: ast.Gt, ast.Eq: ast.NotEq, ast.NotEq: ast.Eq,
         ast.In: ast.NotIn, ast.NotIn: ast.In, ast.Is: ast.IsNot, ast.IsNot: ast.Is}


@dataclass(frozen=True)
class Mutant:
    module: str
    identifier: str
    """module:function:operator:original->mutated[#k], stable while the function's code is."""
    line: int
    start: tuple
    end: tuple
    replacement: str

    def apply(self, source: str) -> str:
        lines = source.splitlines(keepends=True)
        offset = [0]
        for text in lines:
            offset.append(offset[-1] + len(text.encode()))
        data = source.encode()
        begin = offset[self.start[0] - 1] + self.start[1]
        finish = offset[self.end[0] - 1] + self.end[1]
        return (data[:begin] + self.replacement.encode() + data[finish:]).decode()


def _is_rejection_raise(node) -> bool:
    return (isinstance(node, ast.Raise) and isinstance(node.exc, ast.Call)
            and getattr(node.exc.func, "id", None) == "Rejection")


def _leads_to_rejection(node) -> bool:
    return isinstance(node, ast.If) and any(_is_rejection_raise(statement) for statement in node.body)


class _Collector(ast.NodeVisitor):
    def __init__(self, module: str, source: str):
        self.module, self.source, self.scope, self.found = module, source, [], []
        self.conditions = []   # the tests of if, while, conditional expressions and comparisons around a node
        self.silent = 0   # inside a Rejection(...) call: messages and reported values, not checks

    def add(self, operator: str, node, replacement: str, original: str = None) -> None:
        original = ast.get_source_segment(self.source, node) if original is None else original
        label = f"{self.module}:{'.'.join(self.scope) or '<module>'}:{operator}:{' '.join(original.split())[:80]}->" \
                f"{' '.join(replacement.split())[:80]}"
        same = sum(1 for m in self.found if m.identifier.split("#")[0] == label)
        self.found.append(Mutant(self.module, label + (f"#{same + 1}" if same else ""), node.lineno,
                                 (node.lineno, node.col_offset), (node.end_lineno, node.end_col_offset), replacement))

    def visit_FunctionDef(self, node):
        self.scope.append(node.name)
        for statement in node.body[1:] if ast.get_docstring(node) else node.body:
            self.visit(statement)
        self.scope.pop()

    def visit_ClassDef(self, node):
        self.visit_FunctionDef(node)

    def visit_Assign(self, node):
        if not self.scope and isinstance(node.targets[0], ast.Name):
            self.scope.append(node.targets[0].id)
            self.generic_visit(node)
            self.scope.pop()
        else:
            self.generic_visit(node)

    def visit_Raise(self, node):
        if _is_rejection_raise(node):
            self.add("delete-raise", node, "pass", original="raise " + node.exc.func.id)
        self.generic_visit(node)

    def visit_Call(self, node):
        rejection = getattr(node.func, "id", None) == "Rejection"
        self.silent += rejection
        self.generic_visit(node)
        self.silent -= rejection

    def visit_If(self, node):
        if _leads_to_rejection(node):
            self.relax(node.test)
        self.condition(node)

    def condition(self, node):
        self.conditions.append(node.test)
        self.visit(node.test)
        self.conditions.pop()
        for child in ast.iter_child_nodes(node):
            if child is not node.test:
                self.visit(child)

    visit_While = visit_IfExp = condition

    def relax(self, test) -> None:
        """The condition leading to a rejection, weakened: its ``not`` dropped, an operand of or/and dropped."""
        if isinstance(test, ast.UnaryOp) and isinstance(test.op, ast.Not):
            self.add("drop-not", test, "(" + ast.get_source_segment(self.source, test.operand) + ")")
            self.relax(test.operand)
        elif isinstance(test, ast.BoolOp):
            neutral = "False" if isinstance(test.op, ast.Or) else "True"
            for operand in test.values:
                self.add("drop-operand", operand, neutral)
                self.relax(operand)

    def visit_Compare(self, node):
        if not self.silent:
            for i, op in enumerate(node.ops):
                flipped = ast.Compare(left=node.left, ops=list(node.ops), comparators=node.comparators)
                flipped.ops[i] = _FLIP[type(op)]()
                self.add("compare", node, "(" + ast.unparse(flipped) + ")")
        self.conditions.append(node)
        self.generic_visit(node)
        self.conditions.pop()

    def visit_Constant(self, node):
        value = node.value
        in_condition = self.conditions and self.module in MATHEMATICAL
        module_level = not self.scope or self.scope[0].isupper()
        if type(value) is int and not self.silent and (module_level or in_condition):
            context = ast.get_source_segment(self.source, self.conditions[-1]) + ": " if in_condition else ""
            self.add("constant", node, str(value + 1), original=context + ast.get_source_segment(self.source, node))

    def visit_JoinedStr(self, node):
        pass   # f-strings are messages


def mutants(root: Path = ROOT, modules=None) -> list:
    """Every mutant of the verifier modules (all of ``TESTS`` by default), in source order."""
    found = []
    for module in modules or TESTS:
        source = (root / VERIFIER / module).read_text()
        collector = _Collector(module, source)
        collector.visit(ast.parse(source))
        tree = ast.dump(ast.parse(source))
        for mutant in collector.found:
            try:
                if ast.dump(ast.parse(mutant.apply(source))) != tree:
                    found.append(mutant)
            except SyntaxError:
                pass
    return found


def quick_sample(all_mutants: list, size: int) -> list:
    """A fixed sample: the mathematical modules' mutants with the smallest SHA-256 of their identifiers, so
    that the sample does not move when unrelated code changes."""
    candidates = [m for m in all_mutants if m.module in MATHEMATICAL]
    return sorted(candidates, key=lambda m: hashlib.sha256(m.identifier.encode()).hexdigest())[:size]


def equivalent_reasons(directory: Path = Path(__file__).parent) -> dict:
    """identifier → reason, from the lines ``identifier | reason`` of every EQUIVALENT_FILES file (``#``
    starts a comment line)."""
    reasons = {}
    for line in (line for path in sorted(directory.glob(EQUIVALENT_FILES)) for line in path.read_text().splitlines()):
        if line.strip() and not line.startswith("#"):
            identifier, _, reason = line.partition(" | ")
            reasons[identifier.strip()] = reason.strip()
    return reasons


TEST_SECONDS = 60
"""In a forked run, the longest one test may take (the slowest test of the lists takes a few seconds alone,
and several times as long when several runs share the 2 cores): a mutant that makes the verifier loop is
stopped in the first test it traps rather than at the mutant's timeout."""

NO_TESTS_COLLECTED = 5
"""pytest's exit status for a file none of whose tests is selected (the ``table`` marker): not a failure."""

TIMEOUT_RECORD = ".test-timeout"
"""The file, in the copy, to which the watchdog writes the stack of a test that ran over TEST_SECONDS."""


class _TestWatchdog:
    """A pytest plugin that ends the process when one test, fixtures included, or the collection (which
    builds the certificate pools) runs over TEST_SECONDS, after writing the stacks to TIMEOUT_RECORD.
    It is faulthandler's watchdog thread, not a signal: the tests' code sets SIGALRM alarms of its own
    (the certifier's factoring limit, through cysignals, which interrupts PARI only with its own
    handler), and a loop inside PARI is stopped as surely as one in Python."""

    def __init__(self, record):
        self.record = record

    def _arm(self) -> None:
        import faulthandler
        faulthandler.dump_traceback_later(TEST_SECONDS, exit=True, file=self.record)

    def _disarm(self) -> None:
        import faulthandler
        faulthandler.cancel_dump_traceback_later()

    def pytest_sessionstart(self, session):
        self._arm()

    def pytest_runtest_logstart(self, nodeid, location):
        self._arm()

    def pytest_runtest_logfinish(self, nodeid, location):
        self._disarm()


class Workspace:
    """A copy of the repository (its committed tree when it is a git checkout, plus ``extra`` files from the
    working tree) in which one module at a time is mutated. Its runner forks: it imports ``PRELOADED`` once,
    and nothing of certify, so a process with threads must not use it."""

    def __init__(self, root: Path = ROOT, extra=()):
        self.directory = Path(tempfile.mkdtemp(prefix="certify-mutation-"))
        if (root / ".git").exists():
            archive = subprocess.run(["git", "-C", str(root), "archive", "HEAD"], check=True, capture_output=True)
            subprocess.run(["tar", "-x", "-C", str(self.directory)], input=archive.stdout, check=True)
        else:
            shutil.copytree(root, self.directory, dirs_exist_ok=True,
                            ignore=shutil.ignore_patterns(".git", "__pycache__", ".hypothesis", "*.egg-info"))
        for name in extra:
            shutil.copy2(root / name, self.directory / name)
        self.environment = dict(PYTHONPATH=str(self.directory), PYTHONDONTWRITEBYTECODE="1")
        for library in PRELOADED:
            __import__(library)

    def run(self, tests, timeout: float) -> str:
        """'passed', 'failed' or 'timeout' for the test files in this copy as it stands: pytest in a child
        forked from this process (about a second saved per mutant), which imports the verifier and the tests
        afresh, from the copy, which also comes first on the path of any process a test starts. The child
        runs one file after the other and stops at the first that fails, so that a mutant killed by the
        first file does not pay for collecting the others."""
        shutil.rmtree(self.directory / ".hypothesis", ignore_errors=True)
        present = [t for t in tests if (self.directory / t).exists()]
        record = self.directory / TIMEOUT_RECORD
        record.write_text("")
        child = os.fork()
        if child == 0:   # the child: never returns
            status = 3
            try:
                os.setsid()
                null = os.open(os.devnull, os.O_WRONLY)
                os.dup2(null, 1)
                os.dup2(null, 2)
                os.chdir(self.directory)
                os.environ.update(self.environment)
                sys.path[:0] = [str(self.directory), str(self.directory / "tests")]
                import pytest
                watch = _TestWatchdog(open(record, "w"))
                for name in present:
                    status = int(pytest.main(["-x", "-q", "-p", "no:cacheprovider", "--rootdir", str(self.directory),
                                              name], plugins=[watch]))
                    status = 0 if status == NO_TESTS_COLLECTED else status
                    if status:
                        break
            finally:
                os._exit(status)
        deadline = time.monotonic() + timeout
        while True:
            done, status = os.waitpid(child, os.WNOHANG)
            if done:
                code = os.waitstatus_to_exitcode(status)
                return "passed" if code == 0 else "timeout" if record.stat().st_size else "failed"
            if time.monotonic() > deadline:
                os.killpg(child, 9)
                os.waitpid(child, 0)
                return "timeout"
            time.sleep(0.02)

    def outcome(self, mutant: Mutant, timeout: float) -> str:
        """'killed', 'timeout', 'killed by new test' or 'survived' for one mutant (the module is restored
        afterwards): the module's tests run first, and only if they all pass the tests of SURVIVOR_TESTS, so
        that one run gives the figures before and after those tests; a timeout of either run is a timeout."""
        path = self.directory / VERIFIER / mutant.module
        original = path.read_text()
        try:
            path.write_text(mutant.apply(original))
            result = self.run(TESTS[mutant.module], timeout)
            if result == "passed" and any((self.directory / name).exists() for name in SURVIVOR_TESTS):
                result = {"failed": "new", "timeout": "timeout"}.get(self.run(survivor_tests(mutant.module), timeout),
                                                                     "passed")
        finally:
            path.write_text(original)
        return {"passed": "survived", "failed": "killed", "timeout": "timeout", "new": "killed by new test"}[result]

    def close(self) -> None:
        shutil.rmtree(self.directory, ignore_errors=True)


def baseline_seconds(workspace: Workspace, modules) -> float:
    """The unmutated run time of all the modules' test files together (which must pass: else no mutant
    can be judged); a bound on the time of any one module's tests."""
    start = time.perf_counter()
    if workspace.run(_files(*(TESTS[module] for module in modules)), timeout=3600) != "passed":
        raise RuntimeError("the tests fail without any mutant")
    return time.perf_counter() - start


def run(selected: list, workspace: Workspace, progress=None, timeout=None) -> list:
    """[(mutant, outcome, seconds)] with outcome killed / timeout / killed by new test / equivalent / survived. Each mutant has
    ``timeout`` seconds, or by default twice the unmutated run of all their tests plus 20."""
    reasons = equivalent_reasons()
    timeout = timeout or 2 * baseline_seconds(workspace, sorted({m.module for m in selected})) + 20
    results = []
    for mutant in selected:
        start = time.perf_counter()
        outcome = workspace.outcome(mutant, timeout)
        if outcome == "survived" and mutant.identifier in reasons:
            outcome = "equivalent"
        results.append((mutant, outcome, time.perf_counter() - start))
        if progress:
            progress(mutant, outcome, results[-1][2])
    return results


def quick(size: int, timeout: float) -> int:
    """The quick mode: the fixed sample of ``size`` mutants not shown equivalent, each given ``timeout``
    seconds; prints one line per mutant and returns the number of survivors. Meant to run in a process of
    its own, which forks a child per mutant (``tests/test_mutation_quick.py`` starts it)."""
    reasons = equivalent_reasons()
    extra = [name for name in SURVIVOR_TESTS if (ROOT / name).exists()]
    workspace = Workspace(extra=extra)
    try:
        sample = quick_sample([m for m in mutants(workspace.directory) if m.identifier not in reasons], size)
        results = run(sample, workspace, lambda m, outcome, seconds: print(f"{outcome}: {m.identifier} "
                                                                           f"({seconds:.1f} s)", flush=True),
                      timeout)
    finally:
        workspace.close()
    return sum(1 for _, outcome, _ in results if outcome == "survived")


if __name__ == "__main__":
    size, timeout = (int(sys.argv[1]), float(sys.argv[2])) if len(sys.argv) == 3 else (10, 60)
    sys.exit(1 if quick(size, timeout) else 0)
