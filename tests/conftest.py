"""Shared fixtures: run the whole pipeline on a sentence and look at what it says."""

from __future__ import annotations

from pathlib import Path

import pytest

import scrutiny
from scrutiny.model import ClaimResult, Settings

REPOSITORY = Path(__file__).resolve().parents[1]
DATA = Path(__file__).resolve().parent / "data"


def results_for(text: str, **settings: float) -> list[ClaimResult]:
    return list(scrutiny.check_text(text, Settings(**settings)).claims)


def only_result(text: str, **settings: float) -> ClaimResult:
    results = results_for(text, **settings)
    assert len(results) == 1, f"expected one result in {text!r}, found {len(results)}"
    return results[0]


def flags_for(text: str, **settings: float) -> list[str]:
    """The check ids raised for the single result in `text`, sorted."""
    return sorted(flag.check for flag in only_result(text, **settings).flags)


@pytest.fixture
def repository() -> Path:
    return REPOSITORY
