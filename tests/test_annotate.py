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
