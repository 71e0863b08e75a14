"""SARIF report: the flags as a SARIF 2.1.0 log (the OASIS Static Analysis Results Interchange
Format), for viewers, editors' pipelines and code-scanning services that read it.

One run; one `result` per flag, with the check as its rule (the registry's id, title and
explanation, severity as the SARIF level). Where a result can be located in the file on disk it
gets a region: plain text and Markdown have character offsets and a line, LaTeX, HTML and JATS
a line of the source file; PDF and Word files have no text regions, so their page, line,
paragraph or table cell go in the location's properties. Unreadable documents and skipped files
are the invocation's notifications. The caution is in the run's properties and in every
rule's help.
"""

from __future__ import annotations

import hashlib
import json
import os
from pathlib import PurePath
from typing import Any, TextIO
from urllib.parse import quote

from .. import __version__
from ..check import REGISTRY
from ..model import ClaimResult, DocumentResult, Flag, Run
from . import CAUTION, phrases

SARIF_VERSION = "2.1.0"
SARIF_SCHEMA = "https://json.schemastore.org/sarif-2.1.0.json"
#: formats whose Location offsets are offsets into the file as decoded
_FILE_OFFSETS = frozenset({"text", "markdown"})
#: formats whose Location line is a line of the source file
_FILE_LINES = frozenset({"text", "markdown", "latex", "html", "jats"})


def uri(path: str) -> str:
    """A URI reference for a path: relative paths stay relative (forward slashes, escaped);
    absolute ones become file: URIs."""
    pure = PurePath(path)
    if pure.is_absolute():
        return pure.as_uri()
    return quote(path.replace(os.sep, "/"))


def _rule_name(check_id: str) -> str:
    return "".join(part.capitalize() for part in check_id.split("-"))


def _rules() -> list[dict[str, Any]]:
    return [{
        "id": registered.id,
        "name": _rule_name(registered.id),
        "shortDescription": {"text": registered.title},
        "fullDescription": {"text": registered.explanation},
        "defaultConfiguration": {"level": registered.severity.label},
        "help": {"text": f"{registered.explanation}\n\n{CAUTION}"},
    } for registered in REGISTRY.values()]


def _artifact_path(document: DocumentResult, result: ClaimResult) -> str:
    """The file a claim is printed in: the document, or the LaTeX file it \\input."""
    included = result.claim.location.file
    if document.format == "latex" and included:
        folder = os.path.dirname(document.path)
        return os.path.join(folder, included) if folder else included
    return document.path


def _location(document: DocumentResult, result: ClaimResult,
              artifacts: dict[str, int]) -> dict[str, Any]:
    where = result.claim.location
    path = _artifact_path(document, result)
    index = artifacts.setdefault(path, len(artifacts))
    physical: dict[str, Any] = {"artifactLocation": {"uri": uri(path), "index": index}}
    region: dict[str, Any] = {}
    if document.format in _FILE_LINES and where.line >= 1:
        region["startLine"] = where.line
    if document.format in _FILE_OFFSETS:
        region["charOffset"] = where.start
        region["charLength"] = where.end - where.start
    if region:
        region["snippet"] = {"text": result.claim.text}
        physical["region"] = region
    location: dict[str, Any] = {"physicalLocation": physical}
    described = {name: value for name, value in (
        ("page", where.page), ("line", where.line), ("section", where.section),
        ("paragraph", where.paragraph), ("cell", where.cell)) if value is not None}
    described["where"] = phrases.where(result)
    location["properties"] = described
    return location


def _fingerprint(document: DocumentResult, result: ClaimResult, flag: Flag) -> str:
    """Stable across runs and line shifts: the check, the file and the result as printed."""
    key = "\n".join((flag.check, os.path.basename(document.path),
                     " ".join(result.claim.text.split())))
    return hashlib.sha256(key.encode("utf-8")).hexdigest()[:32]


def _result(document: DocumentResult, result: ClaimResult, flag: Flag,
            artifacts: dict[str, int], rule_index: dict[str, int]) -> dict[str, Any]:
    return {
        "ruleId": flag.check,
        "ruleIndex": rule_index[flag.check],
        "level": flag.severity.label,
        "message": {"text": flag.message},
        "locations": [_location(document, result, artifacts)],
        "partialFingerprints": {"scrutinyResult/v1": _fingerprint(document, result, flag)},
        "properties": {
            "claim": result.id,
            "test": result.claim.test,
            "status": result.status.value,
            "printed": phrases.printed(result),
            "sentence": result.claim.sentence,
            "details": {key: value for key, value in flag.details.items()
                        if isinstance(value, (str, int, float, bool)) or value is None},
        },
    }


def _notifications(run: Run, artifacts: dict[str, int]) -> list[dict[str, Any]]:
    notes = []
    for document in run.documents:
        for error in document.errors:
            index = artifacts.setdefault(document.path, len(artifacts))
            notes.append({"level": "error", "message": {"text": f"could not be read: {error}"},
                          "locations": [{"physicalLocation": {"artifactLocation": {
                              "uri": uri(document.path), "index": index}}}]})
    for skipped in run.skipped:
        notes.append({"level": "note", "message": {"text": f"skipped: {skipped.reason}"},
                      "locations": [{"physicalLocation": {"artifactLocation": {
                          "uri": uri(skipped.path)}}}]})
    return notes


def sarif_log(run: Run) -> dict[str, Any]:
    rules = _rules()
    rule_index = {rule["id"]: index for index, rule in enumerate(rules)}
    artifacts: dict[str, int] = {}
    for document in run.documents:
        artifacts.setdefault(document.path, len(artifacts))
    results = [_result(document, result, flag, artifacts, rule_index)
               for document in run.documents for result in document.claims
               for flag in result.flags]
    notifications = _notifications(run, artifacts)
    return {
        "$schema": SARIF_SCHEMA,
        "version": SARIF_VERSION,
        "runs": [{
            "tool": {"driver": {
                "name": "scrutiny",
                "version": __version__,
                "rules": rules,
            }},
            "invocations": [{
                "executionSuccessful": True,
                "toolExecutionNotifications": notifications,
            }],
            "artifacts": [{"location": {"uri": uri(path)}}
                          for path, _ in sorted(artifacts.items(), key=lambda item: item[1])],
            "columnKind": "unicodeCodePoints",
            "results": results,
            "properties": {
                "caution": CAUTION,
                "settings": run.settings.as_dict(),
            },
        }],
    }


def render_sarif(run: Run, stream: TextIO) -> None:
    json.dump(sarif_log(run), stream, ensure_ascii=False, indent=2)
    stream.write("\n")
