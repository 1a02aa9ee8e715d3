"""What every place of the desk shares: the screen base class and its link to the app.

A place (Roster, Round, Results, Standings, Log) shows one
:class:`~pairings.state.EventState` at a time through :meth:`Place.show`; the
app calls it after every change and whenever the place comes back into view
with a state it has not shown yet. Changes go through :meth:`Place.apply`,
which hands the pure action to the app together with the head of the state
the organiser was looking at, so a decision made on a stale screen is refused.
"""

from __future__ import annotations

from typing import Callable, Protocol, Sequence, runtime_checkable

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
from pairings.state import EventState, Result
from pairings.store import EventStore
from pairings.tui.offload import Offload
from pairings.tui.text import RESULT_WORDS, cell, round_status, short_result

Action = Callable[[EventState], Sequence[Event]]


@runtime_checkable
class Desk(Protocol):
    """What a place needs of the app it runs in (:class:`pairings.tui.app.DeskApp` is one)."""

    store: EventStore
    state: EventState
    offload: Offload

    def apply(self, action: Action, done: str, base: int) -> bool:
        """Append what ``action`` returns, made on the state at head ``base``; False when refused."""
        ...


SHORT_LABELS = {
    "Draft next": "Draft", "Pin board": "Pin", "Forbid pair": "Forbid", "To/from bye": "Bye",
    "Discard draft": "Discard", "Earlier round": "Earlier", "Later round": "Later",
    "Add player": "Add", "Request bye": "Bye", "Mark absent": "Absent", "Cancel bye": "No bye",
    "Import CSV": "Import", "Clear result": "Clear", "Undo last action": "Undo", "Read whole": "Read", "Why panel": "Why", "palette": "",
    **{RESULT_WORDS[r]: short_result(r) for r in Result},
}
"""What a key is called on the bottom line when the full words do not fit (F1 lists them in full)."""

KEPT_KEYS = ("help", "why")
"""Actions whose key stays on the bottom line however narrow (F1 lists every key; w opens the Why panel)."""

KeyEntry = tuple[str, str, str, bool]
"""(key to press, key shown, description, kept when the line is short of room)."""


class KeyList(Label):
    """Keys and what they do on one line; a click on one presses it (as textual's footer did).

    The line is made for its width: the full words when they fit, else the
    short ones (``SHORT_LABELS``), then whole entries left out from the end
    (never a kept one, such as F1 for the full list), so no key is cut in half.
    """

    def __init__(self, keys: Sequence[KeyEntry], classes: str, partner: "KeyList | None" = None) -> None:
        """``partner``: a list beside this one that takes its short words too when this one must."""
        self._keys = list(keys)
        self._spans: list[tuple[int, int, str]] = []
        self._made_for = -1
        self._partner = partner
        self._short = False
        super().__init__(self._make(None), classes=classes)

    def _make(self, width: int | None) -> Content:
        entries = [(key, shown, words) for key, shown, words, _ in self._keys]

        def length(chosen: Sequence[tuple[str, str, str]]) -> int:
            return sum(cell_len(f" {shown} {words}") for _, shown, words in chosen)

        short = self._short or width is not None and length(entries) > width
        if self._partner is not None:
            self._partner.shorten(short)
        if short:
            entries = [(key, shown, SHORT_LABELS.get(words, words)) for key, shown, words in entries]
            kept = [k[3] for k in self._keys]
            while width is not None and length(entries) > width and not all(kept):
                drop = max(i for i, keep in enumerate(kept) if not keep)
                del entries[drop], kept[drop]
        parts: list[str | tuple[str, str]] = []
        self._spans = []
        at = 0
        for key, shown, words in entries:
            text = f" {shown} "
            parts += [(text, "bold $footer-key-foreground"), words]
            self._spans.append((at, at + cell_len(text + words), key))
            at += cell_len(text + words)
        return Content.assemble(*parts)

    def on_resize(self, event: events.Resize) -> None:
        if event.size.width != self._made_for:
            self._made_for = event.size.width
            self.update(self._make(event.size.width))

    def shorten(self, short: bool) -> None:
        """Use the short words (or the full ones again)."""
        if short != self._short:
            self._short = short
            self.update(self._make(self._made_for if self._made_for >= 0 else None))

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
        palette = KeyList([("ctrl+p", "▏^p", "palette", True)], classes="palette")
        yield KeyList([(b.key.split(",")[0], self.app.get_key_display(b), b.description, b.action in KEPT_KEYS)
                       for b in self._shown_keys], classes="keys", partner=palette)
        yield Notice("", classes="notice")
        yield palette

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
    def desk(self) -> Desk:
        assert isinstance(self.app, Desk)
        return self.app

    @property
    def state(self) -> EventState:
        return self.desk.state

    def compose(self) -> ComposeResult:
        with Horizontal(id="topline", classes="topline"):
            yield Label("", id="topline-event")
            yield Label("", id="topline-state")
        yield from self.body()
        yield KeyLine([*self.BINDINGS, *self.app.BINDINGS])

    def body(self) -> ComposeResult:
        yield from ()

    def on_screen_resume(self) -> None:
        if self.shown_head != self.state.head:
            self.refresh_place()

    def refresh_place(self) -> None:
        state = self.state
        # The event's name gives way first: where the event stands is never cut (80 columns).
        self.query_one("#topline-event", Label).update(cell(state.settings.name))
        self.query_one("#topline-state", Label).update(cell(f"{self.TITLE} · {round_status(state)}"))
        self.show(state)
        self.shown_head = state.head

    def show(self, state: EventState) -> None:
        """Bring the widgets up to ``state``."""

    def apply(self, action: Action, done: str, base: int | None = None) -> bool:
        """Append what ``action`` returns; ``base`` is the head the decision was made on."""
        return self.desk.apply(action, done, self.shown_head if base is None else base)
