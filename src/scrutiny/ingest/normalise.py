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
* superscript digits right after a number, a footnote marker ("p = .021³"), to spaces, so
  that they are not read as digits of the number; a power of ten ("10⁴") keeps its exponent;
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

_MIDDLE_DOTS = "\u00b7\u2219"
_SUPERSCRIPT_DIGITS = "\u2070\u00b9\u00b2\u00b3\u2074\u2075\u2076\u2077\u2078\u2079"
#: digits to superscript digits (str.translate): readers write digits printed raised right
#: after a number this way, and `normalise` then tells a note marker from an exponent
TO_SUPERSCRIPT = str.maketrans("0123456789", _SUPERSCRIPT_DIGITS)
# A middle dot between digits is a decimal point ("0·03"), except before a power of ten, where
# it multiplies ("3·10⁻⁶").
_POWER_OF_TEN = regex.compile(
    r"10[ ]?(?:[\^\u207b\u2212\u2013-]|[\u2070\u00b9\u00b2\u00b3\u2074-\u2079])")

# One pass finds every place that may need a change: a hyphen at a line end, and runs of
# non-ASCII characters (with hyphens, so that "-" next to a dash is one run). Both start with a
# character from a small set, which lets the regex engine skip plain ASCII text quickly; the
# context of each candidate is then examined in Python.
_CANDIDATES = regex.compile(r"-[ \t]*\r?\n[ \t]*|[^\x00-\x2c\x2e-\x7f]+")


def _map_character(ch: str) -> str:
    mapped = _CHARACTER_MAP.get(ch)
    if mapped is not None:
        return mapped
    compatible = unicodedata.normalize("NFKC", ch)
    # NFKC turns a superscript minus into U+2212 and some letters into several characters;
    # map what it produced once more so that every dash ends up as "-".
    return "".join(_CHARACTER_MAP.get(c, c) for c in compatible)


_character_cache: dict[str, str] = {}


def _normalise_run(text: str, start: int, run: str) -> str:
    if (unicodedata.is_normalized("NFKC", run) and not any(ch in _CHARACTER_MAP for ch in run)
            and not any(ch in _MIDDLE_DOTS for ch in run)):
        return run
    out = []
    for offset, ch in enumerate(run):
        if ch in _SUPERSCRIPT_DIGITS and _is_footnote_marker(text, start + offset):
            out.append(" ")
            continue
        if ch in _MIDDLE_DOTS:
            position = start + offset
            if (position > 0 and text[position - 1].isdigit()
                    and text[position + 1:position + 2].isdigit()
                    and not _POWER_OF_TEN.match(text, position + 1)):
                out.append(".")
                continue
        mapped = _character_cache.get(ch)
        if mapped is None:
            mapped = _character_cache[ch] = _map_character(ch)
        out.append(mapped)
    return "".join(out)


def _is_footnote_marker(text: str, position: int) -> bool:
    """Is the superscript digit at `position` part of a footnote marker after a number
    ("p = .021³", "t(28) = 2.45¹²") rather than an exponent ("10⁴", "× 10³") or a square
    after a letter ("χ²", "r²")?"""
    first = position
    while first > 0 and text[first - 1] in _SUPERSCRIPT_DIGITS:
        first -= 1
    if first == 0 or not "0" <= text[first - 1] <= "9":
        return False
    # a power of ten: "10" not preceded by another digit or a decimal point
    if text[max(0, first - 2):first] == "10" and (
            first < 3 or not (text[first - 3].isdigit() or text[first - 3] in ".,")):
        return False
    return True


def _is_hyphenation(text: str, start: int, end: int) -> bool:
    """A lower-case word broken at a line end: "signifi-\ncant" (not "3-\n5", not "ANOVA-")."""
    before = text[start - 1] if start > 0 else ""
    after = text[end] if end < len(text) else ""
    return "a" <= before <= "z" and "a" <= after <= "z"


def normalise(text: str) -> tuple[str, list[tuple[int, int]]]:
    """Return the normalised text and its breakpoints `(normalised_offset, original_offset)`.

    Between two breakpoints an offset in the normalised text and one in the original text move
    together; a breakpoint is recorded wherever a replacement changed the length.
    """
    pieces: list[str] = []
    breakpoints: list[tuple[int, int]] = []
    last = 0
    shift = 0  # len(normalised so far) - len(original so far)
    for match in _CANDIDATES.finditer(text):
        original = match.group()
        if original == "-":
            continue
        start, end = match.span()
        if "\n" in original:
            if not _is_hyphenation(text, start, end):
                continue
            replacement = ""
        else:
            replacement = _normalise_run(text, start, original)
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
