"""Results printed across the cells of a table: one claim per row of a table of results.

Word, HTML, JATS and LaTeX readers keep a table's cells apart and label each ("table 2, row 3,
column 1"). A table of results prints across a row what the running text prints in one
sentence:

    | Measure  | t    | df | p    |
    | Boldness | 2.45 | 28 | .021 |      reads as  t(28) = 2.45, p = .021

A table counts as one of results when a header row (one of its first three rows) names a test
statistic column (t, F, chi-square, r, z: the patterns of kind "table-column" in
`patterns/tables.toml`) and a p-value column. Each later row whose statistic cell holds a
number becomes a claim, with its df from the header ("t(58)", "F(2, 87)") or from df columns,
its p from the p column ("< .001", ".021**"), its N from an N column, and a coefficient and
its standard error when the table has those columns. A row already read from the running text
(a cell that prints a whole result) is not read twice, and a row whose p cell is empty or not a
p-value is left out rather than reported without one. PDF tables have no cells to read and are
not read this way.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, replace

import regex

from ..model import Claim, Document, Estimate, PValue
from ..patterns import Library
from .context import WHITESPACE
from .estimates import RATIO_LABELS

_CELL = re.compile(r"table (\d+), row (\d+), column (\d+)")
#: how many rows from the top of a table its header may be
_HEADER_ROWS = 3
#: a number as a cell prints it, with the marks tables put after it ("2.45**", "3.1a")
_NUMBER = regex.compile(r"\s*(?P<value>-?\s?\d*[.,]?\d+)\s*(?:[*†‡§]+|[a-e])?\s*")
_P = regex.compile(r"\s*(?:(?P<comparator><=|>=|[<>≤≥=])\s*)?"
                   r"(?P<value>\d*\.\d+|[01]|\d(?:\.\d+)?\s?[eE]\s?-\s?\d+)\s*(?:[*†‡§]+|[a-e])?\s*")
_NOT_SIGNIFICANT = regex.compile(r"\s*(?:ns|n\.s\.|NS)\s*")
_DF = regex.compile(r"\s*\(?\s*(?P<df1>\d+(?:\.\d+)?)\s*(?:[,;/]\s*(?P<df2>\d+(?:\.\d+)?))?"
                    r"\s*\)?\s*")
#: an interval as a cell prints it: "1.10-2.10", "1.10 to 2.10", "[1.10, 2.10]"
_INTERVAL = regex.compile(r"\s*[(\[]?\s*(?P<low>-?\d*\.?\d+)\s*(?:-|to|,|;|\.\.)\s*"
                          r"(?P<high>-?\d*\.?\d+)\s*[)\]]?\s*")
#: an estimate and its interval in one cell: "1.52 (1.10-2.10)"
_ESTIMATE_INTERVAL = regex.compile(r"\s*(?P<value>-?\d*\.?\d+)\s*[*†‡§]*\s*[(\[]\s*"
                                   r"(?P<low>-?\d*\.?\d+)\s*(?:-|to|,|;|\.\.)\s*"
                                   r"(?P<high>-?\d*\.?\d+)\s*[)\]]\s*[*†‡§]*\s*")
_COMPARATORS = {"<=": "<=", ">=": ">=", "≤": "<=", "≥": ">=", "<": "<", ">": ">", "=": "="}


@dataclass(frozen=True)
class _Cell:
    row: int
    column: int
    start: int       # in the Document's text, trimmed of white space
    end: int
    printed: str     # as printed
    plain: str       # normalised, for reading


@dataclass(frozen=True)
class _Column:
    role: str
    test: str | None = None
    header_df: tuple[str, ...] = ()
    printed: str = ""
    label: str | None = None   # an estimate's symbol in the header ("OR (95% CI)")
    level: str | None = None   # the confidence level in the header


def find_table_results(document: Document, library: Library,
                       claims: list[Claim]) -> list[Claim]:
    """Claims read from the rows of the document's tables of results; `claims` are those
    already found in the running text (their cells are not read again)."""
    tables = _tables(document)
    if not tables:
        return []
    # only a claim read from inside a cell can be a row's claim read twice
    taken = [(c.location.start, c.location.end) for c in claims if c.location.cell]
    found: list[Claim] = []
    for cells in tables.values():
        rows: dict[int, dict[int, _Cell]] = {}
        for cell in cells:
            rows.setdefault(cell.row, {})[cell.column] = cell
        header_row, columns = _header(rows, library)
        if columns is None:
            continue
        tails = _tails_stated(cells, library)
        for row_number in sorted(rows):
            if row_number <= header_row:
                continue
            claim = _row_claim(document, rows[row_number], columns, rows[header_row])
            if claim is not None and tails is not None:
                claim = replace(claim, tails_stated=tails)
            if claim is not None and not any(claim.location.start < end and
                                             start < claim.location.end
                                             for start, end in taken):
                found.append(claim)
    return found


def _tails_stated(cells: list[_Cell], library: Library) -> str | None:
    """What the table itself says of its tests' tails (a header "p (one-tailed)", a note row
    "One-tailed tests."): "one", "two" or None."""
    text = "\n".join(cell.plain for cell in cells)
    one = any(p.compiled.search(text) for p in library.of_kind("tails-one"))
    two = any(p.compiled.search(text) for p in library.of_kind("tails-two"))
    return "one" if one and not two else "two" if two and not one else None


def _tables(document: Document) -> dict[int, list[_Cell]]:
    """The cells of each table, by table number, from the reader's segments."""
    segments = document.offset_map.segments
    spans: dict[tuple[int, int, int], list[int]] = {}
    for index, segment in enumerate(segments):
        if not segment.cell:
            continue
        label = _CELL.fullmatch(segment.cell)
        if label is None:
            continue
        end = segments[index + 1].start if index + 1 < len(segments) else len(document.text)
        key = (int(label.group(1)), int(label.group(2)), int(label.group(3)))
        span = spans.setdefault(key, [segment.start, end])
        span[0], span[1] = min(span[0], segment.start), max(span[1], end)
    tables: dict[int, list[_Cell]] = {}
    for (table, row, column), (start, end) in spans.items():
        printed = document.text[start:end]
        stripped = printed.strip()
        if not stripped:
            continue
        start += len(printed) - len(printed.lstrip())
        end = start + len(stripped)
        plain = document.normalised[document.normalised_offset(start):
                                    document.normalised_offset(end)]
        tables.setdefault(table, []).append(_Cell(row, column, start, end, stripped, plain))
    return tables


def _header(rows: dict[int, dict[int, _Cell]],
            library: Library) -> tuple[int, dict[int, _Column] | None]:
    """The header row of a table of results and what each of its columns holds."""
    for row_number in sorted(rows)[:_HEADER_ROWS]:
        columns: dict[int, _Column] = {}
        for column, cell in rows[row_number].items():
            for pattern in library.of_kind("table-column"):
                match = pattern.compiled.fullmatch(cell.plain)
                if match is not None:
                    named = {name: match.group(name) for name in match.re.groupindex}
                    header_df = tuple(named[name] for name in ("df1", "df2") if named.get(name))
                    columns[column] = _Column(pattern.role or "", pattern.test, header_df,
                                              cell.printed, named.get("label"),
                                              named.get("level"))
                    break
        roles = [column.role for column in columns.values()]
        if roles.count("p") == 1 and (roles.count("statistic") == 1 or (
                "statistic" not in roles and (
                    roles.count("coefficient") == 1 and roles.count("se") == 1
                    or roles.count("estimate-interval") == 1
                    or roles.count("estimate") == 1 and roles.count("interval") == 1))):
            return row_number, columns
    return 0, None


def _row_claim(document: Document, row: dict[int, _Cell], columns: dict[int, _Column],
               header: dict[int, _Cell]) -> Claim | None:
    def cell_of(role: str) -> list[tuple[_Cell, _Column]]:
        return [(row[index], column) for index, column in sorted(columns.items())
                if column.role == role and index in row]

    statistic_cells = cell_of("statistic")
    p_cells = cell_of("p")
    if not p_cells:
        return None
    if not statistic_cells:
        if cell_of("estimate-interval") or cell_of("estimate"):
            return _interval_claim(document, row, cell_of, p_cells[0][0], header)
        return _coefficient_claim(document, row, cell_of, p_cells[0][0], header)
    statistic_cell, statistic_column = statistic_cells[0]
    p_cell = p_cells[0][0]
    number = _NUMBER.fullmatch(statistic_cell.plain)
    if number is None:
        return None
    p_value = _p_value(p_cell)
    if p_value is None:
        return None
    test = statistic_column.test or ""
    used = [statistic_cell, p_cell]
    df = statistic_column.header_df
    if not df:
        df_cells = cell_of("df")
        pieces: list[str] = []
        for cell, _ in df_cells:
            found = _DF.fullmatch(cell.plain)
            if found is None:
                break
            pieces.extend(_printed_group(cell, found, name) for name in ("df1", "df2")
                          if found.group(name))
            used.append(cell)
        df = tuple(pieces)
    if test == "F" and len(df) != 2 or test in ("t", "chi2", "r") and len(df) > 1:
        df = ()  # not the df of this statistic: leave the claim without them
    n = None
    for cell, _ in cell_of("n"):
        if _NUMBER.fullmatch(cell.plain) and test in ("chi2", "z", "r"):
            n = cell.printed
            used.append(cell)
    estimate = None
    coefficient = _coefficient(cell_of) if test in ("t", "z") else None
    if coefficient is not None:
        estimate, cells = coefficient
        used += cells
    return _claim(document, row, header, used, test=test, df=df,
                  statistic=_number_as_printed(statistic_cell), p=p_value, n=n,
                  estimate=estimate)


def _coefficient_claim(document: Document, row: dict[int, _Cell], cell_of, p_cell: _Cell,
                       header: dict[int, _Cell]) -> Claim | None:
    """A row of a table of coefficients without a test statistic column: b, SE and p."""
    p_value = _p_value(p_cell)
    coefficient = _coefficient(cell_of)
    if p_value is None or coefficient is None:
        return None
    estimate, cells = coefficient
    return _claim(document, row, header, [*cells, p_cell], test="estimate",
                  df=(), statistic=estimate.value, p=p_value, n=None, estimate=estimate)


def _coefficient(cell_of) -> tuple[Estimate, list[_Cell]] | None:
    """The row's coefficient and its SE (b and SE columns), and their cells."""
    coefficients, errors = cell_of("coefficient"), cell_of("se")
    if not coefficients or not errors:
        return None
    (value_cell, value_column), (se_cell, _) = coefficients[0], errors[0]
    if not (_NUMBER.fullmatch(value_cell.plain) and _NUMBER.fullmatch(se_cell.plain)):
        return None
    return (Estimate(label=value_column.printed.strip("*_ ") or "b",
                     value=_number_as_printed(value_cell), se=_number_as_printed(se_cell)),
            [value_cell, se_cell])


def _interval_claim(document: Document, row: dict[int, _Cell], cell_of, p_cell: _Cell,
                    header: dict[int, _Cell]) -> Claim | None:
    """A row of a table of estimates with confidence intervals: "OR (95% CI)" and p columns
    ("1.52 (1.10-2.10)", ".011"), or "OR", "95% CI" and p columns."""
    p_value = _p_value(p_cell)
    if p_value is None:
        return None
    together = cell_of("estimate-interval")
    if together:
        cell, column = together[0]
        found = _ESTIMATE_INTERVAL.fullmatch(cell.plain)
        if found is None:
            return None
        value, low, high = (_printed_group(cell, found, name) for name in ("value", "low", "high"))
        used, label, level = [cell, p_cell], column.label, column.level
    else:
        (cell, column), intervals = cell_of("estimate")[0], cell_of("interval")
        number = _NUMBER.fullmatch(cell.plain)
        if number is None or not intervals:
            return None
        interval_cell, interval_column = intervals[0]
        found = _INTERVAL.fullmatch(interval_cell.plain)
        if found is None:
            return None
        value = _printed_group(cell, number, "value")
        low, high = (_printed_group(interval_cell, found, name) for name in ("low", "high"))
        used, label, level = [cell, interval_cell, p_cell], column.label, interval_column.level
    label = label or "estimate"
    estimate = Estimate(label=label, value=value, low=low, high=high, level=level,
                        ratio=label in RATIO_LABELS)
    return _claim(document, row, header, used, test="estimate", df=(), statistic=value,
                  p=p_value, n=None, estimate=estimate)


def _claim(document: Document, row: dict[int, _Cell], header: dict[int, _Cell],
           used: list[_Cell], **parts) -> Claim:
    """The claim of a row: its text runs from the first cell read to the last."""
    start, end = min(cell.start for cell in used), max(cell.end for cell in used)
    labelled = "; ".join(
        f"{WHITESPACE.sub(' ', header[index].printed) if index in header else ''}: "
        f"{WHITESPACE.sub(' ', cell.printed)}".lstrip(": ")
        for index, cell in sorted(row.items()))
    location = document.location(start, end)
    where = _CELL.fullmatch(location.cell or "")
    row_name = f"table {where.group(1)}, row {where.group(2)}" if where else "a table row"
    return Claim(statistic_comparator="=", location=location, text=document.text[start:end],
                 sentence=f"{row_name}: {labelled}", pattern="table-row", **parts)


def _p_value(cell: _Cell) -> PValue | None:
    if _NOT_SIGNIFICANT.fullmatch(cell.plain):
        return PValue(comparator="ns", reported="")
    found = _P.fullmatch(cell.plain)
    if found is None:
        return None
    return PValue(comparator=_COMPARATORS.get(found.group("comparator") or "=", "="),
                  reported=_printed_group(cell, found, "value"))


def _number_as_printed(cell: _Cell) -> str:
    found = _NUMBER.fullmatch(cell.plain)
    return _printed_group(cell, found, "value") if found else cell.printed


def _printed_group(cell: _Cell, match: regex.Match, name: str) -> str:
    """A group of a match in a cell's normalised text, as printed (the cell's own characters
    where normalisation kept its length, the normalised ones otherwise)."""
    value = match.group(name)
    if len(cell.plain) == len(cell.printed):
        start, end = match.span(name)
        return cell.printed[start:end]
    return value
