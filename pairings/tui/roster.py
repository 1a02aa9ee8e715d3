"""The Roster: players with rating, club, score and status; add, edit, byes, import, filter."""

from __future__ import annotations

from pathlib import Path
from typing import Callable, Sequence

from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.widgets import Input

from pairings import actions
from pairings.errors import InputError, RosterError
from pairings.events import Event
from pairings.details import detail_texts, read_details
from pairings.roster import decode, import_roster, read_roster
from pairings.state import ByeKind, EventState, Player, PlayerDetails, PlayerId, Status
from pairings.text import fold
from pairings.tui.base import Action, Place
from pairings.tui.dialogs import Field, FormDialog, open_dialog
from pairings.tui.grid import Column, Grid
from pairings.tui.text import points, safe, widest

PlayerAction = Callable[[EventState, str, int | None, str | None, PlayerDetails], Sequence[Event]]
DETAIL_FIELDS = (
    ("title", "Title (GM, IM, FM, CM, WGM, WIM, WFM, WCM)"), ("federation", "Federation (three letters)"),
    ("fide_id", "FIDE ID"), ("national_id", "National ID"), ("birth", "Birth (year or YYYY-MM-DD)"),
    ("sex", "Sex (m or f)"), ("ratings", "Ratings by list (fide=2010,national=1980)"),
    ("categories", "Categories (comma-separated)"),
)
QuickAction = Callable[[EventState, PlayerId], Sequence[Event]]


def status_words(state: EventState, player: Player) -> str:
    """The player's status for the round to come, in words."""
    if player.status is Status.WITHDRAWN:
        return f"withdrawn from round {player.withdrawn_from}"
    coming = actions.entry_round(state)
    asked = state.requests.get(coming, {}).get(player.id)
    if asked is ByeKind.REQUESTED:
        return f"bye requested, round {coming}"
    if asked is ByeKind.ABSENCE:
        return f"absent, round {coming}"
    if player.entry_round > coming:
        return f"joins in round {player.entry_round}"
    return "active"


def titled(player: Player) -> str:
    """The name with the player's title before it, as sheets print it ("FM Ada Quince")."""
    return f"{player.details.title} {player.name}" if player.details.title else player.name


def _rating(text: str) -> int | None:
    text = text.strip()
    if not text:
        return None
    try:
        return int(text)
    except ValueError:
        raise InputError(f"rating {text!r} is not a whole number") from None


class RosterPlace(Place):
    TITLE = "Roster"
    BINDINGS = [
        Binding("a", "add", "Add player"),
        Binding("e", "edit", "Edit"),
        Binding("w", "withdraw", "Withdraw"),
        Binding("r", "reinstate", "Reinstate"),
        Binding("q", "bye", "Request bye"),
        Binding("m", "absent", "Mark absent"),
        Binding("c", "cancel_bye", "Cancel bye"),
        Binding("i", "import_csv", "Import CSV"),
        Binding("slash", "filter", "Filter", key_display="/"),
    ]

    def body(self) -> ComposeResult:
        yield Input(placeholder="/ filter by name, id or club (Esc: back to the list)", id="filter", compact=True)
        yield Grid(id="players")

    def __init__(self) -> None:
        super().__init__()
        self._index: tuple[int, list[Player], list[str], dict[PlayerId, str]] | None = None
        """Per state head: the players, what the filter looks in (id, name, club: folded) and their status."""

    def on_mount(self) -> None:
        grid = self.query_one("#players", Grid)
        grid.set_columns([Column("id", "Id", limit=8), Column("name", "Name", flex=True, least=10),
                          Column("fed", "Fed", 3), Column("rating", "Rating", 7), Column("club", "Club", flex=True, rank=1),
                          Column("score", "Score", 5), Column("status", "Status", limit=24)])
        grid.focus()

    def index(self, state: EventState) -> tuple[list[Player], list[str], dict[PlayerId, str]]:
        if self._index is None or self._index[0] != state.head:
            players = list(state.players.values())
            self._index = (state.head, players, [fold(f"{p.id}\n{p.name}\n{p.club or ''}") for p in players],
                           {p.id: status_words(state, p) for p in players})
        return self._index[1:]

    def show(self, state: EventState) -> None:
        players, folded, status = self.index(state)
        wanted = fold(self.query_one("#filter", Input).value.strip())
        shown = [p for p, f in zip(players, folded) if wanted in f] if wanted else players

        def row(i: int) -> tuple[str, ...]:
            p = shown[i]
            return (p.id, titled(p), p.details.federation or "",
                    str(p.rating) if p.rating is not None else "unrated", p.club or "",
                    points(state.score(p.id)), status[p.id])

        self.query_one("#players", Grid).set_source([p.id for p in shown], row, [
            widest(p.id for p in shown), widest(titled(p) for p in shown), 3, 7, widest(p.club or "" for p in shown), 5,
            widest(status[p.id] for p in shown),
        ])

    def selected(self) -> PlayerId | None:
        key = self.query_one("#players", Grid).cursor_key
        if key is None:
            self.notify("no player selected", severity="warning")
            return None
        return PlayerId(key)

    # -- filter ----------------------------------------------------------------------------

    def action_filter(self) -> None:
        self.query_one("#filter", Input).focus()

    @on(Input.Changed, "#filter")
    def filter_changed(self) -> None:
        self.show(self.state)

    @on(Input.Submitted, "#filter")
    def filter_done(self) -> None:
        self.query_one("#players", Grid).focus()

    def key_escape(self) -> None:
        self.query_one("#players", Grid).focus()

    # -- forms -----------------------------------------------------------------------------

    def _player_form(self, title: str, player: Player | None, make: PlayerAction) -> None:
        base = self.shown_head

        def action(values: dict[str, str]) -> Action:
            rating = _rating(values["rating"])
            details = read_details({key: values[key] for key, _ in DETAIL_FIELDS})
            return lambda s: make(s, values["name"], rating, values["club"] or None, details)

        def check(values: dict[str, str]) -> str | None:
            try:
                action(values)(self.state)
            except InputError as exc:
                return str(exc)
            return None

        def done(values: dict[str, str] | None) -> None:
            if values is not None:
                self.apply(action(values), f"{title}: {safe(values['name'])}", base)

        fields = [
            Field("name", "Name", player.name if player else ""),
            Field("rating", "Rating (empty: unrated)", str(player.rating) if player and player.rating is not None else ""),
            Field("club", "Club", (player.club or "") if player else ""),
        ]
        texts = detail_texts(player.details if player else PlayerDetails())
        fields += [Field(key, label, texts[key]) for key, label in DETAIL_FIELDS]
        open_dialog(self.app, FormDialog(title, fields, check, save_from=2), done)

    def action_add(self) -> None:
        self._player_form("Add player", None, lambda s, n, r, c, d: actions.add_player(s, n, r, c, details=d))

    def action_edit(self) -> None:
        pid = self.selected()
        if pid is not None:
            player = self.state.players[pid]
            self._player_form("Edit player", player, lambda s, n, r, c, d: actions.edit_player(s, pid, n, r, c, d))

    def _quick(self, verb: str, make: QuickAction) -> None:
        pid = self.selected()
        if pid is not None:
            self.apply(lambda s: make(s, pid), f"{safe(self.state.players[pid].name)}: {verb}")

    def action_withdraw(self) -> None:
        pid = self.selected()
        if pid is None:
            return
        base = self.shown_head
        who = safe(self.state.players[pid].name)

        def done(values: dict[str, str] | None) -> None:
            if values is not None:
                self.apply(lambda s: actions.withdraw(s, pid, None, values["reason"]), f"{who}: withdrawn", base)

        open_dialog(self.app, FormDialog(f"Withdraw {who}", [Field("reason", "Reason (optional)")]), done)

    def action_reinstate(self) -> None:
        self._quick("back in", actions.reinstate)

    def action_bye(self) -> None:
        self._quick("bye requested", lambda s, p: actions.announce_bye(s, p, ByeKind.REQUESTED))

    def action_absent(self) -> None:
        self._quick("marked absent", lambda s, p: actions.announce_bye(s, p, ByeKind.ABSENCE))

    def action_cancel_bye(self) -> None:
        self._quick("bye cancelled", actions.cancel_bye)

    def action_import_csv(self) -> None:
        base = self.shown_head
        loaded: dict[str, str] = {}
        warnings: list[str] = []

        def read(path_text: str) -> str:
            path = Path(path_text.strip()).expanduser()
            try:
                return decode(path.read_bytes())
            except OSError as exc:
                raise InputError(f"{path}: cannot read ({exc.strerror})") from None

        def check(values: dict[str, str]) -> str | None:
            try:
                text = read(values["path"])
                roster = read_roster(self.state, text)
                warnings[:] = roster.warnings
                actions.refuse_duplicates(self.state, roster.events)
            except RosterError as exc:
                return "; ".join(exc.problems[:3]) + (f" (and {len(exc.problems) - 3} more)" if len(exc.problems) > 3 else "") + " — nothing imported"
            except InputError as exc:
                return str(exc)
            loaded["text"] = text
            return None

        def done(values: dict[str, str] | None) -> None:
            if values is not None:
                before = len(self.state.players)
                if self.apply(lambda s: actions.refuse_duplicates(s, import_roster(s, loaded["text"])), "", base):
                    self.notify(f"imported {len(self.state.players) - before} players")
                    for warning in warnings:
                        self.notify(safe(warning), severity="warning")

        intro = ["A CSV file with a header row: name (required), rating, club, id, title, federation,",
                 "fide_id, national_id, birth, sex, categories; other columns are named, not read."]
        open_dialog(self.app, FormDialog("Import a roster", [Field("path", "CSV file")], check, intro), done)
