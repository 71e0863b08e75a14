"""Generate a long invented manuscript with a known number of reported results.

Used by the benchmarks; deterministic for a given seed. About 400 bytes of prose per result,
so 5,000 results make a file of roughly 2 MB. Two results in three are tests (t, F, chi-square,
r, z); the rest are the numbers around tests: means with SD and n on a rating scale,
percentages with their base, estimates with confidence intervals, and coefficients with a
standard error beside their t.
"""

from __future__ import annotations

import math
import random
import statistics

from scipy import stats

PROSE = (
    "Voles from the upland enclosures were weighed at dawn and released at the burrow "
    "entrance, and their foraging bouts were logged by the infrared gates of the station. "
    "The observers did not know which diet a colony had received. "
)


def _result(rng: random.Random) -> str:
    family = rng.choice(["t", "F", "chi2", "r", "z", "t", "F", "chi2", "r", "z",
                         "mean", "percent", "estimate", "coefficient", "estimate"])
    if family == "mean":
        ratings = [rng.randint(1, 7) for _ in range(rng.randint(10, 60))]
        return (f"on the 7-point scale (M = {statistics.mean(ratings):.2f}, "
                f"SD = {statistics.stdev(ratings):.2f}, n = {len(ratings)})")
    if family == "percent":
        base = rng.randint(20, 400)
        count = rng.randint(0, base)
        return f"and {count} of {base} ({100 * count / base:.1f}%) returned to the nest"
    if family == "estimate":
        log_ratio, se = rng.uniform(-1.0, 1.0), rng.uniform(0.1, 0.4)
        low, high = math.exp(log_ratio - 1.96 * se), math.exp(log_ratio + 1.96 * se)
        p = 2 * stats.norm.sf(abs(log_ratio) / se)
        return (f"OR = {math.exp(log_ratio):.2f}, 95% CI [{low:.2f}, {high:.2f}], "
                f"p {_p(p)}")
    if family == "coefficient":
        df, se = rng.randint(30, 300), rng.uniform(0.05, 0.5)
        b = rng.uniform(-4, 4) * se
        t = round(b, 2) / round(se, 2) if round(se, 2) else 0.0
        return (f"b = {b:.2f}, SE = {se:.2f}, t({df}) = {t:.2f}, "
                f"p {_p(2 * stats.t.sf(abs(round(t, 2)), df))}")
    if family == "t":
        df = rng.randint(8, 300)
        t = rng.uniform(0.2, 5.0)
        p = 2 * stats.t.sf(round(t, 2), df)
        return f"t({df}) = {t:.2f}, p {_p(p)}"
    if family == "F":
        df1, df2 = rng.randint(1, 5), rng.randint(10, 400)
        f = rng.uniform(0.5, 20.0)
        return (f"F({df1}, {df2}) = {f:.2f}, MSE = {rng.uniform(0.1, 3000):,.2f}, "
                f"p {_p(stats.f.sf(round(f, 2), df1, df2))}")
    if family == "chi2":
        df, n = rng.randint(1, 6), rng.randint(40, 900)
        x = rng.uniform(0.5, 25.0)
        return f"χ²({df}, N = {n}) = {x:.2f}, p {_p(stats.chi2.sf(round(x, 2), df))}"
    if family == "r":
        df = rng.randint(10, 500)
        r = rng.uniform(-0.6, 0.6)
        t = round(r, 2) * (df / (1 - round(r, 2) ** 2)) ** 0.5
        return f"r({df}) = {r:.2f}".replace("0.", ".", 1) + f", p {_p(2 * stats.t.sf(abs(t), df))}"
    z = rng.uniform(-4.0, 4.0)
    return f"z = {z:.2f}, p {_p(2 * stats.norm.sf(abs(round(z, 2))))}"


def _p(p: float) -> str:
    return "< .001" if p < 0.001 else f"= {p:.3f}".replace("0.", ".", 1)


def manuscript(results: int, seed: int = 1) -> str:
    rng = random.Random(seed)
    paragraphs = []
    for index in range(results):
        paragraphs.append(f"{PROSE * rng.randint(1, 2)}In session {index + 1} the colonies "
                          f"differed, {_result(rng)}.")
    return "\n\n".join(paragraphs) + "\n"
