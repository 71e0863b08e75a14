"""The CSV, SARIF and HTML reports, and writing a report to a file (--output).

Golden files for these formats live beside the text and JSON ones in tests/data/golden/
(regenerate with `SCRUTINY_UPDATE_GOLDEN=1 python -m pytest tests/test_report.py` and review the
diff). Beyond the golden files each format is read back by an independent reader: the csv
module and pandas for CSV, the rules of the SARIF 2.1.0 standard for SARIF, the standard
library's HTML parser for HTML.
"""

from __future__ import annotations

import csv
import io
import json
import os
import stat
import threading
from html.parser import HTMLParser

import pytest

import scrutiny
from scrutiny.check import REGISTRY

from test_cli import GOLDEN, MISMATCH, _golden, run

VERSION = scrutiny.__version__


def _report(format: str, monkeypatch) -> str:
    monkeypatch.chdir(GOLDEN)
    code, out, _ = run("check", "manuscript.md", "--format", format)
    assert code == 1
    return out


def _json(monkeypatch) -> dict:
    return json.loads(_report("json", monkeypatch))


# -- CSV -------------------------------------------------------------------------------------

def _csv_rows(text: str) -> list[dict]:
    caution, _, table = text.partition("\n")
    assert caution == f"# {scrutiny.CAUTION}"
    return list(csv.DictReader(io.StringIO(table)))


def test_csv_golden(monkeypatch):
    _golden("manuscript.csv", _report("csv", monkeypatch))


def test_csv_has_a_row_per_result_matching_the_json(monkeypatch):
    rows = _csv_rows(_report("csv", monkeypatch))
    claims = _json(monkeypatch)["documents"][0]["claims"]
    assert [row["id"] for row in rows] == [claim["id"] for claim in claims]
    for row, claim in zip(rows, claims):
        assert row["test"] == claim["test"] and row["status"] == claim["status"]
        assert row["statistic"] == claim["statistic"]  # as printed: "−.32" keeps its minus sign
        assert row["checks"].split(";") == ([f["check"] for f in claim["flags"]] or [""])
        if claim["p"]["recomputed"] is not None:
            assert float(row["p_recomputed"]) == claim["p"]["recomputed"]
        else:
            assert row["p_recomputed"] == ""
    mismatch = next(row for row in rows if row["id"] == "c2")
    assert (mismatch["df1"], mismatch["df2"], mismatch["worst_severity"]) == ("2", "87", "error")
    flip = next(row for row in rows if row["id"] == "c4")
    assert flip["checks"] == "decision-flip;undeclared-one-sided"
    assert flip["worst_severity"] == "error"


def test_csv_reads_into_pandas(monkeypatch):
    pandas = pytest.importorskip("pandas")  # installed with pingouin and statsmodels
    frame = pandas.read_csv(io.StringIO(_report("csv", monkeypatch)), skiprows=1,
                            dtype={"statistic": str, "p_reported": str})
    assert len(frame) == 13
    assert frame.loc[frame["id"] == "c1", "p_reported"].item() == ".021"
    assert frame.loc[frame["id"] == "c1", "df1"].item() == 28
    assert set(frame["status"]) == {"consistent", "inconsistent", "unchecked"}


def test_csv_keeps_commas_quotes_and_line_breaks_inside_cells(tmp_path):
    path = tmp_path / "quoted.txt"
    path.write_text('The "warm" voles, as expected,\ndug deeper, t(28) = 2.20,\np = .01.\n',
                    encoding="utf-8")
    rows = _csv_rows(run("check", str(path), "--format", "csv")[1])
    assert len(rows) == 1
    assert rows[0]["text"] == "t(28) = 2.20, p = .01"
    assert rows[0]["sentence"] == 'The "warm" voles, as expected, dug deeper, t(28) = 2.20, p = .01.'


def test_summary_csv_lists_every_stored_result(tmp_path):
    folder = tmp_path / "issue"
    folder.mkdir()
    (folder / "a.txt").write_text(MISMATCH, encoding="utf-8")
    (folder / "b.md").write_text((GOLDEN / "manuscript.md").read_text(encoding="utf-8"),
                                 encoding="utf-8")
    store = str(tmp_path / "screening.sqlite")
    code, out, _ = run("screen", str(folder), "--store", store, "--workers", "1",
                       "--format", "csv")
    assert code == 0
    rows = _csv_rows(out)
    assert len(rows) == 1 + 13
    assert {os.path.basename(row["document"]) for row in rows} == {"a.txt", "b.md"}
    code, again, _ = run("summary", store, "--format", "csv")
    assert code == 0 and again == out


# -- SARIF -----------------------------------------------------------------------------------
# The rules below are those of the SARIF 2.1.0 OASIS Standard (recalled from memory, section
# numbers of the 2020 errata version): sarifLog.version is "2.1.0" (3.13.2); a result's level is
# one of none, note, warning, error (3.27.10); ruleIndex is the index of the rule whose id is
# the ruleId (3.27.6); message objects carry text (3.11.8); region line numbers are 1-based and
# character offsets and lengths non-negative (3.30.5-3.30.11); artifactLocation.index refers to
# run.artifacts (3.4.5).

def _sarif(monkeypatch) -> dict:
    return json.loads(_report("sarif", monkeypatch))


def test_sarif_golden(monkeypatch):
    text = _report("sarif", monkeypatch).replace(f'"version": "{VERSION}"',
                                                 '"version": "<version>"')
    _golden("manuscript.sarif", text)


def test_sarif_follows_the_standard(monkeypatch):
    log = _sarif(monkeypatch)
    assert log["version"] == "2.1.0" and log["$schema"].endswith("sarif-2.1.0.json")
    [sarif_run] = log["runs"]
    driver = sarif_run["tool"]["driver"]
    assert driver["name"] == "scrutiny" and driver["version"] == VERSION
    rules = driver["rules"]
    assert [rule["id"] for rule in rules] == list(REGISTRY)
    for rule in rules:
        assert rule["shortDescription"]["text"] and rule["fullDescription"]["text"]
        assert rule["defaultConfiguration"]["level"] in {"note", "warning", "error"}
        assert scrutiny.CAUTION in rule["help"]["text"]
    artifacts = sarif_run["artifacts"]
    for result in sarif_run["results"]:
        assert result["level"] in {"none", "note", "warning", "error"}
        assert rules[result["ruleIndex"]]["id"] == result["ruleId"]
        assert result["level"] == REGISTRY[result["ruleId"]].severity.label
        assert result["message"]["text"]
        [location] = result["locations"]
        artifact = location["physicalLocation"]["artifactLocation"]
        assert artifacts[artifact["index"]]["location"]["uri"] == artifact["uri"]
        region = location["physicalLocation"]["region"]
        assert region["startLine"] >= 1 and region["charOffset"] >= 0
        assert region["charLength"] > 0
    assert sarif_run["properties"]["caution"] == scrutiny.CAUTION


def test_sarif_regions_point_at_the_printed_result(monkeypatch):
    # offsets and lines into the file as decoded: an editor jumping there finds the result
    log = _sarif(monkeypatch)
    source = (GOLDEN / "manuscript.md").read_text(encoding="utf-8")
    lines = source.split("\n")
    results = log["runs"][0]["results"]
    assert len(results) == sum(len(c["flags"]) for c in _json(monkeypatch)["documents"][0]
                               ["claims"])
    for result in results:
        region = result["locations"][0]["physicalLocation"]["region"]
        start, length = region["charOffset"], region["charLength"]
        assert source[start:start + length] == region["snippet"]["text"]
        assert region["snippet"]["text"].split("\n")[0] in lines[region["startLine"] - 1]


def test_sarif_fingerprints_survive_a_shifted_line(tmp_path):
    first, second = tmp_path / "a" / "paper.txt", tmp_path / "b" / "paper.txt"
    first.parent.mkdir()
    second.parent.mkdir()
    first.write_text(MISMATCH, encoding="utf-8")
    second.write_text("A new first line.\n\n" + MISMATCH, encoding="utf-8")

    def fingerprint(path):
        result = json.loads(run("check", str(path), "--format", "sarif")[1])["runs"][0]["results"][0]
        return result["partialFingerprints"], result["locations"][0]["physicalLocation"]["region"]

    (print_a, region_a), (print_b, region_b) = fingerprint(first), fingerprint(second)
    assert print_a == print_b and region_a["startLine"] == 1 and region_b["startLine"] == 3


def test_sarif_reports_unreadable_files_as_notifications(tmp_path):
    good, bad = tmp_path / "good.txt", tmp_path / "bad.pdf"
    good.write_text(MISMATCH, encoding="utf-8")
    bad.write_bytes(b"%PDF-1.7\nnot really a PDF")
    code, out, _ = run("check", str(good), str(bad), "--format", "sarif")
    assert code == 2
    sarif_run = json.loads(out)["runs"][0]
    [note] = sarif_run["invocations"][0]["toolExecutionNotifications"]
    assert note["level"] == "error" and "could not be read" in note["message"]["text"]
    index = note["locations"][0]["physicalLocation"]["artifactLocation"]["index"]
    assert sarif_run["artifacts"][index]["location"]["uri"].endswith("bad.pdf")
    assert len(sarif_run["results"]) == 1


def test_sarif_uri_of_paths():
    from scrutiny.report.sarif import uri

    assert uri("issue 4/paper one.txt") == "issue%204/paper%20one.txt"
    assert uri("/data/issue/paper.pdf") == "file:///data/issue/paper.pdf"


# -- HTML ------------------------------------------------------------------------------------

_VOID = {"meta", "br", "hr", "img", "input", "link"}


class _Structure(HTMLParser):
    """Checks that every element is closed in order, and collects the page's text."""

    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.open: list[str] = []
        self.problems: list[str] = []
        self.text: list[str] = []
        self.tags: list[str] = []

    def handle_starttag(self, tag, attrs):
        self.tags.append(tag)
        if tag not in _VOID:
            self.open.append(tag)

    def handle_endtag(self, tag):
        if not self.open or self.open[-1] != tag:
            self.problems.append(f"</{tag}> closes {self.open[-1:] or 'nothing'}")
        else:
            self.open.pop()

    def handle_data(self, data):
        self.text.append(data)


def _parsed(page: str) -> _Structure:
    parser = _Structure()
    parser.feed(page)
    parser.close()
    assert not parser.problems and not parser.open, (parser.problems, parser.open)
    return parser


def test_html_golden(monkeypatch):
    page = _report("html", monkeypatch).replace(f"scrutiny {VERSION};", "scrutiny <version>;")
    _golden("manuscript.html", page)


def test_html_is_well_formed_and_says_everything(monkeypatch):
    page = _report("html", monkeypatch)
    assert page.startswith("<!DOCTYPE html>")
    parsed = _parsed(page)
    text = " ".join(" ".join(parsed.text).split())
    assert scrutiny.CAUTION in text
    assert "script" not in parsed.tags
    report = _json(monkeypatch)
    for claim in report["documents"][0]["claims"]:
        assert " ".join(claim["text"].split()) in text
        for flag in claim["flags"]:
            assert " ".join(flag["message"].split()) in text
    # the explanation of each check that raised a flag, once
    raised = {f["check"] for c in report["documents"][0]["claims"] for f in c["flags"]}
    for check_id in raised:
        assert text.count(f"{check_id} ({REGISTRY[check_id].severity.label}): "
                          f"{REGISTRY[check_id].title}") == 1


def test_html_escapes_the_manuscript(tmp_path):
    path = tmp_path / "hostile.txt"
    path.write_text("<script>alert(1)</script> <b>Voles</b> & co dug deeper, t(28) = 2.20, "
                    "p = .01.\n", encoding="utf-8")
    page = run("check", str(path), "--format", "html")[1]
    parsed = _parsed(page)
    assert "script" not in parsed.tags and "b" not in parsed.tags
    assert "&lt;script&gt;alert(1)&lt;/script&gt;" in page
    assert "<mark>t(28) = 2.20, p = .01</mark>" in page


def test_html_names_unreadable_and_skipped_files(tmp_path):
    (tmp_path / "bad.docx").write_bytes(b"PK\x03\x04 broken")
    (tmp_path / "notes.csv").write_text("a,b\n", encoding="utf-8")
    (tmp_path / "good.txt").write_text(MISMATCH, encoding="utf-8")
    code, page, _ = run("check", str(tmp_path), "--format", "html")
    assert code == 2
    text = " ".join(" ".join(_parsed(page).text).split())
    assert "Could not be read:" in text and "bad.docx" in text
    assert "notes.csv: not a manuscript format" in text


# -- --output --------------------------------------------------------------------------------

def test_output_writes_the_report_to_a_file(tmp_path):
    manuscript = tmp_path / "paper.txt"
    manuscript.write_text(MISMATCH, encoding="utf-8")
    report = tmp_path / "reports" / "paper.html"
    report.parent.mkdir()
    code, out, _ = run("check", str(manuscript), "--format", "html", "--output", str(report))
    assert code == 1 and out == ""
    assert "<mark>t(28) = 2.20, p = .01</mark>" in report.read_text(encoding="utf-8")
    assert manuscript.read_text(encoding="utf-8") == MISMATCH
    assert [p.name for p in report.parent.iterdir()] == ["paper.html"]  # no temporary left


@pytest.mark.parametrize("where", ["the input", "inside the input folder"])
def test_output_never_overwrites_or_joins_the_inputs(tmp_path, where):
    folder = tmp_path / "issue"
    folder.mkdir()
    manuscript = folder / "paper.txt"
    manuscript.write_text(MISMATCH, encoding="utf-8")
    target = manuscript if where == "the input" else folder / "report.html"
    given = str(manuscript) if where == "the input" else str(folder)
    code, out, err = run("check", given, "--format", "html", "--output", str(target))
    assert code == 2 and out == ""
    assert err.startswith("scrutiny: error: --output") and err.count("\n") == 1
    assert manuscript.read_text(encoding="utf-8") == MISMATCH
    assert sorted(p.name for p in folder.iterdir()) == ["paper.txt"]


def test_output_into_a_missing_folder_is_one_line(tmp_path):
    manuscript = tmp_path / "paper.txt"
    manuscript.write_text(MISMATCH, encoding="utf-8")
    code, _, err = run("check", str(manuscript), "--output", str(tmp_path / "no" / "r.txt"))
    assert code == 2 and err.startswith("scrutiny: error: --output") and err.count("\n") == 1
    assert "Traceback" not in err


def test_every_new_format_carries_the_caution(tmp_path):
    manuscript = tmp_path / "paper.txt"
    manuscript.write_text(MISMATCH, encoding="utf-8")
    for format in ("csv", "sarif", "html"):
        out = run("check", str(manuscript), "--format", format)[1]
        assert scrutiny.CAUTION in out, format


def test_output_follows_a_link_and_keeps_the_file_s_mode(tmp_path):
    manuscript = tmp_path / "paper.txt"
    manuscript.write_text(MISMATCH, encoding="utf-8")
    real = tmp_path / "reports" / "real.csv"
    real.parent.mkdir()
    real.write_text("an old report\n", encoding="utf-8")
    os.chmod(real, 0o640)
    link = tmp_path / "latest.csv"
    link.symlink_to(real)
    assert run("check", str(manuscript), "--format", "csv", "--output", str(link))[0] == 1
    assert link.is_symlink() and os.readlink(link) == str(real)
    assert real.read_text(encoding="utf-8").startswith("# " + scrutiny.CAUTION)
    assert stat.S_IMODE(os.stat(real).st_mode) == 0o640


def test_output_into_a_pipe_writes_into_it_and_never_replaces_it(tmp_path):
    # a device or a named pipe (/dev/null, /dev/stdout, a FIFO) must be written to, not
    # replaced by a regular file
    manuscript = tmp_path / "paper.txt"
    manuscript.write_text(MISMATCH, encoding="utf-8")
    pipe = tmp_path / "pipe"
    os.mkfifo(pipe)
    received: list[bytes] = []
    reader = threading.Thread(target=lambda: received.append(pipe.read_bytes()))
    reader.start()
    code, out, err = run("check", str(manuscript), "--format", "csv", "--output", str(pipe))
    reader.join(30)
    assert (code, out) == (1, "")
    assert stat.S_ISFIFO(os.stat(pipe).st_mode)
    assert received and received[0].decode("utf-8").startswith("# " + scrutiny.CAUTION)


# -- the JSON Schema of the report -----------------------------------------------------------

def test_every_json_report_follows_the_published_schema(tmp_path):
    # the schema (src/scrutiny/report/schema/report-1.json) is checked with jsonschema, a
    # general-purpose validator: a key added, dropped or retyped without the schema fails
    jsonschema = pytest.importorskip("jsonschema")
    from scrutiny.report.json import SCHEMA_PATH

    schema = json.loads(SCHEMA_PATH.read_text(encoding="utf-8"))
    jsonschema.Draft202012Validator.check_schema(schema)
    validator = jsonschema.Draft202012Validator(schema)
    (tmp_path / "broken.pdf").write_bytes(b"%PDF-1.7 not really")
    (tmp_path / "notes.csv").write_text("a,b\n", encoding="utf-8")
    (tmp_path / "paper.tex").write_text(
        "\\documentclass{article}\\begin{document}Voles dug deeper, $t(28) = 2.20$, "
        "$p = .01$.\\end{document}\n", encoding="utf-8")
    repository = GOLDEN.parent.parent.parent
    inputs = [str(GOLDEN / "manuscript.md"), str(repository / "samples"),
              str(GOLDEN.parent / "markup"), str(tmp_path)]
    for given in inputs:
        report = json.loads(run("check", given, "--format", "json")[1])
        problems = [f"{error.json_path}: {error.message}"
                    for error in validator.iter_errors(report)]
        assert not problems, (given, problems[:5])
        assert report["summary"]["claims"] > 0
    # a key the schema does not know is refused
    report["summary"]["surprise"] = 1
    assert not validator.is_valid(report)


def test_every_format_renders_every_case_of_the_extraction_tables():
    # the 350 and more printed results of every kind the extraction tables hold, in one run: no
    # format may fail on any of them, and each says how many results it shows
    from scrutiny.model import Run
    from scrutiny.report import FORMATS, render

    try:
        import tomllib
    except ModuleNotFoundError:  # Python 3.10
        import tomli as tomllib
    cases = [case for name in ("extraction_cases.toml", "estimate_cases.toml")
             for case in tomllib.loads((GOLDEN.parent / name).read_text(encoding="utf-8"))["case"]]
    documents = tuple(scrutiny.check_text(case["text"], path=f"case-{index}.txt")
                      for index, case in enumerate(cases))
    run_of_all = Run(settings=scrutiny.Settings(), documents=documents, skipped=())
    claims = sum(len(document.claims) for document in documents)
    assert claims > 350
    for format in FORMATS:
        out = io.StringIO()
        render(run_of_all, format, out, width=120)
        assert scrutiny.CAUTION in " ".join(out.getvalue().split()), format
    out = io.StringIO()
    render(run_of_all, "csv", out)
    assert len(_csv_rows(out.getvalue())) == claims


def test_html_of_several_documents_links_each_from_a_list(tmp_path):
    (tmp_path / "a.txt").write_text(MISMATCH, encoding="utf-8")
    (tmp_path / "b.txt").write_text("Nothing to report here.\n", encoding="utf-8")
    page = run("check", str(tmp_path), "--format", "html")[1]
    parsed = _parsed(page)
    assert "nav" in parsed.tags
    for index in (1, 2):
        assert f'<a href="#document-{index}">' in page and f'id="document-{index}"' in page
