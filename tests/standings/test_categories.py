"""Prize categories by rule and by hand, and the checks made before a category is stored."""

from __future__ import annotations

from datetime import date
from typing import Any

import pytest

from pairings import events as ev
from pairings.categories import age_on, define_category, describe_rule, members, set_member
from pairings.errors import PrizeError
from pairings.fold import fold
from pairings.state import CategoryRule, EventState

PEOPLE = [
    # id, rating, club, birth, sex, ratings per list, labels
    ("a", 2100, "Harbour", "2008-03-02", "f", {"fide": 2050}, ()),
    ("b", 1850, "harbour", "2008-03-01", "m", {"fide": 1790, "national": 1900}, ("local",)),
    ("c", None, None, "1960", "f", {}, ()),
    ("d", 1500, "Lantern", None, None, {"national": 1450}, ("Local", "student")),
    ("e", 1999, "Lantern", "1961-12-31", "m", {"fide": 2000}, ()),
]


def people(*extra: ev._Event) -> EventState:
    log: list[Any] = [ev.EventCreated(name="Category Cup", rounds=5)]
    for pid, rating, club, birth, sex, ratings, labels in PEOPLE:
        log.append(ev.PlayerRegistered(id=pid, name=f"Player {pid}", rating=rating, club=club, details=ev.PlayerDetailsModel(
            birth=birth, sex=sex, ratings=ratings, categories=labels)))
    log += list(extra)
    return fold(enumerate(log, 1))


def who(rule: CategoryRule) -> set[str]:
    state = people(*define_category(people(), "Test", rule))
    return set(members(state, state.categories["Test"]))


def test_age_on_a_date() -> None:
    # Whole years on the date; a year alone counts as born on 1 January (common practice, no source).
    assert age_on("2008-03-02", date(2026, 3, 1)) == 17
    assert age_on("2008-03-02", date(2026, 3, 2)) == 18
    assert age_on("1960", date(2026, 1, 1)) == 66
    assert age_on(None, date(2026, 1, 1)) is None and age_on("soon", date(2026, 1, 1)) is None


@pytest.mark.parametrize(("rule", "expected"), [
    (CategoryRule(age_under=18, age_on="2026-03-01"), {"a"}),     # b turns 18 that day, a the next
    (CategoryRule(age_under=18, age_on="2026-03-02"), set()),
    (CategoryRule(age_from=65, age_on="2026-12-31"), {"c", "e"}),     # e: 65 on 1961-12-31 + 65 years
    (CategoryRule(age_from=65, age_on="2026-12-30"), {"c"}),
    (CategoryRule(sex="f"), {"a", "c"}),
    (CategoryRule(rating_from=1800, rating_below=2000), {"b", "e"}),  # the event's own rating
    (CategoryRule(rating_below=2000, rating_list="fide"), {"b"}),      # on the FIDE list (c, d have none)
    (CategoryRule(unrated=True), {"c"}),
    (CategoryRule(unrated=True, rating_list="fide"), {"c", "d"}),
    (CategoryRule(label="LOCAL"), {"b", "d"}),
    (CategoryRule(club="HARBOUR"), {"a", "b"}),
    (CategoryRule(sex="f", age_under=20, age_on="2026-01-01"), {"a"}),   # every condition must hold
])
def test_rules(rule: CategoryRule, expected: set[str]) -> None:
    assert who(rule) == expected


def test_by_hand_in_and_out() -> None:
    defined = [ev.CategoryDefined(name="Club", rule=ev.CategoryRuleModel(club="Lantern")),
               ev.CategoryDefined(name="Guests")]
    state = people(*defined)
    state = people(*defined, *set_member(state, "club", "Player e", member=False),
                   *set_member(state, "guests", "a", member=True))
    assert members(state, state.categories["Club"]) == {"d"}
    assert members(state, state.categories["Guests"]) == {"a"}


@pytest.mark.parametrize(("name", "rule", "message"), [
    ("U18", CategoryRule(age_under=18), "needs the date"),
    ("U18", CategoryRule(age_under=18, age_on="1 March"), "YYYY-MM-DD"),
    ("Band", CategoryRule(rating_from=2000, rating_below=1800), "is empty"),
    ("Odd", CategoryRule(unrated=True, rating_from=1000), "both unrated"),
    ("Empty", CategoryRule(), "no condition"),
    ("Overall", CategoryRule(sex="f"), "whole field"),
    ("", CategoryRule(sex="f"), "category name is empty"),
])
def test_bad_categories_are_refused(name: str, rule: CategoryRule, message: str) -> None:
    with pytest.raises(PrizeError if message != "category name is empty" else ValueError, match=message):
        define_category(people(), name, rule)


def test_rules_in_words() -> None:
    assert describe_rule(CategoryRule(age_under=18, age_on="2026-01-01", sex="f")) == "under 18 on 2026-01-01, women"
    assert describe_rule(CategoryRule(rating_from=1600, rating_below=1800, rating_list="fide")) == (
        "rated 1600 below 1800 (fide)")
    assert describe_rule(CategoryRule(rating_from=2000)) == "rated 2000 or more"
    assert describe_rule(None) == "members given by hand"
