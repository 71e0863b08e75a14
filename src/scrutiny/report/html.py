"""HTML report: one self-contained page (no scripts, no external files) for a reviewer or an
editor to read, print or attach to a review.

Per document a table of every result (as in the terminal report), then each flag with its
message and the sentence it sits in, the result marked; at the end the checks that raised
flags, with the statistics behind them and the methods they follow. Every text from the
manuscript is escaped.
"""

from __future__ import annotations

from html import escape
from typing import TextIO

from .. import __version__
from ..check import REGISTRY
from ..model import ClaimResult, DocumentResult, Run, Status
from . import CAUTION, Summary, phrases

_STYLE = """
body { font-family: system-ui, sans-serif; margin: 2rem auto; max-width: 72rem; padding: 0 1rem;
       color: #1b1b1b; line-height: 1.45; }
h1 { font-size: 1.6rem; margin-bottom: 0.2rem; }
h2 { font-size: 1.2rem; margin-top: 2.2rem; border-bottom: 1px solid #ccc; }
h3 { font-size: 1rem; margin: 1.2rem 0 0.3rem; }
.caution { background: #fff8e1; border-left: 4px solid #e0a800; padding: 0.5rem 0.8rem; }
.meta, .note { color: #555; font-size: 0.9rem; }
table { border-collapse: collapse; width: 100%; font-size: 0.88rem; margin-top: 0.6rem; }
th, td { border-bottom: 1px solid #ddd; padding: 0.3rem 0.4rem; text-align: left;
         vertical-align: top; }
th { background: #f3f3f3; }
td.printed { font-family: ui-monospace, monospace; }
tr.inconsistent td.status { color: #b00020; font-weight: bold; }
tr.consistent td.status { color: #1b6e20; }
tr.unchecked td.status { color: #666; }
.error { color: #b00020; font-weight: bold; }
.warning { color: #8a5a00; font-weight: bold; }
.note-level { color: #005a8a; font-weight: bold; }
.flag { margin: 0.8rem 0; padding-left: 0.8rem; border-left: 3px solid #ddd; }
.sentence { color: #333; font-style: italic; }
mark { background: #ffe58f; font-style: normal; }
.unreadable { color: #b00020; }
dt { font-weight: bold; margin-top: 0.8rem; }
dd { white-space: pre-wrap; margin-left: 1rem; font-size: 0.9rem; }
"""

_LEVEL_CLASS = {"error": "error", "warning": "warning", "note": "note-level"}


def _marked_sentence(result: ClaimResult) -> str:
    """The sentence with the result marked, or the sentence alone when the result cannot be
    found in it verbatim."""
    sentence = result.claim.sentence
    printed = phrases.printed(result)
    where = sentence.find(printed)
    if not printed or where < 0:
        return escape(sentence)
    return (escape(sentence[:where]) + "<mark>" + escape(printed) + "</mark>"
            + escape(sentence[where + len(printed):]))


def _flags_cell(result: ClaimResult) -> str:
    return ", ".join(f'<span class="{_LEVEL_CLASS[flag.severity.label]}">'
                     f"{escape(flag.check)}</span>" for flag in result.flags)


def _contents(run: Run, out: list[str]) -> None:
    """For several documents: a list of them, each with its counts, linked to its section."""
    if len(run.documents) < 2:
        return
    out.append('<nav>\n<h2>Documents</h2>\n<table>\n<thead><tr><th>document</th>'
               "<th>results</th><th>inconsistent</th><th>flags</th></tr></thead>\n<tbody>")
    for index, document in enumerate(run.documents, 1):
        if document.errors:
            counts = '<td colspan="3" class="unreadable">could not be read</td>'
        else:
            inconsistent = sum(1 for r in document.claims if r.status is Status.INCONSISTENT)
            flags = sum(len(r.flags) for r in document.claims)
            counts = (f"<td>{len(document.claims)}</td><td>{inconsistent}</td>"
                      f"<td>{flags}</td>")
        out.append(f'<tr><td><a href="#document-{index}">{escape(document.path)}</a></td>'
                   f"{counts}</tr>")
    out.append("</tbody>\n</table>\n</nav>")


def _document(document: DocumentResult, alpha: float, out: list[str],
              index: int = 1) -> None:
    about = document.format or "unknown format"
    if document.encoding and document.encoding != "utf-8":
        about += f", {document.encoding}"
    if document.pages:
        about += f", {document.pages} page{'s' if document.pages != 1 else ''}"
    out.append(f'<section id="document-{index}">\n<h2>{escape(document.path)} '
               f'<span class="meta">({escape(about)})</span></h2>')
    for error in document.errors:
        out.append(f'<p class="unreadable">Could not be read: {escape(error)}</p>')
    if document.errors:
        out.append("</section>")
        return
    for note in document.notes:
        out.append(f'<p class="note">Note: {escape(note)}</p>')
    if not document.claims:
        out.append('<p class="note">No test results found.</p>\n</section>')
        return
    out.append("<table>\n<thead><tr><th>id</th><th>where</th><th>result as printed</th>"
               "<th>reported</th><th>recomputed</th><th>effect [95% CI], evidence</th>"
               "<th>status</th><th>flags</th></tr></thead>\n<tbody>")
    for result in document.claims:
        out.append(
            f'<tr class="{result.status.value}">'
            f"<td>{result.id}</td><td>{escape(phrases.where(result))}</td>"
            f'<td class="printed">{escape(phrases.printed(result))}</td>'
            f"<td>{escape(phrases.reported(result))}</td>"
            f"<td>{escape(phrases.recomputed(result))}</td>"
            f"<td>{escape(phrases.evidence(result, alpha))}</td>"
            f'<td class="status">{escape(phrases.status(result))}</td>'
            f"<td>{_flags_cell(result)}</td></tr>")
    out.append("</tbody>\n</table>")
    flagged = [result for result in document.claims if result.flags]
    if flagged:
        out.append("<h3>Flags</h3>")
    for result in flagged:
        out.append(f'<div class="flag"><p><strong>{result.id}</strong>, '
                   f"{escape(phrases.where(result))}: "
                   f'<span class="sentence">{_marked_sentence(result)}</span></p>')
        for flag in result.flags:
            out.append(f'<p><span class="{_LEVEL_CLASS[flag.severity.label]}">'
                       f"{escape(flag.check)} ({flag.severity.label})</span>: "
                       f"{escape(flag.message)}</p>")
        out.append("</div>")
    out.append("</section>")


def _glossary(run: Run, out: list[str]) -> None:
    raised = {flag.check for document in run.documents for result in document.claims
              for flag in result.flags}
    if not raised:
        return
    out.append("<section>\n<h2>The checks that raised flags</h2>\n<dl>")
    for registered in REGISTRY.values():
        if registered.id in raised:
            out.append(f"<dt>{escape(registered.id)} ({registered.severity.label}): "
                       f"{escape(registered.title)}</dt>\n"
                       f"<dd>{escape(registered.explanation)}</dd>")
    out.append("</dl>\n</section>")


def render_html(run: Run, stream: TextIO) -> None:
    settings = run.settings
    out = [
        "<!DOCTYPE html>",
        '<html lang="en">',
        '<head>\n<meta charset="utf-8">',
        '<meta name="viewport" content="width=device-width, initial-scale=1">',
        f"<title>scrutiny report</title>\n<style>{_STYLE}</style>\n</head>",
        "<body>",
        "<h1>scrutiny report</h1>",
        f'<p class="meta">scrutiny {escape(__version__)}; alpha = {settings.alpha:g}; '
        f"{escape(Summary.of(run).line())}</p>",
        f'<p class="caution">{escape(CAUTION)}</p>',
    ]
    _contents(run, out)
    for index, document in enumerate(run.documents, 1):
        _document(document, settings.alpha, out, index)
    if run.skipped:
        out.append("<section>\n<h2>Files not read</h2>\n<ul>")
        out.extend(f"<li>{escape(skipped.path)}: {escape(skipped.reason)}</li>"
                   for skipped in run.skipped)
        out.append("</ul>\n</section>")
    _glossary(run, out)
    out.append(f'<p class="caution">{escape(CAUTION)}</p>\n</body>\n</html>')
    stream.write("\n".join(out) + "\n")
