"""Exceptions that know how to describe themselves to a user in one line.

Library code raises these; only the CLI (and `api`, for per-file errors that must not stop a
batch) turns them into messages. Every message names what went wrong and, where it helps, what to
do next.
"""

from __future__ import annotations


class ScrutinyError(Exception):
    """Base class; `str(exc)` is the one-line message for the user."""

    exit_code = 2


class InputError(ScrutinyError):
    """An input file could not be read as a manuscript (the run goes on with the others)."""

    def __init__(self, path: str, reason: str) -> None:
        super().__init__(f"{path}: {reason}")
        self.path = path
        self.reason = reason


class UsageError(ScrutinyError):
    """The command line or the settings are not usable."""
