"""The desk application: five places over one event store.

:class:`DeskApp` receives an open :class:`~pairings.store.EventStore` and never
opens files itself except to write a printout. Every change is a pure action
from :mod:`pairings.actions` applied through :meth:`DeskApp.apply`, which
refuses (writes nothing) when the organiser's decision was made on a state
that is no longer the file's. A timer polls the file for writes from other
processes and reloads.
"""

from __future__ import annotations

import gc
from collections import deque
from dataclasses import dataclass
from pathlib import Path
from time import monotonic
from typing import Iterable

from textual import events, on, work
from textual.app import App, SystemCommand
from textual.binding import Binding
from textual.message import Message
from textual.notifications import SeverityLevel
from textual.dom import DOMNode
from textual.screen import Screen

from pairings.errors import ConflictError, InputError, RosterError
from pairings.printouts import KINDS, ROUND_KINDS
from pairings.state import EventState
from pairings.store import EventStore
from pairings.tui.base import Action, KeyLine, Place
from pairings.tui.dialogs import Dialog, Field, FormDialog, HelpDialog, open_dialog
from pairings.tui.log import LogPlace
from pairings.tui.offload import Job, Offload
from pairings.tui.results import ResultsPlace
from pairings.tui.roster import RosterPlace
from pairings.tui.round import WIDE, RoundPlace
from pairings.tui.settings import SettingsPlace
from pairings.tui.standings import StandingsPlace

PLACES: dict[str, type[Place]] = {
    "roster": RosterPlace,
    "round": RoundPlace,
    "results": ResultsPlace,
    "standings": StandingsPlace,
    "log": LogPlace,
    "settings": SettingsPlace,
}
"""The places in their key order (F2 … F6, and F8 for the settings)."""

FORMATS = {"text": "txt", "csv": "csv", "json": "json", "html": "html", "pdf": "pdf"}


def _key_label(key: str) -> str:
    return ", ".join(k.upper() if k.startswith("f") and k[1:].isdigit() else k for k in key.split(","))


def binding_rows(bindings: Iterable[object]) -> list[tuple[str, str]]:
    """(keys, description) for every binding with a description."""
    rows = []
    for b in bindings:
        if isinstance(b, Binding) and b.description:
            rows.append((b.key_display or _key_label(b.key), b.description))
    return rows


QUIET_SECONDS = 3.0
"""After this long without a key the desk tidies its memory (a full collection, 0.1 s on a big event)."""


def settle_heap() -> None:
    """Collect everything, then move what is alive out of the cycle collector's sight (``gc.freeze``).

    A big event is a few hundred thousand long-lived objects (the log, the
    folded states, the screens). A full collection walks all of them, about
    0.1 s on a 2,000-player event, and left to itself it strikes in the middle
    of whichever key allocates last. Frozen objects are still freed by
    reference counting; the next settle (with the collector's thresholds set
    by :meth:`DeskApp.on_mount`, the only full collections) unfreezes and
    collects them too, so no cycle is kept for good.
    """
    gc.unfreeze()
    gc.collect()
    gc.freeze()


class DeskApp(App[None]):
    """The full-screen desk on one event file."""

    CSS_PATH = "desk.tcss"
    HORIZONTAL_BREAKPOINTS = [(0, "-narrow"), (WIDE, "-wide")]
    TITLE = "pairings desk"
    BINDINGS = [
        Binding("f1", "help", "Help"),
        Binding("f2", "place('roster')", "Roster"),
        Binding("f3", "place('round')", "Round"),
        Binding("f4", "place('results')", "Results"),
        Binding("f5", "place('standings')", "Standings"),
        Binding("f6", "place('log')", "Log"),
        Binding("f7", "output", "Print"),
        Binding("f8", "place('settings')", "Settings"),
        Binding("ctrl+q", "quit", "Quit", priority=True),
    ]

    @dataclass
    class Exported(Message):
        """A printout was written (or could not be)."""

        path: Path | None
        problem: str = ""

    def __init__(self, store: EventStore, *, poll_seconds: float = 1.0, start: str = "round") -> None:
        super().__init__()
        self.store = store
        self.state: EventState = store.state
        self._poll_seconds = poll_seconds
        self._start = start
        self.last_output: Path | None = None
        """Where the latest printout went."""
        self._last_key = monotonic()
        self._keys: deque[events.Key] = deque()
        """Keys read and not handled yet (see :meth:`_hand_on_keys`)."""
        self._key_in_hand = False
        self.offload = Offload(store.path)
        """Where the engine works for the desk (a child process for big fields)."""
        for name, place in PLACES.items():
            self.add_mode(name, place)

    async def on_mount(self) -> None:
        # Every place is built now, so the first visit to one is a switch, not a build (0.1 s and more).
        for name in PLACES:
            if name != self._start:
                await self.switch_mode(name)
        await self.switch_mode(self._start)
        self.set_interval(self._poll_seconds, self.poll)
        young, middle, _ = gc.get_threshold()
        gc.set_threshold(young, middle, 1000)  # full collections: when the desk is quiet (a safety net besides)
        self.call_after_refresh(settle_heap)
        self.set_interval(QUIET_SECONDS / 2, self.tidy)

    async def on_event(self, event: events.Event) -> None:
        if isinstance(event, events.Key) and not event.is_forwarded:
            self._last_key = monotonic()
            self._keys.append(event)
            await self._hand_on_keys()
            return
        await super().on_event(event)

    async def _hand_on_keys(self) -> None:
        """Handle the next key typed once the one before it has been handled all the way.

        textual hands a key to the focused widget's queue and runs a place's
        binding only when the key has bubbled back up, so a fast typist's next
        keys went out to the old focus before the previous key had opened a
        dialog or moved to the next field. Keys wait here, in order, while one
        is on its way (see :meth:`_after`) or while a dialog just opened has no
        field to type into yet (``Dialog.ready``).
        """
        while self._keys and not self._key_in_hand and getattr(self.screen, "ready", True):
            key = self._keys.popleft()
            target = self.focused or self.screen
            self._key_in_hand = True
            await super().on_event(key)
            self._after(target)

    def _after(self, node: DOMNode | None) -> None:
        """Go on with the keys once ``node`` and every node above it have handled what they hold.

        A key not used up by a widget bubbles up through each parent's queue;
        a call queued behind it at each step runs once it has moved on.
        """
        if node is None or node is self:
            self.call_later(self._key_handled)
        elif not node.call_later(self._after, node.parent):
            self._after(node.parent)

    async def _key_handled(self) -> None:
        self._key_in_hand = False
        await self._hand_on_keys()

    @on(Dialog.Ready)
    async def dialog_ready(self) -> None:
        await self._hand_on_keys()

    def tidy(self) -> None:
        """A full collection once the keys have been quiet for a while and something new was kept."""
        if monotonic() - self._last_key > QUIET_SECONDS and gc.get_count()[2] > 0:
            settle_heap()

    def on_unmount(self) -> None:
        self.offload.close()

    def notify(self, message: str, *, title: str = "", severity: SeverityLevel = "information",
               timeout: float | None = None, markup: bool = False) -> None:
        """A notice on the place's bottom line, one at a time (see :meth:`KeyLine.say`); over a dialog, a toast."""
        place = self.screen
        if isinstance(place, Place) and place.is_mounted:
            place.query_one(KeyLine).say(str(message), severity, timeout)
        else:
            super().notify(message, title=title, severity=severity, timeout=timeout, markup=False)

    # -- state -----------------------------------------------------------------------------

    def places_on_screen(self) -> list[Place]:
        return [s for s in self.screen_stack if isinstance(s, Place)]

    def refresh_places(self) -> None:
        for place in self.places_on_screen():
            place.refresh_place()

    def poll(self) -> None:
        """Reload when another process wrote to the event file."""
        try:
            changed = self.store.changed_elsewhere()
        except InputError as exc:
            self.notify(str(exc), severity="error")
            return
        if changed:
            self.state = self.store.reload()
            self.refresh_places()
            self.notify("changed elsewhere, reloaded", severity="warning")

    def apply(self, action: Action, done: str, base: int) -> bool:
        """Append ``action(state)``; refused when the file's head is no longer ``base``.

        Returns True when the events were written.
        """
        try:
            events = action(self.store.state)
            self.state = self.store.append(events, expected=base)
        except ConflictError:
            self.state = self.store.state
            self.refresh_places()
            self.notify("changed elsewhere, reloaded: nothing written; check and try again", severity="error")
            return False
        except RosterError as exc:
            self.notify("\n".join([str(exc), *exc.problems[:8]]), severity="error", timeout=12)
            return False
        except InputError as exc:
            self.notify(str(exc), severity="error")
            return False
        self.refresh_places()
        if done:
            self.notify(done)
        return True

    # -- places, help, palette -------------------------------------------------------------

    def action_place(self, name: str) -> None:
        self.switch_mode(name)

    def help_sections(self) -> list[tuple[str, list[tuple[str, str]]]]:
        sections = [("Everywhere", binding_rows(self.BINDINGS) + [("ctrl+p", "search every action")])]
        sections += [(place.TITLE, binding_rows(place.BINDINGS)) for place in PLACES.values()]
        return sections

    def action_help(self) -> None:
        open_dialog(self, HelpDialog(self.help_sections()))

    def get_system_commands(self, screen: Screen[object]) -> Iterable[SystemCommand]:
        for b in self.BINDINGS:
            if isinstance(b, Binding) and b.description:
                yield SystemCommand(b.description, f"key {_key_label(b.key)}", self._runner(None, b.action))
        for mode, place in PLACES.items():
            for b in place.BINDINGS:
                if isinstance(b, Binding) and b.description:
                    yield SystemCommand(
                        f"{place.TITLE}: {b.description}", f"key {b.key_display or _key_label(b.key)}",
                        self._runner(mode, b.action),
                    )
        yield from super().get_system_commands(screen)

    def _runner(self, mode: str | None, action: str):  # type: ignore[no-untyped-def]
        async def run() -> None:
            if mode is None:
                await self.run_action(action)
                return
            await self.switch_mode(mode)
            await self.screen.run_action(action)

        return run

    # -- printouts -------------------------------------------------------------------------

    def default_output(self, kind: str, fmt: str) -> Path:
        number = self.state.last_round.number if self.state.last_round else 0
        stem = self.store.path.stem
        tail = f"-round{number}" if kind in ROUND_KINDS and number else ""
        return self.store.path.with_name(f"{stem}-{kind}{tail}.{FORMATS.get(fmt, 'txt')}")

    def action_output(self) -> None:
        def check(values: dict[str, str]) -> str | None:
            if values["round"] and not values["round"].isdigit():
                return "round must be a number (or empty for the latest)"
            if not Path(values["file"] or ".").expanduser().parent.is_dir():
                return f"folder {Path(values['file']).parent} does not exist"
            return None

        def chosen(values: dict[str, str] | None) -> None:
            if values is None:
                return
            path = Path(values["file"]).expanduser() if values["file"] else self.default_output(
                values["kind"], values["format"])
            number = int(values["round"]) if values["round"] else None
            self.notify(f"writing {values['kind']} ({values['format']}) …")
            self.write_report(self.state, values["kind"], values["format"], number, path)

        def follow(values: dict[str, str]) -> dict[str, str]:
            return {"file": self.default_output(values["kind"], values["format"]).name}

        fields = [
            Field("kind", "What (← →, or type the first letters)", "pairings", choices=KINDS),
            Field("format", "Format", "text", choices=tuple(FORMATS)),
            Field("round", "Round (empty: the latest)", ""),
            Field("file", "File (empty: the name shown, beside the event file)", "",
                  self.default_output("pairings", "text").name),
        ]
        open_dialog(self, FormDialog("Print / export", fields, check, follow=follow), chosen)

    @work(thread=True, exclusive=True, group="output", description="write a printout")
    def write_report(self, state: EventState, kind: str, fmt: str, number: int | None, path: Path) -> None:
        outcome = self.offload.run(state, Job("report", state.head, report=(kind, fmt, number, str(path))))
        self.post_message(self.Exported(None, outcome.problem) if outcome.problem else self.Exported(path))

    @on(Exported)
    def exported(self, message: Exported) -> None:
        if message.path is None:
            self.notify(f"not written: {message.problem}", severity="error")
        else:
            self.last_output = message.path
            self.notify(f"written to {message.path}", timeout=10)


def run_desk(path: Path) -> None:
    """Open the event file at ``path`` in the desk until the organiser quits."""
    with EventStore.open(path) as store:
        app = DeskApp(store)
        try:
            app.run()
        finally:
            app.offload.close()
