"""Benchmark: the evidence layer (effect sizes with intervals, Bayes factors) per claim.

    python bench/bench_evidence.py                  # 10,000 claims of all five families
    python bench/bench_evidence.py --claims 50000 --repeats 5

Builds the Claims once, outside the timed part (as extraction would print them: strings, with
df, N and the design words where the family has them), then times `scrutiny.recompute.recompute`
over all of them: the p-value and its interval, the implied effect with its 95% and 90%
intervals and the effect detectable with 80% power, the Sellke-Bayarri-Berger bound and the JZS
or BIC Bayes factor with the posterior probability of the null. Prints claims/s overall and per
test family (best of `--repeats`). Target: 2,000 claims/s on one core. Not a test: the figures
go in the README.
"""

from __future__ import annotations

import argparse
import random
import time
from collections import Counter

from scrutiny.model import Claim, Location, PValue, Settings
from scrutiny.recompute import recompute

FAMILIES = ("t", "F", "chi2", "r", "z")
LOCATION = Location(start=0, end=0, line=1)


def _df(rng: random.Random, large: bool) -> int:
    return rng.randint(2000, 200000) if large else rng.randint(4, 400)


def _claim(rng: random.Random, family: str) -> Claim:
    """One invented result; about one in four has a large sample (the large-n paradox)."""
    large = rng.random() < 0.25
    n = design = None
    if family == "t":
        df = (str(_df(rng, large)),)
        statistic = f"{rng.uniform(-6.0, 6.0):.2f}"
        design = rng.choice([None, "within", "between"])
    elif family == "F":
        df = (str(rng.randint(1, 6)), str(_df(rng, large)))
        statistic = f"{rng.uniform(0.2, 25.0):.2f}"
    elif family == "chi2":
        df = (str(rng.randint(1, 8)),)
        statistic = f"{rng.uniform(0.2, 40.0):.2f}"
        n = str(_df(rng, large) + 10)
    elif family == "r":
        df = (str(_df(rng, large)),)
        statistic = f"{rng.uniform(-0.7, 0.7):.2f}".replace("0.", ".", 1)
    else:
        df = ()
        statistic = f"{rng.uniform(-5.0, 5.0):.2f}"
        n = str(_df(rng, large) + 10)
    text = f"{family}({', '.join(df)}) = {statistic}"
    return Claim(test=family, df=df, statistic=statistic, statistic_comparator="=",
                 p=PValue("=", f"{rng.uniform(0.0005, 0.3):.3f}".lstrip("0")),
                 location=LOCATION, text=text, sentence=text, n=n, design_stated=design)


def claims(count: int, seed: int = 2026) -> list[Claim]:
    rng = random.Random(seed)
    return [_claim(rng, FAMILIES[i % len(FAMILIES)]) for i in range(count)]


def best_time(repeats: int, batch: list[Claim], settings: Settings) -> float:
    best = float("inf")
    for _ in range(repeats):
        start = time.perf_counter()
        for claim in batch:
            recompute(claim, settings)
        best = min(best, time.perf_counter() - start)
    return best


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--claims", type=int, default=10000)
    parser.add_argument("--repeats", type=int, default=3)
    args = parser.parse_args()

    settings = Settings()
    batch = claims(args.claims)
    recompute(batch[0], settings)  # first call outside the timing (lazy imports, caches)

    elapsed = best_time(args.repeats, batch, settings)
    results = [recompute(claim, settings) for claim in batch]
    with_bf = sum(1 for r in results if r.evidence is not None and r.evidence.bf01 is not None)
    with_effect = sum(1 for r in results if r.effect is not None)
    methods = Counter(r.evidence.method for r in results if r.evidence is not None)

    print(f"evidence for {len(batch):,} claims: {elapsed:.2f} s, "
          f"{len(batch) / elapsed:,.0f} claims/s (best of {args.repeats}; target 2,000)")
    print(f"  with an effect size: {with_effect:,}; with a Bayes factor: {with_bf:,} "
          f"({', '.join(f'{m}: {c:,}' for m, c in sorted(methods.items(), key=str))})")
    for family in FAMILIES:
        subset = [c for c in batch if c.test == family]
        family_time = best_time(args.repeats, subset, settings)
        print(f"  {family:>4}: {len(subset) / family_time:>9,.0f} claims/s "
              f"({family_time / len(subset) * 1e6:.0f} µs per claim)")


if __name__ == "__main__":
    main()
