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
interval printed inside a test result ("r = .19, 95% CI [-.11, .47], p = .21") or right after it
("t(58) = 2.10, p = .040, d = 0.54, 95% CI [0.02, 1.06]") belong to that result and are
attached to its Claim; the others become Claims of their own (test "mean", "percent" or
"estimate"). The N of the sample printed in a test result's sentence (or, if it is
the only one, its paragraph) is attached too, for the check of df against the sample size.

What decides whether the granularity tests may run is read here, conservatively, because a
wrong cue raises a false alarm:

* a count cue ("number of", "counts") is about a mean only in the mean's own clause, close to
  it; a scale
  cue ("7-point", "a scale from 1 to 5") also from the rest of its paragraph, and only for means
  its range can hold; a mean printed with a unit of measurement ("12.4 g", "21.3 years") is
  never taken for a mean of integer responses;
* the number after "±" is an SD unless the sentence speaks of a standard error or a confidence
  interval, or the document states "mean ± SEM" (or the like) as its convention anywhere;
* a mean of means, a weighted or adjusted mean, or a mean of ages is not read at all.
"""

from __future__ import annotations

import dataclasses
import sys
from bisect import bisect_right

import regex

from ..model import Claim, Descriptive, Document, Estimate, Proportion, PValue
from ..patterns import Library
from ..rounding import UnreadableNumber, parse_printed
from .context import PARAGRAPH_REACH, WHITESPACE, Boundaries, find_all, first, lowered_ascii
from .statistics import comparator

#: how far after an estimate its p-value may be printed
_P_WINDOW = 150
#: how far before a t or z its coefficient and SE may end ("b = 0.33, SE = 0.13, t(...)")
_COEFFICIENT_GAP = 40
RATIO_LABELS = frozenset({"OR", "aOR", "HR", "aHR", "RR", "aRR", "IRR", "aIRR", "PR", "aPR"})
#: what may stand between a coefficient (or an interval) and the test of it
_PUNCTUATION = r"[\s,;()\[\]]*"
_WALD = r"(?:(?:Wald|Wald's|Wald’s)\s*)?"
_SEPARATORS = regex.compile(_PUNCTUATION + _WALD)
#: ... and, between a coefficient and its t or z, its standardised version: "B = 0.34,
#: SE = 0.12, β = .23, t(120) = 2.80"
_STANDARDISED_BETWEEN = regex.compile(
    _PUNCTUATION + r"(?:(?:β|beta|standardi[sz]ed\s+β)\s*=\s*-?\d*\.?\d+" + _PUNCTUATION
    + r")?" + _WALD)
#: how far before (after) a mean a count cue may stand to be about it
_COUNT_CUE_BEFORE = 60
_COUNT_CUE_AFTER = 30
_CLAUSE_BREAK = regex.compile(r";|\b(?:but|whereas|while|although|though|unlike)\b")
#: numbers written as words in cue phrases ("a seven-point scale")
_WORD_NUMBERS = {"one": 1, "two": 2, "three": 3, "four": 4, "five": 5, "six": 6, "seven": 7,
                 "eight": 8, "nine": 9, "ten": 10, "eleven": 11, "twelve": 12, "fifteen": 15,
                 "twenty": 20}


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
        # for keyword-guided whole-text searches (find_all)
        self.lowered = lowered_ascii(self.text)

    def find_all(self, kind: str) -> list[regex.Match]:
        """Every match of `kind` in the text, searched only near the patterns' keywords."""
        return find_all(self.library, kind, self.text, self.lowered)

    def printed(self, match: regex.Match, group: str) -> str | None:
        if group not in match.re.groupindex or match.group(group) is None:
            return None  # the pattern has no such part, or this match left it out
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

    def pattern(self, kind: str, pattern_id: str) -> regex.Pattern:
        """One pattern of `kind`, for where the patterns of a kind say different things."""
        return next(p.compiled for p in self.library.of_kind(kind) if p.id == pattern_id)

    def paragraph(self, position: int) -> tuple[int, int]:
        """The paragraph at `position`, cut to PARAGRAPH_REACH either side: text without blank
        lines (hard-wrapped text, PDF text layers) is one "paragraph" from title to references."""
        start, end = self.boundaries.paragraph(position, len(self.text))
        return max(start, position - PARAGRAPH_REACH), min(end, position + PARAGRAPH_REACH)

    def nearby(self, kind: str, position: int) -> regex.Match | None:
        """The first match of `kind` in the sentence at `position`, else in its paragraph."""
        start, end = self.sentence(position)
        found = first(self.library.scanner(kind), self.text, start, end)
        if found is None:
            found = first(self.library.scanner(kind), self.text, *self.paragraph(position))
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

    def p_after(self, end: int, next_estimate: int) -> regex.Match | None:
        """A p-value printed after an estimate, before the next result, the next estimate
        (whose p it would be: "OR = 1.52 [...] and OR = 0.80 [...], p = .13") or the end of
        the sentence."""
        next_test = bisect_right(self.test_starts, end)
        limit = min(self.sentence(end)[1], end + _P_WINDOW, next_estimate,
                    self.test_starts[next_test] if next_test < len(self.test_starts) else
                    len(self.text))
        return first(self.library.scanner("p-value"), self.text, end, limit)


def _p_value(reader: _Reader, match: regex.Match | None) -> PValue | None:
    if match is None:
        return None
    return PValue(comparator=comparator(match.group("p_cmp")),
                  reported=reader.printed(match, "p_value") or "",
                  adjusted=match.group("p_adjust"))


def _number(printed: str | None) -> float | None:
    if printed is None:
        return None
    printed = printed.strip().lower()
    if printed in _WORD_NUMBERS:
        return float(_WORD_NUMBERS[printed])
    try:
        return float(printed.replace(" ", ""))
    except ValueError:
        return None


def _captured(match: regex.Match, group: str) -> bool:
    """Did the match take this named part (which some patterns of a kind do not have)?"""
    return group in match.re.groupindex and bool(match.captures(group))


def _scale_holds(cue: regex.Match, mean: float | None, items: float) -> bool:
    """Can a mean on the scale this cue describes take this value? A 7-point scale holds means
    up to 7 (up to 7 x items for sum scores), a scale from 1 to 5 means from 1 up; a cue whose
    scale cannot hold the mean is about another measure."""
    if mean is None:
        return False
    groups = cue.groupdict()
    high = _number(groups.get("points")) or _number(groups.get("scale_high"))
    low = _number(groups.get("scale_low"))
    if high is not None and mean > high * items:
        return False
    if low is not None and mean < low:
        return False
    return True


def _integer_cue(reader: _Reader, match: regex.Match, items: float) -> regex.Match | None:
    """The words that say this mean is of integer-valued data, if any (see the module notes)."""
    if _captured(match, "unit"):
        return None  # "12.4 g", "21.3 years": a measurement
    try:
        mean: float | None = parse_printed(match.group("mean")).value
    except UnreadableNumber:
        mean = None
    position = match.start()
    sentence = reader.sentence(position)
    scale = reader.pattern("integer-cue", "integer-scale")
    count = reader.pattern("integer-cue", "integer-count")
    found = [m for m in scale.finditer(reader.text, *sentence) if _scale_holds(m, mean, items)]
    found += [m for m in count.finditer(reader.text, *sentence) if _count_is_about(reader, m, match)]
    if not found:
        found = [m for m in scale.finditer(reader.text, *reader.paragraph(position))
                 if _scale_holds(m, mean, items)]
    if not found:
        return None
    return min(found, key=lambda m: abs(m.start() - position))


def _is_sum_score(cue: regex.Match | None, mean: str, items: float) -> bool:
    """A mean over several items above the top of the items' scale ("a 20-item questionnaire
    on a 4-point scale ... M = 41.37") is a mean of sum scores: each person's score is an
    integer, whatever the number of items."""
    if cue is None or items <= 1:
        return False
    groups = cue.groupdict()
    high = _number(groups.get("points")) or _number(groups.get("scale_high"))
    try:
        return high is not None and parse_printed(mean).value > high
    except UnreadableNumber:
        return False


def _count_is_about(reader: _Reader, cue: regex.Match, match: regex.Match) -> bool:
    """Is a count cue ("number of") about this mean? Only when it stands close before it
    ("the number of eggs was M = 4.20") or right after it ("2.35 on the count of seeds"), in
    the same clause: "the number of visits did not differ, but the index did (M = 3.48)" is
    about the visits."""
    if cue.end() <= match.start():
        between = reader.text[cue.end():match.start()]
        reach = _COUNT_CUE_BEFORE
    elif cue.start() >= match.end():
        between = reader.text[match.end():cue.start()]
        reach = _COUNT_CUE_AFTER
    else:
        return True
    return len(between) <= reach and _CLAUSE_BREAK.search(between) is None


def _not_a_raw_mean(reader: _Reader, position: int) -> bool:
    """A mean of means, a weighted, standardised or adjusted mean: no granularity to test."""
    if first(reader.library.scanner("weighted-cue"), reader.text, *reader.sentence(position)):
        return True
    return first(reader.pattern("weighted-cue", "not-a-raw-mean"), reader.text,
                 *reader.paragraph(position)) is not None


def _descriptives(reader: _Reader) -> list[Claim]:
    matches = [match for match in reader.find_all("descriptive")
               if not _inside_test_result(reader, match.start())
               and not _not_a_raw_mean(reader, match.start())]
    per_sentence: dict[int, int] = {}
    for match in matches:
        key = reader.sentence(match.start())[0]
        per_sentence[key] = per_sentence.get(key, 0) + 1
    # "Values are mean ± SEM": the convention of the whole document's ± values
    se_convention = bool(matches) and first(reader.pattern("se-cue", "standard-error-convention"),
                                            reader.text, 0, len(reader.text)) is not None
    stated_se = reader.pattern("se-cue", "standard-error-stated")
    sizes = [reader.pattern("total-sample", "group-sample"),
             reader.pattern("total-sample", "total-sample")]
    claims = []
    for match in matches:
        sd = reader.printed(match, "sd")
        sentence = reader.sentence(match.start())
        if _captured(match, "plus_minus") and (
                se_convention or first(stated_se, reader.text, *sentence)):
            sd = None  # "mean ± SE", or a CI's half-width: the number after ± is not an SD
        n = reader.printed(match, "n")
        if n is None and per_sentence[sentence[0]] == 1:
            found = [m for scanner in sizes for m in scanner.finditer(reader.text, *sentence)]
            if len(found) == 1:
                n = reader.printed(found[0], "size" if found[0].groupdict().get("size")
                                   else "total")
        items = reader.nearby("item-count", match.start())
        item_count = (_number(items.group("items")) or 1.0) if items is not None else 1.0
        cue = _integer_cue(reader, match, item_count)
        descriptive = Descriptive(
            mean=reader.printed(match, "mean") or "",
            sd=sd,
            n=n,
            items=items.group("items") if items is not None else None,
            integer_cue=WHITESPACE.sub(" ", cue.group()).strip() if cue is not None else None,
            sum_score=_is_sum_score(cue, match.group("mean"), item_count),
        )
        claims.append(reader.claim("mean", "descriptive", match, descriptive.mean, match.end(),
                                   descriptive=descriptive))
    return claims


def _inside_test_result(reader: _Reader, position: int) -> bool:
    index = reader.test_containing(position)
    return index is not None and position < reader.test_ends[index]


def _inside_other_result(reader: _Reader, position: int, index: int) -> bool:
    other = reader.test_containing(position)
    return other is not None and other != index and position < reader.test_ends[other]


def _proportions(reader: _Reader) -> list[Claim]:
    claims = []
    weighted = reader.pattern("weighted-cue", "weighted")
    for match in reader.find_all("proportion"):
        sentence = reader.sentence(match.start())
        proportion = Proportion(
            percent=reader.printed(match, "percent") or "",
            count=reader.printed(match, "count") or "",
            base=reader.printed(match, "base") or "",
            weighted=first(weighted, reader.text, *sentence) is not None,
        )
        claims.append(reader.claim("percent", "proportion", match, proportion.percent, match.end(),
                                   proportion=proportion))
    return claims


#: ratios named in words, by their usual abbreviation
_RATIO_WORDS = {"odds ratio": "OR", "hazard ratio": "HR", "risk ratio": "RR", "relative risk": "RR",
                "rate ratio": "IRR", "incidence rate ratio": "IRR", "prevalence ratio": "PR"}


def _label(printed: str) -> str:
    """The estimate's symbol: as printed, or the abbreviation of a ratio named in words
    ("adjusted odds ratio" -> "aOR")."""
    words = " ".join(printed.lower().split())
    adjusted = words.startswith("adjusted ")
    abbreviation = _RATIO_WORDS.get(words[len("adjusted "):] if adjusted else words)
    if abbreviation is None:
        return printed
    return "a" + abbreviation if adjusted else abbreviation


def _estimate(reader: _Reader, match: regex.Match, kind: str) -> Estimate:
    label = _label(match.group("label"))
    return Estimate(
        label=label,
        value=reader.printed(match, "value") or "",
        low=reader.printed(match, "low") if kind == "interval-estimate" else None,
        high=reader.printed(match, "high") if kind == "interval-estimate" else None,
        level=reader.printed(match, "level") if kind == "interval-estimate" else None,
        se=reader.printed(match, "se") if kind == "coefficient" else None,
        ratio=label in RATIO_LABELS,
    )


def _estimates(reader: _Reader) -> tuple[list[Claim], dict[int, Estimate]]:
    """Estimates of their own, and those that belong to a test result (by its index)."""
    claims: list[Claim] = []
    attached: dict[int, Estimate] = {}
    found = sorted(((match, kind) for kind in ("interval-estimate", "coefficient")
                    for match in reader.find_all(kind)),
                   key=lambda item: item[0].start())
    starts = [match.start() for match, _ in found]
    for match, kind in found:
        estimate = _estimate(reader, match, kind)
        owner = _owner(reader, match, kind)
        if owner is not None:
            if owner not in attached:
                attached[owner] = estimate
            continue
        following = bisect_right(starts, match.start())
        p_match = reader.p_after(match.end(), starts[following] if following < len(starts)
                                 else len(reader.text))
        end = p_match.end() if p_match is not None else match.end()
        claims.append(reader.claim("estimate", kind, match, estimate.value, end,
                                   p=_p_value(reader, p_match), estimate=estimate))
    return claims, attached


def _owner(reader: _Reader, match: regex.Match, kind: str) -> int | None:
    """The test result an estimate belongs to, if any."""
    # a coefficient and SE (or an estimate and its interval) printed right before the t or z
    # that tests it: "b = 0.33, SE = 0.13, t(...)", "OR = 2.31, 95% CI [1.20, 4.45], z = 2.50"
    index = bisect_right(reader.test_starts, match.end())
    between = _STANDARDISED_BETWEEN if kind == "coefficient" else _SEPARATORS
    if index < len(reader.tests) and reader.tests[index].test in ("t", "z") and \
            reader.test_starts[index] - match.end() <= _COEFFICIENT_GAP and \
            between.fullmatch(reader.text, match.end(), reader.test_starts[index]):
        return index
    if kind == "coefficient":
        return None
    # an interval inside a result as printed: "r = .19, 95% CI [-.11, .47], p = .21"
    index = reader.test_containing(match.start())
    if index is not None and match.start() < reader.test_ends[index]:
        return index
    # or right after it, as an effect size and its interval are printed after the p:
    # "t(58) = 2.10, p = .040, d = 0.54, 95% CI [0.02, 1.06]"
    if index is not None and reader.tests[index].test in ("t", "z", "r") and \
            _SEPARATORS.fullmatch(reader.text, reader.test_ends[index], match.start()):
        return index
    return None


def _sample_sizes(reader: _Reader) -> dict[int, str]:
    """The N of the whole sample printed with a t or r result with whole-number df, by the
    result's index: the only N of its sentence, or the only N of its paragraph when the
    paragraph reports no other t or r. Anything less plain (several N, several analyses, an N
    per group, trials or observations or a mixed model nearby, Satterthwaite df) is left alone,
    because a wrong N would raise a false alarm."""
    found = {}
    scanner = reader.pattern("total-sample", "total-sample")
    observations = reader.pattern("total-sample", "observations-not-sample")
    paragraph_results: dict[int, int] = {}
    for index, claim in enumerate(reader.tests):
        if claim.test in ("t", "r"):
            key = reader.boundaries.paragraph(reader.test_starts[index], len(reader.text))[0]
            paragraph_results[key] = paragraph_results.get(key, 0) + 1
    for index, claim in enumerate(reader.tests):
        if claim.test not in ("t", "r") or not claim.df or not claim.df[0].isdigit():
            continue
        position = reader.test_starts[index]
        sentence, paragraph = reader.sentence(position), reader.paragraph(position)
        if first(observations, reader.text, min(sentence[0], paragraph[0]),
                 max(sentence[1], paragraph[1])):
            continue  # trials, observations, a mixed model: the df need not count the N
        # an N printed inside another result of the sentence ("χ2(1, N = 80) = 4.10") is
        # that result's, and the sentence has said what its N are
        printed = list(scanner.finditer(reader.text, *sentence))
        mentions = [m for m in printed if not _inside_other_result(reader, m.start(), index)]
        if not printed:
            key = reader.boundaries.paragraph(position, len(reader.text))[0]
            if paragraph_results.get(key, 0) == 1:
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
        if index in samples:
            changes["sample_size"] = samples[index]
        updated.append(dataclasses.replace(claim, **changes) if changes else claim)
    return updated + _descriptives(reader) + _proportions(reader) + own_estimates
