"""JSON report: the machine contract (schema version 1, documented in the README).

Numbers are JSON numbers, printed strings stay strings, and a missing value is null. Keys are
never dropped: a consumer can rely on every key of the schema being present. The contract is
also published as a JSON Schema (draft 2020-12) at `SCHEMA_PATH`, which the tests hold every
report to.
"""

from __future__ import annotations

import json
import math
from pathlib import Path
from typing import Any, TextIO

from .. import __version__
from ..model import ClaimResult, DocumentResult, Effect, Evidence, Location, Run
from ..rounding import UnreadableNumber, parse_printed
from . import CAUTION, Summary

SCHEMA_VERSION = 1
#: the JSON Schema of the report, shipped with the package
SCHEMA_PATH = Path(__file__).resolve().parent / "schema" / f"report-{SCHEMA_VERSION}.json"


def _number(value: float | None) -> float | int | None:
    if value is None or math.isnan(value):
        return None
    if math.isinf(value):
        return None
    if float(value).is_integer() and abs(value) < 2**53:
        return int(value)
    return float(value)


def _printed_number(printed: str | None) -> float | int | None:
    if not printed:
        return None
    try:
        return _number(parse_printed(printed).value)
    except UnreadableNumber:
        return None


def _parts(record: Any) -> dict[str, Any] | None:
    """A small record of printed strings or verdicts as a JSON object (null for None)."""
    if record is None:
        return None
    return {name: (list(value) if isinstance(value, tuple) else value)
            for name, value in ((name, getattr(record, name)) for name in record.__slots__)}


def _effect(effect: Effect | None) -> dict[str, Any] | None:
    if effect is None:
        return None
    return {
        "measure": effect.measure,
        "value": _number(effect.value),
        "low": _number(effect.low),
        "high": _number(effect.high),
        "confidence": effect.confidence,
        "low90": _number(effect.low90),
        "high90": _number(effect.high90),
        "detectable": _number(effect.detectable),
        "n": _number(effect.n),
        "assumption": effect.assumption,
    }


def _evidence(evidence: Evidence | None) -> dict[str, Any] | None:
    if evidence is None:
        return None
    return {
        "bf01": _number(evidence.bf01),
        "method": evidence.method,
        "prior_scale": evidence.prior_scale,
        "prior_null": evidence.prior_null,
        "posterior_null": _number(evidence.posterior_null),
        "min_bf01": _number(evidence.min_bf01),
        "min_posterior_null": _number(evidence.min_posterior_null),
        "assumption": evidence.assumption,
        "reason": evidence.reason,
    }


def location_json(location: Location) -> dict[str, Any]:
    return {
        "page": location.page,
        "line": location.line,
        "start": location.start,
        "end": location.end,
        "file": location.file,
        "section": location.section,
        "paragraph": location.paragraph,
        "cell": location.cell,
        "boxes": [{"page": box.page, "x0": round(box.x0, 2), "top": round(box.top, 2),
                   "x1": round(box.x1, 2), "bottom": round(box.bottom, 2)}
                  for box in location.boxes],
    }


def claim_json(result: ClaimResult) -> dict[str, Any]:
    claim, recomputed = result.claim, result.recomputed
    p_interval = recomputed.p_interval
    one_sided = recomputed.p_interval_one_sided
    df = recomputed.df or tuple(v for v in (_printed_number(d) for d in claim.df) if v is not None)
    return {
        "id": result.id,
        "text": claim.text,
        "sentence": claim.sentence,
        "location": location_json(claim.location),
        "test": claim.test,
        "df": [_number(d) for d in df],
        "df_printed": list(claim.df),
        "statistic": claim.statistic,
        "statistic_comparator": claim.statistic_comparator,
        "n": _number(recomputed.n) if recomputed.n is not None else _printed_number(claim.n),
        "aggregate": claim.aggregate,
        "p": {
            "comparator": claim.p.comparator if claim.p else None,
            "reported": claim.p.reported if claim.p else None,
            "adjusted": claim.p.adjusted if claim.p else None,
            "tails_stated": claim.tails_stated,
            "recomputed": _number(recomputed.p),
            "low": _number(p_interval.low) if p_interval else None,
            "high": _number(p_interval.high) if p_interval else None,
            "one_sided_low": _number(one_sided.low) if one_sided else None,
            "one_sided_high": _number(one_sided.high) if one_sided else None,
        },
        "status": result.status.value,
        "reason": result.reason,
        "effect": _effect(recomputed.effect),
        "effect_printed": ({"measure": claim.effect_printed.measure,
                            "value": claim.effect_printed.value,
                            "label": claim.effect_printed.label}
                           if claim.effect_printed else None),
        "group_sizes": list(claim.group_sizes) if claim.group_sizes else None,
        "sample_size": _printed_number(claim.sample_size),
        "descriptive": _parts(claim.descriptive),
        "proportion": _parts(claim.proportion),
        "estimate": _parts(claim.estimate),
        "granularity": ({name: _parts(getattr(recomputed, name))
                         for name in ("grim", "grimmer", "percentage")}
                        if claim.test in ("mean", "percent") else None),
        "interval": ({"p_low": _number(facts.p.low), "p_high": _number(facts.p.high),
                      "statistic_low": _number(facts.statistic.low),
                      "statistic_high": _number(facts.statistic.high),
                      "excludes_null": facts.excludes_null,
                      "centre_offset": _number(facts.centre_offset)}
                     if (facts := recomputed.interval_facts) is not None else None),
        "coefficient_statistic": ({"low": _number(recomputed.coefficient_statistic.low),
                                   "high": _number(recomputed.coefficient_statistic.high)}
                                  if recomputed.coefficient_statistic is not None else None),
        "evidence": _evidence(recomputed.evidence),
        "flags": [
            {
                "check": flag.check,
                "severity": flag.severity.label,
                "message": flag.message,
                "details": {k: (_number(v) if isinstance(v, float) else v)
                            for k, v in flag.details.items()},
            }
            for flag in result.flags
        ],
    }


def document_json(document: DocumentResult) -> dict[str, Any]:
    return {
        "path": document.path,
        "format": document.format,
        "encoding": document.encoding,
        "pages": document.pages,
        "errors": list(document.errors),
        "notes": list(document.notes),
        "claims": [claim_json(c) for c in document.claims],
    }


def run_json(run: Run) -> dict[str, Any]:
    summary = Summary.of(run)
    return {
        "scrutiny": __version__,
        "schema": SCHEMA_VERSION,
        "settings": run.settings.as_dict(),
        "caution": CAUTION,
        "summary": {
            "documents": summary.documents,
            "unreadable": summary.unreadable,
            "skipped": summary.skipped,
            "claims": summary.claims,
            "consistent": summary.consistent,
            "inconsistent": summary.inconsistent,
            "decision_flips": summary.decision_flips,
            "unchecked": summary.unchecked,
            "flags": summary.flags,
        },
        "documents": [document_json(d) for d in run.documents],
        "skipped": [{"path": skipped.path, "reason": skipped.reason} for skipped in run.skipped],
    }


def render_json(run: Run, stream: TextIO) -> None:
    json.dump(run_json(run), stream, ensure_ascii=False, indent=2)
    stream.write("\n")
