"""The Settings place: every setting of the event on one line, changed where it is shown.

A choice among a few words is a ``Select``; anything else an ``Input`` saved
with Enter. Each change is one call of :func:`pairings.regulations.change_settings`
(the same action as ``pairings settings``): one logged change, or the reason it
is refused, shown under the list while the field goes back to the event's value.
"""

from __future__ import annotations

from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, VerticalScroll
from textual.widgets import Input, Label, Select

from pairings.errors import InputError
from pairings.regulations import SETTINGS, Setting, change_settings, changed_after_notes, setting_texts
from pairings.state import EventState
from pairings.tui.base import Place
from pairings.tui.text import cell, safe


def _widget_id(setting: Setting) -> str:
    return f"setting-{setting.key}"


class SettingsPlace(Place):
    TITLE = "Settings"
    BINDINGS = [
        Binding("ctrl+r", "revert", "Reset fields"),
    ]
    DEFAULT_CSS = """
    SettingsPlace #settings { height: 1fr; padding: 0 1; }
    SettingsPlace .setting { height: 1; }
    SettingsPlace .setting-label { width: 34; }
    SettingsPlace .setting > Input, SettingsPlace .setting > Select { width: 1fr; }
    SettingsPlace #settings-note { width: 100%; height: auto; padding: 0 1; color: $warning; }
    """

    def body(self) -> ComposeResult:
        texts = setting_texts(self.state.settings)
        with VerticalScroll(id="settings"):
            for s in SETTINGS:
                with Horizontal(classes="setting"):
                    yield Label(cell(s.label), classes="setting-label")
                    if s.choices:
                        yield Select([(c, c) for c in s.choices], allow_blank=False, compact=True,
                                     value=texts[s.key], id=_widget_id(s), tooltip=s.help)
                    else:
                        yield Input(texts[s.key], compact=True, id=_widget_id(s), tooltip=s.help)
        yield Label("", id="settings-note")

    def on_mount(self) -> None:
        self.query_one(f"#{_widget_id(SETTINGS[0])}", Input).focus()

    def show(self, state: EventState) -> None:
        texts = setting_texts(state.settings)
        for s in SETTINGS:
            if s.choices:
                self.query_one(f"#{_widget_id(s)}", Select).value = texts[s.key]
            else:
                self.query_one(f"#{_widget_id(s)}", Input).value = texts[s.key]
        notes = changed_after_notes(state.settings)
        self.query_one("#settings-note", Label).update(
            cell("Enter saves a field; a choice saves when made. " + " ".join(notes)))

    def action_revert(self) -> None:
        self.show(self.state)

    def change(self, key: str, text: str) -> None:
        """One setting changed on screen: apply it, or put the field back and say why not."""
        if setting_texts(self.state.settings)[key] == text:
            return
        label = next(s.label for s in SETTINGS if s.key == key)
        try:
            change_settings(self.state, {key: text})
        except InputError as exc:
            self.show(self.state)
            said = str(exc) if "not changed:" in str(exc) else f"{label} not changed: {exc}"
            self.query_one("#settings-note", Label).update(cell(said))
            self.notify(str(exc), severity="error")
            return
        if not self.apply(lambda s: change_settings(s, {key: text}), f"{label}: {safe(text)}"):
            self.show(self.state)

    @on(Input.Submitted)
    def input_saved(self, event: Input.Submitted) -> None:
        event.stop()
        self.change((event.input.id or "").removeprefix("setting-"), event.value.strip())

    @on(Select.Changed)
    def choice_made(self, event: Select.Changed) -> None:
        event.stop()
        if isinstance(event.value, str) and event.value == event.select.value:  # not a value since replaced
            self.change((event.select.id or "").removeprefix("setting-"), event.value)
