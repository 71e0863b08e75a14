"""Terminal report with rich: per document a table of results, then the flags in full, then
one summary line and the caution."""

from __future__ import annotations

from typing import TextIO

from rich.console import Console
from rich.table import Table
from rich.text import Text

from ..check.consistency import describe_p
from ..check.effects import LABELS
from ..model import TEST_FAMILIES, ClaimResult, DocumentResult, Run, Severity, Status
from ..numbers import format_p, format_p_interval
from . import CAUTION, Summary

_STATUS_STYLE = {
    Status.CONSISTENT: "green",
    Status.INCONSISTENT: "bold red",
    Status.UNCHECKED: "dim",
}
_SEVERITY_STYLE = {Severity.ERROR: "bold red", Severity.WARNING: "yellow", Severity.NOTE: "cyan"}


def _where(result: ClaimResult) -> str:
    """Short location: "p.3 l.14" (PDF), "intro.tex:14" (LaTeX), "¶12" (Word, markup), "l.14"."""
    location = result.claim.location
    if location.page:
        return f"p.{location.page} l.{location.line}"
    if location.file:
        return f"{location.file}:{location.line}"
    if location.paragraph:
        where = f"¶{location.paragraph}"
        return f"{where} {location.cell}" if location.cell else where
    return f"l.{location.line}"


def _recomputed(result: ClaimResult) -> str:
    recomputed = result.recomputed
    if recomputed.p is not None:
        return format_p(recomputed.p)
    if recomputed.p_interval is not None:
        return format_p_interval(recomputed.p_interval.low, recomputed.p_interval.high)
    return "-"


def _format_bayes_factor(value: float) -> str:
    if value >= 1000 or value < 0.001:
        return f"{value:.1e}"
    return f"{value:.3g}"


def _granularity(name: str, verdict) -> str | None:
    if verdict is None:
        return None
    if not verdict.testable:
        return f"{name}: not testable"
    return f"{name}: {'possible' if verdict.consistent else 'impossible'}"


def _evidence(result: ClaimResult, alpha: float) -> str:
    """Compact effect and evidence: "d = 0.89 [0.13, 1.64], BF01 = 0.34"."""
    recomputed = result.recomputed
    if result.claim.test in ("mean", "percent"):
        parts = [_granularity("GRIM", recomputed.grim), _granularity("GRIMMER", recomputed.grimmer),
                 _granularity("count/base", recomputed.percentage)]
        return ", ".join(part for part in parts if part) or "-"
    if recomputed.interval_facts is not None:
        facts = recomputed.interval_facts
        return f"p from CI in {format_p_interval(facts.p.low, facts.p.high)}"
    if result.claim.test == "estimate" and recomputed.coefficient_statistic is not None:
        statistic = recomputed.coefficient_statistic
        return f"|b| / SE in [{statistic.low:.2f}, {statistic.high:.2f}]"
    effect, evidence = recomputed.effect, recomputed.evidence
    parts = []
    if effect is not None:
        text = f"{LABELS[effect.measure]} = {effect.value:.2f}"
        if effect.low is not None and effect.high is not None:
            text += f" [{effect.low:.2f}, {effect.high:.2f}]"
        parts.append(text)
        p = result.recomputed.p
        if p is not None and effect.detectable is not None and p >= alpha:
            parts.append(f"80% power at {effect.detectable:.2f}")
    if evidence is not None:
        if evidence.bf01 is not None:
            parts.append(f"BF01 = {_format_bayes_factor(evidence.bf01)}")
        elif evidence.min_bf01 is not None:
            parts.append(f"BF01 ≥ {_format_bayes_factor(evidence.min_bf01)}")
    return ", ".join(parts) or "-"


def _status(result: ClaimResult) -> Text:
    label = result.status.value
    if result.status is Status.UNCHECKED and result.reason:
        label += f": {result.reason}"
    return Text(label, style=_STATUS_STYLE[result.status])


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
        reported = describe_p(result.claim) if result.claim.p is not None or \
            result.claim.test in TEST_FAMILIES else "-"
        table.add_row(result.id, _where(result), " ".join(result.claim.text.split()),
                      reported, _recomputed(result),
                      _evidence(result, alpha), _status(result), _flags(result))
    console.print(table)
    messages = Table(show_header=False, show_edge=False, box=None, pad_edge=False,
                     padding=(0, 1, 0, 0))
    messages.add_column("id", no_wrap=True)
    messages.add_column("where", no_wrap=True)
    messages.add_column("check", no_wrap=True)
    messages.add_column("message", overflow="fold")
    for result in document.claims:
        for flag in result.flags:
            messages.add_row(result.id, _where(result),
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
