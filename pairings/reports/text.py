"""Terminal text of a sheet, laid out with rich and returned as a plain string.

Names reach rich as :class:`rich.text.Text` (never as markup), already stripped
of control characters and escape sequences, and wrapped in a bounded column by
:func:`pairings.text.wrap` (at spaces and after hyphens; inside a word only when
the word alone is wider than the column), the same rule as the PDF.
"""

from __future__ import annotations

import io

from rich import box
from rich.console import Console
from rich.table import Table as RichTable
from rich.cells import cell_len
from rich.text import Text

from pairings.reports.clean import PREVAIL, plain, show
from pairings.reports.sheets import Sheet, Table
from pairings.text import wrap

NAME_WIDTH = 32


def _cell(value: object, kind: str) -> str:
    text = show(value, kind)
    return "\n".join(wrap(text, NAME_WIDTH, cell_len)) if kind == "name" else text


def _table(table: Table) -> RichTable:
    out = RichTable(title=table.caption, box=box.SIMPLE_HEAD, title_justify="left", pad_edge=False)
    shown = table.printed_columns()
    for i in shown:
        col = table.columns[i]
        right = col.kind in ("number", "points", "rank")
        if col.kind == "name":  # wrapped by us (pairings.text.wrap), the same rule as the PDF
            out.add_column(Text(plain(col.label)), no_wrap=True)
        elif col.kind == "result":
            out.add_column(Text(plain(col.label)), min_width=9)
        else:
            out.add_column(Text(plain(col.label)), justify="right" if right else "left", no_wrap=True)
    for row in table.rows:
        out.add_row(*(Text(_cell(row[i], table.columns[i].kind)) for i in shown))
    return out


def _slips(sheet: Sheet, console: Console) -> None:
    first, second = (plain(s) for s in sheet.sides or ("Player", "Player"))
    cut = "✂ " + "- " * 30
    for row in sheet.tables[0].rows:
        board, _, a, _, b = row
        console.print(Text(cut))
        console.print(Text(f"{plain(sheet.event)} · Round {sheet.round_number} · Board {board}"))
        console.print(Text(f"{first}: {show(a, 'name')}"))
        console.print(Text(f"{second}: {show(b, 'name')}"))
        console.print(Text("Result:  [ ] 1-0   [ ] ½-½   [ ] 0-1"))
        console.print(Text("Signatures: ____________________   ____________________"))
    console.print(Text(cut))


def render_text(sheet: Sheet) -> str:
    """The sheet as plain terminal text: header, notes, tables, the line that rules prevail."""
    width = 100 + 7 * max((len(t.columns) for t in sheet.tables), default=0)
    buffer = io.StringIO()
    console = Console(file=buffer, width=width, color_system=None, force_terminal=False,
                      legacy_windows=False, emoji=False, highlight=False, markup=False)
    console.print(Text(plain(sheet.event)))
    console.print(Text(f"{sheet.title} — {sheet.round_label} · printed {sheet.printed}"))
    for note in sheet.notes:
        console.print(Text(plain(note)))
    console.print()
    if sheet.kind == "slips":
        _slips(sheet, console)
    else:
        for table in sheet.tables:
            console.print(_table(table))
    console.print(Text(PREVAIL))
    return "\n".join(line.rstrip() for line in buffer.getvalue().splitlines()) + "\n"
