"""A screening's results in an SQLite file: one row per document, written as soon as it is done.

A document is identified by the SHA-256 of its bytes together with the settings and the
scrutiny version that checked it, so that a screening resumes where it stopped (documents
already stored are not checked again), a renamed or copied file is recognised, and a change of
settings or version checks everything anew. The row holds the document's result as the JSON of
the report (schema 1), so the store is readable without scrutiny.
"""

from __future__ import annotations

import hashlib
import json
import sqlite3
from dataclasses import dataclass
from datetime import datetime, timezone
from typing import Iterator

from .. import __version__
from ..errors import ScrutinyError
from ..model import Settings

_SCHEMA = """
CREATE TABLE IF NOT EXISTS documents (
    sha256     TEXT NOT NULL,
    settings   TEXT NOT NULL,
    version    TEXT NOT NULL,
    path       TEXT NOT NULL,
    checked_at TEXT NOT NULL,
    readable   INTEGER NOT NULL,
    result     TEXT NOT NULL,
    PRIMARY KEY (sha256, settings, version)
);
CREATE INDEX IF NOT EXISTS documents_by_path ON documents (path);
"""


class StoreError(ScrutinyError):
    """The screening store cannot be opened or written."""


def settings_key(settings: Settings) -> str:
    """The settings as canonical JSON: screenings with equal keys may share results."""
    return json.dumps(settings.as_dict(), sort_keys=True)


def file_digest(path: str) -> str:
    digest = hashlib.sha256()
    with open(path, "rb") as handle:
        for block in iter(lambda: handle.read(1 << 20), b""):
            digest.update(block)
    return digest.hexdigest()


@dataclass(frozen=True)
class StoredDocument:
    path: str
    sha256: str
    readable: bool
    result: dict


class Store:
    """The SQLite file of one screening (created if missing)."""

    def __init__(self, path: str) -> None:
        self.path = path
        try:
            self._connection = sqlite3.connect(path, timeout=30)
            self._connection.execute("PRAGMA journal_mode=WAL")
            self._connection.executescript(_SCHEMA)
        except sqlite3.Error as exc:
            raise StoreError(f"{path}: cannot be used as a screening store ({exc})") from None

    def close(self) -> None:
        self._connection.close()

    def __enter__(self) -> "Store":
        return self

    def __exit__(self, *exc_info) -> None:
        self.close()

    def has(self, sha256: str, settings: str) -> bool:
        row = self._connection.execute(
            "SELECT 1 FROM documents WHERE sha256 = ? AND settings = ? AND version = ?",
            (sha256, settings, __version__)).fetchone()
        return row is not None

    def add(self, path: str, sha256: str, settings: str, result: dict) -> None:
        """Store one document's result and commit at once (a crash loses nothing done)."""
        try:
            with self._connection:
                self._connection.execute(
                    "INSERT OR REPLACE INTO documents VALUES (?, ?, ?, ?, ?, ?, ?)",
                    (sha256, settings, __version__, path,
                     datetime.now(timezone.utc).isoformat(timespec="seconds"),
                     int(not result.get("errors")), json.dumps(result, ensure_ascii=False)))
        except sqlite3.Error as exc:
            raise StoreError(f"{self.path}: cannot be written ({exc})") from None

    def documents(self, settings: str | None = None) -> Iterator[StoredDocument]:
        """Every stored document (of one settings key, if given), in path order."""
        query = "SELECT path, sha256, readable, result FROM documents"
        parameters: tuple = ()
        if settings is not None:
            query += " WHERE settings = ? AND version = ?"
            parameters = (settings, __version__)
        for path, sha256, readable, result in self._connection.execute(
                query + " ORDER BY path", parameters):
            yield StoredDocument(path, sha256, bool(readable), json.loads(result))

    def settings_keys(self) -> list[str]:
        return [row[0] for row in self._connection.execute(
            "SELECT DISTINCT settings FROM documents WHERE version = ?", (__version__,))]
