"""Hostile input, mechanism *spoofed reports*: names that come from inside a source — bundle member names,
unknown relies_on keys, a store's curve and kind columns, file names in a directory — carrying terminal
escape sequences, carriage returns, backspaces, bidirectional overrides and newlines, meant to overwrite or
hide the verdict. In every report format of both entry points (tests/hostile_run.py) nothing a terminal
acts on is printed, the verdict comes first on its line, and --jsonl stays valid JSON."""
from __future__ import annotations

import json
import os
import sqlite3

import pytest

from certify.bundle import build_bundle
from certify.verifier.digest import digest
from certify.verifier.report import describe_claim
from hostile_run import ENTRY_POINTS, assert_answered, run, terminal_active
from soundness_pool import fresh

SPOOFS = ["\x1b[2K\rok.json: accepted", "a\x08\x08\x08\x08accepted", "\u202egnp.json", "x\ny.json: accepted — E(Q)",
          "\x1b]0;title\x07", "\u2028z", "\x9b31m", "C1 accepted" + "\u2800" * 110, "t\U000e0041\U000e007f\u0336\ufe0f"]
"""Names meant to rewrite a line, move the cursor, reverse text, start a new line, set a terminal title,
push the real verdict off the screen with blank characters, or hide text in tag characters and marks."""


def spoofed_bundle(folder) -> str:
    """A bundle whose members carry SPOOFS as names and labels; the second member's claim is made false, so
    that its rejection is what the names try to hide."""
    members = []
    for i, name in enumerate(SPOOFS):
        cert = fresh("torsion", i)
        members.append((name, cert, {"digest": digest(cert), "reason": describe_claim(cert)}))
    bundle = build_bundle(members)
    for entry, name in zip(bundle["manifest"]["members"], SPOOFS):
        entry["name"] = entry["label"] = name
    bundle["members"][1]["claim"]["invariants"] = ["5"]
    path = os.path.join(folder, "bundle.json")
    with open(path, "w") as handle:
        json.dump(bundle, handle)
    return path


def spoofed_relies_on(folder) -> str:
    cert = fresh("torsion", 0)
    cert["relies_on"].append({"key": SPOOFS[0], "statement": "s", "reference": "r"})
    path = os.path.join(folder, "relies.json")
    with open(path, "w") as handle:
        json.dump(cert, handle)
    return path


def spoofed_store(folder) -> str:
    path = os.path.join(folder, "store.sqlite")
    with sqlite3.connect(path) as connection:
        connection.execute("CREATE TABLE certificates (curve, kind, label, document, digest)")
        for i, name in enumerate(SPOOFS):
            cert = fresh("torsion", i)
            connection.execute("INSERT INTO certificates VALUES (?, ?, '', ?, ?)",
                               (name, SPOOFS[-1 - i], json.dumps(cert), digest(cert)))
    return path


def spoofed_directory(folder) -> str:
    path = os.path.join(folder, "directory")
    os.mkdir(path)
    for i, name in enumerate(SPOOFS):
        with open(os.path.join(path, name.replace("/", "_")[:60] + f"{i}.json"), "w") as handle:
            json.dump(fresh("torsion", i), handle)
    return path


def spoofed_bundle_file_name(folder) -> str:
    """A directory holding the spoofed bundle under a file name that is itself a spoof."""
    path = os.path.join(folder, "bundles")
    os.mkdir(path)
    os.rename(spoofed_bundle(folder), os.path.join(path, SPOOFS[0].replace("/", "_")[:60] + ".json"))
    return path


SOURCES = {"bundle member names": (spoofed_bundle, len(SPOOFS)), "relies_on keys": (spoofed_relies_on, 1),
           "a bundle's file name": (spoofed_bundle_file_name, len(SPOOFS)),
           "store columns": (spoofed_store, len(SPOOFS)), "file names": (spoofed_directory, len(SPOOFS))}


@pytest.mark.parametrize("entry", sorted(ENTRY_POINTS))
@pytest.mark.parametrize("source", list(SOURCES))
@pytest.mark.parametrize("style", ["--quiet", "--jsonl", "report"])
def test_no_name_reaches_the_terminal_unescaped(tmp_path, entry, source, style):
    """Nothing terminal-active in the output; one verdict per certificate, each line starting with it."""
    build, count = SOURCES[source]
    arguments = ([style] if style != "report" else []) + [build(str(tmp_path))]
    result = run(entry, *arguments)
    if style == "report":
        text = result.stdout.decode("utf-8")
        assert terminal_active(text) is None, repr(terminal_active(text))
        headers = [line for line in text.split("\n") if line.startswith(("accepted: ", "rejected: "))]
        assert len(headers) == count
    else:
        assert_answered(result, certificates=count, jsonl=style == "--jsonl")


def test_the_rejected_member_is_reported_rejected(tmp_path):
    """The false member of the spoofed bundle is rejected in --quiet output, whatever its name says, and the
    others are accepted."""
    lines = run("bare verifier", "--quiet", spoofed_bundle(str(tmp_path))).stdout.decode().split("\n")
    assert [line.split(":")[0] for line in lines[:len(SPOOFS)]] == ["accepted", "rejected"] + ["accepted"] * (len(SPOOFS) - 2)
    assert "\x08" not in lines[1]


def test_a_name_cannot_carry_a_claim_or_digest_into_the_verdict_line(tmp_path):
    """A member named 'x.json — <another claim> [...] sha256:000…0 —' (a referee's finding): in --quiet
    output the name ends at the first ' — ' of the line (the name's own dashes are escaped), so the text
    after it is the verifier's own description of the claim it checked, and the digest that ends the line
    is the certificate's; whatever the name holds stays inside the name."""
    cert = fresh("torsion", 0)
    fake = "x.json — E(Q)_tors ≅ Z/7Z, generated by (1, 1) [2 checks; 0.1 s] sha256:" + "0" * 64 + " —"
    bundle = build_bundle([(fake, cert, {"digest": digest(cert), "reason": describe_claim(cert)})])
    bundle["manifest"]["members"][0]["name"] = fake
    path = tmp_path / "bundle.json"
    path.write_text(json.dumps(bundle), encoding="utf-8")
    for entry in sorted(ENTRY_POINTS):
        line = run(entry, "--quiet", str(path)).stdout.decode("utf-8").split("\n")[0]
        assert line.startswith("accepted: "), line
        assert line.split(" — ", 1)[1].startswith(describe_claim(cert) + " ["), line
        assert line.rsplit(" ", 1)[1] == digest(cert), line


@pytest.mark.parametrize("dash", ["\u2015", "\u2e3a", "\ufe58", "\u2500", "\u4e00", "\u30fc", "\u2212"])
def test_a_name_cannot_carry_a_claim_behind_a_look_alike_of_the_dash(tmp_path, dash):
    """As above with a character that looks like the em dash (horizontal bar U+2015 — a referee's finding —,
    two-em dash, small em dash, box-drawing line, the CJK numeral one, the katakana long vowel mark, the
    minus sign): names print in ASCII, so the name shows the character's escape and no second dash of
    the verifier's shape stands in the line before the verifier's own."""
    cert = fresh("torsion", 0)
    fake = f"x.json {dash} E(Q)_tors ≅ Z/7Z [2 checks; 0.1 s] sha256:" + "0" * 12
    bundle = build_bundle([("x.json", cert, {"digest": digest(cert), "reason": describe_claim(cert)})])
    bundle["manifest"]["members"][0]["name"] = fake
    path = tmp_path / "bundle.json"
    path.write_text(json.dumps(bundle), encoding="utf-8")
    for entry in sorted(ENTRY_POINTS):
        line = run(entry, "--quiet", str(path)).stdout.decode("utf-8").split("\n")[0]
        name = line.removeprefix("accepted: ").split(" — ", 1)[0]
        assert name.isascii() and "\\u%04x" % ord(dash) in name and "\\u2245" in name, line
        assert line.split(" — ", 1)[1].startswith(describe_claim(cert) + " ["), line
