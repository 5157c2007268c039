"""The README's example outputs are real: every console block marked
``<!-- example: checked by tests/test_readme_examples.py -->`` is run, command by command and block after
block, in one empty folder, and what each command prints must be what the README shows (times, rates and
dates aside); the release's published source digest must be the verifier's. ``python
tests/test_readme_examples.py --write`` regenerates both in README.md after a change."""
from __future__ import annotations

import os
import re
import stat
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
README = ROOT / "README.md"
MARK = "<!-- example: checked by tests/test_readme_examples.py -->"
DIGEST_MARK = "<!-- source digest: checked by tests/test_readme_examples.py -->"
TRUST_MARK = "<!-- trusted files: checked by tests/test_readme_examples.py -->"
KINDS = {"torsion": "certify-torsion", "isogeny": "certify-isogeny-class", "conductor": "certify-conductor",
         "rank": "certify-rank"}
"""The verifier module of each certificate kind, and its format."""
BLOCK = re.compile(re.escape(MARK) + r"\n```console\n(.*?)```", re.S)
VOLATILE = [(re.compile(r"\d+\.\d+ s\b"), "T s"), (re.compile(r"\d+\.\d+ curves/s"), "R curves/s"),
            (re.compile(r"\d+ s left"), "S s left"), (re.compile(r"file SHA-256  sha256:[0-9a-f]{64}"), "file SHA-256")]
"""What changes from run to run: times, rates, estimates, and the SHA-256 of a bundle file, whose unhashed
metadata block records when it was written."""


def normalise(text: str) -> str:
    for pattern, replacement in VOLATILE:
        text = pattern.sub(replacement, text)
    return text


def tools(folder: Path) -> dict:
    """An environment whose `certify`, `python` and `python3` are this interpreter and this checkout."""
    bin_dir = folder / ".bin"
    bin_dir.mkdir()
    for name in ("python", "python3"):
        (bin_dir / name).symlink_to(sys.executable)
    wrapper = bin_dir / "certify"
    wrapper.write_text(f"#!/bin/sh\nexec {sys.executable} -m certify \"$@\"\n")
    wrapper.chmod(wrapper.stat().st_mode | stat.S_IEXEC)
    return dict(os.environ, PATH=f"{bin_dir}{os.pathsep}{os.environ['PATH']}", PYTHONPATH=str(ROOT),
                COLUMNS="100")


def run_blocks(text: str, folder: Path) -> list:
    """[(block text as in the README, block text as the commands print it now)]."""
    environment, out = tools(folder), []
    for match in BLOCK.finditer(text):
        shown, produced = match.group(1), []
        for chunk in re.split(r"^(?=\$ )", shown, flags=re.M):
            if not chunk.startswith("$ "):
                continue
            command, _, expected = chunk.partition("\n")
            if command.startswith("$ cat ") and expected:  # a file the example shows: write it first
                (folder / command[6:].strip()).write_text(expected)
            result = subprocess.run(command[2:], shell=True, cwd=folder, env=environment, capture_output=True,
                                    text=True, timeout=300)
            produced.append(command + "\n" + result.stdout + result.stderr)
        out.append((shown, "".join(produced)))
    return out


def published_digest() -> str:
    from certify.verifier import VERSION
    from certify.verifier.kit import package_files, source_digest

    return f"verifier {VERSION}, source digest `{source_digest(package_files())}`"


def verifier_imports(module: str) -> set:
    """The verifier modules ``module`` imports, directly or through others (read from the source)."""
    import ast

    seen, todo = set(), [module]
    while todo:
        name = todo.pop()
        if name in seen:
            continue
        seen.add(name)
        tree = ast.parse((ROOT / "certify" / "verifier" / f"{name}.py").read_text(encoding="utf-8"))
        for node in ast.walk(tree):
            if isinstance(node, ast.ImportFrom) and (node.module or "").startswith("certify.verifier."):
                todo.append(node.module.split(".")[2])
    return seen


def lines(module: str) -> int:
    return len((ROOT / "certify" / "verifier" / f"{module}.py").read_text(encoding="utf-8").splitlines())


def trusted_table() -> str:
    """The README's table of what a referee reads to trust one kind of certificate: the modules its checks
    import, and the modules every kind goes through (reading, the schema step, digests, reports)."""
    front = (verifier_imports("cli") | verifier_imports("__init__")) - set(KINDS)
    rows = ["| certificate kind | verifier modules its checks rely on | lines |", "| --- | --- | --- |"]
    for kind, name in KINDS.items():
        modules = sorted(verifier_imports(kind))
        rows.append(f"| `{name}` | " + ", ".join(f"`{m}.py` ({lines(m)})" for m in modules)
                    + f" | {sum(map(lines, modules))} |")
    shared = sorted(front - set().union(*(verifier_imports(kind) for kind in KINDS)))
    rows.append("| every kind: reading, schema step, digests, report | " + ", ".join(f"`{m}.py` ({lines(m)})"
                                                                                  for m in shared)
                + f" | {sum(map(lines, shared))} |")
    return "\n".join(rows) + "\n"


def test_the_table_of_trusted_files_is_current():
    text = README.read_text(encoding="utf-8")
    assert text.split(TRUST_MARK + "\n", 1)[1].startswith(trusted_table()), \
        "run `python tests/test_readme_examples.py --write`"


def test_readme_examples_are_what_the_commands_print(tmp_path):
    text = README.read_text(encoding="utf-8")
    blocks = run_blocks(text, tmp_path)
    assert blocks, "no checked example in the README"
    for shown, produced in blocks:
        assert normalise(shown) == normalise(produced), "run `python tests/test_readme_examples.py --write`"


def test_the_published_source_digest_is_the_verifiers():
    """The digest a referee compares a kit's source with (README, "Which verifier ran")."""
    text = README.read_text(encoding="utf-8")
    line = text.split(DIGEST_MARK + "\n", 1)[1].split("\n", 1)[0]
    assert line == published_digest(), "run `python tests/test_readme_examples.py --write`"


def write() -> None:
    import tempfile

    text = README.read_text(encoding="utf-8")
    with tempfile.TemporaryDirectory() as folder:
        for shown, produced in run_blocks(text, Path(folder)):
            text = text.replace(MARK + "\n```console\n" + shown + "```", MARK + "\n```console\n" + produced + "```", 1)
    head, tail = text.split(DIGEST_MARK + "\n", 1)
    text = head + DIGEST_MARK + "\n" + published_digest() + "\n" + tail.split("\n", 1)[1]
    head, tail = text.split(TRUST_MARK + "\n", 1)
    rest = tail.split("\n\n", 1)[1]
    text = head + TRUST_MARK + "\n" + trusted_table() + "\n" + rest
    README.write_text(text, encoding="utf-8")


if __name__ == "__main__" and sys.argv[1:] == ["--write"]:
    sys.path.insert(0, str(ROOT))
    write()
