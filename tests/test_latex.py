"""The LaTeX reader: printed text from LaTeX source, claims with file and line, inputs, bad input.

The manuscripts here are invented (the Fenmarsh vole studies of the Quillmere field station);
every number in them is made up for the test.
"""

from __future__ import annotations

import codecs
import os
import re

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import scrutiny
from scrutiny.errors import InputError
from scrutiny.extract import find_claims
from scrutiny.ingest import (
    document_from_bytes,
    document_from_text,
    manuscript_suffixes,
    read_document,
    sniff_format,
)
from scrutiny.ingest import latex
from scrutiny.ingest.normalise import normalise_fragment


def plain(source: str, path: str = "paper.tex") -> str:
    """The text the reader makes of `source`, with runs of white space as single spaces."""
    return re.sub(r"\s+", " ", latex.read(source.encode("utf-8"), path).text).strip()


def claims_of(document) -> list[tuple]:
    """(test, df, statistic, p comparator, p reported, n) of every claim, as printed."""
    return [(c.test, c.df, c.statistic, c.p.comparator if c.p else None,
             c.p.reported if c.p else None, c.n) for c in find_claims(document)]


def line_of(source: str, snippet: str) -> int:
    """The 1-based line of `source` on which `snippet` is typed."""
    for number, line in enumerate(source.splitlines(), start=1):
        if snippet in line:
            return number
    raise AssertionError(f"{snippet!r} is not in the source")


# -- the sample manuscript and its plain-text twin ----------------------------------------------

MANUSCRIPT = r"""\documentclass[11pt]{article}
\usepackage{amsmath}
% Fenmarsh vole burrowing study, draft 3: t(99) = 9.99, p = .001 is from the pilot
\newcommand{\chisq}{\ensuremath{\chi^2}}
\newcommand{\pvalue}[1]{\textit{p}~=~#1}
\title{Burrow depth in Fenmarsh voles after spring floods}
\begin{document}
\maketitle

\section{Results}
Voles at the Quillmere plots dug deeper burrows than voles at the dry plots,
$t(38) = 2.10$, $p = .042$.\footnote{Two burrows collapsed before they were measured.}
Depth did not depend on the observer, \textit{t}(38)~=~0.84, \emph{p}~=~.41.
% An older analysis gave t(38) = 9.99, p = .001 and was dropped.
Flood duration predicted depth, $r(46) = -.32$, $p = .027$ \citep{orrin2019}, and
the effect of season was reliable, $F(2, 87) = 4{,}12$, \pvalue{.019}, $\eta^2_p = .09$.

Nest chambers were lined with moss more often after floods,
$\chi^2(1, N = 80) = 4.20$, $p = .040$;
the sex difference was negligible, \chisq(1, $N$~=~80)~=~0.30, $p \geq .50$.
\begin{equation}
  z = 3.29, \quad p \leq .001
\end{equation}
Finally, $F(1,\,120) = 15.20$, $p = 1.6 \times 10^{-4}$.
\end{document}
"""

PLAIN_TWIN = """Burrow depth in Fenmarsh voles after spring floods

Results

Voles at the Quillmere plots dug deeper burrows than voles at the dry plots, t(38) = 2.10,
p = .042. (Two burrows collapsed before they were measured.) Depth did not depend on the
observer, t(38) = 0.84, p = .41. Flood duration predicted depth, r(46) = −.32, p = .027, and
the effect of season was reliable, F(2, 87) = 4,12, p = .019, ηp² = .09.

Nest chambers were lined with moss more often after floods, χ²(1, N = 80) = 4.20, p = .040;
the sex difference was negligible, χ²(1, N = 80) = 0.30, p ≥ .50.
z = 3.29, p ≤ .001
Finally, F(1, 120) = 15.20, p = 1.6 × 10⁻⁴.
"""

#: what the sample prints, as the plain text of the LaTeX prints it
SAMPLE_CLAIMS = [
    ("t", ("38",), "2.10", "=", ".042", None),
    ("t", ("38",), "0.84", "=", ".41", None),
    ("r", ("46",), "-.32", "=", ".027", None),
    ("F", ("2", "87"), "4,12", "=", ".019", None),
    ("chi2", ("1",), "4.20", "=", ".040", "80"),
    ("chi2", ("1",), "0.30", ">=", ".50", "80"),
    ("z", (), "3.29", "<=", ".001", None),
    ("F", ("1", "120"), "15.20", "=", "1.6 × 10^-4", None),
]


def test_sample_manuscript_claims_as_printed():
    document = latex.read(MANUSCRIPT.encode(), "voles.tex")
    assert document.format == "latex"
    assert claims_of(document) == SAMPLE_CLAIMS
    assert document.notes == ()


def test_sample_claims_point_to_file_and_line():
    document = latex.read(MANUSCRIPT.encode(), "manuscripts/voles.tex")
    found = find_claims(document)
    snippets = ["$t(38) = 2.10$", r"\textit{t}(38)", "$r(46) = -.32$", "$F(2, 87)",
                r"$\chi^2(1, N = 80)", r"\chisq(1,", "z = 3.29", r"$F(1,\,120)"]
    assert [claim.location.line for claim in found] == \
        [line_of(MANUSCRIPT, snippet) for snippet in snippets]
    assert {claim.location.file for claim in found} == {"voles.tex"}
    assert {claim.location.section for claim in found} == {"Results"}
    # the location's offsets point at the claim in the Document's text
    first = found[0]
    assert document.text[first.location.start:first.location.end] == "t(38) = 2.10, p = .042"


def _comparable(document) -> list[tuple]:
    """Claims reduced to what must agree between formats: test, df, statistic value, p."""
    return [(c.test, c.df, normalise_fragment(c.statistic), c.p.comparator,
             normalise_fragment(c.p.reported).replace("^", "").replace(" ", ""), c.n)
            for c in find_claims(document)]


def test_plain_text_twin_yields_the_same_claims():
    from_latex = _comparable(latex.read(MANUSCRIPT.encode(), "voles.tex"))
    from_text = _comparable(document_from_text(PLAIN_TWIN))
    assert len(from_latex) == len(SAMPLE_CLAIMS)
    assert from_latex == from_text


def test_whole_check_of_a_tex_file(tmp_path):
    path = tmp_path / "voles.tex"
    path.write_text(MANUSCRIPT, encoding="utf-8")
    result = scrutiny.check_file(path)
    assert result.format == "latex"
    assert [claim.claim.statistic for claim in result.claims] == [c[2] for c in SAMPLE_CLAIMS]
    assert result.claims[0].claim.location.file == "voles.tex"


# -- what LaTeX constructs print -------------------------------------------------------------

@pytest.mark.parametrize("source, printed", [
    # comments, and the percent sign that is not one
    ("Voles dug, t(28) = 2.45, % was 2.54\np = .021.", "Voles dug, t(28) = 2.45, p = .021."),
    ("In 40\\% of burrows, p = .02.", "In 40% of burrows, p = .02."),
    ("Dug%\ndeeper.", "Dugdeeper."),
    ("One.\n% a whole line of comment\nTwo.", "One. Two."),
    # math mode
    ("$t(28) = 2.45$, $p<.001$", "t(28) = 2.45, p<.001"),
    (r"\(t(28) = 2.45\), \(p = .021\)", "t(28) = 2.45, p = .021"),
    (r"so \[F(1, 40) = 9.30,\] with $$p = .004$$ here", "so F(1, 40) = 9.30, with p = .004 here"),
    ("$\\chi^2(1, N=80)=4.2$", "χ2(1, N=80)=4.2"),
    ("$\\chi^{2}(1) = 4.2$", "χ2(1) = 4.2"),
    ("$\\chi^2$(2, $N$ = 120) = 9.0", "χ2(2, N = 120) = 9.0"),
    ("$\\eta_p^2 = .12$ and $\\eta^2_p = .12$", "ηp2 = .12 and ηp2 = .12"),
    ("$\\eta^2_{\\text{p}} = .12$, $\\omega^2 = .05$", "ηp2 = .12, ω2 = .05"),
    ("$t_{28} = 2.45$", "t28 = 2.45"),
    # italics and other fonts
    (r"\textit{t}(28) = 2.45, \emph{p} = .021", "t(28) = 2.45, p = .021"),
    (r"$\mathit{F}(2, 87) = 4.12$, $\mathrm{p} = .019$", "F(2, 87) = 4.12, p = .019"),
    (r"$\textit{r}(48) = .30$, $\text{ns}$", "r(48) = .30, ns"),
    (r"\textbf{Results.} \textsc{Anova}", "Results. Anova"),
    # relations
    (r"$p \leq .001$, $p \le .01$, $p \geq .50$, $p \ge .5$, $p \neq 0$",
     "p ≤ .001, p ≤ .01, p ≥ .50, p ≥ .5, p ≠ 0"),
    (r"$p\leq.001$", "p≤.001"),
    (r"\textit{p} \textless{} .05, $p \lt .05$", "p < .05, p < .05"),
    # spacing
    (r"$N\,=\,80$, $p\;<\;.05$, $t\ =\ 2$, $t\!=\!2$", "N = 80, p < .05, t = 2, t=2"),
    ("$t$(28)~=~2.45, et al.\\ wrote", "t(28) = 2.45, et al. wrote"),
    # dashes and minus signs
    ("pages 3--5, a pause---then", "pages 3–5, a pause—then"),
    ("$t(28) = $--2.45, t(28) = $-$2.45, t(28) = \\textminus 2.45",
     "t(28) = –2.45, t(28) = -2.45, t(28) = −2.45"),
    # numbers
    ("$F(1, 102) = 4{,}77$, $N = 1{,}204$", "F(1, 102) = 4,77, N = 1,204"),
    (r"$p = 2.8 \times 10^{-4}$, $p = 3 \cdot 10^{-6}$", "p = 2.8 × 10^-4, p = 3 · 10^-6"),
    (r"$R^2 = .32$, $x^{\circ}$", "R2 = .32, x°"),
    (r"\SI{45}{\percent} and \num{0.021}", "45 % and 0.021"),
    (r"$\frac{1}{2}$, $\sqrt{2}$", "1/2, √2"),
    # citations, references, footnotes, labels
    (r"shown before \citep[p.~3]{orrin2019}, and \cite{a,b}.", "shown before, and."),
    (r"see Table~\ref{tab:1}\label{sec:x} and Eq.~\eqref{eq:2}", "see Table ?? and Eq. ??"),
    (r"deeper\footnote{Two burrows, $t(3) = 1.1$, $p = .35$.} than",
     "deeper (Two burrows, t(3) = 1.1, p = .35.) than"),
    # unknown commands print their argument; known layout commands print nothing
    (r"\unknowncommand{kept} \vspace{2em}\hspace*{1cm}\noindent text", "kept text"),
    (r"\textcolor{red}{red text}, \href{https://example.org/x%20y}{a link}",
     "red text, a link"),
    (r"\url{https://example.org/a_b%20c}", "https://example.org/a_b%20c"),
    # accents
    (r"Gr\"o\ss e, K\"{a}fer, \'etude, na\"{\i}ve", "Größe, Käfer, étude, naïve"),
    # quotes
    ("``warm'' plots", "“warm” plots"),
    # line breaks and lists
    (r"one\\[2pt] two\\* three\newline four", "one two three four"),
    (r"\begin{itemize}\item First \item[(b)] Second\end{itemize}", "First (b) Second"),
    # delimiters
    (r"$\left( t(28) = 2.45 \right.$", "( t(28) = 2.45"),
])
def test_latex_constructs_print_as_a_reader_sees_them(source, printed):
    assert plain(source) == printed


def test_user_commands_are_expanded():
    source = "\n".join([
        r"\newcommand{\pv}[1]{\textit{p}~=~#1}",
        r"\newcommand*{\res}[2][28]{$t(#1) = #2$}",
        r"\def\chisq{\chi^2}",
        r"\let\it\textit",
        r"\DeclareMathOperator{\logit}{logit}",
        r"\providecommand{\pv}{never used}",
        r"\res{2.45}, \pv{.021}; \res[30]{1.10}, \it{p} = .28; $\chisq(2) = 9.0$; $\logit(x)$",
    ])
    assert plain(source) == "t(28) = 2.45, p = .021; t(30) = 1.10, p = .28; χ2(2) = 9.0; logit(x)"


def test_definitions_do_not_replace_the_structure_the_reader_needs():
    # A template redefining \section in package code must not make titles disappear.
    source = ("\\makeatletter\\renewcommand\\section{\\@startsection{section}{1}{\\z@}{1ex}"
              "{1ex}{\\bfseries}}\\makeatother\n\\section{Study 2}\nVoles dug.")
    assert plain(source) == "Study 2 Voles dug."


def test_a_command_that_calls_itself_stops_with_a_note(monkeypatch):
    monkeypatch.setattr(latex, "MAX_EXPANSIONS", 1000)
    document = latex.read(b"\\def\\loop{x\\loop}Voles \\loop dug, t(28) = 2.45, p = .021.",
                          "paper.tex")
    assert any(note.startswith("paper.tex:1: macro expansion stopped at \\loop")
               for note in document.notes)
    assert len(document.text) <= latex.MAX_EXPANSIONS + 100
    assert [c.statistic for c in find_claims(document)] == ["2.45"]


def test_commands_that_multiply_stop_at_the_expansion_budget(monkeypatch):
    monkeypatch.setattr(latex, "MAX_EXPANDED_CHARACTERS", 100_000)
    # \b is ten \a, \c ten \b, ...: \e prints 10,000 copies of \a's 1,000 characters
    levels = "".join("\\def\\" + name + "{" + ("\\" + previous) * 10 + "}"
                     for previous, name in zip("abcd", "bcde"))
    source = "\\def\\a{" + "word " * 200 + "}" + levels + "\\e Then t(28) = 2.45, p = .021."
    document = latex.read(source.encode(), "paper.tex")
    assert len(document.text) < 200_000
    assert "macro expansion stopped" in document.notes[0]
    assert [c.statistic for c in find_claims(document)] == ["2.45"]


def test_preamble_prints_only_title_and_abstract():
    source = r"""\documentclass[man]{apa7}
\usepackage[british]{babel}
\title{Burrows of Fenmarsh voles}
\shorttitle{VOLE BURROWS}
\author{The Quillmere group}
\abstract{Voles dug deeper after floods, $t(40) = 3.10$, $p = .003$.

A second paragraph, $F(1, 40) = 9.61$, $p = .004$.}
\begin{document}
\maketitle
Body text.
\end{document}
Text after the end of the document is not printed, t(9) = 9.9, p = .001.
"""
    document = latex.read(source.encode(), "apa.tex")
    assert re.sub(r"\s+", " ", document.text).strip() == (
        "Burrows of Fenmarsh voles Voles dug deeper after floods, t(40) = 3.10, p = .003. "
        "A second paragraph, F(1, 40) = 9.61, p = .004. Body text.")
    assert [(c.df, c.location.line) for c in find_claims(document)] == \
        [(("40",), line_of(source, "t(40)")), (("1", "40"), line_of(source, "F(1, 40)"))]
    assert "\n\n" in document.text.split("p = .003.")[1][:3]  # the abstract's paragraphs


def test_paragraphs_and_sentences_survive():
    source = "First paragraph ends here.\n\nSecond paragraph.\n\\par Third."
    text = latex.read(source.encode(), "paper.tex").text
    assert text.count("\n\n") == 2
    assert "First paragraph ends here.\n\nSecond paragraph." in text


def test_section_titles_stand_as_paragraphs():
    text = latex.read(b"\\section{Methods}Voles dug.\\subsection*{Plots}Wet.", "p.tex").text
    assert text.strip().split("\n\n") == ["Methods", "Voles dug.", "Plots", "Wet."]


def test_verbatim_is_printed_as_typed_and_comments_left_out():
    source = "\n".join([
        "Output of the test:",
        r"\begin{verbatim}",
        "t = 2.45, df = 28, p-value = 0.021 % not a comment here, \\textit{kept}",
        r"\end{verbatim}",
        r"\begin{comment}",
        "t(28) = 9.99, p = .001",
        r"\end{comment}",
        r"\iffalse t(28) = 8.88, p = .002 \fi",
        "Inline \\verb|$x$ % y| too.",
    ])
    document = latex.read(source.encode(), "paper.tex")
    assert "t = 2.45, df = 28, p-value = 0.021 % not a comment here, \\textit{kept}" in \
        document.text
    assert "9.99" not in document.text and "8.88" not in document.text
    assert "Inline $x$ % y too." in document.text
    [claim] = find_claims(document)
    assert (claim.statistic, claim.df, claim.location.line) == ("2.45", ("28",), 3)


def test_results_in_align_environments_and_tables():
    source = "\n".join([
        r"\begin{align*}",
        r"t(28) &= 2.45, & p &= .021 \\",
        r"t(30) &= 1.10, & p &= .280",
        r"\end{align*}",
        r"\begin{table}[htbp]",
        r"\caption{Burrow depth, $F(2, 57) = 3.30$, $p = .044$}",
        r"\begin{tabular}{lcc}",
        r"\toprule",
        r"Plot & Depth & \multicolumn{2}{c}{Voles} \\",
        r"\end{tabular}",
        r"\end{table}",
    ])
    document = latex.read(source.encode(), "paper.tex")
    assert [(c.test, c.df, c.statistic, c.p.reported, c.location.line)
            for c in find_claims(document)] == [
        ("t", ("28",), "2.45", ".021", 2), ("t", ("30",), "1.10", ".280", 3),
        ("F", ("2", "57"), "3.30", ".044", 6)]
    assert "lcc" not in document.text and "Plot Depth Voles" in re.sub(r"\s+", " ",
                                                                        document.text)


def test_lines_stay_exact_after_constructs_that_remove_lines():
    source = "\n".join([
        "% comment line one",
        "% comment line two",
        r"Voles dug, $t(28) = 2.45$, %",
        r"  $p = .021$; \begin{equation}",
        r"  F(1, 40) = 9.30,",
        r"  p = .004",
        r"\end{equation}",
        r"\iffalse",
        r"skipped",
        r"\fi",
        r"and \textit{r}(30)",
        r"   = .41, $p = .02$.",
    ])
    found = find_claims(latex.read(source.encode(), "paper.tex"))
    assert [(c.test, c.location.line) for c in found] == [("t", 3), ("F", 5), ("r", 11)]


# -- \input and \include ---------------------------------------------------------------------

def write(path, text: str) -> None:
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text(text, encoding="utf-8")


def test_inputs_are_read_with_their_own_file_and_line(tmp_path):
    write(tmp_path / "paper" / "main.tex", "\n".join([
        r"\documentclass{article}",
        r"\begin{document}",
        r"Voles dug, $t(28) = 2.45$, $p = .021$.",
        r"\input{sections/methods}",
        r"\include{results.tex}",
        r"\input sections/discussion",
        r"Back in main, $t(12) = 2.20$, $p = .048$.",
        r"\end{document}",
    ]))
    write(tmp_path / "paper" / "sections" / "methods.tex",
          "% Methods\n\nBurrows, $r(46) = .30$, $p = .038$.\n")
    write(tmp_path / "paper" / "results.tex",
          "\\section{Results}\nFirst.\n\nFloods, $F(1, 40) = 9.61$, $p = .004$.\n")
    write(tmp_path / "paper" / "sections" / "discussion.tex",
          "Moss, $\\chi^2(1) = 4.20$, $p = .040$.\n")
    document = read_document(tmp_path / "paper" / "main.tex")
    assert document.notes == ()
    assert [(c.test, c.location.file, c.location.line) for c in find_claims(document)] == [
        ("t", "main.tex", 3), ("r", "sections/methods.tex", 3), ("F", "results.tex", 4),
        ("chi2", "sections/discussion.tex", 1), ("t", "main.tex", 7)]


def test_input_files_lists_what_a_main_file_reads(tmp_path):
    write(tmp_path / "main.tex", "\\input{a}\n\\include{sub/b}\n\\input{absent}\n")
    write(tmp_path / "a.tex", "A.\n")
    write(tmp_path / "sub" / "b.tex", "B.\n")
    write(tmp_path / "alone.tex", "Alone.\n")
    assert latex.input_files(str(tmp_path / "main.tex")) == (
        os.path.realpath(tmp_path / "a.tex"), os.path.realpath(tmp_path / "sub" / "b.tex"))
    assert latex.input_files(str(tmp_path / "alone.tex")) == ()
    assert latex.input_files(str(tmp_path / "absent.tex")) == ()


def test_a_missing_input_gives_a_note_and_the_rest_is_read(tmp_path):
    write(tmp_path / "main.tex",
          "Before, $t(28) = 2.45$, $p = .021$.\n\\input{absent}\nAfter, $t(12) = 2.2$, $p = .048$.")
    document = read_document(tmp_path / "main.tex")
    assert document.notes == ("main.tex:2: \\input{absent}: no such file (absent.tex); "
                              "the rest was read without it",)
    assert [c.location.line for c in find_claims(document)] == [1, 3]


@pytest.mark.parametrize("target", ["../outside", "../outside.tex", "sub/../../outside",
                                    "<absolute>"])
def test_inputs_may_not_leave_the_manuscripts_folder(tmp_path, target):
    write(tmp_path / "outside.tex", "Outside, $t(9) = 9.9$, $p = .001$.")
    if target == "<absolute>":
        target = (tmp_path / "outside.tex").as_posix()
    write(tmp_path / "paper" / "main.tex", f"Inside.\n\\input{{{target}}}\n")
    document = read_document(tmp_path / "paper" / "main.tex")
    assert "Outside" not in document.text
    [note] = document.notes
    assert note.startswith("main.tex:2: \\input{") and "refused" in note


@pytest.mark.skipif(not hasattr(os, "symlink"), reason="no symbolic links here")
def test_a_link_out_of_the_folder_is_refused(tmp_path):
    write(tmp_path / "secret.tex", "Secret, $t(9) = 9.9$, $p = .001$.")
    write(tmp_path / "paper" / "main.tex", "Inside.\n\\input{linked}\n")
    try:
        os.symlink(tmp_path / "secret.tex", tmp_path / "paper" / "linked.tex")
    except OSError:
        pytest.skip("cannot make symbolic links here")
    document = read_document(tmp_path / "paper" / "main.tex")
    assert "Secret" not in document.text
    assert "refused" in document.notes[0]


def test_include_cycles_are_cut_with_a_note(tmp_path):
    write(tmp_path / "main.tex", "Main.\n\\input{a}\nEnd of main, $t(12) = 2.2$, $p = .048$.")
    write(tmp_path / "a.tex", "In a, $t(13) = 2.2$, $p = .046$.\n\\input{b}\n")
    write(tmp_path / "b.tex", "In b, $t(14) = 2.2$, $p = .042$.\n\\input{a.tex}\n\\input{main}\n")
    document = read_document(tmp_path / "main.tex")
    assert [(c.df, c.location.file) for c in find_claims(document)] == [
        (("13",), "a.tex"), (("14",), "b.tex"), (("12",), "main.tex")]
    assert document.notes == (
        "b.tex:2: \\input{a.tex}: a.tex is already being read (an include cycle); "
        "not read again",
        "b.tex:3: \\input{main}: main.tex is already being read (an include cycle); "
        "not read again")


def test_a_file_may_be_input_twice_when_it_is_no_cycle(tmp_path):
    write(tmp_path / "main.tex", "\\input{row}\n\\input{row}\n")
    write(tmp_path / "row.tex", "Row, $t(13) = 2.2$, $p = .046$.\n")
    document = read_document(tmp_path / "main.tex")
    assert [c.location.file for c in find_claims(document)] == ["row.tex", "row.tex"]


def test_the_number_of_files_is_limited(tmp_path, monkeypatch):
    monkeypatch.setattr(latex, "MAX_FILES", 3)
    write(tmp_path / "main.tex", "".join(f"\\input{{part{i}}}\n" for i in range(5)))
    for i in range(5):
        write(tmp_path / f"part{i}.tex", f"Part {i}, $t({20 + i}) = 2.2$, $p = .04$.\n")
    document = read_document(tmp_path / "main.tex")
    assert [c.df for c in find_claims(document)] == [("20",), ("21",)]
    assert document.notes == ("main.tex:3: more than 3 files are input; \\input{part2} and any "
                              "later inputs were not read",)


def test_a_subfile_with_its_own_preamble(tmp_path):
    write(tmp_path / "main.tex",
          "\\documentclass{article}\n\\begin{document}\n\\subfile{chapter}\nMain again.\n"
          "\\end{document}\n")
    write(tmp_path / "chapter.tex",
          "\\documentclass[main]{subfiles}\n\\begin{document}\nChapter, $t(9) = 2.4$, "
          "$p = .04$.\n\\end{document}\nNot printed.\n")
    document = read_document(tmp_path / "main.tex")
    text = re.sub(r"\s+", " ", document.text).strip()
    assert text == "Chapter, t(9) = 2.4, p = .04. Main again."
    [claim] = find_claims(document)
    assert (claim.location.file, claim.location.line) == ("chapter.tex", 3)


def test_inputs_are_not_followed_without_a_folder():
    document = document_from_bytes(b"\\documentclass{article}\n\\begin{document}\n"
                                   b"Text.\n\\input{methods}\n\\end{document}\n", "-")
    assert document.format == "latex"
    assert "not followed" in document.notes[0]


def test_an_input_named_by_a_command_is_not_followed(tmp_path):
    write(tmp_path / "main.tex", "Text.\n\\input{\\jobname-extra}\nMore.")
    document = read_document(tmp_path / "main.tex")
    assert "More." in document.text
    assert document.notes == ("main.tex:2: \\input{\\jobname -extra}: a file name made by a "
                              "command cannot be followed; not read",)


def test_endinput_ends_the_input_file_only(tmp_path):
    write(tmp_path / "main.tex", "\\input{part}\nMain, $t(12) = 2.20$, $p = .048$.")
    write(tmp_path / "part.tex", "\\section{Study 3}\nPart, $t(13) = 2.2$, $p = .046$.\n"
                                 "\\endinput\nNot read, $t(99) = 9.9$, $p = .001$.\n")
    document = read_document(tmp_path / "main.tex")
    assert [(c.df, c.location.file, c.location.line, c.location.section)
            for c in find_claims(document)] == [
        (("13",), "part.tex", 2, "Study 3"), (("12",), "main.tex", 2, "Study 3")]


def test_an_input_that_is_not_text_gives_a_note(tmp_path):
    write(tmp_path / "main.tex", "Text.\n\\input{figure.pdf}\nMore.")
    (tmp_path / "figure.pdf").write_bytes(b"%PDF-1.4\x00\x01\x02\x00" * 20)
    document = read_document(tmp_path / "main.tex")
    assert "More." in document.text
    assert document.notes[0].startswith("main.tex:2: \\input{figure.pdf}: binary file")


# -- bad input -------------------------------------------------------------------------------

@pytest.mark.parametrize("data, reason", [
    (b"", "empty file"),
    (b"  \n\n ", "empty file (only white space)"),
    (b"\x00\x01\x02binary\x00\xff" * 40, "binary file"),
    (b"% only a comment\n\\documentclass{article}\n\\usepackage{amsmath}\n",
     "no text to read"),
    (b"\\documentclass{article}\n\\begin{document}\n\\end{document}\n", "no text to read"),
    (b"\x89PNG\r\n\x1a\n\x00\x00", "this is a PNG image"),
])
def test_bad_tex_files_give_a_one_line_reason(tmp_path, data, reason):
    path = tmp_path / "paper.tex"
    path.write_bytes(data)
    with pytest.raises(InputError) as raised:
        read_document(path)
    message = str(raised.value)
    assert reason in message
    assert "\n" not in message


@pytest.mark.parametrize("encoded, encoding", [
    ("Käfer im Moor, $t(28) = 2.45$, $p = .021$.".encode("cp1252"), "windows-1252"),
    (codecs.BOM_UTF16_LE + "Käfer, $t(28) = 2.45$, $p = .021$.".encode("utf-16-le"), "utf-16"),
    ("Käfer, $t(28) = 2.45$, $p = .021$.".encode("utf-8"), "utf-8"),
])
def test_encodings_of_tex_files(encoded, encoding):
    document = document_from_bytes(encoded, "paper.tex")
    assert (document.format, document.encoding) == ("latex", encoding)
    assert "Käfer" in document.text
    assert claims_of(document) == [("t", ("28",), "2.45", "=", ".021", None)]


def test_windows_line_ends_keep_lines_exact():
    source = "% draft\r\nVoles.\r\n\r\nDug, $t(28) = 2.45$,\r\n$p = .021$.\r\n"
    document = latex.read(source.encode(), "paper.tex")
    [claim] = find_claims(document)
    assert (claim.location.line, claim.p.reported) == (4, ".021")
    assert "\r" not in document.text


def test_an_unclosed_dollar_ends_at_the_paragraph():
    source = "Voles dug, $t(28) = 2.45, p = .021.\n\nNext, $t(12) = 2.20$, $p = .048$, and on."
    document = latex.read(source.encode(), "paper.tex")
    assert claims_of(document) == [("t", ("28",), "2.45", "=", ".021", None),
                                   ("t", ("12",), "2.20", "=", ".048", None)]
    assert document.notes == ("paper.tex:1: $ opens math mode that is not closed before the "
                              "paragraph ends; read on as text",)
    assert "Next, t(12) = 2.20, p = .048, and on." in document.text


@pytest.mark.parametrize("source, note", [
    ("\\begin{equation}\nF(1, 40) = 9.30, p = .004\n\nNext, $t(12) = 2.20$, $p = .048$.",
     "paper.tex:1: \\begin{equation} opens math mode that is not closed before the paragraph "
     "ends; read on as text"),
    ("\\[\nF(1, 40) = 9.30, p = .004\n\nNext, $t(12) = 2.20$, $p = .048$.",
     "paper.tex:1: \\[ opens math mode that is not closed before the paragraph ends; read on "
     "as text"),
    ("$$\nF(1, 40) = 9.30, p = .004\n\nNext, $t(12) = 2.20$, $p = .048$.",
     "paper.tex:1: $$ opens math mode that is not closed before the paragraph ends; read on "
     "as text"),
])
def test_unclosed_display_math_ends_at_the_paragraph(source, note):
    document = latex.read(source.encode(), "paper.tex")
    assert [(c.df, c.location.line) for c in find_claims(document)] == [
        (("1", "40"), 2), (("12",), 4)]
    assert document.notes == (note,)


def test_an_unclosed_verbatim_environment_is_noted():
    document = latex.read(b"Text, t(12) = 2.20, p = .048.\n\\begin{verbatim}\nraw $x$\n",
                          "paper.tex")
    assert "raw $x$" in document.text
    assert document.notes == ("paper.tex:2: \\begin{verbatim} without its \\end; the rest of "
                              "the file was taken as verbatim",)


def test_an_unclosed_dollar_at_the_end_is_noted():
    document = latex.read(b"Voles dug, $t(28) = 2.45, p = .021.", "paper.tex")
    assert [c.statistic for c in find_claims(document)] == ["2.45"]
    assert document.notes == ("paper.tex:1: $ opens math mode that is never closed",)


@pytest.mark.parametrize("source", [
    "Broken \\textit{brace t(18) = 2.4, p = .027\n\nNext, t(12) = 2.20, p = .048.",
    "Broken \\cite{key t(18) = 2.4, p = .027\n\nNext, t(12) = 2.20, p = .048.",
    "Broken \\footnote{note t(18) = 2.4, p = .027\n\nNext, t(12) = 2.20, p = .048.",
    "Broken } brace } t(18) = 2.4, p = .027\n\nNext, t(12) = 2.20, p = .048.",
    "Broken \\section{title t(18) = 2.4, p = .027\n\nNext, t(12) = 2.20, p = .048.",
    "Broken \\begin{itemize t(18) = 2.4, p = .027\n\nNext, t(12) = 2.20, p = .048.",
])
def test_unbalanced_braces_are_read_on_as_text(source):
    document = latex.read(source.encode(), "paper.tex")
    assert [(c.df, c.statistic) for c in find_claims(document)] == [
        (("18",), "2.4"), (("12",), "2.20")]


def test_broken_source_in_bulk_is_read_to_the_end(monkeypatch):
    # Thousands of unclosed arguments: each would be scanned to the paragraph's end, over and
    # over; the scan budget keeps that in bounds and the text after them is still read.
    monkeypatch.setattr(latex, "SCAN_BUDGET", 50_000)
    source = ("\\cite{" * 3000 + "\\item[" * 3000 + "\\footnote{" * 3000 + "{" * 3000
              + "$" * 3001 + " Finally, $t(12) = 2.20$, $p = .048$.")
    document = latex.read(source.encode(), "paper.tex")
    assert [c.df for c in find_claims(document)] == [("12",)]
    assert len(document.notes) == latex.MAX_NOTES + 1
    assert document.notes[-1].endswith("more notes like these were left out")


def test_the_scan_budget_limits_later_arguments(monkeypatch):
    monkeypatch.setattr(latex, "SCAN_BUDGET", 10)
    words = "w{}" * 100  # 300 tokens
    source = "\\footnote{" + words + "}. \\footnote{" + words + "}."
    document = latex.read(source.encode(), "paper.tex")
    # the first argument is read whole; the second, after the budget is spent, is cut short
    # (and its text is still printed)
    assert document.text.count("w") == 200
    assert document.notes == ("paper.tex:1: the argument of \\footnote has no closing brace; "
                              "read on as text",)


_PIECES = ["\\", "{", "}", "$", "$$", "%", "\n", "\n\n", " ", "^", "_", "&", "~", "#", "[", "]",
           "\\begin{", "\\end{", "equation", "verbatim", "document", "\\section", "\\footnote",
           "\\cite", "\\def", "\\newcommand", "\\x", "#1", "\\verb|", "\\url{", "\\iffalse",
           "\\fi", "t(28) = 2.45", "p = .021", "\\chi", "\\frac", "\\text", "\\left", ".", "\\\"",
           "\\\\", "\\[", "\\]", "*", "\\item", "\\caption", "\\abstract", "\\endinput", "--"]


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.lists(st.sampled_from(_PIECES), max_size=60).map("".join))
def test_any_source_reads_without_error_and_maps_inside_itself(source):
    try:
        document = latex.read(source.encode(), "paper.tex")
    except InputError as error:
        assert error.reason.startswith(("empty file", "no text to read"))
        return
    find_claims(document)
    segments = document.offset_map._segments
    assert [s.start for s in segments] == sorted(s.start for s in segments)
    assert all(0 <= s.start <= len(document.text) for s in segments)
    assert all(1 <= s.line <= source.count("\n") + 1 for s in segments)


# -- sniffing --------------------------------------------------------------------------------

@pytest.mark.parametrize("data, path, expected", [
    (b"Any text at all.", "paper.tex", "latex"),
    (b"\\documentclass{article}\n\\begin{document}\nText.\n\\end{document}\n", "paper", "latex"),
    (b"% draft\n\\documentclass{article}\nText.\n", "paper.txt", "latex"),
    (b"\\begin{document}\nText.\n\\end{document}\n", "<stdin>", "latex"),
    (b"\\section{Methods}\nText.\n\\begin{itemize}\n\\item One\n\\end{itemize}\n", "chapter",
     "latex"),
    (b"Results. See \\section{x} in the template.\nt(28) = 2.45, p = .021\n", "paper",
     "text"),
    (b"# Notes\n\nA LaTeX example:\n\n```\n\\documentclass{article}\n\\begin{document}\n"
     b"\\section{A}\n\\end{document}\n```\n", "notes.md", "markdown"),
    (b"\\section{A}\n\\section{B}\n\\section{C}\n", "notes.txt", "text"),
])
def test_latex_is_recognised_by_content_and_extension(data, path, expected):
    assert sniff_format(data, path) == expected


def test_tex_files_are_searched_in_folders():
    assert ".tex" in manuscript_suffixes()
