"""Checks on what a result implies beyond its p-value."""

from __future__ import annotations

from typing import Iterator

from ..model import Claim, Recomputed, Settings, Severity
from ..numbers import format_count, format_p
from . import Context, Finding, check
from .consistency import describe_statistic

_LABELS = {"d": "d", "d_z": "d_z", "r": "r", "eta2_partial": "partial η2", "w": "w"}


def smallest_effect_of_interest(measure: str, settings: Settings) -> float:
    return {"d": settings.sesoi_d, "d_z": settings.sesoi_d, "r": settings.sesoi_r,
            "eta2_partial": settings.sesoi_eta2, "w": settings.sesoi_w}[measure]


@check("negligible-effect", Severity.WARNING,
       "Significant, but the implied effect is below the smallest effect of interest")
def negligible_effect(claim: Claim, recomputed: Recomputed, context: Context,
                      settings: Settings) -> Iterator[Finding]:
    """A significant result whose implied effect size is negligible.

    With enough data any non-zero difference gets a small p: at n = 10,000 per group a
    difference of d = 0.04 is significant at .05. So a small p says little about whether an
    effect matters. The effect implied by the statistic and its df is computed (d = 2t/sqrt(N)
    for two equal groups or d_z = t/sqrt(n) for paired data, r, partial eta squared =
    F df1 / (F df1 + df2), Cohen's w = sqrt(chi2 / N); Lakens 2013) and compared with the
    smallest effect size of interest, by default Cohen's (1988) "small" conventions (d = 0.2,
    r = 0.1, partial eta squared = 0.01, w = 0.1; change them with --sesoi). The design behind
    a t test is read from the text and stated in the message; when none is stated two equal
    independent groups are assumed.
    """
    effect = recomputed.effect
    if effect is None or recomputed.p is None or recomputed.p >= settings.alpha:
        return
    threshold = smallest_effect_of_interest(effect.measure, settings)
    if abs(effect.value) >= threshold:
        return
    label = _LABELS[effect.measure]
    size = f" because n = {format_count(effect.n)} is large" if effect.n else ""
    yield Finding(
        f"{describe_statistic(claim)} is significant (p = {format_p(recomputed.p)}), but the "
        f"implied effect is negligible: {label} = {effect.value:.3f}, below the smallest effect "
        f"of interest {label} = {threshold:g} ({effect.assumption}). It is significant{size}: "
        f"with enough data any non-zero difference gets a small p.",
        {"effect": effect.value, "threshold": threshold, "n": effect.n},
    )
