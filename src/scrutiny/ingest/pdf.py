"""PDF manuscripts: the text layer, page by page, in reading order, with character boxes.

The text comes from pdfium (through pypdfium2), which keeps the reading order of two-column
pages and Greek letters as printed, and is many times faster than layout analysis in Python.
Each page becomes one `Segment` (page number, line 1), so a Claim's location is its page and
its line on the page (counted in reading order, without running heads and line numbers). The
Document's `text` is the text as read and repaired here; `PdfGeometry` looks up the boxes of a
claim's characters only when asked, from the PDF kept open for the check.

What PDFs do to statistics is repaired here, once (see `pdf_layout` for the page, `pdf_glyphs`
for the fonts); the format-independent rest (ligatures, superscript digits, mathematical italic
letters, dashes, hyphenation) is `normalise`'s work:

* a printed line that pdfium cut where a superscript or subscript moves the baseline is one
  line again ("χ" + "2" + "(1, N = 80)"), and a word hyphenated at a line end is two lines again;
* running heads and feet (lines at the top or bottom of three or more pages that are the same
  but for their numbers) and page numbers are left out, so that a statistic broken across a
  page break reads on;
* margin line numbers, turned text (watermarks, stamps), text outside the page and invisible
  duplicate text layers are left out; columns written line by line across the page are read
  column by column;
* glyphs of fonts without a correct Unicode map (a "=" printed as "¼", a "<" as ",", a chi as
  "c", a sign with no mapping at all) are read as what they stand for, decided per font.

Every repair is noted in the Document's `notes`. Encrypted PDFs, PDFs without a text layer and
damaged files raise `InputError` with a one-line reason.
"""

from __future__ import annotations

import re
from array import array
from bisect import bisect_right
from collections import Counter

import pypdfium2 as pypdfium
import pypdfium2.raw as pdfium

from ..errors import InputError
from ..model import Box, Document, Segment
from . import pdf_glyphs
from .pdf_layout import Context, Line, PageLayout, TextPage, read_page, record_edges

FORMAT = "pdf"
SUFFIXES = (".pdf",)

#: a PDF may start with a little junk before its header (the standard allows 1024 bytes)
_HEADER_REACH = 1024
#: fewer visible characters than this in the whole file: no text layer
_MIN_CHARACTERS = 20
#: share of the page height at its top and bottom where running heads and feet are looked for
_BAND = 0.14
#: a running head or foot repeats on at least this many pages (fewer in very short files)
_REPEATS = 3
_DIGITS = re.compile(r"\d+")
_SPACES = re.compile(r"\s+")
_PAGE_NUMBER = re.compile(r"(?i)^(?:page|p\.|-|–|—)?\s*#\s*(?:(?:of|/)\s*#)?\s*(?:-|–|—)?$")
_CONTROL = re.compile(r"[\x00-\x08\x0b\x0c\x0e-\x1f\ufffe\uffff]")

_REPAIR_NOTES = {
    "unmapped glyphs": "{n} glyphs without a Unicode mapping were taken from the character "
                       "codes (pages {pages})",
    "turned text": "text turned against the page (watermarks, margin stamps) left out "
                   "(pages {pages})",
    "text outside the page": "text outside the visible page left out (pages {pages})",
    "invisible text": "invisible text over visible text (a duplicate text layer) left out "
                      "(pages {pages})",
    "columns put in reading order": "columns printed line by line across the page were read "
                                    "column by column (pages {pages})",
    "margin line numbers": "margin line numbers left out (pages {pages})",
    "spaces in numbers": "{n} spaces inside numbers taken out (pages {pages})",
    "running heads": "running heads, feet and page numbers left out (pages {pages})",
}


def sniff(data: bytes, path: str) -> str | None:
    return FORMAT if b"%PDF-" in data[:_HEADER_REACH] else None


def _open(data: bytes, path: str) -> pypdfium.PdfDocument:
    try:
        return pypdfium.PdfDocument(data)
    except pypdfium.PdfiumError as exc:
        code = getattr(exc, "err_code", None)
        if code == pdfium.FPDF_ERR_PASSWORD:
            raise InputError(path, "encrypted PDF: cannot be read without its password") from None
        if code == pdfium.FPDF_ERR_SECURITY:
            raise InputError(path, "encrypted PDF with an unsupported security handler: "
                                   "cannot be read") from None
        if b"%%EOF" not in data[-_HEADER_REACH:]:
            raise InputError(path, "this is a PDF, but it is truncated (the file stops before "
                                   "its end) and cannot be read") from None
        raise InputError(path, "this is a PDF, but it is damaged and cannot be read") from None


def _page_ranges(numbers: list[int]) -> str:
    """"3, 5-7, 10" for [3, 5, 6, 7, 10]."""
    numbers = sorted(set(numbers))
    ranges = []
    start = previous = numbers[0]
    for number in numbers[1:] + [None]:
        if number is not None and number == previous + 1:
            previous = number
            continue
        ranges.append(str(start) if start == previous else f"{start}-{previous}")
        if number is not None:
            start = previous = number
    return ", ".join(ranges)


def read(data: bytes, path: str) -> Document:
    from . import build_document

    document = _open(data, path)
    page_count = len(document)
    layouts: list[PageLayout] = []
    places: list[pdf_glyphs.Place] = []
    characters = 0
    failed_pages = []
    context = Context()
    for index in range(page_count):
        raw_page = pdfium.FPDF_LoadPage(document.raw, index)
        if not raw_page:
            failed_pages.append(index + 1)
            layouts.append(PageLayout([], (0.0, 0.0, 0.0, 0.0), 0))
            continue
        raw_textpage = pdfium.FPDFText_LoadPage(raw_page)
        try:
            if not raw_textpage:
                failed_pages.append(index + 1)
                layouts.append(PageLayout([], (0.0, 0.0, 0.0, 0.0), 0))
                continue
            layout = read_page(raw_page, raw_textpage, context)
            characters += sum(len(line.text.strip()) for line in layout.lines)
            text_page = TextPage(raw_textpage)
            found = pdf_glyphs.collect(index, layout.lines, text_page)
            places.extend(found)
            record_edges(text_page, layout, {place.line for place in found})
            layouts.append(layout)
        finally:
            if raw_textpage:
                pdfium.FPDFText_ClosePage(raw_textpage)
            pdfium.FPDF_ClosePage(raw_page)
    if characters < _MIN_CHARACTERS:
        if failed_pages and len(failed_pages) == page_count:
            raise InputError(path, "this is a PDF, but none of its pages can be read (damaged "
                                   "or truncated file)")
        raise InputError(path, "no text layer: scanned PDF, OCR not attempted")

    notes: list[str] = []
    if b"%%EOF" not in data[-_HEADER_REACH:]:
        notes.append("the file ends without a PDF's end-of-file marker (truncated?): what "
                     "could be read was checked")
    meaning = pdf_glyphs.decide(places)
    notes.extend(pdf_glyphs.apply(places, meaning, layouts))
    _drop_running_heads(layouts)  # after the glyphs, whose places count lines
    notes[:0] = _repair_notes(layouts)
    empty = [number for number, layout in enumerate(layouts, start=1)
             if layout.characters == 0 and number not in failed_pages]
    if empty:
        notes.append(f"no text layer on pages {_page_ranges(empty)} (scanned pages are not "
                     "read)")
    if failed_pages:
        notes.append(f"pages {_page_ranges(failed_pages)} could not be read (damaged)")

    text, segments, geometry = _assemble(document, layouts)
    return build_document(path, FORMAT, text, segments=segments, pages=page_count,
                          geometry=geometry, notes=tuple(notes))


def _repair_notes(layouts: list[PageLayout]) -> list[str]:
    pages: dict[str, list[int]] = {}
    counts: Counter = Counter()
    for number, layout in enumerate(layouts, start=1):
        for kind, count in layout.repairs.items():
            pages.setdefault(kind, []).append(number)
            counts[kind] += count
    notes = []
    for kind, template in _REPAIR_NOTES.items():
        if kind in pages:
            notes.append(template.format(n=counts[kind], pages=_page_ranges(pages[kind])))
    return notes


# -- running heads and feet ------------------------------------------------------------------

def _signature(line: Line) -> str:
    return _SPACES.sub(" ", _DIGITS.sub("#", line.text)).strip().lower()


def _drop_running_heads(layouts: list[PageLayout]) -> None:
    """Leave out lines at the top or bottom of pages that repeat (but for their numbers) on
    several pages, and bare page numbers there."""
    candidates: list[tuple[int, int, str]] = []
    seen: dict[str, set[int]] = {}
    for page, layout in enumerate(layouts):
        lines = layout.lines
        if not lines:
            continue
        _, bottom, _, top = layout.crop
        height = top - bottom
        order = sorted(range(len(lines)), key=lambda i: -lines[i].top)
        edge = order[:2] + order[-2:] if len(order) > 2 else order
        for index in dict.fromkeys(edge):
            line = lines[index]
            if line.bottom < top - _BAND * height and line.top > bottom + _BAND * height:
                continue
            signature = _signature(line)
            candidates.append((page, index, signature))
            seen.setdefault(signature, set()).add(page)
    repeats = _REPEATS if len(layouts) > 4 else 2
    drop: dict[int, set[int]] = {}
    for page, index, signature in candidates:
        if _PAGE_NUMBER.match(signature) or (len(seen[signature]) >= repeats
                                              and len(signature) > 1):
            drop.setdefault(page, set()).add(index)
    for page, indexes in drop.items():
        layout = layouts[page]
        layout.lines = [line for i, line in enumerate(layout.lines) if i not in indexes]
        layout.count("running heads", len(indexes))


# -- the Document's text and where each character came from ---------------------------------

def _assemble(document: pypdfium.PdfDocument, layouts: list[PageLayout]):
    parts: list[str] = []
    segments: list[Segment] = []
    lines = _Lines()
    pieces = _Pieces()
    # bound methods: this loop runs once for every line of the document
    add_start, add_page = lines.starts.append, lines.pages.append
    add_first, add_last = lines.first.append, lines.last.append
    add_char, add_box, add_exact = lines.chars.append, lines.boxes.extend, lines.exact.append
    add_part = parts.append
    position = 0
    for number, layout in enumerate(layouts, start=1):
        page_lines = [line for line in layout.lines if line.text.strip()]
        if not page_lines:
            continue
        page = number - 1
        segments.append(Segment(position, line=1, page=number))
        check_control = any(_CONTROL.search(line.text) for line in page_lines)
        for line in page_lines:
            if check_control and _CONTROL.search(line.text):
                for found in reversed(list(_CONTROL.finditer(line.text))):
                    line.cut(found.start(), found.end())
            text = line.text
            length = len(text)
            line_pieces = line.pieces
            if len(line_pieces) == 1 and line_pieces[0][0] == 0 and line_pieces[0][2] >= length:
                add_char(line_pieces[0][1])  # one to one: no pieces needed
            else:
                add_char(-1)
                for start, char, count in line_pieces:
                    if start < length:
                        pieces.add(position + start, page, char, min(count, length - start))
            add_start(position)
            add_page(page)
            add_first(position + length - len(text.lstrip()))
            add_last(position + len(text.rstrip()) - 1)
            add_box((line.x0, line.bottom, line.x1, line.top))
            add_exact(line.exact)
            add_part(text)
            add_part("\n")
            position += length + 1
    text = "".join(parts)
    pages = [(layout.crop, layout.rotation) for layout in layouts]
    edges = [layout.edges for layout in layouts]
    return text, tuple(segments), PdfGeometry(document, text, pages, pieces, lines, edges)


class _Pieces:
    """Runs of the Document's text that come one to one from pdfium's characters, for the
    lines that are not one such run from end to end."""

    def __init__(self) -> None:
        self.starts = array("l")
        self.pages = array("l")
        self.chars = array("l")
        self.lengths = array("l")

    def add(self, start: int, page: int, char: int, length: int) -> None:
        self.starts.append(start)
        self.pages.append(page)
        self.chars.append(char)
        self.lengths.append(length)

    def find(self, offset: int) -> tuple[int, int] | None:
        """(page, pdfium character index) of a Document offset, if it has one."""
        index = bisect_right(self.starts, offset) - 1
        if index < 0 or offset >= self.starts[index] + self.lengths[index]:
            return None
        return self.pages[index], self.chars[index] + offset - self.starts[index]


class _Lines:
    """The printed lines of the Document's text: where each starts, its page, its box, and
    the pdfium index of its first character where the line is one run of characters."""

    def __init__(self) -> None:
        self.starts = array("l")
        self.pages = array("l")
        self.first = array("l")
        self.last = array("l")
        #: pdfium's index of the line's first character, or -1 (see `_Pieces`)
        self.chars = array("l")
        self.boxes = array("d")
        #: 1 where the right edge in `boxes` is the last character's, 0 where estimated
        self.exact = bytearray()

    def find(self, offset: int, pieces: _Pieces) -> tuple[int, int] | None:
        index = bisect_right(self.starts, offset) - 1
        if index < 0:
            return None
        if self.chars[index] >= 0:
            return self.pages[index], self.chars[index] + offset - self.starts[index]
        return pieces.find(offset)


class PdfGeometry:
    """Boxes of a span of the Document's text, one per printed line.

    A box runs from the span's first to its last printed character on the line and covers
    the line's height. The edges of characters where claims start and end were kept while the
    pages were read; any other character is looked up in the PDF, kept open for the check.
    """

    def __init__(self, document: pypdfium.PdfDocument, text: str, pages, pieces: _Pieces,
                 lines: _Lines, edges: list[dict[int, tuple[float, float]]]) -> None:
        self._document = document
        self._text = text
        self._pages = pages
        self._pieces = pieces
        self._lines = lines
        self._edges = edges
        self._open_page: tuple[int, object, TextPage] | None = None

    def _text_page(self, page: int) -> TextPage | None:
        # pypdfium2's page objects close before their document does, even at exit
        if self._open_page is not None and self._open_page[0] == page:
            return self._open_page[2]
        self._close()
        try:
            pdf_page = self._document[page]
            pdf_text_page = pdf_page.get_textpage()
        except pypdfium.PdfiumError:
            return None
        self._open_page = (page, (pdf_page, pdf_text_page), TextPage(pdf_text_page.raw))
        return self._open_page[2]

    def _close(self) -> None:
        if self._open_page is not None:
            pdf_page, pdf_text_page = self._open_page[1]
            self._open_page = None
            pdf_text_page.close()
            pdf_page.close()

    def _edge(self, offset: int, right: bool) -> float | None:
        found = self._lines.find(offset, self._pieces)
        if found is None:
            return None
        page, char = found
        edges = self._edges[page].get(char)
        if edges is None:
            text_page = self._text_page(page)
            if text_page is None:
                return None
            left, _, right_edge, _ = text_page.box(char)
            edges = self._edges[page][char] = (left, right_edge)
        return edges[1] if right else edges[0]

    def _to_top_left(self, page: int, box: tuple[float, float, float, float]) -> Box:
        (left, bottom, right, top), rotation = self._pages[page]
        x0, y0, x1, y1 = box
        corners = ((x0, y0), (x1, y1))
        if rotation == 90:
            points = [(y - bottom, x - left) for x, y in corners]
        elif rotation == 180:
            points = [(right - x, y - bottom) for x, y in corners]
        elif rotation == 270:
            points = [(top - y, right - x) for x, y in corners]
        else:
            points = [(x - left, top - y) for x, y in corners]
        xs = [p[0] for p in points]
        ys = [p[1] for p in points]
        return Box(page + 1, round(min(xs), 2), round(min(ys), 2), round(max(xs), 2),
                   round(max(ys), 2))

    def boxes(self, start: int, end: int) -> tuple[Box, ...]:
        lines = self._lines
        text = self._text
        first_line = max(0, bisect_right(lines.starts, start) - 1)
        found = []
        index = first_line
        while index < len(lines.starts) and lines.starts[index] < end:
            line_end = lines.last[index] + 1
            span_start, span_end = max(start, lines.starts[index]), min(end, line_end)
            segment = text[span_start:span_end]
            stripped = segment.strip()
            if stripped:
                first = span_start + segment.index(stripped[0])
                last = span_start + len(segment.rstrip()) - 1
                x0, bottom, x1, top = lines.boxes[4 * index:4 * index + 4]
                if first > lines.first[index]:
                    x0 = self._edge(first, right=False) or x0
                if last < lines.last[index] or not lines.exact[index]:
                    x1 = self._edge(last, right=True) or x1
                found.append(self._to_top_left(lines.pages[index], (x0, bottom, x1, top)))
            index += 1
        return tuple(found)
