"""Prize lists on a hand-worked event: one prize per player, the better-prize rule, ties
broken by tiebreaks, shared equally, or by the Hort system (from memory). Amounts in cents.

The event (3 rounds, 1-½-0; first side listed first):
  R1 P1-P5 1-0  P2-P6 1-0  P3-P7 1-0  P4-P8 1-0
  R2 P1-P2 1-0  P3-P4 1-0  P5-P6 ½-½  P7-P8 1-0
  R3 P1-P3 1-0  P2-P7 1-0  P4-P5 1-0  P6-P8 1-0
Final: P1 3, P2 2, P3 2, P4 2, P6 1½, P7 1, P5 ½, P8 0. With BH as the only tiebreak:
  P3 (P7 1 + P4 2 + P1 3 = 6) before P2 (P6 1½ + P1 3 + P7 1 = 5½) before P4 (P8 0 + P3 2 + P5 ½ = 2½).
Overall order: P1, P3, P2, P4, P6, P7, P5, P8.
Categories: Junior by hand (P2, P4, P7); Women by rule, sex f (P3, P6).
Prizes: overall 100.00 / 60.00 / 40.00; Junior 50.00 / 20.00; Women 30.00.
"""

from __future__ import annotations

import json
from typing import Any

import pytest

from pairings import events as ev
from pairings.categories import members
from pairings.errors import PrizeError
from pairings.fold import fold
from pairings.prizes import format_amount, parse_amount, prize_list, set_policy, set_prize
from pairings.state import BetterPrize, EventState, PrizePolicy, PrizeTies

ROUNDS = [
    [("P1", "P5", "1-0"), ("P2", "P6", "1-0"), ("P3", "P7", "1-0"), ("P4", "P8", "1-0")],
    [("P1", "P2", "1-0"), ("P3", "P4", "1-0"), ("P5", "P6", "1/2-1/2"), ("P7", "P8", "1-0")],
    [("P1", "P3", "1-0"), ("P2", "P7", "1-0"), ("P4", "P5", "1-0"), ("P6", "P8", "1-0")],
]
PRIZES = [(None, 1, 10000), (None, 2, 6000), (None, 3, 4000), ("Junior", 1, 5000), ("Junior", 2, 2000),
          ("Women", 1, 3000)]


def event(*policy: ev.PrizePolicySet, prizes: list[tuple[str | None, int, int]] = PRIZES,
          categories: bool = True) -> EventState:
    log: list[Any] = [ev.EventCreated(name="Prize Open", rounds=3, tiebreaks=("BH",))]
    for n in range(1, 9):
        sex = "f" if n in (3, 6) else "m"
        log.append(ev.PlayerRegistered(id=f"P{n}", name=f"Player {n}", rating=2000 - 10 * n,
                                       details=ev.PlayerDetailsModel(sex=sex)))
    if categories:
        log.append(ev.CategoryDefined(name="Junior"))
        log += [ev.CategoryMember(category="Junior", player=p) for p in ("P2", "P4", "P7")]
        log.append(ev.CategoryDefined(name="Women", rule=ev.CategoryRuleModel(sex="f")))
    log += [ev.PrizeSet(category=c, place=p, amount=a) for c, p, a in prizes]
    log += list(policy)
    for number, games in enumerate(ROUNDS, 1):
        log.append(ev.RoundDrafted(round=number, boards=tuple(
            ev.BoardModel(board=i, first=a, second=b, result=r) for i, (a, b, r) in enumerate(games, 1))))
        log.append(ev.RoundPublished(round=number))
    return fold(enumerate(log, 1))


def awards(state: EventState) -> list[tuple[str | None, str, str | None, int]]:
    return [(a.category, a.place, a.player, a.amount) for a in prize_list(state).awards]


def test_the_hand_worked_order() -> None:
    state = event()
    assert [r.player for r in prize_list(state).table.rows] == ["P1", "P3", "P2", "P4", "P6", "P7", "P5", "P8"]
    assert members(state, state.categories["Women"]) == {"P3", "P6"}


def test_better_prize_by_amount() -> None:
    # Best first: overall 1st 100 → P1; overall 2nd 60 → P3; Junior 1st 50 → P2 (third overall, but
    # 50 beats the overall 3rd's 40); overall 3rd 40 → P4; Women 1st 30 → P6 (P3 has a prize);
    # Junior 2nd 20 → P7 (P2 and P4 have prizes).
    assert awards(event()) == [
        (None, "1", "P1", 10000), (None, "2", "P3", 6000), (None, "3", "P4", 4000),
        ("Junior", "1", "P2", 5000), ("Junior", "2", "P7", 2000), ("Women", "1", "P6", 3000)]


def test_better_prize_by_order_of_the_lists() -> None:
    # The overall list first, whatever the amounts: P1, P3, P2 take it; Junior 1st → P4, 2nd → P7.
    assert awards(event(ev.PrizePolicySet(better=BetterPrize.ORDER))) == [
        (None, "1", "P1", 10000), (None, "2", "P3", 6000), (None, "3", "P2", 4000),
        ("Junior", "1", "P4", 5000), ("Junior", "2", "P7", 2000), ("Women", "1", "P6", 3000)]


def test_shared_equally() -> None:
    # P3 (overall 2nd) and P4 (overall 3rd) are both on 2 points: they add 60 + 40 and share 50 each.
    # P2, also on 2, took the better Junior prize and stays out of the share (one prize per player).
    assert awards(event(ev.PrizePolicySet(ties=PrizeTies.SHARED))) == [
        (None, "1", "P1", 10000), (None, "2-3", "P3", 5000), (None, "2-3", "P4", 5000),
        ("Junior", "1", "P2", 5000), ("Junior", "2", "P7", 2000), ("Women", "1", "P6", 3000)]


def test_hort_system() -> None:
    # Hort (from memory): half of each prize by tiebreaks (P3 30, P4 20), the other halves (30 + 20)
    # shared equally (25 each): P3 55, P4 45.
    got = awards(event(ev.PrizePolicySet(ties=PrizeTies.HORT)))
    assert got[1:3] == [(None, "2-3", "P3", 5500), (None, "2-3", "P4", 4500)]


def test_a_tied_player_without_a_prize_shares_and_odd_cents_go_in_tiebreak_order() -> None:
    # Overall prizes only: P3, P2, P4 tie on 2 points for places 2-4; prizes 2 and 3 (60 + 40 = 100)
    # shared by three: 33.34 to P3 (first by tiebreaks), 33.33 to P2 and P4.
    state = event(ev.PrizePolicySet(ties=PrizeTies.SHARED), prizes=PRIZES[:3], categories=False)
    assert awards(state) == [(None, "1", "P1", 10000), (None, "2-4", "P3", 3334), (None, "2-4", "P2", 3333),
                             (None, "2-4", "P4", 3333)]
    assert sum(a.amount for a in prize_list(state).awards) == 20000     # not a cent lost or made


def test_a_prize_nobody_can_take() -> None:
    state = event(prizes=[("Women", 1, 3000), ("Women", 2, 2000), ("Women", 3, 1000)])
    assert awards(state) == [("Women", "1", "P3", 3000), ("Women", "2", "P6", 2000), ("Women", "3", None, 1000)]


def test_amounts_are_integers_read_without_floats() -> None:
    cents = PrizePolicy(currency="EUR")
    assert parse_amount("150", cents) == 15000 and parse_amount("0.07", cents) == 7
    assert parse_amount("1,234.5", cents) == 123450
    assert format_amount(123450, cents) == "1,234.50 EUR"
    assert format_amount(500, PrizePolicy(minor_digits=0, currency="JPY")) == "500 JPY"
    for bad in ("1.234", "-5", "1e3", "ten", ""):
        with pytest.raises(PrizeError):
            parse_amount(bad, cents)


def test_prize_actions_check_before_writing() -> None:
    state = event()
    assert set_prize(state, "junior", 3, "12.50") == [ev.PrizeSet(category="Junior", place=3, amount=1250)]
    assert set_prize(state, "Overall", 4, "25")[0].category is None   # type: ignore[union-attr]
    with pytest.raises(PrizeError, match="no category 'Seniors'"):
        set_prize(state, "Seniors", 1, "10")
    with pytest.raises(PrizeError, match="places start at 1"):
        set_prize(state, "overall", 0, "10")
    with pytest.raises(PrizeError, match="remove them before"):
        set_policy(state, minor_digits=0)
    with pytest.raises(PrizeError, match="better is amount or order"):
        set_policy(state, better="cheapest")


def test_export_and_restore_carry_categories_prizes_and_rules() -> None:
    from pairings.interchange import export_event, restore_events

    state = event(ev.PrizePolicySet(ties=PrizeTies.HORT, currency="EUR"),
                  ev.CategoryMember(category="Women", player="P6", member=False))
    doc = export_event(state)
    again = fold(enumerate(restore_events(json.loads(json.dumps(doc))), 1))
    assert export_event(again)["awards"] == doc["awards"]
    assert again.prize_policy == state.prize_policy and again.prizes == state.prizes
    assert again.categories == state.categories        # rules, hand-given members and exclusions
    assert members(again, again.categories["Junior"]) == {"P2", "P4", "P7"}
    assert "awards" not in export_event(event(prizes=[], categories=False))   # nothing added when unused


@pytest.mark.parametrize(("awards", "message"), [
    ({"prizes": [{"category": "Nope", "place": 1, "amount": 5}]}, "unknown category 'Nope'"),
    ({"categories": [{"name": "A", "added": ["zz"]}]}, "unknown player 'zz'"),
    ({"categories": [{"name": "A"}, {"name": "A"}]}, "category 'A' appears twice"),
    ({"prizes": [{"category": None, "place": 1, "amount": 5}] * 2}, "two prizes"),
    ({"prizes": [{"category": None, "place": 1, "amount": 1.5}]}, "awards.prizes.0.amount"),
    ({"categories": [{"name": "U18", "rule": {"age_under": 18}}]}, "category 'U18': an age rule needs the date"),
    ({"categories": [{"name": "Overall"}]}, "names the whole field"),
])
def test_restore_refuses_bad_awards(awards: dict[str, Any], message: str) -> None:
    from pairings.errors import InputError
    from pairings.interchange import export_event, restore_events

    doc = export_event(event(prizes=[], categories=False)) | {"awards": awards}
    with pytest.raises(InputError, match=message):
        restore_events(doc)


def test_a_prize_left_over_says_whether_anyone_was_eligible() -> None:
    """Women 1st after five overall prizes: the women P3 and P6 (2nd and 5th) hold better overall prizes,
    so "no eligible player" would mislead; a category nobody is in says it."""
    overall = [(None, n, 10000 - 1000 * n) for n in range(1, 6)]
    for ties in (PrizeTies.TIEBREAKS, PrizeTies.SHARED):
        notes = {(a.category, a.place): a.note for a in prize_list(event(
            ev.PrizePolicySet(ties=ties), prizes=[*overall, ("Women", 1, 3000)])).awards}
        assert notes["Women", "1"] == "every eligible player already has a prize (one prize per player)", notes
    log = [ev.EventCreated(name="Empty", rounds=1), ev.PlayerRegistered(id="P1", name="Ann Bo", rating=1500),
           ev.PlayerRegistered(id="P2", name="Cy Do", rating=1400), ev.CategoryDefined(name="Guests"),
           ev.PrizeSet(category="Guests", place=1, amount=500),
           ev.RoundDrafted(round=1, boards=(ev.BoardModel(board=1, first="P1", second="P2", result="1-0"),)),
           ev.RoundPublished(round=1)]
    assert [a.note for a in prize_list(fold(enumerate(log, 1))).awards] == ["no eligible player"]
