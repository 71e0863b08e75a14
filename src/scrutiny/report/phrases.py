"""Short phrases about one result, shared by the human-readable formats (text, HTML, CSV):
where it is, what was reported and recomputed, its effect and evidence. Formatting only."""

from __future__ import annotations

from ..check.consistency import describe_p, describe_statistic
from ..check.estimates import describe_estimate
from ..check.effects import LABELS
from ..model import TEST_FAMILIES, ClaimResult, Status
from ..numbers import format_p, format_p_interval


def where(result: ClaimResult) -> str:
    """Short location: "p.3 l.14" (PDF), "intro.tex:14" (LaTeX), "¶12" (Word, markup),
    "table 2 r3 c1" (a table cell), "l.14"."""
    location = result.claim.location
    if location.page:
        return f"p.{location.page} l.{location.line}"
    if location.file:
        return f"{location.file}:{location.line}"
    if location.paragraph:
        paragraph = f"¶{location.paragraph}"
        return f"{paragraph} {location.cell}" if location.cell else paragraph
    if location.cell:
        return _short_cell(location.cell)
    return f"l.{location.line}"


def _short_cell(label: str) -> str:
    """"table 2, row 3, column 1" as "table 2 r3 c1"."""
    parts = [part.strip() for part in label.split(",")]
    if len(parts) == 3 and parts[1].startswith("row ") and parts[2].startswith("column "):
        return f"{parts[0]} r{parts[1][4:]} c{parts[2][7:]}"
    return label


def reported(result: ClaimResult) -> str:
    """The p-value as printed ("p = .021", "no p"), or "-" for a claim that has none to print."""
    claim = result.claim
    return describe_p(claim) if claim.p is not None or claim.test in TEST_FAMILIES else "-"


def recomputed(result: ClaimResult) -> str:
    numbers = result.recomputed
    if numbers.p is not None:
        return format_p(numbers.p)
    if numbers.p_interval is not None:
        return format_p_interval(numbers.p_interval.low, numbers.p_interval.high)
    return "-"


def bayes_factor(value: float) -> str:
    if value >= 1000 or value < 0.001:
        return f"{value:.1e}"
    return f"{value:.3g}"


def _granularity(name: str, verdict) -> str | None:
    if verdict is None:
        return None
    if not verdict.testable:
        return f"{name}: not testable"
    return f"{name}: {'possible' if verdict.consistent else 'impossible'}"


def evidence(result: ClaimResult, alpha: float) -> str:
    """Compact effect and evidence: "d = 0.89 [0.13, 1.64], BF01 = 0.34"."""
    numbers = result.recomputed
    if result.claim.test in ("mean", "percent"):
        parts = [_granularity("GRIM", numbers.grim), _granularity("GRIMMER", numbers.grimmer),
                 _granularity("count/base", numbers.percentage)]
        return ", ".join(part for part in parts if part) or "-"
    if numbers.interval_facts is not None:
        facts = numbers.interval_facts
        return f"p from CI in {format_p_interval(facts.p.low, facts.p.high)}"
    if result.claim.test == "estimate" and numbers.coefficient_statistic is not None:
        statistic = numbers.coefficient_statistic
        return f"|b| / SE in [{statistic.low:.2f}, {statistic.high:.2f}]"
    effect, weight = numbers.effect, numbers.evidence
    parts = []
    if effect is not None:
        text = f"{LABELS[effect.measure]} = {effect.value:.2f}"
        if effect.low is not None and effect.high is not None:
            text += f" [{effect.low:.2f}, {effect.high:.2f}]"
        parts.append(text)
        if numbers.p is not None and effect.detectable is not None and numbers.p >= alpha:
            parts.append(f"80% power at {effect.detectable:.2f}")
    if weight is not None:
        if weight.bf01 is not None:
            parts.append(f"BF01 = {bayes_factor(weight.bf01)}")
        elif weight.min_bf01 is not None:
            parts.append(f"BF01 ≥ {bayes_factor(weight.min_bf01)}")
    return ", ".join(parts) or "-"


def status(result: ClaimResult) -> str:
    """"consistent", "inconsistent", or "unchecked: <reason>"."""
    label = result.status.value
    if result.status is Status.UNCHECKED and result.reason:
        label += f": {result.reason}"
    return label


def printed(result: ClaimResult) -> str:
    """The result as printed, with its white space collapsed; a row of a table, whose cells
    alone say little ("1.48 210 .04"), as the result it prints, marked as a table row."""
    claim = result.claim
    if claim.pattern == "table-row":
        first = (describe_estimate(claim) if claim.test == "estimate"
                 else describe_statistic(claim))
        estimate = claim.estimate if claim.test != "estimate" else None
        if estimate is not None and estimate.se is not None:
            first = f"{estimate.label} = {estimate.value}, SE = {estimate.se}, {first}"
        return f"{first}, {describe_p(claim)} (table row)"
    return " ".join(claim.text.split())
