"""Numbers as printed, and the intervals their rounding stands for.

A printed "2.45" stands for any value in [2.445, 2.455]; "p = .021" for [.0205, .0215];
"p < .001" for [0, .001]; "p = .000" for [0, .0005]. Every comparison between a reported and a
recomputed p-value in scrutiny goes through these intervals, never through a fixed tolerance.

Printed forms understood: a leading minus (ingest has mapped every dash to "-"), thousands
separators ("2,506.01"), decimal commas ("4,77"; a comma followed by exactly three digits is a
thousands separator, unless the digits before it are a lone zero: "0,021" is 0.021), numbers
without a leading zero (".021"), stray spaces inside a number, and scientific notation
("2.8 × 10-4", "2.8x10^-4", "2.8·10-4", "3e-5", "10-6").
"""

from __future__ import annotations

import functools
import math
import re
from dataclasses import dataclass

import regex

from .ingest.normalise import normalise_fragment
from .model import Interval

# A thousands group never starts with a lone zero: "0,021" is a decimal comma.
_THOUSANDS = regex.compile(r"[1-9]\d{0,2}(?:,\d{3})+(?:\.\d+)?")
# A multiplication dot before a power of ten: normalisation would otherwise read the middle dot
# in "2.8·10-4" as a decimal point (between digits), so it becomes "×" before normalising.
_TIMES_DOT = regex.compile(r"(?<=\d)\s*[\u00b7\u2219\u22c5]\s*(?=10\s*\^?\s*[-\u2212\u207b])")
_SCIENTIFIC = (
    regex.compile(r"(?P<mantissa>[\d.,]+)[xX×*·⋅]10\^?(?P<exponent>-?\d+)"),  # 2.8 × 10-4
    regex.compile(r"(?P<mantissa>[\d.,]+)[eE](?P<exponent>[-+]?\d+)"),      # 2.8e-4
    regex.compile(r"(?P<mantissa>)10\^?(?P<exponent>-\d+)"),                # 10-6, 10^-6
)
_PLAIN = regex.compile(r"\d*\.?\d+|\d+\.")

#: relative slack for floating-point error only (not a tolerance on reported numbers)
FLOAT_SLACK = 1e-9


class UnreadableNumber(ValueError):
    """A printed string is not a number in any form we understand."""


@dataclass(frozen=True)
class PrintedNumber:
    """A number as printed: its value and the half-width of the rounding it implies."""

    value: float
    half_unit: float
    decimals: int

    @property
    def interval(self) -> Interval:
        return Interval(self.value - self.half_unit, self.value + self.half_unit)


#: the common case, a plain decimal such as "2.45", "-.32" or "28", read without any rewriting
_SIMPLE = re.compile(r"-?(\d*)(?:\.(\d+))?")


@functools.lru_cache(maxsize=65536)
def parse_printed(printed: str) -> PrintedNumber:
    """Read a printed number; raise `UnreadableNumber` if it is not one.

    Cached: manuscripts print the same strings ("28", ".05", "< .001") again and again.
    """
    simple = _SIMPLE.fullmatch(printed)
    if simple and (simple.group(1) or simple.group(2)):
        decimals = len(simple.group(2) or "")
        return PrintedNumber(float(printed), 0.5 * 10.0 ** -decimals, decimals)
    text = normalise_fragment(_TIMES_DOT.sub("×", printed)).strip().replace(" ", "")
    sign = 1.0
    if text.startswith("-"):
        sign, text = -1.0, text[1:]
    elif text.startswith("+"):
        text = text[1:]
    scientific = next((m for m in (p.fullmatch(text) for p in _SCIENTIFIC) if m), None)
    if scientific:
        mantissa = _parse_plain(scientific.group("mantissa") or "1")
        exponent = int(scientific.group("exponent"))
        value = float(f"{mantissa.value!r}e{exponent}")  # exact decimal, no 3 * 1e-5 error
        return PrintedNumber(sign * value, mantissa.half_unit * 10.0 ** exponent,
                             mantissa.decimals - exponent)
    number = _parse_plain(text)
    return PrintedNumber(sign * number.value, number.half_unit, number.decimals)


def _parse_plain(text: str) -> PrintedNumber:
    if _THOUSANDS.fullmatch(text):
        text = text.replace(",", "")
    elif text.count(",") == 1 and "." not in text:
        text = text.replace(",", ".")  # a decimal comma
    if not _PLAIN.fullmatch(text):
        raise UnreadableNumber(f"not a number: {text!r}")
    decimals = len(text.split(".", 1)[1]) if "." in text else 0
    return PrintedNumber(float(text), 0.5 * 10.0 ** -decimals, decimals)


def statistic_interval(printed: str, comparator: str, lower_limit: float = -math.inf,
                       upper_limit: float = math.inf) -> Interval:
    """The values a printed statistic stands for, clipped to the statistic's range.

    A bound printed with decimals is read leniently: "t >= 3.19" allows t down to 3.185,
    because such a bound is itself a rounded value. A whole-number bound ("F < 1") is a round
    threshold the authors chose, and is read exactly.
    """
    number = parse_printed(printed)
    half = number.half_unit if comparator == "=" or number.decimals > 0 else 0.0
    low, high = number.value - half, number.value + half
    if comparator in ("<", "<="):
        low = lower_limit
    elif comparator in (">", ">="):
        high = upper_limit
    low, high = max(low, lower_limit), min(high, upper_limit)
    if low > high:  # a printed value outside the statistic's range (an impossible value)
        low = high = min(max(number.value, lower_limit), upper_limit)
    return Interval(low, high)


def magnitude_interval(interval: Interval) -> Interval:
    """The interval of |x| for x in `interval` (two-sided tests depend on |t| only)."""
    if interval.low <= 0.0 <= interval.high:
        return Interval(0.0, max(-interval.low, interval.high))
    a, b = abs(interval.low), abs(interval.high)
    return Interval(min(a, b), max(a, b))


def reported_p_interval(comparator: str, printed: str, alpha: float) -> Interval:
    """The p-values a printed p stands for.

    "=" is a rounded value ("p = .000" therefore means p < .0005); "<", "<=", ">" and ">=" are
    bounds taken at face value; "ns" means p at or above alpha.
    """
    if comparator == "ns":
        return Interval(alpha, 1.0)
    number = parse_printed(printed)
    if comparator == "=":
        low, high = number.value - number.half_unit, number.value + number.half_unit
    elif comparator in ("<", "<="):
        low, high = 0.0, number.value
    elif comparator in (">", ">="):
        low, high = number.value, 1.0
    else:
        raise ValueError(f"unknown comparator {comparator!r}")
    low, high = max(low, 0.0), min(high, 1.0)
    if low > high:  # p printed outside [0, 1]; impossible-value reports it
        low = high = min(max(number.value, 0.0), 1.0)
    return Interval(low, high)


def intervals_meet(a: Interval, b: Interval) -> bool:
    """True when some value lies in both intervals (allowing for floating-point error)."""
    slack = FLOAT_SLACK * max(abs(a.high), abs(b.high), 1e-300)
    return max(a.low, b.low) <= min(a.high, b.high) + slack
