"""Terminal text of a sheet, returned as a plain string.

Names are already stripped of control characters and escape sequences, and
wrapped in a bounded column by :func:`pairings.text.wrap` (at spaces and after
hyphens; inside a word only when the word alone is wider than the column), the
same rule as the PDF.

The tables are laid out here, line by line, in the layout of rich's
``SIMPLE_HEAD`` table (a title, a rule under the header, one space between
columns): a thousand-row standings table takes milliseconds this way and
seconds through rich's general renderer. rich itself lays out only what needs
its wrapping: a table wider than the page, a title wider than its table, a
line of text wider than the page (then as :class:`rich.text.Text`, never as
markup). Both give the same text (tests/reports compare them).
"""

from __future__ import annotations

import io
from typing import TYPE_CHECKING

from rich.cells import cell_len

from pairings.reports.clean import PREVAIL, plain, show
from pairings.reports.sheets import Sheet, Table
from pairings.text import wrap

if TYPE_CHECKING:
    from rich.console import Console
    from rich.table import Table as RichTable

OWN_LAYOUT = True
"""Lay tables and lines out here; False hands everything to rich (the reference for tests and the benchmark)."""
NAME_WIDTH = 32
RESULT_WIDTH = 9
"""Result columns are at least this wide (room for a result written in by hand)."""
RIGHT = ("number", "points", "rank")


def _cell(value: object, kind: str) -> str:
    text = show(value, kind)
    return "\n".join(wrap(text, NAME_WIDTH, cell_len)) if kind == "name" else text


def _console(width: int, buffer: io.StringIO) -> Console:
    from rich.console import Console

    return Console(file=buffer, width=width, color_system=None, force_terminal=False,
                   legacy_windows=False, emoji=False, highlight=False, markup=False)


def _by_rich(width: int, item: Table | str) -> list[str]:
    """``item`` laid out by rich (a table, or one line of text) at ``width`` cells."""
    from rich.text import Text

    buffer = io.StringIO()
    console = _console(width, buffer)
    console.print(_rich_table(item) if isinstance(item, Table) else Text(item))
    return buffer.getvalue().splitlines()


def _rich_table(table: Table) -> RichTable:
    from rich import box
    from rich.table import Table as RichTable
    from rich.text import Text

    out = RichTable(title=table.caption, box=box.SIMPLE_HEAD, title_justify="left", pad_edge=False)
    shown = table.printed_columns()
    for i in shown:
        col = table.columns[i]
        if col.kind == "name":  # wrapped by us (pairings.text.wrap), the same rule as the PDF
            out.add_column(Text(plain(col.label)), no_wrap=True)
        elif col.kind == "result":
            out.add_column(Text(plain(col.label)), min_width=RESULT_WIDTH)
        else:
            out.add_column(Text(plain(col.label)), justify="right" if col.kind in RIGHT else "left",
                           no_wrap=True)
    for row in table.rows:
        out.add_row(*(Text(_cell(row[i], table.columns[i].kind)) for i in shown))
    return out


def _line(text: str, width: int) -> list[str]:
    """One line of text; rich wraps it when it is wider than the page."""
    if not OWN_LAYOUT or "\n" in text or cell_len(text) > width:
        return _by_rich(width, text)
    return [text]


def _table(table: Table, width: int) -> list[str]:
    """The table in rich's SIMPLE_HEAD layout, without padding at the outer edges.

    Each column is as wide as its widest line (label included; a result
    column at least :data:`RESULT_WIDTH`), plus one space of padding on
    each inner side; columns are joined by one space and the table has a
    one-space edge on each side, with a blank top and bottom edge line.
    """
    if not OWN_LAYOUT:
        return _by_rich(width, table)
    shown = table.printed_columns()
    kinds = [table.columns[i].kind for i in shown]
    head = [plain(table.columns[i].label).split("\n") for i in shown]
    body = [[_cell(row[i], k).split("\n") for i, k in zip(shown, kinds)] for row in table.rows]
    content = [max(cell_len(x) for cell in [head[c], *(r[c] for r in body)] for x in cell)
               for c in range(len(shown))]
    content = [max(w, RESULT_WIDTH) if k == "result" else w for w, k in zip(content, kinds)]
    last = len(shown) - 1
    pads = [(0 if c == 0 else 1, 0 if c == last else 1) for c in range(len(shown))]
    total = sum(content) + sum(a + b for a, b in pads) + 2 + last
    caption = table.caption or ""
    if not shown or min(w + a + b for w, (a, b) in zip(content, pads)) < 1 or total > width \
            or cell_len(caption) > total:
        return _by_rich(width, table)

    def row(cells: list[list[str]]) -> list[str]:
        height = max(len(c) for c in cells)
        out = []
        for k in range(height):
            parts = []
            for c, (lines, w, (a, b)) in enumerate(zip(cells, content, pads)):
                text = lines[k] if k < len(lines) else ""
                gap = " " * (w - cell_len(text))
                text = gap + text if kinds[c] in RIGHT else text + gap
                parts.append(" " * a + text + " " * b)
            out.append(" " + " ".join(parts) + " ")
        return out

    lines = [caption] if caption else []
    lines.append("")  # the blank top edge
    lines += row(head)
    lines.append(" " + "─".join("─" * (w + a + b) for w, (a, b) in zip(content, pads)) + " ")
    for cells in body:
        lines += row(cells)
    lines.append("")  # the blank bottom edge
    return lines


def _slips(sheet: Sheet, width: int) -> list[str]:
    first, second = (plain(s) for s in sheet.sides or ("Player", "Player"))
    cut = "✂ " + "- " * 30
    out: list[str] = []
    for row in sheet.tables[0].rows:
        board, _, a, _, b = row
        for text in (cut, f"{plain(sheet.event)} · Round {sheet.round_number} · Board {board}",
                     f"{first}: {show(a, 'name')}", f"{second}: {show(b, 'name')}",
                     "Result:  [ ] 1-0   [ ] ½-½   [ ] 0-1",
                     "Signatures: ____________________   ____________________"):
            out += _line(text, width)
    return out + _line(cut, width)


def render_text(sheet: Sheet) -> str:
    """The sheet as plain terminal text: header, notes, tables, the line that rules prevail."""
    width = 100 + 7 * max((len(t.columns) for t in sheet.tables), default=0)
    lines = _line(plain(sheet.event), width)
    lines += _line(f"{sheet.title} — {sheet.round_label} · printed {sheet.printed}", width)
    for note in sheet.notes:
        lines += _line(plain(note), width)
    lines.append("")
    if sheet.kind == "slips":
        lines += _slips(sheet, width)
    else:
        for table in sheet.tables:
            lines += _table(table, width)
    lines += _line(PREVAIL, width)
    return "\n".join(line.rstrip() for line in lines) + "\n"
