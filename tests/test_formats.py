"""One manuscript, every format: plain text, Markdown, Word, LaTeX, HTML, JATS XML and PDF (one
and two columns) must yield the same Claims.

The manuscript is written once, as paragraphs in a small markup (`{i:p}` italic, `{sup:2}`
superscript, `{minus}` a minus sign), and rendered into each format the way that format prints
it: an italic run in Word, `<italic>` in JATS, `\\textit`/math mode in LaTeX, a superscript
glyph in a PDF.
"""

from __future__ import annotations

import html
import io
import re

import pytest
from docx import Document as WordDocument

import scrutiny
from scrutiny.rounding import parse_printed

import pdf_factory

PARAGRAPHS = [
    "Burrow depth in upland voles of the Quarrow enclosures",
    "Voles from the warm enclosures dug deeper burrows than voles from the cold enclosures, "
    "{i:t}(28) = 2.45, {i:p} = .021. Enclosure and season interacted, {i:F}(2, 87) = 4.12, "
    "{i:MSE} = 1.92, {i:p} = .02.",
    "Entrances faced south more often than chance, χ{sup:2}(1, {i:N} = 80) = 6.05, "
    "{i:p} = .014. Entrance width grew with body mass, {i:r}(78) = .25, {i:p} = .025, and the "
    "Wald test of season gave {i:z} = 2.81, {i:p} = .005.",
    "Nest height did not depend on the observer, {i:t}(40) = {minus}0.85, {i:p} = .40, and the "
    "colour of the nest lining did not depend on the site, χ{sup:2}(2) = 3.10, {i:p} = .21.",
]
#: what every format must yield: (test, df, statistic value, p comparator, p value)
EXPECTED = [
    ("t", (28.0,), 2.45, "=", 0.021),
    ("F", (2.0, 87.0), 4.12, "=", 0.02),
    ("chi2", (1.0,), 6.05, "=", 0.014),
    ("r", (78.0,), 0.25, "=", 0.025),
    ("z", (), 2.81, "=", 0.005),
    ("t", (40.0,), -0.85, "=", 0.40),
    ("chi2", (2.0,), 3.10, "=", 0.21),
]
_MARK = re.compile(r"\{(i|sup):([^}]*)\}|\{minus\}")


def _render(paragraph: str, italic, superscript, minus: str, escape=lambda s: s) -> str:
    out, last = [], 0
    for match in _MARK.finditer(paragraph):
        out.append(escape(paragraph[last:match.start()]))
        kind, content = match.group(1), match.group(2)
        if kind == "i":
            out.append(italic(escape(content)))
        elif kind == "sup":
            out.append(superscript(escape(content)))
        else:
            out.append(minus)
        last = match.end()
    out.append(escape(paragraph[last:]))
    return "".join(out)


def as_text() -> bytes:
    return "\n\n".join(_render(p, lambda s: s, lambda s: "²" if s == "2" else s, "−")
                       for p in PARAGRAPHS).encode("utf-8")


def as_markdown() -> bytes:
    body = [_render(p, lambda s: f"*{s}*", lambda s: "²", "−") for p in PARAGRAPHS]
    return ("# " + body[0] + "\n\n" + "\n\n".join(body[1:]) + "\n").encode("utf-8")


def as_latex() -> bytes:
    def paragraph(text: str) -> str:
        text = text.replace("χ{sup:2}", "$\\chi^2$")
        return _render(text, lambda s: f"\\textit{{{s}}}", lambda s: f"$^{{{s}}}$", "$-$")
    body = "\n\n".join(paragraph(p) for p in PARAGRAPHS[1:])
    return ("\\documentclass{article}\n\\title{" + PARAGRAPHS[0] + "}\n\\begin{document}\n"
            "\\maketitle\n\n" + body + "\n\n\\end{document}\n").encode("utf-8")


def as_html() -> bytes:
    body = "\n".join(f"<p>{_render(p, lambda s: f'<i>{s}</i>', lambda s: f'<sup>{s}</sup>', '&minus;', html.escape)}</p>"
                     for p in PARAGRAPHS[1:])
    return (f"<!DOCTYPE html>\n<html><head><title>{PARAGRAPHS[0]}</title></head><body>\n"
            f"<h1>{PARAGRAPHS[0]}</h1>\n{body}\n</body></html>\n").encode("utf-8")


def as_jats() -> bytes:
    body = "\n".join(
        f"<p>{_render(p, lambda s: f'<italic>{s}</italic>', lambda s: f'<sup>{s}</sup>', '&#8722;', html.escape)}</p>"
        for p in PARAGRAPHS[1:])
    return ('<?xml version="1.0" encoding="UTF-8"?>\n'
            '<article xmlns:xlink="http://www.w3.org/1999/xlink" article-type="research-article">'
            f"<front><article-meta><title-group><article-title>{PARAGRAPHS[0]}</article-title>"
            "</title-group></article-meta></front>\n"
            f'<body><sec><title>Results</title>\n{body}\n</sec></body></article>\n').encode("utf-8")


def as_docx() -> bytes:
    document = WordDocument()
    document.add_heading(PARAGRAPHS[0], level=1)
    for paragraph in PARAGRAPHS[1:]:
        word_paragraph = document.add_paragraph()
        last = 0
        for match in _MARK.finditer(paragraph):
            word_paragraph.add_run(paragraph[last:match.start()])
            kind, content = match.group(1), match.group(2)
            if kind == "i":
                word_paragraph.add_run(content).italic = True
            elif kind == "sup":
                word_paragraph.add_run(content).font.superscript = True
            else:
                word_paragraph.add_run("\u2212")
            last = match.end()
        word_paragraph.add_run(paragraph[last:])
    buffer = io.BytesIO()
    document.save(buffer)
    return buffer.getvalue()


def _pdf_markup(paragraph: str) -> str:
    return _MARK.sub(lambda m: ("{it:" + m.group(2) + "}" if m.group(1) == "i" else
                                "^{" + m.group(2) + "}" if m.group(1) == "sup" else "−"),
                     paragraph)


def as_pdf(columns: int) -> bytes:
    layout = pdf_factory.Layout(columns=columns)
    return pdf_factory.manuscript_pdf([_pdf_markup(p) for p in PARAGRAPHS], layout).data


FORMATS = {
    "paper.txt": ("text", as_text),
    "paper.md": ("markdown", as_markdown),
    "paper.tex": ("latex", as_latex),
    "paper.html": ("html", as_html),
    "paper.xml": ("jats", as_jats),
    "paper.docx": ("docx", as_docx),
    "paper.pdf": ("pdf", lambda: as_pdf(1)),
    "two-columns.pdf": ("pdf", lambda: as_pdf(2)),
}


def _summary(result: scrutiny.DocumentResult) -> list[tuple]:
    summary = []
    for claim_result in result.claims:
        claim = claim_result.claim
        summary.append((claim.test, tuple(parse_printed(d).value for d in claim.df),
                        parse_printed(claim.statistic).value, claim.p.comparator,
                        parse_printed(claim.p.reported).value))
    return summary


@pytest.mark.parametrize("name", list(FORMATS))
def test_every_format_yields_the_same_claims(name, tmp_path):
    if name.endswith(".pdf") and not pdf_factory.FONTS_AVAILABLE:
        pytest.skip("the DejaVu fonts for generating PDFs are not installed")
    expected_format, render = FORMATS[name]
    path = tmp_path / name
    path.write_bytes(render())
    result = scrutiny.check_file(path)
    assert result.format == expected_format
    assert _summary(result) == EXPECTED
    assert all(c.status is scrutiny.Status.CONSISTENT for c in result.claims), [
        (c.claim.text, [f.message for f in c.flags]) for c in result.claims]


def test_a_folder_of_all_formats_is_checked_in_one_run(tmp_path):
    for name, (_, render) in FORMATS.items():
        if name.endswith(".pdf") and not pdf_factory.FONTS_AVAILABLE:
            continue
        (tmp_path / name).write_bytes(render())
    run = scrutiny.check_paths([str(tmp_path)])
    assert not any(document.errors for document in run.documents)
    assert all(_summary(document) == EXPECTED for document in run.documents)
