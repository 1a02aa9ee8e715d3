"""Write an event as a FIDE tournament report file (TRF16, column positions from memory).

:func:`write_trf` is pure: state in, text out. The header records come from the
event's settings (:mod:`pairings.eventinfo` holds the fields only a report file
needs), then one 001 record per player in start-rank order, with one slot per
published round (see :mod:`pairings.trf.layout` for the columns and the caution
that goes with them).
"""

from __future__ import annotations

from pairings.points import ZERO, Points, points_text
from pairings.standings import check_tiebreaks, default_tiebreaks
from pairings.standings.ratingchange import fide_rating
from pairings.state import (
    ByeKind, EventState, Player, PlayerId, RoundEntry, RoundState, Settings, Side, System, Unplayed,
)
from pairings.trf.layout import (
    BLACK, COLOUR_TAG, NO_COLOUR, PLAYER, PLAYER_TAG, ROUNDS_TAG, SCORING_TAG, TIEBREAK_TAG, WHITE, slot_spans,
    slot_start,
)

ScoringValues = tuple[Points, Points, Points, Points, Points, Points]
DEFAULT_POINTS: ScoringValues = (Points(1), Points(1, 2), ZERO, Points(1), Points(1, 2), ZERO)
"""Win, draw, loss, pairing bye, requested bye, each round missed before a late entry: the values a
report file assumes (PTS omitted)."""

TYPES = {
    (System.SWISS, False): "Individual: Swiss system (whole-round optimum)",
    (System.DUTCH, False): "Individual: Swiss system (FIDE Dutch)",
    (System.ROUND_ROBIN, False): "Individual: round robin",
    (System.ROUND_ROBIN, True): "Individual: double round robin",
}
"""The 092 text per pairing system (our wording; TRF16 leaves it free)."""


def trf_date(iso: str, short: bool = False) -> str:
    """``YYYY-MM-DD`` (or ``YYYY``) as ``YYYY/MM/DD``; ``short`` gives ``YY/MM/DD`` (the 132 record)."""
    text = iso.replace("-", "/")
    return text[2:] if short else text


def event_type(settings: Settings) -> str:
    return TYPES[settings.system, settings.double_round and settings.system is System.ROUND_ROBIN]


def scoring_values(settings: Settings) -> ScoringValues:
    s = settings
    return (s.scoring.win, s.scoring.draw, s.scoring.loss, s.bye_points, s.requested_bye_points,
            s.late_entry_points)


def bye_code(kind: ByeKind, points: Points, settings: Settings) -> str:
    """U for a pairing bye; for a requested bye F (a win's points), Z (none) or H; Z for an absence."""
    if kind is ByeKind.PAIRING:
        return "U"
    if kind is ByeKind.ABSENCE or points == 0:
        return "Z"
    return "F" if points == settings.scoring.win else "H"


def _slot(entry: RoundEntry | None, number: dict[PlayerId, int], settings: Settings) -> str:
    if entry is None:  # not paired: before a late entry, after a withdrawal
        return " " * 8
    if entry.bye is not None:
        return f"0000 {NO_COLOUR} {bye_code(entry.bye, entry.points or ZERO, settings)}"
    assert entry.opponent is not None and entry.side is not None
    colour = WHITE if entry.side is Side.FIRST else BLACK
    code = " "
    if entry.result is not None:
        outcome = entry.result.outcome(entry.side)
        if entry.played:
            code = {"win": "1", "draw": "=", "loss": "0"}[outcome]
        else:
            code = "+" if outcome == "win" else "-"
    return f"{number[entry.opponent]:>4} {colour} {code}"


def _ranks(state: EventState) -> dict[PlayerId, str]:
    """Each player's current place (the first number of a shared rank); none before a round is published."""
    from pairings.standings import counted_rounds, standings

    if counted_rounds(state) == 0:
        return {}
    return {row.player: str(row.rank).split("-")[0] for row in standings(state).rows}


def _player_line(state: EventState, player: Player, number: dict[PlayerId, int], rank: str,
                 rounds: list[int]) -> str:
    d = player.details
    rating = fide_rating(player)
    values = {
        "start_rank": str(number[player.id]),
        "sex": {"m": "m", "f": "w"}.get(d.sex or "", " "),
        "title": d.title or "",
        "name": player.name,
        "rating": str(rating) if rating else "",
        "federation": d.federation or "",
        "fide_id": d.fide_id or "",
        "birth": trf_date(d.birth) if d.birth else "",
        "points": points_text(round(state.records[player.id].score, 1), "report"),  # the column's one decimal
        "rank": rank,
    }
    line = [" "] * (slot_start(len(rounds) + 1) - 1)
    line[0:3] = PLAYER_TAG
    for key, span in PLAYER.items():
        line[span.first - 1:span.last] = span.put(values[key])
    record = state.records[player.id]
    for r in rounds:
        first = slot_spans(r)[0].first
        line[first - 1:first + 7] = _slot(record.entry(r), number, state.settings)
    return "".join(line).rstrip()


def _initial_colour(state: EventState, number: dict[PlayerId, int]) -> str | None:
    """``white1`` / ``black1`` from start rank 1's side in round 1, when that player played a game in it."""
    top = next((pid for pid, n in number.items() if n == 1), None)
    entry = state.records[top].entry(1) if top is not None else None
    if entry is None or entry.side is None:
        return None
    return "white1" if entry.side is Side.FIRST else "black1"


def write_trf(state: EventState) -> str:
    """The event's report file: header records, then one 001 record per player in start-rank order.

    Lines end in CR LF: TRF16 (from memory) ends each line with a carriage return, and
    the line feed keeps the file readable everywhere (readers accept CR, LF or both).
    """
    s = state.settings
    number = {pid: n for n, pid in enumerate(state.initial_rank(), 1)}
    rounds = [r.number for r in state.rounds if r.state is not RoundState.DRAFT]
    lines = [f"012 {s.name}"]
    for tag, value in (("022", s.city), ("032", s.federation), ("042", trf_date(s.start_date)),
                       ("052", trf_date(s.end_date))):
        if value:
            lines.append(f"{tag} {value}")
    rated = sum(1 for p in state.players.values() if fide_rating(p))
    lines += [f"062 {len(state.players)}", f"072 {rated}", f"092 {event_type(s)}"]
    if s.chief_arbiter:
        lines.append(f"102 {s.chief_arbiter}")
    lines += [f"112 {d}" for d in s.deputy_arbiters]
    if s.time_control:
        lines.append(f"122 {s.time_control}")
    lines.append(f"{ROUNDS_TAG} {s.rounds}")
    colour = _initial_colour(state, number)
    if colour:
        lines.append(f"{COLOUR_TAG} {colour}")
    if scoring_values(s) != DEFAULT_POINTS:
        lines.append(f"{SCORING_TAG} " + " ".join(points_text(v, "report") for v in scoring_values(s)))
    tiebreaks = check_tiebreaks(list(s.tiebreaks))
    if tiebreaks != default_tiebreaks(s.system, True) or s.unplayed is not Unplayed.VIRTUAL_OPPONENT:
        lines.append(f"{TIEBREAK_TAG} {','.join(tiebreaks) or '-'} {s.unplayed.value}")
    if s.round_dates:
        dates = [" "] * (slot_start(len(s.round_dates) + 1) - 1)
        dates[0:3] = "132"
        for r, iso in enumerate(s.round_dates, 1):
            c = slot_start(r)
            dates[c - 1:c + 7] = trf_date(iso, short=True)
        lines.append("".join(dates).rstrip())
    ranks = _ranks(state)
    for pid in number:
        lines.append(_player_line(state, state.players[pid], number, ranks.get(pid, ""), rounds))
    return "\r\n".join(lines) + "\r\n"
