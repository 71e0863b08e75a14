"""Extraction: the table of formatting variants and the pattern library's own examples.

`tests/data/extraction_cases.toml` lists sentences written the way manuscripts print results,
each with exactly the Claims the extractor must find in it (none, for the negative cases). Every
field is compared as printed; fields a case leaves out must be empty (no n, no tails stated, ...).
"""

from __future__ import annotations

import sys
from pathlib import Path

import pytest
import regex

from scrutiny.extract import PARAGRAPH_REACH, find_claims, statistic_heads
from scrutiny.model import TEST_FAMILIES
from scrutiny.ingest import document_from_text
from scrutiny.patterns import load_library

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover - exercised on Python 3.10 only
    import tomli as tomllib

CASES_FILE = Path(__file__).parent / "data" / "extraction_cases.toml"
CASES = tomllib.loads(CASES_FILE.read_text(encoding="utf-8"))["case"]

#: keys a case may carry, and keys each of its expected claims may carry
CASE_KEYS = {"text", "note", "claims"}
CLAIM_KEYS = {
    "test", "df", "statistic", "statistic_comparator", "p_comparator", "p_reported",
    "p_adjusted", "n", "aggregate", "tails_stated", "design_stated", "line", "span",
}
REQUIRED_CLAIM_KEYS = {"test", "df", "statistic", "statistic_comparator"}
COMPARATORS = {"=", "<", ">", "<=", ">="}


def _case_id(case: dict) -> str:
    slug = regex.sub(r"[^\w]+", "-", case["note"].lower(), flags=regex.ASCII).strip("-")
    return slug[:70]


def _expected(entry: dict) -> dict:
    """The fields one expected claim must have; anything a case leaves out must be empty."""
    has_p = "p_comparator" in entry
    return {
        "test": entry["test"],
        "df": tuple(entry["df"]),
        "statistic": entry["statistic"],
        "statistic_comparator": entry["statistic_comparator"],
        "p": (entry["p_comparator"], entry.get("p_reported", ""), entry.get("p_adjusted"))
        if has_p else None,
        "n": entry.get("n"),
        "aggregate": entry.get("aggregate", False),
        "tails_stated": entry.get("tails_stated"),
        "design_stated": entry.get("design_stated"),
    }


def _found(claim) -> dict:
    return {
        "test": claim.test,
        "df": claim.df,
        "statistic": claim.statistic,
        "statistic_comparator": claim.statistic_comparator,
        "p": (claim.p.comparator, claim.p.reported, claim.p.adjusted) if claim.p else None,
        "n": claim.n,
        "aggregate": claim.aggregate,
        "tails_stated": claim.tails_stated,
        "design_stated": claim.design_stated,
    }


def test_case_table_is_well_formed():
    assert len(CASES) >= 170
    notes = [case["note"] for case in CASES]
    assert len(set(notes)) == len(notes), "every case needs its own note"
    ids = [_case_id(case) for case in CASES]
    assert len(set(ids)) == len(ids), "notes must differ in more than punctuation"
    texts = [case["text"] for case in CASES]
    assert len(set(texts)) == len(texts), "a case repeats another case's text"
    assert sum(1 for case in CASES if not case.get("claims")) >= 25, "too few negative cases"
    for case in CASES:
        assert set(case) <= CASE_KEYS, f"{case['note']}: unknown keys {set(case) - CASE_KEYS}"
        for entry in case.get("claims", []):
            where = f"{case['note']}: claim {entry}"
            assert set(entry) <= CLAIM_KEYS, f"{where}: unknown keys {set(entry) - CLAIM_KEYS}"
            assert REQUIRED_CLAIM_KEYS <= set(entry), f"{where}: missing keys"
            assert entry["test"] in {"t", "F", "chi2", "r", "z"}, where
            assert entry["statistic_comparator"] in COMPARATORS, where
            assert entry.get("p_comparator", "=") in COMPARATORS | {"ns"}, where
            assert ("p_reported" in entry) == (entry.get("p_comparator") not in (None, "ns")), \
                f"{where}: p_reported goes with a p comparator other than ns"
            if "\n" in case["text"]:
                assert "line" in entry, f"{where}: a multi-line case states each claim's line"


@pytest.mark.parametrize("case", CASES, ids=[_case_id(case) for case in CASES])
def test_extraction_case(case):
    # the table lists test results; means, percentages and estimates have tests of their own
    text = case["text"]
    claims = [c for c in find_claims(document_from_text(text)) if c.test in TEST_FAMILIES]
    expected = [_expected(entry) for entry in case.get("claims", [])]
    assert [_found(claim) for claim in claims] == expected

    for claim, entry in zip(claims, case.get("claims", [])):
        location = claim.location
        assert claim.text and claim.text in text
        assert text[location.start:location.end] == claim.text
        assert location.line == text.count("\n", 0, location.start) + 1
        if "line" in entry:
            assert location.line == entry["line"]
        if "span" in entry:
            assert claim.text == entry["span"]
        # the claim lies inside the sentence the extractor reports for it
        assert " ".join(claim.text.split()) in claim.sentence


def test_tails_stated_far_away_in_text_without_blank_lines_does_not_count():
    # Hard-wrapped text and PDF text layers have no blank lines, so the whole manuscript is one
    # paragraph; a mention of tails thousands of characters away must not reach a result.
    filler = "Birds were ringed, weighed and released at the net.\n" * 60
    result = "Chicks fledged sooner in warm springs, t(28) = 2.20, p = .036.\n"
    far = "All tests were one-tailed.\n" + filler + result
    near = filler + "All tests were one-tailed.\n" + result
    assert len(filler) > PARAGRAPH_REACH
    [far_claim] = find_claims(document_from_text(far))
    [near_claim] = find_claims(document_from_text(near))
    assert far_claim.tails_stated is None
    assert near_claim.tails_stated == "one"
    assert far_claim.location.line == 62 and near_claim.location.line == 62


def _examples(kind_of_example: str):
    library = load_library()
    return [
        pytest.param(pattern, example, id=f"{pattern.id}:{example}")
        for pattern in library.patterns
        for example in getattr(pattern, kind_of_example)
    ]


def test_every_pattern_has_examples():
    for pattern in load_library().patterns:
        assert pattern.must_match, f"{pattern.id} has no must_match examples"
        assert pattern.must_not_match, f"{pattern.id} has no must_not_match examples"


@pytest.mark.parametrize("pattern, example", _examples("must_match"))
def test_pattern_matches_its_examples(pattern, example):
    normalised = document_from_text(example).normalised
    assert pattern.compiled.search(normalised), f"{pattern.id} does not match {example!r}"


@pytest.mark.parametrize("pattern, example", _examples("must_not_match"))
def test_pattern_rejects_its_counter_examples(pattern, example):
    normalised = document_from_text(example).normalised
    found = pattern.compiled.search(normalised)
    assert found is None, f"{pattern.id} matches {found.group()!r} in {example!r}"


@pytest.mark.parametrize("pattern, example", [
    param for param in _examples("must_match") if param.values[0].kind == "statistic"])
def test_every_statistic_example_is_found_by_the_symbol_scan(pattern, example):
    # statistic_heads tries the patterns only where a statistic symbol starts a word; this
    # fails when a pattern learns to start with a symbol the scan does not know
    normalised = document_from_text(example).normalised
    expected = pattern.compiled.search(normalised)
    heads = statistic_heads(normalised, load_library())
    assert any(head.start() <= expected.start() < head.end() for head in heads), (
        f"no head found for {example!r}")


@pytest.mark.parametrize("sentence, tails, design", [
    ("One-tailed tests were used for both predictions. Males sang more, t(38) = 1.71, p = .048.",
     "one", None),
    ("Directional tests were used. Males sang more, t(38) = 1.71, p = .048.", "one", None),
    ("Paired counts differed, t(2408) = 4.10, p < .001.", None, "within"),
    ("Two-sided tests throughout: Welch's t(37.6) = 2.10, p = .043.", "two", "between"),
])
def test_cue_words_count_in_any_case(sentence, tails, design):
    [claim] = find_claims(document_from_text(sentence))
    assert (claim.tails_stated, claim.design_stated) == (tails, design)


def test_every_keyword_pattern_example_contains_a_keyword():
    # patterns with keywords are searched only near them; an example without one would be missed
    for pattern in load_library().patterns:
        for example in pattern.must_match if pattern.keywords else ():
            # lower-case ASCII keywords are found in any case, others exactly as written
            assert any(k in example.lower() if k.isascii() and k == k.lower() else k in example
                       for k in pattern.keywords), (pattern.id, example)


def test_cue_words_are_found_anywhere_in_a_long_text():
    filler = "Birds were ringed, weighed and released at the net. " * 400
    text = filler + "All tests were One-Tailed. Chicks fledged sooner, t(28) = 2.20, p = .018. " + filler
    [claim] = find_claims(document_from_text(text))
    assert claim.tails_stated == "one"


@pytest.mark.parametrize("sentence, measure, value, label", [
    ("The groups differed, t(28) = 2.45, p = .021, d = 0.93.", "d", "0.93", "d"),
    ("The groups differed, t(28) = 2.45, p = .021, Cohen's d = −0.41.", "d", "−0.41", "Cohen's d"),
    ("Paired counts differed, t(28) = 2.45, p = .021, d_z = 0.45.", "d", "0.45", "d_z"),
    ("The groups differed, t(28) = 2.45, p = .021, Hedges' g = 0.87.", "g", "0.87", "Hedges' g"),
    ("Season mattered, F(1, 40) = 6.25, MSE = 1.2, ηp² = .14, p = .017.", "eta2_partial", ".14",
     "ηp²"),
    ("Season mattered, F(2, 40) = 6.25, p = .004, partial η2 = .24.", "eta2_partial", ".24",
     "partial η2"),
    ("Season mattered, F(2, 40) = 6.25, p = .004, η² = .11.", "eta2", ".11", "η²"),
    ("Model fit was good, R2 = .39, F(5, 611) = 78.92, p < .001.", "R2", ".39", "R2"),
    ("Colour mattered, χ2(1, N = 100) = 4.00, p = .046, φ = .20.", "phi", ".20", "φ"),
    ("Colour mattered, χ2(4, N = 100) = 16.00, p = .003, Cramér's V = .28.", "V", ".28",
     "Cramér's V"),
    ("The groups differed, t(28) = 2.45, p = .021, r = .42.", "r", ".42", "r"),
])
def test_printed_effect_sizes_are_read(sentence, measure, value, label):
    [claim] = find_claims(document_from_text(sentence))
    assert (claim.effect_printed.measure, claim.effect_printed.value,
            claim.effect_printed.label) == (measure, value, label)


@pytest.mark.parametrize("sentence", [
    "The groups differed, t(28) = 2.45, p = .021.",
    "Model fit was good, adjusted R2 = .52, F(5, 611) = 78.92, p < .001.",
    # the d belongs to the next result, after its own statistic
    "The groups differed, t(28) = 2.45, p = .021, and F(1, 30) = 4.40, p = .044, d = 0.77.",
])
def test_no_printed_effect_where_none_belongs_to_the_result(sentence):
    assert find_claims(document_from_text(sentence))[0].effect_printed is None


@pytest.mark.parametrize("sentence, sizes", [
    ("Treated (n = 12) and control (n = 18) voles differed, t(28) = 2.45, p = .021.", ("12", "18")),
    ("Voles differed, n1 = 14, n2 = 16, t(28) = 2.45, p = .021.", ("14", "16")),
    # sizes that do not add up to df + 2 are not these groups
    ("Treated (n = 12) and control (n = 20) voles differed, t(28) = 2.45, p = .021.", None),
    ("Of the voles (n = 30), the treated dug deeper, t(28) = 2.45, p = .021.", None),
])
def test_printed_group_sizes_are_read(sentence, sizes):
    [claim] = find_claims(document_from_text(sentence))
    assert claim.group_sizes == sizes
