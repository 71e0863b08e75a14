"""Results printed across the cells of a table (extract/tables.py), in Word, HTML and JATS.

Expected p-values are the two-sided or upper-tail p of the printed statistic, computed with
mpmath (a reference library) where a test needs them; the rows are invented.
"""

from __future__ import annotations

import io
from html import escape

import docx
import mpmath
import pytest

import scrutiny
from scrutiny.ingest import document_from_bytes

TESTS = [["Measure", "t", "df", "p"],
         ["Boldness", "2.45", "28", ".021"],      # p = .0208: consistent
         ["Range", "2.20", "28", ".01*"],         # p = .036: a p-mismatch, both significant
         ["Speed", "−1.10", "28", "< .001"],      # p = .28: a decision flip
         ["Note. * p < .05.", "", "", ""]]        # a note row: not a result


def _docx(*tables: list[list[str]], paragraph: str = "The tests are in the tables.") -> bytes:
    document = docx.Document()
    document.add_paragraph(paragraph)
    for rows in tables:
        table = document.add_table(rows=len(rows), cols=len(rows[0]))
        for r, row in enumerate(rows):
            for c, text in enumerate(row):
                table.cell(r, c).text = text
    buffer = io.BytesIO()
    document.save(buffer)
    return buffer.getvalue()


def _html(*tables: list[list[str]]) -> bytes:
    body = "".join(
        "<table>" + "".join("<tr>" + "".join(f"<td>{escape(cell)}</td>" for cell in row) + "</tr>"
                            for row in rows) + "</table>" for rows in tables)
    return f"<!DOCTYPE html><html><body><p>The tests.</p>{body}</body></html>".encode()


def _jats(*tables: list[list[str]]) -> bytes:
    body = "".join(
        "<table-wrap><table>" + "".join(
            "<tr>" + "".join(f"<td>{escape(cell)}</td>" for cell in row) + "</tr>" for row in rows)
        + "</table></table-wrap>" for rows in tables)
    return (f'<?xml version="1.0" encoding="UTF-8"?><article><body><p>The tests.</p>{body}'
            f"</body></article>").encode()


def _check(data: bytes, name: str) -> scrutiny.DocumentResult:
    return scrutiny.check_document(document_from_bytes(data, name))


def _summary(result) -> list[tuple]:
    return [(c.claim.test, c.claim.df, c.claim.statistic,
             (c.claim.p.comparator, c.claim.p.reported) if c.claim.p else None,
             sorted(f.check for f in c.flags)) for c in result.claims]


def _two_sided_t(t: float, df: float) -> float:
    x = mpmath.mpf(t)
    return float(mpmath.betainc(df / 2, 0.5, 0, df / (df + x * x), regularized=True))


@pytest.mark.parametrize("make, name", [(_docx, "tables.docx"), (_html, "tables.html"),
                                        (_jats, "tables.xml")])
def test_a_table_of_t_tests_is_read_row_by_row(make, name):
    # reference p-values (mpmath): .0208, .0364, .281
    assert round(_two_sided_t(2.45, 28), 4) == 0.0208
    assert round(_two_sided_t(2.20, 28), 4) == 0.0362
    assert _two_sided_t(1.10, 28) > 0.05
    result = _check(make(TESTS), name)
    assert _summary(result) == [
        ("t", ("28",), "2.45", ("=", ".021"), []),
        ("t", ("28",), "2.20", ("=", ".01"), ["p-mismatch"]),
        ("t", ("28",), "−1.10", ("<", ".001"), ["decision-flip", "p-mismatch"]),
    ]
    first = result.claims[0].claim
    assert first.location.cell == "table 1, row 2, column 2"
    assert first.sentence == "table 1, row 2: Measure: Boldness; t: 2.45; df: 28; p: .021"


def test_the_claim_s_text_is_the_row_as_printed():
    data = _docx(TESTS)
    document = document_from_bytes(data, "tables.docx")
    for result in scrutiny.check_document(document).claims:
        location = result.claim.location
        assert document.text[location.start:location.end] == result.claim.text


def test_df_in_the_header_and_in_one_or_two_df_columns():
    header_df = [["Effect", "F(2, 87)", "p"], ["Site", "4.12", ".02"], ["Season", "3.10", ".001"]]
    one_column = [["Effect", "F", "df", "p"], ["Site", "4.12", "2, 87", ".02"]]
    two_columns = [["Effect", "F", "df", "df", "p"], ["Site", "4.12", "2", "87", ".02"]]
    too_few = [["Effect", "F", "df", "p"], ["Site", "4.12", "87", ".02"]]
    result = _check(_docx(header_df, one_column, two_columns, too_few), "f.docx")
    assert [(c.claim.df, c.status.value) for c in result.claims] == [
        (("2", "87"), "consistent"), (("2", "87"), "inconsistent"),
        (("2", "87"), "consistent"), (("2", "87"), "consistent"),
        ((), "unchecked")]          # one df for an F: which is it? left unchecked


def test_chi_square_with_df_and_n_columns():
    rows = [["Variable", "χ2", "df", "N", "p"], ["Habitat", "4.62", "1", "80", ".032"]]
    [claim] = _check(_docx(rows), "chi.docx").claims
    assert (claim.claim.test, claim.claim.df, claim.claim.n) == ("chi2", ("1",), "80")
    assert claim.status.value == "consistent" and claim.recomputed.effect.measure == "w"


def test_a_regression_table_checks_t_against_b_and_se():
    rows = [["Predictor", "b", "SE", "t", "p"],
            ["Mass", "0.34", "0.12", "2.83", ".006"],     # 0.34 / 0.12 = 2.83
            ["Age", "0.52", "0.14", "2.10", ".039"]]      # 0.52 / 0.14 = 3.71, not 2.10
    mass, age = _check(_docx(rows), "reg.docx").claims
    assert mass.flags == () and mass.claim.estimate.se == "0.12"
    assert [f.check for f in age.flags] == ["coefficient-mismatch"]


@pytest.mark.parametrize("rows", [
    [["Group", "M", "SD", "n"], ["Voles", "3.48", "1.21", "20"]],     # descriptives
    [["Group", "n", "p"], ["Voles", "20", ".35"]],                     # p a proportion
    [["Measure", "t", "df"], ["Boldness", "2.45", "28"]],              # no p column
    [["Time", "t1", "t2", "p"], ["Morning", "2.45", "2.50", ".02"]],  # t1, t2: time points
    [["Measure", "t", "p"], ["Boldness", "large", ".02"]],             # no number
    [["Measure", "t", "p"], ["Boldness", "2.45", "—"]],                # no p-value
])
def test_tables_that_are_not_tables_of_results_give_no_claims(rows):
    assert _check(_docx(rows), "t.docx").claims == ()


def test_a_cell_that_prints_a_whole_result_is_read_once():
    rows = [["Test", "t", "p"], ["Boldness", "t(28) = 2.45", ".021"],
            ["Range", "2.20", "p = .036"]]
    other = [["Test", "Result"], ["Boldness", "t(28) = 2.45, p = .021"]]
    result = _check(_docx(rows, other), "t.docx")
    texts = [c.claim.text for c in result.claims]
    assert texts.count("t(28) = 2.45, p = .021") == 1
    assert all(c.claim.pattern != "table-row" or c.claim.statistic != "2.45"
               for c in result.claims)


def test_a_table_of_coefficients_without_a_statistic_checks_p_against_b_and_se():
    # 0.34 / 0.12 = 2.83: p = .005 fits (normal: .0047; t with 10 or more df up to .018);
    # 0.52 / 0.14 = 3.71: p = .21 does not
    rows = [["Predictor", "B", "SE", "p"], ["Mass", "0.34", "0.12", ".005"],
            ["Age", "0.52", "0.14", ".21"]]
    mass, age = _check(_docx(rows), "coefficients.docx").claims
    assert (mass.claim.test, mass.claim.estimate.se, mass.flags) == ("estimate", "0.12", ())
    assert [f.check for f in age.flags] == ["coefficient-mismatch"]


def test_tables_of_ratios_with_confidence_intervals():
    # Altman & Bland (2011): p from the interval on the log scale. OR 1.84 (1.06-3.19):
    # SE = (ln 3.19 - ln 1.06) / 3.92 = 0.281, z = ln 1.84 / 0.281 = 2.17, p = .030 (not .20);
    # OR 1.52 (1.10-2.10): SE = 0.165, z = 2.54, p = .011
    together = [["Exposure", "OR (95% CI)", "p"], ["Smoking", "1.52 (1.10–2.10)", ".011"],
                ["Flooding", "1.84 (1.06-3.19)", ".20"]]
    apart = [["Exposure", "aHR", "95% CI", "P"], ["Smoking", "0.71", "0.55 to 0.92", ".009"]]
    result = _check(_docx(together, apart), "ratios.docx")
    assert [(c.claim.estimate.label, c.claim.estimate.value, c.claim.estimate.low,
             c.claim.estimate.high, c.claim.estimate.ratio, sorted(f.check for f in c.flags))
            for c in result.claims] == [
        ("OR", "1.52", "1.10", "2.10", True, []),
        ("OR", "1.84", "1.06", "3.19", True, ["ci-p-mismatch"]),
        ("aHR", "0.71", "0.55", "0.92", True, [])]
    assert all(c.claim.estimate.level == "95" for c in result.claims)


def test_a_latex_tabular_is_read_like_a_word_table(tmp_path):
    source = tmp_path / "paper.tex"
    source.write_text(
        "\\documentclass{article}\n\\begin{document}\nThe tests are in Table 1.\n"
        "\\begin{table}\n\\begin{tabular}{lccc}\n\\hline\n"
        "Measure & $t$ & $df$ & $p$ \\\\\n\\hline\n"
        "Boldness & 2.45 & 28 & .021 \\\\\n"
        "Range & 2.20 & 28 & .01$^{*}$ \\\\\n\\hline\n"
        "\\end{tabular}\n\\end{table}\n\\end{document}\n", encoding="utf-8")
    result = scrutiny.check_file(str(source))
    assert _summary(result) == [("t", ("28",), "2.45", ("=", ".021"), []),
                                ("t", ("28",), "2.20", ("=", ".01"), ["p-mismatch"])]
    location = result.claims[1].claim.location
    assert (location.file, location.line, location.cell) == (
        "paper.tex", 10, "table 1, row 3, column 2")


def test_a_table_of_correlations_with_n():
    # r = .32 with n = 50 (df 48): t = .32 * sqrt(48 / (1 - .1024)) = 2.34, p = .024
    rows = [["Pair", "r", "n", "p"], ["Mass and depth", ".32", "50", ".024"],
            ["Mass and speed", ".12", "50", ".03"]]   # r = .12: p = .41, not .03
    mass_depth, mass_speed = _check(_docx(rows), "r.docx").claims
    assert (mass_depth.claim.test, mass_depth.claim.n, mass_depth.flags) == ("r", "50", ())
    assert sorted(f.check for f in mass_speed.flags) == ["decision-flip", "p-mismatch"]


def test_reports_show_a_row_as_the_result_it_prints(tmp_path):
    from test_cli import run

    path = tmp_path / "tables.docx"
    path.write_bytes(_docx(TESTS))
    out = run("check", str(path), "--format", "text")[1]
    assert "t(28) = 2.20, p = .01 (table row)" in " ".join(out.split())
    assert "table 1 r3 c2" in out


def test_a_table_that_says_its_tests_are_one_tailed():
    # t(28) = 1.80: two-sided p = .083, one-sided .041; printed p = .04
    rows = [["Measure", "t", "df", "p"], ["Boldness", "1.80", "28", ".04"],
            ["Note. One-tailed tests.", "", "", ""]]
    [claim] = _check(_docx(rows), "one.docx").claims
    assert claim.claim.tails_stated == "one"
    assert [f.check for f in claim.flags] == ["one-sided"]
    [silent] = _check(_docx(rows[:2]), "none.docx").claims
    assert "undeclared-one-sided" in [f.check for f in silent.flags]


def test_a_p_column_headed_one_tailed():
    rows = [["Measure", "t", "df", "p (one-tailed)"], ["Boldness", "1.80", "28", ".04"]]
    [claim] = _check(_docx(rows), "one.docx").claims
    assert claim.claim.tails_stated == "one" and [f.check for f in claim.flags] == ["one-sided"]


@pytest.mark.parametrize("data, name", [
    (b"<!DOCTYPE html><html><body><table><thead><tr><th>Measure</th><th><i>t</i></th>"
     b"<th><i>df</i></th><th><i>p</i></th></tr></thead><tbody><tr><td>Range</td><td>2.20</td>"
     b"<td>28</td><td>.01</td></tr></tbody></table></body></html>", "page.html"),
    (b'<?xml version="1.0"?><article><body><table-wrap><label>Table 1</label><table><thead>'
     b"<tr><th>Measure</th><th><italic>t</italic></th><th><italic>df</italic></th>"
     b"<th><italic>p</italic></th></tr></thead><tbody><tr><td>Range</td><td>2.20</td>"
     b"<td>28</td><td>.01</td></tr></tbody></table></table-wrap></body></article>",
     "article.xml"),
])
def test_header_cells_in_italics_and_a_thead(data, name):
    [claim] = _check(data, name).claims
    assert (claim.claim.statistic, claim.claim.df, [f.check for f in claim.flags]) == (
        "2.20", ("28",), ["p-mismatch"])
