"""check: a registry of small, independent checks, and the verdict on each Claim.

A check is a function decorated with `@check(id, severity, title, ...)`. It receives the Claim,
its Recomputed numbers, a Context (the document it came from) and the Settings, and yields a
`Finding` (message plus the numbers behind it) for each problem; the registry stamps each
Finding with the check's id and severity to make a `Flag`. Its docstring explains the statistics
and cites the published method; `scrutiny checks` prints these, and the README lists them.

Adding a check means adding one decorated function in a module of this package (imported at
the bottom of this file) and its tests; nothing else changes.
"""

from __future__ import annotations

import inspect
from dataclasses import dataclass, field
from typing import Callable, Iterable, Mapping

from ..model import TEST_FAMILIES, Claim, Flag, Recomputed, Settings, Severity, Status


@dataclass(frozen=True)
class Finding:
    """What a check yields: a message for the reader and the numbers behind it."""

    message: str
    details: Mapping[str, float | str | None] = field(default_factory=dict)


@dataclass(frozen=True)
class Context:
    """What a check may know beyond its own Claim."""

    path: str = "<text>"
    claims: tuple[Claim, ...] = ()


CheckFunction = Callable[[Claim, Recomputed, Context, Settings], Iterable[Finding]]


@dataclass(frozen=True)
class Check:
    id: str
    severity: Severity
    title: str
    function: CheckFunction
    #: test families the check applies to; None means all
    applies_to: frozenset[str] | None = None
    #: a flag from this check makes the claim `inconsistent`
    marks_inconsistent: bool = False

    @property
    def explanation(self) -> str:
        return inspect.cleandoc(self.function.__doc__ or "")

    def run(self, claim: Claim, recomputed: Recomputed, context: Context,
            settings: Settings) -> list[Flag]:
        if self.applies_to is not None and claim.test not in self.applies_to:
            return []
        return [Flag(check=self.id, severity=self.severity, message=f.message,
                     details=dict(f.details))
                for f in self.function(claim, recomputed, context, settings)]


REGISTRY: dict[str, Check] = {}


def check(check_id: str, severity: Severity, title: str, *,
          applies_to: Iterable[str] | None = None,
          marks_inconsistent: bool = False) -> Callable[[CheckFunction], CheckFunction]:
    """Register a check function under `check_id` (kebab-case, unique)."""

    def register(function: CheckFunction) -> CheckFunction:
        if check_id in REGISTRY:
            raise ValueError(f"check {check_id!r} is registered twice")
        if not function.__doc__:
            raise ValueError(f"check {check_id!r} needs a docstring explaining its statistics")
        REGISTRY[check_id] = Check(
            id=check_id,
            severity=severity,
            title=title,
            function=function,
            applies_to=frozenset(applies_to) if applies_to is not None else None,
            marks_inconsistent=marks_inconsistent,
        )
        return function

    return register


def run_checks(claim: Claim, recomputed: Recomputed, context: Context,
               settings: Settings) -> tuple[Flag, ...]:
    """Every flag the registered checks raise for one claim, most severe first."""
    flags = [flag for registered in REGISTRY.values()
             for flag in registered.run(claim, recomputed, context, settings)]
    order = list(REGISTRY)
    flags.sort(key=lambda f: (-f.severity, order.index(f.check)))
    return tuple(flags)


def verdict(claim: Claim, recomputed: Recomputed,
            flags: tuple[Flag, ...]) -> tuple[Status, str | None]:
    """The status of a claim and, when it is unchecked, why."""
    if any(REGISTRY[f.check].marks_inconsistent for f in flags):
        return Status.INCONSISTENT, None
    if recomputed.reason:
        if (recomputed.interval_facts is not None and claim.p is not None
                and recomputed.reported_p_interval is not None):
            # the statistic cannot be recomputed ("r = .19, 95% CI [-.11, .47], p = .21"
            # without df), but its p was checked against its confidence interval and fits
            return Status.CONSISTENT, None
        return Status.UNCHECKED, recomputed.reason
    if claim.test not in TEST_FAMILIES:
        return Status.CONSISTENT, None  # what could be checked (granularity, interval) was
    if claim.p is None:
        return Status.UNCHECKED, "no p-value printed"
    if recomputed.reported_p_interval is None:
        return Status.UNCHECKED, f"unreadable p-value {claim.p.reported!r}"
    if claim.p.adjusted and not _fits_two_sided(recomputed):
        return Status.UNCHECKED, (f"p-value adjusted for multiple comparisons "
                                  f"({claim.p.adjusted}); the adjustment is not known")
    return Status.CONSISTENT, None


def _fits_two_sided(recomputed: Recomputed) -> bool:
    from ..rounding import intervals_meet

    return (recomputed.p_interval is not None and recomputed.reported_p_interval is not None
            and intervals_meet(recomputed.p_interval, recomputed.reported_p_interval))


# Modules that register checks; imported for their side effect.
from . import consistency, descriptives, effects, estimates  # noqa: E402,F401

__all__ = ["Check", "Context", "Finding", "REGISTRY", "check", "run_checks", "verdict"]
