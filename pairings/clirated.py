"""The command line's rated-event parts: ``pairings ratings update`` and the report-file options of
``pairings settings``.

Thin like :mod:`pairings.cli`: parse, call the pure functions of
:mod:`pairings.eventinfo` and :mod:`pairings.ratinglist`, print. The report file
itself is ``pairings export EVENT --format trf``; the rating report sheet is
``pairings print EVENT rating-report``.
"""

from __future__ import annotations

import argparse
from pathlib import Path
from typing import TYPE_CHECKING, Any, Callable

from pairings.errors import InputError
from pairings.store import EventStore
from pairings.text import plain

if TYPE_CHECKING:
    from pairings.eventinfo import InfoChange


def _say(text: str) -> None:
    print(text)


def info_change(a: argparse.Namespace) -> "InfoChange | None":
    """The report-file details given as ``settings`` options (:func:`add_info_options`), or None."""
    from pairings.eventinfo import InfoChange

    change = InfoChange(
        city=a.city, federation=a.event_federation, start_date=a.start, end_date=a.end,
        chief_arbiter=a.chief_arbiter,
        deputy_arbiters=tuple(a.deputy) if a.deputy is not None else (() if a.no_deputies else None),
        time_control=a.time_control,
        round_dates=tuple(a.round_dates.split(",")) if a.round_dates is not None else None,
    )
    return None if change == InfoChange() else change


def add_info_options(sp: argparse.ArgumentParser) -> None:
    """The report-file details as options of ``pairings settings`` (an empty text clears one)."""
    sp.add_argument("--city")
    sp.add_argument("--federation", dest="event_federation", metavar="FED",
                    help="three-letter code of the federation the event is held in")
    sp.add_argument("--start", metavar="YYYY-MM-DD", help="the first day")
    sp.add_argument("--end", metavar="YYYY-MM-DD", help="the last day")
    sp.add_argument("--chief-arbiter", metavar="NAME")
    sp.add_argument("--deputy", action="append", metavar="NAME", help="a deputy arbiter (repeat; replaces the list)")
    sp.add_argument("--no-deputies", action="store_true", help="clear the deputy arbiters")
    sp.add_argument("--time-control", metavar="TEXT", help="the rate of play, as the regulations state it")
    sp.add_argument("--round-dates", metavar="D1,D2,...", help="YYYY-MM-DD per round, round 1 first")


def cmd_ratings_update(a: argparse.Namespace) -> None:
    from pairings.ratinglist import plan_update, read_list_file, update_events

    if a.force and not (a.reason or "").strip():
        raise InputError("ratings update: --force needs --reason TEXT (it goes into the log)")
    with EventStore.open(Path(a.event)) as store:
        found = read_list_file(Path(a.list), store.state, a.kind)
        plan = plan_update(store.state, found, accept_names=a.accept_names, keep_rating=a.keep_rating)
        if plan.changes:
            store.apply(lambda s: update_events(s, plan, a.force, a.reason or ""))
    for line in plan.report():
        _say(plain(line))


def add_rated_commands(sub: Any, parser_class: type[argparse.ArgumentParser]) -> None:
    """Add ``ratings update`` to the command line's subparsers."""

    def add(where: Any, name: str, fn: Callable[[argparse.Namespace], None], help_: str) -> argparse.ArgumentParser:
        sp: argparse.ArgumentParser = where.add_parser(name, help=help_, description=help_)
        sp.add_argument("event", metavar="EVENT", help="the event file")
        sp.set_defaults(fn=fn)
        return sp

    ratings = sub.add_parser("ratings", help="take ratings from a published rating list")
    rsub = ratings.add_subparsers(dest="ratings_command", required=True, parser_class=parser_class)
    sp = add(rsub, "update", cmd_ratings_update,
             "update ratings, titles, federations and birth years from a FIDE list (text) or a national list (CSV)")
    sp.add_argument("list", metavar="LIST", help="the FIDE download (fixed-width text) or a national list (*.csv)")
    sp.add_argument("--kind", choices=("standard", "rapid", "blitz"), default="standard",
                    help="which FIDE rating to take (default standard)")
    sp.add_argument("--accept-names", action="store_true",
                    help="also update the players without an ID that the list matches by name")
    sp.add_argument("--keep-rating", action="store_true",
                    help="store the list's rating beside the event's own rating instead of replacing it")
    sp.add_argument("--force", action="store_true", help="update after round 1 has been paired (needs --reason)")
    sp.add_argument("--reason", help="why the ratings change after round 1 (with --force; goes into the log)")
