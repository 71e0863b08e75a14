"""The command line and the report formats: exit codes, bad input, stdin, golden files.

Golden files live in tests/data/golden/. After an intended change of a report format,
regenerate them with `SCRUTINY_UPDATE_GOLDEN=1 python -m pytest tests/test_cli.py` and review
the diff before committing.
"""

from __future__ import annotations

import io
import json
import os
import re
import subprocess
import sys

import pytest

import scrutiny
from scrutiny.check import REGISTRY
from scrutiny.cli import main

from conftest import DATA

GOLDEN = DATA / "golden"
CONSISTENT = "The voles dug deeper, t(28) = 2.45, p = .021.\n"
MISMATCH = "The voles dug deeper, t(28) = 2.20, p = .01.\n"       # p-mismatch (error)
ONE_SIDED = "The voles dug deeper, t(40) = 2.50, p = .008.\n"     # undeclared-one-sided (warning)


def run(*argv: str, stdin: bytes | None = None) -> tuple[int, str, str]:
    stdout, stderr = io.StringIO(), io.StringIO()
    if stdin is not None:
        original = sys.stdin
        sys.stdin = io.TextIOWrapper(io.BytesIO(stdin))
        try:
            code = main(list(argv), stdout=stdout, stderr=stderr)
        finally:
            sys.stdin = original
    else:
        code = main(list(argv), stdout=stdout, stderr=stderr)
    return code, stdout.getvalue(), stderr.getvalue()


@pytest.fixture
def manuscripts(tmp_path):
    def write(name: str, content: str | bytes):
        path = tmp_path / name
        path.parent.mkdir(parents=True, exist_ok=True)
        if isinstance(content, bytes):
            path.write_bytes(content)
        else:
            path.write_text(content, encoding="utf-8")
        return str(path)
    return write


# -- exit codes ------------------------------------------------------------------------------

def test_exit_0_when_everything_is_consistent(manuscripts):
    assert run("check", manuscripts("a.txt", CONSISTENT))[0] == 0


def test_exit_1_when_an_error_is_flagged(manuscripts):
    code, out, _ = run("check", manuscripts("a.txt", MISMATCH))
    assert code == 1
    assert "p-mismatch" in out


def test_fail_on_sets_the_threshold(manuscripts):
    path = manuscripts("a.txt", ONE_SIDED)
    assert run("check", path)[0] == 0                        # a warning is below "error"
    assert run("check", path, "--fail-on", "warning")[0] == 1
    assert run("check", path, "--fail-on", "note")[0] == 1
    assert run("check", manuscripts("b.txt", MISMATCH), "--fail-on", "never")[0] == 0


def test_unreadable_input_gives_2_and_the_others_are_still_checked(manuscripts):
    good = manuscripts("good.txt", MISMATCH)
    binary = manuscripts("bad.txt", b"\x00\x01\x02\xff" * 100)
    code, out, err = run("check", binary, "--format", "json", good)
    assert code == 2
    report = json.loads(out)
    assert [d["path"] for d in report["documents"]] == [binary, good]
    assert report["documents"][0]["errors"] == ["binary file (contains NUL bytes), not a text manuscript"]
    assert report["documents"][1]["claims"][0]["flags"][0]["check"] == "p-mismatch"
    assert err == f"scrutiny: {binary}: binary file (contains NUL bytes), not a text manuscript\n"
    assert report["summary"]["unreadable"] == 1


@pytest.mark.parametrize("argv, fragment", [
    ([], "a command is needed"),
    (["check"], "the following arguments are required: PATH"),
    (["check", "x.txt", "--alpha", "1.5"], "must lie strictly between 0 and 1"),
    (["check", "x.txt", "--alpha", "five"], "not a number"),
    (["check", "x.txt", "--format", "xml"], "invalid choice"),
    (["check", "x.txt", "--fail-on", "fatal"], "invalid choice"),
    (["check", "x.txt", "--sesoi", "q=0.2"], "MEASURE one of d, r, eta2, w"),
    (["check", "x.txt", "--sesoi", "d=-1"], "must be positive"),
    (["inspect"], "invalid choice"),
])
def test_bad_usage_is_one_line_and_exit_2(argv, fragment):
    code, out, err = run(*argv)
    assert code == 2 and out == ""
    assert err.count("\n") == 1 and err.startswith("scrutiny: error: ")
    assert fragment in err


def test_missing_file_is_named(tmp_path):
    missing = str(tmp_path / "nowhere.txt")
    code, out, err = run("check", missing)
    assert code == 2
    assert err == f"scrutiny: {missing}: no such file\n"
    assert "could not be read: no such file" in out


# -- inputs ----------------------------------------------------------------------------------

def test_standard_input():
    code, out, _ = run("check", "-", "--format", "json", stdin=MISMATCH.encode("utf-16"))
    report = json.loads(out)
    assert code == 1
    document = report["documents"][0]
    assert (document["path"], document["encoding"]) == ("<stdin>", "utf-16")


def test_folders_are_searched_and_other_files_counted(manuscripts, tmp_path):
    manuscripts("paper/results.md", CONSISTENT)
    manuscripts("paper/nested/appendix.txt", MISMATCH)
    manuscripts("paper/figure.png", b"\x89PNG\r\n\x1a\n")
    manuscripts("paper/.hidden.txt", MISMATCH)
    manuscripts("paper/.git/config", "[core]")
    code, out, _ = run("check", str(tmp_path / "paper"), "--format", "json")
    report = json.loads(out)
    assert [os.path.basename(d["path"]) for d in report["documents"]] == ["results.md",
                                                                           "appendix.txt"]
    assert [(os.path.basename(s["path"]), s["reason"]) for s in report["skipped"]] == [
        (".git", "hidden"), (".hidden.txt", "hidden"), ("figure.png", "not a manuscript format")]
    assert code == 1
    text = run("check", str(tmp_path / "paper"))[1]
    assert "3 other files skipped (2 hidden, 1 not a manuscript format)" in text


def test_latex_parts_are_checked_with_their_main_file(manuscripts, tmp_path):
    manuscripts("paper/main.tex", "\\documentclass{article}\n\\begin{document}\n"
                                  "\\input{results}\n\\end{document}\n")
    manuscripts("paper/results.tex", "The voles dug deeper, $t(28) = 2.20$, $p = .01$.\n")
    report = json.loads(run("check", str(tmp_path / "paper"), "--format", "json")[1])
    assert [os.path.basename(d["path"]) for d in report["documents"]] == ["main.tex"]
    assert [c["statistic"] for c in report["documents"][0]["claims"]] == ["2.20"]
    [skipped] = report["skipped"]
    assert (os.path.basename(skipped["path"]), skipped["reason"].startswith("part of ")) == (
        "results.tex", True)


def test_a_file_named_twice_is_checked_once(manuscripts):
    path = manuscripts("a.txt", CONSISTENT)
    report = json.loads(run("check", path, path, "--format", "json")[1])
    assert len(report["documents"]) == 1


def test_alpha_and_sesoi_reach_the_checks(manuscripts):
    path = manuscripts("a.txt", "The voles dug deeper, t(9998) = 2.50, p = .012.\n")
    assert "negligible-effect" in run("check", path)[1]
    assert "negligible-effect" not in run("check", path, "--sesoi", "d=0.01")[1]
    report = json.loads(run("check", path, "--alpha", "0.01", "--format", "json")[1])
    assert report["settings"]["alpha"] == 0.01
    assert report["documents"][0]["claims"][0]["flags"] == []  # p = .012 is not below .01


def test_checks_command_lists_every_check():
    code, out, _ = run("checks")
    assert code == 0
    for check_id in REGISTRY:
        assert f"\n{check_id} (" in "\n" + out


def test_version():
    with pytest.raises(SystemExit) as raised:
        run("--version")
    assert raised.value.code == 0


def test_console_script_runs_as_a_separate_process(manuscripts):
    path = manuscripts("a.txt", MISMATCH)
    completed = subprocess.run([sys.executable, "-m", "scrutiny", "check", path],
                               capture_output=True, text=True, timeout=120)
    assert completed.returncode == 1
    assert "p-mismatch" in completed.stdout
    assert "Traceback" not in completed.stderr


# -- report formats --------------------------------------------------------------------------

def _seven_digits(value):
    """Floats to seven significant digits, in any JSON structure: the last digits of a p-value
    (and more of those found by a root search) differ between builds of scipy and numpy, and a
    golden file pins the format, not them."""
    if isinstance(value, float):
        return float(f"{value:.7g}")
    if isinstance(value, dict):
        return {key: _seven_digits(item) for key, item in value.items()}
    if isinstance(value, list):
        return [_seven_digits(item) for item in value]
    return value


def _seven_digit_cells(text: str) -> str:
    """The same for the numbers of a CSV or any other text: every number with more than seven
    decimals is rounded to seven significant digits."""
    return re.sub(r"-?\d+\.\d{8,}(?:e-?\d+)?",
                  lambda number: f"{float(number.group()):.7g}", text)


def _golden(name: str, actual: str) -> None:
    path = GOLDEN / name
    if os.environ.get("SCRUTINY_UPDATE_GOLDEN"):
        path.write_text(actual, encoding="utf-8")
    expected = path.read_text(encoding="utf-8")
    if name.endswith((".json", ".sarif")):
        assert _seven_digits(json.loads(actual)) == _seven_digits(json.loads(expected))
        assert actual.count("\n") == expected.count("\n")  # the layout, key for key
    else:
        assert _seven_digit_cells(actual) == _seven_digit_cells(expected)


def test_text_report_golden(monkeypatch):
    monkeypatch.chdir(GOLDEN)
    code, out, _ = run("check", "manuscript.md")
    assert code == 1
    _golden("manuscript.txt", out)


def test_json_report_golden(monkeypatch):
    monkeypatch.chdir(GOLDEN)
    code, out, _ = run("check", "manuscript.md", "--format", "json")
    report = json.loads(out)
    assert report["scrutiny"] == scrutiny.__version__
    report["scrutiny"] = "<version>"
    _golden("manuscript.json", json.dumps(report, ensure_ascii=False, indent=2) + "\n")


def test_json_follows_the_contract(monkeypatch):
    monkeypatch.chdir(GOLDEN)
    report = json.loads(run("check", "manuscript.md", "--format", "json")[1])
    assert set(report) >= {"scrutiny", "schema", "settings", "documents", "summary", "caution"}
    claim = report["documents"][0]["claims"][0]
    assert set(claim) >= {"id", "text", "location", "test", "df", "statistic", "n", "p",
                          "status", "effect", "evidence", "flags"}
    assert set(claim["location"]) == {"page", "line", "start", "end", "file", "section",
                                      "paragraph", "cell", "boxes"}
    assert set(claim["p"]) >= {"comparator", "reported", "tails_stated", "recomputed", "low",
                               "high"}
    assert claim["text"] == "t(28) = 2.45, p = .021"
    assert (claim["test"], claim["df"], claim["statistic"]) == ("t", [28], "2.45")
    source = (GOLDEN / "manuscript.md").read_text(encoding="utf-8")
    for item in report["documents"][0]["claims"]:
        start, end = item["location"]["start"], item["location"]["end"]
        assert source[start:end] == item["text"]


def test_every_format_carries_the_caution(manuscripts):
    path = manuscripts("a.txt", MISMATCH)
    assert scrutiny.CAUTION in " ".join(run("check", path)[1].split())
    assert json.loads(run("check", path, "--format", "json")[1])["caution"] == scrutiny.CAUTION


def test_integer_scales_turns_granularity_tests_on(manuscripts):
    # M = 3.48 is impossible for 20 integer responses (3.48 x 20 = 69.6; Brown & Heathers 2017)
    path = manuscripts("a.txt", "Burrow temperature was high (M = 3.48, SD = 1.21, n = 20).\n")
    plain = json.loads(run("check", path, "--format", "json")[1])["documents"][0]["claims"][0]
    assert (plain["test"], plain["status"], plain["flags"]) == ("mean", "unchecked", [])
    declared = json.loads(run("check", path, "--integer-scales", "--format", "json")[1])
    claim = declared["documents"][0]["claims"][0]
    assert [f["check"] for f in claim["flags"]] == ["grim"]
    assert "--integer-scales declares it" in claim["flags"][0]["message"]
