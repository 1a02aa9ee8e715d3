"""Results: fast entry by board for the published round.

Type a board number (or stay on the board under the cursor), then one key
for the result; the cursor moves on to the next open board. A board that
already has a result asks before it is changed.
"""

from __future__ import annotations

from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.widgets import Label

from pairings import actions
from pairings.errors import InputError
from pairings.state import EventState, Result, Round, RoundState
from pairings.tui.base import Place
from pairings.tui.dialogs import ConfirmDialog, Field, FormDialog, open_dialog
from pairings.tui.grid import Column, Grid, RowMaker
from pairings.tui.text import RESULT_WORDS, cell, name, points, short_result, widest

RESULT_KEYS: dict[str, Result] = {
    "f": Result.FIRST_WINS,
    "d": Result.DRAW,
    "s": Result.SECOND_WINS,
    "plus": Result.FIRST_WINS_BY_FORFEIT,
    "minus": Result.SECOND_WINS_BY_FORFEIT,
    "x": Result.DOUBLE_FORFEIT,
    "z": Result.BOTH_LOSE,
    "h": Result.FIRST_HALF_SECOND_LOSES,
    "j": Result.FIRST_LOSES_SECOND_HALF,
}
"""The one-key results (the keymap is plain data; the help and the footer read it)."""

_KEY_SHOWN = {"plus": "+", "minus": "-"}


def result_text(result: Result | None, sides: tuple[str, str] | None = None) -> str:
    """The code and its words; with the event's side names ("White wins") where it has them, which is
    also what fits an 80-column board line."""
    if result is None:
        return "open"
    words = RESULT_WORDS[result]
    if sides is not None:
        words = words.replace("first side", sides[0]).replace("second side", sides[1])
        words = words.replace("first", sides[0]).replace("second", sides[1]) if "arbiter" in words else words
    return f"{result.value}  {words}"


RESULT_WIDTH = max(len(result_text(r)) for r in Result)
"""The widest a result can be (the column keeps its width while results come in)."""


class ResultsPlace(Place):
    TITLE = "Results"
    BINDINGS = [
        *(Binding(key, f"result('{code.value}')", RESULT_WORDS[code], key_display=_KEY_SHOWN.get(key, key))
          for key, code in RESULT_KEYS.items()),
        Binding("c", "clear", "Clear result"),
        *(Binding(str(d), f"digit({d})", "Board number", show=False) for d in range(10)),
        Binding("backspace", "backspace", "Erase a digit", show=False),
        Binding("enter", "go", "Go to board", show=False),
        Binding("escape", "forget", "Forget the number", show=False),
    ]

    def __init__(self) -> None:
        super().__init__()
        self.typed = ""
        """The board number being typed."""
        self._shown: tuple[int, tuple[tuple[int, str, str], ...]] | None = None
        """Round number and boards (board, first, second) the table holds."""

    def body(self) -> ComposeResult:
        yield Label("", id="open-count", classes="status")
        yield Label("", id="entry", classes="entry")
        yield Grid(id="games")

    def on_mount(self) -> None:
        self.query_one("#games", Grid).focus()
        self.show_entry()

    def round(self) -> Round | None:
        try:
            return actions.results_round(self.state, None)
        except InputError:
            return None

    def show(self, state: EventState) -> None:
        rnd = self.round()
        grid = self.query_one("#games", Grid)
        count = self.query_one("#open-count", Label)
        if rnd is None:
            grid.set_rows([])
            self._shown = None
            count.update("No round published yet: publish a draft in the Round place (F3).")
            return
        left = len(rnd.open_boards)
        state_words = "complete" if rnd.state is RoundState.COMPLETE else "published"
        count.update(cell(f"Round {rnd.number} ({state_words}): {left} of {len(rnd.games)} boards open"))
        shape = (rnd.number, tuple((g.board, g.first, g.second) for g in rnd.games))
        sides = state.settings.sides or ("First", "Second")
        if shape != self._shown:
            grid.set_columns([
                Column("board", "Bd", 4), Column("first", sides[0], flex=True), Column("p1", "Pts", 4),
                Column("second", sides[1], flex=True), Column("p2", "Pts", 4),
                Column("result", "Result", flex=True, least=7, rank=1),  # names first; the code fits in 7
            ])
            grid.set_source([str(g.board) for g in rnd.games], self._row_maker(state, rnd), [
                4, widest(name(state, g.first) for g in rnd.games), 4,
                widest(name(state, g.second) for g in rnd.games), 4, RESULT_WIDTH,
            ])
            self._shown = shape
            self.move_to_open(0)
            return
        grid.remake(self._row_maker(state, rnd))

    @staticmethod
    def _row_maker(state: EventState, rnd: Round) -> RowMaker:
        def row(i: int) -> tuple[str, ...]:
            g = rnd.games[i]
            return (str(g.board), name(state, g.first), points(state.records[g.first].score_before(rnd.number)),
                    name(state, g.second), points(state.records[g.second].score_before(rnd.number)),
                    result_text(g.result, state.settings.sides))

        return row

    def show_entry(self) -> None:
        text = f"Board: {self.typed}_" if self.typed else "Board: under the cursor"
        keys = " · then " + " ".join(f"{_KEY_SHOWN.get(k, k)} {short_result(r)}" for k, r in RESULT_KEYS.items())
        keys += " · c clear"
        self.query_one("#entry", Label).update(text + keys)

    def move_to_open(self, start_index: int) -> None:
        """Put the cursor on the first open board at or after ``start_index`` (wrapping round)."""
        rnd = self.round()
        if rnd is None or not rnd.games:
            return
        n = len(rnd.games)
        for step in range(n):
            i = (start_index + step) % n
            if rnd.games[i].result is None:
                self.query_one("#games", Grid).move_to(i)
                return

    def target(self) -> int | None:
        rnd = self.round()
        grid = self.query_one("#games", Grid)
        if rnd is None:
            self.notify("no published round", severity="warning")
            return None
        if self.typed:
            board = int(self.typed)
            self.typed = ""
            self.show_entry()
            if rnd.game_on(board) is None:
                self.notify(f"round {rnd.number} has no board {board} (boards 1-{len(rnd.games)})", severity="error")
                return None
            return board
        if not grid.row_count:
            return None
        return rnd.games[grid.cursor].board

    # -- keys ------------------------------------------------------------------------------

    def action_digit(self, digit: int) -> None:
        if len(self.typed) < 5:
            self.typed += str(digit)
        self.show_entry()

    def action_backspace(self) -> None:
        self.typed = self.typed[:-1]
        self.show_entry()

    def action_forget(self) -> None:
        self.typed = ""
        self.show_entry()

    def action_go(self) -> None:
        board = self.target()
        if board is not None:
            self.query_one("#games", Grid).move_to(board - 1)

    @on(Grid.Selected, "#games")
    def enter_pressed(self) -> None:
        self.action_go()

    def action_result(self, code: str) -> None:
        self.enter(self.target(), Result(code))

    def action_clear(self) -> None:
        self.enter(self.target(), None)

    def enter(self, board: int | None, result: Result | None) -> None:
        rnd = self.round()
        if board is None or rnd is None:
            return
        game = rnd.game_on(board)
        assert game is not None
        number, base = rnd.number, self.shown_head
        what = result.value if result is not None else "cleared"

        def write(correct: bool, reason: str = "") -> None:
            if self.apply(lambda s: actions.record_result(s, board, result, number, correct, reason),
                          f"board {board}: {what}", base):
                self.move_to_open(board)  # index ``board`` is the board after this one

        if game.result is None:
            write(False)
            return
        if game.result == result:
            self.notify(f"board {board} already has {game.result.value}", severity="warning")
            return

        def confirmed(yes: bool | None) -> None:
            if yes:
                write(True)

        question = f"Board {board} has {game.result.value}; change it to {what}?"
        later = [r.number for r in self.state.rounds if r.number > number]
        if later:  # a correction under a later round: it stays as paired, the reason goes into the log
            def reasoned(values: dict[str, str] | None) -> None:
                if values is not None:
                    write(True, values["reason"])

            intro = [question, f"Round {later[0]} is already paired on this result and stays as it is."]
            open_dialog(self.app, FormDialog("Correct a result", [Field("reason", "Reason (goes into the log)")],
                                             lambda v: None if v["reason"].strip() else "a correction needs a reason",
                                             intro), reasoned)
            return
        open_dialog(self.app, ConfirmDialog(question, [
            f"{name(self.state, game.first)} – {name(self.state, game.second)}"]), confirmed)
