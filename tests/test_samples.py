"""The bundled sample manuscripts raise exactly the flags planted in them.

`samples/expected-flags.toml` lists, for every invented manuscript in `samples/`, how many
results scrutiny must find, how many are consistent, inconsistent and unchecked, and every
flag each claim must raise. A claim that the file does not list must raise no flag.
"""

from __future__ import annotations

import re
from collections import Counter
from pathlib import Path

import pytest

import scrutiny
from scrutiny.check import REGISTRY

try:
    import tomllib
except ModuleNotFoundError:  # Python 3.10
    import tomli as tomllib

SAMPLES = Path(__file__).resolve().parent.parent / "samples"
EXPECTED = SAMPLES / "expected-flags.toml"
MANUSCRIPT_SUFFIXES = {".txt", ".md", ".docx"}

#: the checks the samples must exercise between them
PLANTED_CHECKS = {"p-mismatch", "decision-flip", "undeclared-one-sided", "one-sided",
                  "negligible-effect", "impossible-value", "p-zero", "effect-mismatch",
                  "grim", "grimmer", "percent-mismatch", "ci-p-mismatch",
                  "ci-estimate-mismatch", "coefficient-mismatch", "df-sample-mismatch"}
FAMILIES = {"t", "F", "chi2", "r", "z", "mean", "percent", "estimate"}
MINIMUM_RESULTS = 40


def _load() -> list[dict]:
    with EXPECTED.open("rb") as handle:
        return tomllib.load(handle)["sample"]


def _collapsed(text: str) -> str:
    return re.sub(r"\s+", " ", text).strip()


def _manuscripts() -> list[str]:
    return sorted(p.name for p in SAMPLES.iterdir()
                  if p.suffix in MANUSCRIPT_SUFFIXES and p.name != "README.md")


_EXPECTED = _load()


@pytest.fixture(scope="module")
def results() -> dict[str, scrutiny.DocumentResult]:
    return {entry["file"]: scrutiny.check_file(SAMPLES / entry["file"]) for entry in _EXPECTED}


def test_every_manuscript_is_listed_once():
    listed = [entry["file"] for entry in _EXPECTED]
    assert len(listed) == len(set(listed)), "a sample is listed twice"
    assert sorted(listed) == _manuscripts()


def test_expected_flags_name_registered_checks():
    for entry in _EXPECTED:
        for flag in entry.get("flag", []):
            assert flag["checks"], f"{entry['file']}: {flag['claim']!r} lists no checks"
            unknown = set(flag["checks"]) - set(REGISTRY)
            assert not unknown, f"{entry['file']}: unknown check ids {sorted(unknown)}"


@pytest.mark.parametrize("entry", _EXPECTED, ids=[e["file"] for e in _EXPECTED])
def test_sample_raises_exactly_the_planted_flags(entry, results):
    result = results[entry["file"]]
    assert result.readable, result.errors
    texts = [_collapsed(claim.claim.text) for claim in result.claims]

    expected: dict[int, Counter] = {}
    for flag in entry.get("flag", []):
        matches = [i for i, text in enumerate(texts) if text.startswith(flag["claim"])]
        assert len(matches) == 1, (
            f"{entry['file']}: {flag['claim']!r} matches {len(matches)} claims, not one; "
            f"claims found: {texts}")
        assert matches[0] not in expected, f"{entry['file']}: {flag['claim']!r} listed twice"
        expected[matches[0]] = Counter(flag["checks"])

    problems = []
    for index, claim in enumerate(result.claims):
        raised = Counter(flag.check for flag in claim.flags)
        wanted = expected.get(index, Counter())
        if raised != wanted:
            problems.append(f"{texts[index]!r}: raised {sorted(raised.elements())}, "
                            f"expected {sorted(wanted.elements())}")
    assert not problems, f"{entry['file']}:\n" + "\n".join(problems)


@pytest.mark.parametrize("entry", _EXPECTED, ids=[e["file"] for e in _EXPECTED])
def test_sample_result_and_status_counts(entry, results):
    result = results[entry["file"]]
    assert len(result.claims) == entry["results"], [_collapsed(c.claim.text) for c in result.claims]
    statuses = Counter(claim.status.value for claim in result.claims)
    assert dict(statuses) == {status: entry[status]
                              for status in ("consistent", "inconsistent", "unchecked")
                              if entry[status]}
    assert sum(entry[s] for s in ("consistent", "inconsistent", "unchecked")) == entry["results"]


def test_samples_cover_every_family_and_planted_check(results):
    claims = [claim for result in results.values() for claim in result.claims]
    assert len(claims) >= MINIMUM_RESULTS
    assert {claim.claim.test for claim in claims} >= FAMILIES
    chi_square = [claim.claim for claim in claims if claim.claim.test == "chi2"]
    assert any(c.n for c in chi_square) and any(not c.n for c in chi_square), \
        "chi-square results both with and without N"
    raised = {flag.check for claim in claims for flag in claim.flags}
    assert raised >= PLANTED_CHECKS, f"not raised: {sorted(PLANTED_CHECKS - raised)}"
    listed = {check for entry in _EXPECTED for flag in entry.get("flag", [])
              for check in flag["checks"]}
    assert listed >= PLANTED_CHECKS, f"not planted: {sorted(PLANTED_CHECKS - listed)}"
    statuses = {claim.status.value for claim in claims}
    assert statuses == {"consistent", "inconsistent", "unchecked"}
    # decision flips both ways: a printed significant p that is not, and the reverse
    alpha = scrutiny.Settings().alpha
    flipped = [claim.recomputed for claim in claims
               if any(flag.check == "decision-flip" for flag in claim.flags)]
    assert any(r.reported_p_interval.high < alpha <= r.p_interval.low for r in flipped)
    assert any(r.p_interval.high < alpha <= r.reported_p_interval.low for r in flipped)


def test_samples_readme_reports_no_results():
    # `scrutiny check samples/` reads the README as a manuscript too
    assert scrutiny.check_file(SAMPLES / "README.md").claims == ()
