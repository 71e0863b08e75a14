"""LaTeX manuscripts: the text a reader of the printed page sees, mapped back to file and line.

This is not a TeX engine. It reads LaTeX source the way manuscripts print statistics and turns
it into plain text for the extractor, keeping a map from every stretch of that text to the
source file and line it came from:

* comments (`%` to the end of the line, not `\\%`) are removed, joining lines as TeX does;
* math (`$...$`, `\\(...\\)`, `\\[...\\]`, `$$...$$`, `equation`, `align` and their kin) is
  printed as text: Greek letters as Unicode (`\\chi` -> "χ"), scripts flattened (`\\chi^2` ->
  "χ2", `\\eta^2_p` -> "ηp2", `t_{28}` -> "t28", `10^{-4}` -> "10^-4"), relations as symbols
  (`\\leq` -> "≤"), spacing commands (`\\,`, `\\;`, `~`) as spaces, braces (`4{,}77`) dropped;
* font commands (`\\textit{p}`, `\\emph`, `\\mathit`, `\\text`, `\\mathrm`, ...) print their
  argument; so does any command the reader does not know (its name is dropped);
* citations, labels and set-up commands print nothing, cross references print "??" (the
  number is only known to a LaTeX run), footnotes print their text in brackets where they
  stand; section titles and captions stand as paragraphs of their own;
* commands the manuscript defines (`\\newcommand`, `\\def`, `\\let`, `\\DeclareMathOperator`)
  are expanded, within a budget;
* verbatim environments are printed exactly as typed; `comment` and drawing environments and
  `\\iffalse ... \\fi` are left out; the preamble prints only its `\\title` and `\\abstract`;
* `\\input`, `\\include`, `\\subfile` and `\\import` read sibling files (LaTeX looks for
  them relative to the main file's folder); a file outside that folder is refused, a missing
  or unreadable one gives a note and the rest is still read, include cycles are cut and at
  most `MAX_FILES` files are read.

Each stretch of the text is a `Segment` naming its file (relative to the main file's folder)
and source line, and the title of the section it stands in.

Broken source never stops the reading: an unclosed `$` or brace ends at the paragraph's end,
an argument that never closes is read as text, and everything the reader had to give up on is
said in `Document.notes`, one line each, naming the file and line.
"""

from __future__ import annotations

import os
import re
import unicodedata
from pathlib import Path
from typing import Callable, Union

from ..errors import InputError
from ..model import Document, Segment
from . import latex_tables as tables
from .text import SUFFIXES as TEXT_SUFFIXES
from .text import NotText, decode

FORMAT = "latex"
SUFFIXES = (".tex",)

#: at most this many files are read for one manuscript (the main file and its inputs)
MAX_FILES = 200
#: at most this many bytes are read from input files of one manuscript
MAX_INPUT_BYTES = 64 * 1024 * 1024
#: budget of macro expansions per manuscript (a command that calls itself stops here)
MAX_EXPANSIONS = 100_000
#: budget of source characters that macro expansion may produce per manuscript (commands
#: that call each other several times over would otherwise grow without bound)
MAX_EXPANDED_CHARACTERS = 20_000_000
#: an argument longer than this many tokens is taken as one whose closing brace is missing
MAX_ARGUMENT_TOKENS = 5_000
#: the same for an optional argument in square brackets (labels, placements, short titles)
MAX_OPTIONAL_TOKENS = 256
#: tokens that reading arguments may look at in all, per manuscript, before arguments are
#: limited to `SCARCE_ARGUMENT_TOKENS`: broken source (thousands of unclosed braces) would
#: otherwise be scanned again and again, in time that grows with the square of its length
SCAN_BUDGET = 1_000_000
SCARCE_ARGUMENT_TOKENS = 64
#: at most this many notes are kept per manuscript (then their number is given)
MAX_NOTES = 50
#: deepest nesting of arguments converted on their own (scripts within scripts, ...)
MAX_NESTING = 40

# -- sniffing --------------------------------------------------------------------------------

_SNIFF_BYTES = 65536
#: a LaTeX document without doubt: it starts a document class or a document body
_DOCUMENT = re.compile(
    r"^[ \t]*\\(?:documentclass|documentstyle)\b|^[ \t]*\\begin[ \t]*\{document\}", re.M)
#: a file that starts (after blank and comment lines) with a document class
_STARTS_AS_DOCUMENT = re.compile(
    r"\ufeff?(?:[ \t]*(?:%[^\n]*)?\n)*[ \t]*\\(?:documentclass|documentstyle)\b")
#: lines that start with structural commands (a LaTeX file without a preamble: a chapter)
_STRUCTURE = re.compile(
    r"^[ \t]*\\(?:part|chapter|(?:sub)*section|(?:sub)?paragraph|begin|end|input|include|"
    r"usepackage|maketitle|item|label|caption|bibliography|newcommand|renewcommand|cite[pt]?)"
    r"(?![A-Za-z])", re.M)
#: structural lines a fragment needs to be taken for LaTeX
_STRUCTURE_LINES = 3


def sniff(data: bytes, path: str) -> str | None:
    """"latex" for a .tex file, and for any file that reads as LaTeX source by its content.

    Content decides for files without the .tex extension: a document class or document body
    at the start of a line counts; a fragment (a chapter file) needs several lines that start
    with structural commands. A file named as plain text or Markdown (which may well quote
    LaTeX) is taken only when it starts with a document class.
    """
    from . import _UNSUPPORTED

    head = data[:_SNIFF_BYTES]
    if any(head.lstrip().startswith(signature) for signature, _ in _UNSUPPORTED):
        return None
    suffix = Path(path).suffix.lower()
    if suffix in SUFFIXES:
        return FORMAT
    try:
        sample, _ = decode(head)
    except NotText:
        return None
    if suffix in TEXT_SUFFIXES:
        # a file named as plain text or Markdown may quote LaTeX: it is LaTeX only if it
        # starts as a LaTeX document
        return FORMAT if _STARTS_AS_DOCUMENT.match(sample) else None
    if _DOCUMENT.search(sample):
        return FORMAT
    if len(_STRUCTURE.findall(sample)) >= _STRUCTURE_LINES:
        return FORMAT
    return None


def read(data: bytes, path: str) -> Document:
    """The Document of a LaTeX manuscript and every file it inputs."""
    from . import build_document

    try:
        source, encoding = decode(data)
    except NotText as exc:
        raise InputError(path, str(exc)) from None
    if not source.strip():
        raise InputError(path, "empty file (only white space)")
    converter = _Converter(path)
    text, segments, notes = converter.convert(source)
    if not text.strip():
        reason = ("no text to read: the LaTeX source prints nothing outside comments and the "
                  "preamble")
        if notes:
            reason += f" ({notes[0]})"
        raise InputError(path, reason)
    return build_document(path, FORMAT, text, segments=tuple(segments), encoding=encoding,
                          notes=tuple(notes))


def input_files(path: str) -> tuple[str, ...]:
    """The files the LaTeX manuscript at `path` reads through \\input and its kin (real paths).

    Meant for searching a folder: a file that another manuscript there inputs is part of that
    manuscript, and checking it on its own as well would report its results twice.
    """
    try:
        with open(path, "rb") as handle:
            source, _ = decode(handle.read())
    except (OSError, NotText):
        return ()
    converter = _Converter(path)
    converter.convert(source)
    return tuple(converter.inputs)


# -- tokens ----------------------------------------------------------------------------------
#
# A token is a tuple (kind, value, line, file). Kinds read from source: "cs" (a control
# sequence; value is its name), "cspace" (the white space after a control word, which only
# math mode prints), "text" (a run of ordinary characters), "space", "nl" (a line end),
# "par" (one or more blank lines; value holds the line ends), and the special characters
# "{", "}", "$", "&", "~", "^", "_", "#". Kinds the reader makes for itself: "emit" (print the
# value), "act" (call the value), "mode" (switch to text or math inside a group), "stop" (end
# of a nested conversion) and "eof".

Token = tuple
_EOF: Token = ("eof", "", 0, "")

_LEX = re.compile(
    r"""
    (?P<cs> \\ (?: [A-Za-z@]+ | [^A-Za-z@] | $ ) )    # "@" is a letter in class and
                                                     # package code (\@startsection)
  | (?P<comment> %[^\n]* (?: \n (?![ \t\f]*\n) [ \t\f]* )? )   # eats the line end, as TeX does,
                                                               # unless a blank line follows
  | (?P<par> \n (?: [ \t\f]* \n )+ [ \t\f]* )
  | (?P<nl> \n [ \t\f]* )
  | (?P<space> [ \t\f]+ )
  | (?P<special> [{}$&~^_\#] )
  | (?P<text> [^\\%\n \t\f{}$&~^_\#]+ (?: [ \t\f]+ [^\\%\n \t\f{}$&~^_\#]+ )* )
                                         # words and the spaces between them; a text token
                                         # never starts or ends with a space
    """,
    re.X | re.S,
)
#: what TeX skips after a control word: spaces and one line end (not a blank line)
_AFTER_WORD = re.compile(r"[ \t\f]*(?:\n(?![ \t\f]*\n)[ \t\f]*)?")
#: inputs that start a new page (so end the paragraph before and after them)
_PAGE_INPUTS = frozenset({"include", "subfile", "includefrom", "subincludefrom"})
#: an uncommented \begin{document}: the file has a preamble
_HAS_BODY = re.compile(r"^[^%\n]*\\begin[ \t]*\{document\}", re.M)
_TERMINATORS = frozenset({"eof", "stop", "par", "emit", "act"})
_LONG_TERMINATORS = _TERMINATORS - {"par"}
_WHITESPACE = re.compile(r"\s+")
_SIGNED_INTEGER = re.compile(r"[-+−]?\d+")


class _Lexer:
    """Tokens of one source file, read lazily (verbatim environments need the raw text)."""

    __slots__ = ("text", "pos", "line", "file", "real", "restore", "pending")

    def __init__(self, text: str, file: str, real: str | None) -> None:
        self.text = text
        self.pos = 0
        self.line = 1
        self.file = file
        self.real = real
        #: what to restore when the file ends (set for files with a preamble of their own)
        self.restore: Callable[[], None] | None = None
        #: the white space after the last control word, given out as the next token
        self.pending: Token | None = None

    def next(self) -> Token | None:
        if self.pending is not None:
            token, self.pending = self.pending, None
            return token
        text = self.text
        while self.pos < len(text):
            match = _LEX.match(text, self.pos)
            kind = match.lastgroup
            value = match.group(kind)
            line = self.line
            end = match.end()
            if kind == "cs":
                value = value[1:]
                if value[:1].isalpha() or value[:1] == "@":
                    skipped = _AFTER_WORD.match(text, end)
                    if skipped.end() > end:
                        # TeX skips the white space after a control word; in math mode it
                        # still separates what a reader sees ("p \le .001" -> "p ≤ .001")
                        self.pending = ("cspace", skipped.group(), line, self.file)
                        self.line += skipped.group().count("\n")
                        end = skipped.end()
                elif value == "\n":
                    self.line += 1
            elif kind == "special":
                kind = value
            elif kind in ("comment", "par", "nl"):
                self.line += value.count("\n")
            self.pos = end
            if kind != "comment":
                return (kind, value, line, self.file)
        return None


Source = Union[_Lexer, list]


def _raw(tokens: list[Token]) -> str:
    """Source text of tokens, as near as it can be rebuilt (file names, environment names)."""
    out = []
    for kind, value, _, _ in tokens:
        if kind == "cs":
            out.append("\\" + value + (" " if value[:1].isalpha() else ""))
        elif kind in ("text", "space", "cspace"):
            out.append(value)
        elif kind in ("nl", "par"):
            out.append("\n" * value.count("\n"))
        elif len(kind) == 1:
            out.append(kind)
    return "".join(out)


class _Macro:
    """A command the manuscript defines: its number of arguments, the default of an optional
    first argument, and its body."""

    __slots__ = ("count", "default", "body")

    def __init__(self, count: int, default: list[Token] | None, body: list[Token]) -> None:
        self.count = count
        self.default = default
        self.body = body


# -- output ----------------------------------------------------------------------------------

class _Output:
    """The plain text being written, cut into segments that say where each stretch came from.

    Every piece of text is written with the file and line its first character comes from;
    a new segment starts wherever that differs from what counting line ends since the last
    segment would give, so each offset of the text maps to its exact source line.
    """

    def __init__(self) -> None:
        self.pieces: list[str] = []
        self.length = 0
        self.segments: list[Segment] = []
        self.file: str | None = None
        self.line = 0
        self.section: str | None = None
        self.new_segment = True
        self.tail = "\n\n"
        self.suppressed = False
        self.captures: list[list[str]] = []
        #: the table cell being written ("table 2, row 3, column 1"), else None
        self.cell: str | None = None

    def enter_cell(self, label: str | None) -> None:
        """What is written next belongs to this table cell (None: to no cell)."""
        if label != self.cell:
            self.cell = label
            self.new_segment = True

    def last_character(self) -> str:
        if self.captures:
            capture = self.captures[-1]
            return capture[-1][-1:] if capture else ""
        return self.tail[-1:]

    def write(self, text: str, line: int, file: str, synthetic: bool = False) -> None:
        """Write `text`; `synthetic` text (a paragraph break the reader adds) has no source."""
        if not text:
            return
        if self.captures:
            self.captures[-1].append(text)
            return
        if self.suppressed:
            return
        if not self.segments or (not synthetic and (self.new_segment or file != self.file
                                                    or line != self.line)):
            self.segments.append(Segment(self.length, line, file=file, section=self.section,
                                         cell=self.cell))
            self.file, self.line, self.new_segment = file, line, False
        self.pieces.append(text)
        self.length += len(text)
        self.line += text.count("\n")
        self.tail = (self.tail + text)[-2:]

    def space(self, line: int, file: str) -> None:
        if self.last_character() not in ("", " ", "\n", "("):
            self.write(" ", line, file)

    def trim_space(self) -> None:
        """Take back a space just written (before a citation that prints nothing)."""
        pieces = self.captures[-1] if self.captures else self.pieces
        if pieces and pieces[-1].endswith(" ") and not (self.suppressed and not self.captures):
            pieces[-1] = pieces[-1][:-1]
            if not self.captures:
                self.length -= 1
                self.tail = ("\n\n" + "".join(pieces[-2:]))[-2:]
            if not pieces[-1]:
                pieces.pop()

    def paragraph_break(self, line: int, file: str) -> None:
        if self.captures:
            self.space(line, file)
        elif not self.suppressed and self.tail != "\n\n":
            self.write("\n" if self.tail.endswith("\n") else "\n\n", line, file, synthetic=True)

    def begin_section(self, title: str) -> None:
        self.section = title or None
        self.new_segment = True

    def text(self) -> str:
        return "".join(self.pieces)


# -- the converter ---------------------------------------------------------------------------

class _Converter:
    """Reads one manuscript (its main file and every file it inputs) into an `_Output`."""

    def __init__(self, path: str) -> None:
        self.path = path
        self.main_name = os.path.basename(path) or path
        self.root: str | None = None
        if os.path.isfile(path):
            self.root = os.path.realpath(os.path.dirname(os.path.abspath(path)))
        self.output = _Output()
        self.sources: list[Source] = []
        self.math: object = None            # None in text mode, else what opened math mode
        self.math_opened: tuple[str, int, str] = ("", 0, "")  # what, line, file
        self.groups: list[object] = []      # the mode to restore at each "}"
        self.environments: list[str] = []
        #: the tables being read, innermost last: [table number, row, column]
        self.tabulars: list[list[int]] = []
        self.tables_read = 0
        self.macros: dict[str, _Macro] = {}
        self.notes: list[str] = []
        self.files_read = 0
        #: real paths of the files read besides the main file
        self.inputs: list[str] = []
        self.bytes_read = 0
        self.expansions = 0
        self.expanded_characters = 0
        self.nesting = 0
        self.scanned = 0
        self.notes_left_out = 0
        self.warned: set[str] = set()

    # -- entry point --------------------------------------------------------------------

    def convert(self, source: str) -> tuple[str, list[Segment], list[str]]:
        real = os.path.realpath(self.path) if self.root is not None else None
        self.files_read = 1
        self._open(_Lexer(_lines(source), self.main_name, real))
        self._run()
        if self.math is not None:
            what, line, file = self.math_opened
            self._note(line, file, f"{what} opens math mode that is never closed")
        if self.notes_left_out:
            self.notes.append(f"{self.notes_left_out} more notes like these were left out")
        return self.output.text(), self.output.segments, self.notes

    # -- notes ---------------------------------------------------------------------------

    def _note(self, line: int, file: str, message: str) -> None:
        self._add_note(f"{file}:{line}: {message}")

    def _note_once(self, key: str, message: str) -> None:
        if key not in self.warned:
            self.warned.add(key)
            self._add_note(message)

    def _add_note(self, note: str) -> None:
        if len(self.notes) < MAX_NOTES:
            self.notes.append(note)
        else:
            self.notes_left_out += 1

    # -- token stream --------------------------------------------------------------------

    def _open(self, lexer: _Lexer) -> None:
        if _HAS_BODY.search(lexer.text):
            # A preamble prints nothing but its title and abstract; after the file (a subfile
            # with a preamble of its own) printing resumes as before.
            before = self.output.suppressed
            self.output.suppressed = True

            def restore() -> None:
                self.output.suppressed = before
            lexer.restore = restore
        self.sources.append(lexer)

    def _next(self) -> Token:
        sources = self.sources
        while sources:
            top = sources[-1]
            if top.__class__ is list:
                if top:
                    return top.pop()
                sources.pop()
                continue
            token = top.next()
            if token is not None:
                return token
            sources.pop()
            if top.restore is not None:
                top.restore()
        return _EOF

    def _unread(self, token: Token) -> None:
        if token[0] == "eof":
            return
        if self.sources and self.sources[-1].__class__ is list:
            self.sources[-1].append(token)
        else:
            self.sources.append([token])

    def _push(self, tokens: list[Token]) -> None:
        if tokens:
            self.sources.append(tokens[::-1])

    def _next_non_space(self, newlines: bool = True) -> Token:
        skip = ("space", "cspace", "nl") if newlines else ("space", "cspace")
        token = self._next()
        while token[0] in skip:
            token = self._next()
        return token

    def _top_lexer(self) -> _Lexer | None:
        """The file being read when no tokens are waiting to be read again, else None."""
        if self.sources and self.sources[-1].__class__ is _Lexer:
            return self.sources[-1]
        return None

    # -- arguments -----------------------------------------------------------------------

    def _read_argument(self, keep_unclosed: bool, line: int, file: str,
                       name: str, long: bool = False) -> list[Token] | None:
        """The tokens of the next argument: a braced group (without its braces) or one token.

        None when no argument follows. A group whose closing brace does not come before the
        paragraph ends (before the file ends, for a `long` argument, which may hold paragraphs)
        is given back whole when `keep_unclosed`, else it is put back to be read as text (and
        the opening brace is dropped).
        """
        terminators = _LONG_TERMINATORS if long else _TERMINATORS
        token = self._next_non_space()
        kind = token[0]
        if kind in _TERMINATORS or kind == "}":
            self._unread(token)
            return None
        if kind == "text" and len(token[1]) > 1:
            self._unread(("text", token[1][1:], token[2], token[3]))
            return [("text", token[1][0], token[2], token[3])]
        if kind != "{":
            return [token]
        tokens: list[Token] = []
        depth = 0
        limit = MAX_ARGUMENT_TOKENS if self.scanned < SCAN_BUDGET else SCARCE_ARGUMENT_TOKENS
        while True:
            token = self._next()
            self.scanned += 1
            kind = token[0]
            if kind == "{":
                depth += 1
            elif kind == "}":
                if depth == 0:
                    return tokens
                depth -= 1
            elif kind in terminators or len(tokens) >= limit:
                self._unread(token)
                self._note(line, file, f"the argument of {_shown(name)} has no closing brace; "
                                       f"read on as text")
                if keep_unclosed:
                    return tokens
                self._push(tokens)
                return None
            tokens.append(token)

    def _read_delimited(self, opening: str, closing: str) -> list[Token] | None:
        """An optional argument in `opening`...`closing` brackets, if one follows on the line."""
        first = self._next_non_space(newlines=False)
        if first[0] != "text" or not first[1].startswith(opening):
            self._unread(first)
            return None
        taken: list[Token] = [first]
        collected: list[Token] = []
        braces = brackets = 0
        limit = MAX_OPTIONAL_TOKENS if self.scanned < SCAN_BUDGET else SCARCE_ARGUMENT_TOKENS
        token: Token = ("text", first[1][1:], first[2], first[3])
        while True:
            kind = token[0]
            if kind == "text":
                value = token[1]
                for index, character in enumerate(value):
                    if braces:
                        continue
                    if character == opening:
                        brackets += 1
                    elif character == closing:
                        if brackets == 0:
                            if index:
                                collected.append(("text", value[:index], token[2], token[3]))
                            if index + 1 < len(value):
                                self._unread(("text", value[index + 1:], token[2], token[3]))
                            return collected
                        brackets -= 1
                collected.append(token)
            elif kind == "{":
                braces += 1
                collected.append(token)
            elif kind == "}" and braces:
                braces -= 1
                collected.append(token)
            elif kind in _TERMINATORS or kind == "}" or len(collected) >= limit:
                # no closing bracket: it was not an optional argument after all
                self._unread(token)
                self._push(taken[:-1] if len(taken) > 1 else taken)
                return None
            else:
                collected.append(token)
            token = self._next()
            self.scanned += 1
            taken.append(token)

    def _read_star(self) -> bool:
        token = self._next_non_space(newlines=False)
        if token[0] == "text" and token[1].startswith("*"):
            if len(token[1]) > 1:
                self._unread(("text", token[1][1:], token[2], token[3]))
            return True
        self._unread(token)
        return False

    def _skip_arguments(self, specification: str, line: int, file: str, name: str) -> None:
        for letter in specification:
            if letter == "s":
                self._read_star()
            elif letter == "o":
                self._read_delimited("[", "]")
            elif letter == "p":
                self._read_delimited("(", ")")
            elif letter == "m":
                self._read_argument(False, line, file, name)

    def _complete(self, argument: list[Token], line: int, file: str) -> list[Token]:
        """A one-token argument that is itself a command with an argument (`_\\text{p}`)."""
        if len(argument) == 1 and argument[0][0] == "cs" and (
                argument[0][1] in tables.TEXT_ARGUMENT or argument[0][1].startswith("math")):
            inner = self._read_argument(True, line, file, argument[0][1])
            if inner is not None:
                return [argument[0], ("{", "{", line, file), *inner, ("}", "}", line, file)]
        return argument

    def _capture(self, tokens: list[Token], math: object) -> str:
        """Convert tokens on their own and return their text (for scripts, titles, accents)."""
        if self.nesting >= MAX_NESTING:
            return _raw([t for t in tokens if t[0] == "text"])
        saved = (self.math, self.groups)
        self.math, self.groups = math, []
        self.nesting += 1
        self.output.captures.append([])
        self.sources.append([("stop", "", 0, "")])
        self._push(tokens)
        try:
            self._run()
        finally:
            self.nesting -= 1
            text = "".join(self.output.captures.pop())
            self.math, self.groups = saved
        return text

    # -- the main loop -------------------------------------------------------------------

    def _run(self) -> None:
        output = self.output
        while True:
            token = self._next()
            kind, value, line, file = token
            if kind == "text":
                if self.math is None and ("-" in value or "`" in value or "''" in value):
                    value = (value.replace("---", "—").replace("--", "–")
                             .replace("``", "“").replace("''", "”").replace("`", "‘"))
                output.write(value, line, file)
            elif kind == "space":
                output.space(line, file)
            elif kind == "cspace":
                if self.math is not None:
                    following = self._next()
                    self._unread(following)
                    if "\n" in value:
                        output.write("\n", line, file)
                    elif following[0] not in ("^", "_"):
                        output.space(line, file)
            elif kind == "nl":
                output.write("\n", line, file)
            elif kind == "cs":
                self._command(value, line, file)
            elif kind == "par":
                self._paragraph(value, line, file)
            elif kind == "{":
                self.groups.append(self.math)
            elif kind == "}":
                if self.groups:
                    self.math = self.groups.pop()
            elif kind == "$":
                self._dollar(line, file)
            elif kind in ("&", "~"):
                output.space(line, file)
                if kind == "&" and self.tabulars and self.math is None:
                    self._next_cell(columns=1)
            elif kind in ("^", "_"):
                self._script(kind, line, file)
            elif kind == "emit":
                output.write(value, line, file, synthetic=True)
            elif kind == "act":
                value()
            elif kind == "mode":
                self.math = None if value == "text" else "group"
                if value == "math":
                    self.math_opened = ("\\ensuremath", line, file)
            elif kind in ("eof", "stop"):
                return
            # "#" outside a definition prints nothing

    def _paragraph(self, value: str, line: int, file: str) -> None:
        if self.math is not None:
            what, opened_line, opened_file = self.math_opened
            self._note(opened_line, opened_file, f"{what} opens math mode that is not closed "
                                                 f"before the paragraph ends; read on as text")
            self.math = None
        self.groups.clear()
        if self.output.captures:
            self.output.space(line, file)
        else:
            self.output.write("\n" * value.count("\n"), line, file)

    def _dollar(self, line: int, file: str) -> None:
        if self.math is None:
            following = self._next()
            if following[0] == "$":
                self.math = "$$"
                self.output.space(line, file)
            else:
                self._unread(following)
                self.math = "$"
            self.math_opened = (self.math, line, file)
        elif self.math == "$":
            self.math = None
        elif self.math == "$$":
            following = self._next()
            if following[0] != "$":
                self._unread(following)
            self.math = None
            self.output.space(line, file)
        # a $ inside \[...\] or an equation environment is an error TeX reports; ignore it

    def _script(self, kind: str, line: int, file: str) -> None:
        if self.math is None:
            self.output.write(kind, line, file)
            return
        argument = self._read_argument(True, line, file, kind)
        if argument is None:
            return
        text = self._capture(self._complete(argument, line, file), self.math).strip()
        if kind == "_":
            self.output.write(text, line, file)
            return
        # A superscript followed by a subscript prints the subscript first: \eta^2_p -> ηp2.
        subscript = ""
        skipped = []
        following = self._next()
        while following[0] in ("space", "cspace"):
            skipped.append(following)
            following = self._next()
        if following[0] == "_":
            argument = self._read_argument(True, line, file, "_")
            if argument is not None:
                subscript = self._capture(self._complete(argument, line, file),
                                          self.math).strip()
        else:
            self._unread(following)
            self._push(skipped)
        if text in ("∘", "\\circ"):
            text = "°"
        elif (not subscript and self.output.last_character().isdigit()
              and _SIGNED_INTEGER.fullmatch(text)):
            text = "^" + text  # a power: 10^{-4} -> 10^-4
        self.output.write(subscript + text, line, file)

    # -- commands ------------------------------------------------------------------------

    def _command(self, name: str, line: int, file: str) -> None:
        output = self.output
        handler = _HANDLERS.get(name)
        if handler is not None:
            handler(self, name, line, file)
        elif name in self.macros:
            # the manuscript's own definitions win, except over the commands the reader
            # needs for the structure of the text (sections, inputs, environments, ...)
            self._expand(name, self.macros[name], line, file)
        elif name in tables.SYMBOLS:
            symbol = tables.SYMBOLS[name]
            if symbol == " ":
                output.space(line, file)
            else:
                output.write(symbol, line, file)
        elif name in tables.GREEK:
            output.write(tables.GREEK[name], line, file)
        elif self.math is not None and name in tables.MATH_SYMBOLS:
            output.write(tables.MATH_SYMBOLS[name], line, file)
        elif name in tables.DROPPED:
            self._skip_arguments(tables.DROPPED[name], line, file, name)
            if name in tables.CITATIONS:
                # "effect \cite{x}." prints "effect." rather than "effect ."
                following = self._next()
                self._unread(following)
                if following[0] == "text" and following[1][:1] in ".,;:)]":
                    output.trim_space()
        elif name in tables.LEADING_DROPPED:
            self._skip_arguments(tables.LEADING_DROPPED[name], line, file, name)
        elif name in tables.REFERENCES:
            self._skip_arguments("sm", line, file, name)
            output.write("??", line, file)
        elif name in tables.ACCENTS and self.math is None:
            self._accent(name, line, file)
        elif name in tables.SIZING:
            following = self._next_non_space()
            if following[0] == "text" and following[1].startswith("."):
                following = ("text", following[1][1:], following[2], following[3])
            if following[0] != "text" or following[1]:
                self._unread(following)
        elif name in tables.MATH_SYMBOLS:
            output.write(tables.MATH_SYMBOLS[name], line, file)  # \times, \leq typed in text
        # any other command is dropped; its braced arguments are read as text

    def _expand(self, name: str, macro: _Macro, line: int, file: str) -> None:
        self.expansions += 1
        if (self.expansions > MAX_EXPANSIONS
                or self.expanded_characters > MAX_EXPANDED_CHARACTERS):
            self._note_once("expansion", f"{file}:{line}: macro expansion stopped at "
                                         f"\\{name}: the manuscript's own commands expand "
                                         f"too often or too far (one that calls itself?); "
                                         f"later ones print nothing")
            return
        arguments: list[list[Token]] = []
        for index in range(macro.count):
            argument = None
            if index == 0 and macro.default is not None:
                argument = self._read_delimited("[", "]")
                if argument is None:
                    argument = macro.default
            else:
                argument = self._read_argument(True, line, file, name)
            arguments.append(argument or [])
        body: list[Token] = []
        tokens = macro.body
        index = 0
        while index < len(tokens):
            kind, value = tokens[index][0], tokens[index][1]
            if kind == "#" and index + 1 < len(tokens):
                following = tokens[index + 1]
                if following[0] == "text" and following[1][0].isdigit():
                    number = int(following[1][0])
                    if 1 <= number <= len(arguments):
                        body.extend(arguments[number - 1])
                    if len(following[1]) > 1:
                        body.append(("text", following[1][1:], line, file))
                    index += 2
                    continue
                if following[0] == "#":
                    body.append(("#", "#", line, file))
                    index += 2
                    continue
            body.append((kind, value, line, file))
            index += 1
        self.expanded_characters += sum(len(token[1]) + 1 for token in body)
        self._push(body)

    def _accent(self, name: str, line: int, file: str) -> None:
        argument = self._read_argument(True, line, file, name)
        if not argument:
            return
        text = self._capture(argument, None)
        if text:
            base = {"ı": "i", "ȷ": "j"}.get(text[0], text[0])
            text = unicodedata.normalize("NFC", base + tables.ACCENTS[name]) + text[1:]
        self.output.write(text, line, file)

    # -- handlers (one per command family; registered in _HANDLERS below) ------------------

    def _line_break(self, name: str, line: int, file: str) -> None:
        self._read_star()
        self._read_delimited("[", "]")
        self.output.space(line, file)
        if self.tabulars and self.math is None:
            self._next_cell(rows=1)

    def _next_cell(self, rows: int = 0, columns: int = 0) -> None:
        """Move to the next cell of the innermost table: a column on (&) or a row down (\\\\)."""
        table = self.tabulars[-1]
        if rows:
            table[1], table[2] = table[1] + rows, 1
        else:
            table[2] += columns
        self.output.enter_cell(f"table {table[0]}, row {table[1]}, column {table[2]}")

    def _par(self, name: str, line: int, file: str) -> None:
        self.output.paragraph_break(line, file)

    def _math_open(self, name: str, line: int, file: str) -> None:
        if self.math is None:
            self.math = name
            self.math_opened = ("\\" + name, line, file)
            if name == "[":
                self.output.space(line, file)

    def _math_close(self, name: str, line: int, file: str) -> None:
        if self.math == {")": "(", "]": "["}[name]:
            self.math = None
            if name == "]":
                self.output.space(line, file)

    def _text_argument(self, name: str, line: int, file: str) -> None:
        """\\text{...} and kin inside math print their argument as text."""
        if self.math is None:
            return  # in text mode the braced argument is read as text anyway
        argument = self._read_argument(True, line, file, name)
        if argument is not None:
            self._push([("{", "{", line, file), ("mode", "text", line, file), *argument,
                        ("}", "}", line, file)])

    def _ensuremath(self, name: str, line: int, file: str) -> None:
        argument = self._read_argument(True, line, file, name)
        if argument is not None:
            self._push([("{", "{", line, file), ("mode", "math", line, file), *argument,
                        ("}", "}", line, file)])

    def _fraction(self, name: str, line: int, file: str) -> None:
        numerator = self._read_argument(True, line, file, name) or []
        denominator = self._read_argument(True, line, file, name) or []
        separator = "/" if name != "binom" else " "
        self._push([("{", "{", line, file), *numerator, ("}", "}", line, file),
                    ("emit", separator, line, file),
                    ("{", "{", line, file), *denominator, ("}", "}", line, file)])

    def _root(self, name: str, line: int, file: str) -> None:
        self._read_delimited("[", "]")
        argument = self._read_argument(True, line, file, name) or []
        self._push([("emit", "√", line, file), ("{", "{", line, file), *argument,
                    ("}", "}", line, file)])

    def _quantity(self, name: str, line: int, file: str) -> None:
        """siunitx: \\SI{2.1}{\\percent} prints the number, a space and the unit."""
        self._read_delimited("[", "]")
        number = self._read_argument(True, line, file, name) or []
        unit = self._read_argument(True, line, file, name) or []
        self._push([*number, ("space", " ", line, file), ("{", "{", line, file), *unit,
                    ("}", "}", line, file)])

    def _xspace(self, name: str, line: int, file: str) -> None:
        following = self._next()
        if following[0] in ("text", "cs") and following[1][:1] not in tuple(".,;:!?)]'/-"):
            self.output.space(line, file)
        elif following[0] in ("space", "cspace", "nl"):
            self.output.space(line, file)
        self._unread(following)

    def _enquote(self, name: str, line: int, file: str) -> None:
        argument = self._read_argument(True, line, file, name)
        if argument is not None:
            self._push([("emit", "“", line, file), *argument, ("emit", "”", line, file)])

    def _title(self, name: str, line: int, file: str) -> None:
        """Section titles and captions stand as paragraphs; the preamble prints its \\title
        and \\abstract (APA classes put the abstract there)."""
        if name in ("title", "abstract"):
            following = self._next_non_space()
            self._unread(following)
            if following[0] != "{":
                return  # a switch (\abstract in some classes), not a command with a title
        else:
            self._read_star()
        self._read_delimited("[", "]")
        argument = self._read_argument(True, line, file, name, long=name == "abstract")
        if argument is None:
            return
        output = self.output
        suppressed = output.suppressed

        def start() -> None:
            output.suppressed = False
            output.paragraph_break(line, file)

        def end() -> None:
            if name in tables.RUN_IN_TITLES:
                output.space(line, file)
            else:
                output.paragraph_break(line, file)
            output.suppressed = suppressed

        tokens = [("act", start, line, file)]
        if name in tables.BLOCK_TITLES and not output.captures:
            title = _WHITESPACE.sub(" ", self._capture(argument, None)).strip()
            tokens.append(("act", lambda: output.begin_section(title), line, file))
        self._push([*tokens, *argument, ("act", end, line, file)])

    def _footnote(self, name: str, line: int, file: str) -> None:
        self._read_delimited("[", "]")
        argument = self._read_argument(True, line, file, name, long=True)
        if argument is not None:
            self._push([("space", " ", line, file), ("emit", "(", line, file), *argument,
                        ("emit", ")", line, file)])

    def _item(self, name: str, line: int, file: str) -> None:
        label = self._read_delimited("[", "]")
        self.output.paragraph_break(line, file)
        if label:
            self._push([*label, ("space", " ", line, file)])

    def _verb(self, name: str, line: int, file: str) -> None:
        lexer = self._top_lexer()
        if lexer is None or lexer.pos >= len(lexer.text):
            return
        text = lexer.text
        start = lexer.pos
        if text[start] == "*":
            start += 1
        delimiter = text[start:start + 1]
        if not delimiter or delimiter == "\n":
            return
        end_of_line = text.find("\n", start + 1)
        end_of_line = len(text) if end_of_line == -1 else end_of_line
        end = text.find(delimiter, start + 1, end_of_line)
        if end == -1:
            self._note(line, file, f"\\{name} without its closing {delimiter}; read on as text")
            lexer.pos = start + 1
            return
        self.output.write(text[start + 1:end], line, file)
        lexer.pos = end + 1

    def _url(self, name: str, line: int, file: str) -> None:
        """\\url{...} prints the address as typed (it may hold %, _ and #); \\href drops it."""
        lexer = self._top_lexer()
        if lexer is not None and lexer.text.startswith("{", lexer.pos):
            end = lexer.text.find("}", lexer.pos)
            newline = lexer.text.find("\n", lexer.pos)
            if end != -1 and (newline == -1 or end < newline):
                address = lexer.text[lexer.pos + 1:end]
                lexer.pos = end + 1
                if name != "href":
                    self.output.write(address, line, file)
                return
        argument = self._read_argument(False, line, file, name)
        if argument is not None and name != "href":
            self.output.write(_raw(argument), line, file)

    def _iffalse(self, name: str, line: int, file: str) -> None:
        depth = 0
        while True:
            token = self._next()
            kind, value = token[0], token[1]
            if kind in ("eof", "stop"):
                self._unread(token)
                self._note(line, file, "\\iffalse without its \\fi: the rest was left out")
                return
            if kind == "cs":
                if value.startswith("if"):
                    depth += 1
                elif value == "fi":
                    if depth == 0:
                        return
                    depth -= 1

    def _begin(self, name: str, line: int, file: str) -> None:
        argument = self._read_argument(False, line, file, name)
        if argument is None:
            return
        environment = _raw(argument).strip()
        output = self.output
        if environment == "document":
            output.suppressed = False
            output.paragraph_break(line, file)
            return
        if environment in tables.VERBATIM or environment in tables.SKIPPED:
            self._verbatim(environment, line, file, keep=environment in tables.VERBATIM)
            return
        self._skip_arguments(tables.ENVIRONMENT_ARGUMENTS.get(environment, ""), line, file,
                             environment)
        self.environments.append(environment)
        if environment in tables.TABULAR and self.math is None:
            self.tables_read += 1
            self.tabulars.append([self.tables_read, 1, 1])
            output.paragraph_break(line, file)
            output.enter_cell(f"table {self.tables_read}, row 1, column 1")
            return
        if environment in tables.DISPLAY_MATH:
            if self.math is None:
                self.math = ("environment", environment)
                self.math_opened = (f"\\begin{{{environment}}}", line, file)
                if environment != "math":
                    output.space(line, file)
        elif environment not in tables.INNER_MATH:
            output.paragraph_break(line, file)

    def _end(self, name: str, line: int, file: str) -> None:
        argument = self._read_argument(False, line, file, name)
        if argument is None:
            return
        environment = _raw(argument).strip()
        if environment == "document":
            self._end_document()
            return
        if environment in self.environments:
            while self.environments and self.environments.pop() != environment:
                pass
        if environment in tables.TABULAR and self.tabulars and self.math is None:
            self.tabulars.pop()
            table = self.tabulars[-1] if self.tabulars else None
            self.output.enter_cell(f"table {table[0]}, row {table[1]}, column {table[2]}"
                                   if table else None)
        if self.math == ("environment", environment):
            self.math = None
            if environment != "math":
                self.output.space(line, file)
        elif environment not in tables.DISPLAY_MATH and environment not in tables.INNER_MATH:
            self.output.paragraph_break(line, file)

    def _end_document(self) -> None:
        """\\end{document}: TeX reads no further (in a subfile: no further in that file)."""
        for index in range(len(self.sources) - 1, -1, -1):
            source = self.sources[index]
            if source.__class__ is _Lexer:
                if index == 0:
                    self.sources.clear()
                    return
                del self.sources[index:]
                if source.restore is not None:
                    source.restore()
                return
        self.sources.clear()

    def _end_input(self, name: str, line: int, file: str) -> None:
        """\\endinput: the file being read ends at the end of this line."""
        for source in reversed(self.sources):
            if source.__class__ is _Lexer:
                # what follows on the line is still read, as TeX does; nothing after it
                if source.pending is not None and "\n" in source.pending[1]:
                    cut = source.pos  # the line end after \endinput is already read
                else:
                    cut = source.text.find("\n", source.pos)
                if cut != -1:
                    source.text = source.text[:cut]
                return

    def _verbatim(self, environment: str, line: int, file: str, keep: bool) -> None:
        """Print (or, for comments and drawings, skip) an environment's text as typed."""
        ending = re.compile(r"\\end[ \t]*\{" + re.escape(environment) + r"\}")
        lexer = self._top_lexer()
        if lexer is None:
            # (only reachable from inside a macro argument, where LaTeX forbids verbatim)
            tokens = []
            while True:
                token = self._next()
                if token[0] in ("eof", "stop"):
                    self._unread(token)
                    break
                if token[0] == "cs" and token[1] == "end":
                    argument = self._read_argument(False, line, file, "end")
                    if argument is not None and _raw(argument).strip() == environment:
                        break
                tokens.append(token)
            if keep:
                self.output.paragraph_break(line, file)
                self.output.write(_raw(tokens), line, file)
                self.output.paragraph_break(line, file)
            return
        text = lexer.text
        found = ending.search(text, lexer.pos)
        stop = found.start() if found else len(text)
        start, first_line = lexer.pos, lexer.line
        if keep and environment in ("lstlisting", "minted", "Verbatim"):
            # options on the \begin line ([language=R], {r}) are not part of the listing
            options = re.compile(r"[ \t]*(?:\[[^\]\n]*\][ \t]*)?(?:\{[^}\n]*\}[ \t]*)?")
            start = options.match(text, start, stop).end()
        content = text[start:stop]
        lexer.line += text.count("\n", lexer.pos, stop)
        lexer.pos = found.end() if found else len(text)
        if not found:
            self._note(line, file, f"\\begin{{{environment}}} without its \\end; the rest of "
                                   f"the file was taken as {environment}")
        if keep:
            self.output.paragraph_break(line, file)
            self.output.write(content, first_line, file)
            self.output.paragraph_break(line, file)

    # -- definitions ---------------------------------------------------------------------

    def _define(self, name: str, line: int, file: str) -> None:
        if name in ("def", "gdef", "edef", "xdef"):
            self._define_tex(name, line, file)
        elif name == "let":
            self._let(line, file)
        elif name in ("newenvironment", "renewenvironment"):
            self._skip_arguments("smoomm", line, file, name)
        elif name in ("NewDocumentCommand", "RenewDocumentCommand", "ProvideDocumentCommand"):
            self._skip_arguments("mmm", line, file, name)
        elif name == "NewDocumentEnvironment":
            self._skip_arguments("mmmm", line, file, name)
        elif name == "DeclareMathOperator":
            self._read_star()
            target = self._defined_name(line, file, name)
            body = self._read_argument(False, line, file, name)
            if target and body is not None:
                self.macros[target] = _Macro(0, None, [("cs", "mathrm", line, file),
                                                       ("{", "{", line, file), *body,
                                                       ("}", "}", line, file)])
        else:
            self._read_star()
            target = self._defined_name(line, file, name)
            count_argument = self._read_delimited("[", "]")
            count = 0
            if count_argument:
                digits = _raw(count_argument).strip()
                count = int(digits) if digits.isdigit() and int(digits) <= 9 else 0
            default = self._read_delimited("[", "]") if count else None
            body = self._read_argument(False, line, file, name)
            if target is None or body is None:
                return
            if name == "providecommand" and target in self.macros:
                return
            self.macros[target] = _Macro(count, default, body)

    def _defined_name(self, line: int, file: str, name: str) -> str | None:
        argument = self._read_argument(False, line, file, name)
        names = [token[1] for token in argument or () if token[0] == "cs"]
        if not names:
            self._note(line, file, f"\\{name} without the name of a command; ignored")
            return None
        return names[0]

    def _define_tex(self, name: str, line: int, file: str) -> None:
        target = self._next_non_space()
        if target[0] != "cs":
            self._unread(target)
            return
        count = 0
        while True:  # the parameter text, up to the body's opening brace
            token = self._next()
            if token[0] == "{":
                self._unread(token)
                break
            if token[0] in _TERMINATORS:
                self._unread(token)
                return
            if token[0] == "#":
                count = min(count + 1, 9)
        body = self._read_argument(False, line, file, name)
        if body is not None:
            self.macros[target[1]] = _Macro(count, None, body)

    def _let(self, line: int, file: str) -> None:
        target = self._next_non_space()
        if target[0] != "cs":
            self._unread(target)
            return
        source = self._next_non_space()
        if source[0] == "text" and source[1].startswith("="):
            if len(source[1]) > 1:
                source = ("text", source[1][1:], source[2], source[3])
            else:
                source = self._next_non_space()
        if source[0] in _TERMINATORS:
            self._unread(source)
            return
        if source[0] == "cs" and source[1] in self.macros:
            self.macros[target[1]] = self.macros[source[1]]
        elif not (source[0] == "cs" and source[1] == target[1]):
            self.macros[target[1]] = _Macro(0, None, [source])

    # -- inputs --------------------------------------------------------------------------

    def _input(self, name: str, line: int, file: str) -> None:
        self._read_star()
        folder = ""
        if name in ("import", "subimport", "inputfrom", "subinputfrom", "includefrom",
                    "subincludefrom"):
            folder_argument = self._read_argument(False, line, file, name)
            folder = _raw(folder_argument or []).strip()
            if name.startswith("sub"):
                current = self._current_file_folder()
                folder = os.path.join(current, folder) if current else folder
        token = self._next_non_space()
        if token[0] == "{":
            self._unread(token)
            argument = self._read_argument(False, line, file, name)
            if argument is None:
                return
        else:
            # TeX's own syntax: \input file (the name ends at a space)
            argument = []
            while token[0] in ("text", "_"):
                name_part, space, rest = token[1].partition(" ")
                argument.append(("text", name_part, token[2], token[3]))
                if space:
                    token = ("text", space + rest, token[2], token[3])
                    break
                token = self._next()
            self._unread(token)
            if not argument:
                return
        if any(token[0] == "cs" for token in argument):
            self._note(line, file, f"\\{name}{{{_raw(argument).strip()}}}: a file name made by "
                                   f"a command cannot be followed; not read")
            return
        target = _raw(argument).strip().strip('"')
        if name in _PAGE_INPUTS:
            self.output.paragraph_break(line, file)
        self._read_file(os.path.join(folder, target) if folder else target, name, line, file)

    def _current_file_folder(self) -> str:
        for source in reversed(self.sources):
            if source.__class__ is _Lexer:
                return os.path.dirname(source.file) if source is not self.sources[0] else ""
        return ""

    def _read_file(self, target: str, command: str, line: int, file: str) -> None:
        shown = f"\\{command}{{{target}}}"
        if not target:
            self._note(line, file, f"{shown}: no file name; nothing read")
            return
        if self.root is None:
            self._note(line, file, f"{shown} not followed: the manuscript was not read from a "
                                   f"file, so it has no folder to look in")
            return
        if os.path.isabs(target) or target.startswith("~") or re.match(r"^[A-Za-z]:", target):
            self._note(line, file, f"{shown} refused: an absolute path is not followed (only "
                                   f"files in the manuscript's folder are read)")
            return
        candidates = [target] if target.lower().endswith(".tex") else [target + ".tex", target]
        found: tuple[str, str] | None = None
        for candidate in candidates:
            relative = os.path.normpath(candidate)
            if relative == os.pardir or relative.startswith(os.pardir + os.sep):
                self._note(line, file, f"{shown} refused: it leaves the manuscript's folder")
                return
            real = os.path.realpath(os.path.join(self.root, relative))
            if real != self.root and not real.startswith(self.root + os.sep):
                self._note(line, file, f"{shown} refused: it leads out of the manuscript's "
                                       f"folder")
                return
            if os.path.isfile(real):
                found = (relative.replace(os.sep, "/"), real)
                break
        if found is None:
            self._note(line, file, f"{shown}: no such file ({candidates[0]}); the rest was read "
                                   f"without it")
            return
        shown_name, real = found
        open_files = {source.real for source in self.sources if source.__class__ is _Lexer}
        if real in open_files:
            self._note(line, file, f"{shown}: {shown_name} is already being read (an include "
                                   f"cycle); not read again")
            return
        if self.files_read >= MAX_FILES:
            self._note_once("files", f"{file}:{line}: more than {MAX_FILES} files are input; "
                                     f"{shown} and any later inputs were not read")
            return
        try:
            size = os.path.getsize(real)
            if self.bytes_read + size > MAX_INPUT_BYTES:
                self._note_once("bytes", f"{file}:{line}: the input files exceed "
                                         f"{MAX_INPUT_BYTES // 2**20} MB; {shown} and any "
                                         f"later inputs were not read")
                return
            with open(real, "rb") as handle:
                data = handle.read()
        except OSError as exc:
            self._note(line, file, f"{shown}: cannot be read ({exc.strerror or exc}); the rest "
                                   f"was read without it")
            return
        try:
            text, _ = decode(data)
        except NotText as exc:
            self._note(line, file, f"{shown}: {exc}; the rest was read without it")
            return
        self.files_read += 1
        self.inputs.append(real)
        self.bytes_read += size
        if command in _PAGE_INPUTS:
            self._push([("act", lambda: self.output.paragraph_break(line, file), line, file)])
        self._open(_Lexer(_lines(text), shown_name, real))


def _shown(name: str) -> str:
    """A command's name as typed: "\\footnote", but "^" for a superscript."""
    return name if name in ("^", "_") else "\\" + name


def _lines(text: str) -> str:
    return text.replace("\r\n", "\n").replace("\r", "\n")


Handler = Callable[[_Converter, str, int, str], None]

_HANDLERS: dict[str, Handler] = {
    "\\": _Converter._line_break,
    "par": _Converter._par,
    "(": _Converter._math_open,
    "[": _Converter._math_open,
    ")": _Converter._math_close,
    "]": _Converter._math_close,
    "ensuremath": _Converter._ensuremath,
    "frac": _Converter._fraction,
    "dfrac": _Converter._fraction,
    "tfrac": _Converter._fraction,
    "binom": _Converter._fraction,
    "sqrt": _Converter._root,
    "SI": _Converter._quantity,
    "qty": _Converter._quantity,
    "xspace": _Converter._xspace,
    "enquote": _Converter._enquote,
    "item": _Converter._item,
    "verb": _Converter._verb,
    "lstinline": _Converter._verb,
    "url": _Converter._url,
    "nolinkurl": _Converter._url,
    "path": _Converter._url,
    "href": _Converter._url,
    "iffalse": _Converter._iffalse,
    "begin": _Converter._begin,
    "end": _Converter._end,
    "endinput": _Converter._end_input,
    "caption": _Converter._title,
    "title": _Converter._title,
    "abstract": _Converter._title,
    **{name: _Converter._title for name in tables.BLOCK_TITLES | tables.RUN_IN_TITLES},
    **{name: _Converter._text_argument for name in tables.TEXT_ARGUMENT},
    **{name: _Converter._footnote for name in tables.FOOTNOTES},
    **{name: _Converter._input for name in tables.INPUTS},
    **{name: _Converter._define for name in tables.DEFINITIONS},
}

__all__ = ["FORMAT", "SUFFIXES", "input_files", "read", "sniff"]
