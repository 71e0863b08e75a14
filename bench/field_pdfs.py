"""Check the field PDFs and compare the results found with the counts expected.

    python bench/field_pdfs.py                      # ../shared/field-pdfs next to the checkout
    python bench/field_pdfs.py FOLDER --expected bench/field-pdfs-expected.toml

The field PDFs are real manuscripts kept outside the repository (their folder's MANIFEST.md
says where they come from). For each PDF this prints its pages, the results found per test
family, the status counts, the notes of the PDF reader and the time of the whole check (as
`scrutiny check` does it: in a child process with the time and memory ceilings), and whether
the results per family equal the counts recorded in `field-pdfs-expected.toml`, which were
made by reading the PDFs. Exits with 1 if any file differs.
"""

from __future__ import annotations

import argparse
import sys
import time
from collections import Counter
from pathlib import Path

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

from scrutiny import check_file
from scrutiny.errors import InputError
from scrutiny.ingest import read_document
from scrutiny.patterns import load_library

ROOT = Path(__file__).resolve().parents[1]
DEFAULT_FOLDER = ROOT.parent / "shared" / "field-pdfs"
DEFAULT_EXPECTED = Path(__file__).resolve().parent / "field-pdfs-expected.toml"


def _families(counts: Counter) -> str:
    return ", ".join(f"{family} {count}" for family, count in sorted(counts.items())) or "none"


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("folder", nargs="?", type=Path, default=DEFAULT_FOLDER)
    parser.add_argument("--expected", type=Path, default=DEFAULT_EXPECTED)
    parser.add_argument("--notes", action="store_true", help="print the PDF reader's notes")
    args = parser.parse_args()
    expected = tomllib.loads(args.expected.read_text(encoding="utf-8"))
    paths = sorted(args.folder.glob("*.pdf"))
    if not paths:
        print(f"no PDFs in {args.folder}")
        return 1
    load_library()  # compiled once here, not in every child process that checks a file
    failures = 0
    total_pages = 0
    total_time = 0.0
    for path in paths:
        start = time.perf_counter()
        try:
            result = check_file(path)
        except InputError as exc:
            print(f"{path.name}: cannot be read: {exc.reason}")
            failures += 1
            continue
        elapsed = time.perf_counter() - start
        total_pages += result.pages or 0
        total_time += elapsed
        families = Counter(claim.claim.test for claim in result.claims)
        statuses = Counter(claim.status.value for claim in result.claims)
        want = expected.get(path.name)
        if want is None:
            verdict = "no expected counts"
        elif (dict(families) == want["results"] and result.pages == want["pages"]):
            verdict = "as expected"
        else:
            verdict = (f"DIFFERS: expected {want['pages']} pages, "
                       f"{_families(Counter(want['results']))}")
            failures += 1
        print(f"{path.name}: {result.pages} pages, {len(result.claims)} results "
              f"({_families(families)}); {_families(statuses)}; {elapsed:.2f} s; {verdict}")
        if args.notes:
            for note in read_document(path).notes:
                print(f"    note: {note}")
    for name in sorted(set(expected) - {path.name for path in paths}):
        print(f"{name}: expected but not found in {args.folder}")
        failures += 1
    print(f"{len(paths)} files, {total_pages} pages in {total_time:.2f} s; "
          f"{'all as expected' if not failures else f'{failures} differ'}")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
