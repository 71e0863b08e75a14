"""Write samples/skerrow-tern-nest-survey.docx, an invented Word manuscript with tables.

    python samples/sources/make_tern_survey.py

The manuscript is invented (the Skerrow Islands, their tern colony and every number). Its
tables print results across cells, as many Word manuscripts do; the planted problems are listed
in samples/expected-flags.toml. The file is kept in the repository so that the samples need no
generation step; this script says exactly what is in it.
"""

from __future__ import annotations

from pathlib import Path

import docx

TARGET = Path(__file__).resolve().parent.parent / "skerrow-tern-nest-survey.docx"

PARAGRAPHS = [
    ("title", "Nest-site choice of the Skerrow tern on the northern shingle banks"),
    ("text", "Note: this manuscript is invented. The islands, the terns and all numbers are "
             "fictional; it is a sample for testing scrutiny."),
    ("heading", "Methods"),
    ("text", "Volunteers of the Skerrow Natural-History Trust mapped 212 tern nests on the "
             "northern shingle banks in the 2025 season and measured vegetation cover, distance "
             "to the tide line and the number of neighbours within five metres."),
    ("heading", "Results"),
    ("text", "Nests on the upper bank were further from the tide line than nests on the lower "
             "bank, t(210) = 4.12, p < .001. Table 1 compares the two banks and Table 2 gives "
             "the odds of a nest fledging at least one chick."),
]

TABLE_1 = [["Measure", "t", "df", "p"],
           ["Vegetation cover", "2.64", "210", ".009"],
           ["Neighbours within 5 m", "1.48", "210", ".04"],       # p = .14: reported as .04
           ["Clutch size", "0.37", "210", ".71"],
           ["Note. Two-sided tests of upper against lower bank.", "", "", ""]]

TABLE_2 = [["Predictor", "OR (95% CI)", "p"],
           ["Upper bank", "2.10 (1.21–3.64)", ".008"],
           ["Vegetation cover above 30%", "1.45 (0.86–2.44)", ".16"],
           ["Ten or more neighbours", "1.62 (1.05–2.50)", ".29"]]  # the interval excludes 1


def main() -> None:
    document = docx.Document()
    for kind, text in PARAGRAPHS:
        if kind == "title":
            document.add_heading(text, level=0)
        elif kind == "heading":
            document.add_heading(text, level=1)
        else:
            document.add_paragraph(text)
    for caption, rows in (("Table 1. Upper and lower bank compared.", TABLE_1),
                          ("Table 2. Odds of fledging at least one chick.", TABLE_2)):
        document.add_paragraph(caption)
        table = document.add_table(rows=len(rows), cols=len(rows[0]))
        for r, row in enumerate(rows):
            for c, text in enumerate(row):
                table.cell(r, c).text = text
    document.core_properties.author = "scrutiny samples"
    document.core_properties.title = PARAGRAPHS[0][1]
    document.save(TARGET)


if __name__ == "__main__":
    main()
