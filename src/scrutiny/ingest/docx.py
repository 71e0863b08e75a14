"""Word (.docx) manuscripts: body paragraphs, tables, text boxes, footnotes and endnotes.

A .docx file is a ZIP archive of XML parts. Before python-docx opens it, the archive is
examined, because a small file can claim to expand to gigabytes (a zip bomb):

* the sizes the archive declares for its entries are checked first, without decompressing
  anything: too many entries, too much in total, or one large entry that compresses far better
  than any Word document does, and the file is refused;
* every entry is then decompressed once in bounded chunks and its checksum verified, so that an
  entry which expands beyond the size it declares (a lying header) is refused as damaged before
  any parser holds it in memory;
* XML parts that carry a document type declaration (which Word never writes, and which is how
  entity-expansion and external-entity attacks start) are refused.

The guard that runs the reader in a child process keeps a memory ceiling as the backstop.

Text is taken from the XML in document order, the way a reader sees it: runs, hyperlinks,
fields' results, content controls, inserted text of tracked changes (deleted text is left
out), equations (Office Math), symbols typed from the Symbol font (mapped to the Unicode
letters they show: a "c" in Symbol is a chi), tabs and line breaks. Paragraphs are joined with
a blank line, so that a paragraph stays a paragraph for extraction; the paragraphs of one
table cell are joined with a line break and form one piece of text.

Locations: `paragraph` numbers the body's paragraphs with text (1-based, in document order,
text boxes included, headings and empty paragraphs not counted); `section` is the nearest
heading before the text (a paragraph in a Heading or Title style, or with an outline level);
table text has `cell` = "table 2, row 3, column 1" (tables numbered in document order, columns
counted on the table's grid, so merged cells keep their column); footnotes and endnotes have
`section` = "footnotes" or "endnotes" and `paragraph` numbering the notes' paragraphs. `line`
counts the lines within the paragraph or cell (line breaks typed with Shift+Enter).
"""

from __future__ import annotations

import io
import re
import zipfile
from dataclasses import dataclass, field
from pathlib import Path
from typing import Iterator

from ..errors import InputError
from ..model import Document, Segment
from .normalise import TO_SUPERSCRIPT

FORMAT = "docx"
SUFFIXES = (".docx",)

#: suffixes of Word's ZIP formats; a broken ZIP archive with one of them is read as Word, so
#: that the reason given is about a damaged Word document
_WORD_SUFFIXES = (".docx", ".docm", ".dotx", ".dotm")
_ZIP_SIGNATURE = b"PK\x03\x04"
_OLE_SIGNATURE = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
#: the stream an encrypted (password-protected) Office document keeps its package in
_ENCRYPTED_STREAM = "EncryptedPackage".encode("utf-16-le")
_MAIN_PART = "word/document.xml"

#: limits checked on the sizes the archive declares, before anything is decompressed
MAX_ENTRIES = 10_000
MAX_TOTAL_BYTES = 1024**3
#: an entry larger than this must not compress better than MAX_RATIO to one
LARGE_ENTRY_BYTES = 16 * 1024**2
MAX_RATIO = 100
_CHUNK = 1024**2

_W = "{http://schemas.openxmlformats.org/wordprocessingml/2006/main}"
_M = "{http://schemas.openxmlformats.org/officeDocument/2006/math}"
_MC = "{http://schemas.openxmlformats.org/markup-compatibility/2006}"

_T = _W + "t"
_MATH_T = _M + "t"
_P = _W + "p"
_TBL = _W + "tbl"
_TR = _W + "tr"
_TC = _W + "tc"
_R = _W + "r"
_TXBX_CONTENT = _W + "txbxContent"
_VAL = _W + "val"

#: subtrees whose text a reader does not see (or sees elsewhere): tracked deletions, the
#: fallback copy of a drawing, properties, field instructions, comment marks
_SKIPPED = frozenset({
    _W + "del", _W + "moveFrom", _MC + "Fallback", _W + "pPr", _W + "rPr", _W + "sdtPr",
    _W + "instrText", _W + "delText", _W + "delInstrText", _W + "commentReference",
    _M + "rPr", _M + "ctrlPr",
})
_SINGLE_CHARACTERS = {
    _W + "tab": "\t",
    _W + "ptab": "\t",
    _W + "br": "\n",
    _W + "cr": "\n",
    _W + "noBreakHyphen": "-",
    _W + "softHyphen": "\u00ad",
}
#: block-level wrappers whose children are paragraphs and tables
_BLOCK_WRAPPERS = frozenset({_W + "sdt", _W + "sdtContent", _W + "customXml", _W + "ins",
                             _W + "moveTo", _W + "smartTag"})

# The Symbol font draws Greek letters and mathematical signs at the code points of Latin
# letters and punctuation; text typed in it (or inserted as a symbol) is mapped to the
# characters it shows.
_SYMBOL_FONT = {
    **dict(zip("abcdefghijklmnopqrstuvwxyz", "αβχδεφγηιϕκλμνοπθρστυϖωξψζ")),
    **dict(zip("ABCDEFGHIJKLMNOPQRSTUVWXYZ", "ΑΒΧΔΕΦΓΗΙϑΚΛΜΝΟΠΘΡΣΤΥςΩΞΨΖ")),
    "-": "\u2212", "\xa3": "≤", "\xb3": "≥", "\xb1": "±", "\xb4": "×", "\xb8": "÷",
    "\xb9": "≠", "\xbb": "≈", "\xa5": "∞", "\xd6": "√", "\xd7": "·", "\xb7": "•",
    "\xa2": "′", "\xb2": "″",
}


def sniff(data: bytes, path: str) -> str | None:
    if data.startswith(_OLE_SIGNATURE):
        # An encrypted .docx is an OLE container; say so rather than "a legacy .doc".
        return FORMAT if _ENCRYPTED_STREAM in data else None
    if not data.startswith(_ZIP_SIGNATURE):
        return None
    try:
        with zipfile.ZipFile(io.BytesIO(data)) as archive:
            if _MAIN_PART in archive.NameToInfo:
                return FORMAT
    except Exception:  # not a readable ZIP archive: maybe a damaged Word document
        if b"word/" in data[:256 * 1024]:
            return FORMAT
    return FORMAT if Path(path).suffix.lower() in _WORD_SUFFIXES else None


def read(data: bytes, path: str) -> Document:
    from . import build_document

    if data.startswith(_OLE_SIGNATURE):
        raise InputError(path, "an encrypted (password-protected) Office document: remove the "
                               "password in Word and save it again")
    archive = _open_archive(data, path)
    with archive:
        _check_declared_sizes(archive, path)
        _check_is_word(archive, path)
        _verify_entries(archive, path)
    word_document = _open_with_python_docx(data, path)
    text, segments = _Reader(word_document, path).read()
    if not text.strip():
        raise InputError(path, "no text: the Word document has no paragraphs, tables or notes "
                               "with text")
    notes = ()
    objects = sum(1 for _ in word_document.element.body.iter(_W + "object"))
    if objects:
        notes = (f"{objects} embedded object(s) (such as equations from an older equation "
                 "editor) have no text and were not read",)
    return build_document(path, FORMAT, text, segments=tuple(segments), notes=notes)


# -- the archive -----------------------------------------------------------------------------

def _open_archive(data: bytes, path: str) -> zipfile.ZipFile:
    try:
        return zipfile.ZipFile(io.BytesIO(data))
    except zipfile.BadZipFile as exc:
        if data.startswith(_ZIP_SIGNATURE):
            raise InputError(path, f"a damaged or truncated Word document (the ZIP archive "
                                   f"cannot be opened: {exc})") from None
        raise InputError(path, "not a Word document (not a ZIP archive)") from None
    except Exception as exc:
        raise InputError(path, f"a damaged Word document (the ZIP archive cannot be opened: "
                               f"{type(exc).__name__}: {exc})") from None


def _size(count: float) -> str:
    for unit, scale in (("GB", 1024**3), ("MB", 1024**2), ("KB", 1024)):
        if count >= scale:
            return f"{count / scale:,.1f} {unit}"
    return f"{count:,.0f} bytes"


def _check_declared_sizes(archive: zipfile.ZipFile, path: str) -> None:
    """Refuse an archive whose declared sizes mark it as a zip bomb, before decompressing."""
    entries = archive.infolist()
    if len(entries) > MAX_ENTRIES:
        raise InputError(path, f"refused: the archive has {len(entries):,} entries (at most "
                               f"{MAX_ENTRIES:,} are read); not an ordinary Word document")
    total = sum(entry.file_size for entry in entries)
    compressed = sum(entry.compress_size for entry in entries)
    if total > MAX_TOTAL_BYTES:
        raise InputError(path, f"refused as a likely zip bomb: {_size(compressed)} of "
                               f"compressed data would expand to {_size(total)} (the limit "
                               f"is {_size(MAX_TOTAL_BYTES)})")
    for entry in entries:
        if entry.file_size > LARGE_ENTRY_BYTES and \
                entry.file_size > MAX_RATIO * max(entry.compress_size, 1):
            ratio = entry.file_size / max(entry.compress_size, 1)
            raise InputError(path, f"refused as a likely zip bomb: {entry.filename} would "
                                   f"expand from {_size(entry.compress_size)} to "
                                   f"{_size(entry.file_size)} (a ratio of {ratio:,.0f} to 1)")


def _check_is_word(archive: zipfile.ZipFile, path: str) -> None:
    names = set(archive.NameToInfo)
    if _MAIN_PART in names:
        return
    if "xl/workbook.xml" in names:
        what = "an Excel workbook (.xlsx)"
    elif "ppt/presentation.xml" in names:
        what = "a PowerPoint presentation (.pptx)"
    elif "mimetype" in names and "content.xml" in names:
        what = "an OpenDocument file (.odt or similar); save it as .docx or PDF"
    elif "META-INF/container.xml" in names:
        what = "an EPUB e-book"
    else:
        what = "a ZIP archive without a Word document in it (no word/document.xml)"
    raise InputError(path, f"not a Word document: this is {what}")


def _verify_entries(archive: zipfile.ZipFile, path: str) -> None:
    """Decompress every entry in bounded chunks and check its size and checksum.

    zipfile stops at the size an entry declares and checks the CRC there, so an entry that
    expands further than it declares fails here, a megabyte at a time, instead of in a parser
    that reads it whole.
    """
    for entry in archive.infolist():
        if entry.is_dir():
            continue
        try:
            with archive.open(entry) as stream:
                head = stream.read(4096)
                produced = len(head)
                while chunk := stream.read(_CHUNK):
                    produced += len(chunk)
        except MemoryError:
            raise
        except Exception as exc:  # a bad CRC, zlib.error, an unsupported compression, ...
            raise InputError(path, f"a damaged Word document ({entry.filename} cannot be "
                                   f"decompressed: {exc})") from None
        if produced != entry.file_size:
            raise InputError(path, f"a damaged Word document ({entry.filename} holds "
                                   f"{produced:,} bytes where it declares {entry.file_size:,})")
        if entry.filename.endswith((".xml", ".rels")) and \
                (b"<!DOCTYPE" in head or b"<!ENTITY" in head):
            raise InputError(path, f"refused: {entry.filename} declares a document type or "
                                   "entities, which Word never writes (a way to smuggle in "
                                   "entity-expansion or external-entity attacks)")


#: main-part content types of Word's macro-enabled documents and templates, which python-docx
#: reads like a .docx once it is told to (`docx.Document()` refuses them)
_OTHER_MAIN_CONTENT_TYPES = (
    "application/vnd.ms-word.document.macroEnabled.main+xml",
    "application/vnd.openxmlformats-officedocument.wordprocessingml.template.main+xml",
    "application/vnd.ms-word.template.macroEnabledTemplate.main+xml",
)


def _open_with_python_docx(data: bytes, path: str):
    from docx.opc.part import PartFactory
    from docx.package import Package
    from docx.parts.document import DocumentPart

    for content_type in _OTHER_MAIN_CONTENT_TYPES:
        PartFactory.part_type_for.setdefault(content_type, DocumentPart)
    try:
        part = Package.open(io.BytesIO(data)).main_document_part
    except MemoryError:
        raise
    except Exception as exc:
        reason = str(exc).splitlines()[0] if str(exc) else type(exc).__name__
        raise InputError(path, f"a damaged Word document ({reason})") from None
    if not isinstance(part, DocumentPart):
        raise InputError(path, f"not a Word document (its main part is of the type "
                               f"{part.content_type})")
    return part.document


# -- the text --------------------------------------------------------------------------------

@dataclass
class _Output:
    """The Document's text as it grows, and the segments that say where each piece is from."""

    parts: list[str] = field(default_factory=list)
    length: int = 0
    segments: list[Segment] = field(default_factory=list)

    def add(self, text: str, **where: object) -> None:
        if self.parts:
            self.parts.append("\n\n")
            self.length += 2
        self.segments.append(Segment(self.length, line=1, **where))  # type: ignore[arg-type]
        self.parts.append(text)
        self.length += len(text)


def _paragraph_text(paragraph, text_boxes: list) -> str:
    """The text of one paragraph as Word shows it; text boxes inside it go to `text_boxes`."""
    pieces: list[str] = []

    def walk(element, symbol_font: bool, superscript: bool = False) -> None:
        for child in element:
            tag = child.tag
            if not isinstance(tag, str) or tag in _SKIPPED:
                continue
            if tag == _T or tag == _MATH_T:
                text = child.text or ""
                if superscript and text.isdigit() and pieces and "0" <= pieces[-1][-1:] <= "9":
                    # digits raised right after a number: an exponent or a note marker, which
                    # normalisation tells apart; kept apart from the number
                    text = text.translate(TO_SUPERSCRIPT)
                pieces.append(_in_symbol_font_text(text) if symbol_font else text)
            elif tag in _SINGLE_CHARACTERS:
                pieces.append(_SINGLE_CHARACTERS[tag])
            elif tag == _W + "sym":
                pieces.append(_symbol(child))
            elif tag == _TXBX_CONTENT:
                text_boxes.append(child)
            elif tag == _R:
                walk(child, _in_symbol_font(child), _is_superscript(child))
            else:
                walk(child, symbol_font, superscript)

    walk(paragraph, False)
    return "".join(pieces)


def _in_symbol_font_text(text: str) -> str:
    """What text typed in the Symbol font shows; Word may store its characters in the private
    use area (U+F063 for the "c" that shows a chi)."""
    characters = []
    for character in text:
        if "\uf020" <= character <= "\uf0ff":
            character = chr(ord(character) - 0xF000)
        characters.append(_SYMBOL_FONT.get(character, character))
    return "".join(characters)




def _is_superscript(run) -> bool:
    alignment = run.find(f"{_W}rPr/{_W}vertAlign")
    return alignment is not None and alignment.get(_W + "val") == "superscript"


def _in_symbol_font(run) -> bool:
    fonts = run.find(f"{_W}rPr/{_W}rFonts")
    if fonts is None:
        return False
    return any((fonts.get(_W + kind) or "").lower() == "symbol"
               for kind in ("ascii", "hAnsi", "cs"))


def _symbol(element) -> str:
    """A character inserted with Insert > Symbol (`<w:sym w:font="Symbol" w:char="F063"/>`)."""
    try:
        code = int(element.get(_W + "char") or "", 16)
    except ValueError:
        return ""
    if 0xF000 <= code <= 0xF0FF:  # fonts with a symbol character map use the private area
        code -= 0xF000
    elif code >= 0xE000:
        return ""
    character = chr(code)
    if (element.get(_W + "font") or "").lower() == "symbol":
        return _SYMBOL_FONT.get(character, character)
    return character if code >= 0x20 else ""


def _heading_style_ids(word_document) -> frozenset[str]:
    """Ids of the paragraph styles that mark a heading (Heading n, Title, or an outline level),
    following each style's "based on" chain."""
    styles_element = word_document.styles.element
    based_on: dict[str, str] = {}
    heading: set[str] = set()
    for style in styles_element.iterchildren(_W + "style"):
        if style.get(_W + "type") not in (None, "paragraph"):
            continue
        style_id = style.get(_W + "styleId") or ""
        name_element = style.find(_W + "name")
        name = (name_element.get(_VAL) if name_element is not None else "") or ""
        parent = style.find(_W + "basedOn")
        if parent is not None and parent.get(_VAL):
            based_on[style_id] = parent.get(_VAL)
        outline = style.find(f"{_W}pPr/{_W}outlineLvl")
        if re.fullmatch(r"(?i)heading\s*\d|title", name.strip()) or \
                (outline is not None and (outline.get(_VAL) or "9").isdigit()
                 and int(outline.get(_VAL) or "9") < 9):
            heading.add(style_id)
    result = set(heading)
    for style_id in based_on:
        seen = set()
        current = style_id
        while current in based_on and current not in seen:
            seen.add(current)
            current = based_on[current]
            if current in heading:
                result.add(style_id)
                break
    return frozenset(result)


def _children(element, tags: frozenset[str] | str) -> Iterator:
    """Children of `element` with one of `tags`, looking through content controls and other
    wrappers that Word may put around rows, cells, paragraphs and tables."""
    wanted = {tags} if isinstance(tags, str) else tags
    for child in element:
        if child.tag in wanted:
            yield child
        elif child.tag in _BLOCK_WRAPPERS:
            yield from _children(child, tags)


def _grid_span(cell) -> int:
    span = cell.find(f"{_W}tcPr/{_W}gridSpan")
    value = span.get(_VAL) if span is not None else None
    return int(value) if value and value.isdigit() and int(value) > 0 else 1


def _grid_before(row) -> int:
    before = row.find(f"{_W}trPr/{_W}gridBefore")
    value = before.get(_VAL) if before is not None else None
    return int(value) if value and value.isdigit() else 0


class _Reader:
    def __init__(self, word_document, path: str) -> None:
        self.word_document = word_document
        self.path = path
        self.output = _Output()
        self.heading_styles = _heading_style_ids(word_document)
        self.section: str | None = None
        self.paragraphs = 0
        self.note_paragraphs = 0
        self.tables = 0

    def read(self) -> tuple[str, list[Segment]]:
        self._blocks(self.word_document.element.body, place="body")
        for kind, relationship in (("footnotes", "footnotes"), ("endnotes", "endnotes")):
            notes = self._notes_part(relationship)
            if notes is not None:
                self._notes(notes, kind)
        return "".join(self.output.parts), self.output.segments

    # body ----------------------------------------------------------------------------------

    def _blocks(self, container, place: str) -> None:
        for block in _children(container, frozenset({_P, _TBL})):
            if block.tag == _P:
                self._paragraph(block, place)
            else:
                self._table(block, place)

    def _is_heading(self, paragraph) -> bool:
        properties = paragraph.find(_W + "pPr")
        if properties is None:
            return False
        style = properties.find(_W + "pStyle")
        if style is not None and style.get(_VAL) in self.heading_styles:
            return True
        outline = properties.find(_W + "outlineLvl")
        value = outline.get(_VAL) if outline is not None else None
        return bool(value and value.isdigit() and int(value) < 9)

    def _paragraph(self, paragraph, place: str) -> None:
        text_boxes: list = []
        text = _paragraph_text(paragraph, text_boxes)
        if text.strip():
            if place == "body" and self._is_heading(paragraph):
                self.section = " ".join(text.split())
                self.output.add(text, section=self.section)
            elif place == "body":
                self.paragraphs += 1
                self.output.add(text, section=self.section, paragraph=self.paragraphs)
            else:  # a note
                self.note_paragraphs += 1
                self.output.add(text, section=place, paragraph=self.note_paragraphs)
        for box in text_boxes:
            self._blocks(box, place)

    def _table(self, table, place: str) -> None:
        self.tables += 1
        number = self.tables
        section = self.section if place == "body" else place
        for row_number, row in enumerate(_children(table, _TR), start=1):
            column = _grid_before(row) + 1
            for cell in _children(row, _TC):
                label = f"table {number}, row {row_number}, column {column}"
                self._cell(cell, label, section, place)
                column += _grid_span(cell)

    def _cell(self, cell, label: str, section: str | None, place: str) -> None:
        lines: list[str] = []

        def flush() -> None:
            # empty paragraphs would put a blank line, a paragraph break, inside the cell
            text = "\n".join(line for line in lines if line.strip())
            if text.strip():
                self.output.add(text, section=section, cell=label)
            lines.clear()

        for block in _children(cell, frozenset({_P, _TBL})):
            if block.tag == _P:
                text_boxes: list = []
                lines.append(_paragraph_text(block, text_boxes))
                for box in text_boxes:
                    for paragraph in _children(box, _P):
                        lines.append(_paragraph_text(paragraph, []))
            else:  # a table inside the cell: its cells are pieces of their own
                flush()
                self._table(block, place)
        flush()

    # notes ---------------------------------------------------------------------------------

    def _notes_part(self, kind: str):
        from docx.opc.constants import RELATIONSHIP_TYPE

        reltype = RELATIONSHIP_TYPE.FOOTNOTES if kind == "footnotes" else \
            RELATIONSHIP_TYPE.ENDNOTES
        for relationship in self.word_document.part.rels.values():
            if relationship.reltype == reltype and not relationship.is_external:
                return _parse_part(relationship.target_part.blob, self.path, kind)
        return None

    def _notes(self, notes, kind: str) -> None:
        self.note_paragraphs = 0
        for note in notes:
            if note.tag not in (_W + "footnote", _W + "endnote"):
                continue
            if note.get(_W + "type") in ("separator", "continuationSeparator",
                                          "continuationNotice"):
                continue
            self._blocks(note, place=kind)


def _parse_part(blob: bytes, path: str, kind: str):
    """Parse a part python-docx does not model (footnotes, endnotes) without resolving
    entities, loading a DTD or touching the network."""
    from lxml import etree

    parser = etree.XMLParser(resolve_entities=False, no_network=True, load_dtd=False,
                             dtd_validation=False, huge_tree=False, remove_comments=True,
                             remove_pis=True)
    try:
        return etree.fromstring(blob, parser)
    except etree.XMLSyntaxError as exc:
        raise InputError(path, f"a damaged Word document (its {kind} are not well-formed "
                               f"XML: {exc})") from None
