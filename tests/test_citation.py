"""Issue 11, item 7: the tool can be cited — a version, a LICENSE, a citation file in the Citation File
Format, author fields in the package metadata."""
from importlib.metadata import metadata
from pathlib import Path

import pytest

from certify import __version__

tomllib = pytest.importorskip("tomllib", reason="Python 3.11 or later")

ROOT = Path(__file__).resolve().parent.parent


def test_license_file_is_the_mit_license_the_metadata_names():
    """The MIT License's text (as published by the Open Source Initiative) and license = MIT in pyproject."""
    text = (ROOT / "LICENSE").read_text()
    assert text.startswith("MIT License") and "Permission is hereby granted, free of charge" in text
    assert "THE SOFTWARE IS PROVIDED \"AS IS\", WITHOUT WARRANTY OF ANY KIND" in text
    assert tomllib.loads((ROOT / "pyproject.toml").read_text())["project"]["license"] == {"text": "MIT"}


def test_citation_file_has_the_keys_cff_1_2_0_requires_and_the_current_version():
    """Citation File Format 1.2.0 (citation-file-format.github.io): cff-version, message, title and authors
    are required; the version cited is the one certify --version prints."""
    yaml = pytest.importorskip("yaml", reason="PyYAML (installed with the test extra's distributed)")
    citation = yaml.safe_load((ROOT / "CITATION.cff").read_text())
    assert citation["cff-version"] == "1.2.0"
    assert citation["message"] and citation["title"].startswith("certify")
    assert all(author.get("name") or author.get("family-names") for author in citation["authors"])
    assert str(citation["version"]) == __version__ and citation["license"] == "MIT"


def test_package_metadata_names_the_authors_and_the_version():
    """pyproject names the authors; the installed package's version is certify.__version__ (pyproject
    reads it from there)."""
    project = tomllib.loads((ROOT / "pyproject.toml").read_text())["project"]
    assert project["authors"] == [{"name": "The certify developers"}] and "version" in project["dynamic"]
    assert metadata("certify")["Version"] == __version__
