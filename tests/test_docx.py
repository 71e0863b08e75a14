"""The Word (.docx) reader: text, tables, notes and locations, and the bad input it refuses.

Every document is built here with python-docx, in an invented scenario (the burrowing voles of
Marrow Fen, studied by the Fenwick field station).
"""

from __future__ import annotations

import io
import struct
import zipfile

import docx
import pytest
from docx.opc.constants import CONTENT_TYPE, RELATIONSHIP_TYPE
from docx.opc.packuri import PackURI
from docx.opc.part import Part
from docx.oxml import parse_xml
from docx.oxml.ns import qn
from docx.oxml.parser import OxmlElement

import scrutiny
from scrutiny.errors import InputError
from scrutiny.extract import find_claims
from scrutiny.ingest import document_from_bytes, sniff_format
from scrutiny.ingest import docx as docx_reader

W = "http://schemas.openxmlformats.org/wordprocessingml/2006/main"
M = "http://schemas.openxmlformats.org/officeDocument/2006/math"


def saved(document) -> bytes:
    buffer = io.BytesIO()
    document.save(buffer)
    return buffer.getvalue()


def claims_of(data: bytes, name: str = "burrows.docx"):
    return find_claims(document_from_bytes(data, name))


def summary(claim) -> tuple:
    p = claim.p
    return (claim.test, claim.df, claim.statistic,
            p.comparator if p else None, p.reported if p else None)


def run_xml(text: str, italic: bool = False) -> str:
    properties = "<w:rPr><w:i/></w:rPr>" if italic else ""
    return f'<w:r>{properties}<w:t xml:space="preserve">{text}</w:t></w:r>'


def add_raw_paragraph(document, inner_xml: str) -> None:
    """Append a paragraph written as WordprocessingML (for what python-docx cannot write)."""
    paragraph = parse_xml(f'<w:p xmlns:w="{W}" xmlns:m="{M}">{inner_xml}</w:p>')
    document.element.body.insert(len(document.element.body) - 1, paragraph)  # before sectPr


def add_notes(document, kind: str, notes: list[str]) -> None:
    """Give the document a footnotes or endnotes part; `notes` are the notes' inner XML."""
    tag = "footnote" if kind == "footnotes" else "endnote"
    separators = (f'<w:{tag} w:type="separator" w:id="-1"><w:p><w:r><w:separator/></w:r>'
                  f'</w:p></w:{tag}><w:{tag} w:type="continuationSeparator" w:id="0"><w:p>'
                  f'<w:r><w:continuationSeparator/></w:r></w:p></w:{tag}>')
    body = "".join(f'<w:{tag} w:id="{number}"><w:p>{inner}</w:p></w:{tag}>'
                   for number, inner in enumerate(notes, start=1))
    xml = f'<w:{kind} xmlns:w="{W}">{separators}{body}</w:{kind}>'
    content_type = CONTENT_TYPE.WML_FOOTNOTES if kind == "footnotes" else \
        CONTENT_TYPE.WML_ENDNOTES
    relationship = RELATIONSHIP_TYPE.FOOTNOTES if kind == "footnotes" else \
        RELATIONSHIP_TYPE.ENDNOTES
    part = Part(PackURI(f"/word/{kind}.xml"), content_type, xml.encode("utf-8"),
                document.part.package)
    document.part.relate_to(part, relationship)


def manuscript():
    """A short manuscript with results in body text, a table and a footnote."""
    document = docx.Document()
    document.add_heading("Burrow depth of Marrow Fen voles", level=0)
    document.add_paragraph("The Fenwick field station measured 80 burrows in two seasons.")
    document.add_paragraph("")  # an empty paragraph, typed for spacing: not counted
    document.add_heading("Results", level=1)
    paragraph = document.add_paragraph("Burrows were deeper in the wet season, t(38) = 2.10, ")
    paragraph.add_run("p").italic = True
    paragraph.add_run(" = .042.")
    reference = OxmlElement("w:footnoteReference", {qn("w:id"): "1"})
    paragraph.add_run()._r.append(reference)  # the note's marker prints no digit into "p"
    paragraph = document.add_paragraph("Depth did not depend on soil type, ")
    paragraph.add_run("F").italic = True
    paragraph.add_run("(2, 77) = 1.20, ")
    paragraph.add_run("p").italic = True
    paragraph.add_run(" = .31.")
    table = document.add_table(rows=3, cols=3)
    table.cell(0, 0).text = "Comparison"
    table.cell(0, 1).text = "Test"
    table.cell(0, 2).text = "Remark"
    table.cell(1, 0).text = "Entrances"
    table.cell(1, 1).text = "χ2(1, N = 80) = 6.05, p = .014"
    table.cell(2, 0).text = "Nest chambers"
    table.cell(2, 1).text = "r(78) = .25"
    table.cell(2, 1).add_paragraph("")  # an empty paragraph does not split the cell
    table.cell(2, 1).add_paragraph("p = .025")  # a further paragraph in the same cell
    document.add_heading("Discussion", level=1)
    document.add_paragraph("Wet soil is easier to dig.")
    add_notes(document, "footnotes", [
        run_xml("A one-sided test of the same contrast gave ") + run_xml("z", italic=True)
        + run_xml(" = 1.93, ") + run_xml("p", italic=True) + run_xml(" = .027."),
    ])
    return document


# -- text, tables, notes ---------------------------------------------------------------------

def test_results_in_body_text_table_and_footnote_with_their_locations():
    claims = claims_of(saved(manuscript()))
    assert [summary(claim) for claim in claims] == [
        ("t", ("38",), "2.10", "=", ".042"),
        ("F", ("2", "77"), "1.20", "=", ".31"),
        ("chi2", ("1",), "6.05", "=", ".014"),
        ("r", ("78",), ".25", "=", ".025"),
        ("z", (), "1.93", "=", ".027"),
    ]
    t, f, chi2, r, z = (claim.location for claim in claims)
    # paragraph numbers count body paragraphs with text; headings and empty ones do not count
    assert (t.section, t.paragraph, t.cell) == ("Results", 2, None)
    assert (f.section, f.paragraph, f.cell) == ("Results", 3, None)
    assert (chi2.section, chi2.paragraph, chi2.cell) == ("Results", None,
                                                         "table 1, row 2, column 2")
    assert (r.cell, r.line) == ("table 1, row 3, column 2", 1)
    assert (z.section, z.paragraph, z.cell) == ("footnotes", 1, None)
    assert z.paragraph == 1
    assert claims[4].tails_stated == "one"  # read from the note's own sentence


def test_paragraphs_are_separated_by_blank_lines_and_offsets_point_into_the_text():
    document = document_from_bytes(saved(manuscript()), "burrows.docx")
    assert document.format == "docx"
    assert "two seasons.\n\nResults\n\nBurrows were deeper" in document.text
    [claim, *_] = find_claims(document)
    location = claim.location
    assert document.text[location.start:location.end] == "t(38) = 2.10, p = .042"
    assert claim.text == "t(38) = 2.10, p = .042"


def test_a_result_split_across_italic_runs_reads_as_one():
    document = docx.Document()
    paragraph = document.add_paragraph("The voles of the northern plots dug faster, ")
    for text, italic in (("t", True), ("(", False), ("19", False), (") = 3.", False),
                         ("4", False), ("1, ", False), ("p", True), (" ", False),
                         ("< ", False), (".01", False), (".", False)):
        paragraph.add_run(text).italic = italic
    [claim] = claims_of(saved(document))
    assert summary(claim) == ("t", ("19",), "3.41", "<", ".01")
    assert claim.location.paragraph == 1


def test_superscript_runs_a_square_an_exponent_and_a_note_marker():
    # python-docx writes w:vertAlign="superscript" for font.superscript (Word's own markup)
    document = docx.Document()
    paragraph = document.add_paragraph("Nest sites differed, ")
    for text, raised in (("χ", False), ("2", True), ("(1, N = 80) = 4.62, p = .032", False),
                         ("3", True), (", and burrows too, t(28) = 2.45", False), ("12", True),
                         (", p = 2.1 × 10", False), ("-2", True), (".", False)):
        paragraph.add_run(text).font.superscript = raised
    claims = claims_of(saved(document))
    assert [summary(claim) for claim in claims] == [
        ("chi2", ("1",), "4.62", "=", ".032"), ("t", ("28",), "2.45", "=", "2.1 × 10-2")]


def test_endnotes_are_read_after_footnotes():
    document = docx.Document()
    document.add_paragraph("Body text without results.")
    add_notes(document, "footnotes", [run_xml("Footnote: t(12) = 2.30, p = .04.")])
    add_notes(document, "endnotes", [run_xml("First endnote."),
                                     run_xml("Endnote: F(1, 30) = 5.00, p = .033.")])
    claims = claims_of(saved(document))
    assert [(summary(c), c.location.section, c.location.paragraph) for c in claims] == [
        (("t", ("12",), "2.30", "=", ".04"), "footnotes", 1),
        (("F", ("1", "30"), "5.00", "=", ".033"), "endnotes", 2),
    ]


def test_merged_cells_keep_their_grid_column():
    document = docx.Document()
    table = document.add_table(rows=2, cols=3)
    table.cell(0, 0).merge(table.cell(0, 1)).text = "Spring and summer plots"
    table.cell(0, 2).text = "t(30) = 2.75, p = .010"
    table.cell(1, 2).text = "t(30) = 0.40, p = .69"
    claims = claims_of(saved(document))
    assert [c.location.cell for c in claims] == ["table 1, row 1, column 3",
                                                 "table 1, row 2, column 3"]


def test_tables_are_numbered_in_document_order_and_nested_tables_are_read():
    document = docx.Document()
    document.add_table(rows=1, cols=1).cell(0, 0).text = "No results here"
    outer = document.add_table(rows=1, cols=2)
    cell = outer.cell(0, 1)
    cell.text = "Burrow entrances:"
    inner = cell.add_table(rows=1, cols=1)
    inner.cell(0, 0).text = "z = 2.40, p = .016"
    [claim] = claims_of(saved(document))
    assert summary(claim) == ("z", (), "2.40", "=", ".016")
    assert claim.location.cell == "table 3, row 1, column 1"


def test_symbol_font_tracked_changes_equations_and_line_breaks():
    document = docx.Document()
    # "c" typed in the Symbol font shows a chi
    paragraph = document.add_paragraph("Nest material differed, ")
    paragraph.add_run("c").font.name = "Symbol"
    paragraph.add_run("2(2, N = 90) = 7.30, p = .026.")
    # the same, with the Symbol character stored in the private use area, as Word may do
    paragraph = document.add_paragraph("Bedding differed, ")
    paragraph.add_run("\uf063").font.name = "Symbol"
    paragraph.add_run("2(2, N = 90) = 8.30, p = .016.")
    # a chi inserted with Insert > Symbol
    add_raw_paragraph(document, run_xml("Entrances differed, ")
                      + '<w:r><w:sym w:font="Symbol" w:char="F063"/></w:r>'
                      + run_xml("2(1, N = 60) = 4.10, p = .043."))
    # tracked changes: the deleted result is not read, the inserted one is
    add_raw_paragraph(document, run_xml("Litter size: ")
                      + '<w:del w:id="1" w:author="A"><w:r><w:delText>t(9) = 9.99, p = .9'
                        '</w:delText></w:r></w:del>'
                      + '<w:ins w:id="2" w:author="A">' + run_xml("t(9) = 2.50, p = .034")
                      + "</w:ins>" + run_xml("."))
    # an equation (Office Math): chi with a superscript 2
    add_raw_paragraph(document, run_xml("Sex ratio: ")
                      + "<m:oMath><m:sSup><m:e><m:r><m:t>χ</m:t></m:r></m:e><m:sup><m:r>"
                        "<m:t>2</m:t></m:r></m:sup></m:sSup><m:r><m:t>(1, N = 40) = 0.90"
                        "</m:t></m:r></m:oMath>"
                      + run_xml(", p = .34."))
    # a line break (Shift+Enter) inside a paragraph
    add_raw_paragraph(document, run_xml("Weights were similar.") + "<w:r><w:br/></w:r>"
                      + run_xml("Lengths too, t(18) = 0.52, p = .61."))
    claims = claims_of(saved(document))
    assert [summary(c) for c in claims] == [
        ("chi2", ("2",), "7.30", "=", ".026"),
        ("chi2", ("2",), "8.30", "=", ".016"),
        ("chi2", ("1",), "4.10", "=", ".043"),
        ("t", ("9",), "2.50", "=", ".034"),
        ("chi2", ("1",), "0.90", "=", ".34"),
        ("t", ("18",), "0.52", "=", ".61"),
    ]
    assert [c.location.paragraph for c in claims] == [1, 2, 3, 4, 5, 6]
    assert claims[5].location.line == 2  # the second line of its paragraph


def test_a_text_box_is_read_once_though_word_stores_it_twice():
    document = docx.Document()
    box = (f'<w:txbxContent><w:p>{run_xml("Box 1: t(22) = 2.20, p = .039")}</w:p>'
           "</w:txbxContent>")
    add_raw_paragraph(
        document,
        '<mc:AlternateContent xmlns:mc="http://schemas.openxmlformats.org/'
        'markup-compatibility/2006"><mc:Choice Requires="wps"><w:r><w:drawing>'
        f"<wps:wsp xmlns:wps=\"urn:example:wps\"><wps:txbx>{box}</wps:txbx></wps:wsp>"
        "</w:drawing></w:r></mc:Choice><mc:Fallback><w:r><w:pict>"
        f"<v:textbox xmlns:v=\"urn:schemas-microsoft-com:vml\">{box}</v:textbox>"
        "</w:pict></w:r></mc:Fallback></mc:AlternateContent>")
    [claim] = claims_of(saved(document))
    assert summary(claim) == ("t", ("22",), "2.20", "=", ".039")


def test_headings_in_custom_styles_based_on_a_heading_style_name_the_section():
    document = docx.Document()
    from docx.enum.style import WD_STYLE_TYPE
    style = document.styles.add_style("Fen Heading", WD_STYLE_TYPE.PARAGRAPH)
    style.base_style = document.styles["Heading 2"]
    document.add_paragraph("Study 2", style="Fen Heading")
    document.add_paragraph("Dry plots: t(14) = 1.10, p = .29.")
    [claim] = claims_of(saved(document))
    assert (claim.location.section, claim.location.paragraph) == ("Study 2", 1)


# -- sniffing --------------------------------------------------------------------------------

def test_a_word_document_is_recognised_by_content_whatever_its_name():
    data = saved(manuscript())
    assert sniff_format(data, "manuscript.txt") == "docx"
    assert sniff_format(data, "manuscript") == "docx"
    assert docx_reader.sniff(b"PK\x03\x04 not really", "notes.txt") is None


# -- bad input -------------------------------------------------------------------------------

def zip_of(entries: dict[str, bytes]) -> bytes:
    buffer = io.BytesIO()
    with zipfile.ZipFile(buffer, "w", zipfile.ZIP_DEFLATED) as archive:
        for name, data in entries.items():
            archive.writestr(name, data)
    return buffer.getvalue()


def declare_size(data: bytes, name: str, size: int) -> bytes:
    """Rewrite the uncompressed size an entry declares (local header and central directory)."""
    data = bytearray(data)
    encoded = name.encode()
    for signature, size_offset, name_offset in ((b"PK\x03\x04", 22, 30),
                                                (b"PK\x01\x02", 24, 46)):
        position = data.find(signature)
        while position != -1:
            if data[position + name_offset:position + name_offset + len(encoded)] == encoded:
                struct.pack_into("<I", data, position + size_offset, size)
            position = data.find(signature, position + 4)
    return bytes(data)


def refusal(data: bytes, name: str = "burrows.docx") -> str:
    with pytest.raises(InputError) as raised:
        document_from_bytes(data, name)
    message = str(raised.value)
    assert message.startswith(f"{name}: ")
    assert "\n" not in message
    return message


def test_a_zip_bomb_declaring_gigabytes_is_refused_before_anything_is_decompressed():
    honest = zip_of({"[Content_Types].xml": b"<Types/>", "word/document.xml": b"<w:document/>"})
    bomb = declare_size(honest, "word/document.xml", 0xF000_0000)  # 3.75 GB
    assert len(bomb) < 1000
    message = refusal(bomb)
    assert "zip bomb" in message and "3.8 GB" in message


def test_a_zip_bomb_that_compresses_far_better_than_any_word_document_is_refused():
    zeros = b"\0" * (docx_reader.LARGE_ENTRY_BYTES + 1024)
    bomb = zip_of({"[Content_Types].xml": b"<Types/>", "word/document.xml": zeros})
    message = refusal(bomb)
    assert "zip bomb" in message and "word/document.xml" in message and "ratio" in message


def test_an_entry_that_expands_beyond_its_declared_size_is_refused_as_damaged():
    lying = declare_size(zip_of({"[Content_Types].xml": b"<Types/>",
                                 "word/document.xml": b"<w:document/>" + b" " * 2_000_000}),
                         "word/document.xml", 1000)
    message = refusal(lying)
    assert "damaged" in message and "word/document.xml" in message


def test_a_truncated_word_document_is_refused_as_damaged():
    data = saved(manuscript())
    message = refusal(data[:len(data) // 2])
    assert "damaged or truncated Word document" in message


def test_a_corrupt_entry_is_refused_as_damaged():
    data = bytearray(saved(manuscript()))
    start = data.find(b"word/document.xml") + len("word/document.xml")
    data[start + 40:start + 60] = b"\xff" * 20  # scramble the compressed document part
    message = refusal(bytes(data))
    assert "damaged Word document" in message


@pytest.mark.parametrize("entries, what", [
    ({"[Content_Types].xml": b"<Types/>", "xl/workbook.xml": b"<workbook/>"},
     "an Excel workbook"),
    ({"[Content_Types].xml": b"<Types/>", "ppt/presentation.xml": b"<p/>"},
     "a PowerPoint presentation"),
    ({"mimetype": b"application/vnd.oasis.opendocument.text", "content.xml": b"<d/>"},
     "an OpenDocument file"),
    ({"notes.txt": b"t(28) = 2.20, p = .04"}, "without a Word document in it"),
])
def test_a_docx_that_is_really_another_zip_format_says_what_it_is(entries, what):
    message = refusal(zip_of(entries))
    assert "not a Word document" in message and what in message


def test_an_encrypted_word_document_says_so():
    ole = (b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1" + b"\0" * 504
           + "EncryptedPackage".encode("utf-16-le") + b"\0" * 200)
    assert "encrypted (password-protected)" in refusal(ole)


def test_a_document_type_declaration_inside_a_part_is_refused():
    data = rewrite(saved(manuscript()), "word/document.xml", lambda xml: xml.replace(
        b"?>", b'?><!DOCTYPE w:document [<!ENTITY lol "lol">]>', 1))
    message = refusal(data)
    assert "word/document.xml declares a document type or entities" in message


def test_a_word_document_without_text_is_refused():
    document = docx.Document()
    document.add_paragraph("")
    document.add_paragraph("   ")
    assert "no text" in refusal(saved(document))


def test_bad_word_documents_do_not_stop_the_others(tmp_path):
    (tmp_path / "a-good.docx").write_bytes(saved(manuscript()))
    honest = zip_of({"[Content_Types].xml": b"<Types/>", "word/document.xml": b"<w:document/>"})
    (tmp_path / "b-bomb.docx").write_bytes(declare_size(honest, "word/document.xml",
                                                        0xF000_0000))
    data = saved(manuscript())
    (tmp_path / "c-truncated.docx").write_bytes(data[:len(data) // 3])
    (tmp_path / "d-empty.docx").write_bytes(saved(docx.Document()))
    (tmp_path / "e-good.txt").write_text("Voles dug deeper, t(28) = 2.20, p = .036.\n")
    run = scrutiny.check_paths([str(tmp_path)])
    by_name = {result.path.rsplit("/", 1)[-1]: result for result in run.documents}
    assert len(by_name["a-good.docx"].claims) == 5 and by_name["a-good.docx"].format == "docx"
    assert "zip bomb" in by_name["b-bomb.docx"].errors[0]
    assert "truncated" in by_name["c-truncated.docx"].errors[0]
    assert "no text" in by_name["d-empty.docx"].errors[0]
    assert len(by_name["e-good.txt"].claims) == 1



def rewrite(data: bytes, name: str, change) -> bytes:
    """The archive `data` with the entry `name` replaced by `change(its bytes)`."""
    with zipfile.ZipFile(io.BytesIO(data)) as archive:
        entries = {entry: archive.read(entry) for entry in archive.namelist()}
    entries[name] = change(entries[name])
    return zip_of(entries)


def test_a_macro_enabled_word_document_is_read_like_a_docx():
    data = rewrite(saved(manuscript()), "[Content_Types].xml", lambda types: types.replace(
        b"application/vnd.openxmlformats-officedocument.wordprocessingml.document.main+xml",
        b"application/vnd.ms-word.document.macroEnabled.main+xml"))
    assert [summary(c) for c in claims_of(data, "burrows.docm")][0] == \
        ("t", ("38",), "2.10", "=", ".042")


def test_a_docx_that_is_really_html_or_plain_text_is_read_as_what_it_is():
    page = b"<!DOCTYPE html><html><body><p>Voles, t(28) = 2.20, p = .036</p></body></html>"
    assert document_from_bytes(page, "burrows.docx").format == "html"
    text = b"Voles dug deeper, t(28) = 2.20, p = .036.\n"
    assert document_from_bytes(text, "burrows.docx").format == "text"


def test_embedded_equation_objects_are_noted_as_unread():
    document = docx.Document()
    add_raw_paragraph(document, run_xml("Nests, ") + '<w:r><w:object w:dxaOrig="800" '
                                'w:dyaOrig="300"/></w:r>' + run_xml(" = 4.20, p = .04."))
    read = document_from_bytes(saved(document), "burrows.docx")
    assert read.notes == ("1 embedded object(s) (such as equations from an older equation "
                          "editor) have no text and were not read",)
