"""The command line: ``certify torsion``, ``isogeny-class``, ``verify``, ``table``, ``bundle``, ``batch``,
``audit``, ``demo``.

Input errors (malformed, singular or over-large curves, certificates the verifier does not accept
where a command builds on them), outputs that cannot be written and unusable cluster addresses exit
with status 2 and one line on stderr, never a traceback.
"""
from __future__ import annotations

import argparse
import re
import socket
import sys

from certify import __version__
from certify.curves import Curve, CurveInputError, parse_curve
from certify.certificates import (NotAccepted, accepted_certificates, certify_checked, emit, to_json,
                                  write_atomically)
from certify.verifier.digest import digest
from certify.verifier.report import describe_claim


def fail(message: str) -> int:
    """Print one line on stderr; the exit status of bad input."""
    print(f"certify: {message}", file=sys.stderr)
    return 2


def certify_command(kind: str, text: str, output: str | None) -> int:
    """Certify one curve; the certificate goes to ``output`` (atomically) or to stdout, and the answer in
    words and the digest to stderr, so that stdout holds the JSON alone."""
    try:
        a = parse_curve(text)
        cert = certify_checked(kind, a)
    except CurveInputError as error:
        return fail(str(error))
    emit(to_json(cert), output)
    written = f" — written to {output}" if output is not None else ""
    print(f"{Curve(a).equation()}: {describe_claim(cert)}{written}", file=sys.stderr)
    print(f"digest {digest(cert)}", file=sys.stderr)
    return 0


def table_command(sources: list, form: str, document: bool, output: str | None) -> int:
    """Tabulate accepted certificates; the caption names the digest of each bundle among the sources."""
    from certify.tables import TableError, bundle_digests, render

    try:
        text = render(accepted_certificates(sources), form, document, bundle_digests(sources))
    except (NotAccepted, TableError) as error:
        return fail(str(error))
    emit(text, output)
    return 0


def bundle_command(sources: list, output: str) -> int:
    """Bundle accepted certificates into one file; prints the bundle's digest and member count."""
    from certify.bundle import build_bundle, bundle_file

    try:
        certificates = accepted_certificates(sources)
    except NotAccepted as error:
        return fail(str(error))
    bundle = build_bundle(certificates)
    write_atomically(output, bundle_file(bundle, output))
    print(f"{len(certificates)} certificates bundled into {output}\ndigest {digest(bundle)}", file=sys.stderr)
    return 0


CLUSTER_ADDRESS = re.compile(r"(?:(?:tcp|tls)://)?(\[[0-9A-Fa-f:.]+\]|[A-Za-z0-9_.-]+):(\d{1,5})")
"""A Dask scheduler's address: [tcp:// or tls://]HOST:PORT (an IPv6 host in brackets)."""


def cluster_problem(address: str) -> str | None:
    """Why ``--cluster ADDRESS`` cannot be used — not an address, distributed not installed, nothing
    listening there within 5 s — or None."""
    match = CLUSTER_ADDRESS.fullmatch(address)
    if not match or not 0 < int(match.group(2)) < 65536:
        return f"--cluster {address!r} is not a scheduler address such as tcp://HOST:PORT"
    try:
        import distributed  # noqa: F401  (only whether it is installed)
    except ImportError:
        return "--cluster needs the distributed package: pip install 'certify[cluster]'"
    try:
        socket.create_connection((match.group(1).strip("[]"), int(match.group(2))), timeout=5).close()
    except OSError as error:
        return f"cannot reach a Dask scheduler at {address}: {error.strerror or error}"
    return None


def batch_command(args) -> int:
    """Certify a whole table into a directory or SQLite store."""
    from certify.batch import BatchInputError, run_batch
    from certify.certificates import certifiers
    from certify.store import StoreError

    for kind in args.only or ():
        if kind not in certifiers():
            return fail(f"this installation cannot write {kind} certificates")
    try:
        return run_batch(args.file, args.output, args.workers, args.only, args.cluster, args.timeout)
    except (BatchInputError, StoreError) as error:
        return fail(str(error))


def audit_command(args) -> int:
    """Certify the truth behind each claim of another program and report agreement field by field."""
    from certify.audit import AuditInputError, run_audit
    from certify.store import StoreError

    form = args.form or ("jsonl" if args.output and args.output.endswith(".jsonl") else "csv")
    try:
        return run_audit(args.claims, args.output, form, args.certificates, args.workers, args.cluster, args.timeout,
                         args.store)
    except (AuditInputError, StoreError) as error:
        return fail(str(error))


def add_run_options(command) -> None:
    """--workers, --cluster and --timeout, shared by batch and audit."""
    command.add_argument("--workers", type=int, metavar="N", help="local processes (default: all cores)")
    command.add_argument("--cluster", metavar="ADDRESS", help="run on the Dask scheduler at ADDRESS (tcp://host:port)")
    command.add_argument("--timeout", type=float, metavar="S", help="give up on a certificate after S seconds")


def parser() -> argparse.ArgumentParser:
    """The argument parser of every subcommand but ``verify`` (which the verifier's own parser reads)."""
    top = argparse.ArgumentParser(prog="certify", description=(
        "Certified torsion subgroups and isogeny classes of elliptic curves over Q. CURVE is "
        "[a1,a2,a3,a4,a6], [A,B] for y^2 = x^3 + Ax + B, or an equation such as 'y^2 + xy = x^3 - x^2 + 3'."))
    top.add_argument("--version", action="version", version=f"certify {__version__}")
    commands = top.add_subparsers(dest="command", required=True)
    for name, about in (("torsion", "certify the rational torsion subgroup"),
                        ("isogeny-class", "certify the rational isogeny class"),
                        ("conductor", "certify the conductor, reduction types and Tamagawa numbers"),
                        ("rank", "certify bounds on the rank of E(Q): independent points, and a 2-isogeny descent")):
        command = commands.add_parser(name, help=about)
        command.add_argument("curve", metavar="CURVE")
        command.add_argument("-o", "--output", metavar="FILE", help="write the certificate here (default: stdout)")
    commands.add_parser("verify", add_help=False, help=(
        "recheck certificates, bundles, directories or stores with the standalone verifier "
        "(certify verify --help for its options)"))
    table = commands.add_parser("table", help="a LaTeX, Markdown or CSV table of accepted certificates")
    table.add_argument("sources", nargs="+", metavar="CERT")
    table.add_argument("--format", choices=("latex", "markdown", "csv"), default="markdown", dest="form")
    table.add_argument("--document", action="store_true", help="with --format latex: a whole article, ready for pdflatex")
    table.add_argument("-o", "--output", metavar="FILE", help="write the table here (default: stdout)")
    bundle = commands.add_parser("bundle", help="pack accepted certificates and a manifest into one file")
    bundle.add_argument("sources", nargs="+", metavar="CERT")
    bundle.add_argument("-o", "--output", metavar="FILE", required=True)
    batch = commands.add_parser("batch", help="certify every curve of a file into a directory or .sqlite store")
    batch.add_argument("file", metavar="FILE", help="one CURVE per line, optionally followed by a label")
    batch.add_argument("-o", "--output", metavar="OUT", required=True, help="a directory, or a file ending in .sqlite")
    batch.add_argument("--only", action="append", choices=("torsion", "isogeny-class", "conductor", "rank"),
                       help="write only this kind of certificate (repeat for several kinds)")
    add_run_options(batch)
    audit = commands.add_parser("audit", help="check another program's torsion, isogeny, conductor and rank claims (CSV or JSONL)")
    audit.add_argument("claims", metavar="CLAIMS", help="columns: curve, and any of label, torsion_group, "
                       "curves_in_class, cyclic_degrees_from_curve, class_members, conductor, rank (see the README)")
    audit.add_argument("-o", "--output", metavar="FILE", help="write the report here (default: stdout)")
    audit.add_argument("--format", choices=("csv", "jsonl"), dest="form", help="default: csv, or jsonl for -o *.jsonl")
    audit.add_argument("--certificates", metavar="DIR", default="audit-certificates",
                       help="where the certificates proving each disagreement go (default: audit-certificates)")
    audit.add_argument("--store", metavar="OUT", help="reuse the certificates of this batch store or directory "
                       "(each is verified again before use)")
    add_run_options(audit)
    demo = commands.add_parser("demo", help="certify and verify the curves of the demo appendix")
    demo.add_argument("--out", metavar="DIR", default=None, help="keep the certificates, bundle and tables in DIR")
    return top


def main(argv=None) -> int:
    argv = sys.argv[1:] if argv is None else list(argv)
    if argv[:1] == ["verify"]:
        from certify.verifier.cli import main as verify_main

        return verify_main(argv[1:])
    args = parser().parse_args(argv)
    if getattr(args, "workers", None) is not None and args.workers < 1 or getattr(args, "timeout", None) is not None \
            and args.timeout <= 0:
        return fail("--workers and --timeout must be positive")
    if getattr(args, "cluster", None) is not None and (problem := cluster_problem(args.cluster)):
        return fail(problem)
    try:
        return run_command(args)
    except OSError as error:  # an output that cannot be written: OutputError names it; others by their file
        return fail(str(error) if error.filename is None else f"cannot write {error.filename}: {error.strerror}")


def run_command(args) -> int:
    """Run the parsed subcommand; its exit status."""
    if args.command in ("torsion", "isogeny-class", "conductor", "rank"):
        return certify_command(args.command, args.curve, args.output)
    if args.command == "table":
        return table_command(args.sources, args.form, args.document, args.output)
    if args.command == "bundle":
        return bundle_command(args.sources, args.output)
    if args.command == "batch":
        return batch_command(args)
    if args.command == "audit":
        return audit_command(args)
    from certify.demo import run_demo

    return run_demo(args.out)
