"""Screening: the corpus tests (p-curve, caliper) against the reference values, and the batch
runner (parallel, resumable, SQLite store, Dask) on the bundled samples."""

from __future__ import annotations

import csv
import io
import json
import shutil
import sqlite3

import pytest

from scrutiny import Settings
from scrutiny.cli import main
from scrutiny.screen import screen, summarise
from scrutiny.screen.corpus import (
    caliper_tests,
    harmonise,
    p_curve,
    power_33_noncentrality,
    pp_values,
)
from scrutiny.screen.store import StoreError

from conftest import DATA, REPOSITORY

PC = list(csv.DictReader((DATA / "reference" / "p_curve.csv").open(encoding="utf-8")))


def _harmonised(row):
    df = tuple(float(row[k]) for k in ("df1", "df2") if row[k])
    return harmonise(row["test"], float(row["statistic"]), df)


def _rounds_to(value: float, printed: str) -> bool:
    decimals = len(printed.split(".")[1])
    return abs(value - float(printed)) <= 0.5 * 10 ** -decimals + 1e-12


# -- p-curve and caliper ---------------------------------------------------------------------

@pytest.mark.parametrize("row", PC, ids=[r["id"] for r in PC])
def test_pp_values_of_the_worked_example(row):
    # reference compilation section 9.2 (p-curve app 4.06 definitions PC-D-02..07)
    result = _harmonised(row)
    pp = pp_values(result)
    assert _rounds_to(result.p, row["p"])
    assert _rounds_to(power_33_noncentrality(result.family, result.df), row["lambda33"])
    assert _rounds_to(pp.right, row["pp_right"])
    assert _rounds_to(pp.power33, row["pp33"])
    if row["pp_right_half"]:
        assert _rounds_to(pp.right_half, row["pp_right_half"])
        assert _rounds_to(pp.power33_half, row["pp33_half"])
    else:
        assert pp.right_half is None and pp.power33_half is None


def test_stouffer_and_binomial_tests_of_the_worked_example():
    # reference compilation section 9.2: right-skew full Z = -1.5041, p = .0663; 33% full
    # Z = -0.1489, p = .4408; right-skew half Z = -0.5343, p = .2966; 33% half Z = 2.0482,
    # p = .9797; binomial right-skew (6 of 7 below .025) p = .0625
    curve = p_curve([_harmonised(row) for row in PC])
    assert (curve.significant, curve.below_025) == (7, 6)
    assert _rounds_to(curve.right_skew_full[0], "-1.5041")
    assert _rounds_to(curve.right_skew_full[1], ".0663")
    assert _rounds_to(curve.flatness_full[0], "-0.1489")
    assert _rounds_to(curve.flatness_full[1], ".4408")
    assert _rounds_to(curve.right_skew_half[0], "-0.5343")
    assert _rounds_to(curve.right_skew_half[1], ".2966")
    assert _rounds_to(curve.flatness_half[0], "2.0482")
    assert _rounds_to(curve.flatness_half[1], ".9797")
    assert _rounds_to(curve.binomial_right_skew, ".0625")
    # decision rule of the 2015 version (PC-D-12, recalled from memory): neither criterion met
    assert curve.verdict == "inconclusive"


def test_a_curve_of_very_small_p_values_has_evidential_value():
    results = [harmonise("t", 5.0 + i / 10, (40.0,)) for i in range(10)]
    assert p_curve(results).verdict == "evidential value"


def test_a_curve_of_p_values_just_below_05_is_flat():
    # t(40) = 2.05 to 2.15: every p between .038 and .047 (a left-skewed curve)
    results = [harmonise("t", 2.05 + i / 100, (40.0,)) for i in range(10)]
    assert p_curve(results).verdict.startswith("evidential value inadequate")


def test_no_significant_results_no_curve():
    assert p_curve([harmonise("t", 1.0, (40.0,))]).significant == 0


@pytest.mark.parametrize("over, under, expected", [
    (30, 15, ".01785"),   # CAL-04 (computed with a binomial test in the reference compilation)
    (20, 20, ".5627"),    # CAL-05
    (49, 15, "1.218e-5"), # CAL-06
])
def test_caliper_binomial(over, under, expected):
    # p-values just over the threshold: z in [1.96, 2.156]; just under: z in [1.764, 1.96)
    ps = [0.04] * over + [0.06] * under
    [caliper] = caliper_tests(ps, (0.10,))
    assert (caliper.over, caliper.under) == (over, under)
    assert caliper.p == pytest.approx(float(expected), rel=1e-3)


def test_caliper_bounds_follow_the_definition():
    # CAL-02: the 10% caliper spans z in [1.764, 2.156]: p of z = 2.17 is outside, 2.15 inside
    from scipy.stats import norm

    p = lambda z: 2 * norm.sf(z)  # noqa: E731 - the p of a z, to place values at the edges
    [caliper] = caliper_tests([p(2.15), p(2.17), p(1.77), p(1.75)], (0.10,))
    assert (caliper.over, caliper.under) == (1, 1)


# -- the runner ------------------------------------------------------------------------------

#: the bundled sample manuscripts; the corpus below is them and one unreadable file (FILES in all)
MANUSCRIPTS = sorted(sample for sample in (REPOSITORY / "samples").iterdir()
                     if sample.suffix in (".md", ".txt", ".docx") and sample.name != "README.md")
FILES = len(MANUSCRIPTS) + 1


@pytest.fixture
def corpus(tmp_path):
    folder = tmp_path / "issue"
    folder.mkdir()
    for sample in MANUSCRIPTS:
        shutil.copy(sample, folder / sample.name)
    (folder / "broken.txt").write_bytes(b"\x00\x01\x02" * 50)
    return folder


def test_screen_stores_every_document_and_summarises(corpus, tmp_path):
    store = str(tmp_path / "screening.sqlite")
    screening = screen([str(corpus)], store, workers=2)
    assert (screening.checked, screening.already_stored, screening.unreadable) == (FILES, 0, 1)
    summary = summarise(store)
    assert summary.documents == FILES and summary.unreadable == 1
    # the samples' planted flags (samples/expected-flags.toml) arrive in the summary
    assert summary.flags["decision-flip"] >= 4
    assert summary.p_curve.significant > 20
    rows = sqlite3.connect(store).execute("SELECT path, readable FROM documents").fetchall()
    assert len(rows) == FILES and sum(readable for _, readable in rows) == FILES - 1
    # every document with a flag, and the unreadable one, listed for a look: decision flips
    # first (samples/expected-flags.toml plants two in each of two samples), the unreadable
    # file, with no flags, last
    tallies = summary.documents_to_look_at
    assert len(tallies) == FILES
    assert [t.decision_flips for t in tallies[:2]] == [2, 2]
    assert tallies[-1].unreadable and tallies[-1].path.endswith("broken.txt")
    flips = sum(t.decision_flips for t in tallies)
    assert flips == summary.flags["decision-flip"]


def test_screen_resumes_and_rechecks_changed_files(corpus, tmp_path):
    store = str(tmp_path / "screening.sqlite")
    screen([str(corpus)], store, workers=1)
    again = screen([str(corpus)], store, workers=1)
    assert (again.checked, again.already_stored) == (0, FILES)
    (corpus / "broken.txt").write_text("Burrows differed, t(28) = 2.20, p = .01.\n")
    changed = screen([str(corpus)], store, workers=1)
    assert (changed.checked, changed.already_stored) == (1, FILES - 1)
    restarted = screen([str(corpus)], store, workers=1, resume=False)
    assert restarted.checked == FILES


def test_parallel_and_serial_screens_agree(corpus, tmp_path):
    serial, parallel = str(tmp_path / "serial.sqlite"), str(tmp_path / "parallel.sqlite")
    screen([str(corpus)], serial, workers=1)
    screen([str(corpus)], parallel, workers=2)
    assert summarise(serial).flags == summarise(parallel).flags
    assert summarise(serial).p_curve == summarise(parallel).p_curve


def test_other_settings_are_a_separate_screening(corpus, tmp_path):
    store = str(tmp_path / "screening.sqlite")
    screen([str(corpus)], store, workers=1)
    strict = Settings(alpha=0.01)
    assert screen([str(corpus)], store, strict, workers=1).checked == FILES
    with pytest.raises(Exception, match="different settings"):
        summarise(store)
    assert summarise(store, strict).documents == FILES


def test_dask_local_cluster(corpus, tmp_path):
    pytest.importorskip("distributed")
    store = str(tmp_path / "dask.sqlite")
    screening = screen([str(corpus)], store, workers=2, scheduler="local")
    assert screening.checked == FILES
    assert summarise(store).flags == summarise_serial(corpus, tmp_path).flags


def summarise_serial(corpus, tmp_path):
    store = str(tmp_path / "serial-for-dask.sqlite")
    screen([str(corpus)], store, workers=1)
    return summarise(store)


def test_a_missing_store_is_an_error(tmp_path):
    with pytest.raises(StoreError, match="no such screening store"):
        summarise(str(tmp_path / "nowhere.sqlite"))


# -- the command line ------------------------------------------------------------------------

def _run(*argv):
    stdout, stderr = io.StringIO(), io.StringIO()
    return main(list(argv), stdout=stdout, stderr=stderr), stdout.getvalue(), stderr.getvalue()


def test_screen_and_summary_commands(corpus, tmp_path):
    store = str(tmp_path / "cli.sqlite")
    code, out, err = _run("screen", str(corpus), "--store", store, "--workers", "2",
                          "--format", "json")
    report = json.loads(out)
    assert code == 0
    assert report["run"]["checked"] == FILES and report["documents"] == FILES
    assert "p_curve" in report and len(report["caliper"]) == 4
    assert len(report["documents_to_look_at"]) == FILES
    assert "broken.txt: binary file" in err
    # the summary's JSON follows its published schema (checked with jsonschema)
    jsonschema = pytest.importorskip("jsonschema")
    from scrutiny.report.summary import SCHEMA_PATH

    schema = json.loads(SCHEMA_PATH.read_text(encoding="utf-8"))
    validator = jsonschema.Draft202012Validator(schema)
    assert not [error.message for error in validator.iter_errors(report)]
    code, out, _ = _run("summary", store, "--format", "json")
    assert code == 0 and validator.is_valid(json.loads(out))
    code, out, _ = _run("summary", store)
    assert code == 0 and "p-curve" in out and "caliper test" in out
    assert "Documents to look at first" in out and "broken.txt" in out


@pytest.mark.parametrize("argv, fragment", [
    (["screen", "x"], "the following arguments are required: --store"),
    (["screen", "x", "--store", "s.sqlite", "--workers", "0"], "must be at least 1"),
    (["screen", "-", "--store", "s.sqlite"], "not standard input"),
    (["summary", "nowhere.sqlite"], "no such screening store"),
])
def test_screen_usage_errors(argv, fragment, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    code, out, err = _run(*argv)
    assert code == 2 and err.count("\n") == 1 and fragment in err


def test_poisson_binomial_against_enumeration():
    # with equal probabilities it is the binomial; with unequal ones, checked by enumerating
    # every outcome of three trials
    import itertools

    from scrutiny.screen.corpus import _poisson_binomial_cdf

    assert _poisson_binomial_cdf(3, [0.5] * 10) == pytest.approx(176 / 1024)  # sum C(10, k<=3)
    probabilities = [0.2, 0.5, 0.9]
    for successes in range(4):
        enumerated = sum(
            __import__("math").prod(p if hit else 1 - p for p, hit in zip(probabilities, outcome))
            for outcome in itertools.product((0, 1), repeat=3) if sum(outcome) <= successes)
        assert _poisson_binomial_cdf(successes, probabilities) == pytest.approx(enumerated)
