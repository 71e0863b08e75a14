"""The printed lines of one PDF page, in reading order, from pdfium's text layer.

pdfium (through pypdfium2) gives a page's text in the order of its content stream, which keeps
two-column manuscripts in reading order, and cuts it into lines. Each line here keeps, beside
its text, which of pdfium's characters it came from (`pieces`), so that the box of any span of
the text can be looked up later, and the box of its first and last printed characters, from
which a few page-level repairs are made:

* pieces of one printed line that pdfium put on lines of their own because a superscript or
  subscript moved the baseline ("χ" / "2" / "(1, N = 80)") are joined again;
* a word hyphenated at the end of a line, which pdfium joins into one line with a hyphen mark,
  is cut into its two printed lines again (the hyphen is joined in normalisation);
* characters whose glyph has no Unicode mapping, which pdfium leaves out of its text, are put
  back as their character code (publisher math fonts; see `pdf_glyphs`);
* text turned against the page (diagonal watermarks, stamps in the margin) is left out unless
  most of the page is turned (a landscape table);
* text outside the page, and invisible text (render mode 3, or clipped away: an old version of
  a page embedded as a figure) that lies over visible text, is left out;
* margin line numbers, which pdfium puts at the start or end of the line they stand beside,
  are cut out;
* two columns written line by line across the page (which pdfium merges into lines that run
  across the gutter) are split at the gutter and read column by column;
* digits printed smaller and raised right after the number of a result ("p = .021³", a
  footnote marker) become superscript digits, which normalisation keeps apart from the number.

All boxes here are in PDF user space (points, origin at the bottom left of the media box).
"""

from __future__ import annotations

import ctypes
import math
import re
from bisect import bisect_right
from dataclasses import dataclass, field

import pypdfium2.raw as pdfium

from .normalise import TO_SUPERSCRIPT

#: a generated line break of pdfium's text, and its mark of a word hyphenated at a line end
_LINE_BREAK = re.compile("\r\n|\ufffe")
#: an integer printed in the margin beside a line, at the line's start or end
_NUMBER_AT_START = re.compile(r"\s*(\d{1,5})(?=\s)")
_NUMBER_AT_END = re.compile(r"(?<=\s)(\d{1,5})\s*$")
_ONLY_NUMBER = re.compile(r"\s*\d{1,5}\s*$")
#: render modes that paint nothing (3: invisible, 7: clip only)
_INVISIBLE_MODES = (3, 7)
_TURNED = 0.05  # radians: a character turned further than this is not upright


@dataclass(slots=True)
class Line:
    """One line of text on a page and the pdfium characters behind it."""

    text: str
    #: (offset in `text`, index of pdfium's character for it, length): runs of characters that
    #: correspond one to one; characters outside every piece have no box (inserted ones). An
    #: int instead, for the usual line that is one such run: the index of its first character
    #: (no list to allocate for each of the thousands of lines of a long document).
    pieces: list[tuple[int, int, int]] | int
    x0: float = 0.0
    bottom: float = 0.0
    x1: float = 0.0
    top: float = 0.0
    #: the line's first or last character is turned against the page
    turned: bool = False
    #: x1 is the right edge of the last character (else an estimate from the line's length)
    exact: bool = True

    @property
    def height(self) -> float:
        return self.top - self.bottom

    def runs(self) -> list[tuple[int, int, int]]:
        """`pieces` as a list."""
        pieces = self.pieces
        if pieces.__class__ is int:
            return [(0, pieces, len(self.text))]
        return pieces

    def char_at(self, offset: int) -> int | None:
        pieces = self.pieces
        if pieces.__class__ is int:
            return pieces + offset if 0 <= offset < len(self.text) else None
        for start, char, length in pieces:
            if start <= offset < start + length:
                return char + offset - start
        return None

    def cut(self, start: int, end: int) -> None:
        """Remove text[start:end]."""
        removed = end - start
        pieces = []
        for piece_start, char, length in self.runs():
            piece_end = piece_start + length
            if piece_end <= start:
                pieces.append((piece_start, char, length))
            elif piece_start >= end:
                pieces.append((piece_start - removed, char, length))
            else:
                if piece_start < start:
                    pieces.append((piece_start, char, start - piece_start))
                if piece_end > end:
                    pieces.append((start, char + end - piece_start, piece_end - end))
        self.pieces = pieces
        self.text = self.text[:start] + self.text[end:]

    def replace(self, offset: int, character: str) -> None:
        """Replace one character by one other character (the boxes stay)."""
        self.text = self.text[:offset] + character + self.text[offset + 1:]

    def extend(self, other: "Line", separator: str) -> None:
        """Append another line's text (pieces of one printed line that pdfium cut)."""
        shift = len(self.text) + len(separator)
        self.pieces = self.runs() + [(start + shift, char, length)
                                     for start, char, length in other.runs()]
        self.text = self.text + separator + other.text
        self.x0, self.x1 = min(self.x0, other.x0), max(self.x1, other.x1)
        self.bottom, self.top = min(self.bottom, other.bottom), max(self.top, other.top)
        self.turned = self.turned or other.turned
        self.exact = other.exact


@dataclass
class PageLayout:
    """The printed lines of one page and what was repaired on it."""

    lines: list[Line]
    #: the visible page (crop box) in user space, and its rotation in degrees clockwise
    crop: tuple[float, float, float, float]
    rotation: int
    #: repairs made on this page, by kind (the reader notes each kind), with counts
    repairs: dict[str, int] = field(default_factory=dict)
    #: characters on the page, and whether pdfium found any
    characters: int = 0
    #: left and right edge of characters where a claim may start or end, by pdfium's index
    edges: dict[int, tuple[float, float]] = field(default_factory=dict)
    #: the lines joined by line breaks and where each starts (None after a line changed)
    text: str | None = None
    starts: list[int] | None = None

    def count(self, kind: str, number: int = 1) -> None:
        self.repairs[kind] = self.repairs.get(kind, 0) + number


class TextPage:
    """Thin, fast access to one pdfium text page (pypdfium2's raw functions, reused buffers)."""

    def __init__(self, raw_textpage) -> None:
        self.raw = raw_textpage
        self.count = pdfium.FPDFText_CountChars(raw_textpage)
        self._rect = pdfium.FS_RECTF()
        self._font_buffer = ctypes.create_string_buffer(256)
        self._flags = ctypes.c_int()

    def box(self, char: int) -> tuple[float, float, float, float]:
        """The loose box (left, bottom, right, top) of a character: its font's full height."""
        rect = self._rect
        pdfium.FPDFText_GetLooseCharBox(self.raw, char, rect)
        return rect.left, rect.bottom, rect.right, rect.top

    def angle(self, char: int) -> float:
        return pdfium.FPDFText_GetCharAngle(self.raw, char)

    def unicode(self, char: int) -> int:
        return pdfium.FPDFText_GetUnicode(self.raw, char)

    def font(self, char: int) -> str:
        """The name of the font a character is printed in ("" when the font has none)."""
        length = pdfium.FPDFText_GetFontInfo(self.raw, char, self._font_buffer, 256, self._flags)
        if length <= 0:
            return ""
        name = self._font_buffer.value.decode("latin-1", "replace")
        # Subset fonts carry a six-letter tag ("ABCDEF+MathPi"); the tag differs between
        # subsets of one font, so the name without it identifies the font.
        return name.split("+", 1)[1] if len(name) > 7 and name[6] == "+" else name

    def text(self) -> tuple[str, int]:
        """The page's text and its length in UTF-16 code units."""
        buffer = (ctypes.c_ushort * (self.count + 1))()
        written = pdfium.FPDFText_GetText(self.raw, 0, self.count, buffer)
        units = max(0, written - 1)
        return bytes(memoryview(buffer).cast("B")[:2 * units]).decode("utf-16-le", "replace"), units


def _text_to_chars(page: TextPage, text: str, units: int) -> tuple[str, list[int] | None]:
    """Map each character of `text` to pdfium's character index.

    Returns the text and None when they correspond one to one (nearly always). Otherwise the
    text with every character pdfium left out of it put back (glyphs without a Unicode
    mapping, as their character code) and the index of each of its characters (-1 where none).
    """
    if units == page.count and len(text) == units:
        return text, None
    indexes: list[int] = []
    unit = 0
    for character in text:
        indexes.append(pdfium.FPDFText_GetCharIndexFromTextIndex(page.raw, unit))
        unit += 2 if ord(character) > 0xFFFF else 1
    seen = set(indexes)
    # a character beyond the BMP is two of pdfium's characters (its surrogates)
    seen.update(char + 1 for char, character in zip(indexes, text) if ord(character) > 0xFFFF)
    missing = [char for char in range(page.count) if char not in seen]
    if not missing:
        return text, indexes
    pieces, mapped = [], []
    cursor = 0
    for char in missing:
        code = page.unicode(char)
        if code == 0 or code in (0x0D, 0x0A):
            continue
        # put the left-out character after the last character of the text that precedes it
        position = cursor
        while position < len(indexes) and indexes[position] < char:
            position += 1
        pieces.append(text[cursor:position])
        mapped.extend(indexes[cursor:position])
        pieces.append(chr(code) if code < 0x110000 else "\ufffd")
        mapped.append(char)
        cursor = position
    pieces.append(text[cursor:])
    mapped.extend(indexes[cursor:])
    return "".join(pieces), mapped


def _raw_lines(page: TextPage, text: str, indexes: list[int] | None) -> list[Line]:
    """Cut the page's text into pdfium's lines, with their characters and boxes."""
    if indexes is None and "\ufffe" not in text:
        return _plain_lines(page, text)
    lines: list[Line] = []
    start = 0
    breaks: list = list(_LINE_BREAK.finditer(text))
    breaks.append(None)
    for found in breaks:
        end = found.start() if found is not None else len(text)
        hyphen = found is not None and found.group() == "\ufffe"
        if hyphen:
            char = found.start() if indexes is None else indexes[found.start()]
            if char >= 0 and not pdfium.FPDFText_IsHyphen(page.raw, char):
                continue  # a glyph mapped to nothing, not a hyphen: it stays in the line
        segment = text[start:end] + ("-" if hyphen else "")
        if segment.strip():
            if indexes is None:
                pieces = [(0, start, len(segment))]
            else:
                pieces = _pieces(indexes, start, start + len(segment))
            line = Line(segment, pieces)
            _measure(page, line)
            lines.append(line)
        start = found.end() if found is not None else len(text)
    return lines


def _plain_lines(page: TextPage, text: str) -> list[Line]:
    """`_raw_lines` for the usual page: text and characters one to one, no hyphen marks.

    Only the first character of each line is looked up; the right edge is estimated from the
    line's length until something needs it exactly (`measure_end`).
    """
    lines: list[Line] = []
    append = lines.append
    raw = page.raw
    rect = page._rect
    get_box = pdfium.FPDFText_GetLooseCharBox
    start = 0
    for segment in text.split("\r\n"):
        length = len(segment)
        if length and not segment.isspace():
            first = start if segment[0] != " " else start + length - len(segment.lstrip())
            get_box(raw, first, rect)
            x0, bottom, top = rect.left, rect.bottom, rect.top
            append(Line(segment, start, x0, bottom, x0 + 0.5 * (top - bottom) * length, top,
                        False, False))
        start += length + 2
    return lines


def _pieces(indexes: list[int], start: int, end: int) -> list[tuple[int, int, int]]:
    pieces: list[tuple[int, int, int]] = []
    for offset in range(start, end):
        char = indexes[offset]
        if char < 0:
            continue
        if pieces:
            piece_start, piece_char, length = pieces[-1]
            if piece_start + length == offset - start and piece_char + length == char:
                pieces[-1] = (piece_start, piece_char, length + 1)
                continue
        pieces.append((offset - start, char, 1))
    return pieces


def _measure(page: TextPage, line: Line) -> None:
    """Set a line's box from its first and last printed characters."""
    text = line.text
    first_char = line.char_at(len(text) - len(text.lstrip()))
    last_char = line.char_at(len(text.rstrip()) - 1)
    if first_char is None or last_char is None:
        chars = [c for _, c, n in line.runs() for c in (c, c + n - 1)]
        if not chars:
            return
        first_char, last_char = min(chars), max(chars)
    left, bottom, right, top = page.box(first_char)
    left2, bottom2, right2, top2 = page.box(last_char)
    line.x0, line.x1 = min(left, left2), max(right, right2)
    line.bottom, line.top = min(bottom, bottom2), max(top, top2)


def measure_end(page: TextPage, line: Line) -> None:
    """Make a line's right edge exact: the right edge of its last printed character."""
    if line.exact:
        return
    char = line.char_at(len(line.text.rstrip()) - 1)
    line.exact = True
    if char is None:
        return
    left, bottom, right, top = page.box(char)
    line.x1 = max(line.x0, right)
    line.bottom, line.top = min(line.bottom, bottom), max(line.top, top)


def _is_turned(page: TextPage, line: Line) -> bool:
    for offset in (len(line.text) - len(line.text.lstrip()), len(line.text.rstrip()) - 1):
        char = line.char_at(offset)
        if char is not None and abs(math.remainder(page.angle(char), 2 * math.pi)) > _TURNED:
            return True
    return False


class Context:
    """What reading the earlier pages of a document found out about the later ones."""

    def __init__(self) -> None:
        #: x positions (rounded points) of margin line numbers
        self.line_number_anchors: set[int] = set()


def read_page(raw_page, raw_textpage, context: Context | None = None) -> PageLayout:
    """The printed lines of one page, repaired as the module docstring says."""
    context = context or Context()
    page = TextPage(raw_textpage)
    left, bottom, right, top = (ctypes.c_float(), ctypes.c_float(), ctypes.c_float(),
                                ctypes.c_float())
    if not pdfium.FPDFPage_GetCropBox(raw_page, left, bottom, right, top):
        pdfium.FPDFPage_GetMediaBox(raw_page, left, bottom, right, top)
    crop = (min(left.value, right.value), min(bottom.value, top.value),
            max(left.value, right.value), max(bottom.value, top.value))
    if crop[2] - crop[0] < 1 or crop[3] - crop[1] < 1:
        crop = (0.0, 0.0, pdfium.FPDF_GetPageWidthF(raw_page), pdfium.FPDF_GetPageHeightF(raw_page))
    layout = PageLayout([], crop, (pdfium.FPDFPage_GetRotation(raw_page) % 4) * 90,
                        characters=page.count)
    if page.count <= 0:
        return layout
    text, units = page.text()
    text, indexes = _text_to_chars(page, text, units)
    if indexes is not None and len(text) > units:
        layout.count("unmapped glyphs", len(text) - units)
    lines = _raw_lines(page, text, indexes)
    lines = _drop_turned(page, lines, layout)
    lines = _drop_outside(lines, layout)
    lines = _drop_hidden(page, raw_page, lines, layout)
    lines = _split_interleaved_columns(page, lines, layout)
    _cut_line_numbers(page, lines, layout, context.line_number_anchors)
    layout.lines = _join_printed_lines(page, lines)
    _mark_raised_digits(page, layout.lines)
    return layout


# Where a claim may start (a statistic's symbol at the start of a word, a delta, emphasis) and
# where it may end (the last digit of a number after a sign). The edges of these
# characters are kept while the page is open, so that the box of a claim can be given without
# reading the page a second time (any other character is looked up then).
_CLAIM_START = re.compile(r"(?<![^\W_])[tFrzZXxχΧ𝑡𝐹𝑟𝑧𝜒Δ∆*_](?![a-rt-z])"
                          r"|[Cc](?=hi)")
#: a sign (or a glyph that may stand for one) and the number after it (scanned once a page)
SIGN_NUMBER = re.compile(r"(?P<sign>[=<>\u2264\u2265,\u00bc\u2afd\u2b0d\x00-\x08])\s?-?[ ]?"
                         r"(?P<number>[\d.,]*(\d))(?:[ ]?[×x*·][ ]?10[ ]?\^?-?[ ]?\d*(\d))?")




def _mark_raised_digits(page: TextPage, lines: list[Line]) -> None:
    """Digits printed smaller and raised right after the number of a result ("p = .021" with a
    footnote marker 3 set as a superscript) become superscript digits, so that ".0213" is not
    read as the p-value. Only numbers after a sign are examined; a digit counts as raised when
    its font box is under 85% of the height of the number's first digit and starts at least
    15% of that height higher."""
    for line in lines:
        text = line.text
        if "=" not in text and "<" not in text and ">" not in text:
            continue
        for found in SIGN_NUMBER.finditer(text):
            start, end = found.span("number")
            first = next((i for i in range(start, end) if text[i].isdigit()), None)
            base = line.char_at(first) if first is not None else None
            if base is None:
                continue
            _, base_bottom, _, base_top = page.box(base)
            base_height = base_top - base_bottom
            if base_height <= 0:
                continue
            for offset in range(first + 1, end):
                if not (text[offset].isdigit() and text[offset - 1].isdigit()):
                    continue
                char = line.char_at(offset)
                if char is None:
                    continue
                _, bottom, _, top = page.box(char)
                if top - bottom < 0.85 * base_height and bottom - base_bottom > 0.15 * base_height:
                    stop = offset
                    while stop < len(text) and text[stop].isdigit():
                        stop += 1
                    text = text[:offset] + text[offset:stop].translate(TO_SUPERSCRIPT) \
                        + text[stop:]
                    break
        line.text = text


def page_text(lines: list[Line]) -> tuple[str, list[int]]:
    """The lines joined by line breaks, and where each starts in that text."""
    starts = []
    position = 0
    for line in lines:
        starts.append(position)
        position += len(line.text) + 1
    return "\n".join(line.text for line in lines), starts


def record_edges(text_page, layout: PageLayout, text: str | None = None,
                 starts: list[int] | None = None, sign_numbers: list | None = None) -> None:
    """Keep the left and right edges of the characters where a claim may start or end
    (`text`, `starts`: `page_text`; `sign_numbers`: the matches of `SIGN_NUMBER` in it)."""
    page = text_page if isinstance(text_page, TextPage) else TextPage(text_page)
    lines = layout.lines
    if text is None or starts is None:
        text, starts = page_text(lines)
    if sign_numbers is None:
        sign_numbers = list(SIGN_NUMBER.finditer(text))
    rect = page._rect
    raw = page.raw
    get_box = pdfium.FPDFText_GetLooseCharBox
    edges = layout.edges
    offsets = [found.start(4) if found.group(4) else found.start(3) for found in sign_numbers]
    # claims start in lines that print a sign (statistics broken before their sign are
    # looked up later)
    result_lines = {bisect_right(starts, found.start()) - 1 for found in sign_numbers
                    if found.group("sign") != ","}
    # a claim may begin on the line before its sign and end on the line after it
    near = result_lines | {i - 1 for i in result_lines} | {i + 1 for i in result_lines}
    for index in sorted(near):
        if 0 <= index < len(lines):
            line = lines[index]
            measure_end(page, line)
            offsets.extend(starts[index] + found.start()
                           for found in _CLAIM_START.finditer(line.text))
    for offset in offsets:
        index = bisect_right(starts, offset) - 1
        char = lines[index].char_at(offset - starts[index])
        if char is not None and char not in edges:
            get_box(raw, char, rect)
            edges[char] = (rect.left, rect.right)


# -- turned text, text outside the page ------------------------------------------------------

def _drop_turned(page: TextPage, lines: list[Line], layout: PageLayout) -> list[Line]:
    """Leave out text turned against the page, unless most of the page is turned (a landscape
    table). Only lines that look odd are examined: taller than the page's ordinary lines (a
    large diagonal watermark, or one that pdfium appended to a line), higher than wide (a
    stamp up the margin), or first or last on the page; of a line that mixes upright and
    turned characters, the upright ones are kept."""
    if not lines:
        return lines
    # the median height of a sample of the lines: what an ordinary line is like
    step = max(1, len(lines) // 9)
    heights = sorted(line.top - line.bottom for line in lines[::step])
    ordinary = heights[len(heights) // 2]
    suspects = {0, len(lines) - 1}
    for index, line in enumerate(lines):
        height = line.top - line.bottom
        if height > 1.6 * ordinary or (line.x1 - line.x0) < height:
            suspects.add(index)
    turned = [index for index in sorted(suspects) if _is_turned(page, lines[index])]
    if not turned:
        return lines
    if len(turned) * 2 > len(lines):
        return lines  # a page printed turned (a landscape table): keep it
    layout.count("turned text", len(turned))
    for index in turned:
        line = lines[index]
        upright = [offset for offset in range(len(line.text))
                   if (char := line.char_at(offset)) is not None
                   and abs(math.remainder(page.angle(char), 2 * math.pi)) <= _TURNED]
        if not any(line.text[offset].strip() for offset in upright):
            line.text, line.pieces = "", []
            continue
        keep = set(upright)
        for offset in reversed(range(len(line.text))):
            if offset not in keep and line.char_at(offset) is not None:
                line.cut(offset, offset + 1)
        line.text = line.text.rstrip()
        _measure(page, line)
    return [line for line in lines if line.text.strip()]


def _drop_outside(lines: list[Line], layout: PageLayout) -> list[Line]:
    left, bottom, right, top = layout.crop
    kept = [line for line in lines
            if line.x1 > left and line.x0 < right and line.top > bottom and line.bottom < top]
    if len(kept) < len(lines):
        layout.count("text outside the page", len(lines) - len(kept))
    return kept


# -- invisible text over visible text ---------------------------------------------------------

def _overlaps(a: Line, b: Line) -> bool:
    width = min(a.x1, b.x1) - max(a.x0, b.x0)
    height = min(a.top, b.top) - max(a.bottom, b.bottom)
    if width <= 0 or height <= 0:
        return False
    return height > 0.5 * min(a.height, b.height) and width > 2 * max(a.height, b.height)


def _has_overlapping_lines(lines: list[Line]) -> bool:
    buckets: dict[int, list[Line]] = {}
    for line in lines:
        # lines whose middles lie within a few points of each other
        key = int((line.top + line.bottom) / 6)
        for near in (key - 1, key, key + 1):
            for other in buckets.get(near, ()):
                if other.x1 > line.x0 and line.x1 > other.x0 and _overlaps(line, other):
                    return True
        bucket = buckets.get(key)
        if bucket is None:
            buckets[key] = [line]
        else:
            bucket.append(line)
    return False


def _object_key(raw_object) -> int:
    return ctypes.cast(raw_object, ctypes.c_void_p).value or 0


def _clip_box(raw_object) -> tuple[float, float, float, float] | None:
    """The bounding box of an object's clip path, in the object's own space, if it has one."""
    clip = pdfium.FPDFPageObj_GetClipPath(raw_object)
    if not clip:
        return None
    paths = pdfium.FPDFClipPath_CountPaths(clip)
    if paths <= 0:
        return None
    xs, ys = [], []
    x, y = ctypes.c_float(), ctypes.c_float()
    for path in range(paths):
        for index in range(pdfium.FPDFClipPath_CountPathSegments(clip, path)):
            segment = pdfium.FPDFClipPath_GetPathSegment(clip, path, index)
            if segment and pdfium.FPDFPathSegment_GetPoint(segment, x, y):
                xs.append(x.value)
                ys.append(y.value)
    if not xs:
        return None
    return min(xs), min(ys), max(xs), max(ys)


def _bounds(raw_object) -> tuple[float, float, float, float] | None:
    left, bottom, right, top = (ctypes.c_float(), ctypes.c_float(), ctypes.c_float(),
                                ctypes.c_float())
    if not pdfium.FPDFPageObj_GetBounds(raw_object, left, bottom, right, top):
        return None
    return left.value, bottom.value, right.value, top.value


def _transform(matrix: tuple[float, ...], box: tuple[float, float, float, float]):
    a, b, c, d, e, f = matrix
    xs, ys = [], []
    for x, y in ((box[0], box[1]), (box[0], box[3]), (box[2], box[1]), (box[2], box[3])):
        xs.append(a * x + c * y + e)
        ys.append(b * x + d * y + f)
    return min(xs), min(ys), max(xs), max(ys)


def _multiply(first: tuple[float, ...], then: tuple[float, ...]) -> tuple[float, ...]:
    a, b, c, d, e, f = first
    a2, b2, c2, d2, e2, f2 = then
    return (a * a2 + b * c2, a * b2 + b * d2, c * a2 + d * c2, c * b2 + d * d2,
            e * a2 + f * c2 + e2, e * b2 + f * d2 + f2)


def _intersect(box, other):
    if other is None:
        return box
    if box is None:
        return other
    return (max(box[0], other[0]), max(box[1], other[1]),
            min(box[2], other[2]), min(box[3], other[3]))


def _invisible_text_objects(raw_page) -> dict[int, tuple[float, float, float, float] | None]:
    """Text objects that paint nothing or are clipped, with the visible window (page space)
    of the clipped ones (None: nothing of the object is visible)."""
    found: dict[int, tuple[float, float, float, float] | None] = {}
    matrix = pdfium.FS_MATRIX()

    def visit(raw_object, to_page: tuple[float, ...], window) -> None:
        kind = pdfium.FPDFPageObj_GetType(raw_object)
        own_clip = _clip_box(raw_object)
        if kind == pdfium.FPDF_PAGEOBJ_TEXT:
            clip = _intersect(window, own_clip and _transform(to_page, own_clip))
            if pdfium.FPDFTextObj_GetTextRenderMode(raw_object) in _INVISIBLE_MODES:
                found[_object_key(raw_object)] = None
                return
            if clip is None:
                return
            bounds = _bounds(raw_object)
            if bounds is None:
                return
            box = _transform(to_page, bounds)
            visible = _intersect(box, clip)
            if visible[2] - visible[0] < 0.95 * (box[2] - box[0]) or \
                    visible[3] - visible[1] < 0.5 * (box[3] - box[1]):
                found[_object_key(raw_object)] = clip if visible[2] > visible[0] and \
                    visible[3] > visible[1] else None
        elif kind == pdfium.FPDF_PAGEOBJ_FORM:
            # The form's clip is in the space its parent draws in; its objects are in the
            # form's own space, which the form's matrix maps to the parent's.
            inner_window = _intersect(window, own_clip and _transform(to_page, own_clip))
            if pdfium.FPDFPageObj_GetMatrix(raw_object, matrix):
                inner = _multiply((matrix.a, matrix.b, matrix.c, matrix.d, matrix.e, matrix.f),
                                  to_page)
            else:
                inner = to_page
            for index in range(pdfium.FPDFFormObj_CountObjects(raw_object)):
                child = pdfium.FPDFFormObj_GetObject(raw_object, index)
                if child:
                    visit(child, inner, inner_window)

    identity = (1.0, 0.0, 0.0, 1.0, 0.0, 0.0)
    for index in range(pdfium.FPDFPage_CountObjects(raw_page)):
        raw_object = pdfium.FPDFPage_GetObject(raw_page, index)
        if raw_object:
            visit(raw_object, identity, None)
    return found


def _drop_hidden(page: TextPage, raw_page, lines: list[Line], layout: PageLayout) -> list[Line]:
    """Leave out invisible text that lies over visible text (a duplicate text layer).

    Looked for only where printed lines overlap, which they do not on an ordinary page; a page
    that has only invisible text (a scan with a recognised text layer) keeps it.
    """
    if len(lines) < 2 or not _has_overlapping_lines(lines):
        return lines
    invisible = _invisible_text_objects(raw_page)
    if not invisible:
        return lines
    hidden_offsets: list[list[int]] = []
    for line in lines:
        hidden = []
        for offset in range(len(line.text)):
            char = line.char_at(offset)
            if char is None:
                continue
            key = _object_key(pdfium.FPDFText_GetTextObject(page.raw, char))
            if key in invisible:
                window = invisible[key]
                if window is not None:
                    x0, y0, x1, y1 = page.box(char)
                    cx, cy = (x0 + x1) / 2, (y0 + y1) / 2
                    if window[0] <= cx <= window[2] and window[1] <= cy <= window[3]:
                        continue
                hidden.append(offset)
        hidden_offsets.append(hidden)
    if all(len(hidden) >= len(line.text.strip())
           for line, hidden in zip(lines, hidden_offsets)):
        return lines  # nothing visible at all (a scan's recognised text): keep what there is
    kept: list[Line] = []
    dropped = 0
    for line, hidden in zip(lines, hidden_offsets):
        if not hidden:
            kept.append(line)
            continue
        dropped += 1
        if len(hidden) >= len(line.text.strip()):
            continue
        # keep the visible part of a line that mixes both
        for offset in reversed(hidden):
            line.cut(offset, offset + 1)
        if line.text.strip():
            _measure(page, line)
            kept.append(line)
    if dropped:
        layout.count("invisible text", dropped)
    return kept


# -- columns written line by line across the page ---------------------------------------------

def _gap_near(page: TextPage, line: Line, x: float) -> tuple[float, float, int] | None:
    """The widest gap between neighbouring characters of a line near `x`: (left edge, right
    edge, offset of the first character after the gap)."""
    text = line.text

    def printed(offset: int, step: int) -> int | None:
        """The nearest printed character (not a space, with a box) from offset on."""
        while 0 <= offset < len(text):
            if not text[offset].isspace() and line.char_at(offset) is not None:
                return offset
            offset += step
        return None

    # binary search for the first printed character that starts right of x
    low, high = 0, len(text) - 1
    while low < high:
        middle = (low + high) // 2
        found = printed(middle, 1)
        if found is None or found > high:
            high = middle
        elif page.box(line.char_at(found))[0] < x:
            low = found + 1
        else:
            high = middle
    best = None
    after = printed(low, 1)
    for _ in range(4):  # the gaps before this character and the next few
        if after is None:
            break
        before = printed(after - 1, -1)
        if before is not None:
            right_edge = page.box(line.char_at(before))[2]
            left_edge = page.box(line.char_at(after))[0]
            if best is None or left_edge - right_edge > best[1] - best[0]:
                best = (right_edge, left_edge, after)
        after = printed(after + 1, 1)
    return best


def _split_interleaved_columns(page: TextPage, lines: list[Line],
                               layout: PageLayout) -> list[Line]:
    """Read two columns that the content stream wrote line by line across the page."""
    if len(lines) < 8:
        return lines
    left = min(line.x0 for line in lines)
    right = max(line.x1 for line in lines)
    middle = (left + right) / 2
    wide = [line for line in lines
            if line.x0 < middle - 0.15 * (right - left)
            and line.x1 > middle + 0.15 * (right - left)]
    if len(wide) < 6:
        return lines
    step = max(1, len(wide) // 9)
    sample = wide[::step][:9]
    # the quick test: on an ordinary page a character is printed at the middle of most lines
    printed_there = sum(1 for line in sample[:3] if pdfium.FPDFText_GetCharIndexAtPos(
        page.raw, middle, (line.bottom + line.top) / 2, 0.5, 0.5) >= 0)
    if printed_there >= 2:
        return lines
    gaps = []
    for tried, line in enumerate(sample, start=1):
        gap = _gap_near(page, line, middle)
        if gap is not None and gap[1] - gap[0] > max(1.2 * line.height, 6.0):
            gaps.append(gap)
        if tried == 3 and len(gaps) < 2:
            return lines  # the usual page: lines run on across the middle
    if len(gaps) < max(4, 2 * len(sample) // 3):
        return lines
    gutter_left = sorted(gap[0] for gap in gaps)[len(gaps) // 2]
    gutter_right = sorted(gap[1] for gap in gaps)[len(gaps) // 2]
    # Columns of text: the right column's lines start at one x, and the lines of the left
    # column either end at one x (justified) or are about as long as those of the right one;
    # a table of contents ("Method .... Page 12") or a table has short right parts.
    starts_aligned = sum(1 for gap in gaps if abs(gap[1] - gutter_right) <= 2.0)
    ends_aligned = sum(1 for gap in gaps if abs(gap[0] - gutter_left) <= 2.0)
    for line in sample:
        measure_end(page, line)
    right_widths = sorted(line.x1 - gutter_right for line in sample)
    left_widths = sorted(gutter_left - line.x0 for line in sample)
    wide_right = right_widths[len(right_widths) // 2] >= 0.6 * left_widths[len(left_widths) // 2]
    if starts_aligned < 2 * len(gaps) / 3 or not (ends_aligned >= len(gaps) / 2 or wide_right):
        return lines
    gutter = (gutter_left + gutter_right) / 2
    for line in lines:
        measure_end(page, line)
    # Split every line that crosses the gutter; then read the left column, then the right,
    # block by block between lines that span both columns (titles, wide figures).
    blocks: list[tuple[list[Line], list[Line]]] = [([], [])]
    spanning: list[Line] = []
    split = 0
    for line in lines:
        if line.x1 <= gutter_right - 2.0:
            blocks[-1][0].append(line)
        elif line.x0 >= gutter:
            blocks[-1][1].append(line)
        else:
            gap = _gap_near(page, line, gutter)
            if (gap is not None and abs(gap[1] - gutter_right) <= 2.0
                    and gap[1] - gap[0] > max(line.height, 6.0)):
                right_part = Line(line.text, list(line.runs()))
                right_part.cut(0, gap[2])
                line.cut(gap[2], len(line.text))
                for part in (line, right_part):
                    part.text = part.text.rstrip() if part is line else part.text
                    _measure(page, part)
                blocks[-1][0].append(line)
                blocks[-1][1].append(right_part)
                split += 1
            else:
                spanning.append(line)
                blocks.append(([line], []))
                blocks.append(([], []))
    if not split:
        return lines
    layout.count("columns put in reading order")
    return [line for left_lines, right_lines in blocks for line in left_lines + right_lines]


# -- margin line numbers ---------------------------------------------------------------------

def _cut_line_numbers(page: TextPage, lines: list[Line], layout: PageLayout,
                      known_anchors: set[int]) -> None:
    """Cut out line numbers printed in the margin beside the lines.

    A number counts as a line number when at least three lines of the page carry one at the
    same distance from the page edge, set off from the text by more than a word space, and the
    numbers grow down the page in step with the lines; on a page with fewer such lines, where
    an earlier page had line numbers at that distance (`known_anchors`, which this adds to).
    """
    candidates: list[tuple[str, Line, int, int, float, int]] = []
    for line in lines:
        text = line.text
        last = text[-1]
        if not (last.isdigit() or text[0].isdigit() or
                ((text[0] == " " or last == " ") and (text.strip()[:1].isdigit()
                                                      or text.strip()[-1:].isdigit()))):
            continue
        found = _ONLY_NUMBER.match(line.text)
        if found:
            candidates.append(("alone", line, 0, len(line.text), line.x0, int(line.text)))
            continue
        found = _NUMBER_AT_START.match(line.text)
        if found:
            candidates.append(("start", line, found.start(1), found.end(1), 0.0,
                               int(found.group(1))))
        found = _NUMBER_AT_END.search(line.text)
        if found:
            candidates.append(("end", line, found.start(1), found.end(1), 0.0,
                               int(found.group(1))))
    if not candidates or (len(candidates) < 3 and not known_anchors):
        return
    margin_numbers = []
    for kind, line, start, end, _, value in candidates:
        first, last = line.char_at(start), line.char_at(end - 1)
        if first is None or last is None:
            continue
        number_left, _, number_right, _ = page.box(first)
        number_right = page.box(last)[2]
        if kind == "start":
            rest = len(line.text) - len(line.text[end:].lstrip())
            neighbour = line.char_at(rest)
            if neighbour is None or page.box(neighbour)[0] - number_right < 1.0 * line.height:
                continue
        elif kind == "end":
            rest = len(line.text[:start].rstrip()) - 1
            neighbour = line.char_at(rest)
            if neighbour is None or number_left - page.box(neighbour)[2] < 1.0 * line.height:
                continue
        anchor = number_right if kind != "end" else number_left
        margin_numbers.append((round(anchor), kind, line, start, end, value))
    by_anchor: dict[int, list] = {}
    for entry in margin_numbers:
        # numbers right-aligned at one x (or left-aligned, for numbers after the line)
        for key in (entry[0] - 1, entry[0], entry[0] + 1):
            if key in by_anchor:
                by_anchor[key].append(entry)
                break
        else:
            by_anchor[entry[0]] = [entry]
    cut = 0
    for anchor, entries in by_anchor.items():
        ordered = sorted(entries, key=lambda entry: -entry[2].top)
        if len(entries) >= 3 and _numbered_like_lines(ordered):
            known_anchors.add(anchor)
        elif not (known_anchors & {anchor - 1, anchor, anchor + 1}) or any(
                b[5] <= a[5] for a, b in zip(ordered, ordered[1:])):
            # too few to tell by themselves: numbers where earlier pages had line numbers
            continue
        for _, kind, line, start, end, _ in entries:
            if kind == "alone":
                line.text, line.pieces = "", []
            elif kind == "start":
                stop = end + len(line.text[end:]) - len(line.text[end:].lstrip())
                line.cut(start, stop)
                _measure(page, line)
            else:
                begin = len(line.text[:start].rstrip())
                line.cut(begin, len(line.text))
                _measure(page, line)
            cut += 1
    if cut:
        lines[:] = [line for line in lines if line.text.strip()]
        layout.count("margin line numbers", cut)


def _numbered_like_lines(ordered: list) -> bool:
    """Numbers that grow down the page in step with the lines they stand beside (every line,
    or every fifth), not the first column of a table ("111", "112", "121", ...)."""
    steps = []
    for (_, _, above, _, _, upper), (_, _, below, _, _, lower) in zip(ordered, ordered[1:]):
        if lower <= upper:
            steps.append(None)
        else:
            steps.append((above.top - below.top) / (lower - upper))
    spacing = sorted(step for step in steps if step is not None)
    if len(spacing) < 0.8 * len(steps) or not spacing:
        return False
    typical = spacing[len(spacing) // 2]
    if typical <= 0:
        return False
    regular = sum(1 for step in spacing if abs(step - typical) <= 0.15 * typical)
    return regular >= 0.8 * len(steps)


# -- numbers with a stray space -------------------------------------------------------------

_SPACE_IN_NUMBER = re.compile(r"\d(?:[.,]( )\d|( )[.,]\d)")


def close_numbers(text_page, layout: PageLayout, text: str, starts: list[int]) -> bool:
    """Take out a space that pdfium put into a number ("127. 64", "1, 318.62") because its
    characters were set a little apart: a space pdfium made up (there is no space character),
    narrower than a quarter of the font size, which no word space is. `text` and `starts` are
    the page's lines joined (`page_text`); True if a line changed."""
    page = text_page if isinstance(text_page, TextPage) else TextPage(text_page)
    changed = False
    for found in reversed(list(_SPACE_IN_NUMBER.finditer(text))):
        offset = found.start(1) if found.group(1) is not None else found.start(2)
        index = bisect_right(starts, offset) - 1
        line = layout.lines[index]
        offset -= starts[index]
        space = line.char_at(offset)
        before, after = line.char_at(offset - 1), line.char_at(offset + 1)
        if space is None or before is None or after is None or \
                not pdfium.FPDFText_IsGenerated(page.raw, space):
            continue
        size = pdfium.FPDFText_GetFontSize(page.raw, after)
        if page.box(after)[0] - page.box(before)[2] < 0.25 * size:
            line.cut(offset, offset + 1)
            layout.count("spaces in numbers")
            changed = True
    return changed


# -- pieces of one printed line --------------------------------------------------------------

def _join_printed_lines(page: TextPage, lines: list[Line]) -> list[Line]:
    """Join lines that continue one printed line (pdfium starts a new line where a
    superscript or subscript moves the baseline)."""
    joined: list[Line] = []
    append = joined.append
    for line in lines:
        if joined:
            previous = joined[-1]
            if previous.bottom >= line.top or line.bottom >= previous.top:
                append(line)  # one above the other: the usual next line
                continue
            overlap = min(previous.top, line.top) - max(previous.bottom, line.bottom)
            measure_end(page, previous)
            gap = line.x0 - previous.x1
            size = max(previous.height, line.height, 1.0)
            if (overlap > 0.3 * min(previous.height, line.height) and -0.5 < gap < 1.0 * size
                    and not previous.text.endswith("-")):
                separator = "" if (gap < 0.15 * size or line.text[:1].isspace()
                                   or previous.text[-1:].isspace()) else " "
                previous.extend(line, separator)
                continue
        append(line)
    return joined
