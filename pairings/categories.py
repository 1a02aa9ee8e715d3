"""Prize categories: who belongs to each (by rule and by hand), and the actions that define them.

A category holds the players its rule takes in (every condition given must
hold: an age on a date, sex, a rating band on a chosen rating list, unrated,
a free label, a club), plus the players put in by hand, less those left out by
hand; a category without a rule has only hand-given members. Pure: state in,
events or members out; every check is made before any event is produced.
"""

from __future__ import annotations

from datetime import date
from typing import Sequence

from pairings import events as ev
from pairings.actions import clean_text, find_player
from pairings.errors import PrizeError
from pairings.state import Category, CategoryRule, EventState, Player, PlayerId

OVERALL = "overall"
"""The name that stands for the whole field (the overall standings) in prize commands."""


def _birth(text: str) -> date | None:
    """A stored birth ``YYYY`` or ``YYYY-MM-DD``; a year alone counts as 1 January (common practice, no source)."""
    try:
        return date.fromisoformat(text) if len(text) > 4 else date(int(text), 1, 1)
    except ValueError:
        return None


def age_on(birth: str | None, on: date) -> int | None:
    """Whole years completed on ``on`` (None without a usable birth date)."""
    born = _birth(birth) if birth else None
    if born is None:
        return None
    return on.year - born.year - ((on.month, on.day) < (born.month, born.day))


def _rating(player: Player, rating_list: str | None) -> int | None:
    if rating_list is None:
        return player.rating
    return dict(player.details.ratings).get(rating_list)


def matches(rule: CategoryRule, player: Player) -> bool:
    """True when ``player`` meets every condition of ``rule``."""
    d = player.details
    if rule.age_under is not None or rule.age_from is not None:
        age = age_on(d.birth, date.fromisoformat(rule.age_on)) if rule.age_on else None
        if age is None:
            return False
        if rule.age_under is not None and age >= rule.age_under:
            return False
        if rule.age_from is not None and age < rule.age_from:
            return False
    if rule.sex is not None and d.sex != rule.sex:
        return False
    rating = _rating(player, rule.rating_list)
    if rule.unrated and rating is not None:
        return False
    if rule.rating_from is not None and (rating is None or rating < rule.rating_from):
        return False
    if rule.rating_below is not None and (rating is None or rating >= rule.rating_below):
        return False
    if rule.label is not None and rule.label.casefold() not in (c.casefold() for c in d.categories):
        return False
    if rule.club is not None and (player.club or "").casefold() != rule.club.casefold():
        return False
    return True


def members(state: EventState, category: Category) -> frozenset[PlayerId]:
    """The category's players: by rule, plus those put in by hand, less those left out by hand."""
    ruled = {p.id for p in state.players.values() if category.rule is not None and matches(category.rule, p)}
    return frozenset((ruled | category.added) - category.excluded)


def find_category(state: EventState, name: str) -> Category:
    """A category by name, any case; PrizeError listing the known ones otherwise."""
    for category in state.categories.values():
        if category.name.casefold() == name.strip().casefold():
            return category
    known = ", ".join(state.categories) or "none defined yet"
    raise PrizeError(f"no category {name!r} (categories: {known})")


def describe_rule(rule: CategoryRule | None) -> str:
    """The rule in words, for listings and sheets."""
    if rule is None:
        return "members given by hand"
    parts = []
    if rule.age_under is not None:
        parts.append(f"under {rule.age_under} on {rule.age_on}")
    if rule.age_from is not None:
        parts.append(f"aged {rule.age_from} or more on {rule.age_on}")
    if rule.sex is not None:
        parts.append({"f": "women", "m": "men"}[rule.sex])
    on_list = f" ({rule.rating_list})" if rule.rating_list else ""
    if rule.unrated:
        parts.append("unrated" + on_list)
    if rule.rating_from is not None or rule.rating_below is not None:
        low = f"{rule.rating_from}" if rule.rating_from is not None else ""
        high = f"below {rule.rating_below}" if rule.rating_below is not None else ""
        parts.append(f"rated {low}{' ' if low and high else ''}{high}{'' if high else ' or more'}{on_list}")
    if rule.label is not None:
        parts.append(f"label {rule.label}")
    if rule.club is not None:
        parts.append(f"club {rule.club}")
    return ", ".join(parts)


def check_rule(rule: CategoryRule) -> None:
    """Refuse a rule nobody could meet or that misses its date (PrizeError naming the problem)."""
    if (rule.age_under is not None or rule.age_from is not None) != (rule.age_on is not None):
        raise PrizeError("an age rule needs the date ages are counted on (--on YYYY-MM-DD), and --on an age")
    if rule.age_on is not None:
        try:
            date.fromisoformat(rule.age_on)
        except ValueError:
            raise PrizeError(f"date {rule.age_on!r}: write it as YYYY-MM-DD") from None
    if rule.age_under is not None and rule.age_from is not None and rule.age_from >= rule.age_under:
        raise PrizeError(f"nobody is aged {rule.age_from} or more and under {rule.age_under}")
    low, high = rule.rating_from, rule.rating_below
    if low is not None and high is not None and low >= high:
        raise PrizeError(f"rating band {low} to below {high} is empty")
    if rule.unrated and (low is not None or high is not None):
        raise PrizeError("a category cannot be both unrated and in a rating band")
    if rule == CategoryRule():
        raise PrizeError("the rule has no condition: give one, or --by-hand")


def define_category(state: EventState, name: str, rule: CategoryRule | None) -> Sequence[ev.Event]:
    """Define (or redefine) a category; checks the name and that the rule can be met."""
    name = clean_text(name, "category name", limit=40)
    if name.casefold() == OVERALL:
        raise PrizeError(f"{OVERALL!r} names the whole field: choose another category name")
    if rule is not None:
        check_rule(rule)
    existing = next((c.name for c in state.categories.values() if c.name.casefold() == name.casefold()), name)
    model = ev.CategoryRuleModel(**{
        k: getattr(rule, k) for k in ev.CategoryRuleModel.model_fields}) if rule is not None else None
    return [ev.CategoryDefined(name=existing, rule=model)]


def remove_category(state: EventState, name: str) -> Sequence[ev.Event]:
    return [ev.CategoryRemoved(name=find_category(state, name).name)]


def set_member(state: EventState, name: str, player: str, member: bool) -> Sequence[ev.Event]:
    """Put a player in a category by hand, or leave them out of it."""
    category = find_category(state, name)
    pid = find_player(state, player)
    return [ev.CategoryMember(category=category.name, player=pid, member=member)]
