"""The documentation stays true to the code: every check is listed, the quick start is the CI's
command, and the wheel carries the pattern library."""

from __future__ import annotations

import re
import zipfile

from scrutiny.check import REGISTRY

from conftest import REPOSITORY

README = (REPOSITORY / "README.md").read_text(encoding="utf-8")


def test_every_check_is_in_the_readme_table():
    for check_id, registered in REGISTRY.items():
        row = re.search(rf"^\| `{re.escape(check_id)}` \| (\w+) \|", README, re.MULTILINE)
        assert row, f"{check_id} is missing from the README's table of checks"
        assert row.group(1) == registered.severity.label


def test_quick_start_is_two_commands_and_ci_runs_the_second():
    quick_start = README.split("## Quick start", 1)[1].split("```sh", 1)[1].split("```", 1)[0]
    commands = [line for line in quick_start.strip().splitlines() if line.strip()]
    assert commands == ["pip install . && scrutiny check samples/",
                        "pip install '.[test]' && python -m pytest"]
    ci = (REPOSITORY / ".ci" / "run").read_text(encoding="utf-8")
    assert "\npip install '.[test]' && python -m pytest\n" in ci


def test_first_paragraph_states_the_job():
    first = README.split("\n\n", 2)[1]
    for word in ("manuscript", "recomputes", "flags"):
        assert word in first


def test_the_wheel_carries_the_patterns(tmp_path):
    from hatchling.builders.wheel import WheelBuilder  # a test dependency

    wheel = next(iter(WheelBuilder(str(REPOSITORY)).build(
        directory=str(tmp_path), versions=["standard"])))
    names = zipfile.ZipFile(wheel).namelist()
    shipped = sorted(n.rsplit("/", 1)[1] for n in names if n.startswith("scrutiny/patterns/"))
    assert shipped == sorted(p.name for p in (REPOSITORY / "patterns").glob("*.toml"))


def test_the_readme_example_agrees_with_the_golden_report():
    # the "What you get" excerpt ends with the golden report's own summary line
    golden = (REPOSITORY / "tests" / "data" / "golden" / "manuscript.txt").read_text(
        encoding="utf-8")
    summary = next(line for line in golden.splitlines() if line.startswith("1 document:"))
    example = README.split("## What you get", 1)[1].split("```", 2)[1]
    assert summary.strip() in example
