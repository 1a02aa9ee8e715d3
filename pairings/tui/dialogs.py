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

from textual import on
from textual.app import App, ComposeResult
from textual.binding import Binding
from textual.containers import Vertical, VerticalScroll
from textual.content import Content
from textual.screen import ModalScreen
from textual.widgets import Input, Label

from pairings.tui.text import cell, safe

T = TypeVar("T")


@dataclass(frozen=True)
class Field:
    """One line of a form: its key in the result, its label, a starting value."""

    key: str
    label: str
    value: str = ""
    placeholder: str = ""


Check = Callable[[dict[str, str]], str | None]
"""Returns the problem with the values (one line), or None when they can be used."""


class Dialog(ModalScreen[T], Generic[T]):
    """A dialog that can be shown again with new contents (see :func:`open_dialog`)."""

    def __init__(self) -> None:
        super().__init__()
        self.in_use = False

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

    def fill(self) -> None:
        """Bring the widgets up to the contents."""

    def close(self, value: T) -> None:
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


class ConfirmDialog(Dialog[bool]):
    """A yes/no question with the facts to decide on listed under it."""

    BINDINGS = [
        Binding("y,enter", "answer(True)", "Yes"),
        Binding("n,escape", "answer(False)", "No"),
    ]

    def __init__(self, question: str, lines: Sequence[str] = ()) -> None:
        super().__init__()
        self._c_question = question
        self._c_lines = list(lines)

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Label("", id="question", classes="dialog-title")
            with VerticalScroll(classes="dialog-lines"):
                yield Label("", id="facts")
            yield Label("y / Enter: yes    n / Esc: no", classes="dialog-keys")

    def fill(self) -> None:
        self.query_one("#question", Label).update(cell(self._c_question))
        facts = self.query_one("#facts", Label)
        facts.update(Content("\n".join(safe(line) for line in self._c_lines)))
        facts.display = bool(self._c_lines)

    def action_answer(self, value: bool) -> None:
        self.close(value)


class FormDialog(Dialog[dict[str, str] | None]):
    """A few text fields; Enter moves on and, in the last field, saves (after ``check``); Esc cancels."""

    BINDINGS = [Binding("escape", "cancel", "Cancel")]

    def __init__(
        self, title: str, fields: Sequence[Field], check: Check | None = None, intro: Sequence[str] = (),
        save_from: int | None = None,
    ) -> None:
        """``save_from``: Enter saves from this field on (the fields after it are reached with Tab)."""
        super().__init__()
        self._c_title = title
        self._c_fields = list(fields)
        self._c_check = check
        self._c_intro = list(intro)
        self._c_save_from = len(self._c_fields) - 1 if save_from is None else save_from

    @property
    def shape(self) -> str:
        return f"{len(self._c_fields)} {len(self._c_intro)}"

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Label("", id="form-title", classes="dialog-title")
            for i in range(len(self._c_intro)):
                yield Label("", id=f"intro-{i}", classes="dialog-intro")
            for i in range(len(self._c_fields)):
                yield Label("", id=f"label-{i}", classes="field-label")
                yield Input(id=f"field-{i}", compact=True)
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
            field = self.query_one(f"#field-{i}", Input)
            field.value, field.placeholder = f.value, f.placeholder
            field.cursor_position = len(f.value)
        self.query_one("#problem", Label).update("")
        self.set_focus(self.query_one("#field-0", Input))
        box = self.query_one(".dialog")
        self.call_after_refresh(box.scroll_home, animate=False)  # a tall form opens at its title

    def values(self) -> dict[str, str]:
        return {f.key: self.query_one(f"#field-{i}", Input).value for i, f in enumerate(self._c_fields)}

    @on(Input.Submitted)
    def submit(self, event: Input.Submitted) -> None:
        event.stop()
        index = int((event.input.id or "field-0").removeprefix("field-"))
        if index < self._c_save_from:
            self.focus_next()
            return
        values = self.values()
        problem = self._c_check(values) if self._c_check is not None else None
        if problem:
            self.query_one("#problem", Label).update(cell(f"not saved: {problem}"))
            return
        self.close(values)

    def action_cancel(self) -> None:
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
