"""The event's regulations as settings: read them from text, show them, change them (pure actions).

The command line (``pairings new`` and ``pairings settings``), the desk's
Settings place and the interchange document all go through here, so a setting
has one name, one text form and one check. :func:`change_settings` returns the
one :class:`~pairings.events.SettingsChanged` event of a change, or raises an
:class:`~pairings.errors.InputError` with the reason a change is refused.

What may change once a round is published (our decision; the event's
regulations and the chief arbiter prevail): the name, the tiebreaks and their
treatment of unplayed games (standings are recomputed and the standings sheet
names the change), the number of rounds upward (never below the rounds already
paired, nor once the last round was paired with the final-round side
exception), and the requested-bye limits (they govern requests to come). The
scoring, the bye points, the system, the acceleration and the meeting rules
(meetings allowed, the final-round side exception, whether a forfeit is a
meeting) are fixed once round 1 is published: they would change published
scores or the rules the published rounds were paired and are checked by
(``verify`` checks every round under the event's settings). The late-entry
points are fixed once a late entrant's missed rounds are published. No setting
the engine reads may change while a draft is open (discard it first).
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Any, Callable, Mapping

from pairings import events as ev
from pairings.errors import InputError, RoundStateError
from pairings.points import PLACES, Points, PointsError, parse_points, points_number, points_text
from pairings.state import (
    SYSTEM_NAMES, Acceleration, EventState, RoundState, Scoring, Settings, System, Unplayed, system_name,
)


class SettingsError(InputError):
    """A setting's value cannot be read, or a change the event's state does not allow."""


@dataclass(frozen=True)
class Setting:
    """One setting as users see it: its key (the option is ``--key`` with dashes), label and help."""

    key: str
    label: str
    help: str
    choices: tuple[str, ...] = ()
    """The allowed words, when the value is one of a few."""
    flag: str = ""
    """The command-line option when it is not ``--key`` with dashes."""
    metavar: str = "X"
    """What the option's value looks like (choices show themselves)."""

    @property
    def option(self) -> str:
        return self.flag or "--" + self.key.replace("_", "-")


YES_NO = ("yes", "no")
UNPLAYED_NAMES = {u.value.replace("_", "-"): u for u in Unplayed}
ACCELERATION_NAMES = {a.value: a for a in Acceleration}

SETTINGS: tuple[Setting, ...] = (
    Setting("name", "Name", "the event's name", metavar="TEXT"),
    Setting("rounds", "Rounds", "the number of rounds", metavar="N"),
    Setting("system", "System", "the pairing system", tuple(SYSTEM_NAMES)),
    Setting("acceleration", "Acceleration", "accelerated pairings for a Swiss system (C.04.5)",
            tuple(ACCELERATION_NAMES)),
    Setting("scoring", "Scoring", "points for a win, a draw and a loss", metavar="W,D,L"),
    Setting("bye_points", "Bye points", "points for a pairing bye"),
    Setting("requested_bye_points", "Requested-bye points", "points for a requested bye"),
    Setting("requested_bye_limit", "Requested byes per player", "most requested byes a player may have",
            metavar="N|none"),
    Setting("requested_bye_last_round", "Last round for a requested bye",
            "the last round a bye may be requested for", metavar="N|none"),
    Setting("late_entry_points", "Late-entry points", "points for each round missed before a late entry"),
    Setting("tiebreaks", "Tiebreaks", "the tiebreaks in order, comma-separated", metavar="LIST"),
    Setting("unplayed", "Unplayed games in tiebreaks", "how tiebreaks count unplayed games",
            tuple(UNPLAYED_NAMES)),
    Setting("max_meetings", "Meetings allowed", "how often two players may meet (2 for a double round robin)",
            metavar="N"),
    Setting("final_round_side_exception", "Final-round side exception",
            "in the last round a side rule may give way to the score", YES_NO, "--final-round-exception"),
    Setting("forfeit_is_meeting", "A forfeit counts as a meeting",
            "a forfeited pairing counts as a meeting of the two", YES_NO, "--forfeit-meets"),
)
BY_KEY = {s.key: s for s in SETTINGS}

AFTER_PUBLICATION = frozenset({"name", "tiebreaks", "unplayed", "rounds", "requested_bye_limit",
                               "requested_bye_last_round"})
"""Settings that may change once a round is published (see the module notes)."""
ENGINE_READS = frozenset({
    "system", "acceleration", "scoring", "bye_points", "requested_bye_points", "late_entry_points",
    "max_meetings", "final_round_side_exception", "forfeit_is_meeting",
})
"""Settings a draft is made on: none of them changes while a draft is open."""
RECOUNT = frozenset({"tiebreaks", "unplayed"})
"""Settings whose change after publication recomputes the standings."""


def _number(text: str, what: str) -> Points:
    try:
        value = parse_points(text)
    except PointsError as exc:
        raise SettingsError(f"{what} {exc}") from None
    if not 0 <= value <= 1000:
        raise SettingsError(f"{what} {points_text(value)} must lie between 0 and 1000")
    return value


def _whole(text: str, what: str, least: int, *, none: bool = False) -> int | None:
    word = text.strip().lower()
    if none and word in ("none", "no", "-", ""):
        return None
    try:
        value = int(word)
    except ValueError:
        hint = " (or none)" if none else ""
        raise SettingsError(f"{what} {text!r} is not a whole number{hint}") from None
    if not least <= value <= 1000:
        raise SettingsError(f"{what} must be from {least} to 1000 (got {value})")
    return value


def _word(text: str, what: str, choices: Mapping[str, Any] | tuple[str, ...]) -> Any:
    word = text.strip().lower()
    if word not in choices:
        raise SettingsError(f"{what} {text!r}: use {', '.join(choices)}")
    return choices[word] if isinstance(choices, Mapping) else word


def parse_scoring(text: str) -> Scoring:
    try:
        win, draw, loss = (parse_points(x) for x in text.split(","))
    except ValueError:
        raise SettingsError(f"scoring {text!r} must be three numbers of at most {PLACES} decimals: win,draw,loss "
                            "(e.g. 1,0.5,0)") from None
    if not (win > loss >= 0 and loss <= draw <= win):
        raise SettingsError(f"scoring {text!r}: a win must score more than a loss, and draws lie between")
    return Scoring(win, draw, loss)


def _tiebreaks(text: str) -> tuple[str, ...]:
    from pairings.standings import check_tiebreaks  # standings stay out of the commands that do not rank

    names = [n for n in (x.strip() for x in text.split(",")) if n]
    if not names:
        raise SettingsError("--tiebreaks needs at least one tiebreak")
    return check_tiebreaks(names)


def _name(text: str) -> str:
    from pairings.actions import clean_text

    return clean_text(text, "event name")


_READERS: dict[str, Callable[[str], Any]] = {
    "name": _name,
    "rounds": lambda t: _whole(t, "rounds", 1),
    "system": lambda t: _word(t, "system", SYSTEM_NAMES),
    "acceleration": lambda t: _word(t, "acceleration", ACCELERATION_NAMES),
    "scoring": parse_scoring,
    "bye_points": lambda t: _number(t, "bye points"),
    "requested_bye_points": lambda t: _number(t, "requested-bye points"),
    "requested_bye_limit": lambda t: _whole(t, "requested byes per player", 0, none=True),
    "requested_bye_last_round": lambda t: _whole(t, "last round for a requested bye", 1, none=True),
    "late_entry_points": lambda t: _number(t, "late-entry points"),
    "tiebreaks": _tiebreaks,
    "unplayed": lambda t: _word(t, "unplayed rule", UNPLAYED_NAMES),
    "max_meetings": lambda t: _whole(t, "meetings allowed", 1),
    "final_round_side_exception": lambda t: _word(t, "final-round side exception", YES_NO) == "yes",
    "forfeit_is_meeting": lambda t: _word(t, "forfeit counts as a meeting", YES_NO) == "yes",
}


def _fields(values: Mapping[str, Any]) -> dict[str, Any]:
    """Setting keys → :class:`Settings` fields (a system name sets the system and the double round)."""
    out = dict(values)
    if "system" in out:
        out["system"], out["double_round"] = out["system"]
    return out


def parse_settings(texts: Mapping[str, str]) -> dict[str, Any]:
    """The typed value of each setting given as text (unknown keys are a programming error)."""
    return _fields({key: _READERS[key](text) for key, text in texts.items()})


def setting_texts(s: Settings) -> dict[str, str]:
    """Each setting as the text its option takes (so ``parse_settings(setting_texts(s))`` gives ``s`` back)."""
    sc = s.scoring
    return {
        "name": s.name,
        "rounds": str(s.rounds),
        "system": system_name(s),
        "acceleration": s.acceleration.value,
        "scoring": ",".join(points_text(x) for x in (sc.win, sc.draw, sc.loss)),
        "bye_points": points_text(s.bye_points),
        "requested_bye_points": points_text(s.requested_bye_points),
        "requested_bye_limit": "none" if s.requested_bye_limit is None else str(s.requested_bye_limit),
        "requested_bye_last_round": "none" if s.requested_bye_last_round is None else str(s.requested_bye_last_round),
        "late_entry_points": points_text(s.late_entry_points),
        "tiebreaks": ",".join(s.tiebreaks),
        "unplayed": s.unplayed.value.replace("_", "-"),
        "max_meetings": str(s.max_meetings),
        "final_round_side_exception": "yes" if s.final_round_side_exception else "no",
        "forfeit_is_meeting": "yes" if s.forfeit_is_meeting else "no",
    }


def check_consistent(s: Settings) -> None:
    """Refuse settings that contradict each other (checked on the settings as they would become)."""
    win = s.scoring.win
    for value, what in ((s.bye_points, "bye points"), (s.requested_bye_points, "requested-bye points"),
                        (s.late_entry_points, "late-entry points")):
        if not 0 <= value <= win:
            raise SettingsError(f"{what} {points_text(value)} must lie between 0 and a win ({points_text(win)})")
    if s.requested_bye_last_round is not None and s.requested_bye_last_round > s.rounds:
        raise SettingsError(
            f"the last round for a requested bye ({s.requested_bye_last_round}) is after the last round ({s.rounds})"
        )
    if s.acceleration is not Acceleration.NONE and s.system is System.ROUND_ROBIN:
        raise SettingsError("accelerated pairings are for a Swiss system, not a round robin")
    if s.acceleration is Acceleration.BAKU and s.scoring != Scoring():
        raise SettingsError("the Baku acceleration (C.04.5.1) is for the standard scoring 1,0.5,0 only")


def _published(state: EventState) -> int:
    return max((r.number for r in state.rounds if r.state is not RoundState.DRAFT), default=0)


def _refusal(state: EventState, key: str, value: Any) -> str | None:
    """Why changing ``key`` to ``value`` is not allowed now, or None."""
    published = _published(state)
    last = state.last_round
    label = BY_KEY[key].label.lower() if key in BY_KEY else key.replace("_", " ")
    if key == "rounds" and state.rounds and value < state.rounds[-1].number:
        return f"round {state.rounds[-1].number} is already paired: the event cannot have fewer rounds"
    if key == "rounds" and state.settings.final_round_side_exception and state.rounds \
            and state.rounds[-1].number == state.settings.rounds:
        return f"round {state.rounds[-1].number} was paired as the last round, with the final-round side exception"
    # The final-round side exception reads which round is the last, so then the rounds count too.
    read = key in ENGINE_READS | {"double_round"} or (key == "rounds" and state.settings.final_round_side_exception)
    if last is not None and last.state is RoundState.DRAFT and read:
        return f"the draft of round {last.number} was made on the {label}: discard it first"
    if key == "late_entry_points":
        late = [p for p in state.players.values() if p.first_round > 1]
        if late and published:
            return f"{late[0].name} already has points for rounds missed before entry"
        return None
    if published and key not in AFTER_PUBLICATION:
        return f"round {published} is published: changing the {label} would change published rounds"
    return None


def change_settings(state: EventState, texts: Mapping[str, str]) -> list[ev.Event]:
    """The one event that changes the settings given as text, or the reason it is refused."""
    wanted = parse_settings(texts)
    changes = {k: v for k, v in wanted.items() if getattr(state.settings, k) != v}
    if not changes:
        raise SettingsError("nothing to change: the settings already have these values")
    for key, value in changes.items():
        why = _refusal(state, key, value)
        if why is not None:
            raise RoundStateError(f"{key.replace('_', '-')} not changed: {why}")
    check_consistent(replace(state.settings, **changes))
    cleared = tuple(k for k in ("requested_bye_limit", "requested_bye_last_round") if k in changes
                    and changes[k] is None)
    stored: dict[str, Any] = {k: v for k, v in changes.items() if v is not None}
    if "scoring" in stored:
        sc = stored["scoring"]
        stored["scoring"] = ev.ScoringModel(win=sc.win, draw=sc.draw, loss=sc.loss)
    return [ev.SettingsChanged(**stored, cleared=cleared, after_round=_published(state))]


def created_settings(first: ev.EventCreated, texts: Mapping[str, str]) -> ev.EventCreated:
    """``first`` with the settings given as text (``pairings new``), checked together."""
    from pairings.fold import fold

    wanted = parse_settings(texts)
    settings = replace(fold([(1, first)]).settings, **wanted)
    check_consistent(settings)
    if "scoring" in wanted:
        sc = wanted["scoring"]
        wanted["scoring"] = ev.ScoringModel(win=sc.win, draw=sc.draw, loss=sc.loss)
    return first.model_copy(update=wanted)


def changed_after_notes(s: Settings) -> tuple[str, ...]:
    """One line per setting changed after publication, for the standings sheet."""
    return tuple(
        f"{BY_KEY[key].label if key in BY_KEY else key} changed after round {number}"
        + ("; standings recomputed." if key in RECOUNT else ".")
        for number, key in dict.fromkeys(s.changed_after)  # each (round, setting) once, in order
        if key != "double_round"
    )


def settings_lines(s: Settings) -> list[tuple[str, str]]:
    """(label, value) for every setting, as ``pairings settings`` prints them."""
    texts = setting_texts(s)
    return [(item.label, texts[item.key]) for item in SETTINGS]


def settings_document(s: Settings) -> dict[str, Any]:
    """The settings as the interchange document's ``event`` object writes them (also ``settings --json``)."""
    sc = s.scoring
    return {
        "name": s.name,
        "rounds": s.rounds,
        "scoring": {"win": points_number(sc.win), "draw": points_number(sc.draw), "loss": points_number(sc.loss)},
        "sides": list(s.sides) if s.sides else None,
        "bye_points": points_number(s.bye_points),
        "system": system_name(s),
        "acceleration": None if s.acceleration is Acceleration.NONE else s.acceleration.value,
        "tiebreaks": list(s.tiebreaks),
        "unplayed": s.unplayed.value.replace("_", "-"),
        "requested_bye_points": points_number(s.requested_bye_points),
        "requested_bye_limit": s.requested_bye_limit,
        "requested_bye_last_round": s.requested_bye_last_round,
        "late_entry_points": points_number(s.late_entry_points),
        "max_meetings": s.max_meetings,
        "final_round_side_exception": s.final_round_side_exception,
        "forfeit_is_meeting": s.forfeit_is_meeting,
        "default_rating": s.default_rating,
        "seed": s.seed,
        "changed_after": [[number, key] for number, key in s.changed_after],
    }


def replay_changed_after(s: Settings) -> list[ev.SettingsChanged]:
    """Events that give restored settings the same list of changes after publication (for the sheets)."""
    out: list[ev.SettingsChanged] = []
    for number, key in s.changed_after:
        value = getattr(s, key)
        if value is None:
            out.append(ev.SettingsChanged(cleared=(key,), after_round=number))  # type: ignore[arg-type]
            continue
        if isinstance(value, Scoring):
            value = ev.ScoringModel(win=value.win, draw=value.draw, loss=value.loss)
        out.append(ev.SettingsChanged(**{key: value}, after_round=number))
    return out


def change_words(e: ev.SettingsChanged) -> list[str]:
    """``label value`` for each setting an event changes (the log's line)."""
    stored = e.given()
    if "system" in stored:
        double = bool(stored.pop("double_round", False))
        stored["system"] = next(n for n, v in SYSTEM_NAMES.items() if v == (System(stored["system"]), double))
    words = []
    for key, value in stored.items():
        if isinstance(value, bool):
            value = "yes" if value else "no"
        elif isinstance(value, ev.ScoringModel):
            value = "/".join(points_text(x) for x in (value.win, value.draw, value.loss))
        elif isinstance(value, (list, tuple)):
            value = ",".join(value)
        elif isinstance(value, Points):
            value = points_text(value)
        elif key == "unplayed":
            value = str(value).replace("_", "-")
        label = BY_KEY[key].label.lower() if key in BY_KEY else key.replace("_", " ")
        words.append(f"{label} {value}")
    words += [f"{BY_KEY[key].label.lower()} none" for key in e.cleared]
    return words
