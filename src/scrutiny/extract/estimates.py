"""Descriptive statistics, estimates with confidence intervals, coefficients with standard errors.

What is found (patterns in `patterns/estimates.toml`):

* means with SD and n ("M = 3.48, SD = 1.21, n = 49", "mean 4.2 (SD 1.1)", "4.2 ± 1.1"), with
  the words around them that say whether the measure is integer-valued ("7-point scale",
  "number of errors") and how many items a scale has ("a 10-item scale");
* percentages with their count and base ("45.3% (38/84)", "38 of 84 (45.2%)");
* estimates with a confidence interval ("OR = 1.52, 95% CI [1.10, 2.10]", "HR 0.71 (95% CI
  0.55 to 0.92; P = 0.009)") and their p-value;
* coefficients with a standard error ("b = 0.34, SE = 0.12, p = .005").

A coefficient printed right before a t or z ("b = 0.33, SE = 0.13, t(1893) = 2.53") and an
interval printed inside a test result's window ("r = .19, 95% CI [-.11, .47], p = .21") belong to
that result and are attached to its Claim; the others become Claims of their own (test "mean",
"percent" or "estimate"). The N of the sample printed in a test result's sentence (or, if it is
the only one, its paragraph) is attached too, for the check of df against the sample size.
"""

from __future__ import annotations

import dataclasses
import sys
from bisect import bisect_right

import regex

from ..model import Claim, Descriptive, Document, Estimate, Proportion, PValue
from ..patterns import Library
from .context import WHITESPACE, Boundaries, first
from .statistics import comparator

#: how far after an estimate its p-value may be printed
_P_WINDOW = 150
#: how far before a t or z its coefficient and SE may end ("b = 0.33, SE = 0.13, t(...)")
_COEFFICIENT_GAP = 40
_RATIO_LABELS = frozenset({"OR", "aOR", "HR", "aHR", "RR", "aRR", "IRR", "aIRR", "PR"})
#: what may stand between a coefficient (or an interval) and the test of it
_SEPARATORS = regex.compile(r"[\s,;()\[\]]*(?:(?:Wald|Wald's|Wald’s)\s*)?")


class _Reader:
    """Shared state for one document: its text, patterns, sentence map and the test results."""

    def __init__(self, document: Document, library: Library, boundaries: Boundaries,
                 tests: list[Claim]) -> None:
        self.document = document
        self.text = document.normalised
        self.library = library
        self.boundaries = boundaries
        self.tests = tests
        # test results by their start in the normalised text, for "which result is this in"
        self.test_starts = [document.normalised_offset(c.location.start) for c in tests]
        self.test_ends = [document.normalised_offset(c.location.end) for c in tests]

    def printed(self, match: regex.Match, group: str) -> str | None:
        if match.group(group) is None:
            return None
        start, end = match.span(group)
        return sys.intern(self.document.text[self.document.original_offset(start):
                                             self.document.original_offset(end)])

    def sentence(self, position: int) -> tuple[int, int]:
        return self.boundaries.sentence(position, len(self.text))

    def sentence_text(self, position: int) -> str:
        start, end = self.sentence(position)
        original = self.document.text[self.document.original_offset(start):
                                      self.document.original_offset(end)]
        return WHITESPACE.sub(" ", original).strip()

    def nearby(self, kind: str, position: int) -> regex.Match | None:
        """The first match of `kind` in the sentence at `position`, else in its paragraph."""
        start, end = self.sentence(position)
        found = first(self.library.scanner(kind), self.text, start, end)
        if found is None:
            start, end = self.boundaries.paragraph(position, len(self.text))
            found = first(self.library.scanner(kind), self.text, start, end)
        return found

    def test_containing(self, position: int) -> int | None:
        """The index of the test result whose span or following window holds `position`:
        the last result that starts before it in the same sentence."""
        index = bisect_right(self.test_starts, position) - 1
        if index < 0:
            return None
        if self.sentence(self.test_starts[index])[0] != self.sentence(position)[0]:
            return None
        return index

    def claim(self, test: str, kind: str, match: regex.Match, statistic: str, end: int,
              p: PValue | None = None, **parts) -> Claim:
        start_original = self.document.original_offset(match.start())
        end_original = self.document.original_offset(end)
        return Claim(
            test=test,
            df=(),
            statistic=statistic,
            statistic_comparator="=",
            p=p,
            location=self.document.location(start_original, end_original),
            text=self.document.text[start_original:end_original],
            sentence=self.sentence_text(match.start()),
            pattern=self.library.matched_pattern(kind, match).id,
            **parts,
        )

    def p_after(self, end: int) -> regex.Match | None:
        """A p-value printed after an estimate, before the next result or sentence end."""
        next_test = bisect_right(self.test_starts, end)
        limit = min(self.sentence(end)[1], end + _P_WINDOW,
                    self.test_starts[next_test] if next_test < len(self.test_starts) else
                    len(self.text))
        return first(self.library.scanner("p-value"), self.text, end, limit)


def _p_value(reader: _Reader, match: regex.Match | None) -> PValue | None:
    if match is None:
        return None
    return PValue(comparator=comparator(match.group("p_cmp")),
                  reported=reader.printed(match, "p_value") or "",
                  adjusted=match.group("p_adjust"))


def _descriptives(reader: _Reader) -> list[Claim]:
    matches = list(reader.library.scanner("descriptive").finditer(reader.text))
    per_sentence: dict[int, int] = {}
    for match in matches:
        key = reader.sentence(match.start())[0]
        per_sentence[key] = per_sentence.get(key, 0) + 1
    claims = []
    for match in matches:
        if reader.test_containing(match.start()) is not None and \
                match.start() < reader.test_ends[reader.test_containing(match.start())]:
            continue  # inside a test result as printed
        sd = reader.printed(match, "sd")
        pattern = reader.library.matched_pattern("descriptive", match)
        sentence = reader.sentence(match.start())
        if pattern.id == "mean-plus-minus" and first(reader.library.scanner("se-cue"),
                                                     reader.text, *sentence):
            sd = None  # "mean ± SE": the number after ± is not an SD
        n = reader.printed(match, "n")
        if n is None and per_sentence[sentence[0]] == 1:
            sizes = list(reader.library.scanner("group-size").finditer(reader.text, *sentence)) + \
                list(reader.library.scanner("total-sample").finditer(reader.text, *sentence))
            if len(sizes) == 1:
                n = reader.printed(sizes[0], "size" if "size" in sizes[0].groupdict() and
                                   sizes[0].group("size") else "total")
        cue = reader.nearby("integer-cue", match.start())
        items = reader.nearby("item-count", match.start())
        descriptive = Descriptive(
            mean=reader.printed(match, "mean") or "",
            sd=sd,
            n=n,
            items=items.group("items") if items is not None else None,
            integer_cue=WHITESPACE.sub(" ", cue.group()).strip() if cue is not None else None,
        )
        claims.append(reader.claim("mean", "descriptive", match, descriptive.mean, match.end(),
                                   descriptive=descriptive))
    return claims


def _proportions(reader: _Reader) -> list[Claim]:
    claims = []
    for match in reader.library.scanner("proportion").finditer(reader.text):
        sentence = reader.sentence(match.start())
        proportion = Proportion(
            percent=reader.printed(match, "percent") or "",
            count=reader.printed(match, "count") or "",
            base=reader.printed(match, "base") or "",
            weighted=first(reader.library.scanner("weighted-cue"), reader.text, *sentence)
            is not None,
        )
        claims.append(reader.claim("percent", "proportion", match, proportion.percent, match.end(),
                                   proportion=proportion))
    return claims


def _estimate(reader: _Reader, match: regex.Match, kind: str) -> Estimate:
    label = match.group("label")
    return Estimate(
        label=label,
        value=reader.printed(match, "value") or "",
        low=reader.printed(match, "low") if kind == "interval-estimate" else None,
        high=reader.printed(match, "high") if kind == "interval-estimate" else None,
        level=reader.printed(match, "level") if kind == "interval-estimate" else None,
        se=reader.printed(match, "se") if kind == "coefficient" else None,
        ratio=label in _RATIO_LABELS,
    )


def _estimates(reader: _Reader) -> tuple[list[Claim], dict[int, Estimate]]:
    """Estimates of their own, and those that belong to a test result (by its index)."""
    claims: list[Claim] = []
    attached: dict[int, Estimate] = {}
    for kind in ("interval-estimate", "coefficient"):
        for match in reader.library.scanner(kind).finditer(reader.text):
            estimate = _estimate(reader, match, kind)
            owner = _owner(reader, match, kind)
            if owner is not None:
                if owner not in attached:
                    attached[owner] = estimate
                continue
            p_match = reader.p_after(match.end())
            end = p_match.end() if p_match is not None else match.end()
            claims.append(reader.claim("estimate", kind, match, estimate.value, end,
                                       p=_p_value(reader, p_match), estimate=estimate))
    return claims, attached


def _owner(reader: _Reader, match: regex.Match, kind: str) -> int | None:
    """The test result an estimate belongs to, if any."""
    # a coefficient and SE (or an estimate and its interval) printed right before the t or z
    # that tests it: "b = 0.33, SE = 0.13, t(...)", "OR = 2.31, 95% CI [1.20, 4.45], z = 2.50"
    index = bisect_right(reader.test_starts, match.end())
    if index < len(reader.tests) and reader.tests[index].test in ("t", "z") and \
            reader.test_starts[index] - match.end() <= _COEFFICIENT_GAP and \
            _SEPARATORS.fullmatch(reader.text, match.end(), reader.test_starts[index]):
        return index
    if kind == "coefficient":
        return None
    # an interval inside a result as printed: "r = .19, 95% CI [-.11, .47], p = .21"
    index = reader.test_containing(match.start())
    if index is not None and match.start() < reader.test_ends[index]:
        return index
    return None


def _sample_sizes(reader: _Reader) -> dict[int, str]:
    """The N of the whole sample printed with a t or r result with whole-number df, by the
    result's index: the only N of its sentence, or the only N of its paragraph when the
    paragraph reports no other t or r. Anything less plain (several N, several analyses,
    Satterthwaite df of a mixed model that counts observations, not participants) is left
    alone, because a wrong N would raise a false alarm."""
    found = {}
    scanner = reader.library.scanner("total-sample")
    paragraph_results: dict[int, int] = {}
    for index, claim in enumerate(reader.tests):
        if claim.test in ("t", "r"):
            key = reader.boundaries.paragraph(reader.test_starts[index], len(reader.text))[0]
            paragraph_results[key] = paragraph_results.get(key, 0) + 1
    for index, claim in enumerate(reader.tests):
        if claim.test not in ("t", "r") or not claim.df or not claim.df[0].isdigit():
            continue
        position = reader.test_starts[index]
        mentions = list(scanner.finditer(reader.text, *reader.sentence(position)))
        if not mentions:
            paragraph = reader.boundaries.paragraph(position, len(reader.text))
            if paragraph_results.get(paragraph[0], 0) == 1:
                mentions = list(scanner.finditer(reader.text, *paragraph))
        if len(mentions) == 1:
            found[index] = reader.printed(mentions[0], "total")
    return found


def with_estimates(document: Document, library: Library, boundaries: Boundaries,
                   tests: list[Claim]) -> list[Claim]:
    """The test results, with what belongs to them attached, and every other claim."""
    reader = _Reader(document, library, boundaries, tests)
    own_estimates, attached = _estimates(reader)
    samples = _sample_sizes(reader)
    updated = []
    for index, claim in enumerate(tests):
        changes = {}
        if index in attached:
            changes["estimate"] = attached[index]
        if index in samples and claim.n is None:
            changes["sample_size"] = samples[index]
        updated.append(dataclasses.replace(claim, **changes) if changes else claim)
    return updated + _descriptives(reader) + _proportions(reader) + own_estimates
