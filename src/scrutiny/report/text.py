"""Terminal report with rich: per document a table of results, then the flags in full, then
one summary line and the caution."""

from __future__ import annotations

from typing import TextIO

from rich.console import Console
from rich.table import Table
from rich.text import Text

from ..model import ClaimResult, DocumentResult, Run, Severity, Status
from . import CAUTION, Summary, phrases

_STATUS_STYLE = {
    Status.CONSISTENT: "green",
    Status.INCONSISTENT: "bold red",
    Status.UNCHECKED: "dim",
}
_SEVERITY_STYLE = {Severity.ERROR: "bold red", Severity.WARNING: "yellow", Severity.NOTE: "cyan"}


def _status(result: ClaimResult) -> Text:
    return Text(phrases.status(result), style=_STATUS_STYLE[result.status])


def _flags(result: ClaimResult) -> Text:
    text = Text()
    for index, flag in enumerate(result.flags):
        if index:
            text.append(", ")
        text.append(flag.check, style=_SEVERITY_STYLE[flag.severity])
    return text


def _document(console: Console, document: DocumentResult, alpha: float) -> None:
    about = [document.format or "unknown format"]
    if document.encoding and document.encoding != "utf-8":
        about.append(document.encoding)
    console.print(Text(document.path, style="bold"), Text(f"({', '.join(about)})", style="dim"))
    if document.errors:
        for error in document.errors:
            console.print(Text(f"  could not be read: {error}", style="bold red"))
        return
    for note in document.notes:
        console.print(Text(f"  note: {note}", style="dim"))
    if not document.claims:
        console.print(Text("  no test results found", style="dim"))
        return
    table = Table(show_edge=False, pad_edge=False, expand=False, header_style="bold")
    table.add_column("id", no_wrap=True)
    table.add_column("where", no_wrap=True)
    table.add_column("result as printed", overflow="fold", ratio=3)
    table.add_column("reported", no_wrap=True)
    table.add_column("recomputed", no_wrap=True)
    table.add_column("effect [95% CI], evidence", ratio=2)
    table.add_column("status", ratio=1)
    table.add_column("flags", ratio=1, overflow="fold")
    for result in document.claims:
        table.add_row(result.id, phrases.where(result), phrases.printed(result),
                      phrases.reported(result), phrases.recomputed(result),
                      phrases.evidence(result, alpha), _status(result), _flags(result))
    console.print(table)
    messages = Table(show_header=False, show_edge=False, box=None, pad_edge=False,
                     padding=(0, 1, 0, 0))
    messages.add_column("id", no_wrap=True)
    messages.add_column("where", no_wrap=True)
    messages.add_column("check", no_wrap=True)
    messages.add_column("message", overflow="fold")
    for result in document.claims:
        for flag in result.flags:
            messages.add_row(result.id, phrases.where(result),
                             Text(f"{flag.check} ({flag.severity.label})",
                                  style=_SEVERITY_STYLE[flag.severity]),
                             flag.message)
    if messages.row_count:
        console.print()
        console.print(messages)


def render_text(run: Run, stream: TextIO, *, width: int | None = None) -> None:
    isatty = getattr(stream, "isatty", lambda: False)()
    console = Console(file=stream, width=width or (None if isatty else 160),
                      force_terminal=None if isatty else False, highlight=False,
                      soft_wrap=False, emoji=False)
    for index, document in enumerate(run.documents):
        if index:
            console.print()
        _document(console, document, run.settings.alpha)
    if run.documents:
        console.print()
    console.print(Text(Summary.of(run).line(), style="bold"))
    console.print(Text(CAUTION, style="italic"))
