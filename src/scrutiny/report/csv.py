"""CSV report: one row per result, for spreadsheets, R and pandas.

Built from the JSON data of the report (schema 1), so that a single check and a stored
screening (whose rows hold that JSON) give the same table. The first line is the caution, not a
header: read the file with `pandas.read_csv(path, skiprows=1)` or `read.csv(path, skip = 1)`.
Numbers are written as Python prints them (full precision, `.` as the decimal mark); missing
values are empty cells; printed strings (statistic, p, the result's text) stay as printed.
"""

from __future__ import annotations

import csv
from typing import Any, Iterable, TextIO

from ..model import Severity, Run
from . import CAUTION

#: the columns, in order; README "CSV output" says what each holds
COLUMNS = (
    "document", "id", "page", "line", "start", "end", "test", "df1", "df2",
    "statistic_comparator", "statistic", "n", "p_comparator", "p_reported", "p_adjusted",
    "tails_stated", "p_recomputed", "p_low", "p_high", "status", "reason",
    "effect_measure", "effect", "effect_low", "effect_high", "bf01", "evidence_method",
    "posterior_null", "checks", "worst_severity", "text", "sentence",
)

_SEVERITY_ORDER = {severity.label: severity.value for severity in Severity}


def _cell(value: Any) -> Any:
    return "" if value is None else value


def claim_row(document: str, claim: dict) -> dict[str, Any]:
    """One row of the table from one claim of the JSON report."""
    df = claim["df"] + [None, None]
    p, effect, evidence = claim["p"], claim["effect"] or {}, claim["evidence"] or {}
    checks = [flag["check"] for flag in claim["flags"]]
    severities = [flag["severity"] for flag in claim["flags"]]
    row = {
        "document": document,
        "id": claim["id"],
        "page": claim["location"]["page"],
        "line": claim["location"]["line"],
        "start": claim["location"]["start"],
        "end": claim["location"]["end"],
        "test": claim["test"],
        "df1": df[0],
        "df2": df[1],
        "statistic_comparator": claim["statistic_comparator"],
        "statistic": claim["statistic"],
        "n": claim["n"],
        "p_comparator": p["comparator"],
        "p_reported": p["reported"],
        "p_adjusted": p["adjusted"],
        "tails_stated": p["tails_stated"],
        "p_recomputed": p["recomputed"],
        "p_low": p["low"],
        "p_high": p["high"],
        "status": claim["status"],
        "reason": claim["reason"],
        "effect_measure": effect.get("measure"),
        "effect": effect.get("value"),
        "effect_low": effect.get("low"),
        "effect_high": effect.get("high"),
        "bf01": evidence.get("bf01"),
        "evidence_method": evidence.get("method"),
        "posterior_null": evidence.get("posterior_null"),
        "checks": ";".join(checks),
        "worst_severity": max(severities, key=_SEVERITY_ORDER.__getitem__) if severities else None,
        "text": " ".join(claim["text"].split()),
        "sentence": claim["sentence"],
    }
    return {name: _cell(value) for name, value in row.items()}


def write_rows(documents: Iterable[dict], stream: TextIO) -> None:
    """The caution, the header and a row per claim of each document (JSON data, schema 1)."""
    stream.write(f"# {CAUTION}\n")
    writer = csv.DictWriter(stream, fieldnames=COLUMNS, lineterminator="\n")
    writer.writeheader()
    for document in documents:
        for claim in document["claims"]:
            writer.writerow(claim_row(document["path"], claim))


def render_csv(run: Run, stream: TextIO) -> None:
    from .json import document_json

    write_rows((document_json(document) for document in run.documents), stream)
