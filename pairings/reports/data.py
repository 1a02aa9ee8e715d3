"""CSV and JSON of a sheet: data for spreadsheets and programs, with player ids.

CSV writes each of the sheet's tables with its header row, tables separated by
one empty line; every text cell is neutralised against formula injection.
JSON of the standings is exactly the interchange list of ``design.md``.
"""

from __future__ import annotations

import csv
import io
import json

from pairings.points import Points, points_number
from pairings.reports.clean import csv_cell, shared_rank
from pairings.reports.sheets import Cell, Sheet


def _data(value: Cell) -> str | int | float | None:
    """A cell as data: points as numbers (:func:`~pairings.points.points_number`), the rest as it is."""
    return points_number(value) if isinstance(value, Points) else value


def _csv_value(value: Cell, kind: str) -> object:
    if kind == "rank" and value is not None:
        return shared_rank(str(value))
    return csv_cell(_data(value))


def render_csv(sheet: Sheet) -> str:
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    for n, table in enumerate(sheet.tables):
        if n:
            writer.writerow([])
        writer.writerow([csv_cell(c.key) for c in table.columns])
        for row in table.rows:
            writer.writerow([_csv_value(v, c.kind) for v, c in zip(row, table.columns)])
    return buffer.getvalue()


def render_json(sheet: Sheet) -> str:
    document = {
        "kind": sheet.kind,
        "event": sheet.event,
        "round": sheet.round_number,
        "title": f"{sheet.title} — {sheet.round_label}",
        "printed": sheet.printed,
        "notes": list(sheet.notes),
        "tables": [
            {"caption": t.caption, "rows": [{c.key: _data(v) for c, v in zip(t.columns, row)} for row in t.rows]}
            for t in sheet.tables
        ],
    }
    return json.dumps(document, ensure_ascii=False, indent=2) + "\n"


def standings_json(rows: list[dict[str, object]]) -> str:
    return json.dumps(rows, ensure_ascii=False, indent=2) + "\n"
