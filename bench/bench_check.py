"""Benchmark: `scrutiny check` on a generated manuscript with many results.

    python bench/bench_check.py                 # 5,000 results (about 2 MB)
    python bench/bench_check.py --results 125000  # about 50 MB: peak memory of a large file

Prints, beside a bare read of the same file: MB/s and results/s of extraction alone and of the
whole check, the time of the command line end to end, and the peak resident memory of a
separate process that checks the file (as a multiple of the file size), after a warm-up check
of one sentence and as the process's first check. Not a test: the figures go in the README.
"""

from __future__ import annotations

import argparse
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from generate import manuscript  # noqa: E402

from scrutiny import check_file  # noqa: E402
from scrutiny.extract import find_claims  # noqa: E402
from scrutiny.ingest import read_document  # noqa: E402

# Peak memory allocated by Python while checking the file, in a fresh process, after the
# imports and the pattern library are loaded (so that only the check itself is counted).
# With "warm", a check of one sentence runs first, so that the one-time tables and caches of
# the first check (the Bayes factor grid, lazily compiled patterns) are not counted either:
# what remains is what grows with the file. tracemalloc counts every Python allocation;
# resident-set figures of this sandbox do not move with the heap, so they are not used.
MEMORY_PROBE = """
import sys, tracemalloc
from scrutiny import check_file, check_text
from scrutiny.patterns import load_library
load_library()
if sys.argv[2] == "warm":
    check_text("The voles dug deeper, t(28) = 2.20, p = .01, on a 7-point scale (M = 3.48, n = 20).")
tracemalloc.start()
result = check_file(sys.argv[1])
current, peak = tracemalloc.get_traced_memory()
print(len(result.claims), current, peak)
"""


def best_of(repeats: int, function):
    best, value = float("inf"), None
    for _ in range(repeats):
        start = time.perf_counter()
        value = function()
        best = min(best, time.perf_counter() - start)
    return best, value


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--results", type=int, default=5000)
    parser.add_argument("--repeats", type=int, default=3)
    args = parser.parse_args()

    with tempfile.TemporaryDirectory() as folder:
        path = os.path.join(folder, "manuscript.txt")
        Path(path).write_text(manuscript(args.results), encoding="utf-8")
        size_mb = os.path.getsize(path) / 1e6
        repeats = args.repeats if args.results <= 20000 else 1

        read_time, _ = best_of(repeats, lambda: Path(path).read_bytes().decode("utf-8"))
        document = read_document(path)
        extract_time, claims = best_of(repeats, lambda: find_claims(document))
        check_time, result = best_of(repeats, lambda: check_file(path))
        start = time.perf_counter()
        subprocess.run([sys.executable, "-m", "scrutiny", "check", path, "--format", "json"],
                       stdout=subprocess.DEVNULL, check=False)
        cli_time = time.perf_counter() - start

        probes = {}
        for state in ("cold", "warm"):
            probe = subprocess.run([sys.executable, "-c", MEMORY_PROBE, path, state],
                                   capture_output=True, text=True, check=True)
            probes[state] = [int(x) for x in probe.stdout.split()]
        found, kept_bytes, peak_bytes = probes["warm"]
        cold_peak_bytes = probes["cold"][2]

    assert len(claims) == args.results == found == len(result.claims), (
        len(claims), found, len(result.claims))
    peak_mb, kept_mb = peak_bytes / 1e6, kept_bytes / 1e6
    rows = [
        ("file", f"{size_mb:.2f} MB, {args.results:,} results"),
        ("bare read + decode", f"{read_time * 1000:.1f} ms ({size_mb / read_time:,.0f} MB/s)"),
        ("extraction (find_claims)", f"{extract_time:.3f} s: {size_mb / extract_time:.1f} MB/s, "
                                     f"{len(claims) / extract_time:,.0f} results/s"),
        ("whole check (check_file)", f"{check_time:.3f} s: {size_mb / check_time:.1f} MB/s, "
                                     f"{len(result.claims) / check_time:,.0f} results/s"),
        ("command line, JSON out", f"{cli_time:.2f} s including interpreter start"),
        ("peak memory of the check", f"{peak_mb:.0f} MB ({peak_mb / size_mb:.1f}x the file size; "
                                     f"{kept_mb:.0f} MB kept in the results)"),
        ("... as the first check", f"{cold_peak_bytes / 1e6:.0f} MB "
                                   f"({cold_peak_bytes / 1e6 / size_mb:.1f}x, with one-time "
                                   f"tables and caches)"),
    ]
    width = max(len(name) for name, _ in rows)
    print(f"scrutiny check benchmark (Python {sys.version.split()[0]}, one process, one core)")
    for name, value in rows:
        print(f"  {name:<{width}}  {value}")


if __name__ == "__main__":
    main()
