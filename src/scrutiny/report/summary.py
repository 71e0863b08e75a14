"""The corpus view of a screening, as text (rich) or JSON. Formatting only."""

from __future__ import annotations

import json
from pathlib import Path
from typing import Any, TextIO

from rich.console import Console
from rich.table import Table
from rich.text import Text

from .. import __version__
from ..numbers import format_p
from ..screen import CorpusSummary, Screening
from . import CAUTION


#: the JSON Schema of the summary's JSON, shipped with the package
SCHEMA_PATH = Path(__file__).resolve().parent / "schema" / "summary-1.json"
#: how many documents the text summary lists under "Documents to look at first"
DOCUMENTS_SHOWN = 20


def _test(pair: tuple[float, float] | None) -> str:
    return f"Z = {pair[0]:.2f}, p = {format_p(pair[1])}" if pair else "-"


def summary_json(summary: CorpusSummary, screening: Screening | None = None) -> dict[str, Any]:
    curve = summary.p_curve
    pair = (lambda value: {"z": value[0], "p": value[1]} if value else None)
    return {
        "scrutiny": __version__,
        "schema": 1,
        "store": summary.store,
        "settings": json.loads(summary.settings) if summary.settings else None,
        "caution": CAUTION,
        "run": ({"checked": screening.checked, "already_stored": screening.already_stored,
                 "unreadable": screening.unreadable, "skipped": screening.skipped}
                if screening else None),
        "documents": summary.documents,
        "unreadable": summary.unreadable,
        "claims": summary.claims,
        "test_results": summary.test_results,
        "status": summary.status,
        "flags": summary.flags,
        "documents_flagged": summary.documents_flagged,
        "p_curve": {
            "significant": curve.significant,
            "below_025": curve.below_025,
            "right_skew_full": pair(curve.right_skew_full),
            "right_skew_half": pair(curve.right_skew_half),
            "flatness_full": pair(curve.flatness_full),
            "flatness_half": pair(curve.flatness_half),
            "binomial_right_skew": curve.binomial_right_skew,
            "binomial_flatness": curve.binomial_flatness,
            "verdict": curve.verdict,
        },
        "caliper": [{"width": c.width, "over": c.over, "under": c.under, "p": c.p}
                    for c in summary.calipers],
        "documents_to_look_at": [
            {"path": t.path, "claims": t.claims, "inconsistent": t.inconsistent,
             "decision_flips": t.decision_flips, "errors": t.errors, "warnings": t.warnings,
             "unreadable": t.unreadable}
            for t in summary.documents_to_look_at],
        "notes": summary.notes,
    }


def render_summary(summary: CorpusSummary, format: str, stream: TextIO,
                   screening: Screening | None = None, width: int | None = None) -> None:
    if format == "json":
        json.dump(summary_json(summary, screening), stream, ensure_ascii=False, indent=2)
        stream.write("\n")
        return
    isatty = getattr(stream, "isatty", lambda: False)()
    console = Console(file=stream, width=width or (None if isatty else 120),
                      force_terminal=None if isatty else False, highlight=False, emoji=False)
    if screening is not None:
        console.print(Text(f"Screening into {screening.store}: {screening.checked} document(s) "
                           f"checked now, {screening.already_stored} already stored, "
                           f"{screening.unreadable} could not be read, {screening.skipped} other "
                           f"file(s) skipped.", style="bold"))
    status = ", ".join(f"{count} {name}" for name, count in sorted(summary.status.items()))
    console.print(f"{summary.documents} documents ({summary.unreadable} could not be read), "
                  f"{summary.claims} results ({summary.test_results} test results): "
                  f"{status or 'none'}.")
    if summary.flags:
        table = Table(title="Flags", show_edge=False, header_style="bold")
        table.add_column("check")
        table.add_column("flags", justify="right")
        table.add_column("documents", justify="right")
        for check_id, count in summary.flags.items():
            table.add_row(check_id, str(count), str(summary.documents_flagged.get(check_id, 0)))
        console.print(table)
    if summary.documents_to_look_at:
        shown = summary.documents_to_look_at[:DOCUMENTS_SHOWN]
        table = Table(title="Documents to look at first", show_edge=False, header_style="bold")
        table.add_column("document", overflow="fold")
        for column in ("results", "inconsistent", "decision flips", "errors", "warnings"):
            table.add_column(column, justify="right")
        for tally in shown:
            if tally.unreadable:
                table.add_row(tally.path, "could not be read", "", "", "", "")
                continue
            table.add_row(tally.path, str(tally.claims), str(tally.inconsistent),
                          str(tally.decision_flips), str(tally.errors), str(tally.warnings))
        console.print(table)
        hidden = len(summary.documents_to_look_at) - len(shown)
        if hidden:
            console.print(Text(f"  and {hidden} more (all of them with --format json or csv)",
                               style="dim"))
    curve = summary.p_curve
    console.print(Text("p-curve", style="bold"))
    console.print(f"  {curve.significant} significant results, {curve.below_025} below .025; "
                  f"verdict: {curve.verdict}")
    console.print(f"  right skew: full {_test(curve.right_skew_full)}; half "
                  f"{_test(curve.right_skew_half)}; binomial p = "
                  f"{format_p(curve.binomial_right_skew)}")
    console.print(f"  33% power: full {_test(curve.flatness_full)}; half "
                  f"{_test(curve.flatness_half)}; binomial p = "
                  f"{format_p(curve.binomial_flatness)}")
    console.print(Text("caliper test around z = 1.96", style="bold"))
    for caliper in summary.calipers:
        console.print(f"  {caliper.width:.0%}: {caliper.over} over, {caliper.under} under, "
                      f"one-sided binomial p = {format_p(caliper.p)}")
    for note in summary.notes:
        console.print(Text(note, style="dim"))
    console.print(Text(CAUTION, style="italic"))
