"""The library API: wires ingest -> extract -> recompute -> check for one or many inputs.

This is the only module the CLI calls; everything the CLI does is reachable from here:

    >>> import scrutiny
    >>> result = scrutiny.check_text("The groups differed, t(28) = 2.20, p = .01.")
    >>> [flag.check for claim in result.claims for flag in claim.flags]
    ['p-mismatch']
"""

from __future__ import annotations

import functools
import os
import sys
from dataclasses import dataclass
from pathlib import Path
from typing import BinaryIO, Iterable

from .check import Context, run_checks, verdict
from .errors import InputError
from .extract import find_claims
from .patterns import load_library
from .ingest import (
    document_from_bytes,
    document_from_text,
    head_needs_guard,
    needs_guard,
    manuscript_suffixes,
    read_document,
)
from .ingest.guard import run_guarded
from .model import ClaimResult, Document, DocumentResult, Run, Settings, Skipped
from .recompute import recompute

#: the name under which standard input is reported
STDIN = "-"
#: inputs larger than this are refused with a message instead of being read into memory
MAX_INPUT_BYTES = 512 * 1024 * 1024


def check_document(document: Document, settings: Settings | None = None) -> DocumentResult:
    """Find, recompute and check every result in an already ingested Document."""
    settings = settings or Settings()
    claims = find_claims(document)
    context = Context(path=document.path, claims=tuple(claims))
    results = []
    for number, claim in enumerate(claims, start=1):
        recomputed = recompute(claim, settings)
        flags = run_checks(claim, recomputed, context, settings)
        status, reason = verdict(claim, recomputed, flags)
        results.append(ClaimResult(id=f"c{number}", claim=claim, recomputed=recomputed,
                                   flags=flags, status=status, reason=reason))
    return DocumentResult(path=document.path, format=document.format, claims=tuple(results),
                          encoding=document.encoding, pages=document.pages, notes=document.notes)


def check_text(text: str, settings: Settings | None = None, path: str = "<text>") -> DocumentResult:
    """Check a manuscript given as a string."""
    return check_document(document_from_text(text, path=path), settings)


def check_file(path: str | os.PathLike[str], settings: Settings | None = None) -> DocumentResult:
    """Check one manuscript file; raises `InputError` if it cannot be read as one."""
    name = os.fspath(path)
    try:
        size = os.path.getsize(name)
    except OSError:
        size = 0  # read_document reports the real problem
    if size > MAX_INPUT_BYTES:
        raise InputError(name, f"too large ({size / 2**20:,.0f} MB; the limit is "
                               f"{MAX_INPUT_BYTES / 2**20:,.0f} MB)")
    # Plain text is decoded here; every other format is parsed (and checked) in a child process
    # with a time and memory ceiling, so that a hostile or broken file cannot hang or sink the
    # batch.
    if needs_guard(name):
        settings = settings or Settings()
        return run_guarded(name, functools.partial(_check_unguarded, name, settings),
                           time_limit=settings.time_limit,
                           memory_limit=settings.memory_limit_mb * 2**20)
    return _check_unguarded(name, settings)


def _check_unguarded(path: str, settings: Settings | None) -> DocumentResult:
    return check_document(read_document(path), settings)


def check_stream(stream: BinaryIO, settings: Settings | None = None,
                 path: str = "<stdin>") -> DocumentResult:
    """Check a manuscript read from a binary stream (standard input)."""
    data = stream.read(MAX_INPUT_BYTES + 1)
    if len(data) > MAX_INPUT_BYTES:
        raise InputError(path, "too large for standard input")
    work = functools.partial(_check_bytes, data, path, settings)
    if head_needs_guard(data):
        settings = settings or Settings()
        return run_guarded(path, work, time_limit=settings.time_limit,
                           memory_limit=settings.memory_limit_mb * 2**20)
    return work()


def _check_bytes(data: bytes, path: str, settings: Settings | None) -> DocumentResult:
    return check_document(document_from_bytes(data, path), settings)


def collect_inputs(paths: Iterable[str]) -> tuple[list[str], list[Skipped]]:
    """Expand folders (recursively, in sorted order) into manuscript files.

    Returns `(inputs, skipped)`: files named explicitly are always inputs (their content
    decides their format). Inside folders, files whose extension is not a manuscript format,
    hidden files and folders (".git", ".DS_Store"; a folder is not entered) and LaTeX files that
    another LaTeX manuscript of the folder reads with \\input (they are checked as part of it)
    are listed in `skipped` with the reason, so that the summary can count them: nothing is
    passed over silently.
    """
    inputs: list[str] = []
    skipped: list[Skipped] = []
    found_in_folders: set[str] = set()
    seen: set[str] = set()
    suffixes = manuscript_suffixes()

    def add(name: str, in_folder: bool) -> None:
        key = name if name == STDIN else os.path.normpath(name)
        if key not in seen:
            seen.add(key)
            inputs.append(name)
            if in_folder:
                found_in_folders.add(name)

    for name in paths:
        if name != STDIN and os.path.isdir(name):
            for folder, subfolders, files in os.walk(name):
                skipped.extend(Skipped(os.path.join(folder, d), "hidden")
                               for d in sorted(subfolders) if d.startswith("."))
                subfolders[:] = sorted(d for d in subfolders if not d.startswith("."))
                for file_name in sorted(files):
                    full = os.path.join(folder, file_name)
                    if file_name.startswith("."):
                        skipped.append(Skipped(full, "hidden"))
                    elif Path(file_name).suffix.lower() in suffixes:
                        add(full, in_folder=True)
                    else:
                        skipped.append(Skipped(full, "not a manuscript format"))
        else:
            add(name, in_folder=False)
    return _without_latex_parts(inputs, skipped, found_in_folders)


def _without_latex_parts(inputs: list[str], skipped: list[Skipped],
                         found_in_folders: set[str]) -> tuple[list[str], list[Skipped]]:
    """Move LaTeX files that another input reads with \\input from `inputs` to `skipped`."""
    from .ingest.latex import input_files

    main_files = [name for name in inputs if name.lower().endswith(".tex")]
    part_of: dict[str, str] = {}
    for main in main_files:
        for part in input_files(main):
            part_of.setdefault(os.path.realpath(part), main)
    kept = []
    for name in inputs:
        main = part_of.get(os.path.realpath(name)) if name in found_in_folders else None
        if main is not None and os.path.realpath(main) != os.path.realpath(name):
            skipped.append(Skipped(name, f"part of {main}"))
        else:
            kept.append(name)
    return kept, skipped


def check_paths(paths: Iterable[str], settings: Settings | None = None,
                stdin: BinaryIO | None = None) -> Run:
    """Check files, folders (recursed) and "-" (standard input); one bad input never stops
    the others."""
    settings = settings or Settings()
    inputs, skipped = collect_inputs(paths)
    load_library()  # compile the patterns once, before the per-file child processes fork
    documents = tuple(_check_one(name, settings, stdin) for name in inputs)
    return Run(settings=settings, documents=documents, skipped=tuple(skipped))


def _check_one(name: str, settings: Settings, stdin: BinaryIO | None) -> DocumentResult:
    try:
        if name == STDIN:
            return check_stream(stdin or sys.stdin.buffer, settings)
        return check_file(name, settings)
    except InputError as exc:
        return DocumentResult(path=exc.path, format=None, errors=(exc.reason,))
    except MemoryError:
        return DocumentResult(path=name, format=None, errors=("not enough memory to check it",))
    except Exception as exc:  # a bug must not stop the batch or show a traceback
        return DocumentResult(path=name, format=None,
                              errors=(f"internal error while checking ({type(exc).__name__}: "
                                      f"{exc}); please report it",))


@dataclass(frozen=True)
class AnnotatedCopy:
    """One annotated copy of a manuscript that `annotate` wrote, or why it could not."""

    path: str                 # the manuscript
    target: str               # the copy
    marked: int = 0           # flagged results highlighted (PDF) or commented (Word)
    missed: int = 0           # flagged results that could not be marked in the text
    error: str | None = None  # one line, when the copy was not written


def annotate(run: Run, folder: str, settings: Settings | None = None
             ) -> tuple[AnnotatedCopy, ...]:
    """Write annotated copies of the PDF and Word documents of `run` that have flags into
    `folder` (created if missing): `NAME.scrutiny.pdf` with highlights, `NAME.scrutiny.docx`
    with comments (see `report.annotate`). Each copy is written in a child process with the
    settings' time and memory ceilings; one that fails is reported and the others are still
    written. The manuscripts are only read."""
    from .report.annotate import annotate_docx, annotate_pdf

    settings = settings or run.settings
    flagged = [document for document in run.documents
               if document.format in ("pdf", "docx")
               and any(result.flags for result in document.claims)]
    if flagged:
        os.makedirs(folder, exist_ok=True)
    copies = []
    used: set[str] = set()
    for document in flagged:
        suffix = ".scrutiny.pdf" if document.format == "pdf" else ".scrutiny.docx"
        stem = os.path.splitext(os.path.basename(document.path))[0]
        name, count = stem + suffix, 2
        while name in used:  # two inputs of the same name from different folders
            name, count = f"{stem}-{count}{suffix}", count + 1
        used.add(name)
        target = os.path.join(folder, name)
        if not os.path.isfile(document.path):
            copies.append(AnnotatedCopy(document.path, target, error=(
                f"{document.path}: read from standard input, so there is no file to copy; "
                f"save it as a file to annotate it")))
            continue
        write = annotate_pdf if document.format == "pdf" else annotate_docx
        try:
            done = run_guarded(document.path, functools.partial(write, document, target),
                               settings.time_limit, settings.memory_limit_mb * 2**20)
        except InputError as exc:
            copies.append(AnnotatedCopy(document.path, target, error=str(exc)))
            continue
        marked, missed = done
        copies.append(AnnotatedCopy(document.path, target, marked, missed))
    return tuple(copies)
