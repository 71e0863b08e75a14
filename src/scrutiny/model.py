"""The records every pipeline stage shares.

Data flows one way: ingest makes a `Document`, extract finds `Claim`s in it, recompute turns a
Claim into a `Recomputed`, the checks turn both into `Flag`s, and the results are gathered in a
`ClaimResult` per Claim and a `DocumentResult` per input. All records are frozen: a stage never
changes what an earlier stage produced.
"""

from __future__ import annotations

import enum
from bisect import bisect_right
from dataclasses import dataclass, field
from typing import Mapping, Protocol


class Severity(enum.IntEnum):
    """Levels of the SARIF standard; a larger value is more serious."""

    NOTE = 1
    WARNING = 2
    ERROR = 3

    @property
    def label(self) -> str:
        return self.name.lower()

    @classmethod
    def from_label(cls, label: str) -> "Severity":
        try:
            return cls[label.strip().upper()]
        except KeyError:
            choices = ", ".join(s.label for s in cls)
            raise ValueError(f"unknown severity {label!r} (choose from {choices})") from None


class Status(str, enum.Enum):
    """Verdict on one Claim."""

    CONSISTENT = "consistent"
    INCONSISTENT = "inconsistent"
    UNCHECKED = "unchecked"


#: Test families the extractor knows; the keys are the JSON contract's `test` values.
TEST_FAMILIES = ("t", "F", "chi2", "r", "z")
#: Other kinds of claim: descriptive statistics and estimates.
OTHER_KINDS = ("mean", "percent", "estimate")


@dataclass(frozen=True, slots=True)
class Box:
    """A rectangle on a PDF page, in PDF points from the page's top-left corner."""

    page: int
    x0: float
    top: float
    x1: float
    bottom: float


@dataclass(frozen=True, slots=True)
class Location:
    """Where a Claim is printed.

    `start`/`end` are character offsets into the Document's `text` (the text as decoded from
    the file, or as a reader extracted it from a PDF, Word, LaTeX or markup file, before any
    normalisation); `line` is 1-based: per page for PDFs, per source file for text, LaTeX,
    HTML and JATS, within the paragraph or table cell for Word; `page` is 1-based or None for
    formats without pages. The other fields say more where the format has it: the LaTeX `file` (after
    `\\input`), the `section` title (LaTeX, Word, HTML, JATS), the `paragraph` number (Word, HTML, JATS), the
    table `cell` ("table 2, row 3, column 1") and the `boxes` the claim covers on a PDF page.
    """

    start: int
    end: int
    line: int
    page: int | None = None
    file: str | None = None
    section: str | None = None
    paragraph: int | None = None
    cell: str | None = None
    boxes: tuple[Box, ...] = ()


@dataclass(frozen=True, slots=True)
class Segment:
    """A stretch of a Document's text that comes from one place in the source.

    A reader cuts its text into segments at every change of page, file, section, paragraph
    or table cell; `start` is the segment's first offset in the Document's `text` and `line`
    the source line number of its first line (1 for a new page, a new file or a paragraph).
    """

    start: int
    line: int = 1
    page: int | None = None
    file: str | None = None
    section: str | None = None
    paragraph: int | None = None
    cell: str | None = None


class Geometry(Protocol):
    """Where the characters of a PDF's text sit on their pages (a PDF reader provides one).

    Implementations may keep the PDF open and look characters up only when asked, since only
    the spans of claims ever need boxes.
    """

    def boxes(self, start: int, end: int) -> tuple[Box, ...]:
        """One box per printed line that the span [start, end) of the Document's text covers."""
        ...


@dataclass(frozen=True, slots=True)
class Document:
    """One input after ingest.

    `text` is the text as decoded from the file (or extracted from it); `normalised` is the same
    text after the normalisation that extraction relies on (Unicode NFKC, dashes to "-", ...).
    `offset_map` maps an offset in `normalised` back to an offset in `text` and knows where in
    the source each offset of `text` comes from.
    """

    path: str
    format: str
    text: str
    normalised: str
    offset_map: "OffsetMap"
    encoding: str | None = None
    pages: int | None = None
    #: what the reader noticed and repaired or could not ("running heads removed", ...)
    notes: tuple[str, ...] = ()

    def original_offset(self, normalised_offset: int) -> int:
        return self.offset_map.to_original(normalised_offset)

    def normalised_offset(self, original_offset: int) -> int:
        return self.offset_map.to_normalised(original_offset)

    def location(self, start: int, end: int) -> Location:
        """Location of the original span [start, end)."""
        return self.offset_map.location(start, end)


class OffsetMap:
    """Maps offsets in a normalised text back to the decoded text and gives locations.

    Normalisation mostly replaces one character by one character, so the map is stored as a
    short list of breakpoints `(normalised_offset, original_offset)` where the two texts shift
    against each other; between breakpoints the offsets move together. `segments` (sorted by
    start) say where in the source each stretch of the text comes from; `geometry`, for PDFs,
    where each character sits on its page.
    """

    __slots__ = ("_norm_points", "_orig_points", "_line_starts", "_segments", "_segment_starts",
                 "_geometry")

    def __init__(
        self,
        breakpoints: list[tuple[int, int]],
        line_starts: list[int],
        segments: tuple[Segment, ...] = (),
        geometry: Geometry | None = None,
    ) -> None:
        if not breakpoints or breakpoints[0] != (0, 0):
            breakpoints = [(0, 0), *breakpoints]
        self._norm_points = [b[0] for b in breakpoints]
        self._orig_points = [b[1] for b in breakpoints]
        self._line_starts = line_starts
        self._segments = segments or (Segment(0),)
        self._segment_starts = [segment.start for segment in self._segments]
        self._geometry = geometry

    @property
    def segments(self) -> tuple[Segment, ...]:
        """Where each stretch of the text comes from, in order of their starts."""
        return self._segments

    def to_original(self, normalised_offset: int) -> int:
        if len(self._norm_points) == 1:  # normalisation changed no lengths: offsets agree
            return normalised_offset
        i = bisect_right(self._norm_points, normalised_offset) - 1
        return self._orig_points[i] + (normalised_offset - self._norm_points[i])

    def to_normalised(self, original_offset: int) -> int:
        """The normalised offset of an original offset (the first one that maps to it)."""
        if len(self._norm_points) == 1:
            return original_offset
        i = bisect_right(self._orig_points, original_offset) - 1
        return self._norm_points[i] + (original_offset - self._orig_points[i])

    def location(self, start: int, end: int) -> Location:
        segment = self._segments[bisect_right(self._segment_starts, start) - 1]
        lines_before = (bisect_right(self._line_starts, start)
                        - bisect_right(self._line_starts, segment.start))
        return Location(
            start=start, end=end, line=segment.line + lines_before, page=segment.page,
            file=segment.file, section=segment.section, paragraph=segment.paragraph,
            cell=segment.cell,
            boxes=self._geometry.boxes(start, end) if self._geometry is not None else (),
        )


@dataclass(frozen=True, slots=True)
class PValue:
    """A p-value as printed.

    `comparator` is one of "=", "<", ">", "<=", ">=" or "ns" (printed as "ns"/"n.s.", meaning
    not significant at the paper's alpha). `reported` is the number exactly as printed (empty
    for "ns"). `adjusted` names the printed label of a multiplicity adjustment ("adj",
    "Bonferroni", ...) when the p-value carries one.
    """

    comparator: str
    reported: str
    adjusted: str | None = None


@dataclass(frozen=True, slots=True)
class PrintedEffect:
    """An effect size printed with a result ("d = 0.93"), exactly as printed.

    `measure` is what it is: "d", "g", "eta2", "eta2_partial", "r", "R2", "phi" or "V";
    `label` the symbol as printed ("Cohen's d", "ηp²") and `value` the number as printed.
    """

    measure: str
    value: str
    label: str


@dataclass(frozen=True, slots=True)
class Descriptive:
    """A mean printed with its SD and group size ("M = 3.48, SD = 1.21, n = 49"), as printed.

    `integer_cue` holds the words that say the measure is integer-valued ("7-point scale",
    "number of errors"), `items` the number of items of a scale when printed; both decide
    whether the granularity tests (GRIM, GRIMMER) apply. `sum_score` is true when the mean
    of a several-item scale lies above the top of one item: a mean of sum scores, whose
    granularity is 1/n rather than 1/(n x items).
    """

    mean: str
    sd: str | None = None
    n: str | None = None
    items: str | None = None
    integer_cue: str | None = None
    sum_score: bool = False


@dataclass(frozen=True, slots=True)
class Proportion:
    """A percentage printed with its count and base ("45.3% (38/84)"), as printed."""

    percent: str
    count: str
    base: str
    weighted: bool = False


@dataclass(frozen=True, slots=True)
class Estimate:
    """An estimate printed with a confidence interval or a standard error, as printed.

    `label` is the symbol ("OR", "HR", "d", "B", "b", "β"; a ratio named in words is given by
    its abbreviation: "adjusted odds ratio" is "aOR"); `ratio` is True for odds, risk,
    hazard and rate ratios, whose intervals are symmetric on the log scale; `level` is the
    confidence level printed ("95").
    """

    label: str
    value: str
    low: str | None = None
    high: str | None = None
    level: str | None = None
    se: str | None = None
    ratio: bool = False


@dataclass(frozen=True, slots=True)
class Claim:
    """One reported result, exactly as the text prints it.

    `test` is a test family ("t", "F", "chi2", "r", "z") or another kind of claim: "mean" (a
    mean with SD and n, in `descriptive`), "percent" (a percentage with its count and base, in
    `proportion`) or "estimate" (an estimate with a confidence interval or a standard error,
    in `estimate`); `statistic` then holds the mean, the percentage or the estimate.
    Numbers stay strings so that their rounding can be reasoned about: "2.450" and "2.45" are
    different claims. `statistic_comparator` is "=" for a result and "<", ">", "<=", ">=" for a
    bound ("F < 1", "all ts(171) >= 3.19"). `tails_stated` is "one" or "two" when the sentence
    or its paragraph says so, else None.
    """

    test: str
    df: tuple[str, ...]
    statistic: str
    statistic_comparator: str
    p: PValue | None
    location: Location
    text: str
    sentence: str
    n: str | None = None
    tails_stated: str | None = None
    #: "within" (one sample, paired, repeated measures) or "between" (independent groups) when
    #: the words around a t test say so, else None
    design_stated: str | None = None
    #: the sizes of two groups printed in the sentence ("n1 = 24, n2 = 26") when they add up
    #: to the df of a two-group t test (df + 2)
    group_sizes: tuple[str, str] | None = None
    #: an effect size printed with the result, if any
    effect_printed: PrintedEffect | None = None
    #: the printed parts of claims that are not test statistics (test "mean", "percent",
    #: "estimate"), and a coefficient and its SE printed before a t or z
    descriptive: Descriptive | None = None
    proportion: Proportion | None = None
    estimate: Estimate | None = None
    #: N printed for the sample in the sentence (or paragraph) of a test result
    sample_size: str | None = None
    aggregate: bool = False
    #: which pattern in patterns/ found the statistic (for debugging and pattern tests)
    pattern: str = ""


@dataclass(frozen=True, slots=True)
class Interval:
    """A closed interval [low, high] of real numbers."""

    low: float
    high: float

    def __post_init__(self) -> None:
        if self.low > self.high:
            raise ValueError(f"empty interval [{self.low}, {self.high}]")

    def contains(self, value: float) -> bool:
        return self.low <= value <= self.high


@dataclass(frozen=True, slots=True)
class Effect:
    """An effect size implied by a Claim, with the assumption it rests on.

    `measure` is "d", "d_z", "r", "eta2_partial" or "w"; `low`/`high` bound its `confidence`
    interval. For a significant result `low90`/`high90` bound its 90% interval (the one an
    equivalence test at .05 uses); for a non-significant one `detectable` is the effect the
    design detects with 80% power at the chosen alpha (its sensitivity).
    """

    measure: str
    value: float
    assumption: str
    n: float | None = None
    low: float | None = None
    high: float | None = None
    confidence: float | None = None
    low90: float | None = None
    high90: float | None = None
    detectable: float | None = None


@dataclass(frozen=True, slots=True)
class Evidence:
    """How strongly a result speaks for or against its point null hypothesis.

    `bf01` is the Bayes factor for the null over the alternative by `method` ("jzs": the
    default Bayes factor of Rouder et al. 2009 with a Cauchy prior of scale `prior_scale`;
    "bic": the unit-information approximation), None where it cannot be computed (`reason`
    says why). `min_bf01` is the Sellke-Bayarri-Berger bound from the recomputed p alone;
    `posterior_null` and `min_posterior_null` are the posterior probabilities of the null they
    imply with prior probability `prior_null`.
    """

    min_bf01: float | None
    min_posterior_null: float | None
    prior_null: float
    bf01: float | None = None
    method: str | None = None
    prior_scale: float | None = None
    posterior_null: float | None = None
    assumption: str | None = None
    reason: str | None = None


@dataclass(frozen=True, slots=True)
class Granularity:
    """The outcome of a granularity test: possible or not, or not testable (with why)."""

    testable: bool
    consistent: bool | None
    reason: str = ""
    #: a witness: an integer total (GRIM) or (total, sum of squares) (GRIMMER) that works
    witness: tuple[int, ...] | None = None


@dataclass(frozen=True, slots=True)
class IntervalFacts:
    """What an estimate and its interval imply."""

    p: Interval                     # p-values the printed numbers allow
    statistic: Interval             # |estimate| / SE over the rounding box (normal scale)
    excludes_null: bool | None      # True / False; None when the rounding leaves it open
    centre_offset: float            # how far the estimate sits from the interval's middle,
                                    # in units of the width's rounding slack (<= 1 is fine)
    ratio: bool


@dataclass(frozen=True, slots=True)
class Recomputed:
    """Numbers derived from a Claim; no text, no judgement.

    `p` is the p-value of the printed statistic taken at face value (two-sided for t, z and r,
    upper tail for F and chi-square); `p_interval` is the range of p-values over every
    statistic that rounds to the printed one (or satisfies the printed bound);
    `p_interval_one_sided` is the same for a one-sided test of t, z or r (None otherwise).
    `reported_p_interval` is the range of p-values the printed p stands for. `reason` says why
    nothing could be recomputed.
    """

    p: float | None = None
    p_interval: Interval | None = None
    #: the test is two-sided (t, z, r), so that a one-sided reading halves its p
    two_sided: bool = False
    statistic_interval: Interval | None = None
    reported_p_interval: Interval | None = None
    df: tuple[float, ...] = ()
    n: float | None = None
    effect: Effect | None = None
    evidence: Evidence | None = None
    #: the values (absolute) the printed effect size may take given the printed statistic;
    #: None when no effect is printed or the result does not determine it
    effect_printed_ranges: tuple[Interval, ...] | None = None
    #: means and percentages: the granularity tests (see recompute.granularity)
    grim: Granularity | None = None
    grimmer: Granularity | None = None
    percentage: Granularity | None = None
    #: estimates with a confidence interval: what the interval implies
    interval_facts: IntervalFacts | None = None
    #: a coefficient and its SE: |b| / SE over their rounding
    coefficient_statistic: Interval | None = None
    reason: str | None = None

    @property
    def p_interval_one_sided(self) -> Interval | None:
        """The p interval of a one-sided test: half the two-sided one (t, z and r only)."""
        if not self.two_sided or self.p_interval is None:
            return None
        return Interval(self.p_interval.low / 2.0, self.p_interval.high / 2.0)


@dataclass(frozen=True, slots=True)
class Flag:
    """One problem a check found."""

    check: str
    severity: Severity
    message: str
    details: Mapping[str, float | str | None] = field(default_factory=dict, hash=False)


@dataclass(frozen=True, slots=True)
class ClaimResult:
    """A Claim with everything the later stages found about it."""

    id: str
    claim: Claim
    recomputed: Recomputed
    flags: tuple[Flag, ...]
    status: Status
    reason: str | None = None


@dataclass(frozen=True, slots=True)
class DocumentResult:
    """Everything found in one input, or why it could not be read."""

    path: str
    format: str | None
    claims: tuple[ClaimResult, ...] = ()
    errors: tuple[str, ...] = ()
    encoding: str | None = None
    pages: int | None = None
    #: what the reader noticed, repaired or could not read ("running heads removed", ...)
    notes: tuple[str, ...] = ()

    @property
    def readable(self) -> bool:
        return not self.errors


@dataclass(frozen=True, slots=True)
class Settings:
    """Everything a user can tune; one frozen object passed to every stage that needs it.

    The smallest effect sizes of interest default to Cohen's (1988) "small" conventions:
    d = 0.2, r = 0.1, partial eta squared = 0.01, w = 0.1.
    """

    alpha: float = 0.05
    sesoi_d: float = 0.2
    sesoi_r: float = 0.1
    sesoi_eta2: float = 0.01
    sesoi_w: float = 0.1
    #: treat every mean as a mean of integer responses (GRIM, GRIMMER) even where the text
    #: does not say so
    integer_scales: bool = False
    #: Bayesian evidence: Cauchy prior scale on the standardised effect, prior P(H0)
    prior_scale: float = 0.7071067811865476
    prior_null: float = 0.5
    #: confidence level of the effect-size intervals
    confidence: float = 0.95
    #: ceilings for reading and checking one PDF, Word or markup file (seconds, megabytes)
    time_limit: float = 120.0
    memory_limit_mb: int = 2048

    def __post_init__(self) -> None:
        if not 0.0 < self.alpha < 1.0:
            raise ValueError(f"alpha must lie strictly between 0 and 1, got {self.alpha}")
        if self.prior_scale <= 0:
            raise ValueError(f"the prior scale must be positive, got {self.prior_scale}")
        if not 0.0 < self.prior_null < 1.0:
            raise ValueError(f"the prior probability of the null must lie strictly between 0 "
                             f"and 1, got {self.prior_null}")
        if not 0.0 < self.confidence < 1.0:
            raise ValueError(f"the confidence level must lie strictly between 0 and 1, got "
                             f"{self.confidence}")
        if self.time_limit <= 0 or self.memory_limit_mb <= 0:
            raise ValueError("the time and memory ceilings must be positive")
        for name in ("sesoi_d", "sesoi_r", "sesoi_eta2", "sesoi_w"):
            if getattr(self, name) <= 0:
                raise ValueError(f"{name} must be positive, got {getattr(self, name)}")

    def as_dict(self) -> dict[str, object]:
        return {
            "alpha": self.alpha,
            "sesoi": {
                "d": self.sesoi_d,
                "r": self.sesoi_r,
                "eta2_partial": self.sesoi_eta2,
                "w": self.sesoi_w,
            },
            "integer_scales": self.integer_scales,
            "prior_scale": self.prior_scale,
            "prior_null": self.prior_null,
            "confidence": self.confidence,
            "time_limit": self.time_limit,
            "memory_limit_mb": self.memory_limit_mb,
        }


@dataclass(frozen=True, slots=True)
class Skipped:
    """A file found while searching a folder that is not checked on its own, and why."""

    path: str
    reason: str  # "hidden", "not a manuscript format", "part of <main file>"


@dataclass(frozen=True, slots=True)
class Run:
    """The result of checking one or more inputs with one set of Settings."""

    settings: Settings
    documents: tuple[DocumentResult, ...]
    #: files found while searching folders and not checked on their own, each with the reason
    skipped: tuple[Skipped, ...] = ()
