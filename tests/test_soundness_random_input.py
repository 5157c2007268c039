"""Soundness, attack class *random JSON and random bytes*: arbitrary JSON values (biased towards the
certificate vocabulary), pool certificates with a random subtree replaced, random bytes and damaged
certificate files, through ``verify`` and through the command line ``python -m certify.verifier --jsonl``.
``verify`` may only accept (confirmed by cypari2) or raise its Rejection; the command line must never print
a traceback, must give one JSON verdict per file, and must exit 2 when some file is unreadable as JSON and
otherwise 1 when some certificate is rejected (README, "Commands")."""
import json
import pathlib
import subprocess
import sys
import tempfile

import pytest
from hypothesis import assume, strategies as st

from soundness_pool import (TALLY, any_certificate, assert_sound, certificate_shaped, ci_and_long, claim_is_true,
                            damage_bytes, json_values, randoms)

ROOT = pathlib.Path(__file__).resolve().parents[1]


def run_cli(documents: list) -> tuple:
    """(exit status, stdout lines, stderr) of ``python -m certify.verifier --jsonl`` over one file per byte
    string, in order."""
    with tempfile.TemporaryDirectory() as folder:
        names = []
        for i, data in enumerate(documents):
            path = pathlib.Path(folder) / f"input-{i:03}.json"
            path.write_bytes(data)
            names.append(str(path))
        done = subprocess.run([sys.executable, "-m", "certify.verifier", "--jsonl", *names], cwd=ROOT,
                              capture_output=True, text=True, timeout=600)
    return done.returncode, done.stdout.splitlines(), done.stderr


def assert_cli_sound(documents: list) -> None:
    """The command-line contract on a batch of files: no traceback, one verdict per file in order, an
    accepted file's claim confirmed by cypari2, and the documented exit status."""
    status, lines, stderr = run_cli(documents)
    assert "Traceback" not in stderr, stderr[-2000:]
    assert len(lines) == len(documents), (lines, stderr[-2000:])
    unreadable = rejected = 0
    for data, line in zip(documents, lines):
        verdict = json.loads(line)
        assert set(verdict) == {"file", "accepted", "reason", "digest"} and verdict["reason"]
        if verdict["accepted"]:
            assert claim_is_true(json.loads(data)), "FALSE ACCEPT through the command line"
        elif verdict["reason"].startswith("unreadable"):
            unreadable += 1
        else:
            rejected += 1
    assert status == (2 if unreadable else 1 if rejected else 0), (status, lines)


@ci_and_long(150, value=json_values)
def test_random_json_values_through_verify(value):
    """Any JSON value — not a certificate at all — handed to verify: only a Rejection is allowed."""
    assert assert_sound(value) is not None


@ci_and_long(150, value=json_values, rnd=randoms)
def test_certificates_with_a_random_subtree_through_verify(value, rnd):
    """A valid certificate with one subtree (anywhere, down to a single number) replaced by an arbitrary
    JSON value: every type confusion must end in a Rejection, or in an acceptance cypari2 confirms."""
    assert_sound(certificate_shaped(value, rnd))


def batch(rnd, raw: list, values: list) -> list:
    """Byte strings for one command-line run: raw random bytes, damaged certificate files, JSON texts of
    random values and of certificates with a random subtree."""
    texts = [json.dumps(any_certificate(rnd), indent=1).encode() for _ in range(3)]
    documents = raw + [damage_bytes(t, rnd) for t in texts]
    documents += [json.dumps(v).encode() for v in values]
    documents += [json.dumps(certificate_shaped(v, rnd)).encode() for v in values]
    return documents


@ci_and_long(12, rnd=randoms, raw=st.lists(st.binary(max_size=200), max_size=4),
             values=st.lists(json_values, min_size=1, max_size=4))
def test_random_bytes_and_damaged_files_through_the_command_line(rnd, raw, values):
    """Random bytes, bit-flipped/truncated certificate files and random JSON, several files per run of
    ``python -m certify.verifier --jsonl``: never a traceback, exit status 2 if any file is unreadable,
    else 1 if any is rejected."""
    documents = batch(rnd, raw, values)
    assume(documents)
    TALLY["inputs"] += len(documents)
    assert_cli_sound(documents)


@pytest.mark.parametrize("value", [5, None, True])
def test_relies_on_that_is_not_a_list_gets_a_verdict(value):
    """Minimal input {"relies_on": 5}: verify rejects it (no field 'format'), and the command line must
    still give a verdict while listing the theorem keys for the report (a regression: it used to crash)."""
    assert_cli_sound([json.dumps({"relies_on": value}).encode()])


def test_bundle_member_name_with_a_lone_surrogate_gets_a_verdict():
    """Minimal input: a bundle whose manifest names its one member "\\ud800" (valid JSON text); printing
    that name used to raise UnicodeEncodeError (a regression test now)."""
    text = ('{"format":"certify-bundle","version":"1","manifest":{"count":"1","members":[{"name":"\\ud800"}]},'
            '"members":[{}]}')
    assert_cli_sound([text.encode()])
