"""Extraction of means, percentages, estimates with intervals and coefficients, case by case.

`tests/data/estimate_cases.toml` lists sentences (and the text of Word and PDF tables) written
the way manuscripts print these numbers, each with exactly the Claims the extractor must find:
every claim of the text, in text order, with its printed parts. A field a case leaves out must
be empty, so a cue word read where it should not be, or an SD read where the text says SE,
fails the case.
"""

from __future__ import annotations

import sys
from pathlib import Path

import pytest
import regex

from scrutiny.extract import find_claims
from scrutiny.ingest import document_from_text
from scrutiny.model import OTHER_KINDS, TEST_FAMILIES

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover - exercised on Python 3.10 only
    import tomli as tomllib

CASES_FILE = Path(__file__).parent / "data" / "estimate_cases.toml"
CASES = tomllib.loads(CASES_FILE.read_text(encoding="utf-8"))["case"]

CASE_KEYS = {"text", "note", "claims"}
DESCRIPTIVE_KEYS = ("mean", "sd", "n", "items", "integer_cue", "sum_score")
PROPORTION_KEYS = ("percent", "count", "base", "weighted")
ESTIMATE_KEYS = ("label", "value", "low", "high", "level", "se", "ratio")
COMMON_KEYS = {"test", "p_comparator", "p_reported", "span", "line"}
KEYS_BY_TEST = {
    "mean": COMMON_KEYS | set(DESCRIPTIVE_KEYS),
    "percent": COMMON_KEYS | set(PROPORTION_KEYS),
    "estimate": COMMON_KEYS | {"estimate"},
}
TEST_KEYS = COMMON_KEYS | {"df", "statistic", "estimate", "sample_size"}


def _case_id(case: dict) -> str:
    return regex.sub(r"[^\w]+", "-", case["note"].lower(), flags=regex.ASCII).strip("-")[:70]


def _estimate(entry: dict | None) -> dict | None:
    if entry is None:
        return None
    return {key: entry.get(key, False if key == "ratio" else None) for key in ESTIMATE_KEYS}


def _expected(entry: dict) -> dict:
    """Every field of one expected claim; what the case leaves out is empty."""
    test = entry["test"]
    expected = {
        "test": test,
        "p": (entry["p_comparator"], entry.get("p_reported", "")) if "p_comparator" in entry
        else None,
        "estimate": _estimate(entry.get("estimate")),
    }
    if test == "mean":
        expected["descriptive"] = {key: entry.get(key, False if key == "sum_score" else None)
                                   for key in DESCRIPTIVE_KEYS}
        expected["statistic"] = entry["mean"]
    elif test == "percent":
        expected["proportion"] = {key: entry.get(key, False if key == "weighted" else None)
                                  for key in PROPORTION_KEYS}
        expected["statistic"] = entry["percent"]
    elif test == "estimate":
        expected["statistic"] = entry["estimate"]["value"]
    else:
        expected.update(df=tuple(entry.get("df", ())), statistic=entry["statistic"],
                        sample_size=entry.get("sample_size"))
    return expected


def _found(claim) -> dict:
    found = {
        "test": claim.test,
        "p": (claim.p.comparator, claim.p.reported) if claim.p else None,
        "estimate": ({key: getattr(claim.estimate, key) for key in ESTIMATE_KEYS}
                     if claim.estimate else None),
        "statistic": claim.statistic,
    }
    if claim.test == "mean":
        found["descriptive"] = {key: getattr(claim.descriptive, key) for key in DESCRIPTIVE_KEYS}
    elif claim.test == "percent":
        found["proportion"] = {key: getattr(claim.proportion, key) for key in PROPORTION_KEYS}
    elif claim.test in TEST_FAMILIES:
        found.update(df=claim.df, sample_size=claim.sample_size)
    return found


def test_case_table_is_well_formed():
    assert len(CASES) >= 60
    notes = [case["note"] for case in CASES]
    assert len(set(notes)) == len(notes), "every case needs its own note"
    assert len({_case_id(case) for case in CASES}) == len(CASES), "notes differ only in punctuation"
    texts = [case["text"] for case in CASES]
    assert len(set(texts)) == len(texts), "a case repeats another case's text"
    assert sum(1 for case in CASES if not case.get("claims")) >= 15, "too few negative cases"
    kinds = {entry["test"] for case in CASES for entry in case.get("claims", [])}
    assert set(OTHER_KINDS) <= kinds and {"t", "z", "r"} <= kinds
    for case in CASES:
        assert set(case) <= CASE_KEYS, f"{case['note']}: unknown keys {set(case) - CASE_KEYS}"
        for entry in case.get("claims", []):
            allowed = KEYS_BY_TEST.get(entry["test"], TEST_KEYS)
            assert set(entry) <= allowed, f"{case['note']}: unknown keys {set(entry) - allowed}"
            assert set(entry.get("estimate", {})) <= set(ESTIMATE_KEYS), case["note"]
            assert ("p_reported" in entry) == (entry.get("p_comparator") not in (None, "ns"))
            if "\n" in case["text"]:
                assert "line" in entry, f"{case['note']}: a multi-line case states each line"


@pytest.mark.parametrize("case", CASES, ids=[_case_id(case) for case in CASES])
def test_estimate_case(case):
    text = case["text"]
    claims = find_claims(document_from_text(text))
    assert [_found(claim) for claim in claims] == \
        [_expected(entry) for entry in case.get("claims", [])]
    for claim, entry in zip(claims, case.get("claims", [])):
        assert text[claim.location.start:claim.location.end] == claim.text
        if "span" in entry:
            assert claim.text == entry["span"]
        if "line" in entry:
            assert claim.location.line == entry["line"]
        assert claim.pattern, "the claim names the pattern that found it"


def test_a_unit_after_the_sd_also_marks_a_measurement():
    # "12.4 ± 3.1 g": the unit follows the SD; the count cue in the sentence must not apply
    [claim] = find_claims(document_from_text(
        "The number of pups weighed 12.4 ± 3.1 g (n = 8) at birth."))
    assert claim.descriptive.integer_cue is None and claim.descriptive.sd == "3.1"


def test_a_standard_error_convention_far_away_still_counts():
    # the convention of a document's ± values is stated once, often in the methods
    filler = "Pikas were weighed and released at the burrow mouth.\n\n" * 40
    text = ("Values are mean ± SEM.\n\n" + filler
            + "The number of pups per litter was 4.25 ± 0.31 (n = 8).")
    [claim] = find_claims(document_from_text(text))
    assert claim.descriptive.sd is None
    [without] = find_claims(document_from_text(filler + text.splitlines()[-1]))
    assert without.descriptive.sd == "0.31"


def test_a_scale_cue_far_away_in_text_without_blank_lines_does_not_count():
    # hard-wrapped text and PDF text layers are one "paragraph"; a cue thousands of characters
    # away is about something else
    filler = "Pikas were weighed and released at the burrow mouth.\n" * 60
    text = "Boldness was rated on a 7-point scale.\n" + filler + \
        "The index was higher at dusk (M = 3.47, SD = 1.20, n = 20).\n"
    [claim] = find_claims(document_from_text(text))
    assert claim.descriptive.integer_cue is None
    [near] = find_claims(document_from_text(filler + text.splitlines()[0] + "\n"
                                            + text.splitlines()[-1]))
    assert near.descriptive.integer_cue == "7-point"
