"""Plain-text and Markdown manuscripts: decode the bytes, nothing more.

The reader of last resort: it takes any input that no other reader recognised and that does not
start with the signature of a binary format.

Manuscripts arrive in whatever encoding the author's editor wrote. The order of attempts is
fixed and stated: a byte-order mark decides (UTF-8, UTF-16, UTF-32); otherwise UTF-8 if the
bytes are valid UTF-8; otherwise UTF-16 without a mark when every other byte is NUL (text with
mostly ASCII characters); otherwise Windows-1252 if it decodes; otherwise Latin-1, which decodes
any byte sequence. The encoding used is reported with the document.
"""

from __future__ import annotations

import codecs
from pathlib import Path

from ..errors import InputError
from ..model import Document

FORMAT = "text"
ALSO = ("markdown",)
SUFFIXES = (".txt", ".text", ".md", ".markdown", ".rst")

_BOMS = (
    (codecs.BOM_UTF32_LE, "utf-32-le", "utf-32"),
    (codecs.BOM_UTF32_BE, "utf-32-be", "utf-32"),
    (codecs.BOM_UTF8, "utf-8", "utf-8-sig"),
    (codecs.BOM_UTF16_LE, "utf-16-le", "utf-16"),
    (codecs.BOM_UTF16_BE, "utf-16-be", "utf-16"),
)

#: C0 control characters other than tab, line feed, form feed and carriage return
_CONTROL = bytes(b for b in range(32) if b not in (9, 10, 12, 13))


class NotText(ValueError):
    """The bytes are not text in any encoding we try; the message says why."""


def _utf16_without_bom(data: bytes) -> str | None:
    sample = data[:4096]
    if len(sample) < 4:
        return None
    even_nul = sample[0::2].count(0) / len(sample[0::2])
    odd_nul = sample[1::2].count(0) / len(sample[1::2])
    if odd_nul > 0.6 and even_nul < 0.1:
        return "utf-16-le"
    if even_nul > 0.6 and odd_nul < 0.1:
        return "utf-16-be"
    return None


def decode(data: bytes) -> tuple[str, str]:
    """Return `(text, encoding)`; raise `NotText` for binary data."""
    for bom, codec, label in _BOMS:
        if data.startswith(bom):
            try:
                return data[len(bom):].decode(codec), label
            except UnicodeDecodeError as exc:
                raise NotText(f"starts with a {label} byte-order mark but is not valid {label} "
                              f"(byte {exc.start + len(bom)})") from None
    if b"\x00" in data[:65536]:
        codec = _utf16_without_bom(data)
        if codec is None:
            raise NotText("binary file (contains NUL bytes), not a text manuscript")
        try:
            return data.decode(codec), codec
        except UnicodeDecodeError:
            raise NotText("binary file (contains NUL bytes), not a text manuscript") from None
    sample = data[:65536]
    controls = sum(sample.count(bytes([c])) for c in _CONTROL)
    if controls > max(8, len(sample) // 100):
        raise NotText("binary file (many control bytes), not a text manuscript")
    try:
        return data.decode("utf-8"), "utf-8"
    except UnicodeDecodeError:
        pass
    try:
        return data.decode("cp1252"), "windows-1252"
    except UnicodeDecodeError:
        return data.decode("latin-1"), "latin-1"


def sniff(data: bytes, path: str) -> str | None:
    from . import _UNSUPPORTED

    head = data[:1024].lstrip()
    if any(head.startswith(signature) for signature, _ in _UNSUPPORTED):
        return None
    return "markdown" if Path(path).suffix.lower() in (".md", ".markdown") else "text"


def read(data: bytes, path: str) -> Document:
    from . import build_document

    try:
        text, encoding = decode(data)
    except NotText as exc:
        raise InputError(path, str(exc)) from None
    if not text.strip():
        raise InputError(path, "empty file (only white space)")
    return build_document(path, sniff(data, path) or "text", text, encoding=encoding)
