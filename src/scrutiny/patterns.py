"""Load the pattern library in `patterns/` and compile it once.

Patterns are data: TOML files with one `[[pattern]]` table per pattern (id, kind, test,
regex, must_match, must_not_match) and `[fragments]` tables of shared pieces that a regex uses
as `<<name>>`. In a checkout they live in the top-level `patterns/` folder; an installed wheel
carries the same files as `scrutiny/patterns`. `load_library()` is the only entry point.
"""

from __future__ import annotations

import functools
import sys
from dataclasses import dataclass, field
from pathlib import Path

import regex

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover - exercised on Python 3.10 only
    import tomli as tomllib

#: kinds of pattern the extractor uses, in the order it uses them
KINDS = ("statistic", "not-a-result", "other-test", "p-value", "not-significant", "df",
         "sample-size", "group-size", "printed-effect", "tails-one", "tails-two", "design-within",
         "design-between", "descriptive", "proportion", "interval-estimate", "coefficient",
         "integer-cue", "item-count", "se-cue", "weighted-cue", "total-sample", "table-column")
#: what a table column may hold (patterns of kind "table-column")
TABLE_ROLES = ("statistic", "df", "p", "n", "coefficient", "se", "estimate", "interval",
               "estimate-interval")

_FRAGMENT = regex.compile(r"<<([a-z_]+)>>")
_FLAGS = regex.VERBOSE | regex.VERSION0


class PatternError(ValueError):
    """A pattern file is malformed; the message names the file and the pattern."""


@dataclass(frozen=True)
class Pattern:
    id: str
    kind: str
    test: str | None
    source: str
    compiled: regex.Pattern
    file: str
    #: a statistic found by this pattern counts only when a p-value (or "ns") follows it
    needs_p: bool = False
    must_match: tuple[str, ...] = ()
    must_not_match: tuple[str, ...] = ()
    #: printed-effect patterns: which effect size they read (d, g, eta2, eta2_partial, ...)
    measure: str | None = None
    #: table-column patterns: what the column holds (one of TABLE_ROLES)
    role: str | None = None
    #: words of which every match contains at least one; when given, a whole-text search looks
    #: only near them (a test checks the examples against them). Lower-case ASCII keywords are
    #: found in any case; others ("SE", "±") exactly as written
    keywords: tuple[str, ...] = ()


@dataclass(frozen=True)
class Library:
    """All patterns, and per kind one combined regex over its patterns (in file order)."""

    patterns: tuple[Pattern, ...]
    by_kind: dict[str, tuple[Pattern, ...]]
    scanners: dict[str, regex.Pattern]
    #: per kind, the number of the group that wraps each pattern's branch in the scanner
    branch_groups: dict[str, tuple[int, ...]]
    #: each pattern by the id of its own compiled regex
    by_regex: dict[int, Pattern] = field(default_factory=dict)

    def of_kind(self, kind: str) -> tuple[Pattern, ...]:
        return self.by_kind[kind]

    def scanner(self, kind: str) -> regex.Pattern:
        return self.scanners[kind]

    def matched_pattern(self, kind: str, match: regex.Match) -> Pattern:
        """Which pattern of `kind` produced a match of `scanner(kind)` (or of one pattern's own
        regex, as `find_all` returns them)."""
        own = self.by_regex.get(id(match.re))
        if own is not None and own.kind == kind:
            return own
        groups = match.groups()
        for pattern, group in zip(self.by_kind[kind], self.branch_groups[kind]):
            if groups[group - 1] is not None:
                return pattern
        raise LookupError("match does not come from this scanner")


def patterns_folder() -> Path:
    """Where the pattern files are: inside the installed package, else in the checkout."""
    packaged = Path(__file__).resolve().parent / "patterns"
    if packaged.is_dir():
        return packaged
    checkout = Path(__file__).resolve().parents[2] / "patterns"
    if checkout.is_dir():
        return checkout
    raise PatternError(f"pattern folder not found (looked in {packaged} and {checkout})")


def _expand(source: str, fragments: dict[str, str], where: str, depth: int = 0) -> str:
    if depth > 10:
        raise PatternError(f"{where}: fragments nest too deeply (a fragment uses itself?)")

    def substitute(match: regex.Match) -> str:
        name = match.group(1)
        if name not in fragments:
            raise PatternError(f"{where}: unknown fragment <<{name}>>")
        return "(?:" + _expand(fragments[name], fragments, where, depth + 1) + ")"

    return _FRAGMENT.sub(substitute, source)


def _keyword(word: str, where: str) -> str:
    """A keyword as the pattern file gives it: lower-case ASCII is matched in any case, anything
    else (capitals, symbols such as "±") exactly as written."""
    if not word.strip():
        raise PatternError(f"{where}: an empty keyword")
    return word


def _combine(patterns: tuple[Pattern, ...]) -> regex.Pattern:
    # Each alternative is wrapped in a group named after its position so that the extractor can
    # tell which pattern matched; `regex` allows the same group name (df1, ...) in every branch.
    branches = [f"(?P<_{i}>{p.source})" for i, p in enumerate(patterns)]
    return regex.compile("|".join(branches), _FLAGS)


def _read(folder: Path) -> tuple[list[tuple[str, dict]], dict[str, str]]:
    documents = []
    fragments: dict[str, str] = {}
    for path in sorted(folder.glob("*.toml")):
        try:
            data = tomllib.loads(path.read_text(encoding="utf-8"))
        except (OSError, tomllib.TOMLDecodeError) as exc:
            raise PatternError(f"{path.name}: {exc}") from None
        for name, value in data.get("fragments", {}).items():
            if name in fragments:
                raise PatternError(f"{path.name}: fragment {name!r} is defined twice")
            fragments[name] = value
        documents.append((path.name, data))
    return documents, fragments


@functools.lru_cache(maxsize=None)
def load_library(folder: str | None = None) -> Library:
    """Read, expand and compile every pattern; cached, so the work happens once per process."""
    documents, fragments = _read(Path(folder) if folder else patterns_folder())
    patterns: list[Pattern] = []
    seen: set[str] = set()
    for file_name, data in documents:
        for entry in data.get("pattern", []):
            pattern_id = entry.get("id")
            where = f"{file_name}: pattern {pattern_id!r}"
            if not pattern_id or pattern_id in seen:
                raise PatternError(f"{where}: missing or duplicate id")
            seen.add(pattern_id)
            kind = entry.get("kind")
            if kind not in KINDS:
                raise PatternError(f"{where}: kind must be one of {', '.join(KINDS)}")
            if kind == "statistic" and not entry.get("test"):
                raise PatternError(f"{where}: a statistic pattern needs a test family")
            if kind == "printed-effect" and not entry.get("measure"):
                raise PatternError(f"{where}: a printed-effect pattern needs a measure")
            if kind == "table-column" and entry.get("role") not in TABLE_ROLES:
                raise PatternError(f"{where}: a table-column pattern needs a role, one of "
                                   f"{', '.join(TABLE_ROLES)}")
            if kind == "table-column" and entry.get("role") == "statistic" \
                    and not entry.get("test"):
                raise PatternError(f"{where}: a statistic column needs a test family")
            source = _expand(entry["regex"], fragments, where)
            try:
                compiled = regex.compile(source, _FLAGS)
            except regex.error as exc:
                raise PatternError(f"{where}: {exc}") from None
            patterns.append(Pattern(
                id=pattern_id,
                kind=kind,
                test=entry.get("test"),
                source=source,
                compiled=compiled,
                file=file_name,
                needs_p=bool(entry.get("needs_p", False)),
                must_match=tuple(entry.get("must_match", ())),
                must_not_match=tuple(entry.get("must_not_match", ())),
                keywords=tuple(_keyword(k, where) for k in entry.get("keywords", ())),
                measure=entry.get("measure"),
                role=entry.get("role"),
            ))
    missing = [kind for kind in KINDS if not any(p.kind == kind for p in patterns)]
    if missing:
        raise PatternError(f"no patterns of kind {', '.join(missing)}")
    by_kind = {kind: tuple(p for p in patterns if p.kind == kind) for kind in KINDS}
    scanners = {kind: _combine(members) for kind, members in by_kind.items()}
    branch_groups = {kind: tuple(scanner.groupindex[f"_{i}"] for i in range(len(by_kind[kind])))
                     for kind, scanner in scanners.items()}
    return Library(patterns=tuple(patterns), by_kind=by_kind, scanners=scanners,
                   branch_groups=branch_groups,
                   by_regex={id(pattern.compiled): pattern for pattern in patterns})
