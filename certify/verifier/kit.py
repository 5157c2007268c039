"""The referee's kit: one zip archive (``NAME.pyz``) that a bare ``python3 -S NAME.pyz`` runs, holding the
verifier's own source, a launcher, and one bundle of certificates.

A genuine kit holds exactly these members, and nothing else: ``__main__.py`` (KIT_MAIN, five lines),
``certify/__init__.py`` (PACKAGE_STUB, a docstring), ``certify/verifier/*.py`` and
``certify/verifier/schemas/*.json`` (this package) and the bundle ``NAME.json``. The *verifier source digest* is the SHA-256 of the text that ``sha256sum`` prints
for all members but the bundle, sorted by path in byte order (``LC_ALL=C``), so a referee can recompute
it from the extracted files with standard tools and compare it with the digest published for the release.
"""
import hashlib
import io
import os
import struct
import sys
import zipfile

from certify.verifier.limits import MAX_FILE_BYTES

KIT_SUFFIX = ".pyz"

KIT_MAIN = ('"""A certify kit: python3 -S THIS_FILE [--quiet | --jsonl] [--expect DIGEST] [--extract DIR]."""\n'
            "import sys\n\n"
            "from certify.verifier.kit import run_kit\n\n"
            "sys.exit(run_kit(sys.argv[1:]))\n")
"""The kit's ``__main__.py``."""

PACKAGE_STUB = '"""The package that holds the verifier inside a kit."""\n'
"""The kit's ``certify/__init__.py``: the verifier's modules are ``certify.verifier.*`` wherever they run."""

MAX_KIT_MEMBERS = 100
"""Most members a kit may hold (a genuine one holds about 20)."""


def package_files() -> dict:
    """{kit path: bytes} of the verifier this code belongs to: its own modules (read through its loader,
    so from the file system or from inside a kit alike) and the two launcher files."""
    archive = getattr(__loader__, "archive", None)  # set when the modules are imported from a zip archive
    if archive:
        with zipfile.ZipFile(archive) as kit:
            files = {name: kit.read(name) for name in kit.namelist() if is_verifier_source(name)}
    else:
        here = os.path.dirname(os.path.abspath(__file__))
        files = {}
        for folder, suffix in (("", ".py"), ("schemas", ".json")):
            for name in os.listdir(os.path.join(here, folder)):
                if name.endswith(suffix):
                    with open(os.path.join(here, folder, name), "rb") as handle:
                        files["/".join(filter(None, ("certify/verifier", folder, name)))] = handle.read()
    files["__main__.py"] = KIT_MAIN.encode("utf-8")
    files["certify/__init__.py"] = PACKAGE_STUB.encode("utf-8")
    return files


def is_verifier_source(name: str) -> bool:
    """A module certify/verifier/NAME.py or a schema certify/verifier/schemas/NAME.json."""
    parts = name.split("/")
    return (parts[:2] == ["certify", "verifier"]
            and ((len(parts) == 3 and name.endswith(".py")) or (len(parts) == 4 and parts[2] == "schemas"
                                                                and name.endswith(".json"))))


def source_digest(files: dict) -> str:
    """'sha256:' and the SHA-256 of the ``sha256sum`` listing (hash, two spaces, path, newline) of the files,
    sorted by path in byte order."""
    listing = "".join(f"{hashlib.sha256(files[name]).hexdigest()}  {name}\n"
                      for name in sorted(files, key=lambda n: n.encode("utf-8")))
    return "sha256:" + hashlib.sha256(listing.encode("utf-8")).hexdigest()


class KitError(Exception):
    """The file is not a kit this verifier reads."""


def read_kit(data: bytes) -> tuple:
    """(bundle name, bundle bytes, {path: bytes} of the other members) of a kit (its bytes, as
    ``sources.read`` gives them) whose layout is the plain one ``check_layout`` describes, refused
    otherwise, as is: a name given twice (zip readers differ on which copy they take), a member other than
    those of a genuine kit, and not exactly one bundle. Members are read through zipfile only once the
    layout leaves a single reading."""
    members = check_layout(data)
    names = [name for name, _ in members]
    if len(set(names)) != len(names):
        raise KitError("the kit names a member twice")
    for name in names:
        check_member_name(name)
    bundles = [n for n in names if "/" not in n and n.endswith(".json")]
    if len(bundles) != 1:
        raise KitError("a kit holds exactly one bundle, NAME.json, at its top level")
    try:
        with zipfile.ZipFile(io.BytesIO(data)) as archive:
            contents = {}
            for name, size in members:
                with archive.open(name) as member:
                    contents[name] = member.read(size + 1)
                if len(contents[name]) != size:
                    raise KitError(f"a member is not the size the archive records: {name}")
    except KitError:
        raise
    except Exception as error:  # any failure of the archive reader on a hostile file: not a kit it can read
        raise KitError(f"not a readable zip archive ({type(error).__name__}: {str(error)[:100]})")
    bundle = bundles[0]
    return bundle, contents.pop(bundle), contents


END_RECORD, CENTRAL_ENTRY, LOCAL_HEADER = b"PK\x05\x06", b"PK\x01\x02", b"PK\x03\x04"


def check_layout(data: bytes) -> list:
    """[(name, size)] of the members of a zip archive laid out the one way every zip reader (zipfile,
    zipimport, unzip) reads alike, else KitError: the end record is the last 22 bytes (no comment, one
    disk) and no zip64 record or locator exists; the central directory ends where the end record begins;
    its entries, at most MAX_KIT_MEMBERS, carry no extra field, comment, encryption or data descriptor and
    are stored or deflated; and the members' local headers, with the same names, methods and sizes, tile
    the file from byte 0 up to the central directory without a gap."""
    if len(data) < 22 or data[-22:-18] != END_RECORD:
        raise KitError("the archive does not end with its end record (a comment, or trailing bytes)")
    disk, first_disk, on_disk, count, size, offset, comment = struct.unpack("<HHHHIIH", data[-18:])
    if disk or first_disk or on_disk != count or comment or count > MAX_KIT_MEMBERS:
        raise KitError(f"the end record is not that of a plain archive of at most {MAX_KIT_MEMBERS} members")
    if offset + size != len(data) - 22 or data[-42:-38] == b"PK\x06\x07":
        raise KitError("the central directory does not end where the end record begins, or a zip64 locator exists")
    members, position, local = [], offset, 0
    for _ in range(count):
        if data[position:position + 4] != CENTRAL_ENTRY:
            raise KitError("a central directory entry is not where the one before it ends")
        (flags, method, crc, packed, unpacked, name_length, extra_length, comment_length,
         header) = struct.unpack("<4xHH4xIIIHHH8xI", data[position + 4:position + 46])
        name = data[position + 46:position + 46 + name_length]
        if flags & 0x9 or method not in (0, 8) or extra_length or comment_length or 0xFFFFFFFF in (packed, unpacked):
            raise KitError("a member is encrypted, has a data descriptor, an extra field, a comment, zip64 sizes, "
                           "or is neither stored nor deflated")
        if header != local or data[local:local + 4] != LOCAL_HEADER:
            raise KitError("the members do not follow one another from the start of the file")
        local_fields = struct.unpack("<2xHH4xIIIHH", data[local + 4:local + 30])
        if local_fields != (flags, method, crc, packed, unpacked, name_length, 0) or \
                data[local + 30:local + 30 + name_length] != name:
            raise KitError("a member's local header does not say what the central directory says")
        members.append((name.decode("ascii", errors="replace"), unpacked))
        local += 30 + name_length + packed
        position += 46 + name_length
    if local != offset or position != offset + size:
        raise KitError("the members and the central directory do not fill the archive exactly")
    if sum(member_size for _, member_size in members) > MAX_FILE_BYTES:
        raise KitError(f"the kit's members come to more than {MAX_FILE_BYTES} bytes")
    return members


def check_member_name(name: str) -> None:
    """A member of a genuine kit: __main__.py, certify/__init__.py, the verifier's source (modules and
    schemas) or a top-level NAME.json; names made of letters, digits, '-', '_' and '.' only."""
    plain = all(c.isascii() and (c.isalnum() or c in "-_.") for c in name.replace("/", "")) and ".." not in name
    allowed = (name in ("__main__.py", "certify/__init__.py") or is_verifier_source(name)
               or ("/" not in name and name.endswith(".json")))
    if not (plain and allowed):
        raise KitError(f"the kit holds a member a genuine kit does not: {name[:80]!r}")


def extract(path: str, directory: str) -> list:
    """Write the kit's members under ``directory`` (created), refusing any that exists; returns the paths."""
    from certify.verifier.sources import read

    bundle, data, others = read_kit(read(path))
    written = []
    for name, content in sorted(dict(others, **{bundle: data}).items()):
        target = os.path.join(directory, *name.split("/"))
        os.makedirs(os.path.dirname(target), exist_ok=True)
        with open(target, "xb") as handle:
            handle.write(content)
        written.append(target)
    return written


def run_kit(argv: list) -> int:
    """The kit's command line: the verifier's own, on the bundle the kit carries, or --extract DIR; a kit
    whose own layout is not plain (``check_layout``) is refused first. This guards a genuine kit that was
    damaged or altered by a tool; against an author who wrote the kit's code, the referee runs the
    extracted copy instead (README, "Which verifier ran")."""
    from certify.verifier.cli import main
    from certify.verifier.sources import Unreadable, read

    archive = __loader__.archive
    shown = sys.argv[0] if os.path.isfile(sys.argv[0]) and os.path.samefile(sys.argv[0], archive) else archive
    try:
        read_kit(read(archive))
    except (KitError, Unreadable) as error:
        print(f"kit: {shown} is not a plain kit, refused: {error}", file=sys.stderr)
        return 2
    if argv[:1] == ["--extract"] and len(argv) == 2:
        try:
            written = extract(archive, argv[1])
        except (KitError, OSError, Unreadable) as error:
            print(f"kit: cannot extract: {error}", file=sys.stderr)
            return 2
        print(f"{len(written)} files written under {argv[1]}:\n" + "\n".join(written))
        return 0
    return main(argv + [shown], program="python3 -S " + os.path.basename(archive))
