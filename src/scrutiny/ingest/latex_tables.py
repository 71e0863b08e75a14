"""What the LaTeX reader knows about commands and environments, as data.

The reader (`latex.py`) looks a command up here to decide what a reader of the printed page
sees in its place. A command found in none of these tables is dropped and its braced arguments
are read as text, which is right for the many commands that only change fonts or layout.

Argument specifications are strings of one letter per argument: `m` a mandatory argument, `o`
an optional argument in square brackets, `s` an optional star, `p` an optional argument in
parentheses (as `\\cmidrule(lr){2-3}` has).
"""

from __future__ import annotations

#: Greek letters, in math mode and (as many manuscripts type them there anyway) in text
GREEK = {
    "alpha": "α", "beta": "β", "gamma": "γ", "delta": "δ", "epsilon": "ε", "varepsilon": "ε",
    "zeta": "ζ", "eta": "η", "theta": "θ", "vartheta": "ϑ", "iota": "ι", "kappa": "κ",
    "lambda": "λ", "mu": "μ", "nu": "ν", "xi": "ξ", "omicron": "ο", "pi": "π", "varpi": "ϖ",
    "rho": "ρ", "varrho": "ϱ", "sigma": "σ", "varsigma": "ς", "tau": "τ", "upsilon": "υ",
    "phi": "ϕ", "varphi": "φ", "chi": "χ", "psi": "ψ", "omega": "ω",
    "Gamma": "Γ", "Delta": "Δ", "Theta": "Θ", "Lambda": "Λ", "Xi": "Ξ", "Pi": "Π",
    "Sigma": "Σ", "Upsilon": "Υ", "Phi": "Φ", "Psi": "Ψ", "Omega": "Ω", "Chi": "Χ",
}
# Upright (upgreek: \upchi) and text (textgreek: \textchi) variants print the same letter.
GREEK.update({prefix + name: letter for name, letter in list(GREEK.items())
              for prefix in ("up", "text", "Up")})

#: symbols that print the same in text and math mode
SYMBOLS = {
    # control symbols
    "%": "%", "&": "&", "#": "#", "$": "$", "_": "_", "{": "{", "}": "}",
    " ": " ", "\n": " ", "\t": " ", ",": " ", ";": " ", ":": " ", ">": " ", "!": "",
    "/": "", "-": "", "@": "", "|": "‖",
    # spacing
    "quad": " ", "qquad": " ", "enspace": " ", "thinspace": " ", "enskip": " ",
    "medspace": " ", "thickspace": " ", "negthinspace": "", "space": " ",
    "nobreakspace": " ", "newline": " ", "linebreak": " ", "break": " ",
    # text symbols
    "ldots": "…", "dots": "…", "textellipsis": "…", "cdots": "…", "dotsc": "…", "dotsb": "…",
    "textendash": "–", "textemdash": "—", "textminus": "−", "textless": "<",
    "textgreater": ">", "textpm": "±", "texttimes": "×", "textdegree": "°", "degree": "°",
    "textasciitilde": "~", "textasciicircum": "^", "textbar": "|", "textbackslash": "\\",
    "textunderscore": "_", "textbullet": "•", "textperiodcentered": "·",
    "textquotedblleft": "“", "textquotedblright": "”", "textquoteleft": "‘",
    "textquoteright": "’", "textquotesingle": "'", "textpercent": "%", "textperthousand": "‰",
    "S": "§", "P": "¶", "dag": "†", "ddag": "‡", "copyright": "©", "textregistered": "®",
    "texttrademark": "™", "pounds": "£", "euro": "€", "textmu": "μ", "micro": "μ",
    "ss": "ß", "o": "ø", "O": "Ø", "ae": "æ", "AE": "Æ", "oe": "œ", "OE": "Œ", "aa": "å",
    "AA": "Å", "l": "ł", "L": "Ł", "i": "ı", "j": "ȷ",
    "LaTeX": "LaTeX", "TeX": "TeX", "LaTeXe": "LaTeX2e", "and": ",",
    "percent": "%",
}

#: symbols of math mode
MATH_SYMBOLS = {
    "leq": "≤", "le": "≤", "leqslant": "≤", "leqq": "≤", "geq": "≥", "ge": "≥", "geqslant": "≥",
    "geqq": "≥", "neq": "≠", "ne": "≠", "lt": "<", "gt": ">", "approx": "≈", "simeq": "≃",
    "sim": "~", "cong": "≅", "equiv": "≡", "ll": "≪", "gg": "≫", "propto": "∝",
    "times": "×", "cdot": "·", "pm": "±", "mp": "∓", "div": "÷", "ast": "*", "star": "⋆",
    "infty": "∞", "prime": "′", "circ": "∘", "bullet": "•", "mid": "|", "vert": "|",
    "lvert": "|", "rvert": "|", "Vert": "‖", "colon": ":", "to": "→", "rightarrow": "→",
    "leftarrow": "←", "Rightarrow": "⇒", "in": "∈", "notin": "∉", "sum": "∑", "prod": "∏",
    "partial": "∂", "nabla": "∇", "forall": "∀", "exists": "∃", "emptyset": "∅",
    "langle": "⟨", "rangle": "⟩", "lbrace": "{", "rbrace": "}", "lbrack": "[", "rbrack": "]",
    "backslash": "\\", "setminus": "∖", "cap": "∩", "cup": "∪", "wedge": "∧", "vee": "∨",
    "neg": "¬", "lnot": "¬", "hbar": "ħ", "ell": "ℓ",
    "log": "log", "ln": "ln", "exp": "exp", "min": "min", "max": "max", "sin": "sin",
    "cos": "cos", "tan": "tan", "lim": "lim", "arg": "arg", "det": "det", "Pr": "Pr",
    "var": "var", "sgn": "sgn",
}

#: delimiter-sizing commands; "\left." prints nothing, so a dot right after them is dropped
SIZING = frozenset({
    "left", "right", "middle", "big", "Big", "bigg", "Bigg", "bigl", "bigr", "Bigl", "Bigr",
    "biggl", "biggr", "Biggl", "Biggr", "bigm", "Bigm", "biggm", "Biggm",
})

#: text accents: the combining character each adds to the letter that follows
ACCENTS = {
    "'": "\u0301", "`": "\u0300", "^": "\u0302", '"': "\u0308", "~": "\u0303", "=": "\u0304",
    ".": "\u0307", "u": "\u0306", "v": "\u030c", "H": "\u030b", "c": "\u0327", "k": "\u0328",
    "r": "\u030a", "d": "\u0323", "b": "\u0331",
}

#: commands that print nothing: their arguments (per the specification) are dropped with them
DROPPED = {
    # references and citations (a citation key is not text a reader sees)
    "label": "m", "cite": "soom", "citep": "soom", "citet": "soom", "citealp": "soom",
    "citealt": "soom", "citeauthor": "soom", "citeyear": "soom", "citeyearpar": "soom",
    "Citep": "soom", "Citet": "soom", "Citeauthor": "soom", "parencite": "soom",
    "Parencite": "soom", "textcite": "soom", "Textcite": "soom", "autocite": "soom",
    "Autocite": "soom", "footcite": "soom", "smartcite": "soom", "supercite": "m",
    "nocite": "m", "cites": "m", "parencites": "m", "citeA": "m", "citeNP": "m",
    "bibitem": "om", "bibliography": "m", "bibliographystyle": "m", "addbibresource": "om",
    "printbibliography": "o", "index": "m", "glossary": "m", "footnotemark": "o",
    # preamble and set-up
    "documentclass": "om", "documentstyle": "om", "usepackage": "om", "RequirePackage": "om",
    "PassOptionsToPackage": "mm", "setlength": "mm", "addtolength": "mm", "setcounter": "mm",
    "addtocounter": "mm", "stepcounter": "m", "refstepcounter": "m", "newcounter": "mo",
    "newlength": "m", "settowidth": "mm", "pagestyle": "m", "thispagestyle": "m",
    "pagenumbering": "m", "graphicspath": "m", "hypersetup": "m", "captionsetup": "om",
    "geometry": "m", "definecolor": "mmm", "color": "om", "linespread": "m",
    "fontsize": "mm", "newtheorem": "somo", "theoremstyle": "m", "setcitestyle": "m",
    "bibpunct": "om", "hyphenation": "m", "includeonly": "m", "typeout": "m",
    "DeclareOption": "sm", "ProcessOptions": "s", "newfloat": "mmmo", "floatname": "mm",
    "setmainfont": "om", "setsansfont": "om", "setmonofont": "om", "newfontfamily": "mom",
    "sisetup": "m", "lstset": "m", "usetikzlibrary": "m", "pgfplotsset": "m",
    "tikzset": "m", "setstretch": "m", "doublespacing": "", "addto": "mm",
    "crefname": "mmm", "Crefname": "mmm", "urlstyle": "m", "DeclareFieldFormat": "omm",
    "shorttitle": "m", "runninghead": "m", "leftheader": "m",
    # layout
    "vspace": "sm", "hspace": "sm", "addvspace": "m", "vskip": "", "includegraphics": "som",
    "rule": "omm", "phantom": "m", "hphantom": "m", "vphantom": "m", "addlinespace": "o",
    "cmidrule": "pom", "cline": "m", "arraystretch": "", "setbox": "",
    "tabcolsep": "", "pagebreak": "o", "nopagebreak": "o", "enlargethispage": "sm",
    "addcontentsline": "mmm", "markboth": "mm", "markright": "m", "specialrule": "mmm",
    "raggedright": "", "raggedleft": "", "centering": "", "noindent": "", "indent": "",
}

#: citations (which print nothing here, so a space before them is taken back before a full
#: stop or comma)
CITATIONS = frozenset(name for name in DROPPED if "cite" in name.lower())

#: cross references: LaTeX prints a number it only knows on a second run
REFERENCES = frozenset({
    "ref", "eqref", "autoref", "Autoref", "cref", "Cref", "pageref", "vref", "Vref",
    "nameref", "autopageref", "labelcref", "cpageref", "Cpageref", "subref",
})

#: commands whose leading arguments (per the specification) are dropped and whose last
#: argument is printed (it is then read as an ordinary braced group)
LEADING_DROPPED = {
    "textcolor": "om", "colorbox": "om", "fcolorbox": "mm", "multicolumn": "mm",
    "multirow": "momo", "resizebox": "smm", "scalebox": "mo", "rotatebox": "om",
    "foreignlanguage": "om", "makebox": "oo", "framebox": "oo", "parbox": "ooom",
    "raisebox": "moo", "hyperref": "o", "hyperlink": "m", "hypertarget": "m",
    "adjustbox": "m", "tablenum": "o", "num": "o", "si": "o",
}

#: commands whose argument is printed in text mode even inside math
TEXT_ARGUMENT = frozenset({
    "text", "textrm", "textit", "textbf", "textsf", "texttt", "textup", "textnormal",
    "textsl", "textsc", "textmd", "mbox", "hbox", "emph", "intertext", "shortintertext",
})

#: sectioning commands whose title stands as a paragraph of its own
BLOCK_TITLES = frozenset({"part", "chapter", "section", "subsection", "subsubsection", "addsec"})
#: sectioning commands whose title runs into the paragraph that follows
RUN_IN_TITLES = frozenset({"paragraph", "subparagraph"})

#: commands whose argument is printed in brackets where the command stands
FOOTNOTES = frozenset({"footnote", "footnotetext", "thanks", "marginpar", "tablefootnote",
                       "endnote", "sidenote"})

#: commands whose argument is a file name to read (LaTeX reads it relative to the main file)
INPUTS = frozenset({"input", "include", "subfile", "import", "subimport", "inputfrom",
                    "subinputfrom", "includefrom", "subincludefrom"})

#: commands that define other commands
DEFINITIONS = frozenset({"newcommand", "renewcommand", "providecommand", "DeclareRobustCommand",
                         "DeclareMathOperator", "def", "gdef", "edef", "xdef", "let",
                         "newenvironment", "renewenvironment", "NewDocumentCommand",
                         "RenewDocumentCommand", "ProvideDocumentCommand",
                         "NewDocumentEnvironment", "newrobustcmd", "renewrobustcmd",
                         "providerobustcmd"})

#: environments whose content is math: results are often printed inside them
DISPLAY_MATH = frozenset({
    "equation", "equation*", "align", "align*", "alignat", "alignat*", "flalign", "flalign*",
    "gather", "gather*", "multline", "multline*", "eqnarray", "eqnarray*", "displaymath",
    "math", "dmath", "dmath*", "IEEEeqnarray", "IEEEeqnarray*",
})
#: math environments that only appear inside math
INNER_MATH = frozenset({
    "aligned", "alignedat", "gathered", "split", "cases", "array", "matrix", "pmatrix",
    "bmatrix", "vmatrix", "Vmatrix", "smallmatrix", "subarray",
})
#: environments whose content is printed exactly as typed
VERBATIM = frozenset({"verbatim", "verbatim*", "Verbatim", "BVerbatim", "LVerbatim",
                      "lstlisting", "minted", "alltt", "spverbatim", "Sinput", "Soutput",
                      "Scode", "Schunk"})
#: environments whose content is not printed text (or not printed at all)
SKIPPED = frozenset({"comment", "tikzpicture", "pgfpicture", "filecontents", "filecontents*",
                     "axis", "tikzcd", "forest", "pspicture", "picture", "asy"})
#: environments that set a table of cells (& between columns, \\ between rows)
TABULAR = frozenset({"tabular", "tabular*", "tabularx", "tabulary", "xltabular", "longtable",
                     "longtable*", "supertabular"})
#: arguments taken by environments (after \begin{name}), per the specification letters
ENVIRONMENT_ARGUMENTS = {
    "tabular": "om", "tabular*": "mom", "tabularx": "mom", "tabulary": "mom",
    "xltabular": "mom", "longtable": "om", "longtable*": "om", "supertabular": "m",
    "array": "om", "subarray": "m", "alignat": "m", "alignat*": "m", "alignedat": "m",
    "IEEEeqnarray": "om", "IEEEeqnarray*": "om", "minipage": "ooom", "multicols": "mo",
    "multicols*": "mo", "wrapfigure": "omom", "wraptable": "omom", "thebibliography": "m",
    "subfigure": "om", "subtable": "om", "adjustbox": "m", "list": "mm", "otherlanguage": "m",
    "otherlanguage*": "m", "tcolorbox": "o", "figure": "o", "figure*": "o", "table": "o",
    "table*": "o", "sidewaystable": "o", "sidewaysfigure": "o", "itemize": "o",
    "enumerate": "o", "description": "o", "tablenotes": "o", "mdframed": "o",
    "threeparttable": "o", "spacing": "m",
}
