"""What every place of the desk shares: the screen base class and its link to the app.

A place (Roster, Round, Results, Standings, Log) shows one
:class:`~pairings.state.EventState` at a time through :meth:`Place.show`; the
app calls it after every change and whenever the place comes back into view
with a state it has not shown yet. Changes go through :meth:`Place.apply`,
which hands the pure action to the app together with the head of the state
the organiser was looking at, so a decision made on a stale screen is refused.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Callable, Sequence

from rich.cells import cell_len
from textual import events
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal
from textual.content import Content
from textual.screen import Screen
from textual.timer import Timer
from textual.widgets import Label

from pairings.events import Event
from pairings.state import EventState
from pairings.tui.text import cell, round_status

if TYPE_CHECKING:
    from pairings.tui.app import DeskApp

Action = Callable[[EventState], Sequence[Event]]


class KeyList(Label):
    """Keys and what they do on one line; a click on one presses it (as textual's footer did)."""

    def __init__(self, keys: Sequence[tuple[str, str, str]], classes: str) -> None:
        """``keys``: (key to press, key shown, description)."""
        parts: list[str | tuple[str, str]] = []
        self._spans: list[tuple[int, int, str]] = []
        at = 0
        for key, shown, description in keys:
            text = f" {shown} "
            parts += [(text, "bold $footer-key-foreground"), description]
            self._spans.append((at, at + cell_len(text + description), key))
            at += cell_len(text + description)
        super().__init__(Content.assemble(*parts), classes=classes)

    def on_mouse_down(self, event: events.MouseDown) -> None:
        self.press_at(event.x)

    def press_at(self, x: int) -> None:
        for start, end, key in self._spans:
            if start <= x < end:
                self.app.simulate_key(key)
                return


class Notice(Label):
    """The notice in place of the keys; a click on it is a click on the key it covers."""

    def on_mouse_down(self, event: events.MouseDown) -> None:
        line = self.parent
        if isinstance(line, KeyLine):
            line.clear_notice()
            line.query_one(".keys", KeyList).press_at(event.x)


NOTICE_SECONDS = 4.0
"""How long a notice stays on the bottom line unless a newer one replaces it."""
NOTICE_WORDS = {"error": "problem: ", "warning": "note: ", "information": ""}
"""Said before a notice, so its weight reads without colour."""


class KeyLine(Horizontal):
    """The bottom line: the place's keys, then the desk's, and the palette key at the right.

    Drawn once when the place is made. (textual's ``Footer`` rebuilds a widget
    per key each time the focus or the screen changes, a tenth of a second on
    every switch of place; the desk's keys never change while it runs.)
    A notice (:meth:`say`) takes the keys' place for a few seconds: one line,
    replaced by the next (textual's toasts stacked up over the data).
    """

    DEFAULT_CSS = """
    KeyLine { height: 1; background: $footer-background; }
    KeyLine > .keys { width: 1fr; }
    KeyLine > .notice { width: 1fr; padding: 0 1; display: none; text-style: bold; }
    KeyLine > .notice.-error { color: $error; }
    KeyLine > .notice.-warning { color: $warning; }
    KeyLine > .notice.-information { color: $success; }
    KeyLine.-noticed > .keys { display: none; }
    KeyLine.-noticed > .notice { display: block; }
    KeyLine > .palette { width: auto; padding: 0 1 0 0; }
    """

    def __init__(self, bindings: Sequence[object]) -> None:
        super().__init__()
        self._shown_keys = [b for b in bindings if isinstance(b, Binding) and b.show and b.description]
        self._notice_timer: Timer | None = None

    def compose(self) -> ComposeResult:
        yield KeyList([(b.key.split(",")[0], self.app.get_key_display(b), b.description) for b in self._shown_keys],
                      classes="keys")
        yield Notice("", classes="notice")
        yield KeyList([("ctrl+p", "▏^p", "palette")], classes="palette")

    def say(self, text: str, severity: str = "information", seconds: float | None = None) -> None:
        """Show ``text`` on one line instead of the keys, replacing the notice before it."""
        notice = self.query_one(Notice)
        notice.set_classes(f"notice -{severity}")
        notice.update(cell(NOTICE_WORDS.get(severity, "") + " · ".join(text.splitlines())))
        self.add_class("-noticed")
        if self._notice_timer is not None:
            self._notice_timer.stop()
        self._notice_timer = self.set_timer(seconds or NOTICE_SECONDS, self.clear_notice)

    @property
    def notice(self) -> str:
        """The notice on the line now ("" when the keys show)."""
        return str(self.query_one(Notice).content) if self.has_class("-noticed") else ""

    def clear_notice(self) -> None:
        self.remove_class("-noticed")


class Place(Screen[None]):
    """One place of the desk; subclasses set ``TITLE``, ``BINDINGS`` and :meth:`body`."""

    TITLE = ""

    def __init__(self) -> None:
        super().__init__()
        self.shown_head = -1
        """Head of the state on screen (-1: nothing shown yet)."""

    @property
    def desk(self) -> "DeskApp":
        from pairings.tui.app import DeskApp

        assert isinstance(self.app, DeskApp)
        return self.app

    @property
    def state(self) -> EventState:
        return self.desk.state

    def compose(self) -> ComposeResult:
        yield Label("", id="topline", classes="topline")
        yield from self.body()
        yield KeyLine([*self.BINDINGS, *self.app.BINDINGS])

    def body(self) -> ComposeResult:
        yield from ()

    def on_screen_resume(self) -> None:
        if self.shown_head != self.state.head:
            self.refresh_place()

    def refresh_place(self) -> None:
        state = self.state
        self.query_one("#topline", Label).update(
            cell(f"{state.settings.name} · {self.TITLE} · {round_status(state)}")
        )
        self.show(state)
        self.shown_head = state.head

    def show(self, state: EventState) -> None:
        """Bring the widgets up to ``state``."""

    def apply(self, action: Action, done: str, base: int | None = None) -> bool:
        """Append what ``action`` returns; ``base`` is the head the decision was made on."""
        return self.desk.apply(action, done, self.shown_head if base is None else base)
