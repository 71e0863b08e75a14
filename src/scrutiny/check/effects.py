"""Checks on what a result implies beyond its p-value: its effect size and its evidence."""

from __future__ import annotations

from typing import Iterator

from ..model import TEST_FAMILIES, Claim, Effect, Interval, Recomputed, Settings, Severity
from ..numbers import format_count, format_p
from ..rounding import UnreadableNumber, intervals_meet, parse_printed
from . import Context, Finding, check
from .consistency import describe_statistic

LABELS = {"d": "d", "d_z": "d_z", "r": "r", "eta2_partial": "partial η2", "w": "w"}


def smallest_effect_of_interest(measure: str, settings: Settings) -> float:
    return {"d": settings.sesoi_d, "d_z": settings.sesoi_d, "r": settings.sesoi_r,
            "eta2_partial": settings.sesoi_eta2, "w": settings.sesoi_w}[measure]


def _interval_text(low: float | None, high: float | None) -> str:
    return f"[{low:.3f}, {high:.3f}]" if low is not None and high is not None else "[-]"


def _equivalent_to_zero(effect: Effect, threshold: float) -> bool:
    """Two one-sided tests at .05: the 90% interval lies inside (-threshold, threshold)."""
    return (effect.low90 is not None and effect.high90 is not None
            and -threshold < effect.low90 and effect.high90 < threshold)


@check("negligible-effect", Severity.WARNING,
       "Significant, but the implied effect is below the smallest effect of interest",
       applies_to=TEST_FAMILIES)
def negligible_effect(claim: Claim, recomputed: Recomputed, context: Context,
                      settings: Settings) -> Iterator[Finding]:
    """A significant result whose implied effect size is negligible.

    With enough data any non-zero difference gets a small p: at n = 10,000 per group a
    difference of d = 0.04 is significant at .05. So a small p says little about whether an
    effect matters. The effect implied by the statistic and its df is computed (d = 2t/sqrt(N)
    for two equal groups or d_z = t/sqrt(n) for paired data, r, partial eta squared =
    F df1 / (F df1 + df2), Cohen's w = sqrt(chi2 / N); Lakens 2013) with its 90% confidence
    interval, and compared with the smallest effect size of interest (SESOI), by default
    Cohen's (1988) "small" conventions (d = 0.2, r = 0.1, partial eta squared = 0.01,
    w = 0.1; change them with --sesoi). When the whole 90% interval lies inside the SESOI,
    two one-sided tests at .05 reject every effect as large as the SESOI: the result is
    significant and yet practically equivalent to zero (Lakens 2017, Social Psychological and
    Personality Science 8, 355-362). When only the point estimate lies below the SESOI, the
    message says that the interval is too wide to rule out a relevant effect. The design
    behind a t test is read from the text and stated; when none is stated, two equal
    independent groups are assumed.
    """
    effect = recomputed.effect
    if effect is None or recomputed.p is None or recomputed.p >= settings.alpha:
        return
    threshold = smallest_effect_of_interest(effect.measure, settings)
    if abs(effect.value) >= threshold:
        return
    label = LABELS[effect.measure]
    size = f"n = {format_count(effect.n)}" if effect.n else "its sample size"
    interval = _interval_text(effect.low90, effect.high90)
    equivalent = _equivalent_to_zero(effect, threshold)
    if equivalent:
        verdict = (f"Its whole 90% interval {interval} lies within ±{threshold:g}: the result "
                   f"is practically equivalent to zero (two one-sided tests). It is significant "
                   f"only because {size} is large: with enough data any non-zero difference "
                   f"gets a small p.")
    else:
        verdict = (f"Its 90% interval {interval} is too wide to rule out an effect of "
                   f"±{threshold:g}, so the size of the effect is not known well enough to call "
                   f"it negligible or relevant.")
    yield Finding(
        f"{describe_statistic(claim)} is significant (p = {format_p(recomputed.p)}), but the "
        f"implied effect {label} = {effect.value:.3f} is below the smallest effect of "
        f"interest, {label} = {threshold:g} ({effect.assumption}). {verdict}",
        {"effect": effect.value, "low90": effect.low90, "high90": effect.high90,
         "threshold": threshold, "n": effect.n,
         "equivalent_to_zero": "yes" if equivalent else "no"},
    )


@check("evidence-favours-null", Severity.WARNING,
       "Significant, yet the Bayes factor favours the null hypothesis",
       applies_to=TEST_FAMILIES)
def evidence_favours_null(claim: Claim, recomputed: Recomputed, context: Context,
                          settings: Settings) -> Iterator[Finding]:
    """A result significant at alpha whose Bayes factor favours the point null (BF01 > 1).

    A p-value is not a measure of support for the null or the alternative: with a large
    sample a small p can come with data that are more likely under "no effect" than under a
    reasonable alternative - Lindley's (1957, Biometrika 44, 187-192) paradox. The Bayes
    factor is the default JZS Bayes factor for t results (Rouder et al. 2009, Psychonomic
    Bulletin & Review 16, 225-237; Cauchy prior scale set with --prior-scale, default
    sqrt(2)/2; F(1, df) and r through their t; Wetzels & Wagenmakers 2012 for r) and the
    unit-information (BIC) approximation for z and chi-square with N (Kass & Raftery 1995;
    Wagenmakers 2007). The BIC approximation is used here only for one-df tests: with several
    df its prior, one observation's worth of information per parameter, favours the null so
    strongly that the flag would mislead. The message gives n, p, BF01 and the posterior
    probability of the null with the prior probability set by --prior-null (default 1/2).
    Other priors give other numbers; the flag says that the significance should not be read
    as strong evidence.
    """
    evidence = recomputed.evidence
    if (evidence is None or evidence.bf01 is None or recomputed.p is None
            or recomputed.p >= settings.alpha or evidence.bf01 <= 1.0):
        return
    if evidence.method == "bic" and claim.test == "chi2" and recomputed.df[0] > 1:
        return
    n = recomputed.effect.n if recomputed.effect is not None else recomputed.n
    size = f"with n = {format_count(n)}, " if n else ""
    yield Finding(
        f"{describe_statistic(claim)} is significant (p = {format_p(recomputed.p)}), yet "
        f"{size}the data are {evidence.bf01:.2f} times as likely under no effect as under the "
        f"alternative (BF01 = {evidence.bf01:.2f}, {evidence.method}; {evidence.assumption}); "
        f"with a prior probability of {evidence.prior_null:g} for the null, its posterior "
        f"probability is {evidence.posterior_null:.2f}. A small p with a large sample is not "
        f"strong evidence against the null.",
        {"bf01": evidence.bf01, "posterior_null": evidence.posterior_null, "p": recomputed.p,
         "n": n},
    )


@check("effect-mismatch", Severity.WARNING,
       "A printed effect size cannot come from the printed statistic",
       applies_to=TEST_FAMILIES, marks_inconsistent=True)
def effect_mismatch(claim: Claim, recomputed: Recomputed, context: Context,
                    settings: Settings) -> Iterator[Finding]:
    """An effect size printed with a result that no rounding of the statistic implies.

    The effect is recomputed from the printed statistic and df (Lakens 2013, Frontiers in
    Psychology 4, 863; Cohen 1988; Rosenthal 1994): d or g from t, r from t or z, partial eta
    squared and R squared from F, phi and Cramer's V from chi-square with N. Both numbers are
    read with the rounding rule, and where conventions differ (d of paired data, d of groups of
    unknown size, g with or without Hedges' correction, the table size behind V) every common
    convention is allowed, so that only a number none produces is flagged. Eta squared can be
    smaller than the partial eta squared the F implies, never larger. Signs are not compared
    (authors orient differences either way). Known causes besides typing errors: an effect
    size from a different analysis (adjusted for covariates, another contrast) printed beside
    the test.
    """
    printed = claim.effect_printed
    ranges = recomputed.effect_printed_ranges
    if printed is None or not ranges:
        return
    try:
        number = parse_printed(printed.value)
    except UnreadableNumber:
        return
    value = Interval(abs(number.value) - number.half_unit, abs(number.value) + number.half_unit)
    if any(intervals_meet(value, allowed) for allowed in ranges):
        return
    if printed.measure == "eta2":
        implied = (f"{printed.label} of at most {ranges[0].high:.3f} (eta squared cannot exceed "
                   f"the partial eta squared the F implies)")
    else:
        signed = printed.measure in ("d", "g", "r")
        symbol = f"|{printed.label}|" if signed else printed.label
        implied = f"{symbol} in " + " or ".join(f"[{r.low:.3f}, {r.high:.3f}]" for r in ranges)
    yield Finding(
        f"The printed {printed.label} = {printed.value} cannot come from "
        f"{describe_statistic(claim)}, which implies {implied}.",
        {"printed": number.value, "allowed_low": min(r.low for r in ranges),
         "allowed_high": max(r.high for r in ranges)},
    )
