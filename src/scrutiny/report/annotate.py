"""Annotated copies of PDF and Word manuscripts: every flagged result highlighted (PDF) or
commented (Word) where it is printed, with the flags' messages, for a reviewer or an author to
page through in any PDF viewer or word processor.

The copy is a new file; the manuscript itself is only read. The highlights are placed from the
character boxes the PDF reader found for each result (`Location.boxes`, in points from the top
left of the page as displayed) mapped back into the page's own coordinates: through its crop
box and its rotation. A note on the first page gives the summary of the document and the
caution that a flag is a prompt to look, not proof of error or misconduct.

In a Word copy each flagged result gets a comment by "scrutiny" anchored to exactly its text
(a run is split where the result starts or ends inside it). Results in notes, text boxes or
fields, to which such a comment cannot be anchored, are counted in the summary comment on the
first paragraph, which also carries the caution.
"""

from __future__ import annotations

import os
from pathlib import Path
from typing import Iterator

from .. import __version__
from ..errors import InputError
from ..files import replace_atomically
from ..model import Box, DocumentResult, Severity
from . import CAUTION

#: the document-information key that marks a copy as written by scrutiny (and so replaceable)
MARKER = "/ScrutinyAnnotated"
#: highlight colours by the worst severity of the result's flags
_COLOURS = {Severity.ERROR: "ff8a80", Severity.WARNING: "ffe58f", Severity.NOTE: "9fd5ff"}


class AnnotationError(InputError):
    """The annotated copy of one manuscript cannot be written (the others still are)."""


def annotated_name(path: str) -> str:
    """`paper.pdf` -> `paper.scrutiny.pdf`."""
    return f"{Path(path).stem}.scrutiny.pdf"


def page_rectangle(box: Box, crop: tuple[float, float, float, float],
                   rotation: int) -> tuple[float, float, float, float]:
    """A box in points from the top left of the displayed page, as (x0, y0, x1, y1) in the
    page's user space (origin bottom left, before the page's /Rotate): the inverse of how the
    PDF reader measured it."""
    left, bottom, right, top = crop
    corners = [(box.x0, box.top), (box.x1, box.bottom)]
    if rotation == 90:
        points = [(left + y, bottom + x) for x, y in corners]
    elif rotation == 180:
        points = [(right - x, bottom + y) for x, y in corners]
    elif rotation == 270:
        points = [(right - y, top - x) for x, y in corners]
    else:
        points = [(left + x, top - y) for x, y in corners]
    xs, ys = [p[0] for p in points], [p[1] for p in points]
    return min(xs), min(ys), max(xs), max(ys)


def _visible(page) -> tuple[float, float, float, float]:
    """The page's crop box (its media box if it has none) as (left, bottom, right, top), as
    the PDF reader measured from it."""
    crop = page.cropbox
    return (min(crop.left, crop.right), min(crop.bottom, crop.top),
            max(crop.left, crop.right), max(crop.bottom, crop.top))


def _is_ours(path: str) -> bool:
    from pypdf import PdfReader

    try:
        metadata = PdfReader(path).metadata or {}
    except Exception:  # unreadable: certainly not a copy we wrote
        return False
    return MARKER in metadata


def annotate_pdf(document: DocumentResult, target: str) -> tuple[int, int]:
    """Write an annotated copy of the PDF `document.path` to `target`; (highlighted, not
    placed) flagged results. The target is replaced only if scrutiny wrote it, and only once
    the copy is complete."""
    from pypdf import PdfReader, PdfWriter
    from pypdf.annotations import Highlight, Text
    from pypdf.generic import ArrayObject, FloatObject, NameObject, TextStringObject

    if os.path.exists(target) and not _is_ours(target):
        raise AnnotationError(target, "exists and was not written by scrutiny; move it or "
                                      "choose another folder")
    try:
        reader = PdfReader(document.path)
        if reader.is_encrypted and not reader.decrypt(""):
            raise AnnotationError(document.path, "is encrypted with a password; cannot be "
                                                 "copied")
        writer = PdfWriter(clone_from=reader)
    except AnnotationError:
        raise
    except Exception as exc:
        raise AnnotationError(document.path, f"cannot be copied ({type(exc).__name__}: "
                                             f"{exc})") from None

    def note(annotation, contents: str, subject: str) -> None:
        annotation[NameObject("/T")] = TextStringObject("scrutiny")
        annotation[NameObject("/Subj")] = TextStringObject(subject)
        annotation[NameObject("/Contents")] = TextStringObject(contents)

    highlighted = missed = 0
    for result in document.claims:
        if not result.flags:
            continue
        if not result.claim.location.boxes:
            missed += 1
            continue
        worst = max(flag.severity for flag in result.flags)
        messages = _messages(result)
        subject = ", ".join(flag.check for flag in result.flags)
        for index, box in enumerate(result.claim.location.boxes):
            if not 1 <= box.page <= len(writer.pages):
                continue
            page = writer.pages[box.page - 1]
            x0, y0, x1, y1 = page_rectangle(box, _visible(page), page.rotation % 360)
            # quadrilateral corners in the order viewers expect: top left, top right,
            # bottom left, bottom right
            quad = ArrayObject(FloatObject(round(v, 2)) for v in (x0, y1, x1, y1, x0, y0, x1, y0))
            highlight = Highlight(rect=(x0, y0, x1, y1), quad_points=quad,
                                  highlight_color=_COLOURS[worst], printing=True)
            note(highlight, f"{result.id}: {messages}" if index == 0
                 else f"{result.id} (continued): {subject}", subject)
            writer.add_annotation(page_number=box.page - 1, annotation=highlight)
        highlighted += 1

    if writer.pages:
        first = writer.pages[0]
        corner = page_rectangle(Box(1, 8, 8, 26, 26), _visible(first), first.rotation % 360)
        flags = sum(len(result.flags) for result in document.claims)
        unplaced = (f" {missed} flagged result{'s' if missed != 1 else ''} could not be "
                    f"placed on the page (see the report)." if missed else "")
        summary = (f"scrutiny {__version__}: {len(document.claims)} results found, "
                   f"{flags} flag{'s' if flags != 1 else ''} on {highlighted + missed} of them, "
                   f"highlighted (open a highlight for its messages).{unplaced}\n\n{CAUTION}")
        sticky = Text(rect=corner, text=summary, open=False)
        note(sticky, summary, "scrutiny summary")
        writer.add_annotation(page_number=0, annotation=sticky)
    writer.add_metadata({MARKER: __version__})

    _write_atomically(target, ".pdf", writer.write)
    return highlighted, missed


def _write_atomically(target: str, suffix: str, write) -> None:
    """`write(path)` put in `target`'s place only once complete (see `files`), with a one-line
    error for the user."""
    try:
        replace_atomically(target, write, suffix)
    except OSError as exc:
        raise AnnotationError(target, f"cannot be written ({exc.strerror})") from None
    except Exception as exc:
        raise AnnotationError(target, f"cannot be written ({type(exc).__name__}: "
                                      f"{exc})") from None


# -- Word ------------------------------------------------------------------------------------

#: the author of the comments scrutiny adds to a Word copy (and how a copy is recognised)
COMMENT_AUTHOR = "scrutiny"


def annotated_docx_name(path: str) -> str:
    """`paper.docx` -> `paper.scrutiny.docx`."""
    return f"{Path(path).stem}.scrutiny.docx"


def _paragraphs(container) -> Iterator:
    """Every paragraph of the body, table cells included, in document order."""
    from docx.table import Table
    from docx.text.paragraph import Paragraph

    for item in container.iter_inner_content():
        if isinstance(item, Paragraph):
            yield item
        elif isinstance(item, Table):
            for row in item.rows:
                seen = set()
                for cell in row.cells:
                    if id(cell._tc) in seen:  # a merged cell appears once per grid column
                        continue
                    seen.add(id(cell._tc))
                    yield from _paragraphs(cell)


def _cell_runs(copy, label: str | None, printed: str) -> list | None:
    """The runs that print `printed` in the table cell the Word reader labelled `label`
    ("table 2, row 3, column 1": tables numbered in document order, nested ones where they
    stand; columns counted on the grid, as the reader counts them)."""
    import re

    from docx.oxml.ns import qn
    from docx.text.paragraph import Paragraph

    where = re.fullmatch(r"table (\d+), row (\d+), column (\d+)", label or "")
    if where is None:
        return None
    number, row_number, column_number = (int(group) for group in where.groups())
    fallback = "{http://schemas.openxmlformats.org/markup-compatibility/2006}Fallback"
    tables = [table for table in copy.element.body.iter(qn("w:tbl"))
              if not any(ancestor.tag == fallback for ancestor in table.iterancestors())]
    if number > len(tables):
        return None
    rows = [child for child in tables[number - 1] if child.tag == qn("w:tr")]
    if row_number > len(rows):
        return None
    row = rows[row_number - 1]
    before = row.find(f"{qn('w:trPr')}/{qn('w:gridBefore')}")
    column = 1 + (int(before.get(qn("w:val"), "0")) if before is not None else 0)
    for cell in (child for child in row if child.tag == qn("w:tc")):
        span = cell.find(f"{qn('w:tcPr')}/{qn('w:gridSpan')}")
        if column == column_number:
            for element in (child for child in cell if child.tag == qn("w:p")):
                paragraph = Paragraph(element, None)
                text = "".join(run.text for run in paragraph.runs)
                at = text.find(printed)
                if at >= 0:
                    return _isolate(paragraph, at, at + len(printed))
            return None
        column += int(span.get(qn("w:val"), "1")) if span is not None else 1
    return None


def _isolate(paragraph, start: int, end: int) -> list | None:
    """The runs that hold exactly paragraph text [start, end), splitting a run of plain text
    at either end; None where the paragraph's runs do not spell its text one to one (fields,
    hyperlinks, tabs inside the span)."""
    import copy

    from docx.oxml.ns import qn
    from docx.text.run import Run

    def simple(run) -> bool:
        children = [child for child in run._r if child.tag != qn("w:rPr")]
        return len(children) == 1 and children[0].tag == qn("w:t")

    def split(run, at: int):
        """Cut a plain run at `at`; the second half, a new run after it."""
        second = copy.deepcopy(run._r)
        run._r.addnext(second)
        text = run.text
        run.text, tail = text[:at], Run(second, run._parent)
        tail.text = text[at:]
        return tail

    position = 0
    runs = []
    for run in paragraph.runs:
        length = len(run.text)
        if position + length <= start or position >= end:
            position += length
            continue
        if position < start:
            if not simple(run):
                return None
            run = split(run, start - position)
            position = start
            length = len(run.text)
        if position + length > end:
            if not simple(run):
                return None
            split(run, end - position)
        runs.append(run)
        position += len(run.text)
    return runs or None


def annotate_docx(document: DocumentResult, target: str) -> tuple[int, int]:
    """Write a copy of the Word document `document.path` to `target` with a comment on every
    flagged result (anchored to exactly its text where its runs allow); (commented,
    not anchored)."""
    import docx

    if os.path.exists(target) and not _is_our_docx(target):
        raise AnnotationError(target, "exists and was not written by scrutiny; move it or "
                                      "choose another folder")
    try:
        copy = docx.Document(document.path)
    except Exception as exc:
        raise AnnotationError(document.path, f"cannot be copied ({type(exc).__name__}: "
                                             f"{exc})") from None
    paragraphs = list(_paragraphs(copy))
    texts = ["".join(run.text for run in paragraph.runs) for paragraph in paragraphs]
    cursor = (0, 0)  # claims come in document order: search on from the last one found
    commented = missed = 0
    for result in document.claims:
        if not result.flags:
            continue
        printed = result.claim.text
        if result.claim.pattern == "table-row":
            # a row of a table, printed across cells: the comment goes on the first cell read
            runs = _cell_runs(copy, result.claim.location.cell,
                              next(line for line in printed.split("\n") if line.strip()).strip())
        else:
            runs, cursor = _text_runs(paragraphs, texts, cursor, printed)
        if not runs:
            missed += 1
            continue
        copy.add_comment(runs, text=_messages(result), author=COMMENT_AUTHOR, initials="sc")
        commented += 1
    first = next((paragraph for paragraph in paragraphs if paragraph.runs), None)
    if first is not None:
        flags = sum(len(result.flags) for result in document.claims)
        unanchored = (f" {missed} flagged result{'s' if missed != 1 else ''} could not be "
                      f"marked in the text (see the report)." if missed else "")
        copy.add_comment(first.runs[0], author=COMMENT_AUTHOR, initials="sc",
                         text=f"scrutiny {__version__}: {len(document.claims)} results found, "
                              f"{flags} flag{'s' if flags != 1 else ''} on {commented + missed} "
                              f"of them, each commented where it is printed.{unanchored}\n\n"
                              f"{CAUTION}")
    _write_atomically(target, ".docx", copy.save)
    return commented, missed


def _text_runs(paragraphs: list, texts: list[str], cursor: tuple[int, int],
               printed: str) -> tuple[list | None, tuple[int, int]]:
    """The runs that print `printed`, searched from `cursor` (paragraph, offset) on, since
    claims come in document order; and where the next search starts."""
    index, offset = cursor
    while index < len(paragraphs):
        at = texts[index].find(printed, offset)
        if at >= 0:
            runs = _isolate(paragraphs[index], at, at + len(printed))
            texts[index] = "".join(run.text for run in paragraphs[index].runs)
            return runs, (index, at + len(printed))
        index, offset = index + 1, 0
    return None, cursor


def _messages(result) -> str:
    """A flagged result's flags, for its note or comment."""
    return "\n\n".join(f"{flag.check} ({flag.severity.label}): {flag.message}"
                        for flag in result.flags)


def _is_our_docx(path: str) -> bool:
    import docx

    try:
        return any(comment.author == COMMENT_AUTHOR for comment in docx.Document(path).comments)
    except Exception:
        return False
