"""report: renderers from results to text. They format; they never compute statistics.

`render(run, format, stream)` writes a whole run in one of `FORMATS`: `text` (a terminal
table), `json` (the machine contract), `csv` (a row per result), `sarif` (SARIF 2.1.0, the
flags as results) and `html` (one self-contained page). Every format carries the caution that
a flag is a prompt to look, not proof of error or misconduct.
"""

from __future__ import annotations

from collections import Counter
from dataclasses import dataclass
from typing import TextIO

from ..model import Run, Status

#: formats of a check's report
FORMATS = ("text", "json", "csv", "sarif", "html")
#: formats of a screening's summary ("csv": the stored results, a row each)
SUMMARY_FORMATS = ("text", "json", "csv")

#: the caution every report carries, in every format
CAUTION = ("A flag is a prompt to look, not proof of error or misconduct: typos, corrections "
           "for multiple testing and tests scrutiny does not know explain many flags.")


@dataclass(frozen=True)
class Summary:
    """Counts over a run, for the summary line and the JSON `summary` object."""

    documents: int
    unreadable: int
    skipped: int
    claims: int
    consistent: int
    inconsistent: int
    decision_flips: int
    unchecked: int
    flags: int
    #: (reason, count) of the skipped files, "part of ..." reasons counted together
    skipped_by_reason: tuple[tuple[str, int], ...] = ()

    @classmethod
    def of(cls, run: Run) -> "Summary":
        claims = [c for d in run.documents for c in d.claims]
        return cls(
            documents=len(run.documents),
            unreadable=sum(1 for d in run.documents if d.errors),
            skipped=len(run.skipped),
            claims=len(claims),
            consistent=sum(1 for c in claims if c.status is Status.CONSISTENT),
            inconsistent=sum(1 for c in claims if c.status is Status.INCONSISTENT),
            decision_flips=sum(1 for c in claims if any(f.check == "decision-flip"
                                                        for f in c.flags)),
            unchecked=sum(1 for c in claims if c.status is Status.UNCHECKED),
            flags=sum(len(c.flags) for c in claims),
            skipped_by_reason=tuple(Counter(
                "part of a LaTeX manuscript" if s.reason.startswith("part of ") else s.reason
                for s in run.skipped).items()),
        )

    def line(self) -> str:
        parts = [
            f"{self.claims} result{'s' if self.claims != 1 else ''} found",
            f"{self.consistent} consistent",
            f"{self.inconsistent} inconsistent",
            f"{self.decision_flips} decision flip{'s' if self.decision_flips != 1 else ''}",
            f"{self.unchecked} unchecked",
        ]
        inputs = f"{self.documents} document{'s' if self.documents != 1 else ''}"
        if self.unreadable:
            inputs += f" ({self.unreadable} could not be read)"
        if self.skipped:
            reasons = ", ".join(f"{count} {reason}" for reason, count in self.skipped_by_reason)
            inputs += (f", {self.skipped} other file{'s' if self.skipped != 1 else ''} "
                       f"skipped ({reasons})")
        return f"{inputs}: " + ", ".join(parts) + "."


def render(run: Run, format: str, stream: TextIO, *, width: int | None = None) -> None:
    """Write `run` to `stream` in one of `FORMATS`."""
    if format == "json":
        from .json import render_json

        render_json(run, stream)
    elif format == "text":
        from .text import render_text

        render_text(run, stream, width=width)
    elif format == "csv":
        from .csv import render_csv

        render_csv(run, stream)
    elif format == "sarif":
        from .sarif import render_sarif

        render_sarif(run, stream)
    elif format == "html":
        from .html import render_html

        render_html(run, stream)
    else:
        raise ValueError(f"unknown format {format!r} (choose from {', '.join(FORMATS)})")


__all__ = ["CAUTION", "FORMATS", "SUMMARY_FORMATS", "Summary", "render"]
