"""The event's report-file details: city, federation, dates, arbiters, rate of play, round dates.

These are the header fields of the FIDE tournament report file (:mod:`pairings.trf`)
that the rest of the desk does not need; they are ordinary event settings, changed
by one logged ``SettingsChanged``. :func:`set_event_info` checks every value first,
so a refused change writes nothing.
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import date

from pairings import events as ev
from pairings.actions import clean_text
from pairings.errors import InputError
from pairings.state import EventState, Settings


@dataclass(frozen=True, slots=True)
class InfoChange:
    """The fields to change; None keeps a field, an empty text (or empty tuple) clears it."""

    city: str | None = None
    federation: str | None = None
    start_date: str | None = None
    end_date: str | None = None
    chief_arbiter: str | None = None
    deputy_arbiters: tuple[str, ...] | None = None
    time_control: str | None = None
    round_dates: tuple[str, ...] | None = None


def check_date(text: str, what: str) -> str:
    """``text`` as an ISO date ``YYYY-MM-DD`` (also accepts ``YYYY/MM/DD``), or InputError."""
    cleaned = text.strip().replace("/", "-")
    try:
        if len(cleaned) == 10:
            return date.fromisoformat(cleaned).isoformat()
    except ValueError:
        pass
    raise InputError(f"{what} {text!r} is not a date YYYY-MM-DD")


def _text(value: str | None, what: str) -> str | None:
    return None if value is None else clean_text(value, what, required=False, limit=200)


def set_event_info(state: EventState, change: InfoChange) -> list[ev.Event]:
    """The one ``SettingsChanged`` that applies ``change``, after checking every field.

    Federation: three letters (upper-cased). Dates: ``YYYY-MM-DD``; the end not
    before the start; at most one round date per round, in order (common practice,
    no source: rounds are played in order, several may share a day).
    """
    federation = None
    if change.federation is not None:
        federation = change.federation.strip().upper()
        if federation and not (len(federation) == 3 and federation.isascii() and federation.isalpha()):
            raise InputError(f"federation {change.federation!r} is not a three-letter code")
    start = check_date(change.start_date, "start date") if change.start_date else change.start_date
    end = check_date(change.end_date, "end date") if change.end_date else change.end_date
    s = state.settings
    first, last = (start if start is not None else s.start_date), (end if end is not None else s.end_date)
    if first and last and last < first:
        raise InputError(f"the end date {last} is before the start date {first}")
    dates = None
    if change.round_dates is not None:
        dates = tuple(check_date(d, f"round {i} date") for i, d in enumerate(change.round_dates, 1) if d.strip())
        if len(dates) > s.rounds:
            raise InputError(f"{len(dates)} round dates for an event of {s.rounds} rounds")
        if list(dates) != sorted(dates):
            raise InputError("the round dates must be in order, round 1 first")
    deputies = None
    if change.deputy_arbiters is not None:
        deputies = tuple(d for d in (_text(x, "deputy arbiter") or "" for x in change.deputy_arbiters) if d)
    event = ev.SettingsChanged(
        city=_text(change.city, "city"), federation=federation, start_date=start, end_date=end,
        chief_arbiter=_text(change.chief_arbiter, "chief arbiter"), deputy_arbiters=deputies,
        time_control=_text(change.time_control, "time control"), round_dates=dates,
    )
    if not any(v is not None for k, v in event.model_dump(exclude={"type"}).items()):
        raise InputError("nothing to change: give at least one option")
    return [event]


def info_lines(settings: Settings) -> list[str]:
    """The report-file details as ``label: value`` lines ("-" where not given)."""
    s = settings
    rows = [
        ("city", s.city), ("federation", s.federation), ("start date", s.start_date), ("end date", s.end_date),
        ("chief arbiter", s.chief_arbiter), ("deputy arbiters", "; ".join(s.deputy_arbiters)),
        ("time control", s.time_control),
        ("round dates", ", ".join(f"{i}: {d}" for i, d in enumerate(s.round_dates, 1))),
    ]
    return [f"{label}: {value or '-'}" for label, value in rows]
