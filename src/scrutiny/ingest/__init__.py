"""ingest: turn a file into a `Document` (decoded text, normalised text, offset map).

One reader per format; the format is decided by content first (a PDF named `.txt` is still a
PDF) and by the file's extension second. Readers never judge what the text says.
"""

from __future__ import annotations

import os
from pathlib import Path

import regex

from ..errors import InputError
from ..model import Document, OffsetMap
from .normalise import normalise
from .text import NotText, decode

#: extensions read when a folder is searched; a file named explicitly is always tried
TEXT_SUFFIXES = frozenset({".txt", ".text", ".md", ".markdown", ".rst"})
MANUSCRIPT_SUFFIXES = TEXT_SUFFIXES

#: signatures of formats that are not plain text, with the name the user knows them by
_SIGNATURES = (
    (b"%PDF-", "a PDF"),
    (b"PK\x03\x04", "a ZIP archive (Word .docx, OpenDocument or similar)"),
    (b"\xd0\xcf\x11\xe0", "a legacy Office document (.doc)"),
    (b"{\\rtf", "an RTF document"),
    (b"\x89PNG", "a PNG image"),
    (b"\xff\xd8\xff", "a JPEG image"),
    (b"\x1f\x8b", "a gzip archive"),
)

_NEWLINE = regex.compile(r"\n")


def sniff_format(data: bytes, path: str) -> str:
    """Name the format of `data`: content decides, the extension only breaks ties."""
    head = data[:1024].lstrip()
    for signature, name in _SIGNATURES:
        if head.startswith(signature):
            return name
    suffix = Path(path).suffix.lower()
    return "markdown" if suffix in {".md", ".markdown"} else "text"


def document_from_text(text: str, path: str = "<text>", format: str = "text",
                       encoding: str | None = None) -> Document:
    """Build a Document from already decoded text."""
    normalised, breakpoints = normalise(text)
    line_starts = [0]
    line_starts.extend(m.end() for m in _NEWLINE.finditer(text))
    return Document(
        path=path,
        format=format,
        text=text,
        normalised=normalised,
        offset_map=OffsetMap(breakpoints, line_starts),
        encoding=encoding,
    )


def document_from_bytes(data: bytes, path: str) -> Document:
    """Build a Document from the raw bytes of a file; raise `InputError` if it is not one."""
    if not data.strip():
        raise InputError(path, "empty file" if not data else "empty file (only white space)")
    kind = sniff_format(data, path)
    if kind not in ("text", "markdown"):
        raise InputError(path, f"this is {kind}; this version of scrutiny reads plain-text and "
                               "Markdown manuscripts only")
    try:
        text, encoding = decode(data)
    except NotText as exc:
        raise InputError(path, str(exc)) from None
    if not text.strip():
        raise InputError(path, "empty file (only white space)")
    return document_from_text(text, path=path, format=kind, encoding=encoding)


def read_document(path: str | os.PathLike[str]) -> Document:
    """Read one file into a Document; raise `InputError` with a one-line reason on failure."""
    name = os.fspath(path)
    try:
        with open(name, "rb") as handle:
            data = handle.read()
    except FileNotFoundError:
        raise InputError(name, "no such file") from None
    except IsADirectoryError:
        raise InputError(name, "is a folder (give the folder itself to search it)") from None
    except PermissionError:
        raise InputError(name, "permission denied") from None
    except OSError as exc:
        raise InputError(name, f"cannot be read ({exc.strerror or exc})") from None
    return document_from_bytes(data, name)


__all__ = [
    "MANUSCRIPT_SUFFIXES",
    "document_from_bytes",
    "document_from_text",
    "read_document",
    "sniff_format",
]
