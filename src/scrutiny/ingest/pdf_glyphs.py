"""Signs and Greek letters that a PDF's fonts print as other characters.

Publisher fonts often lack a correct Unicode map, so that a text layer prints "=" as "¼", "⫽"
or "5", "<" as "," or "⬍", ">" as ".", "≥" as "$", "≤" as "#", a minus as "2", or a sign as a
control character (a glyph with no mapping at all, which pdfium gives as its character code),
and "χ" as "c" or "v", "η" as "g" or "h". Which character stands for which sign is a property
of the font, so it is decided per font and document, never per result:

1. While each page is read, every place where only a sign can stand is collected with the
   font of the glyph printed there: after a statistic with degrees of freedom
   ("F(1, 26) ? 38.70", where only "=" can stand), after "df" and "N", after "p" ("p ? .001",
   where "<", "=" or ">" can), after a statistic without degrees of freedom ("F ? 1"); and
   every single letter printed before a "2" where a chi-square ("?2(1, N = 80)") or an eta
   squared ("?2p = .21") must stand.
2. A glyph counts only where nothing else explains it: an ordinary character ("," "." "5")
   only when it is printed in another font than the characters on both sides of it (the
   sign font of a publisher), an unusual one (a control character, a private-use character)
   anywhere.
3. For each font, a glyph known to stand for a sign ("," for "<", "¼" for "=", "$" for "≥")
   is that sign; another glyph seen where only "=" can stand (mostly) is "="; another glyph
   after "p" is "<" (or ">", when the p-values printed after it are mostly above .05). A
   letter in a font of its own before a "2" is "χ" where degrees of freedom follow, "η" where
   an effect size does; a "2" in such a font at the start of a number is a minus sign.
4. Every collected place whose glyph and font have a meaning gets it; the reader notes each
   mapping in the Document's notes.
"""

from __future__ import annotations

import re
from bisect import bisect_right
from collections import Counter, defaultdict
from dataclasses import dataclass

#: characters known to stand for a sign in fonts without a correct Unicode map
KNOWN_SIGNS = {",": "<", "\u2b0d": "<", ".": ">", "\u00bc": "=", "\u2afd": "=", "5": "=",
               "$": "\u2265", "#": "\u2264"}
#: comparison signs as Unicode prints them (no repair needed)
_SIGNS = "=<>\u2264\u2265\u2266\u2267\u2a7d\u2a7e"

# An unusual glyph: a control character (a glyph pdfium could not map), a fraction, an arrow, a
# geometric shape, a supplemental math operator, a private-use character or a replacement
# character; such glyphs are what fonts without a correct Unicode map print for signs.
_ODD = (r"[\x00-\x08\x0e-\x1f\u00bc-\u00be\u2190-\u21ff\u25a0-\u25ff\u2a00-\u2bff"
        r"\ue000-\uf8ff\ufffd\ufffe]")
# A sign slot: one glyph (group "sign") where only a sign can stand, before a number: an
# ordinary character known to stand for a sign in such fonts ("5" only after brackets and
# letters: see the scans below), or an unusual one.
_GLYPH = rf"(?P<sign>[,.$#]|{_ODD})"
# A number, perhaps after one glyph that may stand for its minus sign (not a dash or a plus,
# which need no repair; a Latin-1 letter such as "À" is what some publisher fonts print).
_NUMBER = (r"(?:(?P<lead>[^\s\w.()\[\],;:+\-\u2010-\u2015\u2212]|[\x00-\x1f\u00c0-\u00ff])"
           r"|[\-\u2010-\u2015\u2212])?\s?(?P<number>\d+(?:\.\d+)?|\.\d+)")
# The scan starts with the glyph (so that the regex engine skips quickly through ordinary
# text) and then looks behind it, glyph included, for what must precede it.
_HEADS = {"df": "df", "N": "df", "n": "df", "p": "p", "ps": "p",
          **{head: "statistic" for head in ("t", "F", "r", "z", "Z", "ts", "Fs", "rs", "zs",
                                            "χ2", "Χ2", "χ 2", "Χ 2")}}
_LOOK_BEHIND = "(?:" + "|".join(f"(?<=\\b{re.escape(head)}{space}.)"
                                for head in sorted(_HEADS, key=len, reverse=True)
                                for space in ("", " ")) + ")"
# two scans, each starting with a small set of characters (one set would be slower)
_SLOTS = re.compile(f"(?P<sign>[,.$#5])(?=\\s?-?[.\\d]){_LOOK_BEHIND}\\s?{_NUMBER}")
_ODD_SLOTS = re.compile(f"(?P<sign>{_ODD}){_LOOK_BEHIND}\\s?{_NUMBER}")
_HEAD_BEFORE = re.compile(r"\b(df|ps?|[tFrzZ]s?|[Nn]|[χΧ][ ]?2)[ ]?$")
#: a sign after brackets (checked: brackets of a statistic's degrees of freedom)
_BRACKET_SLOTS = re.compile(rf"(?P<close>[)\]])\s?(?:{_GLYPH}|(?P<digit>5))\s?{_NUMBER}")
#: what must come before a closing bracket for the sign after it to be a statistic's
_STATISTIC_BEFORE = re.compile(r"(?:(?<![A-Za-z])[tFrzZ](?:['’]?s)?|[χΧ][ ]?2"
                               r"|(?<![A-Za-z])[A-Za-z]2)[ ]?[(\[][^()\[\]\n]{1,40}$")
# An unusual glyph before a number anywhere ("MSE ¼ 1,318.20"): once the slots have shown what
# a glyph stands for, it is read so here too.
_ODD_BEFORE_NUMBER = re.compile(rf"(?P<sign>{_ODD})(?=\s?[-.\d])")
# A sign inside the brackets of a statistic: "(1, N ? 80)".
_BRACKET_SIGN = re.compile(rf"[Nn][ ]?{_GLYPH}[ ]?\d")
# A "2" after a single letter where a Greek letter must stand: chi-square before degrees of
# freedom ("c2(1, N = 80)"), eta squared before an effect size ("g2p = .21").
_LETTER_SLOTS = re.compile(
    r"""
    2\s?
    (?: (?P<chi>[(\[][ ]?\d)
      | (?P<eta>(?:\n?[pPG])?\s?(?:[=\u00bc\u2afd]|[^\s\w])\s?0?\.\d) )
    """,
    re.VERBOSE,
)
# The letter: any letter but a Greek one (which needs no repair), alone ("c2", "v2", "Ȥ2").
_LETTER_BEFORE = re.compile(r"(?<![^\W\d_])[^\W\d_\u0370-\u03ff][ ]?\n?$")
_DIGITS_AND_POINT = ("0", "1", "2", "3", "4", "5", "6", "7", "8", "9", ".")
#: letters that are statistics in their own right and never stand for Greek ones here
_NOT_GREEK = frozenset("tFrzZXxRpPNnd")


@dataclass(slots=True)
class Place:
    """One glyph printed where a sign or a Greek letter must stand."""

    page: int
    line: int
    offset: int
    glyph: str
    font: str
    #: "equals" (only "=" can stand), "p", "statistic" (after a statistic without df),
    #: "minus" (at the start of a number), "chi", "eta"
    role: str
    #: printed in a font other than the characters on both sides of it
    foreign: bool
    #: the number printed after a sign, as printed
    value: str = ""


def _ordinary(glyph: str) -> bool:
    return " " < glyph < "\x7f"


def collect(page_number: int, lines, text_page, text: str | None = None,
            starts: list[int] | None = None, sign_numbers: list | None = None) -> list[Place]:
    """The sign and letter slots of one page (lines: `pdf_layout.Line`s; text_page:
    `pdf_layout.TextPage`; text and starts: the lines joined by line breaks and where each
    starts in it; sign_numbers: the matches of `pdf_layout.SIGN_NUMBER` in it, where a "2"
    after a proper sign may stand for a minus sign: "t(28) = 22.45" for "= -2.45")."""
    if not lines:
        return []
    if text is None or starts is None:
        starts = []
        position = 0
        for line in lines:
            starts.append(position)
            position += len(line.text) + 1
        text = "\n".join(line.text for line in lines)
    places: list[Place] = []

    def locate(offset: int) -> tuple[int, int]:
        index = _line_of(starts, offset)
        return index, offset - starts[index]

    def font_at(offset: int) -> str | None:
        index, within = locate(offset)
        char = lines[index].char_at(within)
        return None if char is None else text_page.font(char)

    def neighbour_font(offset: int, step: int) -> str | None:
        offset += step
        while 0 <= offset < len(text) and text[offset].isspace():
            offset += step
        if not 0 <= offset < len(text):
            return None
        return font_at(offset)

    def add(offset: int, role: str, value: str = "", digit: int | None = None) -> None:
        """`digit`: where a digit of the number after a sign is (the sign's font is compared
        with the number's, not with a minus sign between them, which may share its font)."""
        glyph = text[offset]
        font = font_at(offset)
        if font is None:
            font = ""
        after = font_at(digit) if digit is not None else neighbour_font(offset, 1)
        if role == "minus":
            # a minus sign may share its font with the sign before it; the digits are the test
            foreign = after is not None and font != after
        else:
            before = neighbour_font(offset, -1)
            foreign = (before is not None and after is not None and font != before
                       and font != after)
        if _ordinary(glyph) and not foreign:
            return  # an ordinary character in the text's own font means what it says
        index, within = locate(offset)
        places.append(Place(page_number, index, within, glyph, font, role, foreign, value))

    matches: list = list(_SLOTS.finditer(text))
    matches.extend(_ODD_SLOTS.finditer(text))
    if ")" in text or "]" in text:
        matches.extend(_BRACKET_SLOTS.finditer(text))
    for match in matches:
        begin = match.start()
        closing = match.re is _BRACKET_SLOTS
        if closing:
            if not _STATISTIC_BEFORE.search(text, max(0, begin - 50), begin):
                continue
            role = "equals"
        else:
            head = _HEAD_BEFORE.search(text, max(0, begin - 4), begin)
            if head is None:
                continue
            role = _HEADS.get(head.group(1), "statistic")
            role = "equals" if role == "df" else role
        sign = "digit" if closing and match.group("digit") else "sign"
        add(match.start(sign), role, match.group("number"), match.end("number") - 1)
        number = match.start("number")
        if match.group("lead"):
            add(match.start("lead"), "minus")
        elif text[number] == "2" and number + 1 < len(text) and text[number + 1] in "0123456789.":
            add(number, "minus")
        if closing:
            bracket = max(text.rfind("(", 0, begin), text.rfind("[", 0, begin))
            for inner in _BRACKET_SIGN.finditer(text, bracket, begin):
                add(inner.start("sign"), "equals")
    for match in sign_numbers or ():
        number = match.start("number")
        if text[number] == "2" and match.group("sign") in _SIGNS and \
                text[number + 1:number + 2] in _DIGITS_AND_POINT:
            add(number, "minus")
    for match in _LETTER_SLOTS.finditer(text):
        before = _LETTER_BEFORE.search(text, max(0, match.start() - 3), match.start())
        if before is None or text[before.start()] in _NOT_GREEK:
            continue
        # compared with the digits after it, not with the "2" (which may share its font)
        add(before.start(), "chi" if match.group("chi") else "eta", digit=match.end() - 1)
    return places


def _line_of(starts: list[int], offset: int) -> int:
    low, high = 0, len(starts) - 1
    while low < high:
        middle = (low + high + 1) // 2
        if starts[middle] <= offset:
            low = middle
        else:
            high = middle - 1
    return low


def _value(printed: str) -> float | None:
    try:
        return float(printed)
    except ValueError:
        return None


def decide(places: list[Place]) -> dict[tuple[str, str, str], str]:
    """What each (font, glyph, kind) stands for; kind is "sign", "minus" or "letter"."""
    meaning: dict[tuple[str, str, str], str] = {}
    roles: dict[tuple[str, str], Counter] = defaultdict(Counter)
    values: dict[tuple[str, str], list[float]] = defaultdict(list)
    for place in places:
        key = (place.font, place.glyph)
        roles[key][place.role] += 1
        if place.role == "p":
            value = _value(place.value)
            if value is not None:
                values[key].append(value)
    unknown_p: dict[str, list[tuple[str, float]]] = defaultdict(list)
    for (font, glyph), counts in roles.items():
        equals, p, statistic = counts["equals"], counts["p"], counts["statistic"]
        if equals or p or statistic:
            if glyph in KNOWN_SIGNS:
                # a "≥" where "=" may stand ("ts(31) ≥ 2.91"): what such fonts are known for
                meaning[(font, glyph, "sign")] = KNOWN_SIGNS[glyph]
            elif equals and equals >= p:
                meaning[(font, glyph, "sign")] = "="
            elif p:
                # below .05 counts for "<", above for ">"
                score = sum(1 if v < 0.05 else -1 if v > 0.05 else 0 for v in values[(font, glyph)])
                unknown_p[font].append((glyph, score))
        if counts["minus"]:
            meaning[(font, glyph, "minus")] = "-"
        if counts["chi"] or counts["eta"]:
            meaning[(font, glyph, "letter")] = "χ" if counts["chi"] >= counts["eta"] else "η"
    for font, glyphs in unknown_p.items():
        glyphs.sort(key=lambda item: -item[1])
        meaning[(font, glyphs[0][0], "sign")] = "<" if glyphs[0][1] >= 0 or len(glyphs) > 1 else ">"
        if len(glyphs) > 1:
            meaning[(font, glyphs[1][0], "sign")] = ">"
    return meaning


_KIND = {"equals": "sign", "p": "sign", "statistic": "sign", "minus": "minus",
         "chi": "letter", "eta": "letter"}


def apply(places: list[Place], meaning: dict[tuple[str, str, str], str], pages) -> list[str]:
    """Print each place's glyph as what it stands for; the notes that say so. `pages` have a
    `text` (their lines joined by line breaks) and `replace(line, offset, character)`."""
    done: Counter = Counter()
    seen: set[tuple[int, int, int]] = set()
    for place in places:
        if (place.page, place.line, place.offset) in seen:
            continue
        seen.add((place.page, place.line, place.offset))
        key = (place.font, place.glyph, _KIND[place.role])
        replacement = meaning.get(key)
        if replacement is None:
            continue
        page = pages[place.page]
        position = page.starts[place.line] + place.offset
        if page.text[position:position + 1] != place.glyph:
            continue
        page.replace(place.line, place.offset, replacement)
        done[key] += 1
    # An unusual glyph that stands for a sign in the slots is read as that sign before any
    # number, whatever its font (no text prints "¼" or a control character before a number).
    odd = {glyph: sign for (_, glyph, kind), sign in meaning.items()
           if kind == "sign" and not _ordinary(glyph)}
    odd_fonts = {glyph: font for (font, glyph, kind) in meaning if glyph in odd}
    if odd:
        for page in pages:
            if not any(glyph in page.text for glyph in odd):
                continue
            for found in _ODD_BEFORE_NUMBER.finditer(page.text):
                glyph = found.group("sign")
                if glyph in odd:
                    line = bisect_right(page.starts, found.start()) - 1
                    page.replace(line, found.start() - page.starts[line], odd[glyph])
                    done[(odd_fonts[glyph], glyph, "sign")] += 1
    notes = []
    for (font, glyph, _), count in sorted(done.items()):
        shown = repr(glyph) if _ordinary(glyph) else f"U+{ord(glyph):04X}"
        notes.append(f"font {font or '(unnamed)'} prints {meaning[(font, glyph, _)]!r} as "
                     f"{shown}: read as {meaning[(font, glyph, _)]!r} in {count} "
                     f"place{'s' if count != 1 else ''}")
    return notes
