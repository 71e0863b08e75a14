"""Where a result stands in its text: sentences, paragraphs and the cue words around it.

Found once per document, in one pass each, and looked up with bisection for every result.
"""

from __future__ import annotations

from bisect import bisect_left, bisect_right
from dataclasses import dataclass
from typing import Iterator

import regex

from ..patterns import Library, Pattern

#: how far from a result, within its paragraph, a mention of tails or design still counts
PARAGRAPH_REACH = 1500

# A sentence ends at ".", "!" or "?" followed by white space and a capital or an opening
# bracket, unless the full stop ends a common abbreviation; a blank line ends it too.
# (The pattern starts with the punctuation rather than a lookbehind: the regex engine can then
# skip quickly to the few places where a sentence may end.)
_SENTENCE_BREAK = regex.compile(
    r"""
    [.!?] ["'”’)]?
    (?<! \b (?: al | vs | e\.g | i\.e | cf | Fig | Figs | Eq | Eqs | Tab | No | approx | ca
              | resp | Dr | Mr | Ms | Mrs | St | Ref | Refs | Vol | Suppl | et | viz ) \. ["'”’)]? )
    \s+ (?= [A-Z(\["“‘] )
    | \n [ \t]* \n \s*
    """,
    regex.VERBOSE,
)
_PARAGRAPH_BREAK = regex.compile(r"\n[ \t]*\n\s*")
#: cues read from the words around a result: cue -> ((pattern kind, value), ...)
_CUES = {
    "tails": (("tails-one", "one"), ("tails-two", "two")),
    "design": (("design-within", "within"), ("design-between", "between")),
}
WHITESPACE = regex.compile(r"\s+")


#: how far from one of its keywords a match of a keyword pattern may start or end
_KEYWORD_REACH = 80


def _matches_near_keywords(pattern: Pattern, text: str,
                           lowered: bytes | None) -> Iterator[regex.Match]:
    """Every match of `pattern` in `text`, searching only around the pattern's keywords.

    Finding a literal word is far cheaper than running a case-insensitive pattern over a whole
    manuscript, and cue words are rare. `lowered` is the text as lower-case ASCII bytes, offset
    for offset; where a pattern has no keywords (or `lowered` is None) the whole text is
    searched.
    """
    if lowered is None or not pattern.keywords:
        yield from pattern.compiled.finditer(text)
        return
    windows = []
    for keyword in pattern.keywords:
        # lower-case ASCII keywords in any case (in the lowered copy), others exactly
        haystack, literal = ((lowered, keyword.encode("ascii"))
                             if keyword.isascii() and keyword == keyword.lower()
                             else (text, keyword))
        found = haystack.find(literal)
        while found != -1:
            windows.append((max(0, found - _KEYWORD_REACH),
                            found + len(literal) + _KEYWORD_REACH))
            found = haystack.find(literal, found + 1)
    windows.sort()
    merged: list[list[int]] = []
    for start, end in windows:
        if merged and start <= merged[-1][1]:
            merged[-1][1] = max(merged[-1][1], end)
        else:
            merged.append([start, end])
    for start, end in merged:
        yield from pattern.compiled.finditer(text, start, min(end, len(text)))


def lowered_ascii(text: str) -> bytes:
    """The text as lower-case ASCII bytes, offset for offset (other characters become "?"):
    one byte a character, where str.lower() of a non-ASCII text can briefly need twelve."""
    return text.encode("ascii", "replace").lower()


def find_all(library: Library, kind: str, text: str, lowered: bytes | None) -> list[regex.Match]:
    """Every match of the patterns of `kind` in `text`, in order, without overlaps; patterns
    with keywords are tried only near them."""
    matches = sorted((m for pattern in library.of_kind(kind)
                      for m in _matches_near_keywords(pattern, text, lowered)),
                     key=lambda m: (m.start(), -m.end()))
    kept: list[regex.Match] = []
    for match in matches:
        if not kept or match.start() >= kept[-1].end():
            kept.append(match)
    return kept


@dataclass(frozen=True)
class Boundaries:
    """Sentence and paragraph starts and tails mentions of one document, found in one pass."""

    sentence_starts: list[int]
    paragraph_starts: list[int]
    #: per cue ("tails", "design"): sorted (offset, value) of every mention in the document
    cues: dict[str, list[tuple[int, str]]]

    @classmethod
    def of(cls, text: str, library: Library) -> "Boundaries":
        sentences = [0] + [m.end() for m in _SENTENCE_BREAK.finditer(text)]
        paragraphs = [0] + [m.end() for m in _PARAGRAPH_BREAK.finditer(text)]
        lowered = lowered_ascii(text)
        cues: dict[str, list[tuple[int, str]]] = {}
        for cue, kinds in _CUES.items():
            mentions = [(m.start(), value) for kind, value in kinds
                        for pattern in library.of_kind(kind)
                        for m in _matches_near_keywords(pattern, text, lowered)]
            cues[cue] = sorted(mentions)
        return cls(sentences, paragraphs, cues)

    @staticmethod
    def _span(starts: list[int], position: int, text_length: int) -> tuple[int, int]:
        index = bisect_right(starts, position) - 1
        end = starts[index + 1] if index + 1 < len(starts) else text_length
        return starts[index], end

    def sentence(self, position: int, text_length: int) -> tuple[int, int]:
        return self._span(self.sentence_starts, position, text_length)

    def paragraph(self, position: int, text_length: int) -> tuple[int, int]:
        return self._span(self.paragraph_starts, position, text_length)

    def nearest(self, cue: str, start: int, end: int, position: int) -> str | None:
        """The value of the mention of `cue` in [start, end) nearest to `position`, if any."""
        mentions = self.cues[cue]
        low = bisect_left(mentions, (start, ""))
        high = bisect_left(mentions, (end, ""))
        if low == high:
            return None
        return min(mentions[low:high], key=lambda item: abs(item[0] - position))[1]

    def stated(self, cue: str, position: int, text_length: int) -> str | None:
        """What the sentence at `position` says about `cue`, else what its paragraph says."""
        sentence_start, sentence_end = self.sentence(position, text_length)
        value = self.nearest(cue, sentence_start, sentence_end, position)
        if value is None:
            # Text without blank lines (hard-wrapped text, PDF text layers) is one "paragraph"
            # from title to references; a mention further away than a long paragraph is not
            # about this result.
            paragraph_start, paragraph_end = self.paragraph(position, text_length)
            value = self.nearest(cue, max(paragraph_start, position - PARAGRAPH_REACH),
                                 min(paragraph_end, position + PARAGRAPH_REACH), position)
        return value


def first(scanner: regex.Pattern, text: str, start: int, end: int) -> regex.Match | None:
    return scanner.search(text, start, end) if start < end else None


def last(scanner: regex.Pattern, text: str, start: int, end: int) -> regex.Match | None:
    last = None
    for match in scanner.finditer(text, start, end):
        last = match
    return last
