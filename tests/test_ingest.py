"""ingest: decoding, format sniffing, bad input, normalisation and the offset map."""

from __future__ import annotations

import codecs

import pytest

from scrutiny.errors import InputError
from scrutiny.extract import find_claims
from scrutiny.ingest import document_from_bytes, document_from_text, read_document
from scrutiny.ingest.normalise import normalise

SENTENCE = "Die Wühlmäuse gruben tiefer, t(28) = 2.45, p = .021 – größer als erwartet.\n"


# -- decoding --------------------------------------------------------------------------------

@pytest.mark.parametrize("encoded, encoding", [
    (SENTENCE.encode("utf-8"), "utf-8"),
    (codecs.BOM_UTF8 + SENTENCE.encode("utf-8"), "utf-8-sig"),
    (codecs.BOM_UTF16_LE + SENTENCE.encode("utf-16-le"), "utf-16"),
    (codecs.BOM_UTF16_BE + SENTENCE.encode("utf-16-be"), "utf-16"),
    (codecs.BOM_UTF32_LE + SENTENCE.encode("utf-32-le"), "utf-32"),
    (SENTENCE.encode("utf-16-le"), "utf-16-le"),
    (SENTENCE.encode("cp1252"), "windows-1252"),
])
def test_encodings_are_detected_and_reported(encoded, encoding):
    document = document_from_bytes(encoded, "paper.txt")
    assert document.encoding == encoding
    assert document.text == SENTENCE
    [claim] = find_claims(document)
    assert (claim.statistic, claim.p.reported) == ("2.45", ".021")


def test_latin1_bytes_undefined_in_windows_1252_fall_back_to_latin1():
    # 0x81 is undefined in Windows-1252 but a control character in Latin-1
    data = "Mäuse t(28) = 2.45, p = .021\x81\n".encode("latin-1")
    document = document_from_bytes(data, "paper.txt")
    assert document.encoding == "latin-1"
    assert "Mäuse" in document.text


def test_windows_1252_curly_quotes_and_dashes():
    data = "The \u201cwarm\u201d group \u2013 t(28) = \u22122.45".encode("cp1252", "replace")
    document = document_from_bytes(data + b", p = .021", "paper.txt")
    assert document.encoding == "windows-1252"
    assert "\u201cwarm\u201d" in document.text


# -- bad input -------------------------------------------------------------------------------

@pytest.mark.parametrize("data, reason", [
    (b"", "empty file"),
    (b"   \n\t\n", "empty file (only white space)"),
    (b"\x00\x01\x02\x03binary\x00\xff" * 50, "binary file"),
    (b"%PDF-1.7\n%\xe2\xe3\xcf\xd3\n1 0 obj", "this is a PDF"),
    (b"PK\x03\x04\x14\x00\x06\x00", "ZIP archive"),
    (b"\x89PNG\r\n\x1a\n\x00\x00", "PNG image"),
    (codecs.BOM_UTF16_LE + b"\x00\xd8", "not valid utf-16"),
])
def test_bad_input_gives_a_one_line_reason(data, reason):
    with pytest.raises(InputError) as raised:
        document_from_bytes(data, "paper.txt")
    message = str(raised.value)
    assert message.startswith("paper.txt: ")
    assert reason in message
    assert "\n" not in message


def test_a_pdf_named_txt_is_recognised_by_content():
    with pytest.raises(InputError, match="this is a PDF"):
        document_from_bytes(b"%PDF-1.4 ...", "results.txt")


def test_missing_and_unreadable_files(tmp_path):
    with pytest.raises(InputError, match="no such file"):
        read_document(tmp_path / "missing.txt")
    with pytest.raises(InputError, match="is a folder"):
        read_document(tmp_path)


def test_reading_never_changes_the_file(tmp_path):
    path = tmp_path / "paper.txt"
    path.write_bytes(SENTENCE.encode("cp1252"))
    before = path.read_bytes(), path.stat().st_mtime_ns
    read_document(path)
    assert (path.read_bytes(), path.stat().st_mtime_ns) == before


# -- normalisation ---------------------------------------------------------------------------

@pytest.mark.parametrize("printed, normalised", [
    ("t(28) = \u22122.45", "t(28) = -2.45"),        # minus sign
    ("t(28) = \u20132.45", "t(28) = -2.45"),        # en dash
    ("\u03c7\u00b2(1) = 4.2", "\u03c72(1) = 4.2"),  # superscript two
    ("\U0001d461(28) = 2.45, \U0001d45d = .02", "t(28) = 2.45, p = .02"),  # math italic
    ("p\u00a0=\u2009.02", "p = .02"),               # no-break and thin spaces
    ("p \u2a7d .001", "p \u2264 .001"),             # slanted less-or-equal
    ("p = 0\u00b703", "p = 0.03"),                  # middle-dot decimal point
    ("signi\u00adficant", "significant"),           # soft hyphen
    ("signifi-\ncant", "significant"),              # end-of-line hyphenation
    ("e\ufb03cient", "efficient"),                  # ligature ffi
    ("2.8 \u00d7 10\u207b\u2074", "2.8 \u00d7 10-4"),  # superscript exponent
    ("p = .021\u00b3 and", "p = .021  and"),       # a footnote marker after a number
    ("t(28) = 2.45\u00b9\u00b2, p", "t(28) = 2.45  , p"),  # a two-digit marker
    ("p = .010\u00b3", "p = .010 "),               # "10" after a decimal point: a marker
    ("2.8 \u00d7 10\u2074", "2.8 \u00d7 104"),      # a positive power of ten keeps its exponent
    ("r\u00b2 = .04, R\u00b2", "r2 = .04, R2"),      # a square after a letter
])
def test_normalisation(printed, normalised):
    assert normalise(printed)[0] == normalised


def test_hyphen_between_numbers_or_capitals_is_kept():
    assert normalise("scores 3-\n5 and ANOVA-\nbased")[0] == "scores 3-\n5 and ANOVA-\nbased"


def test_offsets_point_into_the_text_as_decoded():
    text = ("The e\ufb03cient voles (signi\u00adficant) dug deeper,\n"
            "t(28) = \u22122.45, \U0001d45d = .021, and signifi-\ncantly more: "
            "r(48) = .32, p = .02.\n")
    document = document_from_text(text)
    claims = find_claims(document)
    assert [c.text for c in claims] == ["t(28) = \u22122.45, \U0001d45d = .021",
                                        "r(48) = .32, p = .02"]
    for claim in claims:
        assert text[claim.location.start:claim.location.end] == claim.text
    assert [c.location.line for c in claims] == [2, 3]
    assert claims[0].statistic == "\u22122.45"  # kept as printed
