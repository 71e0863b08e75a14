"""The HTML and JATS XML reader: text, inline markup, MathML, tables, locations, and the hostile
or broken input it refuses.

`tests/data/markup/` holds one invented manuscript (the burrowing voles of Marrow Fen, studied by
the Fenwick field station) as plain text, as a JATS article and as an HTML page; the other
documents are written here.
"""

from __future__ import annotations

import io
import socket

import docx
import pytest

import scrutiny
from scrutiny.errors import InputError
from scrutiny.extract import find_claims
from scrutiny.ingest import document_from_bytes, read_document, sniff_format
from scrutiny.ingest.markup import MAX_ENTITY_EXPANSION, tex_to_text

from conftest import DATA

MARKUP = DATA / "markup"
MATHML = 'xmlns:mml="http://www.w3.org/1998/Math/MathML"'


def summary(claim) -> tuple:
    p = claim.p
    return (claim.test, claim.df, claim.statistic,
            p.comparator if p else None, p.reported if p else None)


def claims_of(data: bytes | str, name: str):
    if isinstance(data, str):
        data = data.encode("utf-8")
    return find_claims(document_from_bytes(data, name))


def jats(body: str, prolog: str = "") -> str:
    return (f'<?xml version="1.0" encoding="UTF-8"?>{prolog}\n<article {MATHML} '
            f'article-type="research-article" dtd-version="1.2"><body>{body}</body></article>')


def html_page(body: str) -> str:
    return f"<!DOCTYPE html>\n<html><head><title>Fen voles</title></head><body>{body}</body></html>"


def line_of(path, needle: str) -> int:
    """The 1-based line of the fixture on which `needle` is printed."""
    lines = path.read_text(encoding="utf-8").splitlines()
    [number] = [index for index, line in enumerate(lines, start=1) if needle in line]
    return number


# -- one manuscript, every format ------------------------------------------------------------

def manuscript_as_docx() -> bytes:
    """The fixture manuscript as a Word document: headings, paragraphs and a real table."""
    document = docx.Document()
    document.add_heading("Burrow depth and soil moisture in Marrow Fen voles", level=0)
    for block in (MARKUP / "fen-voles.txt").read_text(encoding="utf-8").split("\n\n")[1:]:
        block = block.strip()
        if block in ("Abstract", "Method", "Results", "Discussion"):
            document.add_heading(block, level=1)
        elif block == "Table 1. Depth by plot":
            document.add_paragraph(block)
            table = document.add_table(rows=2, cols=2)
        elif block.startswith("Plot "):
            row = 0 if block == "Plot A" else 1
            table.cell(row, 0).text = block
        elif block.startswith("t(18)"):
            table.cell(row, 1).text = block
        else:
            document.add_paragraph(block)
    buffer = io.BytesIO()
    document.save(buffer)
    return buffer.getvalue()


EXPECTED = [
    ("t", ("38",), "2.10", "=", ".042"),
    ("t", ("38",), "2.10", "=", ".042"),
    ("F", ("2", "77"), "1.20", "=", ".31"),
    ("chi2", ("1",), "6.05", "=", ".014"),
    ("r", ("78",), ".25", "=", ".025"),
    ("t", ("18",), "2.45", "<", ".05"),
    ("t", ("18",), "\u22120.85", "=", ".41"),
    ("z", (), "1.93", "=", ".027"),
]


@pytest.mark.parametrize("name", ["fen-voles.txt", "fen-voles.xml", "fen-voles.html", "docx"])
def test_the_same_manuscript_yields_the_same_claims_in_every_format(name):
    if name == "docx":
        claims = claims_of(manuscript_as_docx(), "fen-voles.docx")
    else:
        claims = find_claims(read_document(MARKUP / name))
    assert [summary(claim) for claim in claims] == EXPECTED
    assert claims[-1].tails_stated == "one"


def test_jats_locations_name_section_paragraph_cell_and_source_line():
    path = MARKUP / "fen-voles.xml"
    document = read_document(path)
    assert document.format == "jats" and document.encoding == "utf-8"
    claims = find_claims(document)
    where = [(c.location.section, c.location.paragraph, c.location.cell) for c in claims]
    assert where == [
        ("Abstract", 1, None),
        ("Results", 3, None),
        ("Results", 3, None),
        ("Results", 4, None),
        ("Results", 4, None),
        ("Results", None, "table 1, row 1, column 2"),
        ("Results", None, "table 1, row 2, column 2"),
        ("footnotes", 7, None),
    ]
    lines = [c.location.line for c in claims]
    assert lines == [
        line_of(path, "<italic>t</italic>(38) = 2.10, <italic>p</italic> = .042.</p>"),
        line_of(path, "wet season, <italic>t</italic>(38)"),
        line_of(path, "<mml:mi>F</mml:mi>"),
        line_of(path, "&#x3C7;<sup>2</sup>"),
        line_of(path, "<italic>r</italic>(78)"),
        line_of(path, "Plot A"),
        line_of(path, "Plot B"),
        line_of(path, "<italic>z</italic> = 1.93"),
    ]


def test_html_locations_name_section_paragraph_cell_and_source_line():
    path = MARKUP / "fen-voles.html"
    document = read_document(path)
    assert document.format == "html" and document.encoding == "utf-8"
    claims = find_claims(document)
    where = [(c.location.section, c.location.paragraph, c.location.cell) for c in claims]
    assert where == [
        ("Abstract", 1, None),
        ("Results", 3, None),
        ("Results", 3, None),
        ("Results", 4, None),
        ("Results", 4, None),
        ("Results", None, "table 1, row 1, column 2"),
        ("Results", None, "table 1, row 2, column 2"),
        ("Notes", 7, None),
    ]
    assert [c.location.line for c in claims] == [
        line_of(path, "<i>t</i>(38) = 2.10, <i>p</i> = .042.</p>"),
        line_of(path, "wet season, <i>t</i>(38)"),
        line_of(path, "<i>F</i>(2, 77)"),
        line_of(path, "&chi;<sup>2</sup>"),
        line_of(path, "<i>r</i>(78)"),
        line_of(path, "Plot A"),
        line_of(path, "Plot B"),
        line_of(path, "<i>z</i> = 1.93"),
    ]


def test_line_breaks_and_left_out_elements_keep_source_lines_right():
    page = ("<html><body>\n<p>Wet plots<br>t(28) = 2.20, p = .036<br/>\n"
            "<script>\nvar x = 1;\n</script> z = 2.10, p = .036 <!-- a\ncomment -->\n"
            "r(40) = .33, p = .031 <span\nclass='x'>t(9) = 2.30, p = .047</span></p>")
    claims = claims_of(page, "lines.html")
    assert [(c.statistic, c.location.line) for c in claims] == [
        ("2.20", 2), ("2.10", 5), (".33", 7), ("2.30", 8)]


def test_claim_offsets_point_into_the_extracted_text():
    document = read_document(MARKUP / "fen-voles.xml")
    claim = find_claims(document)[3]
    assert document.text[claim.location.start:claim.location.end] == \
        "χ2(1, N = 80) = 6.05, p = .014"


def test_what_is_not_the_article_text_is_left_out():
    jats_text = read_document(MARKUP / "fen-voles.xml").text
    for decoy in ("9.99", "Annals of Fen Ecology", "reviewer", "Table 1\n", "Heron"):
        assert decoy not in jats_text
    html_text = read_document(MARKUP / "fen-voles.html").text
    for decoy in ("decoy", "t(1)", "t(3)", "t(4)", "t(5)"):
        assert decoy not in html_text


# -- inline markup, entities, MathML ---------------------------------------------------------

def test_italic_superscript_subscript_and_entities_read_as_printed():
    document = document_from_bytes(jats(
        "<p>Nests differed, &#x3C7;<sup>2</sup>(1, <italic>N</italic> = 80) = 4.20, "
        "<italic>p</italic> &lt; .001, and litters, <italic>t</italic><sub>18</sub> = "
        "&#8722;4.18, <italic>p</italic> = .0006.</p>").encode(), "nests.xml")
    assert "χ2(1, N = 80) = 4.20, p < .001" in document.text
    assert "t18 = −4.18, p = .0006" in document.text
    assert [summary(c) for c in find_claims(document)] == [
        ("chi2", ("1",), "4.20", "<", ".001"),
        ("t", ("18",), "−4.18", "=", ".0006"),
    ]


def test_superscript_note_and_citation_markers_are_not_read_into_numbers():
    page = html_page(
        '<p>Voles dug deeper, t(28) = 2.20, <i>p</i> = .04<sup><a href="#n3">3</a></sup>.</p>'
        '<p>Wet plots, t(28) = 2.90, p = .007<a href="#r12"><sup>12</sup></a>.</p>'
        "<p>Dry plots, t(400) = 3.80, p = 1.6 × 10<sup>&minus;4</sup>.</p>")
    claims = claims_of(page, "notes.html")
    assert [c.p.reported for c in claims] == [".04", ".007", "1.6 × 10−4"]
    article = jats('<p>Voles, <italic>t</italic>(28) = 2.20, <italic>p</italic> = '
                   '.04<xref ref-type="fn" rid="n1">1</xref>, and <italic>z</italic> = 2.10, '
                   '<italic>p</italic> = .036<sup><xref ref-type="bibr" rid="b2">2</xref>'
                   '</sup>.</p>')
    assert [c.p.reported for c in claims_of(article, "notes.xml")] == [".04", ".036"]


def test_named_html_entities_in_jats_without_the_dtd():
    article = jats("<p>Burrows, <italic>t</italic>(30)&nbsp;=&nbsp;&minus;2.75, "
                   "<italic>p</italic>&nbsp;=&nbsp;.010 &ndash; as expected.</p>")
    [claim] = claims_of(article, "entities.xml")
    assert summary(claim) == ("t", ("30",), "−2.75", "=", ".010")


def test_small_internal_entities_are_expanded():
    article = jats("<p>&chi2; (1, N = 80) = 4.20, &p; = .04</p>",
                   prolog='\n<!DOCTYPE article [<!ENTITY chi "&#967;"> '
                          '<!ENTITY chi2 "&chi;2"> <!ENTITY p "p">]>')
    [claim] = claims_of(article, "entities.xml")
    assert summary(claim) == ("chi2", ("1",), "4.20", "=", ".04")


def test_mathml_reads_as_its_characters_and_alternatives_are_read_once():
    chi = ("<mml:math><mml:msup><mml:mi>χ</mml:mi><mml:mn>2</mml:mn></mml:msup>"
           "<mml:mfenced><mml:mn>1</mml:mn><mml:mrow><mml:mi>N</mml:mi><mml:mo>=</mml:mo>"
           "<mml:mn>80</mml:mn></mml:mrow></mml:mfenced><mml:mo>=</mml:mo><mml:mn>4.20</mml:mn>"
           "<mml:semantics><mml:annotation encoding='TeX'>t(9) = 9.99</mml:annotation>"
           "</mml:semantics></mml:math>")
    t_sub = ("<mml:math><mml:msub><mml:mi>t</mml:mi><mml:mn>18</mml:mn></mml:msub>"
             "<mml:mo>=</mml:mo><mml:mo>&#x2212;</mml:mo><mml:mn>2.30</mml:mn><mml:mo>&#x2062;"
             "</mml:mo></mml:math>")
    article = jats(
        f"<p>Entrances, <inline-formula><alternatives><tex-math>\\chi^2(1, N=80)=4.20</tex-math>"
        f"{chi}<inline-graphic xlink:href='eq1.gif' xmlns:xlink='http://www.w3.org/1999/xlink'/>"
        f"</alternatives></inline-formula>, <italic>p</italic> = .04.</p>"
        f"<p>Litters, <inline-formula>{t_sub}</inline-formula>, <italic>p</italic> = .034.</p>"
        "<p>Mass, <inline-formula><tex-math><![CDATA[$F_{1,\\,60} = 5.10$]]></tex-math>"
        "</inline-formula>, <italic>p</italic> &lt; .05.</p>")
    claims = claims_of(article, "math.xml")
    assert [summary(c) for c in claims] == [
        ("chi2", ("1",), "4.20", "=", ".04"),
        ("t", ("18",), "−2.30", "=", ".034"),
        ("F", ("1", "60"), "5.10", "<", ".05"),
    ]


@pytest.mark.parametrize("tex, text", [
    (r"\chi^{2}(1, N=80)=4.2", "χ2(1, N=80)=4.2"),
    (r"$p \lt .001$", "p < .001"),
    (r"\documentclass{article}\begin{document}$t_{28}=\mathrm{2.20}$\end{document}",
     "t28=2.20"),
    (r"\eta_{p}^{2} \geq .06", "ηp2 ≥ .06"),
])
def test_tex_math_is_reduced_to_plain_text(tex, text):
    assert tex_to_text(tex) == text


def test_mathml_in_html_and_hidden_duplicates():
    page = html_page(
        '<p>Entrances, <span aria-hidden="true">χ²(1) = 4.20</span><math><msup><mi>χ</mi>'
        "<mn>2</mn></msup><mo>(</mo><mn>1</mn><mo>)</mo><mo>=</mo><mn>4.20</mn></math>, "
        '<i>p</i> = .04.</p><p style="display: none">t(2) = 9.99, p = .5</p>')
    [claim] = claims_of(page, "math.html")
    assert summary(claim) == ("chi2", ("1",), "4.20", "=", ".04")


# -- tables ----------------------------------------------------------------------------------

def test_row_and_column_spans_keep_columns_on_the_grid():
    page = html_page(
        "<table><tr><td rowspan='2'>Wet plots</td><td colspan='2'>Two seasons</td>"
        "<td>t(40) = 2.50, p = .017</td></tr>"
        "<tr><td>Spring</td><td>Summer</td><td>t(40) = 1.10, p = .28</td></tr></table>"
        "<table><tr><td>z = 2.00, p = .046</td></tr></table>")
    claims = claims_of(page, "spans.html")
    assert [c.location.cell for c in claims] == ["table 1, row 1, column 4",
                                                 "table 1, row 2, column 4",
                                                 "table 2, row 1, column 1"]


def test_cals_tables_in_jats():
    oasis = 'xmlns:oasis="http://www.niso.org/standards/z39-96/ns/oasis-exchange/table"'
    article = jats(
        f"<table-wrap><oasis:table {oasis}><oasis:tgroup cols='2'><oasis:tbody>"
        "<oasis:row><oasis:entry morerows='1'>Fen</oasis:entry><oasis:entry>r(58) = .31, "
        "p = .016</oasis:entry></oasis:row><oasis:row><oasis:entry>r(58) = .05, p = .70"
        "</oasis:entry></oasis:row></oasis:tbody></oasis:tgroup></oasis:table></table-wrap>")
    claims = claims_of(article, "cals.xml")
    assert [c.location.cell for c in claims] == ["table 1, row 1, column 2",
                                                 "table 1, row 2, column 2"]


def test_paragraphs_inside_a_cell_and_blank_lines_inside_a_paragraph_keep_a_result_whole():
    article = jats("\n<table><tr>\n  <td>\n    <p>t(38) = 2.10</p>\n\n    <p>p = .042</p>\n  </td>"
                   "\n  <td>p = .9</td>\n</tr></table>\n"
                   "<p>Entrance width grew, r(78) = .25,\n\n\n  p = .025.</p>")
    claims = claims_of(article, "cells.xml")
    assert [summary(c) for c in claims] == [("t", ("38",), "2.10", "=", ".042"),
                                            ("r", ("78",), ".25", "=", ".025")]
    assert [c.location.line for c in claims] == [5, 11]
    assert [c.location.cell for c in claims] == ["table 1, row 1, column 1", None]


# -- encodings and sniffing ------------------------------------------------------------------

def test_html_declared_in_windows_1252():
    page = ('<html><head><meta charset="windows-1252"></head><body><p>Voles \u2013 '
            't(28) = \u22122.20, p = .036</p></body></html>')
    data = page.replace("\u2212", "-").encode("cp1252")
    document = document_from_bytes(data, "voles.html")
    assert document.encoding == "windows-1252"
    assert "Voles \u2013 t(28)" in document.text


def test_html_in_utf16_and_jats_in_latin1():
    page = html_page("<p>Wühlmäuse, t(28) = 2.20, p = .036</p>")
    document = document_from_bytes(page.encode("utf-16"), "voles.html")
    assert "Wühlmäuse" in document.text
    article = jats("<p>Wühlmäuse, t(28) = 2.20, p = .036</p>").replace("UTF-8", "ISO-8859-1")
    document = document_from_bytes(article.encode("latin-1"), "voles.xml")
    assert "Wühlmäuse" in document.text and document.encoding == "iso-8859-1"


@pytest.mark.parametrize("data, name, expected", [
    (jats("<p>x</p>"), "article.txt", "jats"),
    ("<article><front><article-meta/></front><body/></article>", "article", "jats"),
    ("<article><body><p>x</p></body></article>", "fen.xml", "jats"),
    ("<!DOCTYPE html><html><body>x</body></html>", "page.txt", "html"),
    ("<?xml version='1.0'?><!DOCTYPE html PUBLIC '-//W3C//DTD XHTML 1.0 Strict//EN' "
     "'xhtml1-strict.dtd'><html xmlns='http://www.w3.org/1999/xhtml'/>", "page.xml", "html"),
    ("<div><p>t(28) = 2.20, p = .04</p></div>", "fragment.html", "html"),
    ("<div><p>t(28) = 2.20, p = .04</p></div>", "notes.md", "markdown"),
    ("<?xml version='1.0'?><article xmlns='http://docbook.org/ns/docbook'/>", "book.xml",
     "text"),
    ("<?xml version='1.0'?><inventory><item/></inventory>", "data.xml", "text"),
])
def test_format_is_chosen_by_content(data, name, expected):
    assert sniff_format(data.encode(), name) == expected


# -- bad input -------------------------------------------------------------------------------

def refusal(data: str | bytes, name: str) -> str:
    with pytest.raises(InputError) as raised:
        document_from_bytes(data.encode() if isinstance(data, str) else data, name)
    message = str(raised.value)
    assert message.startswith(f"{name}: ")
    assert "\n" not in message
    return message


@pytest.fixture
def listener():
    """A local TCP server that nothing should ever connect to."""
    server = socket.socket(socket.AF_INET, socket.SOCK_STREAM)
    server.bind(("127.0.0.1", 0))
    server.listen(16)
    server.setblocking(False)
    yield server
    server.close()


def connections(server: socket.socket) -> int:
    """Connections made to `server` so far (the kernel queues them even before accept)."""
    count = 0
    while True:
        try:
            connection, _ = server.accept()
        except BlockingIOError:
            return count
        connection.close()
        count += 1


def test_external_entity_naming_a_file_is_refused_and_never_read(tmp_path):
    secret = tmp_path / "secret.txt"
    secret.write_text("FEN-SECRET-4711 t(9) = 9.99, p = .5")
    article = jats("<p>&leak; t(28) = 2.20, p = .04</p>",
                   prolog=f'<!DOCTYPE article [<!ENTITY leak SYSTEM "{secret.as_uri()}">]>')
    message = refusal(article, "leak.xml")
    assert "external entity" in message and "never fetched or read" in message
    assert "FEN-SECRET" not in message


@pytest.mark.parametrize("declaration", [
    '<!ENTITY leak SYSTEM "http://127.0.0.1:{port}/leak">',
    '<!ENTITY % remote SYSTEM "http://127.0.0.1:{port}/remote.dtd"> %remote;',
    '<!ENTITY leak PUBLIC "-//Fen//Leak//EN" "http://127.0.0.1:{port}/leak">',
])
def test_external_entity_naming_a_url_is_refused_without_a_connection(listener, declaration):
    port = listener.getsockname()[1]
    article = jats("<p>&leak; t(28) = 2.20, p = .04</p>",
                   prolog=f"<!DOCTYPE article [{declaration.format(port=port)}]>")
    assert "external entity" in refusal(article, "leak.xml")
    assert connections(listener) == 0


def test_the_external_dtd_of_a_jats_article_is_never_loaded(listener):
    port = listener.getsockname()[1]
    article = jats("<p>Voles, t(28) = 2.20, p = .036&nbsp;in all.</p>",
                   prolog=f'<!DOCTYPE article PUBLIC "-//NLM//DTD JATS (Z39.96) Journal '
                          f'Archiving and Interchange DTD v1.2 20190208//EN" '
                          f'"http://127.0.0.1:{port}/JATS-archivearticle1.dtd">')
    [claim] = claims_of(article, "voles.xml")
    assert summary(claim) == ("t", ("28",), "2.20", "=", ".036")
    assert connections(listener) == 0


def laughs(levels: int) -> str:
    declarations = '<!ENTITY lol0 "lol">' + "".join(
        f'<!ENTITY lol{level} "{f"&lol{level - 1};" * 10}">' for level in range(1, levels + 1))
    return jats(f"<p>&lol{levels}; t(28) = 2.20, p = .04</p>",
                prolog=f"<!DOCTYPE article [{declarations}]>")


@pytest.mark.parametrize("levels", [9, 4])
def test_entity_expansion_bombs_are_refused(levels):
    # nine levels: the XML parser itself stops the expansion; four levels (30,000 characters)
    # pass the parser and meet this reader's own limit
    assert 3 * 10**4 > MAX_ENTITY_EXPANSION
    message = refusal(laughs(levels), "laughs.xml")
    assert "entity-expansion bomb" in message


@pytest.mark.parametrize("used", [True, False])
def test_entities_that_refer_to_each_other_in_a_loop_are_refused(used):
    # used: the XML parser meets the loop; unused: this reader's own expansion does
    article = jats(("&a; " if used else "") + "<p>t(28) = 2.20, p = .04</p>",
                   prolog='<!DOCTYPE article [<!ENTITY a "x&b;"> <!ENTITY b "y&a;">]>')
    message = refusal(article, "loop.xml")
    assert "entity-expansion bomb" in message
    assert ("in a loop" if used else "the entity a refers back to itself") in message


def test_entities_in_an_html_page_are_never_expanded():
    page = ('<!DOCTYPE html [<!ENTITY lol0 "lol"><!ENTITY lol1 "&lol0;&lol0;&lol0;">]>'
            "<html><body><p>&lol1; t(28) = 2.20, p = .04</p></body></html>")
    document = document_from_bytes(page.encode(), "laughs.html")
    assert "lollollol" not in document.text
    [claim] = find_claims(document)
    assert summary(claim) == ("t", ("28",), "2.20", "=", ".04")


def test_malformed_xml_gives_the_line_and_the_reason():
    message = refusal(jats("<p>Voles, t(28) = 2.20, <italic>p = .04</p>\n<p>more</p>"),
                      "broken.xml")
    assert "not well-formed XML (line 2" in message and "mismatch" in message
    truncated = jats("<p>Voles, t(28) = 2.20, p = .04</p><p>More text")[:-30]
    assert "not well-formed XML" in refusal(truncated, "truncated.xml")


def test_malformed_html_is_read_leniently():
    page = ("<html><body><p>Voles dug deeper, <i>t</i>(28) = 2.20, <b><i>p</b> = .036"
            "<p>Unclosed <div><td>stray cell</i></table>")
    [claim] = claims_of(page, "broken.html")
    assert summary(claim) == ("t", ("28",), "2.20", "=", ".036")


@pytest.mark.parametrize("data, name", [
    (html_page("  <script>var t = 'x';</script>  "), "empty.html"),
    ("<html></html>", "bare.html"),
    (jats("<sec><title> </title><p/></sec>"), "empty.xml"),
    ('<?xml version="1.0"?><article><front><journal-meta><journal-title>Fen</journal-title>'
     "</journal-meta></front></article>", "front-only.xml"),
])
def test_documents_without_text_say_so(data, name):
    assert "no text" in refusal(data, name)


def test_elements_nested_absurdly_deep_are_refused():
    page = "<html><body>" + "<div>" * 400 + "t(28) = 2.20" + "</div>" * 400 + "</body></html>"
    assert "nested more than" in refusal(page, "deep.html")
    article = jats("<p>" + "<bold>" * 400 + "t" + "</bold>" * 400 + "</p>")
    assert "nested more than" in refusal(article, "deep.xml")


def test_bad_markup_files_do_not_stop_the_others(tmp_path, listener):
    port = listener.getsockname()[1]
    (tmp_path / "a-article.xml").write_bytes((MARKUP / "fen-voles.xml").read_bytes())
    (tmp_path / "b-page.html").write_bytes((MARKUP / "fen-voles.html").read_bytes())
    (tmp_path / "c-leak.xml").write_text(jats(
        "<p>&leak;</p>", prolog=f'<!DOCTYPE article [<!ENTITY leak SYSTEM '
                                f'"http://127.0.0.1:{port}/leak">]>'))
    (tmp_path / "d-laughs.xml").write_text(laughs(9))
    (tmp_path / "e-broken.xml").write_text(jats("<p>t(28) = 2.20, p = .04"))
    (tmp_path / "f-empty.html").write_text(html_page(""))
    (tmp_path / "g-plain.txt").write_text("Voles dug deeper, t(28) = 2.20, p = .036.\n")
    run = scrutiny.check_paths([str(tmp_path)])
    by_name = {result.path.rsplit("/", 1)[-1]: result for result in run.documents}
    assert [summary(c.claim) for c in by_name["a-article.xml"].claims] == EXPECTED
    assert by_name["a-article.xml"].format == "jats"
    assert [summary(c.claim) for c in by_name["b-page.html"].claims] == EXPECTED
    assert by_name["b-page.html"].format == "html"
    assert "external entity" in by_name["c-leak.xml"].errors[0]
    assert "entity-expansion bomb" in by_name["d-laughs.xml"].errors[0]
    assert "not well-formed XML" in by_name["e-broken.xml"].errors[0]
    assert "no text" in by_name["f-empty.html"].errors[0]
    assert len(by_name["g-plain.txt"].claims) == 1
    assert connections(listener) == 0


@pytest.mark.parametrize("wrap, name", [(html_page, "page.html"), (jats, "article.xml")])
def test_superscript_digits_a_square_and_a_note_marker(wrap, name):
    # a <sup> of digits after χ is its square; after the number of a result, a note marker
    # that must not be read as a digit of it (p = .032 with note 3 is not p = .0323)
    body = ("<p>Nest sites differed, χ<sup>2</sup>(1, N = 80) = 4.62, p = .032<sup>3</sup>, "
            "and burrows too, t(28) = 2.45<sup>12</sup>, p = .021.</p>")
    claims = claims_of(wrap(body), name)
    assert [summary(claim) for claim in claims] == [
        ("chi2", ("1",), "4.62", "=", ".032"), ("t", ("28",), "2.45", "=", ".021")]
