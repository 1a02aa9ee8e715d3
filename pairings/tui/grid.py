"""A read-only table that draws only the rows on screen, for rosters and rounds of any size.

Built on textual's line API (:class:`~textual.scroll_view.ScrollView`): the
rows are plain tuples of already-cleaned strings, so replacing two thousand
of them costs a list copy, and each redraw renders the visible lines only.
Columns are sized once per data change; ``flex`` columns share the width the
others leave.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import ClassVar, Sequence

from rich.cells import cell_len, set_cell_size
from rich.segment import Segment
from textual import events
from textual.binding import Binding, BindingType
from textual.geometry import Size
from textual.message import Message
from textual.reactive import reactive
from textual.scroll_view import ScrollView
from textual.strip import Strip

from pairings.tui.text import safe


@dataclass(frozen=True)
class Column:
    key: str
    label: str
    width: int | None = None
    """Fixed width; None sizes the column to its longest cell (up to ``limit``)."""
    flex: bool = False
    """Takes a share of the width the other columns leave."""
    limit: int = 40


def fit(text: str, width: int) -> str:
    """``text`` padded or cut (with an ellipsis) to exactly ``width`` cells."""
    if cell_len(text) <= width:
        return set_cell_size(text, width)
    return set_cell_size(text, max(0, width - 1)) + "…" if width else ""


class Grid(ScrollView, can_focus=True):
    """Rows of text with a cursor row; posts :class:`Grid.Highlighted` and :class:`Grid.Selected`."""

    BINDINGS: ClassVar[list[BindingType]] = [
        Binding("up", "move(-1)", "Up", show=False),
        Binding("down", "move(1)", "Down", show=False),
        Binding("pageup", "page(-1)", "Page up", show=False),
        Binding("pagedown", "page(1)", "Page down", show=False),
        Binding("home", "jump(0)", "First", show=False),
        Binding("end", "jump(-1)", "Last", show=False),
        Binding("enter", "select", "Select", show=False),
    ]
    COMPONENT_CLASSES: ClassVar[set[str]] = {"grid--header", "grid--cursor", "grid--odd"}
    DEFAULT_CSS = """
    Grid { height: 1fr; }
    Grid > .grid--header { text-style: bold; background: $panel; }
    Grid > .grid--cursor { background: $accent 40%; text-style: bold; }
    Grid:focus > .grid--cursor { background: $accent; color: $text; }
    Grid > .grid--odd { background: $surface; }
    """

    cursor: reactive[int] = reactive(0, always_update=True, init=False)

    @dataclass
    class Highlighted(Message):
        grid: "Grid"
        row: int
        key: str

        @property
        def control(self) -> "Grid":
            return self.grid

    @dataclass
    class Selected(Message):
        grid: "Grid"
        row: int
        key: str

        @property
        def control(self) -> "Grid":
            return self.grid

    def __init__(self, *, id: str | None = None) -> None:
        super().__init__(id=id)
        self.columns: list[Column] = []
        self._rows: list[tuple[str, ...]] = []
        self._keys: list[str] = []
        self._index: dict[str, int] = {}
        self._natural: list[int] = []
        """Longest cell per column (header included)."""
        self._widths: list[int] = []

    # -- data ------------------------------------------------------------------------------

    @property
    def row_count(self) -> int:
        return len(self._rows)

    def set_columns(self, columns: Sequence[Column]) -> None:
        self.columns = list(columns)
        self.set_rows([])

    def set_rows(self, rows: Sequence[tuple[str, Sequence[object]]], cursor: int | None = None) -> None:
        """Replace every row: ``(key, cells)``; cells are cleaned of control characters here."""
        self._keys = [key for key, _ in rows]
        self._rows = [tuple(safe(c) for c in cells) for _, cells in rows]
        self._index = {key: i for i, key in enumerate(self._keys)}
        self._natural = [cell_len(c.label) for c in self.columns]
        for row in self._rows:
            for i, text in enumerate(row):
                if cell_len(text) > self._natural[i]:
                    self._natural[i] = cell_len(text)
        self._layout()
        keep = self.cursor if cursor is None else cursor
        self.cursor = max(0, min(keep, len(self._rows) - 1))

    def update_cell(self, key: str, column: str, value: object) -> None:
        i = self._index[key]
        col = [c.key for c in self.columns].index(column)
        row = list(self._rows[i])
        row[col] = safe(value)
        self._rows[i] = tuple(row)
        self.refresh()

    def cell(self, key: str, column: str) -> str:
        return self._rows[self._index[key]][[c.key for c in self.columns].index(column)]

    def index_of(self, key: str) -> int | None:
        return self._index.get(key)

    @property
    def cursor_key(self) -> str | None:
        return self._keys[self.cursor] if self._rows else None

    # -- layout and drawing ----------------------------------------------------------------

    def _layout(self) -> None:
        width = self.size.width or 80
        fixed = [c.width if c.width is not None else min(self._natural[i], c.limit) if not c.flex else 0
                 for i, c in enumerate(self.columns)]
        flex = [i for i, c in enumerate(self.columns) if c.flex]
        spare = width - sum(fixed) - len(self.columns) - 2
        for i in flex:
            fixed[i] = max(6, min(self._natural[i], spare // len(flex))) if spare > 0 else 6
        self._widths = fixed
        self.virtual_size = Size(width, len(self._rows) + 1)
        self.refresh()

    def on_resize(self, event: events.Resize) -> None:
        self._layout()

    def _line(self, cells: Sequence[str]) -> str:
        return " " + " ".join(fit(text, w) for text, w in zip(cells, self._widths))

    def render_line(self, y: int) -> Strip:
        width = self.size.width
        if y == 0:
            style = self.get_component_rich_style("grid--header")
            return Strip([Segment(fit(self._line([c.label for c in self.columns]), width), style)])
        index = int(self.scroll_offset.y) + y - 1
        if index >= len(self._rows):
            return Strip.blank(width, self.rich_style)
        if index == self.cursor:
            style = self.get_component_rich_style("grid--cursor")
        elif index % 2:
            style = self.get_component_rich_style("grid--odd")
        else:
            style = self.rich_style
        return Strip([Segment(fit(self._line(self._rows[index]), width), style)])

    # -- cursor ----------------------------------------------------------------------------

    def watch_cursor(self, old: int, new: int) -> None:
        body = max(1, self.size.height - 1)
        top = int(self.scroll_offset.y)
        if new < top:
            self.scroll_to(y=new, animate=False, immediate=True)
        elif new >= top + body:
            self.scroll_to(y=new - body + 1, animate=False, immediate=True)
        self.refresh()
        if self._rows:
            self.post_message(self.Highlighted(self, new, self._keys[new]))

    def move_to(self, row: int) -> None:
        if self._rows:
            self.cursor = max(0, min(row, len(self._rows) - 1))

    def action_move(self, step: int) -> None:
        self.move_to(self.cursor + step)

    def action_page(self, step: int) -> None:
        self.move_to(self.cursor + step * max(1, self.size.height - 2))

    def action_jump(self, row: int) -> None:
        self.move_to(row if row >= 0 else len(self._rows) - 1)

    def action_select(self) -> None:
        if self._rows:
            self.post_message(self.Selected(self, self.cursor, self._keys[self.cursor]))

    def on_click(self, event: events.Click) -> None:
        row = int(self.scroll_offset.y) + event.y - 1
        if event.y >= 1 and row < len(self._rows):
            self.move_to(row)
