"""ingest: turn a file into a `Document` (text, normalised text, offset and location map).

One reader module per format. Each reader module defines

    FORMAT    the format's name ("pdf", "docx", "latex", "html", "jats", ...)
    SUFFIXES  the file extensions read when a folder is searched
    sniff(data: bytes, path: str) -> str | None
              the format's name when `data` is in the format (decided by content first, the
              extension only where content cannot tell), else None
    read(data: bytes, path: str) -> Document
              the Document, built with `build_document`; raises `InputError` with a one-line
              reason when the file cannot be read

Readers extract text and say where it came from; they never judge what it says. Normalisation
(`normalise.py`) is shared by all of them and happens once, in `build_document`.
"""

from __future__ import annotations

import importlib
import importlib.util
import os
from types import ModuleType

import regex

from ..errors import InputError
from ..model import Document, Geometry, OffsetMap, Segment
from .normalise import normalise

#: reader modules in the order their `sniff` is asked; plain text comes last (it takes anything)
_READER_MODULES = ("pdf", "docx", "markup", "latex", "text")

#: signatures of formats no reader takes, with the name the user knows them by
_UNSUPPORTED = (
    (b"\xd0\xcf\x11\xe0", "a legacy Office document (.doc); save it as .docx or PDF"),
    (b"{\\rtf", "an RTF document; save it as .docx or PDF"),
    (b"\x89PNG", "a PNG image"),
    (b"\xff\xd8\xff", "a JPEG image"),
    (b"GIF8", "a GIF image"),
    (b"II*\x00", "a TIFF image"),
    (b"MM\x00*", "a TIFF image"),
    (b"\x1f\x8b", "a gzip archive"),
    (b"7z\xbc\xaf", "a 7-Zip archive"),
    (b"Rar!", "a RAR archive"),
    (b"PK\x03\x04", "a ZIP archive that is not a Word (.docx) document"),
    (b"%PDF-", "a PDF"),
)

_NEWLINE = regex.compile(r"\n")


def _reader_modules() -> list[ModuleType]:
    modules = []
    for name in _READER_MODULES:
        qualified = f"{__name__}.{name}"
        if importlib.util.find_spec(qualified) is not None:
            modules.append(importlib.import_module(qualified))
    return modules


def manuscript_suffixes() -> frozenset[str]:
    """Extensions of the formats scrutiny reads (used when a folder is searched)."""
    return frozenset(suffix for module in _reader_modules() for suffix in module.SUFFIXES)


def sniff_format(data: bytes, path: str) -> str:
    """The name of the format of `data`; raise `InputError` for a format no reader takes."""
    for module in _reader_modules():
        found = module.sniff(data, path)
        if found:
            return found
    head = data[:1024].lstrip()
    for signature, name in _UNSUPPORTED:
        if head.startswith(signature):
            raise InputError(path, f"this is {name}, which scrutiny does not read")
    raise InputError(path, "not a manuscript in any format scrutiny reads")


def _reader_for(format_name: str) -> ModuleType:
    for module in _reader_modules():
        if format_name == module.FORMAT or format_name in getattr(module, "ALSO", ()):
            return module
    raise InputError("<input>", f"no reader for the format {format_name!r}")


def build_document(path: str, format: str, text: str, *,
                   segments: tuple[Segment, ...] = (), encoding: str | None = None,
                   pages: int | None = None, geometry: Geometry | None = None,
                   notes: tuple[str, ...] = ()) -> Document:
    """Normalise a reader's text and bundle it with its location map into a Document."""
    normalised, breakpoints = normalise(text)
    line_starts = [0]
    line_starts.extend(m.end() for m in _NEWLINE.finditer(text))
    return Document(
        path=path,
        format=format,
        text=text,
        normalised=normalised,
        offset_map=OffsetMap(breakpoints, line_starts, segments, geometry),
        encoding=encoding,
        pages=pages,
        notes=notes,
    )


def document_from_text(text: str, path: str = "<text>", format: str = "text",
                       encoding: str | None = None) -> Document:
    """Build a Document from already decoded plain text."""
    return build_document(path, format, text, encoding=encoding)


def document_from_bytes(data: bytes, path: str) -> Document:
    """Build a Document from the raw bytes of a file; raise `InputError` if it is not one."""
    if not data.strip():
        raise InputError(path, "empty file" if not data else "empty file (only white space)")
    return _reader_for(sniff_format(data, path)).read(data, path)


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


def head_needs_guard(head: bytes) -> bool:
    """True unless the bytes start like plain text or LaTeX, read without big parsers.

    PDFs, ZIP containers (Word) and markup (HTML, XML) are parsed by large libraries and are read
    under a time and memory ceiling (see `guard`); the decision looks at content, not the name.
    """
    head = head[:1024].lstrip(b"\xef\xbb\xbf \t\r\n")
    return head.startswith((b"%PDF", b"PK", b"<", b"\xff\xfe<", b"\xfe\xff\x00<")) or \
        b"%PDF-" in head


def needs_guard(path: str) -> bool:
    """`head_needs_guard` for the start of the file at `path`."""
    try:
        with open(path, "rb") as handle:
            return head_needs_guard(handle.read(1024))
    except OSError:
        return False  # read_document reports the real problem


__all__ = [
    "build_document",
    "document_from_bytes",
    "document_from_text",
    "manuscript_suffixes",
    "read_document",
    "sniff_format",
]
