"""Each check: sentences that must raise it and near-misses that must not.

Where an expectation rests on a p-value, the comment names where that p-value comes from: a
critical value of a standard table (see tests/data/reference/ and the reference tests) or a
value computed with mpmath. "Common practice" marks a convention, not a published number.
"""

from __future__ import annotations

import pytest

from scrutiny.check import REGISTRY
from scrutiny.model import Severity, Status

from conftest import flags_for, only_result


# -- the registry itself ---------------------------------------------------------------------

def test_every_check_is_documented_and_kebab_case():
    for check_id, registered in REGISTRY.items():
        assert check_id == registered.id
        assert check_id.replace("-", "").isalpha() and check_id == check_id.lower()
        assert registered.title and not registered.title.endswith(".")
        assert len(registered.explanation.splitlines()) >= 3, check_id


def test_the_issue_checks_are_registered_with_their_severities():
    assert {c: REGISTRY[c].severity for c in (
        "p-mismatch", "decision-flip", "undeclared-one-sided", "one-sided",
        "negligible-effect", "impossible-value", "p-zero")} == {
        "p-mismatch": Severity.ERROR,
        "decision-flip": Severity.ERROR,
        "undeclared-one-sided": Severity.WARNING,
        "one-sided": Severity.NOTE,
        "negligible-effect": Severity.WARNING,
        "impossible-value": Severity.ERROR,
        "p-zero": Severity.WARNING,
    }


# -- p-mismatch ------------------------------------------------------------------------------

@pytest.mark.parametrize("text", [
    # t(28) = 2.20: two-sided p = .0363 (mpmath), one-sided .0182; .01 fits neither
    "The groups differed, t(28) = 2.20, p = .01.",
    # F(1, 30) = 4.17 sits at the .05 critical value 4.17 (standard F table, CV-F-16)
    "The main effect was reliable, F(1, 30) = 4.17, p = .01.",
    # chi2(1) = 3.84 is the .05 critical value (standard table, CV-C-01)
    "Nesting depended on site, χ2(1) = 3.84, p = .01.",
    # z = 1.96 is the two-sided .05 critical value (standard normal table, CV-T-10)
    "The Wald test gave z = 1.96, p = .01.",
    # r(48) = -.32: t = 2.34, two-sided p = .0235 (mpmath); p < .001 is impossible
    "Mass correlated with depth, r(48) = -.32, p < .001.",
    # an adjusted p cannot be smaller than the unadjusted one
    "The contrast was reliable, t(28) = 2.20, p_bonf = .001.",
])
def test_p_mismatch_raised(text):
    assert "p-mismatch" in flags_for(text)
    assert only_result(text).status is Status.INCONSISTENT


@pytest.mark.parametrize("text", [
    # t in [2.15, 2.25] gives p in [.0323, .0404]; p = .04 means [.035, .045]: they meet
    "The groups differed, t(28) = 2.2, p = .04.",
    "The groups differed, t(28) = 2.20, p = .036.",
    "The main effect was reliable, F(1, 30) = 4.17, p = .05.",
    "Nesting depended on site, χ2(1) = 3.84, p = .05.",
    "The Wald test gave z = 1.96, p = .05.",
    "Mass correlated with depth, r(48) = -.32, p = .02.",
    # p < .05 is true of a p of .036
    "The groups differed, t(28) = 2.20, p < .05.",
    # a Bonferroni-adjusted p above the unadjusted one is explained by the adjustment
    "The contrast was reliable, t(28) = 2.20, p_bonf = .11.",
    # "p = .000" stands for p < .0005; t(28) = 5.2 gives p = .000016 (mpmath)
    "Burrows differed, t(28) = 5.20, p = .000.",
])
def test_p_mismatch_not_raised(text):
    assert "p-mismatch" not in flags_for(text)


def test_adjusted_p_that_fits_only_through_the_adjustment_is_unchecked():
    result = only_result("The contrast was reliable, t(28) = 2.20, p_bonf = .11.")
    assert result.status is Status.UNCHECKED
    assert "adjusted" in result.reason


# -- decision-flip ---------------------------------------------------------------------------

@pytest.mark.parametrize("text", [
    # t(28) = 1.20 is far below the .05 critical value 2.048 (standard t table)
    "Foraging time differed, t(28) = 1.20, p = .03.",
    # the reverse: t(28) = 3.20 exceeds the .01 critical value 2.763 (standard t table)
    "Foraging time did not differ, t(28) = 3.20, p = .21.",
    "There was no effect of season, F(1, 30) = 9.50, p > .05.",
    "Season mattered, F(1, 30) = 2.10, p < .05.",
    # an F below 1 cannot be significant: p(F(1, 30) = 1) = .325 (mpmath)
    "All other effects were reliable, Fs(1, 30) < 1, ps < .05.",
    "Colour and site were related, χ2(2) = 3.10, p = .04.",
    # "ns" stands for p >= alpha, but z = 2.81 gives p = .005
    "Nest height did not matter, z = 2.81, ns.",
])
def test_decision_flip_raised(text):
    flags = flags_for(text)
    assert "decision-flip" in flags
    assert only_result(text).status is Status.INCONSISTENT


@pytest.mark.parametrize("text", [
    # mismatched, but both p-values are below .05
    "The groups differed, t(28) = 2.20, p = .01.",
    # a printed p = .05 lies on neither side of .05
    "The groups differed, t(28) = 3.50, p = .05.",
    # consistent results never flip
    "The groups differed, t(28) = 2.20, p = .036.",
    # a declared one-sided test is not a flip
    "As predicted, a one-tailed test showed t(40) = 1.80, p = .04.",
])
def test_decision_flip_not_raised(text):
    assert "decision-flip" not in flags_for(text)


def test_decision_flip_depends_on_alpha():
    # t(28) = 2.20 gives p = .0363 (mpmath): at alpha = .01 the printed .004 is on the other side
    text = "The groups differed, t(28) = 2.20, p = .004."
    assert "decision-flip" not in flags_for(text)
    assert "decision-flip" in flags_for(text, alpha=0.01)


# -- undeclared-one-sided and one-sided ------------------------------------------------------

def test_halved_p_without_one_sided_wording():
    # t(40) = 2.50: two-sided p = .0166, one-sided .0083 (mpmath)
    assert flags_for("The treated voles dug deeper, t(40) = 2.50, p = .008.") == [
        "undeclared-one-sided"]


def test_halved_p_that_makes_a_result_significant_is_also_a_flip():
    # t(40) = 1.80: two-sided p = .0794, one-sided .0397 (mpmath)
    assert flags_for("The treated voles dug deeper, t(40) = 1.80, p = .04.") == [
        "decision-flip", "undeclared-one-sided"]


@pytest.mark.parametrize("text", [
    "As predicted, a one-tailed test showed t(40) = 2.50, p = .008.",
    "The directional hypothesis held, t(40) = 2.50, p = .008.",
    "The treated voles dug deeper, t(40) = 2.50, p(one-tailed) = .008.",
    "All tests of the burrow hypotheses were one-sided.\nThe treated voles dug deeper, "
    "t(40) = 2.50, p = .008.",
])
def test_declared_one_sided_is_a_note_and_consistent(text):
    result = only_result(text)
    assert [f.check for f in result.flags] == ["one-sided"]
    assert result.status is Status.CONSISTENT


def test_one_sided_wording_in_another_paragraph_does_not_count():
    text = ("All tests of the burrow hypotheses were one-sided.\n\n"
            "The treated voles dug deeper, t(40) = 2.50, p = .008.")
    assert flags_for(text) == ["undeclared-one-sided"]


def test_two_sided_wording_does_not_excuse_a_halved_p():
    assert flags_for("A two-tailed test showed t(40) = 2.50, p = .008.") == [
        "undeclared-one-sided"]


def test_one_sidedness_does_not_apply_to_F_or_chi_square():
    # F(1, 40) = 6.25 is t = 2.5 squared: upper-tail p = .0166; .008 is a mismatch for F
    assert flags_for("The effect of site was reliable, F(1, 40) = 6.25, p = .008.") == [
        "p-mismatch"]


# -- negligible-effect -----------------------------------------------------------------------

@pytest.mark.parametrize("text, measure", [
    # d = 2t / sqrt(N) = 2 * 2.50 / 100 = 0.05 (Lakens 2013, eq. 2)
    ("Larger colonies foraged longer, t(9998) = 2.50, p = .012.", "d"),
    # d_z = t / sqrt(n) = 3.00 / 100 = 0.03 (Lakens 2013)
    ("Within nests, paired samples differed, t(9999) = 3.00, p = .003.", "d_z"),
    # r = .03 at n = 10,000; t = 3.00, p = .0027 (mpmath)
    ("Mass and depth correlated, r(9998) = .03, p = .003.", "r"),
    # partial eta squared = 9 / (9 + 9998) = .0009
    ("Season affected depth, F(1, 9998) = 9.00, p = .003.", "eta2_partial"),
    # w = sqrt(9 / 10000) = .03 (Cohen 1988)
    ("Colour and site were related, χ2(1, N = 10000) = 9.00, p = .003.", "w"),
    # r = z / sqrt(N) = 3 / sqrt(20000) = .021 (Rosenthal 1994)
    ("The Wald test gave z = 3.00, N = 20000, p = .003.", "r"),
])
def test_negligible_effect_raised(text, measure):
    result = only_result(text)
    assert "negligible-effect" in [f.check for f in result.flags]
    assert result.recomputed.effect.measure == measure
    message = result.flags[0].message
    assert "n = " in message and "any non-zero difference" in message


@pytest.mark.parametrize("text", [
    # d = 2 * 2.50 / 10 = 0.5
    "Larger colonies foraged longer, t(98) = 2.50, p = .014.",
    # not significant: nothing to explain away
    "Larger colonies foraged longer, t(9998) = 1.20, p = .23.",
    # chi-square without N: the effect cannot be computed
    "Colour and site were related, χ2(1) = 9.00, p = .003.",
    # z without N: the effect cannot be computed
    "The Wald test gave z = 3.00, p = .003.",
])
def test_negligible_effect_not_raised(text):
    assert "negligible-effect" not in flags_for(text)


def test_smallest_effect_of_interest_is_configurable():
    text = "Larger colonies foraged longer, t(9998) = 2.50, p = .012."
    assert "negligible-effect" not in flags_for(text, sesoi_d=0.01)
    assert flags_for("Larger colonies foraged longer, t(98) = 2.50, p = .014.",
                     sesoi_d=0.8) == ["negligible-effect"]


def test_negligible_effect_states_the_assumed_design():
    message = only_result("Larger colonies foraged longer, t(9998) = 2.50, p = .012.").flags[0].message
    assert "two independent groups of equal size, n = 5,000 + 5,000" in message
    assert "assumed" in message


# -- impossible-value ------------------------------------------------------------------------

@pytest.mark.parametrize("text", [
    "Mass and depth correlated, r(40) = 1.12, p < .001.",
    "Season had no effect, F(2, 30) = -1.50, p = .24.",
    "The groups differed, t(0) = 2.10, p = .04.",
    "The groups differed, t(28) = 2.20, p = 1.20.",
])
def test_impossible_value_raised(text):
    assert "impossible-value" in flags_for(text)
    assert only_result(text).status is Status.INCONSISTENT


@pytest.mark.parametrize("text", [
    "Mass and depth correlated, r(40) = -.99, p < .001.",
    # a printed 1.00 stands for [.995, 1.00]: possible
    "The two scorers agreed, r(40) = 1.00, p < .001.",
    "Season had no effect, F(2, 30) = 0.00, p = 1.00.",
])
def test_impossible_value_not_raised(text):
    assert "impossible-value" not in flags_for(text)


# -- p-zero ----------------------------------------------------------------------------------

def test_p_zero_raised_but_consistent_when_the_statistic_is_large():
    result = only_result("Burrows differed, t(28) = 5.20, p = .000.")
    assert [f.check for f in result.flags] == ["p-zero"]
    assert result.status is Status.CONSISTENT


def test_p_zero_with_a_small_statistic_is_also_a_mismatch():
    assert flags_for("Burrows differed, t(28) = 1.20, p = .000.") == [
        "decision-flip", "p-mismatch", "p-zero"]


@pytest.mark.parametrize("text", [
    "Burrows differed, t(28) = 5.20, p < .001.",
    "Burrows differed, t(28) = 5.20, p = .0001.",
])
def test_p_zero_not_raised(text):
    assert "p-zero" not in flags_for(text)


# -- unchecked -------------------------------------------------------------------------------

@pytest.mark.parametrize("text, reason", [
    ("The main effect was reliable, F = 4.12, p = .02.", "no degrees of freedom printed"),
    ("Mass and depth correlated, r = .19, p = .21.", "no degrees of freedom or N printed"),
    ("The groups differed, t(28) = 2.45.", "no p-value printed"),
])
def test_unchecked_with_reason(text, reason):
    result = only_result(text)
    assert result.status is Status.UNCHECKED
    assert result.reason == reason
    assert result.flags == ()


def test_bound_results_are_checked_as_bounds():
    # every t >= 3.185 with df 171 gives p <= .0017 (mpmath), so ps < .01 is consistent
    result = only_result("All ts(171) ≥ 3.19, ps < .01.")
    assert result.status is Status.CONSISTENT
    assert result.claim.aggregate
    assert result.recomputed.p is None and result.recomputed.p_interval.high < 0.002


# -- evidence-favours-null -------------------------------------------------------------------
# BF01 values: JZS from pingouin.bayesfactor_ttest with r = sqrt(2)/2 (its default 0.707 gives
# the same to 3 digits); BIC from sqrt(N) exp(-z^2/2) evaluated in mpmath (Wagenmakers 2007).
# p-values from mpmath. tests/test_bayes.py checks both Bayes factors against their references.

@pytest.mark.parametrize("text, bf01, n", [
    # p = .0358; two groups of 5,000 assumed: JZS BF01 = 4.91 (pingouin)
    ("The colonies differed, t(9998) = 2.10, p = .036.", "4.91", "10,000"),
    # p = .0357; BIC BF01 = sqrt(50000) exp(-2.205) = 24.65 (mpmath)
    ("The Wald test gave z = 2.10, N = 50000, p = .036.", "24.65", "50,000"),
    # Lindley's births (reference LIN-01): p = .0232; BIC BF01 = 23.86 (mpmath)
    ("Sex ratio differed from parity, z = 2.27, N = 98,451, p = .023.", "23.86", "98,451"),
    # p = .0093 and yet JZS BF01 = 2.14 for 10,000 + 10,000 (pingouin)
    ("Larger colonies foraged longer, t(19998) = 2.60, p = .009.", "2.14", "20,000"),
])
def test_evidence_favours_null_raised(text, bf01, n):
    result = only_result(text)
    flag = next(f for f in result.flags if f.check == "evidence-favours-null")
    assert flag.severity is Severity.WARNING
    assert f"BF01 = {bf01}" in flag.message and f"with n = {n}" in flag.message
    assert "times as likely under no effect" in flag.message
    assert "posterior probability" in flag.message
    assert f"{flag.details['bf01']:.2f}" == bf01 and flag.details["bf01"] > 1
    assert result.status is Status.CONSISTENT     # a prompt to look, not an inconsistency


@pytest.mark.parametrize("text", [
    # p = .0208 with JZS BF01 = 0.34 for 15 + 15 (pingouin): the data favour the alternative
    "The voles dug deeper, t(28) = 2.45, p = .021.",
    # not significant (p = .230), although BF01 = 21.6 (pingouin): nothing claimed to explain
    "Larger colonies foraged longer, t(9998) = 1.20, p = .23.",
    # significant but no N: no Bayes factor (only the Sellke-Bayarri-Berger bound)
    "The Wald test gave z = 2.10, p = .036.",
    # a significant correlation that the Bayes factor supports too: BF01 = 0.62 at prior scale
    # 1 (pingouin.bayesfactor_pearson, method "wetzels"), 0.44 at the default sqrt(2)/2
    "Mass and depth correlated, r(12000) = .03, p = .001.",
])
def test_evidence_favours_null_not_raised(text):
    assert "evidence-favours-null" not in flags_for(text)


def test_evidence_favours_null_depends_on_the_prior_scale():
    # t(1998) = 2.20, p = .0279: JZS BF01 = 1.81 at r = sqrt(2)/2 (pingouin), 0.63 at r = 0.2
    text = "The colonies differed, t(1998) = 2.20, p = .028."
    assert "evidence-favours-null" in flags_for(text)
    assert "evidence-favours-null" not in flags_for(text, prior_scale=0.2)


# -- negligible-effect: equivalent to zero, or too wide to tell ------------------------------
# 90% limits: noncentral t roots (Steiger & Fouladi 1997) and Fisher's z, computed with mpmath;
# the smallest effects of interest are Cohen's (1988) "small" (reference ES-C-01/02, ES-C-06).

@pytest.mark.parametrize("text, interval, threshold", [
    # d = 0.037, 90% interval [0.0135, 0.0600] (mpmath) inside +-0.2
    ("Larger colonies foraged longer, t(19998) = 2.60, p = .009.", "[0.014, 0.060]", "0.2"),
    # r = .03, Fisher-z 90% interval [0.0184, 0.0416] (mpmath) inside +-0.1
    ("Mass and depth correlated, r(19998) = .03, p < .001.", "[0.018, 0.042]", "0.1"),
    # partial eta squared .0009, 90% interval [0.00018, 0.00215] (mpmath) inside +-0.01
    ("Season affected depth, F(1, 9998) = 9.00, p = .003.", "[0.000, 0.002]", "0.01"),
])
def test_negligible_effect_practically_equivalent_to_zero(text, interval, threshold):
    flag = next(f for f in only_result(text).flags if f.check == "negligible-effect")
    assert flag.details["equivalent_to_zero"] == "yes"
    assert -float(threshold) < flag.details["low90"] <= flag.details["high90"] < float(threshold)
    assert (f"Its whole 90% interval {interval} lies within ±{threshold}: the result is "
            f"practically equivalent to zero (two one-sided tests)") in flag.message
    assert "significant only because n = " in flag.message
    assert "too wide" not in flag.message


@pytest.mark.parametrize("text, interval, threshold", [
    # d = 0.158 < 0.2, but the 90% interval [0.0539, 0.2623] (mpmath) reaches past 0.2
    ("Larger colonies foraged longer, t(998) = 2.50, p = .013.", "[0.054, 0.262]", "0.2"),
    # r = .08 < .1, Fisher-z 90% interval [0.0281, 0.1315] (mpmath)
    ("Mass and depth correlated, r(998) = .08, p = .011.", "[0.028, 0.131]", "0.1"),
    # partial eta squared .0060 < .01, 90% interval [0.00063, 0.01647] (mpmath)
    ("Season affected depth, F(1, 1000) = 6.00, p = .014.", "[0.001, 0.016]", "0.01"),
])
def test_negligible_effect_too_wide_to_rule_out(text, interval, threshold):
    flag = next(f for f in only_result(text).flags if f.check == "negligible-effect")
    assert flag.details["equivalent_to_zero"] == "no"
    assert abs(flag.details["effect"]) < float(threshold) < flag.details["high90"]
    assert (f"90% interval {interval} is too wide to rule out an effect of ±{threshold}"
            in flag.message)
    assert "practically equivalent" not in flag.message
    assert "only because" not in flag.message


# -- effect-mismatch -------------------------------------------------------------------------
# Expected values follow the conversion formulas of Lakens (2013) and Cohen (1988), section 8.1
# of the reference compilation (ES-F-01 to ES-F-09), evaluated by hand for each sentence.

@pytest.mark.parametrize("text", [
    # t(28) = 2.45: d at least t/sqrt(29) = 0.455 under any convention; 0.23 is impossible
    "The groups differed, t(28) = 2.45, p = .021, d = 0.23.",
    # printed group sizes fix d = 2.45 sqrt(1/12 + 1/18) = 0.913
    "Treated (n = 12) and control (n = 18) voles differed, t(28) = 2.45, p = .021, d = 0.60.",
    # partial eta squared = 6.25 / (6.25 + 40) = .135
    "Season mattered, F(1, 40) = 6.25, p = .017, ηp² = .41.",
    # eta squared cannot exceed the partial eta squared 2 * 6.25 / (2 * 6.25 + 40) = .238
    "Season mattered, F(2, 40) = 6.25, p = .004, η2 = .44.",
    # phi = sqrt(4 / 100) = .20
    "Colour mattered, χ2(1, N = 100) = 4.00, p = .046, φ = .35.",
    # V = sqrt(16 / (100 m)) with m = 1 or 2 (df 4: a 2 x 5 or a 3 x 3 table): .40 or .28
    "Colour mattered, χ2(4, N = 100) = 16.00, p = .003, V = .20.",
    # r = sqrt(t^2 / (t^2 + df)) = .42 for t(28) = 2.45
    "The groups differed, t(28) = 2.45, p = .021, r = .21.",
    # R squared of the model F: 5 * 78.92 / (5 * 78.92 + 611) = .392
    "Model fit was good, R2 = .52, F(5, 611) = 78.92, p < .001.",
])
def test_effect_mismatch_raised(text):
    assert "effect-mismatch" in flags_for(text)


@pytest.mark.parametrize("text", [
    "The groups differed, t(28) = 2.45, p = .021, d = 0.89.",      # 2t/sqrt(30) = 0.895
    "The groups differed, t(28) = 2.45, p = .021, d = 0.93.",      # 2t/sqrt(28) = 0.926 (Rosenthal)
    "The groups differed, t(28) = 2.45, p = .021, d = 1.20.",      # unequal groups: larger d
    "Within nests, paired samples differed, t(28) = 2.45, p = .021, d_z = 0.45.",  # t/sqrt(29)
    "Within nests, paired samples differed, t(28) = 2.45, p = .021, d = 0.20.",    # d_av: unknown
    "Treated (n = 12) and control (n = 18) voles differed, t(28) = 2.45, p = .021, d = 0.91.",
    "The groups differed, t(28) = 2.45, p = .021, g = 0.87.",      # 0.895 x J(28) = 0.871
    "Season mattered, F(1, 40) = 6.25, p = .017, ηp² = .14.",
    "Season mattered, F(2, 40) = 6.25, p = .004, η2 = .11.",       # below .238: a smaller share
    "Colour mattered, χ2(1, N = 100) = 4.00, p = .046, φ = .20.",
    "Colour mattered, χ2(4, N = 100) = 16.00, p = .003, V = .28.",  # 3 x 3 table: sqrt(16/200)
    "The groups differed, t(28) = -2.45, p = .021, r = .42.",      # signs are not compared
    "Model fit was good, R2 = .39, F(5, 611) = 78.92, p < .001.",
    "Model fit was good, adjusted R2 = .52, F(5, 611) = 78.92, p < .001.",  # adjusted: not read
])
def test_effect_mismatch_not_raised(text):
    assert "effect-mismatch" not in flags_for(text)
