"""Checks of descriptive statistics (granularity) and of df against the sample size."""

from __future__ import annotations

from typing import Iterator

from ..model import Claim, Recomputed, Settings, Severity
from ..rounding import UnreadableNumber, parse_printed
from . import Context, Finding, check
from .consistency import describe_statistic


def describe_mean(claim: Claim) -> str:
    described = claim.descriptive
    parts = [f"M = {described.mean}"]
    if described.sd:
        parts.append(f"SD = {described.sd}")
    if described.n:
        parts.append(f"n = {described.n}")
    return ", ".join(parts)


def _assumption(claim: Claim, settings: Settings) -> str:
    described = claim.descriptive
    items = described.items or "1"
    why = (f"the text says \"{described.integer_cue}\"" if described.integer_cue
           else "--integer-scales declares it")
    if described.sum_score:
        return (f"assuming integer sum scores over {items} items from n = {described.n} people "
                f"({why}, and the mean lies above the top of one item)")
    return (f"assuming integer responses from n = {described.n} people on {items} item"
            f"{'s' if items != '1' else ''} ({why})")


@check("grim", Severity.WARNING, "A mean that no set of integer responses can produce",
       applies_to={"mean"}, marks_inconsistent=True)
def grim_check(claim: Claim, recomputed: Recomputed, context: Context,
               settings: Settings) -> Iterator[Finding]:
    """GRIM (Brown & Heathers 2017, Social Psychological and Personality Science 8, 363-369).

    The mean of n integer responses on L items is a multiple of 1/(nL); a printed mean that no
    integer total rounds to cannot come from such data. The test only runs where the text says
    the measure is integer-valued (a k-point item or scale, a count, "number of ...") or
    --integer-scales declares it, uses the printed item count (else one item), accepts either
    rounding of a tie, and can only fail while nL is below 10^decimals. Continuous measures,
    means of means and means after exclusions the n does not reflect make it inapplicable;
    the message states the assumption.
    """
    verdict = recomputed.grim
    if verdict is None or not verdict.testable or verdict.consistent:
        return
    yield Finding(f"{describe_mean(claim)}: no integer total gives this mean, "
                  f"{_assumption(claim, settings)}; {verdict.reason}.",
                  {"n": recomputed.n})


@check("grimmer", Severity.WARNING,
       "A standard deviation that no set of integer responses with this mean can produce",
       applies_to={"mean"}, marks_inconsistent=True)
def grimmer_check(claim: Claim, recomputed: Recomputed, context: Context,
                  settings: Settings) -> Iterator[Finding]:
    """GRIMMER (Anaya 2016, PeerJ Preprints 4:e2400v1), in its analytic form.

    With integer data the sum S and the sum of squares Q are integers and Q has the parity of
    S, so the SD sqrt((Q - S^2/n)/(n - 1)) takes only certain values; a printed SD that none of
    them rounds to cannot come from integer data with this mean and n. Runs under the same
    conditions as grim, and only where the mean itself passes GRIM (a failing mean is already
    flagged).
    """
    verdict = recomputed.grimmer
    if verdict is None or not verdict.testable or verdict.consistent:
        return
    if recomputed.grim is not None and recomputed.grim.testable and not recomputed.grim.consistent:
        return
    yield Finding(f"{describe_mean(claim)}: no integer data with this mean give this SD, "
                  f"{_assumption(claim, settings)}; {verdict.reason}.",
                  {"n": recomputed.n})


@check("percent-mismatch", Severity.WARNING,
       "A percentage that its count and base do not give", applies_to={"percent"},
       marks_inconsistent=True)
def percent_mismatch(claim: Claim, recomputed: Recomputed, context: Context,
                     settings: Settings) -> Iterator[Finding]:
    """count / base x 100 must round to the printed percentage.

    Either rounding of a tie is accepted. Weighted percentages (survey weights) need not match
    their raw counts and are not checked; a percentage of a base other than the printed one
    (valid responses only) is a known cause besides typing errors.
    """
    verdict = recomputed.percentage
    if verdict is None or verdict.consistent:
        return
    printed = claim.proportion
    yield Finding(f"{printed.percent}% does not follow from {printed.count} of {printed.base}: "
                  f"{verdict.reason}.", {"base": recomputed.n})


@check("df-sample-mismatch", Severity.WARNING,
       "Degrees of freedom larger than the sample allows", applies_to={"t", "r"})
def df_sample_mismatch(claim: Claim, recomputed: Recomputed, context: Context,
                       settings: Settings) -> Iterator[Finding]:
    """A t or r whose df exceeds what the stated sample size allows.

    With N observations a t test has at most N - 1 df (one sample or paired; two groups have
    N - 2) and a correlation N - 2. The N is taken only when it is unambiguously the same
    sample: the only N printed in the result's sentence, or in its paragraph when that reports
    no other t or r; never an N per group, and never where the sentence or paragraph speaks of
    trials, observations, repeated measures or a mixed model, whose df count observations
    rather than participants (results with fractional, Satterthwaite df are left alone for the
    same reason). Known causes besides typing errors: an analysis of trials or observations
    while N counts participants, or an N that counts one group only.
    """
    if not claim.sample_size or not recomputed.df:
        return
    try:
        total = parse_printed(claim.sample_size).value
    except UnreadableNumber:
        return
    most = total - (1.0 if claim.test == "t" else 2.0)
    if recomputed.df[0] <= most:
        return
    yield Finding(f"{describe_statistic(claim)} has {recomputed.df[0]:g} df, but the sample "
                  f"printed with it (N = {claim.sample_size}) allows at most {most:g}.",
                  {"df": recomputed.df[0], "n": total})
