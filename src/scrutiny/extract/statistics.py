"""Test results (t, F, chi-square, r, z) and what is printed with them.

How a result is found:

1. The statistic patterns in `patterns/` (tried where a statistic symbol starts a word) find
   each statistic head ("t(28) = 2.45", "F(2, 87) = 4.12", "χ2(1, N = 80) = 4.2", "F < 1"),
   unless a not-a-result pattern matches just before it ("critical t(28) = 2.05").
2. After each head, a *window* runs to the start of the next head, the end of the sentence,
   the start of a test scrutiny does not recompute ("U = 312": a p after it is that test's) or
   250 characters, whichever comes first. The first p-value (or "ns") in the window belongs to
   the statistic, so that whatever a manuscript prints in between ("MSE = 2,506.01",
   "ηp2 = .12", a sphericity epsilon) does not matter. Degrees of freedom and N printed after
   the statistic ("t = 2.45, df = 28") are taken from the window too; when none are printed
   there, degrees of freedom printed immediately before the statistic ("df = 28, t = 2.45") or
   immediately after its p-value ("t = 2.45, p = .021, df = 28") count.
3. Whether the test was one- or two-sided is read from the words of the sentence, else of the
   paragraph (the nearest mention within `PARAGRAPH_REACH` characters wins), or from a label on
   the p-value itself.

Everything is done on the normalised text and mapped back to the text as decoded, so the
strings in a Claim are exactly as printed and its offsets point into the file's own text.
"""

from __future__ import annotations

import re
import sys
from dataclasses import replace

import regex

from ..model import Claim, Document, PrintedEffect, PValue
from ..patterns import Library
from .context import PARAGRAPH_REACH, WHITESPACE, Boundaries, first, last

#: how far after a statistic its p-value may be printed
WINDOW = 250

_COMPARATORS = {
    "=": "=", "<": "<", ">": ">", "≤": "<=", "≥": ">=",
    "<=": "<=", "=<": "<=", ">=": ">=", "=>": ">=",
}

_ALL_BEFORE = regex.compile(r"(?i:\ball|\bboth|\beach)\s+$")
_ONLY_SEPARATORS = regex.compile(r"[\s,;]*")
#: words that turn a plural p after a single result to other results
_CONTRAST = regex.compile(r"(?i)\b(?:whereas|while|but|although|though|unlike|except|"
                          r"(?:the|all)[ ](?:other|others|remaining|rest))\b")
#: what may stand between results that share one plural p: separators, "and", "or", a short
#: label ("for odour") or a parenthesis ("(Table 2)")
_ONLY_CONNECTIVES = regex.compile(
    r"(?:[\s,;]|\band\b|\bor\b|\bfor(?:[ ][\w-]+){1,3}|\([^()]{0,40}\))*")
#: how far before a statistic its degrees of freedom may be printed ("df = 2, 87, F = ...")
_DF_BEFORE = 30
#: how far before a statistic an R squared may be printed ("R2 = .39, F(5, 611) = 78.92")
_EFFECT_BEFORE = 30


def _df_value(printed: str) -> float | None:
    try:
        return float(printed.replace(",", ""))
    except ValueError:
        return None


def comparator(printed: str) -> str:
    compact = printed.replace(" ", "")
    if compact in ("=<", "=>") and " " in printed:
        # "p = < .001" printed with a space is "p < .001"
        return "<" if compact == "=<" else ">"
    return _COMPARATORS.get(compact, compact)


# Where a statistic can start: one of the symbols the statistic patterns begin with (t, F, r,
# z, Z, X, x, χ, Χ, "chi") at the start of a word and not followed by a letter that makes it
# another word ("the", "to", "chief"; "ts" and "t's" are plurals). Scanning the text for these
# with the standard `re` module, then trying the statistic patterns only there, is many times
# faster than running every pattern over all the text; a test checks that every example of
# every statistic pattern starts at such a symbol.
_SYMBOL = re.compile(
    r"(?:[tFrzZXxχΧ](?![a-rt-z])|[Cc](?=hi(?![a-rt-z])))"
    r"(?<![^\W_Δ].)(?<![.'’].)"   # not inside a word; "_" (emphasis) and "Δ" may come before
)
#: characters that may precede a symbol within a statistic: emphasis and a difference delta
_PREFIX_CHARACTERS = frozenset("*_Δ ")
_NOT_A_RESULT_REACH = 40


def statistic_heads(text: str, library: Library) -> list[regex.Match]:
    """Every statistic head in `text`, in order, without overlaps."""
    scanner = library.scanner("statistic")
    not_a_result = library.scanner("not-a-result")
    heads: list[regex.Match] = []
    covered = 0
    for symbol in _SYMBOL.finditer(text):
        position = symbol.start()
        if position < covered:
            continue
        start = position
        while start > covered and position - start < 4 and text[start - 1] in _PREFIX_CHARACTERS:
            start -= 1
        head = None
        for candidate in range(start, position + 1):
            head = scanner.match(text, candidate)
            if head is not None:
                break
        if head is None:
            continue
        if not_a_result.search(text, max(0, head.start() - _NOT_A_RESULT_REACH), head.start()):
            continue
        heads.append(head)
        covered = head.end()
    return heads


def find_test_results(document: Document, library: Library,
                      boundaries: Boundaries) -> list[Claim]:
    """Every test result printed in `document`, in the order of the text."""
    text = document.normalised
    heads = _with_their_p(statistic_heads(text, library), text, library, boundaries)
    found: list[tuple[Claim, regex.Match, regex.Match | None]] = []
    for index, head in enumerate(heads):
        next_head = heads[index + 1].start() if index + 1 < len(heads) else len(text)
        claim, p_match = _claim_at(document, library, boundaries, head, next_head)
        if claim is not None:
            found.append((claim, head, p_match))
    return _share_plural_p(found, text, boundaries)


def _share_plural_p(found: list[tuple[Claim, regex.Match, regex.Match | None]], text: str,
                    boundaries: Boundaries) -> list[Claim]:
    """A plural p ("ps < .05") after several results is the bound of each of them:
    "F(1, 76) = 18.44 and F(1, 76) = 5.03, ps < .05" gives the first F the bound too (as an
    aggregate), when the two sit in one sentence with only connectives between them."""
    claims = [claim for claim, _, _ in found]
    shares = [p_match is not None and bool(p_match.group("p_plural")) for _, _, p_match in found]
    for index in range(len(found) - 2, -1, -1):
        head, later_head = found[index][1], found[index + 1][1]
        if claims[index].p is not None or not shares[index + 1]:
            continue
        if boundaries.sentence(head.start(), len(text)) != \
                boundaries.sentence(later_head.start(), len(text)):
            continue
        if not _ONLY_CONNECTIVES.fullmatch(text, head.end(), later_head.start()):
            continue
        claims[index] = replace(claims[index], p=claims[index + 1].p, aggregate=True)
        shares[index] = True
    return claims


def _with_their_p(heads: list[regex.Match], text: str, library: Library,
                  boundaries: Boundaries) -> list[regex.Match]:
    """The heads that count: a pattern that needs a p-value ("r = .42", "t = 30 s") counts only
    when one follows before the next head. A head that does not count must not end the window
    of the result before it ("t(28) = 2.45, p = .021, r = .42": the r is an effect size)."""
    kept = []
    for index, head in enumerate(heads):
        if library.matched_pattern("statistic", head).needs_p:
            next_head = heads[index + 1].start() if index + 1 < len(heads) else len(text)
            end = min(next_head, boundaries.sentence(head.start(), len(text))[1],
                      head.end() + WINDOW)
            if not (first(library.scanner("p-value"), text, head.end(), end)
                    or first(library.scanner("not-significant"), text, head.end(), end)):
                continue
        kept.append(head)
    return kept


def _printed_effect(library: Library, text: str, head: regex.Match, window_end: int,
                    sentence_start: int) -> regex.Match | None:
    """The first effect size printed after the statistic, or an R squared just before it."""
    after = first(library.scanner("printed-effect"), text, head.end(), window_end)
    if after is not None:
        return after
    before = last(library.scanner("printed-effect"), text,
                   max(sentence_start, head.start() - _EFFECT_BEFORE), head.start())
    if before is not None and library.matched_pattern("printed-effect", before).measure == "R2" \
            and _ONLY_SEPARATORS.fullmatch(text, before.end(), head.start()):
        return before
    return None


def _group_sizes(library: Library, text: str, sentence: tuple[int, int],
                 df: float | None) -> tuple[regex.Match, regex.Match] | None:
    """Two group sizes printed in the sentence that add up to df + 2 (a two-group t test)."""
    if df is None:
        return None
    sizes = list(library.scanner("group-size").finditer(text, *sentence))
    if len(sizes) != 2:
        return None
    try:
        total = sum(float(m.group("size").replace(",", "")) for m in sizes)
    except ValueError:
        return None
    return (sizes[0], sizes[1]) if abs(total - (df + 2.0)) < 1e-9 else None


def _df_just_before(library: Library, text: str, start: int, head_start: int) -> regex.Match | None:
    """Degrees of freedom printed right before a statistic ("df = 28, t = 2.20, p = .036").

    Only a df that nothing but a comma, semicolon or white space separates from the statistic
    counts, and not one that as closely follows an earlier p-value ("t = 2.1, p = .04, df = 30;
    t = 1.3, ..."): which of the two results it belongs to cannot be told, so neither gets it.
    """
    df_match = last(library.scanner("df"), text, start, head_start)
    if df_match is None or not _ONLY_SEPARATORS.fullmatch(text, df_match.end(), head_start):
        return None
    p_before = last(library.scanner("p-value"), text, max(0, df_match.start() - _DF_BEFORE),
                    df_match.start())
    if p_before is not None and _ONLY_SEPARATORS.fullmatch(text, p_before.end(),
                                                            df_match.start()):
        return None
    return df_match


def _df_just_after(library: Library, text: str, p_end: int, end: int,
                   next_head: int) -> regex.Match | None:
    """Degrees of freedom printed right after the p-value ("t = 2.20, p = .036, df = 28").

    Not a df that the next statistic follows as closely: it may be that statistic's.
    """
    match = first(library.scanner("df"), text, p_end, end)
    if match is None or not _ONLY_SEPARATORS.fullmatch(text, p_end, match.start()):
        return None
    if next_head < len(text) and _ONLY_SEPARATORS.fullmatch(text, match.end(), next_head):
        return None
    return match


def _claim_at(document: Document, library: Library, boundaries: Boundaries,
              head: regex.Match, next_head: int) -> tuple[Claim | None, regex.Match | None]:
    """The result that starts at `head`, and the match of its p-value if one is printed."""
    text = document.normalised
    pattern = library.matched_pattern("statistic", head)
    sentence_start, sentence_end = boundaries.sentence(head.start(), len(text))
    window_end = min(next_head, sentence_end, head.end() + WINDOW)
    other_test = first(library.scanner("other-test"), text, head.end(), window_end)
    if other_test is not None:  # a p-value after it is that test's, not this one's
        window_end = other_test.start()

    p_match = first(library.scanner("p-value"), text, head.end(), window_end)
    if p_match is not None and p_match.group("p_plural") and not head.group("plural") \
            and _CONTRAST.search(text, head.end(), p_match.start()):
        # "t(20) = 1.20 was not reliable, whereas the others were, ps < .05": the others' p
        p_match = None
    ns_end = p_match.start() if p_match else window_end
    ns_match = first(library.scanner("not-significant"), text, head.end(), ns_end)
    if pattern.needs_p and p_match is None and ns_match is None:
        return None, None

    def printed(match: regex.Match, group: str) -> str | None:
        """A group's text exactly as printed in the original file."""
        if match.group(group) is None:
            return None
        start, end = match.span(group)
        # interned: manuscripts print the same short strings ("28", ".05") again and again
        return sys.intern(document.text[document.original_offset(start):
                                        document.original_offset(end)])

    df = tuple(d for d in (printed(head, "df1"), printed(head, "df2")) if d is not None)
    n = printed(head, "n")
    p_value: PValue | None = None
    tails = None
    end = head.end()
    if p_match is not None:
        p_value = PValue(
            comparator=comparator(p_match.group("p_cmp")),
            reported=printed(p_match, "p_value") or "",
            adjusted=p_match.group("p_adjust"),
        )
        tails_label = p_match.group("p_tails")
        if tails_label:
            tails = "one" if tails_label.startswith(("one", "1")) else "two"
        end = p_match.end()
    elif ns_match is not None:
        p_value = PValue(comparator="ns", reported="")
        end = ns_match.end()

    # Degrees of freedom or N printed after the statistic ("t = 2.45, df = 28").
    between_end = p_match.start() if p_match else window_end
    if not df:
        df_match = first(library.scanner("df"), text, head.end(), between_end) \
            or _df_just_before(library, text, max(sentence_start, head.start() - _DF_BEFORE),
                               head.start()) \
            or (p_match and _df_just_after(library, text, p_match.end(), window_end, next_head))
        if df_match is not None:
            df = tuple(d for d in (printed(df_match, "df1"), printed(df_match, "df2")) if d)
    if n is None and not (pattern.test == "r" and df):
        n_match = first(library.scanner("sample-size"), text, head.end(), between_end)
        if n_match is not None:
            n = printed(n_match, "n")

    if tails is None:
        tails = boundaries.stated("tails", head.start(), len(text))
    two_groups_possible = pattern.test == "t" or (pattern.test == "F" and df[:1] == ("1",))
    design = boundaries.stated("design", head.start(), len(text)) if two_groups_possible else None
    group_sizes = None
    if two_groups_possible and design != "within" and df:
        sizes = _group_sizes(library, text, (sentence_start, sentence_end),
                             _df_value(df[0] if pattern.test == "t" else df[-1]))
        if sizes is not None:
            group_sizes = (printed(sizes[0], "size"), printed(sizes[1], "size"))
    effect_match = _printed_effect(library, text, head, window_end, sentence_start)
    effect_printed = None
    if effect_match is not None:
        effect_printed = PrintedEffect(
            measure=library.matched_pattern("printed-effect", effect_match).measure,
            value=printed(effect_match, "effect_value") or "",
            label=WHITESPACE.sub(" ", document.text[
                document.original_offset(effect_match.start()):
                document.original_offset(effect_match.start("effect_value"))]).strip(" =*_"),
        )

    aggregate = bool(head.group("plural")) or bool(p_match and p_match.group("p_plural")) \
        or bool(_ALL_BEFORE.search(text, max(0, head.start() - 12), head.start()))

    start_original = document.original_offset(head.start())
    end_original = document.original_offset(end)
    sentence = document.text[document.original_offset(sentence_start):
                             document.original_offset(sentence_end)]
    claim = Claim(
        test=pattern.test or "",
        df=df,
        statistic=printed(head, "statistic") or "",
        statistic_comparator=comparator(head.group("stat_cmp")),
        p=p_value,
        location=document.location(start_original, end_original),
        text=document.text[start_original:end_original],
        sentence=WHITESPACE.sub(" ", sentence).strip(),
        n=n,
        tails_stated=tails,
        design_stated=design,
        group_sizes=group_sizes,
        effect_printed=effect_printed,
        aggregate=aggregate,
        pattern=pattern.id,
    )
    return claim, p_match


__all__ = ["PARAGRAPH_REACH", "WINDOW", "find_test_results", "statistic_heads"]
