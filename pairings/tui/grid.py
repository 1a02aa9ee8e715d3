"""A read-only table that draws only the rows on screen, for rosters and rounds of any size.

Built on textual's line API (:class:`~textual.scroll_view.ScrollView`): a
table is its row keys and a function making one row's cells, called only for
the rows drawn (and kept until the data changes), so a place with two
thousand rows builds the forty on screen. Columns are sized once per data
change from the widths the place says its cells reach; ``flex`` columns share
the width the others leave.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable, ClassVar, Sequence

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
    least: int = 6
    """A flex column's narrowest width."""
    rank: int = 0
    """Flex columns of a lower rank grow to their longest cell first (names before a result's words)."""


RowMaker = Callable[[int], Sequence[object]]
"""The cells of one row from its index."""


def _no_row(index: int) -> Sequence[object]:
    raise IndexError(index)


def fit(text: str, width: int) -> str:
    """``text`` padded or cut (with an ellipsis) to exactly ``width`` cells."""
    if cell_len(text) <= width:
        return set_cell_size(text, width)
    return set_cell_size(text, max(0, width - 1)) + "…" if width else ""


@dataclass
class _RowMessage(Message):
    """A row of a :class:`Grid` (its ``control`` is the grid, so ``@on(..., "#id")`` works)."""

    grid: "Grid"
    row: int
    key: str

    @property
    def control(self) -> "Grid":
        return self.grid


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
    Grid { height: 1fr; overflow-x: hidden; }
    Grid > .grid--header { text-style: bold; background: $panel; }
    Grid > .grid--cursor { background: $accent 40%; text-style: bold; }
    Grid:focus > .grid--cursor { background: $accent; color: $text; }
    Grid > .grid--odd { background: $surface; }
    """

    cursor: reactive[int] = reactive(0, always_update=True, init=False)

    class Highlighted(_RowMessage):
        """The cursor moved to a row."""

    class Selected(_RowMessage):
        """Enter on a row."""

    def __init__(self, *, id: str | None = None) -> None:
        super().__init__(id=id)
        self.columns: list[Column] = []
        self._keys: Sequence[str] = ()
        self._index: dict[str, int] | None = None
        """Row of each key, built on first use."""
        self._make: RowMaker = _no_row
        self._made: dict[int, tuple[str, ...]] = {}
        """The rows built so far (only those drawn or asked for)."""
        self._natural: list[int] = []
        """Longest cell per column (header included), as far as it is known."""
        self._widths: list[int] = []

    # -- data ------------------------------------------------------------------------------

    @property
    def row_count(self) -> int:
        return len(self._keys)

    def set_columns(self, columns: Sequence[Column]) -> None:
        self.columns = list(columns)
        self.set_rows([])

    def set_rows(self, rows: Sequence[tuple[str, Sequence[object]]], cursor: int | None = None) -> None:
        """Replace every row: ``(key, cells)``; cells are cleaned of control characters here."""
        made = [tuple(safe(c) for c in cells) for _, cells in rows]
        natural = [max((cell_len(row[i]) for row in made), default=0) for i in range(len(self.columns))]
        self.set_source([key for key, _ in rows], made.__getitem__, natural, cursor)

    def set_source(self, keys: Sequence[str], make: RowMaker, natural: Sequence[int | None],
                   cursor: int | None = None) -> None:
        """Replace every row by ``keys`` and ``make(index)``, called only for the rows drawn or read.

        ``natural`` is each column's longest cell, None where it is not worth
        finding out (the column then takes its ``limit``).
        """
        if keys is not self._keys:
            self._keys, self._index = keys, None
        self._make, self._made = make, {}
        self._natural = [max(cell_len(c.label), c.limit if n is None else n) for c, n in zip(self.columns, natural)]
        self._layout()
        keep = self.cursor if cursor is None else cursor
        self.cursor = max(0, min(keep, len(self._keys) - 1))

    def remake(self, make: RowMaker) -> None:
        """Same keys and widths, new cells (for example after a result came in)."""
        self._make, self._made = make, {}
        self.refresh()

    def row(self, index: int) -> tuple[str, ...]:
        """The cells of row ``index``, cleaned, built on first use."""
        made = self._made.get(index)
        if made is None:
            made = self._made[index] = tuple(safe(c) for c in self._make(index))
        return made

    def update_cell(self, key: str, column: str, value: object) -> None:
        i = self._require(key)
        col = [c.key for c in self.columns].index(column)
        row = list(self.row(i))
        row[col] = safe(value)
        self._made[i] = tuple(row)
        self.refresh()

    def cell(self, key: str, column: str) -> str:
        return self.row(self._require(key))[[c.key for c in self.columns].index(column)]

    def index_of(self, key: str) -> int | None:
        if self._index is None:
            self._index = {k: i for i, k in enumerate(self._keys)}
        return self._index.get(key)

    def _require(self, key: str) -> int:
        i = self.index_of(key)
        if i is None:
            raise KeyError(key)
        return i

    @property
    def cursor_key(self) -> str | None:
        return self._keys[self.cursor] if self._keys else None

    # -- layout and drawing ----------------------------------------------------------------

    def _layout(self) -> None:
        width = self.size.width or 80
        fixed = [c.width if c.width is not None else min(self._natural[i], c.limit) if not c.flex else 0
                 for i, c in enumerate(self.columns)]
        flex = [i for i, c in enumerate(self.columns) if c.flex]
        for i in flex:
            fixed[i] = min(self.columns[i].least, self._natural[i])
        left = width - sum(fixed) - len(self.columns) - 2  # a space before each column, the scrollbar
        for rank in sorted({self.columns[i].rank for i in flex}):
            # Within a rank, the shortest needs are met first and what they leave goes to the others.
            waiting = sorted((i for i in flex if self.columns[i].rank == rank), key=lambda i: self._natural[i])
            while waiting and left > 0:
                i = waiting.pop(0)
                grow = min(self._natural[i] - fixed[i], left // (len(waiting) + 1))
                fixed[i] += max(0, grow)
                left -= max(0, grow)
        self._widths = fixed
        self.virtual_size = Size(width, len(self._keys) + 1)
        self.refresh()

    def on_resize(self, event: events.Resize) -> None:
        self._layout()
        self._show_cursor()

    def _line(self, cells: Sequence[str]) -> str:
        return " " + " ".join(fit(text, w) for text, w in zip(cells, self._widths))

    def render_line(self, y: int) -> Strip:
        width = self.size.width
        if y == 0:
            style = self.get_component_rich_style("grid--header")
            return Strip([Segment(fit(self._line([c.label for c in self.columns]), width), style)])
        index = int(self.scroll_offset.y) + y - 1
        if index >= len(self._keys):
            return Strip.blank(width, self.rich_style)
        if index == self.cursor:
            style = self.get_component_rich_style("grid--cursor")
        elif index % 2:
            style = self.get_component_rich_style("grid--odd")
        else:
            style = self.rich_style
        return Strip([Segment(fit(self._line(self.row(index)), width), style)])

    # -- cursor ----------------------------------------------------------------------------

    def _show_cursor(self) -> None:
        """Scroll so that the cursor row is on screen (again after a resize: rows set before the
        grid had a size were scrolled against a height of nothing)."""
        body = max(1, self.size.height - 1)
        top, new = int(self.scroll_offset.y), self.cursor
        if new < top:
            self.scroll_to(y=new, animate=False, immediate=True)
        elif new >= top + body:
            self.scroll_to(y=new - body + 1, animate=False, immediate=True)

    def watch_cursor(self, old: int, new: int) -> None:
        self._show_cursor()
        self.refresh()
        if self._keys:
            self.post_message(self.Highlighted(self, new, self._keys[new]))

    def move_to(self, row: int) -> None:
        if self._keys:
            self.cursor = max(0, min(row, len(self._keys) - 1))

    def action_move(self, step: int) -> None:
        self.move_to(self.cursor + step)

    def action_page(self, step: int) -> None:
        self.move_to(self.cursor + step * max(1, self.size.height - 2))

    def action_jump(self, row: int) -> None:
        self.move_to(row if row >= 0 else len(self._keys) - 1)

    def action_select(self) -> None:
        if self._keys:
            self.post_message(self.Selected(self, self.cursor, self._keys[self.cursor]))

    def on_click(self, event: events.Click) -> None:
        row = int(self.scroll_offset.y) + event.y - 1
        if event.y >= 1 and row < len(self._keys):
            self.move_to(row)
