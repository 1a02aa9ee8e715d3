"""Helpers for driving the desk with textual's pilot: typing, waiting for workers, small events."""

from __future__ import annotations

from pathlib import Path
from typing import Any

from textual import events
from textual.worker import WorkerCancelled

from pairings import actions
from pairings.store import EventStore
from pairings.tui.app import DeskApp

# Invented names (the demo's fixed lists): nobody real is meant.
PLAYERS: list[tuple[str, str, str]] = [
    ("Ansel Ash", "1910", "Old Mill"),
    ("Brisa Bray", "1785", ""),
    ("Corvin Cole", "1640", "Riverside"),
    ("Della Dun", "", ""),
    ("Eamon Esk", "1555", ""),
]


async def settle(app: DeskApp, pilot: Any) -> None:
    """Let every worker finish and every message be handled (instead of sleeping)."""
    for _ in range(3):
        try:
            await app.workers.wait_for_complete()
        except WorkerCancelled:  # an exclusive worker superseded by a newer one: wait for that one
            continue
        await pilot.pause()


async def type_text(pilot: Any, text: str) -> None:
    """Put ``text`` into the focused field as one paste (a user may paste as well as type).

    A key press costs the pilot at least 40 ms of idle waiting, so typing every field key by key was
    most of the desk tests' time; the keys themselves are tested where they matter (``press_keys``,
    the typeahead tests, and the real-terminal smoke test, which types every key).
    """
    pilot.app.post_message(events.Paste(text))
    await pilot.pause()


async def press_keys(pilot: Any, text: str) -> None:
    """Type ``text`` key by key, as the keyboard sends it."""
    await pilot.press(*text)


class Notes:
    """Records the desk's notifications (toasts are switched off in headless tests)."""

    def __init__(self, app: DeskApp) -> None:
        self.messages: list[str] = []
        original = app.notify

        def notify(message: str, **kw: Any) -> None:
            self.messages.append(str(message))
            original(message, **kw)

        app.notify = notify  # type: ignore[method-assign]

    def last(self) -> str:
        return self.messages[-1] if self.messages else ""


def new_event(path: Path, players: int = 0) -> EventStore:
    """An event made as `pairings new E --name "Test Open" --rounds 3 --seed 7` makes it."""
    store = EventStore.create(path, actions.new_event("Test Open", 3, seed=7))
    for name, rating, club in PLAYERS[:players]:
        store.append(actions.add_player(store.state, name, int(rating) if rating else None, club or None))
    return store


def burst(app: DeskApp, *keys: str) -> None:
    """Queue ``keys`` at once, as a terminal delivers fast typing: nothing is handled in between.

    (``pilot.press`` waits for the app to go idle after each key, which hides
    races between a key and the focus change the previous key caused.)
    """
    from textual import events

    driver = app._driver
    assert driver is not None
    for key in keys:
        char = key if len(key) == 1 else {"space": " "}.get(key)
        name = {" ": "space"}.get(key, key)
        event = events.Key(name, char)
        event.set_sender(app)
        driver.send_message(event)
