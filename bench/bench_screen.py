"""Benchmark: screening a generated corpus with one and with several worker processes.

    python bench/bench_screen.py                  # 200 manuscripts of 40 results each
    python bench/bench_screen.py --documents 1000

Prints documents/s and results/s of `scrutiny.screen.screen` for 1 worker and for every core,
a second run on the same store (resuming: nothing left to check) and the summary's time.
"""

from __future__ import annotations

import argparse
import os
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from generate import manuscript  # noqa: E402

from scrutiny.screen import screen, summarise  # noqa: E402


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--documents", type=int, default=200)
    parser.add_argument("--results", type=int, default=40, help="results per manuscript")
    args = parser.parse_args()
    cores = os.cpu_count() or 1
    with tempfile.TemporaryDirectory() as folder:
        corpus = Path(folder) / "corpus"
        corpus.mkdir()
        for index in range(args.documents):
            (corpus / f"paper-{index:04d}.txt").write_text(
                manuscript(args.results, seed=index), encoding="utf-8")
        size_mb = sum(p.stat().st_size for p in corpus.iterdir()) / 1e6
        print(f"scrutiny screen benchmark: {args.documents} manuscripts, {args.results} results "
              f"each ({size_mb:.1f} MB), {cores} cores")
        for workers in sorted({1, cores}):
            store = str(Path(folder) / f"w{workers}.sqlite")
            start = time.perf_counter()
            screening = screen([str(corpus)], store, workers=workers)
            elapsed = time.perf_counter() - start
            print(f"  {workers} worker(s): {elapsed:6.2f} s, "
                  f"{screening.checked / elapsed:6.1f} documents/s, "
                  f"{screening.checked * args.results / elapsed:8,.0f} results/s")
        start = time.perf_counter()
        again = screen([str(corpus)], store, workers=cores)
        print(f"  resumed run: {time.perf_counter() - start:.2f} s "
              f"({again.checked} checked, {again.already_stored} already stored)")
        start = time.perf_counter()
        summary = summarise(store)
        print(f"  summary: {time.perf_counter() - start:.2f} s for {summary.claims:,} results "
              f"(p-curve: {summary.p_curve.verdict})")


if __name__ == "__main__":
    main()
