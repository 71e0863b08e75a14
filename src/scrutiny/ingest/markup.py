"""HTML pages and JATS XML articles (the open standard in which journals publish articles).

Both are read with lxml and walked in document order. What a reader of the article sees is
kept; what is not part of its text is left out:

* HTML: everything in the page's body except scripts, styles, navigation, forms, embedded
  media and elements marked hidden (`hidden`, `aria-hidden="true"`, `display: none`);
* JATS: the abstracts, the body, the back matter except the reference list, and the floats
  (tables and figures kept apart from the text); not the journal and article metadata
  (keywords included), not citations, not sub-articles (peer-review reports, translations),
  not labels ("Table 1", "2.1").

Inline markup is read as the text it renders: `χ<sup>2</sup>(1, N = 80)` reads
`χ2(1, N = 80)`, `<italic>p</italic> &lt; .001` reads `p < .001`, `t<sub>18</sub>` reads
`t18`. Superscript note and citation markers (a superscript that holds a link or a
cross-reference, and JATS cross-references to footnotes) are left out, so that
`p = .04<sup><a href="#n3">3</a></sup>` does not read `p = .043`; a plain superscript of
digits right after a number reads as superscript digits (`p = .04<sup>3</sup>` is `p = .04³`,
which normalisation does not read as `.043`). MathML reads as its
characters (`<msup><mi>χ</mi><mn>2</mn></msup>` is `χ2`); JATS `<alternatives>` are read once
(a table or MathML before TeX, TeX before a picture); TeX math is reduced to plain text.

Paragraphs are joined with a blank line, so that a paragraph stays a paragraph for extraction;
the paragraphs of one table cell are joined with a line break and form one piece of text.

Locations: `section` is the title of the nearest enclosing section (JATS `<sec>` and the
like; the latest heading `<h1>`-`<h6>` in HTML, within its `<section>` or `<article>`), or
"Abstract" for an untitled abstract and "footnotes" for untitled JATS notes; `paragraph` numbers
the blocks with text (paragraphs, list items, captions, notes; 1-based in document order;
headings and table cells are not counted); table text has `cell` = "table 2, row 3, column 1"
(tables numbered in document order, columns counted with column and row spans); `line` is the
line of the source file.

Parsing is safe: no network, no DTD loading, no external entities, no huge trees. A file that
declares an external entity is refused without anything being fetched or read; internal entities
are expanded by this reader, within limits, and a file whose entities would expand without bound
(an entity-expansion bomb, "billion laughs") is refused. Named HTML entities in JATS (`&nbsp;`,
`&minus;`, defined by the JATS DTD, which is never loaded) are read as their characters.
"""

from __future__ import annotations

import codecs
import html.entities
import re
import sys
from dataclasses import dataclass, field
from pathlib import Path

from ..errors import InputError
from ..model import Document, Segment
from .normalise import TO_SUPERSCRIPT

FORMAT = "html"
ALSO = ("jats",)
SUFFIXES = (".html", ".htm", ".xhtml", ".xml", ".nxml")

_HTML_SUFFIXES = (".html", ".htm", ".xhtml")
_XML_SUFFIXES = (".xml", ".nxml")
_SNIFF_BYTES = 64 * 1024

#: the longest text one internal entity may expand to, and all entities of a file together
MAX_ENTITY_EXPANSION = 10_000
MAX_TOTAL_ENTITY_TEXT = 1_000_000
#: elements nested deeper than this are refused (real pages nest a few dozen levels)
MAX_DEPTH = 1_000
#: how deep lxml's parsers nest elements without their "huge tree" option
_PARSER_DEPTH = 256

_MATHML = "{http://www.w3.org/1998/Math/MathML}"
_OASIS = "{http://www.niso.org/standards/z39-96/ns/oasis-exchange/table}"

# -- sniffing --------------------------------------------------------------------------------

_PROLOG = re.compile(
    r"""\s*(?:
        <\?.*?\?>                                   # XML declaration, processing instruction
      | <!--.*?-->                                  # comment
      | <!DOCTYPE\s+(?P<doctype>[^\s\[>]+)[^\[>]*   # document type, with an internal subset
        (?:\[.*?\]\s*)?>
    )""",
    re.DOTALL | re.VERBOSE | re.IGNORECASE,
)
_ROOT = re.compile(r"\s*<(?P<root>[A-Za-z_][\w.:-]*)")
_JATS_MARKERS = re.compile(
    r"dtd-version\s*=|article-type\s*=|xmlns:mml|xmlns:xlink|JATS|-//NLM//|archivearticle"
    r"|journalpublishing|<front[\s>]|<article-meta[\s>]|<body[\s>]")
_DOCBOOK = re.compile(r"docbook", re.IGNORECASE)
_HTML_ROOTS = frozenset({
    "head", "body", "meta", "title", "link", "style", "script", "div", "p", "section", "main",
    "article", "table", "h1", "h2", "h3", "h4", "h5", "h6", "header", "span", "ul", "ol",
})


def _head_text(data: bytes) -> str:
    """The start of the file, decoded well enough to read its tags."""
    sample = data[:_SNIFF_BYTES]
    for bom, codec in ((codecs.BOM_UTF32_LE, "utf-32-le"), (codecs.BOM_UTF32_BE, "utf-32-be"),
                       (codecs.BOM_UTF8, "utf-8"), (codecs.BOM_UTF16_LE, "utf-16-le"),
                       (codecs.BOM_UTF16_BE, "utf-16-be")):
        if sample.startswith(bom):
            return sample[len(bom):].decode(codec, "ignore")
    if sample[:2] in (b"<\x00", b" \x00", b"\n\x00"):
        return sample.decode("utf-16-le", "ignore")
    if sample[:2] in (b"\x00<", b"\x00 ", b"\x00\n"):
        return sample.decode("utf-16-be", "ignore")
    return sample.decode("latin-1")


def _kind(data: bytes, path: str) -> str | None:
    head = _head_text(data)
    position = 0
    doctype = None
    while match := _PROLOG.match(head, position):
        if match.end() == position:
            break
        doctype = (match.group("doctype") or doctype or "").lower() or None
        position = match.end()
    root_match = _ROOT.match(head, position)
    root = root_match.group("root").lower() if root_match else None
    name = (root or doctype or "").rsplit(":", 1)[-1]
    suffix = Path(path).suffix.lower()
    if not name:
        return None
    if name == "html":
        return "html"
    if name == "article":
        if _DOCBOOK.search(head[:4096]):
            return None
        if _JATS_MARKERS.search(head) or suffix in _XML_SUFFIXES:
            return "jats"
        return "html" if suffix in _HTML_SUFFIXES else None
    if suffix in _HTML_SUFFIXES and name in _HTML_ROOTS:
        return "html"
    return None


def sniff(data: bytes, path: str) -> str | None:
    if not data.lstrip(b"\xef\xbb\xbf\xff\xfe\x00 \t\r\n")[:1] == b"<":
        return None
    return _kind(data, path)


def read(data: bytes, path: str) -> Document:
    from . import build_document

    kind = _kind(data, path) or ("jats" if Path(path).suffix.lower() in _XML_SUFFIXES
                                 else "html")
    if kind == "jats":
        root, entities, encoding = _parse_xml(data, path)
        walker: _Walker = _JatsWalker(entities, path)
    else:
        root, encoding = _parse_html(data, path)
        walker = _HtmlWalker(path)
    if root is None:
        raise InputError(path, "no text: the file has no elements")
    text, segments = walker.run(root)
    if not text.strip():
        where = "in its abstract, body or back matter" if kind == "jats" else "in its body"
        raise InputError(path, f"no text: the {kind.upper()} file has no readable text {where}")
    return build_document(path, kind, text, segments=tuple(segments), encoding=encoding)


# -- parsing ---------------------------------------------------------------------------------

_BOMB_MESSAGES = re.compile(r"amplification|entity reference loop|Detected an entity")
_UNDEFINED_ENTITY = re.compile(r"Entity '([^']+)' not defined")
_ENTITY_REFERENCE = re.compile(r"&(?:#(x[0-9A-Fa-f]+|[0-9]+)|([A-Za-z_][\w.-]*));")
_PREDEFINED = {"lt": "<", "gt": ">", "amp": "&", "quot": '"', "apos": "'"}
_NAMED_REFERENCE_BYTES = re.compile(rb"&([A-Za-z][A-Za-z0-9]*);")


def _one_line(message: object) -> str:
    text = str(message).strip()
    return text.splitlines()[0] if text else "no details"


def _parser_error(exc) -> str:
    """The parser's error as "line 3, column 7: what went wrong"."""
    message = re.sub(r",? line \d+, column \d+$", "", _one_line(getattr(exc, "msg", "") or exc))
    position = getattr(exc, "position", None)
    if not position or not position[0]:
        return message
    return f"line {position[0]}, column {position[1]}: {message}"


def _xml_parser():
    from lxml import etree

    return etree.XMLParser(resolve_entities=False, no_network=True, load_dtd=False,
                           dtd_validation=False, attribute_defaults=False, huge_tree=False,
                           collect_ids=False)


def _bomb(path: str, detail: str) -> InputError:
    return InputError(path, f"refused: an entity-expansion bomb ({detail}); its entities are "
                            "not expanded")


def _numeric_named_references(data: bytes) -> bytes:
    """Replace named HTML entities (`&nbsp;`), which an XML file can only use with a DTD that
    is never loaded here, by numeric character references."""

    def replace(match: re.Match) -> bytes:
        name = match.group(1).decode("ascii")
        if name in _PREDEFINED:
            return match.group(0)
        characters = html.entities.html5.get(name + ";")
        if characters is None:
            return match.group(0)
        return b"".join(b"&#%d;" % ord(character) for character in characters)

    return _NAMED_REFERENCE_BYTES.sub(replace, data)


def _parse_xml(data: bytes, path: str):
    from lxml import etree

    try:
        root = etree.fromstring(data, _xml_parser())
    except etree.XMLSyntaxError as exc:
        message = _parser_error(exc)
        if _BOMB_MESSAGES.search(message):
            raise _bomb(path, "its entities refer to each other in a loop" if "loop" in message
                        else "its entities would expand far beyond the size of the file") \
                from None
        if "Excessive depth" in message:
            raise InputError(path, f"refused: elements nested more than {_PARSER_DEPTH} levels "
                                   f"deep ({message.split(':')[0]})") from None
        if not _UNDEFINED_ENTITY.search(message):
            raise InputError(path, f"not well-formed XML ({message})") from None
        try:
            root = etree.fromstring(_numeric_named_references(data), _xml_parser())
        except etree.XMLSyntaxError as again:
            raise InputError(path, f"not well-formed XML ({_parser_error(again)})") from None
    except ValueError as exc:
        raise InputError(path, f"not readable as XML ({_one_line(exc)})") from None
    if root is None:
        return None, {}, None
    tree = root.getroottree()
    entities = _declared_entities(tree.docinfo.internalDTD, path)
    return root, entities, (tree.docinfo.encoding or "").lower() or None


def _declared_entities(dtd, path: str) -> dict[str, str]:
    """The text each internal entity of the file's own DTD expands to.

    An external entity (one naming a file or URL) is refused outright: it is never fetched or
    read. Internal entities are expanded here rather than by the parser, so that their size can
    be bounded.
    """
    if dtd is None:
        return {}
    raw: dict[str, str] = {}
    for entity in dtd.iterentities():
        if entity.system_url is not None:
            url = entity.system_url if len(entity.system_url) <= 80 else \
                entity.system_url[:77] + "..."
            raise InputError(path, f"refused: it declares an external entity ({entity.name} -> "
                                   f"{url}); external entities are never fetched or read")
        raw[entity.name] = entity.content or ""
    expanded: dict[str, str] = {}

    def expand(name: str, active: tuple[str, ...]) -> str:
        if name in expanded:
            return expanded[name]
        if name in active:
            raise _bomb(path, f"the entity {name} refers back to itself")

        def reference(match: re.Match) -> str:
            if match.group(1):
                return _character(match.group(1))
            inner = match.group(2)
            if inner in _PREDEFINED:
                return _PREDEFINED[inner]
            if inner in raw:
                return expand(inner, active + (name,))
            return html.entities.html5.get(inner + ";", match.group(0))

        text = _ENTITY_REFERENCE.sub(reference, raw[name])
        if len(text) > MAX_ENTITY_EXPANSION:
            raise _bomb(path, f"the entity {name} expands to more than "
                              f"{MAX_ENTITY_EXPANSION:,} characters")
        expanded[name] = re.sub(r"<[^>]*>", "", text)  # markup inside an entity: its text
        return expanded[name]

    for name in raw:
        expand(name, ())
    return expanded


def _character(reference: str) -> str:
    try:
        code = int(reference[1:], 16) if reference[0] in "xX" else int(reference)
        return chr(code)
    except (ValueError, OverflowError):
        return ""


_XML_DECLARATION = re.compile(r"\A\s*<\?xml[^>]*\?>")
_DECLARED_CHARSET = re.compile(
    rb"""<\?xml[^>]*encoding\s*=\s*["']([\w.:-]+)["']"""
    rb"""|<meta[^>]*charset\s*=\s*["']?([\w.:-]+)""", re.IGNORECASE)


def _decode_html(data: bytes, path: str) -> tuple[str, str]:
    from .text import NotText, decode

    if not data.startswith((codecs.BOM_UTF8, codecs.BOM_UTF16_LE, codecs.BOM_UTF16_BE)):
        declared = _DECLARED_CHARSET.search(data[:4096])
        if declared:
            label = (declared.group(1) or declared.group(2)).decode("ascii").lower()
            try:
                codec = codecs.lookup(label).name
                if codec.startswith(("utf-16", "utf-32")):
                    raise LookupError  # a page declared in ASCII cannot be UTF-16
                return data.decode(codec), label
            except (LookupError, UnicodeDecodeError):
                pass  # a wrong declaration: decide from the bytes
    try:
        return decode(data)
    except NotText as exc:
        raise InputError(path, str(exc)) from None


def _parse_html(data: bytes, path: str):
    from lxml import etree

    text, encoding = _decode_html(data, path)
    # lxml refuses a decoded string that declares an encoding; keep the line numbers.
    text = _XML_DECLARATION.sub(lambda m: "\n" * m.group(0).count("\n"), text, count=1)
    parser = etree.HTMLParser(no_network=True, huge_tree=False, default_doctype=False)
    try:
        root = etree.fromstring(text, parser)
    except etree.XMLSyntaxError as exc:
        if "empty" in str(exc).lower():
            return None, encoding
        raise InputError(path, f"not readable as HTML ({_parser_error(exc)})") from None
    except ValueError as exc:
        raise InputError(path, f"not readable as HTML ({_one_line(exc)})") from None
    # The HTML parser forgives everything, but drops what is nested too deeply: say so rather
    # than report a page without text.
    for error in parser.error_log:
        if "Excessive depth" in error.message:
            raise InputError(path, f"refused: elements nested more than {_PARSER_DEPTH} levels "
                                   f"deep (line {error.line})")
    return root, encoding


# -- walking ---------------------------------------------------------------------------------

#: a blank line, with the white space around it
_BLANK_LINES = re.compile(r"\n[^\S\n]*\n\s*")
#: invisible MathML operators (function application, invisible times, separator, plus)
_INVISIBLE = str.maketrans("", "", "\u2061\u2062\u2063\u2064")


@dataclass(eq=False)
class _Owner:
    """The block whose text is being gathered: a paragraph-like block, a heading or a cell."""

    kind: str  # "block", "heading", "cell"
    label: str | None = None
    number: int | None = None


@dataclass
class _Table:
    number: int
    row: int = 0
    column: int = 1
    occupied: set[tuple[int, int]] = field(default_factory=set)


def _span(value: str | None) -> int:
    return min(int(value), 1000) if value and value.strip().isdigit() and int(value) > 0 else 1


class _Walker:
    """Walk an element tree in document order, gathering text block by block.

    Subclasses say what each element is (`kind`); this class keeps the text, the paragraph and
    table counters, the section title and the source line of each piece.
    """

    #: the largest line number the parser reports faithfully
    max_line = 2**31

    def __init__(self, path: str) -> None:
        self.path = path
        self.parts: list[str] = []
        self.length = 0
        self.segments: list[Segment] = []
        self.buffer: list[str] = []
        self.buffer_length = 0
        #: (offset in the buffer, source line there); None: see `_resolved`
        self.marks: list[tuple[int, int | None]] = []
        self.owner: _Owner | None = None
        self.section: str | None = None
        self.paragraphs = 0
        self.tables: list[_Table] = []
        self.table_count = 0
        self.depth = 0
        from lxml import etree

        self.entity_type = etree._Entity
        self.names: dict[str, str] = {}
        self.math_depth = 0

    # what an element is -----------------------------------------------------------------

    def name(self, element) -> str:
        """The element's local name in lower case (without namespace or prefix)."""
        tag = element.tag
        name = self.names.get(tag)
        if name is None:
            name = self.names[tag] = tag.rsplit("}", 1)[-1].rsplit(":", 1)[-1].lower()
        return name

    def kind(self, element, name: str) -> str:
        """One of skip, block, heading, section, table, row, cell, break, space, inline, and
        the subclasses' own kinds."""
        raise NotImplementedError

    # text ---------------------------------------------------------------------------------

    def text(self, text: str | None) -> None:
        if text:
            if self.math_depth:
                text = text.translate(_INVISIBLE)
            self.buffer.append(text)
            self.buffer_length += len(text)

    def mark(self, element) -> None:
        line = getattr(element, "sourceline", None)
        if line and line < self.max_line:
            self.marks.append((self.buffer_length, line))

    def separate(self) -> None:
        """A block boundary inside a table cell: a line break, not a new piece."""
        if self.buffer and not self.buffer[-1].endswith("\n"):
            self.text("\n")
            # a line break the source does not have: the line goes on after it
            self.marks.append((self.buffer_length, None))

    def flush(self) -> None:
        """End the piece of text being gathered: add it to the Document's text, with segments
        that say where it is from."""
        whole = "".join(self.buffer)
        marks = _resolved(self.marks, whole)
        end_line = _line_at(marks, whole, len(whole))
        self.buffer = []
        self.buffer_length = 0
        self.marks = [(0, end_line)] if end_line else []
        # Blank lines inside one block (source formatting, white space between the paragraphs
        # of a table cell) would end the paragraph for extraction: they become one line break.
        stretches = []
        position = 0
        for blank in [*_BLANK_LINES.finditer(whole), None]:
            end = blank.start() if blank else len(whole)
            piece = whole[position:end]
            first = position + len(piece) - len(piece.lstrip())
            last = end - (len(piece) - len(piece.rstrip()))
            if first < last:
                stretches.append((first, last))
            position = blank.end() if blank else end
        if not stretches:
            return
        body = "\n".join(whole[first:last] for first, last in stretches)
        where = self.where(body)
        start = self.length + (2 if self.parts else 0)
        if self.parts:
            self.parts.append("\n\n")
        self.parts.append(body)
        self.length = start + len(body)
        # The true source line at the start of each stretch and at each element inside it; a
        # segment wherever the body runs on a different number of lines than the source (a
        # skipped element, a tag over several lines, collapsed blank lines).
        points = []
        offset = 0
        for first, last in stretches:
            points.append((offset, _line_at(marks, whole, first)))
            points.extend((offset + mark - first, line) for mark, line in marks
                          if first < mark < last)
            offset += last - first + 1
        first_line = points[0][1] or 1
        self.segments.append(Segment(start, line=first_line, **where))
        previous = (0, first_line)
        for offset, line in points[1:]:
            if line is None:
                continue
            if line != previous[1] + body.count("\n", previous[0], offset):
                self.segments.append(Segment(start + offset, line=line, **where))
            previous = (offset, line)

    def where(self, body: str) -> dict[str, object]:
        owner = self.owner
        if owner is None:
            return {"section": self.section}
        if owner.kind == "heading":
            self.section = " ".join(body.split())
            return {"section": self.section}
        if owner.kind == "cell":
            return {"section": self.section, "cell": owner.label}
        if owner.number is None:
            self.paragraphs += 1
            owner.number = self.paragraphs
        return {"section": self.section, "paragraph": owner.number}

    # the walk -----------------------------------------------------------------------------

    def run(self, root) -> tuple[str, list[Segment]]:
        # The walk recurses a few calls per level of nesting; pages nest far less deeply than
        # MAX_DEPTH, and deeper files are refused rather than left to exhaust the stack.
        limit = sys.getrecursionlimit()
        sys.setrecursionlimit(max(limit, 8 * MAX_DEPTH + 1000))
        try:
            self.element(root)
        finally:
            sys.setrecursionlimit(limit)
        self.flush()
        return "".join(self.parts), self.segments

    def children(self, element) -> None:
        self.text(element.text)
        for child in element:
            self.node(child)
            self.text(child.tail)

    def node(self, node) -> None:
        if isinstance(node.tag, str):
            self.element(node)
        elif isinstance(node, self.entity_type):  # an entity reference the parser kept
            self.text(self.entity(node))
        else:  # a comment or processing instruction
            self.skipped(node)

    def entity(self, node) -> str:
        return ""

    def skipped(self, node) -> None:
        """Leave `node` out of the text, but count its lines, so that the line numbers of what
        follows stay those of the source file."""
        from lxml import etree

        line = getattr(node, "sourceline", None)
        if not line or line >= self.max_line:
            return
        if not isinstance(node.tag, str):
            # libxml2 gives a comment or processing instruction the line on which it ends
            self.marks.append((self.buffer_length, line))
            return
        # and an element the line on which its start tag ends
        try:
            serialised = etree.tostring(node, with_tail=False, encoding=str)
        except (ValueError, TypeError, etree.LxmlError):
            return
        start_tag_end = serialised.find(">")
        self.marks.append((self.buffer_length,
                           line + serialised.count("\n", max(start_tag_end, 0))))

    def element(self, element) -> None:
        name = self.name(element)
        kind = self.kind(element, name)
        if kind == "skip":
            self.skipped(element)
            return
        self.mark(element)
        self.depth += 1
        if self.depth > MAX_DEPTH:
            raise InputError(self.path, f"refused: elements nested more than {MAX_DEPTH:,} "
                                        "levels deep")
        handler = getattr(self, "on_" + kind, None)
        if handler is not None:
            handler(element, name)
        else:
            self.children(element)
        self.depth -= 1

    def in_cell(self) -> bool:
        return self.owner is not None and self.owner.kind == "cell"

    def on_superscript(self, element, name: str) -> None:
        # digits raised right after a number: an exponent ("10<sup>4</sup>") or a note marker
        # ("p = .021<sup>3</sup>"), which normalisation tells apart; kept as superscript
        # digits so that they do not join the number. Elsewhere ("χ<sup>2</sup>") as printed.
        text = element.text or ""
        before = self.buffer[-1][-1:] if self.buffer else ""
        self.text(text.translate(TO_SUPERSCRIPT) if "0" <= before <= "9" else text)

    def on_break(self, element, name: str) -> None:
        self.text("\n")
        self.marks.append((self.buffer_length, None))  # a break, not a line of the source

    def on_space(self, element, name: str) -> None:
        self.text(" ")

    def on_block(self, element, name: str, owner: _Owner | None = None) -> None:
        if self.in_cell():
            self.separate()
            self.children(element)
            self.separate()
            return
        self.flush()
        saved = self.owner
        self.owner = owner or _Owner("block")
        self.children(element)
        self.flush()
        self.owner = saved

    def on_heading(self, element, name: str) -> None:
        self.on_block(element, name, _Owner("heading"))

    def on_section(self, element, name: str, title: str | None = None) -> None:
        """A sectioning element: its title lasts until it ends."""
        if self.in_cell():
            self.on_block(element, name)
            return
        saved = self.section
        if title is not None:
            self.section = title
        self.on_block(element, name)
        self.section = saved

    def on_table(self, element, name: str) -> None:
        self.flush()
        self.table_count += 1
        self.tables.append(_Table(self.table_count))
        self.children(element)
        self.flush()
        self.tables.pop()

    def on_row(self, element, name: str) -> None:
        if not self.tables:
            self.on_block(element, name)
            return
        table = self.tables[-1]
        table.row += 1
        table.column = 1
        self.children(element)

    def on_cell(self, element, name: str) -> None:
        if not self.tables:
            self.on_block(element, name)
            return
        table = self.tables[-1]
        row = max(table.row, 1)
        column = table.column
        while (row, column) in table.occupied:
            column += 1
        columns, rows = self.cell_span(element)
        for r in range(row, row + rows):
            for c in range(column, column + columns):
                table.occupied.add((r, c))
        table.column = column + columns
        self.flush()
        saved = self.owner
        self.owner = _Owner("cell", f"table {table.number}, row {row}, column {column}")
        self.children(element)
        self.flush()
        self.owner = saved

    def cell_span(self, element) -> tuple[int, int]:
        return _span(element.get("colspan")), _span(element.get("rowspan"))

    def on_math(self, element, name: str) -> None:
        """MathML: the characters it shows; `mfenced` with its brackets and separators."""
        if name == "math":
            self.math_depth += 1
            self.children(element)
            self.math_depth -= 1
        elif name == "mfenced":
            separators = (element.get("separators") or ",").split() or [""]
            separators = list("".join(separators)) or [""]
            self.text(element.get("open", "("))
            for index, child in enumerate(element):
                if index:
                    self.text(separators[min(index - 1, len(separators) - 1)])
                self.node(child)
            self.text(element.get("close", ")"))
        elif name == "mspace":
            self.text(" ")
        else:
            self.children(element)

    def on_marker(self, element, name: str) -> None:
        """A note or citation marker: left out (its tail is not)."""
        self.skipped(element)


def _resolved(marks: list[tuple[int, int | None]], text: str) -> list[tuple[int, int]]:
    """The marks with a line for each: a mark without one follows a line break the reader
    added, and has the line of the text before that break."""
    resolved: list[tuple[int, int]] = []
    for offset, line in marks:
        if line is None:
            if not resolved:
                continue
            previous_offset, previous_line = resolved[-1]
            line = previous_line + text.count("\n", previous_offset, max(offset - 1, 0))
        resolved.append((offset, line))
    return resolved


def _line_at(marks: list[tuple[int, int]], text: str, offset: int) -> int | None:
    best = None
    for mark_offset, line in marks:
        if mark_offset <= offset:
            best = (mark_offset, line)
        else:
            break
    if best is None:
        return None
    return best[1] + text.count("\n", best[0], offset)


_LINK_NAMES = frozenset({"a", "xref"})




def _holds_only_digits(element) -> bool:
    """A superscript of digits only, nothing nested (`<sup>3</sup>`)."""
    return len(element) == 0 and (element.text or "").isdigit()


def _is_superscript_marker(element, name_of) -> bool:
    """A superscript that holds a link (`<sup><a href="#n3">3</a></sup>`), or a link that holds
    a superscript: a note or citation marker, not part of a number."""
    wanted = _LINK_NAMES if name_of(element) == "sup" else frozenset({"sup"})
    return any(isinstance(d.tag, str) and name_of(d) in wanted for d in element.iterdescendants())


class _HtmlWalker(_Walker):
    max_line = 65535  # libxml2's HTML parser stops counting there

    SKIP = frozenset({
        "head", "script", "style", "noscript", "template", "nav", "form", "button", "select",
        "textarea", "input", "svg", "canvas", "iframe", "object", "embed", "audio", "video",
        "map", "img", "picture", "annotation", "annotation-xml", "dialog",
    })
    HEADINGS = frozenset({"h1", "h2", "h3", "h4", "h5", "h6"})
    SECTIONS = frozenset({"section", "article", "aside"})
    BLOCKS = frozenset({
        "html", "body", "main", "div", "p", "li", "dd", "dt", "dl", "ul", "ol", "blockquote",
        "pre", "address", "figure", "figcaption", "caption", "header", "footer", "hr",
        "details", "summary", "fieldset", "legend", "center", "hgroup",
    })
    MATH = frozenset({"math", "mfenced", "mspace"})

    def kind(self, element, name: str) -> str:
        if name in self.SKIP or self.hidden(element):
            return "skip"
        if name in ("sup", "a") and _is_superscript_marker(element, self.name):
            return "marker"
        if name == "sup" and _holds_only_digits(element):
            return "superscript"
        if name == "br":
            return "break"
        if name in ("td", "th"):
            return "cell"
        if name == "tr":
            return "row"
        if name == "table":
            return "table"
        if name in self.HEADINGS:
            return "heading"
        if name in self.SECTIONS:
            return "section"
        if name in self.BLOCKS:
            return "block"
        if name in self.MATH:
            return "math"
        return "inline"

    @staticmethod
    def hidden(element) -> bool:
        if element.get("hidden") is not None:
            return True
        if (element.get("aria-hidden") or "").strip().lower() == "true":
            return True
        if (element.get("role") or "").strip().lower() == "navigation":
            return True
        style = (element.get("style") or "").replace(" ", "").lower()
        return "display:none" in style


class _JatsWalker(_Walker):
    SKIP = frozenset({
        "journal-meta", "ref-list", "sub-article", "response", "label", "alt-text",
        "long-desc", "object-id", "graphic", "inline-graphic", "media", "inline-media",
        "processing-meta", "element-citation", "mixed-citation", "nlm-citation", "citation",
        "annotation", "annotation-xml", "kwd-group", "permissions", "counts",
    })
    #: elements whose title names the text inside them, with the name an untitled one gets
    SECTIONS = {
        "sec": None, "abstract": "Abstract", "trans-abstract": "Abstract", "app": None,
        "app-group": None, "ack": "Acknowledgements", "notes": None, "glossary": None,
        "fn-group": "footnotes", "boxed-text": None, "body": None, "back": None,
        "floats-group": None, "bio": None,
    }
    BLOCKS = frozenset({
        "article", "p", "fn", "table-wrap", "table-wrap-foot", "table-wrap-group", "fig",
        "fig-group", "caption", "title", "subtitle", "list", "list-item", "def-list",
        "def-item", "term", "def", "disp-quote", "statement", "disp-formula",
        "disp-formula-group", "preformat", "code", "speech", "speaker", "verse-group",
        "verse-line", "attrib", "array", "supplementary-material", "chem-struct-wrap",
        "question", "answer", "explanation", "address", "sig-block",
    })
    MATH = frozenset({"math", "mfenced", "mspace"})

    def __init__(self, entities: dict[str, str], path: str) -> None:
        super().__init__(path)
        self.entities = entities
        self.entity_text = 0

    def kind(self, element, name: str) -> str:
        tag = element.tag
        if name in self.SKIP:
            return "skip"
        if tag.startswith(_OASIS):
            return {"table": "table", "row": "row", "entry": "cell"}.get(name, "inline")
        if tag.startswith(_MATHML):
            return "math" if name in self.MATH else "inline"
        if name == "front":
            return "front"
        if name == "alternatives":
            return "alternatives"
        if name == "tex-math":
            return "tex"
        if name == "xref" and (element.get("ref-type") or "") in ("fn", "table-fn"):
            return "marker"
        if name in ("sup", "xref") and _is_superscript_marker(element, self.name):
            return "marker"
        if name == "sup" and _holds_only_digits(element):
            return "superscript"
        if name == "break":
            return "break"
        if name in ("td", "th"):
            return "cell"
        if name == "tr":
            return "row"
        if name == "table":
            return "table"
        if name == "title":
            parent = element.getparent()
            if parent is not None and self.name(parent) in self.SECTIONS:
                return "heading"
            return "block"
        if name in self.SECTIONS:
            return "section"
        if name in self.BLOCKS:
            return "block"
        return "inline"

    def on_section(self, element, name: str, title: str | None = None) -> None:
        super().on_section(element, name, self.SECTIONS.get(name))

    def on_front(self, element, name: str) -> None:
        """Front matter: only the abstracts are text a reader checks."""
        for child in element.iter():
            if isinstance(child.tag, str) and self.name(child) in ("abstract", "trans-abstract"):
                if not any(self.name(a) in ("abstract", "trans-abstract")
                           for a in child.iterancestors()):
                    self.element(child)

    def on_alternatives(self, element, name: str) -> None:
        children = [child for child in element if isinstance(child.tag, str)]
        chosen = children
        for preferred in ("table", "math", "tex-math"):
            found = [child for child in children if self.name(child) == preferred]
            if found:
                chosen = found[:1]
                break
        for child in children:
            if child in chosen:
                self.element(child)
            else:
                self.skipped(child)

    def on_tex(self, element, name: str) -> None:
        self.text(tex_to_text("".join(element.itertext())))

    def cell_span(self, element) -> tuple[int, int]:
        if element.tag.startswith(_OASIS):  # CALS tables: "morerows" extra rows
            return 1, _span(str(int(element.get("morerows") or 0) + 1)
                            if (element.get("morerows") or "0").isdigit() else None)
        return super().cell_span(element)

    def entity(self, node) -> str:
        name = getattr(node, "name", None) or ""
        text = self.entities.get(name)
        if text is None:
            text = _PREDEFINED.get(name) or html.entities.html5.get(name + ";") or f"&{name};"
        self.entity_text += len(text)
        if self.entity_text > MAX_TOTAL_ENTITY_TEXT:
            raise _bomb(self.path, f"its entities expand to more than "
                                   f"{MAX_TOTAL_ENTITY_TEXT:,} characters in all")
        return text


# -- TeX math --------------------------------------------------------------------------------

_TEX_SYMBOLS = {
    "chi": "χ", "eta": "η", "alpha": "α", "beta": "β", "gamma": "γ", "delta": "δ",
    "Delta": "Δ", "epsilon": "ε", "varepsilon": "ε", "omega": "ω", "rho": "ρ", "tau": "τ",
    "mu": "μ", "sigma": "σ", "lambda": "λ", "phi": "φ", "psi": "ψ", "theta": "θ",
    "lt": "<", "gt": ">", "le": "≤", "leq": "≤", "leqslant": "≤", "ge": "≥", "geq": "≥",
    "geqslant": "≥", "times": "×", "cdot": "·", "pm": "±", "minus": "−", "approx": "≈",
    "ne": "≠", "neq": "≠", "%": "%", "{": "", "}": "", "_": "_", "&": "&",
}
_TEX_SPACES = {",", ";", ":", " ", "quad", "qquad", "enspace", "thinspace", "medspace"}
_TEX_COMMAND = re.compile(r"\\([A-Za-z]+|.)")


def tex_to_text(tex: str) -> str:
    """The plain text a short piece of TeX math shows (`\\chi^{2}(1, N=80)=4.2` is
    `χ2(1, N=80)=4.2`); document wrappers, delimiters and formatting commands are dropped."""
    body = tex
    if "\\begin{document}" in body:
        body = body.split("\\begin{document}", 1)[1].split("\\end{document}", 1)[0]
    body = re.sub(r"\\(?:begin|end)\{[^}]*\}", " ", body)

    def command(match: re.Match) -> str:
        word = match.group(1)
        if word in _TEX_SYMBOLS:
            return _TEX_SYMBOLS[word]
        if word in _TEX_SPACES:
            return " "
        if word in ("!", "left", "right", "big", "Big", "bigl", "bigr", "displaystyle"):
            return ""
        return ""  # a formatting command (\mathrm, \textit, ...): its argument stays

    body = _TEX_COMMAND.sub(command, body)
    body = body.replace("$", "").replace("~", " ").replace("^", "").replace("_", "")
    body = body.replace("{", "").replace("}", "")
    return " ".join(body.split())
