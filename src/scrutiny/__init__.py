"""scrutiny: check the statistics reported in scientific manuscripts.

    >>> import scrutiny
    >>> result = scrutiny.check_text("t(28) = 2.20, p = .01")
    >>> result.claims[0].status.value
    'inconsistent'

The stages are modules of their own (`ingest`, `extract`, `recompute`, `check`, `report`); this
package re-exports the library API from `scrutiny.api` and the records from `scrutiny.model`.
"""

__version__ = "0.1.0"

from .api import (AnnotatedCopy, annotate, check_document, check_file, check_paths,
                  check_stream, check_text)
from .errors import InputError, ScrutinyError, UsageError
from .report import CAUTION
from .model import (
    Claim,
    ClaimResult,
    Document,
    DocumentResult,
    Flag,
    PValue,
    Recomputed,
    Run,
    Settings,
    Severity,
    Status,
)

__all__ = [
    "AnnotatedCopy",
    "CAUTION",
    "Claim",
    "ClaimResult",
    "Document",
    "DocumentResult",
    "Flag",
    "InputError",
    "PValue",
    "Recomputed",
    "Run",
    "ScrutinyError",
    "Settings",
    "Severity",
    "Status",
    "UsageError",
    "__version__",
    "annotate",
    "check_document",
    "check_file",
    "check_paths",
    "check_stream",
    "check_text",
]
