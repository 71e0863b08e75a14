"""How numbers are written in messages and reports (formatting only; nothing is computed).

p-values get four decimals without a leading zero (".0320", ".0495": enough to see on which
side of .05 a value lies), or two significant digits in scientific notation below .0001.
"""

from __future__ import annotations

import math


def format_p(p: float | None) -> str:
    if p is None or math.isnan(p):
        return "-"
    if p >= 0.99995:
        return "1.000"
    if p >= 0.0001:
        return f"{p:.4f}".lstrip("0")
    if p == 0.0:
        return "0"
    return f"{p:.1e}"


def format_p_interval(low: float, high: float) -> str:
    return f"[{format_p(low)}, {format_p(high)}]"


def format_number(value: float | None, decimals: int = 2) -> str:
    if value is None or math.isnan(value):
        return "-"
    if math.isinf(value):
        return "∞" if value > 0 else "-∞"
    return f"{value:.{decimals}f}"


def format_count(value: float) -> str:
    """A sample size or df: whole numbers with thousands separators, else one decimal."""
    return f"{value:,.0f}" if abs(value - round(value)) < 1e-9 else f"{value:,.1f}"
