"""Modal dialogs of the desk: confirm, a small form with validation, the help list.

Dialogs hold no rules: a form's ``check`` callback runs the real action on the
current state and returns its one-line error, which the form shows in place
until the organiser fixes the field or presses Escape.

Making a dialog's widgets costs some 40 ms, so :func:`open_dialog` keeps one dialog
of each shape (kind, number of fields, of intro lines) installed in the app
and only fills it with the new contents the next time; a second dialog of a
shape already on screen is made afresh.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Callable, Generic, Sequence, TypeVar

from textual import events, on
from textual.app import App, ComposeResult
from textual.binding import Binding
from textual.containers import Vertical, VerticalScroll
from textual.content import Content
from textual.message import Message
from textual.screen import ModalScreen
from textual.widget import Widget
from textual.widgets import Input, Label

from pairings.tui.text import cell, safe

T = TypeVar("T")


@dataclass(frozen=True)
class Field:
    """One line of a form: its key in the result, its label, a starting value; ``choices`` makes it a choice."""

    key: str
    label: str
    value: str = ""
    placeholder: str = ""
    choices: tuple[str, ...] = ()


class Choice(Widget, can_focus=True):
    """One of a few words, all shown on one line: ← / → or the first letters of a word choose it.

    The choice changes at once with the key (a ``RadioSet`` takes its new value
    only when a message comes back, so an Enter typed right after could save
    the old one). The chosen word is bracketed, so it reads in any colours.
    """

    DEFAULT_CSS = """
    Choice { height: auto; width: 100%; }
    Choice:focus { background: $accent 25%; }
    """
    BINDINGS = [Binding("left", "step(-1)", "Previous", show=False), Binding("right", "step(1)", "Next", show=False)]

    @dataclass
    class Changed(Message):
        choice: "Choice"

        @property
        def control(self) -> "Choice":
            return self.choice

    def __init__(self, *, id: str | None = None) -> None:
        super().__init__(id=id)
        self.choices: tuple[str, ...] = ()
        self.index = 0
        self._typed = ""

    def set_choices(self, choices: Sequence[str], value: str) -> None:
        self.choices = tuple(choices)
        self.index = self.choices.index(value) if value in self.choices else 0
        self._typed = ""
        self.refresh()

    @property
    def value(self) -> str:
        return self.choices[self.index] if self.choices else ""

    def _choose(self, index: int) -> None:
        if index != self.index:
            self.index = index
            self.refresh()
            self.post_message(self.Changed(self))

    def action_step(self, step: int) -> None:
        self._typed = ""
        if self.choices:
            self._choose((self.index + step) % len(self.choices))

    def on_key(self, event: events.Key) -> None:
        char = event.character
        if char is None or len(char) != 1 or not char.isalnum():
            return
        event.stop()
        for typed in (self._typed + char.casefold(), char.casefold()):
            found = next((i for i, c in enumerate(self.choices) if c.casefold().startswith(typed)), None)
            if found is not None:
                self._typed = typed
                self._choose(found)
                return

    def on_blur(self) -> None:
        self._typed = ""

    def render(self) -> Content:
        parts: list[str | tuple[str, str]] = []
        for i, word in enumerate(self.choices):
            parts += [(f"[{word}]", "bold reverse") if i == self.index else f" {word} ", " "]
        return Content.assemble(*parts)


Check = Callable[[dict[str, str]], str | None]
"""Returns the problem with the values (one line), or None when they can be used."""
Follow = Callable[[dict[str, str]], dict[str, str]]
"""Placeholders by field key, worked out from the values (called when a choice changes)."""


class Dialog(ModalScreen[T], Generic[T]):
    """A dialog that can be shown again with new contents (see :func:`open_dialog`)."""

    class Ready(Message):
        """Posted to the app once a new dialog has its widgets and its focus (see ``DeskApp.on_event``)."""

    def __init__(self) -> None:
        super().__init__()
        self.in_use = False
        self.ready = False
        """False until the widgets exist: keys typed before that wait in the app (``DeskApp._hand_on_keys``)."""

    @property
    def shape(self) -> str:
        """Dialogs of one shape have the same widgets."""
        return ""

    def take(self, other: Any) -> None:
        """Take the contents of ``other`` (a dialog of the same class and shape, never shown)."""
        self.__dict__.update({k: v for k, v in vars(other).items() if k.startswith("_c_")})
        self.fill()

    def on_mount(self) -> None:
        self.fill()
        self.ready = True
        self.app.post_message(self.Ready())

    def fill(self) -> None:
        """Bring the widgets up to the contents."""

    def close(self, value: T) -> None:
        """Dismiss with ``value``; a second close before the screen is gone (Enter twice) does nothing."""
        if not self.in_use:
            return
        self.in_use = False
        self.dismiss(value)


def open_dialog(app: App[Any], dialog: Dialog[T], callback: Callable[[T | None], Any] | None = None) -> None:
    """Push ``dialog``, or rather the installed one of its shape filled with its contents."""
    name = f"dialog {type(dialog).__name__} {dialog.shape}"
    if not app.is_screen_installed(name):
        app.install_screen(dialog, name)
        shown: Dialog[T] = dialog
    else:
        shown = app.get_screen(name, type(dialog))
        if shown.in_use:  # already on screen under this one
            dialog.in_use = True
            app.push_screen(dialog, callback)
            return
        shown.take(dialog)
    shown.in_use = True
    app.push_screen(name, callback)


class ConfirmDialog(Dialog[bool | None]):
    """A yes/no question with the facts to decide on listed under it.

    With ``cancel``, where both answers write something (keep or withdraw a
    player), Esc answers None (nothing done) instead of no.
    """

    BINDINGS = [
        Binding("y,enter", "answer(True)", "Yes"),
        Binding("n", "answer(False)", "No"),
        Binding("escape", "escape", "No"),
    ]

    def __init__(self, question: str, lines: Sequence[str] = (), cancel: bool = False) -> None:
        super().__init__()
        self._c_question = question
        self._c_lines = list(lines)
        self._c_cancel = cancel

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Label("", id="question", classes="dialog-title")
            with VerticalScroll(classes="dialog-lines"):
                yield Label("", id="facts")
            yield Label("", id="confirm-keys", classes="dialog-keys")

    def fill(self) -> None:
        self.query_one("#question", Label).update(cell(self._c_question))
        facts = self.query_one("#facts", Label)
        facts.update(Content("\n".join(safe(line) for line in self._c_lines)))
        facts.display = bool(self._c_lines)
        self.query_one("#confirm-keys", Label).update(
            "y / Enter: yes    n: no    Esc: cancel" if self._c_cancel else "y / Enter: yes    n / Esc: no")

    def action_answer(self, value: bool) -> None:
        self.close(value)

    def action_escape(self) -> None:
        self.close(None if self._c_cancel else False)


class FormDialog(Dialog[dict[str, str] | None]):
    """A few text fields; Enter moves on and, in the last field, saves (after ``check``); Esc cancels.

    Enter in a field before the last is a priority binding: it runs when the
    app reads the key, so the focus is on the next field before the keys typed
    after it are handed out (as an ``Input.Submitted`` message it ran only after
    them, and fast typing landed in the first field). Enter in the last field
    stays the field's own, so it submits after every key typed before it.
    """

    BINDINGS = [
        Binding("escape", "cancel", "Cancel"),
        Binding("enter", "next_field", "Next field", show=False, priority=True),
    ]

    def __init__(
        self, title: str, fields: Sequence[Field], check: Check | None = None, intro: Sequence[str] = (),
        save_from: int | None = None,
        follow: Follow | None = None,
    ) -> None:
        """``save_from``: Enter saves from this field on (the fields after it are reached with Tab)."""
        super().__init__()
        self._c_title = title
        self._c_fields = list(fields)
        self._c_check = check
        self._c_intro = list(intro)
        self._c_save_from = len(self._c_fields) - 1 if save_from is None else save_from
        self._c_follow = follow

    @property
    def shape(self) -> str:
        kinds = ",".join("|".join(f.choices) for f in self._c_fields)
        return f"{len(self._c_fields)} {len(self._c_intro)} {kinds}"

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Label("", id="form-title", classes="dialog-title")
            with VerticalScroll(classes="form-fields"):  # a long form scrolls; title and keys stay in view
                for i in range(len(self._c_intro)):
                    yield Label("", id=f"intro-{i}", classes="dialog-intro")
                for i, f in enumerate(self._c_fields):
                    yield Label("", id=f"label-{i}", classes="field-label")
                    yield Choice(id=f"field-{i}") if f.choices else Input(id=f"field-{i}", compact=True)
            yield Label("", id="problem", classes="problem")
            yield Label("", id="form-keys", classes="dialog-keys")

    def fill(self) -> None:
        self.query_one("#form-title", Label).update(cell(self._c_title))
        more = self._c_save_from < len(self._c_fields) - 1
        keys = (f"Enter: next field, save from {safe(self._c_fields[self._c_save_from].label)} on    Tab: more"
                if more else "Enter: next field, save after the last")
        self.query_one("#form-keys", Label).update(keys + "    Esc: cancel")
        for i, line in enumerate(self._c_intro):
            self.query_one(f"#intro-{i}", Label).update(cell(line))
        for i, f in enumerate(self._c_fields):
            self.query_one(f"#label-{i}", Label).update(cell(f.label))
            if f.choices:
                self.query_one(f"#field-{i}", Choice).set_choices(f.choices, f.value)
                continue
            field = self.query_one(f"#field-{i}", Input)
            field.value, field.placeholder = f.value, f.placeholder
            field.cursor_position = len(f.value)
        self.query_one("#problem", Label).update("")
        self.set_focus(self.query_one("#field-0"))
        box = self.query_one(".form-fields")
        self.call_after_refresh(box.scroll_home, animate=False)  # a tall form opens at its first field

    def values(self) -> dict[str, str]:
        return {f.key: self._value(i) for i, f in enumerate(self._c_fields)}

    def _value(self, i: int) -> str:
        if self._c_fields[i].choices:
            return self.query_one(f"#field-{i}", Choice).value
        return self.query_one(f"#field-{i}", Input).value

    @on(Choice.Changed)
    def choice_changed(self) -> None:
        """Placeholders that depend on a choice (the printout's file name on its format) follow it."""
        if self._c_follow is None:
            return
        shown = self._c_follow(self.values())
        for i, f in enumerate(self._c_fields):
            if f.key in shown and not f.choices:
                self.query_one(f"#field-{i}", Input).placeholder = shown[f.key]

    @staticmethod
    def _index(widget: Widget | None) -> int:
        """The field number of a form widget (``field-3`` → 3)."""
        return int(((widget.id if widget is not None else None) or "field-0").removeprefix("field-"))

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        if action == "next_field":
            focused = self.focused
            return isinstance(focused, Choice) or isinstance(focused, Input) and self._index(focused) < self._c_save_from
        return True

    def action_next_field(self) -> None:
        if self._index(self.focused) >= self._c_save_from:
            self.save()
        else:
            self.focus_next("Input, Choice")

    @on(Input.Submitted)
    def submit(self, event: Input.Submitted) -> None:
        event.stop()
        if self._index(event.input) < self._c_save_from:
            self.focus_next("Input, Choice")
            return
        self.save()

    def save(self) -> None:
        """Close with the values, unless ``check`` finds a problem (shown in the form)."""
        values = self.values()
        problem = self._c_check(values) if self._c_check is not None else None
        if problem:
            self.query_one("#problem", Label).update(cell(f"not saved: {problem}"))
            return
        self.close(values)

    def action_cancel(self) -> None:
        self.close(None)


class ReadDialog(Dialog[None]):
    """A text to read whole (wrapped, scrolled), for a line a table had to cut."""

    BINDINGS = [Binding("escape,enter,q", "close_text", "Close")]

    def __init__(self, title: str, lines: Sequence[str]) -> None:
        super().__init__()
        self._c_title = title
        self._c_lines = list(lines)

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Label("", id="read-title", classes="dialog-title")
            with VerticalScroll(classes="dialog-lines"):
                yield Label("", id="read-text", classes="read-text")
            yield Label("Esc / Enter: close", classes="dialog-keys")

    def fill(self) -> None:
        self.query_one("#read-title", Label).update(cell(self._c_title))
        self.query_one("#read-text", Label).update(Content("\n".join(safe(line) for line in self._c_lines)))

    def action_close_text(self) -> None:
        self.close(None)


class HelpDialog(Dialog[None]):
    """Every action of every place with its key (the same list feeds the command palette)."""

    BINDINGS = [Binding("escape,f1,q", "close_help", "Close")]

    def __init__(self, sections: Sequence[tuple[str, Sequence[tuple[str, str]]]]) -> None:
        super().__init__()
        self._c_sections = list(sections)

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog help"):
            yield Label("Keys of the desk", classes="dialog-title")
            with VerticalScroll(classes="dialog-lines"):
                # One label for the whole list: a widget per line made the dialog slow to open.
                yield Label("", id="help-keys", classes="help-keys")
            yield Label("Esc: close    Ctrl+P: search every action", classes="dialog-keys")

    def fill(self) -> None:
        parts: list[str | tuple[str, str]] = []
        for title, rows in self._c_sections:
            parts.append((safe(title) + "\n", "bold $accent"))
            parts += [safe(f"  {key:<14} {description}") + "\n" for key, description in rows]
        self.query_one("#help-keys", Label).update(Content.assemble(*parts).rstrip())

    def action_close_help(self) -> None:
        self.close(None)
