"""Plain-text helpers for the desk: safe names, points, results and flags in words.

Player names may hold anything (the roster comes from other people's
spreadsheets), so every name shown on the terminal goes through :func:`safe`,
which drops control and escape characters, and is wrapped in a rich ``Text``
(never parsed as markup).
"""

from __future__ import annotations

from typing import Iterable

from rich.cells import cell_len
from rich.text import Text

from pairings.costs import FLAG_MEANINGS
from pairings.points import Points, points_text
from pairings.state import EventState, Game, PlayerId, Result, Round, RoundState
from pairings.text import plain


def safe(value: object) -> str:
    """``value`` as one line of text with no escape sequence or control character left."""
    return plain(str(value))


def cell(value: object) -> Text:
    """A label that is never read as markup."""
    return Text(safe(value), no_wrap=True, overflow="ellipsis")


def widest(values: Iterable[object]) -> int:
    """Cells taken by the longest of ``values`` once cleaned (a table column's natural width)."""
    return max((cell_len(safe(v)) for v in values), default=0)


def points(value: Points | None) -> str:
    """Points in the desk (:func:`pairings.points.points_text`), ``-`` for none."""
    if value is None:
        return "-"
    return points_text(value)


def name(state: EventState, pid: PlayerId | str) -> str:
    player = state.players.get(PlayerId(pid))
    return safe(player.name) if player is not None else safe(pid)


RESULT_WORDS: dict[Result, str] = {
    Result.FIRST_WINS: "first side wins",
    Result.DRAW: "draw",
    Result.SECOND_WINS: "second side wins",
    Result.FIRST_WINS_BY_FORFEIT: "first side wins by forfeit",
    Result.SECOND_WINS_BY_FORFEIT: "second side wins by forfeit",
    Result.DOUBLE_FORFEIT: "double forfeit",
    Result.BOTH_LOSE: "arbiter: both lose",
    Result.FIRST_HALF_SECOND_LOSES: "arbiter: ½ to first, second loses",
    Result.FIRST_LOSES_SECOND_HALF: "arbiter: first loses, ½ to second",
}


def short_result(result: Result | None) -> str:
    """A result in three cells for narrow tables (``½-½`` for a draw)."""
    if result is None:
        return ""
    return "½-½" if result is Result.DRAW else result.value.replace("1/2", "½")


def round_status(state: EventState) -> str:
    """One line on where the event stands, in words (read in any colour scheme)."""
    last = state.last_round
    total = state.settings.rounds
    if last is None:
        return f"no round yet (of {total}); {len(state.players)} players"
    return f"round {last.number} of {total}: {describe_round(last)}"


def describe_round(rnd: Round) -> str:
    if rnd.state is RoundState.DRAFT:
        return f"draft, {len(rnd.games)} boards, {len(flagged_games(rnd))} flagged"
    if rnd.state is RoundState.PUBLISHED:
        return f"published, {len(rnd.open_boards)} of {len(rnd.games)} boards open"
    return f"complete, {len(rnd.games)} boards"


def flag_words(flag: str) -> str:
    """The flag with what it means (:data:`pairings.costs.FLAGS`), for the Why panel and the publish check."""
    head = flag.split()[0] if flag else flag
    meaning = FLAG_MEANINGS.get(head)
    return f"{flag}: {meaning}" if meaning else flag


OPEN_FLAGS_IGNORED = ("pinned", "changed")
"""Flags that record the organiser's own decision, not a question still open."""


def open_flags(flags: tuple[str, ...]) -> tuple[str, ...]:
    return tuple(f for f in flags if f.split()[0] not in OPEN_FLAGS_IGNORED)


def flagged_games(rnd: Round) -> list[Game]:
    """The boards whose flags are still open: what "N flagged" counts and the publish check lists."""
    return [g for g in rnd.games if open_flags(g.flags)]
