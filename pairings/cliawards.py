"""The command line's prize commands: ``pairings category ...`` and ``pairings prize ...``.

Thin like :mod:`pairings.cli`: parse, call the pure actions of
:mod:`pairings.categories` and :mod:`pairings.prizes`, print. The prize list
itself is a printout (``pairings prizes EVENT``, in :mod:`pairings.cli`).
"""

from __future__ import annotations

import argparse
from pathlib import Path
from typing import Any, Callable, Sequence

from pairings.errors import InputError
from pairings.state import EventState
from pairings.store import EventStore
from pairings.text import counted, plain


def _run(path: str, action: Callable[[EventState], Sequence[Any]]) -> EventState:
    with EventStore.open(Path(path)) as store:
        return store.apply(action)


def _say(text: str) -> None:
    print(text)


def cmd_category_add(a: argparse.Namespace) -> None:
    from pairings.categories import define_category
    from pairings.state import CategoryRule

    rule = None if a.by_hand else CategoryRule(
        age_under=a.under, age_from=a.age_from, age_on=a.on, sex=a.sex, rating_from=a.rating_from,
        rating_below=a.rating_below, rating_list=a.rating_list, unrated=a.unrated, label=a.label, club=a.club)
    if a.by_hand and any(v not in (None, False) for v in (a.under, a.age_from, a.on, a.sex, a.rating_from,
                                                          a.rating_below, a.rating_list, a.unrated, a.label, a.club)):
        raise InputError("category add: --by-hand takes no rule options")
    with EventStore.open(Path(a.event)) as store:
        known = {c.casefold() for c in store.state.categories}
    _run(a.event, lambda s: define_category(s, a.name, rule))
    _say(f"category {plain(a.name)} {'redefined' if a.name.strip().casefold() in known else 'defined'}")


def cmd_category_remove(a: argparse.Namespace) -> None:
    from pairings.categories import remove_category

    _run(a.event, lambda s: remove_category(s, a.name))
    _say(f"category {plain(a.name)} removed, with its prizes")


def _member_command(member: bool) -> Callable[[argparse.Namespace], None]:
    def command(a: argparse.Namespace) -> None:
        from pairings.categories import set_member

        from pairings.actions import find_player
        from pairings.categories import find_category

        s = _run(a.event, lambda s: set_member(s, a.name, a.player, member))
        who, where = s.players[find_player(s, a.player)].name, find_category(s, a.name).name
        _say(f"{plain(who)} {'put in' if member else 'left out of'} {plain(where)} by hand")

    return command


def cmd_category_list(a: argparse.Namespace) -> None:
    from pairings.categories import describe_rule, members

    with EventStore.open(Path(a.event)) as store:
        s = store.state
    if not s.categories:
        _say("no categories defined")
    for c in s.categories.values():
        inside = members(s, c)
        _say(f"{plain(c.name)}: {plain(describe_rule(c.rule))}; {counted(len(inside), 'player')}")
        if a.members:
            for pid in sorted(inside, key=lambda p: s.players[p].order):
                _say(f"    {plain(pid):>6}  {plain(s.players[pid].name)}")


def cmd_prize_add(a: argparse.Namespace) -> None:
    from pairings.prizes import set_prize

    _run(a.event, lambda s: set_prize(s, a.category, a.place, a.amount))
    _say(f"prize for place {a.place} of {plain(a.category)} set")


def cmd_prize_remove(a: argparse.Namespace) -> None:
    from pairings.prizes import remove_prize

    _run(a.event, lambda s: remove_prize(s, a.category, a.place))
    _say(f"prize for place {a.place} of {plain(a.category)} removed")


def cmd_prize_rules(a: argparse.Namespace) -> None:
    from pairings.prizes import set_policy

    state = _run(a.event, lambda s: set_policy(s, a.better, a.ties, a.currency, a.minor_digits))
    p = state.prize_policy
    _say(f"prize rules: better prize by {p.better.value}, ties {p.ties.value}, "
         f"currency {p.currency or '-'}, {p.minor_digits} minor digits")



def add_award_commands(sub: Any, parser_class: type[argparse.ArgumentParser]) -> None:
    """Add ``category`` and ``prize`` with their subcommands to the main parser's ``sub``."""
    category = sub.add_parser("category", help="prize categories: by rule or by hand")
    csub = category.add_subparsers(dest="category_command", required=True, parser_class=parser_class)
    sp = csub.add_parser("add", help="define or redefine a category (every rule option given must hold)")
    sp.set_defaults(fn=cmd_category_add)
    sp.add_argument("event", metavar="EVENT")
    sp.add_argument("name", metavar="NAME")
    sp.add_argument("--under", type=int, metavar="AGE", help="younger than AGE whole years on --on")
    sp.add_argument("--from-age", dest="age_from", type=int, metavar="AGE", help="AGE or older on --on")
    sp.add_argument("--on", metavar="YYYY-MM-DD", help="the date ages are counted on")
    sp.add_argument("--sex", choices=("f", "m"))
    sp.add_argument("--rating-from", type=int, metavar="R", help="rated R or more")
    sp.add_argument("--rating-below", type=int, metavar="R", help="rated below R")
    sp.add_argument("--rating-list", metavar="LIST", help="the rating list the band reads (default: the event's rating)")
    sp.add_argument("--unrated", action="store_true", help="no rating (on --rating-list if given)")
    sp.add_argument("--label", help="players carrying this free category label")
    sp.add_argument("--club")
    sp.add_argument("--by-hand", action="store_true", help="no rule: members only by `category include`")
    for name, fn, help_ in (("include", _member_command(True), "put a player in a category by hand"),
                            ("exclude", _member_command(False), "leave a player out of a category by hand")):
        sp = csub.add_parser(name, help=help_, description=help_)
        sp.set_defaults(fn=fn)
        sp.add_argument("event", metavar="EVENT")
        sp.add_argument("name", metavar="CATEGORY")
        sp.add_argument("player", metavar="PLAYER")
    sp = csub.add_parser("remove", help="remove a category and its prizes")
    sp.set_defaults(fn=cmd_category_remove)
    sp.add_argument("event", metavar="EVENT")
    sp.add_argument("name", metavar="NAME")
    sp = csub.add_parser("list", help="the categories, their rules and member counts")
    sp.set_defaults(fn=cmd_category_list)
    sp.add_argument("event", metavar="EVENT")
    sp.add_argument("--members", action="store_true", help="list each category's players too")

    prize = sub.add_parser("prize", help="prizes: amounts per place of a category (or overall)")
    zsub = prize.add_subparsers(dest="prize_command", required=True, parser_class=parser_class)
    sp = zsub.add_parser("add", help="set the prize of a place (CATEGORY 'overall' for the whole field)")
    sp.set_defaults(fn=cmd_prize_add)
    sp.add_argument("event", metavar="EVENT")
    sp.add_argument("category", metavar="CATEGORY")
    sp.add_argument("place", type=int, metavar="PLACE")
    sp.add_argument("amount", metavar="AMOUNT", help="in the event's currency, e.g. 150 or 150.50")
    sp = zsub.add_parser("remove", help="remove the prize of a place")
    sp.set_defaults(fn=cmd_prize_remove)
    sp.add_argument("event", metavar="EVENT")
    sp.add_argument("category", metavar="CATEGORY")
    sp.add_argument("place", type=int, metavar="PLACE")
    sp = zsub.add_parser("rules", help="the better-prize rule, how ties share, the currency")
    sp.set_defaults(fn=cmd_prize_rules)
    sp.add_argument("event", metavar="EVENT")
    sp.add_argument("--better", choices=("amount", "order"),
                    help="a player eligible for two prizes gets the larger (amount) or the list named first (order)")
    sp.add_argument("--ties", choices=("tiebreaks", "shared", "hort"),
                    help="players equal on points: tiebreaks decide, share equally, or the Hort system")
    sp.add_argument("--currency", help="a short code printed after amounts, e.g. EUR")
    sp.add_argument("--minor-digits", type=int, help="decimals of the currency (default 2)")
