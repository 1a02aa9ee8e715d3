"""PDF sheets with fpdf2 and the bundled DejaVu Sans (Unicode: "Zoë Ødegård", "Łucja Nowak").

Every page repeats the event, the sheet, the round and the printing time at the
top and the line that the regulations prevail at the bottom. Tables wrap long
names inside their column at spaces and after hyphens, inside a word only when
the word alone is wider than the column (:func:`pairings.text.wrap`, measured in
the font); result slips come eight to an A4 page, to cut along the dashed lines.
The creation date is the printing time, so the same state and time give the same
file.
"""

from __future__ import annotations

import unicodedata
from datetime import datetime
from collections.abc import Sequence
from functools import cache
from pathlib import Path

from fpdf import FPDF
from fpdf.enums import WrapMode, XPos, YPos
from fpdf.fonts import FontFace
from fontTools.ttLib import TTFont  # type: ignore[import-untyped]

from pairings.reports.clean import PREVAIL, plain, show
from pairings.reports.sheets import Sheet, Table
from pairings.text import fit, wrap

_FONTS = Path(__file__).parent / "fonts"
_FAMILY = "DejaVu"
_WEIGHT = {"name": 5.0, "points": 1.5, "number": 1.1, "rank": 1.4, "result": 2.2, "text": 2.0}
_ALIGN = {"points": "RIGHT", "number": "RIGHT", "rank": "RIGHT"}
_PADDING = 0.8
_PAPER = {"a4": "A4", "letter": "Letter"}
_SLIP_NAME = 80
"""Characters of a name kept on a result slip; longer names end in an ellipsis."""
_PLAYER_BY_PLAYER = ("crosstable", "grid")
"""The sheets with a column per round or per player (text columns narrower, landscape when wide)."""


@cache
def _covered() -> frozenset[int]:
    """Code points the bundled font can draw (bold covers the same set)."""
    with TTFont(str(_FONTS / "DejaVuSans.ttf"), lazy=True) as font:
        return frozenset(font.getBestCmap())


def printable(text: str) -> str:
    """Clean ``text`` (see :func:`plain`) and mark each character the font lacks with "□".

    Invisible marks the font lacks (joiners, variation selectors) are dropped.
    """
    covered = _covered()
    out = []
    for ch in plain(text):
        if ord(ch) in covered:
            out.append(ch)
        elif unicodedata.category(ch) not in ("Mn", "Me", "Cf"):
            out.append("□")
    return "".join(out)


class _Document(FPDF):
    def __init__(self, sheet: Sheet, landscape: bool, paper: str = "a4") -> None:
        super().__init__(orientation="L" if landscape else "P", unit="mm", format=_PAPER[paper])
        self.sheet = sheet
        self.add_font(_FAMILY, "", str(_FONTS / "DejaVuSans.ttf"))
        self.add_font(_FAMILY, "B", str(_FONTS / "DejaVuSans-Bold.ttf"))
        self.set_margins(12, 12, 12)
        self.set_auto_page_break(True, margin=16)
        self.set_title(f"{plain(sheet.event)} — {sheet.title} — {sheet.round_label}")
        self.set_creator("pairings")

    def header(self) -> None:
        s = self.sheet
        self.set_font(_FAMILY, "B", 12)
        self.multi_cell(0, 6, "\n".join(wrap(printable(s.event), self.epw - 1, self.get_string_width)),
                        new_x=XPos.LMARGIN, new_y=YPos.NEXT)
        self.set_font(_FAMILY, "", 9)
        self.cell(0, 5, printable(f"{s.title} — {s.round_label} · printed {s.printed}"), new_x=XPos.LMARGIN, new_y=YPos.NEXT)
        self.ln(2)

    def footer(self) -> None:
        self.set_y(-13)
        self.set_font(_FAMILY, "", 7.5)
        self.cell(0, 4, PREVAIL, new_x=XPos.LMARGIN, new_y=YPos.NEXT)
        self.cell(0, 4, f"Page {self.page_no()}/{{nb}}", align="R")


def _table(pdf: _Document, table: Table, size: float) -> None:
    shown = table.printed_columns()
    kinds = [table.columns[i].kind for i in shown]
    cross = pdf.sheet.kind in _PLAYER_BY_PLAYER
    empty = [all(row[i] in (None, "") for row in table.rows) for i in shown]
    # A text column left empty on every row (a note nobody needs) gives its width to the names.
    widths = [0.9 if k == "text" and blank else 1.3 if cross and k == "text" else _WEIGHT[k]
              for k, blank in zip(kinds, empty)]
    pdf.set_font(_FAMILY, "B", size + 1)
    pdf.cell(0, 6, table.caption, new_x=XPos.LMARGIN, new_y=YPos.NEXT)
    pdf.set_font(_FAMILY, "B", size)
    widths = _fit_headings(pdf, widths, kinds, [printable(table.columns[i].label) for i in shown])
    pdf.set_font(_FAMILY, "", size)
    # The text width of each column: its share of the page less the padding and a margin for the rules.
    room = [pdf.epw * w / sum(widths) - 2 * _PADDING - 1.0 for w in widths]
    with pdf.table(col_widths=widths, text_align=[_ALIGN.get(k, "LEFT") for k in kinds],
                   wrapmode=WrapMode.WORD, line_height=size * 0.5, width=pdf.epw, repeat_headings=1,
                   headings_style=FontFace(family=_FAMILY, emphasis="BOLD"), padding=_PADDING) as grid:
        head = grid.row()
        for i in shown:
            head.cell(printable(table.columns[i].label))
        for values in table.rows:
            row = grid.row()
            for n, i in enumerate(shown):
                text = printable(show(values[i], table.columns[i].kind))
                row.cell("\n".join(wrap(text, room[n], pdf.get_string_width)) if kinds[n] == "name" else text)
    pdf.ln(4)


def _fit_headings(pdf: _Document, widths: list[float], kinds: Sequence[str], labels: list[str]) -> list[float]:
    """Column widths in mm, each at least as wide as the longest word of its heading (in the current
    font), so that "Board" is never broken into "Boa" / "rd"; the name columns give up the room."""
    share = [pdf.epw * w / sum(widths) for w in widths]
    need = [max((pdf.get_string_width(word) for word in label.split()), default=0.0) + 2 * _PADDING + 1.5
            for label in labels]
    grown = [max(s, n) if k != "name" else s for s, n, k in zip(share, need, kinds)]
    extra = sum(grown) - pdf.epw
    names = sum(s for s, k in zip(grown, kinds) if k == "name")
    if extra <= 0 or names <= extra:
        return grown if extra <= 0 else share
    return [s - extra * s / names if k == "name" else s for s, k in zip(grown, kinds)]


def _slip_name(name: object) -> str:
    return fit(printable(show(name, "name")), _SLIP_NAME, len)


def _slips(pdf: _Document) -> None:
    sheet = pdf.sheet
    first, second = (printable(x) for x in sheet.sides or ("Player", "Player"))
    w, h = pdf.epw / 2, 60.0
    top = pdf.get_y()
    per_page = int((pdf.h - 16 - top) // h) * 2
    pdf.set_dash_pattern(dash=1.5, gap=1.5)
    for n, row in enumerate(sheet.tables[0].rows):
        if n and n % per_page == 0:
            pdf.add_page()
        slot = n % per_page
        x, y = pdf.l_margin + (slot % 2) * w, top + (slot // 2) * h
        pdf.rect(x, y, w, h)
        pdf.set_xy(x + 3, y + 3)
        pdf.set_font(_FAMILY, "B", 10)
        pdf.cell(w - 6, 5, f"Board {row[0]} · Round {sheet.round_number}", new_x=XPos.LEFT, new_y=YPos.NEXT)
        pdf.set_font(_FAMILY, "", 7.5)
        event = wrap(fit(printable(sheet.event), 120, len), w - 7, pdf.get_string_width)
        pdf.multi_cell(w - 6, 3.5, "\n".join(event), new_x=XPos.LEFT, new_y=YPos.NEXT)
        pdf.set_font(_FAMILY, "", 9)
        for label, name in ((first, row[2]), (second, row[4])):
            lines = wrap(f"{label}: {_slip_name(name)}", w - 7, pdf.get_string_width)
            pdf.multi_cell(w - 6, 4.5, "\n".join(lines), new_x=XPos.LEFT, new_y=YPos.NEXT)
        pdf.set_xy(x + 3, y + h - 17)
        pdf.cell(w - 6, 5, "Result:   ☐ 1-0     ☐ ½-½     ☐ 0-1", new_x=XPos.LEFT, new_y=YPos.NEXT)
        pdf.set_font(_FAMILY, "", 7.5)
        pdf.cell(w - 6, 8, "Signatures: ______________________   ______________________")
    pdf.set_dash_pattern()


def render_pdf(sheet: Sheet, now: datetime, paper: str = "a4") -> bytes:
    """The sheet as PDF bytes, on A4 or Letter (``paper``)."""
    wide = sheet.kind in _PLAYER_BY_PLAYER and sum(len(t.columns) for t in sheet.tables) > 12
    pdf = _Document(sheet, landscape=wide, paper=paper)
    pdf.set_creation_date(now)
    pdf.alias_nb_pages()
    pdf.add_page()
    pdf.set_font(_FAMILY, "", 8.5)
    for note in sheet.notes:
        pdf.multi_cell(0, 4, "\n".join(wrap(printable(note), pdf.epw - 1, pdf.get_string_width)),
                       new_x=XPos.LMARGIN, new_y=YPos.NEXT)
    pdf.ln(2)
    if sheet.kind == "slips":
        _slips(pdf)
    else:
        size = 7.5 if sheet.kind == "crosstable" else 9.0
        for table in sheet.tables:
            _table(pdf, table, size)
    return bytes(pdf.output())
