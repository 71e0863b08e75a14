"""Benchmark: `scrutiny check` on a long generated two-column PDF.

    python bench/bench_pdf.py                  # 200 pages
    python bench/bench_pdf.py --pages 50 --plumber-pages 20

Generates an invented two-column manuscript (the Skerrow Islands scenario of the samples:
studies of wall skinks, lantern crabs and pipers, each with introduction, method, results and
discussion; chi-square and eta squared with real Greek glyphs, running heads and page
numbers; about 1.3 results per page, as dense as the two-column
journal article among the field PDFs) and prints pages per second of

* pypdfium2's bare text extraction (open, then every page's text),
* pdfplumber's `extract_text()` (on the first `--plumber-pages` pages: it is slow),
* the whole check with `scrutiny.check_file` (the PDF is read and checked in a child process
  with its time and memory ceilings, as the command line does), and the same check in this
  process (`read_document` + `check_document`),

each the best of `--repeats` runs, in wall-clock time and in CPU time of this process (the
child's CPU time is not counted by `process_time`, so for `check_file` only wall time is
given). Then the peak memory of a fresh process that checks the PDF at 50 and at the full
number of pages: resident memory (C libraries included) and the Python heap. Not a test: the
figures go in the README.
"""

from __future__ import annotations

import argparse
import random
import subprocess
import sys
import tempfile
import time
from pathlib import Path

from scipy import stats

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT / "tests"))

from pdf_factory import Layout, manuscript_pdf  # noqa: E402

from scrutiny import check_file  # noqa: E402
from scrutiny.api import check_document  # noqa: E402
from scrutiny.ingest import read_document  # noqa: E402
from scrutiny.patterns import load_library  # noqa: E402

ANIMALS = [
    ("wall skinks", "basking ledges", "the granite terraces above Skerrow harbour"),
    ("lantern crabs", "tide pools", "the Ossel shore"),
    ("pipers", "song posts", "the heath behind the Skerrow observatory"),
    ("shore waders", "roost sites", "the sand bars of the northern sound"),
]
PROSE = [
    "The {animal} of {place} were marked at first light and followed until dusk, and every "
    "visit to the {sites} was logged by two observers who did not know the treatment.",
    "Earlier work at the field station had suggested that the {animal} respond to the "
    "weather of the preceding week rather than to that of the day itself.",
    "Counts were taken on fixed transects, and {sites} that flooded during a spring tide were "
    "left out of the survey for that day.",
    "We expected the effect to be larger in the second season, when the colony had grown and "
    "competition for {sites} was stronger.",
    "All procedures were approved by the animal welfare board of the Skerrow natural-history "
    "trust, and the animals were released where they had been caught.",
    "Weather data came from the station's own mast, which records wind, temperature and "
    "rainfall every ten minutes throughout the year.",
]


def _p(p: float) -> str:
    return "< .001" if p < 0.001 else f"= {p:.3f}".replace("0.", ".", 1)


def _result(rng: random.Random) -> str:
    family = rng.choice(["t", "F", "chi2", "r", "z"])
    if family == "t":
        df, t = rng.randint(12, 180), rng.uniform(0.3, 4.5)
        return f"t({df}) = {t:.2f}, p {_p(2 * stats.t.sf(round(t, 2), df))}, d = {t / 6:.2f}"
    if family == "F":
        df1, df2, f = rng.randint(1, 4), rng.randint(20, 300), rng.uniform(0.6, 18.0)
        return (f"F({df1}, {df2}) = {f:.2f}, MSE = {rng.uniform(0.1, 900):.2f}, "
                f"p {_p(stats.f.sf(round(f, 2), df1, df2))}, η^{{2}}_{{p}} = "
                f"{f * df1 / (f * df1 + df2):.2f}".replace("0.", ".", 1))
    if family == "chi2":
        df, n, x = rng.randint(1, 5), rng.randint(40, 600), rng.uniform(0.5, 22.0)
        return f"χ^{{2}}({df}, N = {n}) = {x:.2f}, p {_p(stats.chi2.sf(round(x, 2), df))}"
    if family == "r":
        df, r = rng.randint(15, 300), rng.uniform(-0.55, 0.55)
        t = round(r, 2) * (df / (1 - round(r, 2) ** 2)) ** 0.5
        return (f"r({df}) = {r:.2f}".replace("0.", ".", 1)
                + f", p {_p(2 * stats.t.sf(abs(t), df))}")
    z = rng.uniform(-3.5, 3.5)
    return f"z = {z:.2f}, p {_p(2 * stats.norm.sf(abs(round(z, 2))))}"


def paragraphs(studies: int, seed: int = 7) -> list[str]:
    """An invented manuscript of `studies` studies (about 4.4 two-column pages each)."""
    rng = random.Random(seed)
    out = []
    for study in range(1, studies + 1):
        animal, sites, place = ANIMALS[study % len(ANIMALS)]

        def prose(sentences: int) -> str:
            return " ".join(rng.choice(PROSE).format(animal=animal, sites=sites, place=place)
                            for _ in range(sentences))

        out.append(f"Study {study}: {animal} at {place}")
        out.extend(prose(rng.randint(5, 8)) for _ in range(4))
        out.append("Method")
        out.extend(prose(rng.randint(5, 8)) for _ in range(4))
        out.append("Results")
        for _ in range(3):
            results = [f"In session {rng.randint(1, 40)} the groups differed, {_result(rng)}."
                       for _ in range(rng.randint(1, 3))]
            out.append(prose(3) + " " + " ".join(results) + " " + prose(2))
        out.append("Discussion")
        out.extend(prose(rng.randint(5, 8)) for _ in range(3))
    return out


def make_pdf(pages: int, folder: Path) -> tuple[Path, int]:
    """A two-column manuscript of about `pages` pages; its path and its number of pages."""
    studies = max(1, round(pages / 4.4))
    while True:
        manuscript = manuscript_pdf(paragraphs(studies),
                                    Layout(columns=2, running_head="SKERROW FIELD NOTES",
                                           page_numbers=True))
        if manuscript.pages >= pages or studies > 10 * pages:
            break
        studies += max(1, round((pages - manuscript.pages) / 4.4))
    path = folder / f"manuscript-{pages}.pdf"
    path.write_bytes(manuscript.data)
    return path, manuscript.pages


def best_of(repeats: int, functions: dict) -> dict[str, tuple[float, float]]:
    """Best wall-clock and best CPU time (of this process) of each function over `repeats`
    rounds; each round calls every function once, so that a machine that speeds up or slows
    down in between (other work on it) does not favour one of them."""
    best = {name: (float("inf"), float("inf")) for name in functions}
    for _ in range(repeats):
        for name, function in functions.items():
            start_wall, start_cpu = time.perf_counter(), time.process_time()
            function()
            wall, cpu = time.perf_counter() - start_wall, time.process_time() - start_cpu
            best[name] = (min(best[name][0], wall), min(best[name][1], cpu))
    return best


def bare_pdfium(path: Path) -> None:
    import pypdfium2

    document = pypdfium2.PdfDocument(str(path))
    for index in range(len(document)):
        page = document[index]
        text_page = page.get_textpage()
        text_page.get_text_range()
        text_page.close()
        page.close()
    document.close()


def plumber(path: Path, pages: int) -> None:
    import pdfplumber

    with pdfplumber.open(str(path)) as pdf:
        for page in pdf.pages[:pages]:
            page.extract_text()
            page.close()


MEMORY_PROBE = """
import sys, tracemalloc
from scrutiny.api import _check_unguarded
from scrutiny.patterns import load_library
load_library()
import pypdfium2

def status(field):
    with open("/proc/self/status") as lines:
        for line in lines:
            if line.startswith(field + ":"):
                return int(line.split()[1])
    return 0

# the peak resident memory so far, then reset it (Linux), so that only the check counts
before = status("VmRSS")
try:
    with open("/proc/self/clear_refs", "w") as clear:
        clear.write("5")
except OSError:
    pass
tracemalloc.start()
result = _check_unguarded(sys.argv[1], None)
current, peak = tracemalloc.get_traced_memory()
print(len(result.claims), status("VmHWM") - before, peak)
"""


def memory(path: Path) -> tuple[int, float, float]:
    """Claims, peak resident memory the check added (MB: C libraries included, Linux only) and
    peak Python heap (MB) of a fresh process that checks the PDF."""
    output = subprocess.run([sys.executable, "-c", MEMORY_PROBE, str(path)], check=True,
                            capture_output=True, text=True).stdout.split()
    claims, resident_kb, heap = int(output[0]), int(output[1]), int(output[2])
    return claims, resident_kb / 1024, heap / 2**20


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--pages", type=int, default=200)
    parser.add_argument("--plumber-pages", type=int, default=30)
    parser.add_argument("--repeats", type=int, default=3)
    args = parser.parse_args()
    load_library()  # as in a batch: the pattern library is compiled once, before the files

    with tempfile.TemporaryDirectory() as folder:
        start = time.perf_counter()
        path, pages = make_pdf(args.pages, Path(folder))
        small, small_pages = make_pdf(50, Path(folder)) if args.pages > 50 else (path, pages)
        print(f"generated {pages} pages ({path.stat().st_size / 2**20:.1f} MB) and "
              f"{small_pages} pages in {time.perf_counter() - start:.1f} s")
        document = read_document(path)
        claims = check_document(document).claims
        print(f"{len(claims)} results found ({len(claims) / pages:.1f} per page); "
              f"notes: {'; '.join(document.notes) or 'none'}")
        del document

        plumber_pages = min(args.plumber_pages, pages)
        best = best_of(args.repeats, {
            "bare": lambda: bare_pdfium(path),
            "read": lambda: read_document(path),
            "check": lambda: check_document(read_document(path)),
            "child": lambda: check_file(path),
        })
        plumber_wall, plumber_cpu = best_of(1, {"plumber": lambda: plumber(path, plumber_pages)})[
            "plumber"]
        rows = [
            ("pypdfium2 text, bare", pages, *best["bare"]),
            ("pdfplumber extract_text()", plumber_pages, plumber_wall, plumber_cpu),
            ("scrutiny: read the PDF only", pages, *best["read"]),
            ("scrutiny: whole check, in process", pages, *best["check"]),
            ("scrutiny check_file (guarded child)", pages, best["child"][0], None),
        ]
        bare_wall, bare_cpu = best["bare"]
        check_wall, check_cpu = best["check"]
        print(f"\n{'step':38} {'pages':>5} {'wall s':>8} {'pages/s':>8} {'cpu s':>8} "
              f"{'pages/s':>8}")
        for name, count, wall, cpu in rows:
            cpu_text = f"{cpu:8.3f} {count / cpu:8.1f}" if cpu else f"{'-':>8} {'-':>8}"
            print(f"{name:38} {count:5d} {wall:8.3f} {count / wall:8.1f} {cpu_text}")
        print(f"\nwhole check / bare pypdfium2 text: {check_wall / bare_wall:.2f}x wall, "
              f"{check_cpu / bare_cpu:.2f}x CPU (target: 1.5x)")

        print("\npeak memory of a fresh process checking the PDF (after imports):")
        for probe, count in ((small, small_pages), (path, pages)):
            claims, resident, heap = memory(probe)
            print(f"  {count:4d} pages: {claims:5d} results, resident +{resident:6.1f} MB, "
                  f"Python heap peak {heap:6.1f} MB ({heap * 1024 / count:.0f} kB a page)")


if __name__ == "__main__":
    main()
