"""Modal dialogs of the desk: confirm, a small form with validation, the help list.

Dialogs hold no rules: a form's ``check`` callback runs the real action on the
current state and returns its one-line error, which the form shows in place
until the organiser fixes the field or presses Escape.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable, Sequence

from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical, VerticalScroll
from textual.content import Content
from textual.screen import ModalScreen
from textual.widgets import Input, Label

from pairings.tui.text import cell, safe


@dataclass(frozen=True)
class Field:
    """One line of a form: its key in the result, its label, a starting value."""

    key: str
    label: str
    value: str = ""
    placeholder: str = ""


Check = Callable[[dict[str, str]], str | None]
"""Returns the problem with the values (one line), or None when they can be used."""


class ConfirmDialog(ModalScreen[bool]):
    """A yes/no question with the facts to decide on listed under it."""

    BINDINGS = [
        Binding("y,enter", "answer(True)", "Yes"),
        Binding("n,escape", "answer(False)", "No"),
    ]

    def __init__(self, question: str, lines: Sequence[str] = ()) -> None:
        super().__init__()
        self._question = question
        self._lines = list(lines)

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Label(cell(self._question), classes="dialog-title")
            if self._lines:
                with VerticalScroll(classes="dialog-lines"):
                    for line in self._lines:
                        yield Label(cell(line))
            yield Label("y / Enter: yes    n / Esc: no", classes="dialog-keys")

    def action_answer(self, value: bool) -> None:
        self.dismiss(value)


class FormDialog(ModalScreen[dict[str, str] | None]):
    """A few text fields; Enter moves on and, in the last field, saves (after ``check``); Esc cancels."""

    BINDINGS = [Binding("escape", "cancel", "Cancel")]

    def __init__(
        self, title: str, fields: Sequence[Field], check: Check | None = None, intro: Sequence[str] = ()
    ) -> None:
        super().__init__()
        self._title = title
        self._fields = list(fields)
        self._check = check
        self._intro = list(intro)

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Label(cell(self._title), classes="dialog-title")
            for line in self._intro:
                yield Label(cell(line), classes="dialog-intro")
            for f in self._fields:
                yield Label(cell(f.label), classes="field-label")
                yield Input(value=f.value, placeholder=f.placeholder, id=f"field-{f.key}", compact=True)
            yield Label("", id="problem", classes="problem")
            yield Label("Enter: next field, save after the last    Esc: cancel", classes="dialog-keys")

    def values(self) -> dict[str, str]:
        return {f.key: self.query_one(f"#field-{f.key}", Input).value for f in self._fields}

    @on(Input.Submitted)
    def submit(self, event: Input.Submitted) -> None:
        event.stop()
        last = f"field-{self._fields[-1].key}"
        if event.input.id != last:
            self.focus_next()
            return
        values = self.values()
        problem = self._check(values) if self._check is not None else None
        if problem:
            label = self.query_one("#problem", Label)
            label.update(cell(f"not saved: {problem}"))
            return
        self.dismiss(values)

    def action_cancel(self) -> None:
        self.dismiss(None)


class HelpDialog(ModalScreen[None]):
    """Every action of every place with its key (the same list feeds the command palette)."""

    BINDINGS = [Binding("escape,f1,q", "close", "Close")]

    def __init__(self, sections: Sequence[tuple[str, Sequence[tuple[str, str]]]]) -> None:
        super().__init__()
        self._sections = list(sections)

    def compose(self) -> ComposeResult:
        parts: list[str | tuple[str, str]] = []
        for title, rows in self._sections:
            parts.append((safe(title) + "\n", "bold $accent"))
            parts += [safe(f"  {key:<14} {description}") + "\n" for key, description in rows]
        with Vertical(classes="dialog help"):
            yield Label("Keys of the desk", classes="dialog-title")
            with VerticalScroll(classes="dialog-lines"):
                # One label for the whole list: a widget per line made the dialog slow to open.
                yield Label(Content.assemble(*parts).rstrip(), classes="help-keys")
            yield Label("Esc: close    Ctrl+P: search every action", classes="dialog-keys")

    def action_close(self) -> None:
        self.dismiss(None)
