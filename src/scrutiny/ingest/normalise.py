"""Text normalisation, done once, in ingest, for every format.

Manuscripts print the same statistic in many code points: a minus as U+2212, an en dash or a
hyphen; "χ²" with a superscript two; "𝑡" as a mathematical italic letter; "ﬁ" as a ligature;
spaces as no-break or thin spaces; soft hyphens inside words. Extraction patterns are written
against one plain form, so this module maps every variant to it:

* Unicode NFKC (superscripts, mathematical letters, ligatures, full-width forms, odd spaces);
* every dash and minus variant to "-";
* slanted and other variants of "≤" and "≥" to those two characters;
* the increment sign "∆" to the Greek capital delta "Δ";
* soft hyphens and zero-width characters removed;
* a middle dot between digits (a decimal point in some journals' house style) to ".", except
  before a power of ten, where it is a times sign ("2.8·10⁻⁴", "3·10^-6");
* end-of-line hyphenation of lower-case words joined ("signifi-\\ncant").

The normalised text keeps the line breaks of the original. Because a few replacements change
the length of the text, `normalise` also returns breakpoints from which `OffsetMap` maps every
offset back into the text as decoded.
"""

from __future__ import annotations

import unicodedata

import regex

_DASHES = "\u2010\u2011\u2012\u2013\u2014\u2015\u2212\u2796\u02d7\ufe58\ufe63\uff0d\u2043"
_DELETED = "\u00ad\u200b\u200c\u200d\u2060\ufeff"
_CHARACTER_MAP = {
    **{dash: "-" for dash in _DASHES},
    **{ch: "" for ch in _DELETED},
    "\u2266": "\u2264",  # ≦
    "\u2a7d": "\u2264",  # ⩽
    "\u2264": "\u2264",
    "\u2267": "\u2265",  # ≧
    "\u2a7e": "\u2265",  # ⩾
    "\u2265": "\u2265",
    "\u2206": "\u0394",  # ∆ (increment) as PDFs print the delta of "∆χ2", "∆F", "∆df"
}

# Longest alternatives first: a decimal middle dot (not one before a power of ten: "3·10⁻⁶"
# multiplies) and a hyphenated line end are recognised in context; any other non-ASCII run is
# examined character by character.
_SPECIAL = regex.compile(
    r"(?P<decimal>(?<=\d)[\u00b7\u2219](?=\d)(?!10[ ]?(?:[\^\u207b\u2212\u2013-]|[\u2070\u00b9\u00b2\u00b3\u2074-\u2079])))"
    r"|(?P<hyphenation>(?<=[a-z])-[ \t]*\r?\n[ \t]*(?=[a-z]))"
    r"|(?P<run>[^\x00-\x7f]+)"
)


def _map_character(ch: str) -> str:
    mapped = _CHARACTER_MAP.get(ch)
    if mapped is not None:
        return mapped
    compatible = unicodedata.normalize("NFKC", ch)
    # NFKC turns a superscript minus into U+2212 and some letters into several characters;
    # map what it produced once more so that every dash ends up as "-".
    return "".join(_CHARACTER_MAP.get(c, c) for c in compatible)


_character_cache: dict[str, str] = {}


def _normalise_run(run: str) -> str:
    if unicodedata.is_normalized("NFKC", run) and not any(ch in _CHARACTER_MAP for ch in run):
        return run
    out = []
    for ch in run:
        mapped = _character_cache.get(ch)
        if mapped is None:
            mapped = _character_cache[ch] = _map_character(ch)
        out.append(mapped)
    return "".join(out)


def normalise(text: str) -> tuple[str, list[tuple[int, int]]]:
    """Return the normalised text and its breakpoints `(normalised_offset, original_offset)`.

    Between two breakpoints an offset in the normalised text and one in the original text move
    together; a breakpoint is recorded wherever a replacement changed the length.
    """
    pieces: list[str] = []
    breakpoints: list[tuple[int, int]] = []
    last = 0
    shift = 0  # len(normalised so far) - len(original so far)
    for match in _SPECIAL.finditer(text):
        start, end = match.span()
        kind = match.lastgroup
        original = match.group()
        if kind == "decimal":
            replacement = "."
        elif kind == "hyphenation":
            replacement = ""
        else:
            replacement = _normalise_run(original)
        if replacement == original:
            continue
        pieces.append(text[last:start])
        pieces.append(replacement)
        last = end
        if len(replacement) != len(original):
            # Offsets inside a replacement that grew (a ligature) run on one to one and may
            # overshoot by a character or two; everything after it is exact again.
            shift += len(replacement) - len(original)
            breakpoints.append((end + shift, end))
    if not pieces:
        return text, []
    pieces.append(text[last:])
    return "".join(pieces), breakpoints


def normalise_fragment(fragment: str) -> str:
    """Normalise a short string (a printed number, a comparator) the way `normalise` would."""
    return normalise(fragment)[0]
