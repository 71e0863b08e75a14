"""Annotated copies of PDF manuscripts (`scrutiny check --annotate FOLDER`).

Where the highlights land is checked with readers other than the one scrutiny reads PDFs with:
pdfplumber (pdfminer) extracts the characters inside each highlight of an upright page, and
pdfium's own text-in-rectangle lookup, in the page's user space, those of a page with a crop
box and a turned page. The manuscript itself must come out byte for byte as it went in.
"""

from __future__ import annotations

import io

import pdfplumber
import pypdfium2
import pytest
from pypdf import PdfReader, PdfWriter

import scrutiny
from scrutiny.report.annotate import MARKER, page_rectangle
from scrutiny.model import Box

from pdf_factory import FONTS_AVAILABLE, Layout, manuscript_pdf
from test_cli import run

needs_fonts = pytest.mark.skipif(not FONTS_AVAILABLE, reason="DejaVu fonts not found")

PARAGRAPHS = [
    "Voles from the warm enclosures dug deeper burrows than voles from the cold enclosures, "
    "t(28) = 2.20, p = .01, and the treated voles left the burrow earlier, t(40) = 1.80, "
    "p = .04, than the untreated ones.",
    "Nest material depended on the site, χ^{2}(2, N = 120) = 3.10, p = .21, the season "
    "mattered, z = 2.81, ns, and burrow depth followed body mass, r(48) = .41, p = .003.",
] * 3
#: the results above that raise flags (p-mismatch, decision-flip, undeclared-one-sided)
FLAGGED = {"t(28) = 2.20, p = .01", "t(40) = 1.80, p = .04", "z = 2.81, ns"}


def _collapsed(text: str) -> str:
    return " ".join(text.split())


def _write(tmp_path, name: str, data: bytes) -> str:
    folder = tmp_path / "manuscripts"
    folder.mkdir(exist_ok=True)
    path = folder / name
    path.write_bytes(data)
    return str(path)


def _highlights(path: str) -> list[dict]:
    """Every highlight of a PDF: page index, rectangle in user space, note."""
    found = []
    for index, page in enumerate(PdfReader(path).pages):
        for reference in page.get("/Annots") or []:
            annotation = reference.get_object()
            if annotation["/Subtype"] == "/Highlight":
                found.append({"page": index, "rect": [float(v) for v in annotation["/Rect"]],
                              "contents": str(annotation["/Contents"]),
                              "quad": [float(v) for v in annotation["/QuadPoints"]]})
    return found


def _claims_by_id(path: str) -> dict[str, scrutiny.ClaimResult]:
    return {claim.id: claim for claim in scrutiny.check_file(path).claims}


@needs_fonts
def test_highlights_cover_exactly_the_flagged_results(tmp_path):
    source = _write(tmp_path, "paper.pdf", manuscript_pdf(PARAGRAPHS, Layout(columns=2)).data)
    before = open(source, "rb").read()
    out = tmp_path / "annotated"
    code, _, err = run("check", source, "--annotate", str(out))
    assert code == 1
    copy = out / "paper.scrutiny.pdf"
    assert err.strip().endswith(f"{copy}: 9 flagged results highlighted")
    assert open(source, "rb").read() == before  # the manuscript is only read

    claims = _claims_by_id(source)
    highlights = _highlights(str(copy))
    covered: dict[str, list[str]] = {}
    with pdfplumber.open(str(copy)) as pdf:
        for highlight in highlights:
            page = pdf.pages[highlight["page"]]
            x0, y0, x1, y1 = highlight["rect"]
            # pdfplumber measures from the top of the page
            inside = page.within_bbox((x0 - 0.5, page.height - y1 - 0.5,
                                       x1 + 0.5, page.height - y0 + 0.5))
            claim_id = highlight["contents"].split(":")[0].split(" ")[0]
            covered.setdefault(claim_id, []).append(inside.extract_text())
            # the quadrilateral is the rectangle's corners: top left, top right, bottom
            # left, bottom right (the order viewers expect)
            assert highlight["quad"] == pytest.approx([x0, y1, x1, y1, x0, y0, x1, y0], abs=0.01)
    flagged = {claim_id for claim_id, claim in claims.items() if claim.flags}
    assert set(covered) == flagged
    assert {_collapsed(claims[c].claim.text) for c in flagged} == FLAGGED
    for claim_id, pieces in covered.items():
        assert _collapsed(" ".join(pieces)) == _collapsed(claims[claim_id].claim.text)
    for highlight in highlights:
        if "(continued)" not in highlight["contents"]:
            claim = claims[highlight["contents"].split(":")[0]]
            for flag in claim.flags:
                assert _collapsed(flag.message) in _collapsed(highlight["contents"])


@needs_fonts
def test_the_copy_says_what_it_is_and_carries_the_caution(tmp_path):
    source = _write(tmp_path, "paper.pdf", manuscript_pdf(PARAGRAPHS, Layout(columns=1)).data)
    out = tmp_path / "annotated"
    run("check", source, "--annotate", str(out))
    reader = PdfReader(str(out / "paper.scrutiny.pdf"))
    assert MARKER in reader.metadata
    notes = [a.get_object() for a in reader.pages[0]["/Annots"]
             if a.get_object()["/Subtype"] == "/Text"]
    assert len(notes) == 1
    assert scrutiny.CAUTION in _collapsed(str(notes[0]["/Contents"]))
    assert len(reader.pages) == len(PdfReader(source).pages)


def _with_crop_box(data: bytes, box: tuple[float, float, float, float]) -> bytes:
    writer = PdfWriter(clone_from=PdfReader(io.BytesIO(data)))
    for page in writer.pages:
        page.cropbox.lower_left = box[:2]
        page.cropbox.upper_right = box[2:]
    buffer = io.BytesIO()
    writer.write(buffer)
    return buffer.getvalue()


@needs_fonts
@pytest.mark.parametrize("layout, crop", [
    (Layout(columns=2), (30.0, 45.0, 590.0, 770.0)),
    (Layout(columns=1, rotate=90), None),
    (Layout(columns=1, rotate=90), (20.0, 30.0, 600.0, 780.0)),
], ids=["crop-box", "turned", "turned-crop-box"])
def test_highlights_follow_crop_box_and_rotation(tmp_path, layout, crop):
    data = manuscript_pdf(PARAGRAPHS[:2], layout).data
    if crop is not None:
        data = _with_crop_box(data, crop)
    source = _write(tmp_path, "paper.pdf", data)
    out = tmp_path / "annotated"
    run("check", source, "--annotate", str(out))
    claims = _claims_by_id(source)
    pieces: dict[str, list[str]] = {}
    document = pypdfium2.PdfDocument(str(out / "paper.scrutiny.pdf"))
    try:
        for highlight in _highlights(str(out / "paper.scrutiny.pdf")):
            textpage = document[highlight["page"]].get_textpage()
            x0, y0, x1, y1 = highlight["rect"]
            claim_id = highlight["contents"].split(":")[0].split(" ")[0]
            # pdfium takes characters that touch the rectangle: a hair inside it along the
            # line, so that the comma after a result is not taken
            pieces.setdefault(claim_id, []).append(
                textpage.get_text_bounded(x0 + 0.3, y0 - 0.5, x1 - 0.3, y1 + 0.5))
    finally:
        document.close()
    assert {_collapsed(claims[c].claim.text) for c in pieces} == {
        "t(28) = 2.20, p = .01", "t(40) = 1.80, p = .04", "z = 2.81, ns"}
    for claim_id, texts in pieces.items():
        assert _collapsed(" ".join(texts)) == _collapsed(claims[claim_id].claim.text)


@pytest.mark.parametrize("rotation", [0, 90, 180, 270])
def test_page_rectangle_inverts_the_reader_s_measure(rotation):
    # the reader's measure of a user-space point on a page whose crop box is (10, 20, 610, 820)
    # (see ingest/pdf.py); the rectangle must come back to the same points
    left, bottom, right, top = 10.0, 20.0, 610.0, 820.0
    x0, y0, x1, y1 = 100.0, 300.0, 180.0, 312.0

    def measured(x, y):
        return {0: (x - left, top - y), 90: (y - bottom, x - left),
                180: (right - x, y - bottom), 270: (top - y, right - x)}[rotation]

    corners = [measured(x0, y0), measured(x1, y1)]
    box = Box(1, min(c[0] for c in corners), min(c[1] for c in corners),
              max(c[0] for c in corners), max(c[1] for c in corners))
    assert page_rectangle(box, (left, bottom, right, top), rotation) == pytest.approx(
        (x0, y0, x1, y1))


# -- what is written where -------------------------------------------------------------------

@needs_fonts
def test_a_foreign_file_is_never_replaced_but_an_earlier_copy_is(tmp_path):
    source = _write(tmp_path, "paper.pdf", manuscript_pdf(PARAGRAPHS[:1], Layout()).data)
    out = tmp_path / "annotated"
    out.mkdir()
    foreign = out / "paper.scrutiny.pdf"
    foreign.write_bytes(b"the user's own file")
    code, _, err = run("check", source, "--annotate", str(out))
    assert code == 2 and "exists and was not written by scrutiny" in err
    assert "Traceback" not in err
    assert foreign.read_bytes() == b"the user's own file"
    foreign.unlink()
    assert run("check", source, "--annotate", str(out))[0] == 1
    first = foreign.read_bytes()
    assert run("check", source, "--annotate", str(out))[0] == 1  # our own copy: replaced
    assert MARKER in PdfReader(str(foreign)).metadata and len(foreign.read_bytes()) == len(first)
    assert sorted(p.name for p in out.iterdir()) == ["paper.scrutiny.pdf"]


@needs_fonts
def test_copies_of_two_papers_of_one_name_both_kept(tmp_path):
    data = manuscript_pdf(PARAGRAPHS[:1], Layout()).data
    for folder in ("a", "b"):
        (tmp_path / "issue" / folder).mkdir(parents=True)
        (tmp_path / "issue" / folder / "paper.pdf").write_bytes(data)
    (tmp_path / "issue" / "clean.txt").write_text("Dug deeper, t(28) = 2.45, p = .021.\n",
                                                   encoding="utf-8")
    out = tmp_path / "annotated"
    assert run("check", str(tmp_path / "issue"), "--annotate", str(out))[0] == 1
    assert sorted(p.name for p in out.iterdir()) == ["paper-2.scrutiny.pdf", "paper.scrutiny.pdf"]


def test_the_folder_may_not_lie_among_the_inputs(tmp_path):
    folder = tmp_path / "issue"
    folder.mkdir()
    (folder / "a.txt").write_text("Dug deeper, t(28) = 2.20, p = .01.\n", encoding="utf-8")
    for target in (folder, folder / "annotated"):
        code, out, err = run("check", str(folder), "--annotate", str(target))
        assert code == 2 and out == "" and err.count("\n") == 1
        assert err.startswith("scrutiny: error: --annotate")
    assert sorted(p.name for p in folder.iterdir()) == ["a.txt"]


def test_without_flagged_pdfs_nothing_is_written(tmp_path):
    path = tmp_path / "a.txt"
    path.write_text("Dug deeper, t(28) = 2.20, p = .01.\n", encoding="utf-8")
    out = tmp_path / "annotated"
    assert run("check", str(path), "--annotate", str(out))[0] == 1
    assert not out.exists()


# -- Word ------------------------------------------------------------------------------------

W = "{http://schemas.openxmlformats.org/wordprocessingml/2006/main}"


def _commented_text(path) -> dict[str, str]:
    """The text each comment range of a Word file covers, read from its XML with lxml."""
    import zipfile

    from lxml import etree

    body = etree.fromstring(zipfile.ZipFile(path).read("word/document.xml"))
    open_ranges: dict[str, list[str]] = {}
    covered: dict[str, str] = {}
    for element in body.iter():
        if element.tag == W + "commentRangeStart":
            open_ranges[element.get(W + "id")] = []
        elif element.tag == W + "commentRangeEnd":
            key = element.get(W + "id")
            covered[key] = "".join(open_ranges.pop(key))
        elif element.tag == W + "t":
            for pieces in open_ranges.values():
                pieces.append(element.text or "")
    return covered


def _word_manuscript(path) -> None:
    import docx

    document = docx.Document()
    document.add_paragraph("Voles from the warm enclosures dug deeper, t(28) = 2.20, p = .01, "
                           "and the treated voles left earlier, t(40) = 1.80, p = .04.")
    paragraph = document.add_paragraph("The logger agreed, t(28) = 2.45, p = .021, and the "
                                       "season mattered, ")
    for text, italic in (("z", True), (" = 2.", False), ("81, n", False), ("s", False),
                         (", as in earlier years.", False)):
        paragraph.add_run(text).italic = italic
    table = document.add_table(rows=1, cols=2)
    table.cell(0, 0).text = "Sites"
    table.cell(0, 1).text = "F(2, 87) = 4.12, p = .01"
    document.save(str(path))


def test_word_copy_comments_exactly_the_flagged_results(tmp_path):
    import docx

    source = tmp_path / "manuscripts" / "paper.docx"
    source.parent.mkdir()
    _word_manuscript(source)
    before = source.read_bytes()
    out = tmp_path / "annotated"
    code, _, err = run("check", str(source), "--annotate", str(out))
    assert code == 1
    copy = out / "paper.scrutiny.docx"
    assert err.strip().endswith(f"{copy}: 4 flagged results commented")
    assert source.read_bytes() == before

    result = scrutiny.check_file(str(source))
    flagged = [claim for claim in result.claims if claim.flags]
    comments = list(docx.Document(str(copy)).comments)
    assert all(comment.author == "scrutiny" for comment in comments)
    covered = _commented_text(copy)
    by_id = {str(comment.comment_id): comment for comment in comments}
    texts = sorted(covered[key] for key in covered if "results found" not in by_id[key].text)
    assert texts == sorted(claim.claim.text for claim in flagged)
    for claim in flagged:
        [key] = [key for key, text in covered.items() if text == claim.claim.text]
        for flag in claim.flags:
            assert flag.message in by_id[key].text
    [summary] = [c for c in comments if "results found" in c.text]
    assert scrutiny.CAUTION in summary.text
    # the runs cut to anchor the comment keep their formatting: "z" stays italic
    copied = docx.Document(str(copy))
    italic = [run.text for paragraph in copied.paragraphs for run in paragraph.runs if run.italic]
    assert italic == ["z"]
    # and the copy reads as the manuscript does
    assert [c.claim.text for c in scrutiny.check_file(str(copy)).claims] == [
        c.claim.text for c in result.claims]


def test_word_results_outside_the_body_text_are_counted_not_lost(tmp_path):
    import docx

    source = tmp_path / "manuscripts" / "paper.docx"
    source.parent.mkdir()
    document = docx.Document()
    paragraph = document.add_paragraph("Burrows differed, ")
    # a result inside a hyperlink: its runs are not the paragraph's own
    from docx.oxml import parse_xml
    paragraph._p.append(parse_xml(
        '<w:hyperlink xmlns:w="http://schemas.openxmlformats.org/wordprocessingml/2006/main">'
        '<w:r><w:t xml:space="preserve">t(28) = 2.20, p = .01</w:t></w:r></w:hyperlink>'))
    document.save(str(source))
    out = tmp_path / "annotated"
    code, _, err = run("check", str(source), "--annotate", str(out))
    assert code == 1 and "0 flagged results commented, 1 could not be placed in the text" in err
    [summary] = list(docx.Document(str(out / "paper.scrutiny.docx")).comments)
    assert "1 flagged result could not be marked in the text" in summary.text


def test_a_foreign_word_file_is_never_replaced(tmp_path):
    source = tmp_path / "manuscripts" / "paper.docx"
    source.parent.mkdir()
    _word_manuscript(source)
    out = tmp_path / "annotated"
    out.mkdir()
    (out / "paper.scrutiny.docx").write_bytes(b"the user's own file")
    code, _, err = run("check", str(source), "--annotate", str(out))
    assert code == 2 and "exists and was not written by scrutiny" in err
    assert (out / "paper.scrutiny.docx").read_bytes() == b"the user's own file"


@needs_fonts
def test_a_pdf_from_standard_input_has_no_file_to_copy(tmp_path):
    data = manuscript_pdf(PARAGRAPHS[:1], Layout()).data
    out = tmp_path / "annotated"
    code, _, err = run("check", "-", "--annotate", str(out), stdin=data)
    assert code == 2 and "read from standard input, so there is no file to copy" in err
    assert err.count("\n") == 1 and "Traceback" not in err


@needs_fonts
def test_a_pdf_encrypted_without_a_user_password_is_annotated(tmp_path):
    # restrictions set with an owner password only: anyone may read it, and so copy it
    source = _write(tmp_path, "paper.pdf",
                    manuscript_pdf(PARAGRAPHS[:1], Layout(password="")).data)
    out = tmp_path / "annotated"
    code, _, err = run("check", source, "--annotate", str(out))
    assert code == 1 and "2 flagged results highlighted" in err
    assert len(_highlights(str(out / "paper.scrutiny.pdf"))) >= 2


def test_word_table_rows_are_commented_in_their_own_cell(tmp_path):
    import docx

    source = tmp_path / "manuscripts" / "tables.docx"
    source.parent.mkdir()
    document = docx.Document()
    # the flagged row's statistic, 2.20, is printed in the text before the table too
    document.add_paragraph("The burrows were 2.20 m deep on average.")
    table = document.add_table(rows=3, cols=4)
    for r, row in enumerate([["Measure", "t", "df", "p"], ["Boldness", "2.45", "28", ".021"],
                             ["Range", "2.20", "28", ".01"]]):
        for c, text in enumerate(row):
            table.cell(r, c).text = text
    document.save(str(source))
    out = tmp_path / "annotated"
    code, _, err = run("check", str(source), "--annotate", str(out))
    assert code == 1 and "1 flagged result commented" in err
    copy = out / "tables.scrutiny.docx"
    comments = {str(c.comment_id): c.text for c in docx.Document(str(copy)).comments}
    covered = _commented_text(copy)
    [key] = [key for key in covered if "p-mismatch" in comments[key]]
    assert covered[key] == "2.20"
    # ... in the table's cell (row 3, column 2), not in the sentence above it
    copied = docx.Document(str(copy))
    start, end = f'commentRangeStart w:id="{key}"', f'commentRangeEnd w:id="{key}"'
    assert start not in copied.paragraphs[0]._p.xml  # (which holds the summary's comment)
    cell = copied.tables[0].cell(2, 1)._tc.xml
    assert start in cell and end in cell
