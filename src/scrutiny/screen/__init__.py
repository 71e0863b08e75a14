"""screen: check many documents (a journal issue, a corpus), in parallel, resumably.

The screen runs the same pipeline as `scrutiny check`, one document per task, on local worker
processes or on a Dask cluster, and stores each document's result in an SQLite file as soon as
it is done (`store.py`). Run again on the same store, it checks only what is not stored yet for
the same settings and version: an interrupted screening resumes. `summarise` reads a store and
gives the corpus view: how many results and flags, and the tests for selective reporting
(`corpus.py`: p-curve and caliper).
"""

from __future__ import annotations

import concurrent.futures
import multiprocessing
import os
from dataclasses import dataclass, field
from typing import Callable, Iterable

from ..api import collect_inputs
from ..errors import UsageError
from ..model import Settings
from ..patterns import load_library
from ..rounding import UnreadableNumber, parse_printed
from .corpus import Caliper, PCurve, caliper_tests, harmonise, p_curve
from .store import Store, StoredDocument, StoreError, file_digest, settings_key

Progress = Callable[[int, int, str, dict], None]


def check_to_json(path: str, settings: Settings) -> dict:
    """Check one file and return its report as JSON-ready data (runs in a worker)."""
    from ..api import check_paths
    from ..report.json import document_json

    [document] = check_paths([path], settings=settings).documents
    return document_json(document)


@dataclass(frozen=True)
class Screening:
    """What one run of `screen` did."""

    store: str
    checked: int          # documents checked in this run
    already_stored: int   # documents found in the store and not checked again
    unreadable: int       # documents of this run that could not be read
    skipped: int          # files found in folders that are not manuscripts


def _local_executor(workers: int | None):
    context = multiprocessing.get_context("fork") if hasattr(os, "fork") else None
    return concurrent.futures.ProcessPoolExecutor(max_workers=workers or os.cpu_count(),
                                                  mp_context=context)


def screen(paths: Iterable[str], store_path: str, settings: Settings | None = None, *,
           workers: int | None = None, scheduler: str | None = None, resume: bool = True,
           progress: Progress | None = None) -> Screening:
    """Check every manuscript under `paths` into the store at `store_path`.

    `workers` local processes (default: one per core), or the Dask cluster at `scheduler`
    ("tcp://host:8786", or "local" for a cluster on this machine; needs dask.distributed and
    scrutiny on every worker). With `resume`, documents already stored for these settings and
    this version are not checked again.
    """
    settings = settings or Settings()
    inputs, skipped = collect_inputs(paths)
    if "-" in inputs:
        raise UsageError("a screening reads files and folders, not standard input")
    key = settings_key(settings)
    load_library()  # compiled once in the parent, inherited by forked workers
    with Store(store_path) as store:
        pending: list[tuple[str, str]] = []
        already = 0
        for path in inputs:
            try:
                digest = file_digest(path)
            except OSError:
                digest = f"unreadable:{path}"
            if resume and store.has(digest, key):
                already += 1
            else:
                pending.append((path, digest))
        done = unreadable = 0
        for path, digest, result in _run(pending, settings, workers, scheduler):
            store.add(path, digest, key, result)
            done += 1
            unreadable += bool(result.get("errors"))
            if progress is not None:
                progress(done, len(pending), path, result)
    return Screening(store_path, done, already, unreadable, len(skipped))


def _run(pending: list[tuple[str, str]], settings: Settings, workers: int | None,
         scheduler: str | None):
    """(path, digest, result) for every pending document, in the order they finish."""
    if not pending:
        return
    if scheduler:
        yield from _run_on_dask(pending, settings, workers, scheduler)
        return
    if workers == 1:
        for path, digest in pending:
            yield path, digest, _safely(path, settings)
        return
    with _local_executor(workers) as executor:
        futures = {executor.submit(check_to_json, path, settings): (path, digest)
                   for path, digest in pending}
        for future in concurrent.futures.as_completed(futures):
            path, digest = futures[future]
            yield path, digest, _result_of(future, path)


def _safely(path: str, settings: Settings) -> dict:
    try:
        return check_to_json(path, settings)
    except Exception as exc:  # never lose the rest of a screening to one document
        return _failed(path, exc)


def _result_of(future, path: str) -> dict:
    try:
        return future.result()
    except Exception as exc:
        return _failed(path, exc)


def _failed(path: str, exc: BaseException) -> dict:
    return {"path": path, "format": None, "encoding": None, "pages": None,
            "errors": [f"the worker failed ({type(exc).__name__}: {exc})"], "notes": [],
            "claims": []}


def _run_on_dask(pending: list[tuple[str, str]], settings: Settings, workers: int | None,
                 scheduler: str):
    try:
        from distributed import Client, LocalCluster, as_completed
    except ImportError:
        raise UsageError("a Dask cluster needs dask.distributed: pip install 'scrutiny[cluster]'"
                         ) from None
    cluster = None
    try:
        if scheduler == "local":
            cluster = LocalCluster(n_workers=workers or os.cpu_count(), threads_per_worker=1,
                                   processes=True, dashboard_address=None)
            client = Client(cluster)
        else:
            client = Client(scheduler, timeout="30s")
    except (OSError, TimeoutError) as exc:
        raise UsageError(f"cannot reach the Dask scheduler at {scheduler} ({exc})") from None
    try:
        futures = {}
        for path, digest in pending:
            future = client.submit(check_to_json, path, settings, pure=False)
            futures[future] = (path, digest)
        for future in as_completed(list(futures)):
            path, digest = futures[future]
            yield path, digest, _result_of(future, path)
    finally:
        client.close()
        if cluster is not None:
            cluster.close()


# -- the corpus view -------------------------------------------------------------------------

TEST_FAMILIES = ("t", "F", "chi2", "r", "z")


@dataclass(frozen=True)
class DocumentTally:
    """One document of a screening, counted: where a reader of the summary should look first."""

    path: str
    claims: int
    inconsistent: int
    decision_flips: int
    errors: int                               # flags of severity error
    warnings: int                             # flags of severity warning
    unreadable: bool = False


@dataclass(frozen=True)
class CorpusSummary:
    """A screening seen as a whole."""

    store: str
    documents: int
    unreadable: int
    claims: int
    test_results: int
    status: dict[str, int]
    flags: dict[str, int]                     # check id -> number of flags
    documents_flagged: dict[str, int]         # check id -> documents with at least one
    p_curve: PCurve
    calipers: list[Caliper]
    settings: str | None = None
    notes: list[str] = field(default_factory=list)
    #: every document with a flag or that could not be read, most errors first
    documents_to_look_at: list[DocumentTally] = field(default_factory=list)


def _screening(store_path: str, settings: Settings | None) -> tuple[str | None,
                                                                    list[StoredDocument]]:
    """The settings key and the documents of one screening in a store: of the given settings,
    else of the only settings the store holds."""
    if not os.path.exists(store_path):
        raise StoreError(f"{store_path}: no such screening store")
    with Store(store_path) as store:
        keys = store.settings_keys()
        if settings is not None:
            key = settings_key(settings)
        elif len(keys) <= 1:
            key = keys[0] if keys else None
        else:
            raise UsageError(f"{store_path} holds screenings with {len(keys)} different settings;"
                             " give the settings of the one to summarise")
        return key, (list(store.documents(key)) if key is not None else [])


def stored_documents(store_path: str, settings: Settings | None = None) -> list[StoredDocument]:
    """The documents of one screening in a store, in path order, each with its report as JSON
    data (schema 1)."""
    return _screening(store_path, settings)[1]


def summarise(store_path: str, settings: Settings | None = None) -> CorpusSummary:
    """The corpus view of a store (of one settings key: the given one, else the only one)."""
    key, documents = _screening(store_path, settings)
    status: dict[str, int] = {}
    flags: dict[str, int] = {}
    flagged_documents: dict[str, int] = {}
    harmonised, p_values = [], []
    claims = tests = 0
    tallies = []
    for document in documents:
        seen: set[str] = set()
        severities: dict[str, int] = {}
        for claim in document.result.get("claims", []):
            claims += 1
            status[claim["status"]] = status.get(claim["status"], 0) + 1
            for flag in claim["flags"]:
                flags[flag["check"]] = flags.get(flag["check"], 0) + 1
                seen.add(flag["check"])
                severities[flag["severity"]] = severities.get(flag["severity"], 0) + 1
            if claim["test"] not in TEST_FAMILIES:
                continue
            tests += 1
            result = _harmonised(claim)
            if result is not None:
                harmonised.append(result)
                p_values.append(result.p)
        for check_id in seen:
            flagged_documents[check_id] = flagged_documents.get(check_id, 0) + 1
        document_claims = document.result.get("claims", [])
        if seen or not document.readable:
            tallies.append(DocumentTally(
                path=document.path,
                claims=len(document_claims),
                inconsistent=sum(1 for c in document_claims if c["status"] == "inconsistent"),
                decision_flips=sum(1 for c in document_claims
                                   if any(f["check"] == "decision-flip" for f in c["flags"])),
                errors=severities.get("error", 0),
                warnings=severities.get("warning", 0),
                unreadable=not document.readable))
    notes = ["p-curve and the caliper test use every single test result found (bounds "
             "excluded); p-curve assumes independent results, one per study and hypothesis, "
             "which a screen cannot verify."]
    return CorpusSummary(
        store=store_path,
        documents=len(documents),
        unreadable=sum(1 for d in documents if not d.readable),
        claims=claims,
        test_results=tests,
        status=status,
        flags=dict(sorted(flags.items())),
        documents_flagged=dict(sorted(flagged_documents.items())),
        p_curve=p_curve(harmonised),
        calipers=caliper_tests(p_values),
        settings=key,
        notes=notes,
        documents_to_look_at=sorted(tallies, key=lambda t: (-t.decision_flips, -t.errors,
                                                            -t.warnings, t.path)),
    )


def _harmonised(claim: dict):
    if claim["statistic_comparator"] != "=" or claim["aggregate"]:
        return None
    df = tuple(float(d) for d in claim["df"])
    needed = {"t": 1, "F": 2, "chi2": 1, "r": 1, "z": 0}[claim["test"]]
    if len(df) < needed or any(d <= 0 for d in df):
        return None
    try:
        statistic = parse_printed(claim["statistic"]).value
    except UnreadableNumber:
        return None
    if claim["test"] in ("F", "chi2") and statistic < 0:
        return None
    return harmonise(claim["test"], statistic, df)


__all__ = ["CorpusSummary", "DocumentTally", "Screening", "StoredDocument", "check_to_json", "screen",
           "stored_documents", "summarise"]
