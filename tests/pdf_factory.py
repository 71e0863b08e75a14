"""Generate manuscript PDFs for the tests and benchmarks of the PDF reader.

A manuscript is written as paragraphs in a small markup that says how each piece is printed:

    ^{2}        superscript (printed smaller and raised): "χ^{2}(1, N = 80)"
    _{18}       subscript (printed smaller and lowered): "t_{18} = 4.18"
    {sym:<}     a sign printed in a separate math-symbol font ("p {sym:<} .001")
    {greek:χ}   a Greek letter printed in a separate Greek font
    {it:t}      a letter printed in the italic font
    {gap}       a little space (a fifth of the font size) without a space character
    {shy}       a place where a word may be hyphenated at the end of a line
    {hy}        a word hyphenated here at the end of a line ("signifi{hy}cant")
    {br}        a forced line break
    {col}       a forced column break (the text goes on at the top of the next column or page)

`plain_text(paragraphs)` gives the same manuscript as plain text, which the tests check with
`scrutiny.check_text` to know which Claims the PDF must yield. `manuscript_pdf` lays the
paragraphs out in one or two columns (greedy line filling, real font metrics) and can add what
real PDFs do: running heads and page numbers, margin line numbers, a diagonal watermark, an
invisible duplicate text layer, an old version of the page embedded as a clipped figure, a
content stream that runs across both columns line by line, and publisher fonts whose
ToUnicode map prints one sign as another ("<" as ",", "χ" as "c").

`unmapped_sign_pdf` writes, without reportlab, a PDF whose comparison signs come from a Type 3
font without any Unicode mapping, as some publisher math fonts are: their glyphs are missing
from a text layer's plain text.

The fonts are the DejaVu fonts (free licence: Bitstream Vera licence and public domain), found
through fontconfig or in matplotlib's bundled fonts; `FONTS_AVAILABLE` says whether they were.
"""

from __future__ import annotations

import contextlib
import io
import re
import shutil
import subprocess
from dataclasses import dataclass, field
from pathlib import Path
from typing import Iterator

import reportlab.pdfbase.ttfonts as ttfonts
from reportlab.lib.pagesizes import letter
from reportlab.pdfbase import pdfmetrics
from reportlab.pdfbase.ttfonts import TTFont
from reportlab.pdfgen import canvas

# -- fonts -----------------------------------------------------------------------------------

_FONT_FILES = {
    "Body": "DejaVuSerif.ttf",
    "Italic": "DejaVuSerif-Italic.ttf",
    "Symbol": "DejaVuSans.ttf",
    "Greek": "DejaVuSans-Oblique.ttf",
}
#: the PostScript names of the fonts, as a PDF's font dictionaries carry them
POSTSCRIPT_NAMES = {"Body": "DejaVuSerif", "Italic": "DejaVuSerif-Italic",
                    "Symbol": "DejaVuSans", "Greek": "DejaVuSans-Oblique"}


def _font_folders() -> list[Path]:
    folders = []
    if shutil.which("fc-match"):
        try:
            found = subprocess.run(["fc-match", "-f", "%{file}", "DejaVu Serif"],
                                   capture_output=True, text=True, timeout=10).stdout
        except (OSError, subprocess.SubprocessError):
            found = ""
        if found.endswith(".ttf"):
            folders.append(Path(found).parent)
    try:
        import matplotlib
        folders.append(Path(matplotlib.__file__).parent / "mpl-data" / "fonts" / "ttf")
    except ImportError:
        pass
    return folders


def _register_fonts() -> bool:
    for folder in _font_folders():
        paths = {name: folder / file for name, file in _FONT_FILES.items()}
        if all(path.is_file() for path in paths.values()):
            for name, path in paths.items():
                pdfmetrics.registerFont(TTFont(f"Factory{name}", str(path)))
            return True
    return False


FONTS_AVAILABLE = _register_fonts()

# -- markup ----------------------------------------------------------------------------------

_TOKEN = re.compile(r"\^\{(?P<sup>[^}]*)\}|_\{(?P<sub>[^}]*)\}|\{sym:(?P<sym>[^}]*)\}"
                    r"|\{greek:(?P<greek>[^}]*)\}|\{it:(?P<it>[^}]*)\}|(?P<shy>\{shy\})"
                    r"|(?P<hy>\{hy\})|(?P<br>\{br\})|(?P<col>\{col\})|(?P<gap>\{gap\})"
                    r"|(?P<space>[ \t\n]+)"
                    r"|(?P<text>[^ \t\n^_{]+|.)")


@dataclass
class Run:
    text: str
    style: str = "body"  # body, sup, sub, sym, greek, it


@dataclass
class _Word:
    #: syllables (split at {shy}), each a list of runs
    syllables: list[list[Run]]
    forced_break_after: bool = False
    column_break_after: bool = False


def plain_text(paragraphs: list[str]) -> str:
    """The manuscript as plain text: what each piece of markup stands for."""
    out = []
    for paragraph in paragraphs:
        text = (paragraph.replace("{shy}", "").replace("{hy}", "").replace("{br}", " ")
                .replace("{col}", " ").replace("{gap}", ""))
        text = re.sub(r"\^\{([^}]*)\}|_\{([^}]*)\}|\{(?:sym|greek|it):([^}]*)\}",
                      lambda m: m.group(1) or m.group(2) or m.group(3) or "", text)
        out.append(text)
    return "\n\n".join(out) + "\n"


def _words(paragraph: str) -> list[_Word]:
    words: list[_Word] = []
    current: list[list[Run]] = [[]]

    def finish(forced: bool = False, column: bool = False) -> None:
        nonlocal current
        if any(current):
            words.append(_Word([s for s in current if s], forced or column, column))
        elif (forced or column) and words:
            words[-1].forced_break_after = True
            words[-1].column_break_after = words[-1].column_break_after or column
        current = [[]]

    for match in _TOKEN.finditer(paragraph):
        kind = match.lastgroup
        value = match.group(kind)
        if kind == "space":
            finish()
        elif kind == "br":
            finish(forced=True)
        elif kind == "col":
            finish(column=True)
        elif kind == "gap":
            current[-1].append(Run("", "gap"))
        elif kind == "hy":
            current[-1].append(Run("-"))
            finish(forced=True)
        elif kind == "shy":
            current.append([])
        else:
            current[-1].append(Run(value, "body" if kind == "text" else kind))
    finish()
    return words


# -- layout ----------------------------------------------------------------------------------

_STYLE_FONT = {"body": "FactoryBody", "sup": "FactoryBody", "sub": "FactoryBody",
               "sym": "FactorySymbol", "greek": "FactoryGreek", "it": "FactoryItalic",
               "gap": "FactoryBody"}
_GAP = 0.22  # of the font size: pdfium makes up a space for gaps from about a fifth


@dataclass
class Layout:
    columns: int = 1
    font_size: float = 10.0
    leading: float = 13.0
    page_width: float = letter[0]
    page_height: float = letter[1]
    margin: float = 72.0
    gutter: float = 24.0
    #: text of a running head printed at the top of every page with the page number
    running_head: str | None = None
    #: a page number printed on every page: at the foot ("foot", or True) or top right ("top")
    page_numbers: bool | str = False
    #: line numbers in the left margin, counted through the whole manuscript
    line_numbers: bool = False
    #: a light diagonal text printed over every page
    watermark: str | None = None
    #: "invisible": every line printed a second time in invisible text (render mode 3);
    #: "clipped": an old version of the page embedded as a figure, clipped to a small window;
    #: "only": the text printed invisibly only, as the recognised text layer of a scan
    hidden_copy: str | None = None
    #: draw two-column pages line by line across both columns instead of column by column
    interleaved: bool = False
    #: how the symbol font's ToUnicode map prints its signs, e.g. {"<": ",", "=": "¼"}
    symbol_map: dict[str, str] = field(default_factory=dict)
    #: how the Greek font's ToUnicode map prints its letters, e.g. {"χ": "c"}
    greek_map: dict[str, str] = field(default_factory=dict)
    #: how the body font's ToUnicode map prints characters (a font without proper Unicode)
    body_map: dict[str, str] = field(default_factory=dict)
    #: blank space (in lines) left at the top of the first column of page 1
    title_space: int = 0
    #: encrypt the PDF with this user password
    password: str | None = None
    #: the pages' /Rotate (degrees clockwise: a page to be shown turned)
    rotate: int = 0


@dataclass
class PlacedRun:
    text: str
    x0: float
    x1: float
    style: str
    size: float


@dataclass
class PlacedLine:
    """One printed line: page (1-based), baseline (PDF points from the bottom), its runs."""

    page: int
    column: int
    baseline: float
    runs: list[PlacedRun]
    number: int | None = None

    @property
    def text(self) -> str:
        return "".join(run.text for run in self.runs)

    def span_x(self, start: int, end: int) -> tuple[float, float]:
        """Left and right edge of the characters [start, end) of `text`, in points."""
        position = 0
        left = right = None
        for run in self.runs:
            run_start, run_end = position, position + len(run.text)
            position = run_end
            font = _STYLE_FONT[run.style]
            for i in range(max(start, run_start), min(end, run_end)):
                x = run.x0 + pdfmetrics.stringWidth(run.text[:i - run_start], font, run.size)
                w = pdfmetrics.stringWidth(run.text[i - run_start], font, run.size)
                left = x if left is None else min(left, x)
                right = x + w if right is None else max(right, x + w)
        if left is None:
            raise ValueError("span outside the line")
        return left, right


def _run_size(style: str, size: float) -> float:
    return size * 0.7 if style in ("sup", "sub") else size


def _rise(style: str, size: float) -> float:
    return {"sup": 0.35 * size, "sub": -0.2 * size}.get(style, 0.0)


def _run_width(run: Run, size: float) -> float:
    if run.style == "gap":
        return _GAP * size
    return pdfmetrics.stringWidth(run.text, _STYLE_FONT[run.style], _run_size(run.style, size))


def _width(runs: list[Run], size: float) -> float:
    return sum(_run_width(run, size) for run in runs)


@dataclass
class Manuscript:
    data: bytes
    lines: list[PlacedLine]
    pages: int

    def find(self, fragment: str) -> tuple[PlacedLine, int]:
        """The printed line whose text contains `fragment`, and where it starts in it."""
        for line in self.lines:
            index = line.text.find(fragment)
            if index >= 0:
                return line, index
        raise LookupError(f"{fragment!r} is not printed on one line")


def _layout(paragraphs: list[str], layout: Layout) -> list[PlacedLine]:
    size = layout.font_size
    space = pdfmetrics.stringWidth(" ", "FactoryBody", size)
    column_width = ((layout.page_width - 2 * layout.margin
                     - (layout.columns - 1) * layout.gutter) / layout.columns)
    top = layout.page_height - layout.margin
    lines_per_column = int((layout.page_height - 2 * layout.margin) // layout.leading)
    placed: list[PlacedLine] = []
    page, column, row = 1, 0, layout.title_space

    def new_line(runs: list[Run]) -> None:
        nonlocal page, column, row
        if row >= lines_per_column:
            row = 0
            column += 1
            if column >= layout.columns:
                column, page = 0, page + 1
        x = layout.margin + column * (column_width + layout.gutter)
        baseline = top - layout.font_size - row * layout.leading
        placed_runs = []
        for run in runs:
            width = _run_width(run, size)
            placed_runs.append(PlacedRun(run.text, x, x + width, run.style,
                                         _run_size(run.style, size)))
            x += width
        placed.append(PlacedLine(page, column, baseline, placed_runs))
        row += 1

    for paragraph in paragraphs:
        current: list[Run] = []
        width = 0.0
        for word in _words(paragraph):
            runs = [run for syllable in word.syllables for run in syllable]
            word_width = _width(runs, size)
            gap = space if current else 0.0
            if current and width + gap + word_width > column_width:
                # hyphenate: put as many syllables as fit, with a hyphen, on this line
                taken = 0
                for count in range(len(word.syllables) - 1, 0, -1):
                    head = [r for s in word.syllables[:count] for r in s] + [Run("-")]
                    if width + gap + _width(head, size) <= column_width:
                        taken = count
                        break
                if taken:
                    head = [r for s in word.syllables[:taken] for r in s] + [Run("-")]
                    new_line(current + [Run(" ")] + head)
                    runs = [r for s in word.syllables[taken:] for r in s]
                    word_width = _width(runs, size)
                else:
                    new_line(current)
                current, width, gap = [], 0.0, 0.0
            if current:
                current.append(Run(" "))
            current.extend(runs)
            width += gap + word_width
            if word.forced_break_after:
                new_line(current)
                current, width = [], 0.0
                if word.column_break_after:
                    row = lines_per_column
        if current:
            new_line(current)
    number = 0
    for line in placed:
        number += 1
        line.number = number
    return placed


# -- ToUnicode maps ------------------------------------------------------------------------


def _utf16_hex(text: str) -> str:
    return text.encode("utf-16-be").hex().upper()


@contextlib.contextmanager
def _to_unicode_maps(maps: dict[str, dict[str, str]]) -> Iterator[None]:
    """Write ToUnicode maps with proper UTF-16 for characters beyond the BMP, and print the
    characters of the named fonts as the given other characters."""
    original = ttfonts.makeToUnicodeCMap

    def make(fontname: str, subset: list[int]) -> str:
        postscript = fontname.split("+", 1)[-1]
        remap = maps.get(postscript, {})
        entries = []
        for code, codepoint in enumerate(subset):
            printed = remap.get(chr(codepoint), chr(codepoint))
            entries.append(f"<{code:02X}> <{_utf16_hex(printed) if printed else '0000'}>")
        return "\n".join([
            "/CIDInit /ProcSet findresource begin", "12 dict begin", "begincmap",
            "/CIDSystemInfo", f"<< /Registry ({fontname})", f"/Ordering ({fontname})",
            "/Supplement 0", ">> def", f"/CMapName /{fontname} def", "/CMapType 2 def",
            "1 begincodespacerange", f"<00> <{len(subset) - 1:02X}>", "endcodespacerange",
            f"{len(entries)} beginbfchar", *entries, "endbfchar", "endcmap",
            "CMapName currentdict /CMap defineresource pop", "end", "end"])

    ttfonts.makeToUnicodeCMap = make
    try:
        yield
    finally:
        ttfonts.makeToUnicodeCMap = original


# -- drawing -------------------------------------------------------------------------------


def _draw_line(pdf: canvas.Canvas, line: PlacedLine, size: float, mode: int = 0) -> None:
    if any(run.style == "gap" for run in line.runs):
        # each run on its own, where the layout put it
        for run in line.runs:
            if run.style == "gap" or not run.text:
                continue
            text = pdf.beginText(run.x0, line.baseline + _rise(run.style, size))
            if mode:
                text.setTextRenderMode(mode)
            text.setFont(_STYLE_FONT[run.style], run.size)
            text.textOut(run.text)
            pdf.drawText(text)
        return
    text = pdf.beginText(line.runs[0].x0 if line.runs else 0, line.baseline)
    if mode:
        text.setTextRenderMode(mode)
    for run in line.runs:
        text.setFont(_STYLE_FONT[run.style], run.size)
        text.setRise(_rise(run.style, size))
        text.textOut(run.text)
    pdf.drawText(text)


def manuscript_pdf(paragraphs: list[str], layout: Layout | None = None) -> Manuscript:
    """Lay out and print `paragraphs`; the PDF's bytes and where every line was printed."""
    if not FONTS_AVAILABLE:
        raise RuntimeError("the DejaVu fonts were not found")
    layout = layout or Layout()
    lines = _layout(paragraphs, layout)
    pages = max((line.page for line in lines), default=1)
    buffer = io.BytesIO()
    maps = {POSTSCRIPT_NAMES["Symbol"]: layout.symbol_map,
            POSTSCRIPT_NAMES["Greek"]: layout.greek_map,
            POSTSCRIPT_NAMES["Body"]: layout.body_map}
    size = layout.font_size
    with _to_unicode_maps(maps):
        encrypt = None
        if layout.password is not None:
            from reportlab.lib.pdfencrypt import StandardEncryption
            encrypt = StandardEncryption(layout.password, ownerPassword=layout.password + "!")
        page_size = (layout.page_width, layout.page_height)
        if layout.rotate % 180:
            page_size = page_size[::-1]  # reportlab swaps the media box of a turned page
        pdf = canvas.Canvas(buffer, pagesize=page_size, invariant=True, encrypt=encrypt)
        for page in range(1, pages + 1):
            on_page = [line for line in lines if line.page == page]
            if layout.hidden_copy == "clipped":
                _draw_clipped_copy(pdf, page, on_page, layout)
            if layout.hidden_copy == "invisible":
                pdf.saveState()  # the render mode is part of the graphics state
                for line in on_page:
                    _draw_line(pdf, line, size, mode=3)
                pdf.restoreState()
            if layout.running_head:
                pdf.setFont("FactoryBody", 8)
                pdf.drawString(layout.margin, layout.page_height - 40, layout.running_head)
                pdf.drawRightString(layout.page_width - layout.margin,
                                    layout.page_height - 40, str(page))
            if layout.interleaved and layout.columns > 1:
                rows: dict[float, list[PlacedLine]] = {}
                for line in on_page:
                    rows.setdefault(line.baseline, []).append(line)
                ordered = [line for baseline in sorted(rows, reverse=True)
                           for line in sorted(rows[baseline], key=lambda l: l.column)]
            else:
                ordered = on_page
            for line in ordered:
                _draw_line(pdf, line, size, mode=3 if layout.hidden_copy == "only" else 0)
                if layout.line_numbers:
                    pdf.setFont("FactoryBody", 7)
                    pdf.drawRightString(layout.margin - 14, line.baseline, str(line.number))
            if layout.page_numbers == "top":
                pdf.setFont("FactoryBody", 9)
                pdf.drawRightString(layout.page_width - layout.margin,
                                    layout.page_height - 40, str(page))
            elif layout.page_numbers:
                pdf.setFont("FactoryBody", 9)
                pdf.drawCentredString(layout.page_width / 2, 40, str(page))
            if layout.rotate:
                pdf.setPageRotation(layout.rotate)
            if layout.watermark:
                pdf.saveState()
                pdf.setFillGray(0.85)
                pdf.setFont("FactoryBody", 48)
                pdf.translate(layout.page_width / 2, layout.page_height / 2)
                pdf.rotate(50)
                pdf.drawCentredString(0, 0, layout.watermark)
                pdf.restoreState()
            pdf.showPage()
        pdf.save()
    return Manuscript(buffer.getvalue(), lines, pages)


def _draw_clipped_copy(pdf: canvas.Canvas, page: int, lines: list[PlacedLine],
                       layout: Layout) -> None:
    """An earlier version of the page (the same lines, moved) embedded as a form and clipped
    to a small window at the foot of the page, as when a figure is pasted in as a whole page
    of another PDF."""
    name = f"OldVersion{page}"
    pdf.beginForm(name)
    for line in lines:
        shifted = PlacedLine(line.page, line.column, line.baseline - 3.0,
                             [PlacedRun(r.text, r.x0 + 5.0, r.x1 + 5.0, r.style, r.size)
                              for r in line.runs])
        _draw_line(pdf, shifted, layout.font_size)
    pdf.endForm()
    pdf.saveState()
    path = pdf.beginPath()
    path.rect(layout.margin, 20, 120, 30)
    pdf.clipPath(path, stroke=0, fill=0)
    pdf.doForm(name)
    pdf.restoreState()


def scanned_pdf(pages: int = 2, stamp: str | None = None) -> bytes:
    """A PDF of page images without any text layer, as a scanner makes them; with `stamp`,
    a line of text at the foot of every page (as repositories add to scans)."""
    from PIL import Image, ImageDraw
    from reportlab.lib.utils import ImageReader

    buffer = io.BytesIO()
    pdf = canvas.Canvas(buffer, pagesize=letter, invariant=True)
    for page in range(pages):
        image = Image.new("L", (425, 550), 255)
        draw = ImageDraw.Draw(image)
        for row in range(40, 520, 14):
            draw.rectangle((40, row, 380 - (row * 7 + page * 31) % 90, row + 6), fill=40)
        pdf.drawImage(ImageReader(image), 0, 0, width=letter[0], height=letter[1])
        if stamp:
            pdf.setFont("Helvetica", 7)
            pdf.drawString(72, 20, stamp)
        pdf.showPage()
    pdf.save()
    return buffer.getvalue()


# -- a PDF whose signs have no Unicode mapping ---------------------------------------------


def _pdf_string(text: str) -> bytes:
    escaped = text.replace("\\", "\\\\").replace("(", "\\(").replace(")", "\\)")
    return b"(" + escaped.encode("latin-1") + b")"


def unmapped_sign_pdf(pages: list[list[str]]) -> bytes:
    """A PDF in Helvetica whose signs "=", "<" and ">" (written "{=}", "{<}", "{>}" in the
    lines) come from a Type 3 math font with no Unicode mapping at all: a text layer has the
    glyphs, but not which characters they are. Each page is a list of printed lines."""
    codes = {"{=}": 2, "{<}": 3, "{>}": 4}
    procs = {
        2: b"600 0 0 0 500 500 d1 50 200 m 450 200 l 450 250 l 50 250 l f "
           b"50 320 m 450 320 l 450 370 l 50 370 l f",
        3: b"600 0 0 0 500 500 d1 450 50 m 50 250 l 450 450 l 450 400 l 120 250 l 450 100 l f",
        4: b"600 0 0 0 500 500 d1 50 50 m 450 250 l 50 450 l 50 400 l 380 250 l 50 100 l f",
    }
    objects: list[bytes] = []

    def add(body: bytes) -> int:
        objects.append(body)
        return len(objects)

    def stream(content: bytes) -> bytes:
        return b"<< /Length %d >>\nstream\n" % len(content) + content + b"\nendstream"

    catalog = add(b"")
    pages_object = add(b"")
    helvetica = add(b"<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica "
                    b"/Encoding /WinAnsiEncoding >>")
    proc_ids = {code: add(stream(proc)) for code, proc in procs.items()}
    math = add(b"<< /Type /Font /Subtype /Type3 /FontBBox [0 0 600 600] "
               b"/FontMatrix [0.001 0 0 0.001 0 0] /CharProcs << "
               + b" ".join(b"/g%d %d 0 R" % (code, ref) for code, ref in proc_ids.items())
               + b" >> /Encoding << /Type /Encoding /Differences [2 /g2 /g3 /g4] >> "
               b"/FirstChar 2 /LastChar 4 /Widths [600 600 600] /Resources << >> >>")
    page_ids = []
    splitter = re.compile(r"(\{[=<>]\})")
    for lines in pages:
        content = [b"BT /F1 10 Tf 13 TL 72 720 Td"]
        for line in lines:
            for piece in splitter.split(line):
                if not piece:
                    continue
                if piece in codes:
                    content.append(b"/F2 10 Tf <%02X> Tj /F1 10 Tf" % codes[piece])
                else:
                    content.append(_pdf_string(piece) + b" Tj")
            content.append(b"T*")
        content.append(b"ET")
        content_id = add(stream(b"\n".join(content)))
        page_ids.append(add(b"<< /Type /Page /Parent %d 0 R /MediaBox [0 0 612 792] "
                            b"/Contents %d 0 R /Resources << /Font << /F1 %d 0 R /F2 %d 0 R "
                            b">> >> >>" % (pages_object, content_id, helvetica, math)))
    objects[catalog - 1] = b"<< /Type /Catalog /Pages %d 0 R >>" % pages_object
    objects[pages_object - 1] = (b"<< /Type /Pages /Kids [" +
                                 b" ".join(b"%d 0 R" % p for p in page_ids) +
                                 b"] /Count %d >>" % len(page_ids))
    out = bytearray(b"%PDF-1.4\n")
    offsets = []
    for number, body in enumerate(objects, start=1):
        offsets.append(len(out))
        out += b"%d 0 obj\n" % number + body + b"\nendobj\n"
    xref = len(out)
    out += b"xref\n0 %d\n0000000000 65535 f \n" % (len(objects) + 1)
    for offset in offsets:
        out += b"%010d 00000 n \n" % offset
    out += (b"trailer\n<< /Size %d /Root %d 0 R >>\nstartxref\n%d\n%%%%EOF\n"
            % (len(objects) + 1, catalog, xref))
    return bytes(out)
