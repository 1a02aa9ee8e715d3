"""The event's report-file details: city, federation, dates, arbiters, rate of play, round dates.

These are the header fields of the FIDE tournament report file (:mod:`pairings.trf`)
that the rest of the desk does not need; they are ordinary event settings, shown and
changed by ``pairings settings`` (one logged ``SettingsChanged``) and carried by the
interchange document's ``event.report``. :func:`checked_info` checks every value
first, so a refused change writes nothing. They never change a pairing or a score,
so they may change at any time.
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import date
from typing import Any

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


def checked_info(change: InfoChange, settings: Settings) -> dict[str, Any]:
    """The fields ``change`` sets, each checked (None fields left out); InputError on a bad value.

    Federation: three letters (upper-cased). Dates: ``YYYY-MM-DD``; the end not
    before the start; at most one round date per round, in order (common practice,
    no source: rounds are played in order, several may share a day).
    """
    out: dict[str, Any] = {}
    for key in ("city", "chief_arbiter", "time_control"):
        value = getattr(change, key)
        if value is not None:
            out[key] = clean_text(value, key.replace("_", " "), required=False, limit=200)
    if change.federation is not None:
        federation = change.federation.strip().upper()
        if federation and not (len(federation) == 3 and federation.isascii() and federation.isalpha()):
            raise InputError(f"federation {change.federation!r} is not a three-letter code")
        out["federation"] = federation
    for key, what in (("start_date", "start date"), ("end_date", "end date")):
        value = getattr(change, key)
        if value is not None:
            out[key] = check_date(value, what) if value.strip() else ""
    first, last = out.get("start_date", settings.start_date), out.get("end_date", settings.end_date)
    if first and last and last < first:
        raise InputError(f"the end date {last} is before the start date {first}")
    if change.round_dates is not None:
        dates = tuple(check_date(d, f"round {i} date") for i, d in enumerate(change.round_dates, 1) if d.strip())
        if len(dates) > settings.rounds:
            raise InputError(f"{len(dates)} round dates for an event of {settings.rounds} rounds")
        if list(dates) != sorted(dates):
            raise InputError("the round dates must be in order, round 1 first")
        out["round_dates"] = dates
    if change.deputy_arbiters is not None:
        out["deputy_arbiters"] = tuple(
            d for d in (clean_text(x, "deputy arbiter", required=False, limit=200) for x in change.deputy_arbiters) if d)
    return out


def set_event_info(state: EventState, change: InfoChange) -> list[ev.Event]:
    """The one ``SettingsChanged`` that applies ``change``, after checking every field (:func:`checked_info`)."""
    fields = checked_info(change, state.settings)
    if not fields:
        raise InputError("nothing to change: give at least one option")
    return [ev.SettingsChanged(**fields)]


KEYS = ("city", "federation", "start_date", "end_date", "chief_arbiter", "deputy_arbiters", "time_control",
        "round_dates")


def info_document(settings: Settings) -> dict[str, Any]:
    """The fields that are set, for the interchange document's ``event.report`` (empty: none set)."""
    out: dict[str, Any] = {}
    for key in KEYS:
        value = getattr(settings, key)
        if value:
            out[key] = list(value) if isinstance(value, tuple) else value
    return out


def info_lines(settings: Settings) -> list[tuple[str, str]]:
    """(label, value) per report-file detail, as ``pairings settings`` prints them ("-" where not given)."""
    s = settings
    rows = [
        ("City", s.city), ("Federation", s.federation), ("Start date", s.start_date), ("End date", s.end_date),
        ("Chief arbiter", s.chief_arbiter), ("Deputy arbiters", "; ".join(s.deputy_arbiters)),
        ("Time control", s.time_control), ("Round dates", ",".join(s.round_dates)),
    ]
    return [(label, value or "-") for label, value in rows]
