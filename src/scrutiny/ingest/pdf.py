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
* running heads and feet (lines at the top or bottom of three or more pages, set off from the
  text, that are the same but for their numbers) and page numbers are left out, so that a
  statistic broken across a page break reads on;
* margin line numbers, turned text (watermarks, stamps), text outside the page and invisible
  duplicate text layers are left out; columns written line by line across the page are read
  column by column;
* glyphs of fonts without a correct Unicode map (a "=" printed as "¼", a "<" as ",", a chi as
  "c", a sign with no mapping at all) are read as what they stand for, decided per font.

Every repair is noted in the Document's `notes`. Encrypted PDFs, PDFs without a text layer and
damaged files raise `InputError` with a one-line reason.
"""

from __future__ import annotations

import contextlib
import gc
import re
from array import array
from bisect import bisect_right
from collections import Counter

import pypdfium2 as pypdfium
import pypdfium2.raw as pdfium

from ..errors import InputError
from ..model import Box, Document, Segment
from . import pdf_glyphs
from .pdf_layout import (SIGN_NUMBER, Context, Line, PageLayout, TextPage, close_numbers,
                         page_text, read_page, record_edges)

FORMAT = "pdf"
SUFFIXES = (".pdf",)

#: a PDF may start with a little junk before its header (the standard allows 1024 bytes)
_HEADER_REACH = 1024
#: fewer visible characters than this in the whole file: no text layer
_MIN_CHARACTERS = 20
#: fewer than this on a page: a page without text of its own (a scan with a stamp, a figure)
_TEXT_PAGE = 80
#: share of the page height at its top and bottom where running heads and feet are looked for
_BAND = 0.14
#: a running head or foot repeats on at least this many pages (fewer in very short files)
_REPEATS = 3
_DIGITS = re.compile(r"\d+")
_SPACES = re.compile(r"\s+")
_PAGE_NUMBER = re.compile(r"(?i)^(?:page|p\.|-|–|—)?\s*#\s*(?:(?:of|/)\s*#)?\s*(?:-|–|—)?$")
_CONTROL = re.compile(r"[\x00-\x08\x0b\x0c\x0e-\x1f\ufffe\uffff]")

_REPAIR_NOTES = {
    "unmapped glyphs": "{n} glyph(s) without a Unicode mapping taken from the character "
                       "codes (pages {pages})",
    "turned text": "text turned against the page (watermarks, margin stamps) left out "
                   "(pages {pages})",
    "text outside the page": "text outside the visible page left out (pages {pages})",
    "invisible text": "invisible text over visible text (a duplicate text layer) left out "
                      "(pages {pages})",
    "columns put in reading order": "columns printed line by line across the page were read "
                                    "column by column (pages {pages})",
    "margin line numbers": "margin line numbers left out (pages {pages})",
    "spaces in numbers": "{n} space(s) inside numbers taken out (pages {pages})",
    "running heads": "running heads, feet and page numbers left out (pages {pages})",
}


def sniff(data: bytes, path: str) -> str | None:
    head = data[:_HEADER_REACH]
    if head.lstrip(b"\xef\xbb\xbf \t\r\n\x00").startswith(b"%PDF-"):
        return FORMAT
    # a header after some junk (which readers accept), but not a text that mentions one
    if b"%PDF-" in head and (b"endobj" in data or b"startxref" in data):
        return FORMAT
    return None


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
        if _opens_without_pages(data):
            raise InputError(path, "this is a PDF without any page") from None
        if b"%%EOF" not in data[-_HEADER_REACH:]:
            raise InputError(path, "this is a PDF, but it is truncated (the file stops before "
                                   "its end) and cannot be read") from None
        raise InputError(path, "this is a PDF, but it is damaged and cannot be read") from None


def _opens_without_pages(data: bytes) -> bool:
    """True if pdfium can open the file but finds no page in it (pdfium's last error is not
    reset by a success, so it cannot tell this case from a damaged file)."""
    handle = pdfium.FPDF_LoadMemDocument64(data, len(data), None)
    if not handle:
        return False
    pdfium.FPDF_CloseDocument(handle)
    return True


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


@contextlib.contextmanager
def _without_cyclic_garbage_collection():
    """Reading a long PDF makes tens of thousands of small objects and no reference cycles;
    Python's cyclic collector would walk them again and again (a third of the reading time)."""
    enabled = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if enabled:
            gc.enable()


def read(data: bytes, path: str) -> Document:
    with _without_cyclic_garbage_collection():
        return _read(data, path)


def _read(data: bytes, path: str) -> Document:
    from . import build_document

    document = _open(data, path)
    page_count = len(document)
    pages: list[_Page] = []
    places: list[pdf_glyphs.Place] = []
    characters = 0
    failed_pages = []
    context = Context()
    for index in range(page_count):
        raw_page = pdfium.FPDF_LoadPage(document.raw, index)
        raw_textpage = pdfium.FPDFText_LoadPage(raw_page) if raw_page else None
        try:
            if not raw_textpage:
                failed_pages.append(index + 1)
                pages.append(_Page.empty())
                continue
            layout = read_page(raw_page, raw_textpage, context)
            text_page = TextPage(raw_textpage)
            text, starts = page_text(layout.lines)
            if close_numbers(text_page, layout, text, starts):
                text, starts = page_text(layout.lines)
            characters += len(text) - text.count(" ") - len(starts)
            sign_numbers = list(SIGN_NUMBER.finditer(text))
            places.extend(pdf_glyphs.collect(index, layout.lines, text_page, text, starts,
                                             sign_numbers))
            record_edges(text_page, layout, text, starts, sign_numbers)
            page = _Page(layout, text, starts)
            if page.visible_characters() < _TEXT_PAGE:
                page.pictured = _has_image(raw_page)
            pages.append(page)
        finally:
            if raw_textpage:
                pdfium.FPDFText_ClosePage(raw_textpage)
            if raw_page:
                pdfium.FPDF_ClosePage(raw_page)
    if characters < _MIN_CHARACTERS:
        if failed_pages and len(failed_pages) == page_count:
            raise InputError(path, "this is a PDF, but none of its pages can be read (damaged "
                                   "or truncated file)")
        raise InputError(path, "no text layer: scanned PDF, OCR not attempted")
    # A scan with a cover page or a download stamp of text: the manuscript itself is unread.
    textless = [number for number, page in enumerate(pages, start=1)
                if number not in failed_pages and page.visible_characters() < _TEXT_PAGE
                and (page.pictured or not page.characters)]
    if len(textless) >= 2 and 3 * len(textless) >= 2 * page_count:
        raise InputError(path, f"no text layer on {len(textless)} of {page_count} pages: "
                               "scanned PDF, OCR not attempted")

    notes: list[str] = []
    if b"%%EOF" not in data[-_HEADER_REACH:]:
        notes.append("the file ends without a PDF's end-of-file marker (truncated?): what "
                     "could be read was checked")
    meaning = pdf_glyphs.decide(places)
    notes.extend(pdf_glyphs.apply(places, meaning, pages))
    _drop_running_heads(pages)  # after the glyphs, whose places count lines
    for page in pages:
        page.cut_control_characters()
    notes[:0] = _repair_notes(pages)
    if textless:
        notes.append(f"no text of their own on pages {_page_ranges(textless)} (scanned pages "
                     "or figures: not read)")
    if failed_pages:
        notes.append(f"pages {_page_ranges(failed_pages)} could not be read (damaged)")

    text, segments, geometry = _assemble(document, pages)
    return build_document(path, FORMAT, text, segments=segments, pages=page_count,
                          geometry=geometry, notes=tuple(notes))


def _has_image(raw_page) -> bool:
    """True if the page shows an image (looked at for pages with little text only)."""
    for index in range(pdfium.FPDFPage_CountObjects(raw_page)):
        raw_object = pdfium.FPDFPage_GetObject(raw_page, index)
        if raw_object and pdfium.FPDFPageObj_GetType(raw_object) == pdfium.FPDF_PAGEOBJ_IMAGE:
            return True
    return False


def _repair_notes(layouts: list["_Page"]) -> list[str]:
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

def _signature(text: str) -> str:
    return _SPACES.sub(" ", _DIGITS.sub("#", text)).strip().lower()


def _drop_running_heads(pages: list["_Page"]) -> None:
    """Leave out lines at the top or bottom of pages that repeat (but for their numbers) on
    several pages, and bare page numbers there."""
    page_gaps = [gaps[len(gaps) // 4] for page in pages if len(gaps := page._line_gaps()) >= 8]
    usual_gap = sorted(page_gaps)[len(page_gaps) // 2] if page_gaps else 0.0
    heads = [page.head_candidates(usual_gap) for page in pages]
    seen: dict[str, set[int]] = {}
    for number, candidates in enumerate(heads):
        for _, signature in candidates:
            seen.setdefault(signature, set()).add(number)
    repeats = _REPEATS if len(pages) > 4 else 2
    for page, candidates in zip(pages, heads):
        drop = {index for index, signature in candidates
                if _PAGE_NUMBER.match(signature)
                or (len(seen[signature]) >= repeats and len(signature) > 1)}
        if drop:
            page.drop_lines(drop)
            page.repairs["running heads"] = page.repairs.get("running heads", 0) + len(drop)


# -- the Document's text and where each character came from ---------------------------------

class _Page:
    """One page as read, kept compact (a long PDF has thousands of lines): its text (the
    lines joined by line breaks), where each line starts, the pdfium index of each line's
    first character (-1 where the line is pieced together: `pieces`), the lines' boxes and
    whether their right edges are exact, and the edges of characters where claims may start
    or end. The lines themselves are kept only where control characters (glyphs without a
    Unicode mapping) may have to be cut once the fonts are understood."""

    __slots__ = ("text", "starts", "chars", "pieces", "boxes", "exact", "edges", "crop",
                 "rotation", "repairs", "characters", "lines", "_gaps", "pictured")

    def __init__(self, layout: PageLayout | None, text: str = "",
                 starts: list[int] | None = None) -> None:
        self.text = text
        self.starts = array("l", starts or ())
        self.chars = array("l")
        self.pieces: dict[int, list[tuple[int, int, int]]] = {}
        #: left, bottom, right and top of each line
        self.boxes = (array("d"), array("d"), array("d"), array("d"))
        self.exact = bytearray()
        self.edges: dict[int, tuple[float, float]] = {}
        self.crop: tuple[float, float, float, float] = (0.0, 0.0, 0.0, 0.0)
        self.rotation = 0
        self.repairs: dict[str, int] = {}
        self.characters = 0
        self.lines: list[Line] | None = None
        self._gaps: list[float] | None = None
        #: the page shows an image (set for pages with little text: a scan, a figure)
        self.pictured = False
        if layout is not None:
            self._take(layout)

    @classmethod
    def empty(cls) -> "_Page":
        return cls(None)

    def _take(self, layout: PageLayout) -> None:
        lines = layout.lines
        self.crop, self.rotation = layout.crop, layout.rotation
        self.repairs, self.characters, self.edges = layout.repairs, layout.characters, layout.edges
        chars = [line.pieces for line in lines]
        for index, pieces in enumerate(chars):
            if pieces.__class__ is not int:
                if (len(pieces) == 1 and pieces[0][0] == 0
                        and pieces[0][2] >= len(lines[index].text)):
                    chars[index] = pieces[0][1]
                else:
                    chars[index] = -1
                    self.pieces[index] = pieces
        self.chars = array("l", chars)
        self.boxes = (array("d", [line.x0 for line in lines]),
                      array("d", [line.bottom for line in lines]),
                      array("d", [line.x1 for line in lines]),
                      array("d", [line.top for line in lines]))
        self.exact = bytearray([line.exact for line in lines])
        if _CONTROL.search(self.text):
            self.lines = lines

    def _line_gaps(self) -> list[float]:
        """The spaces between vertically neighbouring lines (bottom to top of the next)."""
        if self._gaps is not None:
            return self._gaps
        tops, bottoms = self.boxes[3], self.boxes[1]
        order = sorted(range(len(tops)), key=tops.__getitem__)
        self._gaps = sorted(gap for below, above in zip(order, order[1:])
                            if (gap := bottoms[above] - tops[below]) > 0.5)
        return self._gaps

    def head_candidates(self, usual_gap: float) -> list[tuple[int, str]]:
        """Lines that may be running heads or feet, with their signatures.

        A running head or foot is the top or bottom line of the page (or the next one, beside
        a head or foot), in the band at the page's edge, and set off from the lines beyond it
        by more space than lines of text are set apart (the top line of a column is not a
        running head). `usual_gap` is that space on an ordinary page of the document.
        """
        _, bottom, _, top = self.crop
        height = top - bottom
        tops, bottoms = self.boxes[3], self.boxes[1]
        count = len(tops)
        order = sorted(range(count), key=tops.__getitem__)
        gaps = self._line_gaps()
        usual = gaps[len(gaps) // 4] if len(gaps) >= 8 else usual_gap
        candidates: list[int] = []
        for position, at_foot, beyond in ((0, True, None), (1, True, 0),
                                          (count - 1, False, None), (count - 2, False, count - 1)):
            if not 0 <= position < count or position in candidates or \
                    (beyond is not None and beyond not in candidates):
                continue
            index = order[position]
            if at_foot:
                if tops[index] > bottom + _BAND * height:
                    continue
                gap = bottoms[order[position + 1]] - tops[index] if position + 1 < count else height
            else:
                if bottoms[index] < top - _BAND * height:
                    continue
                gap = bottoms[index] - tops[order[position - 1]] if position >= 1 else height
            if gap > max(1.5 * usual, 0.3 * (tops[index] - bottoms[index])):
                candidates.append(position)
        return [(order[position], _signature(self.line_text(order[position])))
                for position in candidates]

    def visible_characters(self) -> int:
        return len(self.text) - self.text.count(" ") - max(0, len(self.starts) - 1)

    def line_text(self, index: int) -> str:
        end = self.starts[index + 1] - 1 if index + 1 < len(self.starts) else len(self.text)
        return self.text[self.starts[index]:end]

    def replace(self, line: int, offset: int, character: str) -> None:
        """Replace one character by one other (a glyph read as what it stands for)."""
        position = self.starts[line] + offset
        self.text = self.text[:position] + character + self.text[position + 1:]
        if self.lines is not None:
            self.lines[line].replace(offset, character)

    def drop_lines(self, indexes: set[int]) -> None:
        count = len(self.starts)
        keep = [i for i in range(count) if i not in indexes]
        if keep and keep[-1] - keep[0] + 1 == len(keep):
            # the usual case: heads first and feet last in the text; slices are enough
            first, last = keep[0], keep[-1] + 1
            begin = self.starts[first]
            end = self.starts[last] - 1 if last < count else len(self.text)
            self.text = self.text[begin:end]
            self.starts = array("l", [start - begin for start in self.starts[first:last]])
            self.chars = self.chars[first:last]
            self.boxes = tuple(values[first:last] for values in self.boxes)
            self.exact = self.exact[first:last]
        else:
            texts = [self.line_text(i) for i in keep]
            position, starts = 0, []
            for text in texts:
                starts.append(position)
                position += len(text) + 1
            self.text = "\n".join(texts)
            self.starts = array("l", starts)
            self.chars = array("l", [self.chars[i] for i in keep])
            self.boxes = tuple(array("d", [values[i] for i in keep]) for values in self.boxes)
            self.exact = bytearray(self.exact[i] for i in keep)
        self.pieces = {new: self.pieces[old] for new, old in enumerate(keep) if old in self.pieces}
        if self.lines is not None:
            self.lines = [self.lines[i] for i in keep]

    def cut_control_characters(self) -> None:
        """Cut the glyphs without a Unicode mapping that no font mapping explained."""
        if self.lines is None or not _CONTROL.search(self.text):
            return
        for line in self.lines:
            for found in reversed(list(_CONTROL.finditer(line.text))):
                line.cut(found.start(), found.end())
        lines = [line for line in self.lines if line.text.strip()]
        layout = PageLayout(lines, self.crop, self.rotation, self.repairs, self.characters,
                            self.edges)
        text, starts = page_text(lines)
        self.__init__(None, text, starts)
        self._take(layout)
        self.lines = None


def _assemble(document: pypdfium.PdfDocument, pages: list[_Page]):
    """The Document's text (the pages' lines, each ended by a line break) and where each of
    its characters came from."""
    parts: list[str] = []
    segments: list[Segment] = []
    lines = _Lines()
    pieces = _Pieces()
    position = 0
    for number, page in enumerate(pages, start=1):
        if not page.starts:
            continue
        segments.append(Segment(position, line=1, page=number))
        lines.starts.extend([position + start for start in page.starts])
        lines.pages.extend([number - 1] * len(page.starts))
        lines.chars.extend(page.chars)
        for values, more in zip(lines.boxes, page.boxes):
            values.extend(more)
        lines.exact.extend(page.exact)
        for index, line_pieces in page.pieces.items():
            start_of_line = position + page.starts[index]
            length = len(page.line_text(index))
            for start, char, count in line_pieces:
                if start < length:
                    pieces.add(start_of_line + start, number - 1, char,
                               min(count, length - start))
        parts.append(page.text)
        parts.append("\n")
        position += len(page.text) + 1
    text = "".join(parts)
    lines.starts.append(len(text))  # the end of the last line
    geometry_pages = [(page.crop, page.rotation) for page in pages]
    edges = [page.edges for page in pages]
    return text, tuple(segments), PdfGeometry(document, text, geometry_pages, pieces, lines,
                                              edges)


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
        #: where each line starts in the text, and after the last, where the text ends
        self.starts = array("l")
        self.pages = array("l")
        #: pdfium's index of the line's first character, or -1 (see `_Pieces`)
        self.chars = array("l")
        #: left, bottom, right and top of each line
        self.boxes = (array("d"), array("d"), array("d"), array("d"))
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
        index = max(0, bisect_right(lines.starts, start) - 1)
        found = []
        while index < len(lines.pages) and lines.starts[index] < end:
            line_start, line_end = lines.starts[index], lines.starts[index + 1] - 1
            line = text[line_start:line_end]
            printed = line.strip()
            span = text[max(start, line_start):min(end, line_end)]
            stripped = span.strip()
            if stripped and printed:
                first = max(start, line_start) + span.index(stripped[0])
                last = max(start, line_start) + len(span.rstrip()) - 1
                x0, bottom, x1, top = (values[index] for values in lines.boxes)
                if first > line_start + line.index(printed[0]):
                    x0 = self._edge(first, right=False) or x0
                if last < line_start + len(line.rstrip()) - 1 or not lines.exact[index]:
                    x1 = self._edge(last, right=True) or x1
                found.append(self._to_top_left(lines.pages[index], (x0, bottom, x1, top)))
            index += 1
        return tuple(found)
