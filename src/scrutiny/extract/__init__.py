"""extract: find every reported result (a `Claim`) in a `Document`.

* `statistics`: test results (t, F, chi-square, r, z) with their df, p-value, effect size and the
  words around them;
* `estimates`: descriptive statistics (means with SD and n, percentages with their base),
  estimates with confidence intervals and regression coefficients with standard errors;
* `tables`: results printed across the cells of a row of a table of results (Word, HTML, JATS);
* `context`: sentences, paragraphs and the cue words both read.

`find_claims(document)` returns all of them in the order of the text.
"""

from __future__ import annotations

from ..model import Claim, Document
from ..patterns import Library, load_library
from .context import Boundaries
from .estimates import with_estimates
from .tables import find_table_results
from .statistics import PARAGRAPH_REACH, WINDOW, find_test_results, statistic_heads


def find_claims(document: Document, library: Library | None = None) -> list[Claim]:
    """Every reported result in `document`, in the order of the text."""
    library = library or load_library()
    boundaries = Boundaries.of(document.normalised, library)
    claims = with_estimates(document, library, boundaries,
                            find_test_results(document, library, boundaries))
    claims += find_table_results(document, library, claims)
    claims.sort(key=lambda claim: (claim.location.start, claim.location.end))
    return claims


__all__ = ["PARAGRAPH_REACH", "WINDOW", "find_claims", "statistic_heads"]
