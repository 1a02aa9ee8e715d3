"""The prize list: places and amounts per category, one prize per player.

Amounts are integer minor units (cents) throughout, never floats. The rules,
as common practice has them (no single published source; the event's
regulations prevail):

* **One prize per player.** Prizes are handed out best first: by the
  organiser's better-prize rule, either the larger amount (between equal
  amounts the overall list, then the categories in the order defined) or the
  order of the lists alone. Each goes to the best-placed player of its list who
  has no prize yet.
* **Ties.** Players equal on points are separated by the event's tiebreaks
  (``tiebreaks``); or the prizes of the places they occupy are added and shared
  equally (``shared``); or, the Hort system as remembered, half of each prize
  goes by the tiebreaks and the other half is shared equally (``hort``). A
  player tied with prize winners and without a prize of their own shares too.
  Minor units that do not divide go one each to the tied players in tiebreak order.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Sequence

from pairings import events as ev
from pairings.categories import OVERALL, find_category, members
from pairings.errors import PrizeError
from pairings.points import Points
from pairings.standings import Standings, standings
from pairings.state import BetterPrize, EventState, PlayerId, Prize, PrizePolicy, PrizeTies


@dataclass(frozen=True, slots=True)
class Award:
    category: str | None
    """None for the overall standings."""
    place: str
    """``"2"``, or ``"2-4"`` for a shared place."""
    player: PlayerId | None
    """None when no eligible player is left for the prize."""
    points: Points | None
    amount: int
    """Integer minor units."""
    note: str = ""


@dataclass(frozen=True, slots=True)
class PrizeList:
    awards: tuple[Award, ...]
    policy: PrizePolicy
    table: Standings
    """The standings the prizes were read from."""


_SCALE = (1, 10, 100, 1000)
"""Minor units per major unit, by the number of minor digits (0 to 3)."""


def format_amount(minor: int, policy: PrizePolicy) -> str:
    """``12345`` → ``"123.45 EUR"`` (with the event's minor digits and currency); integers only."""
    digits = policy.minor_digits
    whole, part = divmod(minor, _SCALE[digits]) if digits else (minor, 0)
    text = f"{whole:,}" + (f".{part:0{digits}d}" if digits else "")
    return f"{text} {policy.currency}".strip()


def parse_amount(text: str, policy: PrizePolicy) -> int:
    """``"150"`` or ``"150.50"`` → minor units, read as a decimal string (no float on the way)."""
    digits = policy.minor_digits
    found = re.fullmatch(r"(\d{1,12})(?:\.(\d+))?", text.strip().replace(",", ""))
    if found is None or (found.group(2) and len(found.group(2)) > digits):
        unit = f" with at most {digits} decimals" if digits else " without decimals"
        raise PrizeError(f"amount {text!r}: write a number{unit}, e.g. {'150.50' if digits else '150'}")
    whole: str = found.group(1)
    part: str = (found.group(2) or "").ljust(digits, "0")
    return int(whole) * _SCALE[digits] + (int(part) if part else 0)


def _lists(state: EventState) -> list[str | None]:
    return [None, *state.categories]


def _eligible(state: EventState, table: Standings) -> dict[str | None, list[PlayerId]]:
    """Each list's players in standings order (the overall list holds everyone)."""
    order = [row.player for row in table.rows]
    out: dict[str | None, list[PlayerId]] = {None: order}
    for name, category in state.categories.items():
        inside = members(state, category)
        out[name] = [pid for pid in order if pid in inside]
    return out


def _best_first(state: EventState) -> list[Prize]:
    index = {name: n for n, name in enumerate(_lists(state))}
    if state.prize_policy.better is BetterPrize.AMOUNT:
        return sorted(state.prizes, key=lambda p: (-p.amount, index[p.category], p.place))
    return sorted(state.prizes, key=lambda p: (index[p.category], p.place))


def _split(pot: int, count: int) -> list[int]:
    """``pot`` minor units in ``count`` shares; the remainder one each to the first shares."""
    share, left = divmod(pot, count)
    return [share + (1 if n < left else 0) for n in range(count)]


def prize_list(state: EventState, after_round: int | None = None) -> PrizeList:
    """Hand out the event's prizes on the standings after ``after_round`` (default: the last published).

    Raises InputError when no round is published yet (as the standings do).
    """
    table = standings(state, after_round=after_round)
    points = {row.player: row.points for row in table.rows}
    eligible = _eligible(state, table)
    won: dict[PlayerId, Prize] = {}
    winner: dict[tuple[str | None, int], PlayerId | None] = {}
    for prize in _best_first(state):
        pick = next((pid for pid in eligible[prize.category] if pid not in won), None)
        winner[prize.category, prize.place] = pick
        if pick is not None:
            won[pick] = prize
    awards: list[Award] = []
    policy = state.prize_policy
    for name in _lists(state):
        prizes = sorted((p for p in state.prizes if p.category == name), key=lambda p: p.place)
        if policy.ties is not PrizeTies.TIEBREAKS:
            awards += _shared(name, prizes, winner, won, eligible[name], points, policy.ties)
            continue
        for p in prizes:
            pid = winner[name, p.place]
            if pid is None:
                awards.append(Award(name, str(p.place), None, None, p.amount, _left_over(eligible[name])))
            else:
                awards.append(Award(name, str(p.place), pid, points[pid], p.amount))
    return PrizeList(tuple(awards), policy, table)


def _left_over(eligible: list[PlayerId]) -> str:
    """Why a prize goes to no one: nobody is in its list, or all of them hold a prize already."""
    return "every eligible player already has a prize (one prize per player)" if eligible else "no eligible player"


def _shared(name: str | None, prizes: list[Prize], winner: dict[tuple[str | None, int], PlayerId | None],
            won: dict[PlayerId, Prize], eligible: list[PlayerId], points: dict[PlayerId, Points],
            ties: PrizeTies) -> list[Award]:
    """The list's awards when tied players share (equally, or by the Hort system)."""
    out: list[Award] = []
    done: set[PlayerId] = set()
    for prize in prizes:
        pid = winner[name, prize.place]
        if pid is None:
            out.append(Award(name, str(prize.place), None, None, prize.amount, _left_over(eligible)))
            continue
        if pid in done:
            continue
        group = [q for q in eligible if points[q] == points[pid]
                 and (q not in won or won[q].category == name) and q not in done]
        for q in group:
            if q not in won:
                won[q] = Prize(name, 0, 0)        # shares here, so no other list gives them a prize
        own = {q: won[q].amount if won[q].category == name and won[q].place else 0 for q in group}
        places = [won[q].place for q in group if won[q].place]
        first = min(places)
        label = str(first) if len(group) == 1 else f"{first}-{first + len(group) - 1}"
        if ties is PrizeTies.SHARED:
            amounts = _split(sum(own.values()), len(group))
            note = "shared equally" if len(group) > 1 else ""
        else:
            halves = _split(sum(a - a // 2 for a in own.values()), len(group))
            amounts = [own[q] // 2 + h for q, h in zip(group, halves)]
            note = "Hort system: half by tiebreaks, half shared" if len(group) > 1 else ""
        for q, amount in zip(group, amounts):
            out.append(Award(name, label, q, points[q], amount, note))
            done.add(q)
    return out


# -- actions: state → events ------------------------------------------------------------------


def _list_name(state: EventState, category: str) -> str | None:
    return None if category.strip().casefold() == OVERALL else find_category(state, category).name


def set_prize(state: EventState, category: str, place: int, amount: str) -> Sequence[ev.Event]:
    """The prize for ``place`` of a category (``overall`` for the whole field), in the event's currency."""
    if place < 1:
        raise PrizeError(f"place {place}: places start at 1")
    name = _list_name(state, category)
    return [ev.PrizeSet(category=name, place=place, amount=parse_amount(amount, state.prize_policy))]


def remove_prize(state: EventState, category: str, place: int) -> Sequence[ev.Event]:
    name = _list_name(state, category)
    if not any(p.category == name and p.place == place for p in state.prizes):
        raise PrizeError(f"no prize for place {place} of {category!r}")
    return [ev.PrizeSet(category=name, place=place, amount=None)]


def set_policy(state: EventState, better: str | None = None, ties: str | None = None,
               currency: str | None = None, minor_digits: int | None = None) -> Sequence[ev.Event]:
    """Change the better-prize rule, the tie rule, the currency or its minor digits."""
    try:
        rule = BetterPrize(better) if better is not None else None
        split = PrizeTies(ties) if ties is not None else None
    except ValueError as exc:
        raise PrizeError(f"{exc}: better is amount or order; ties are tiebreaks, shared or hort") from None
    if minor_digits is not None:
        if not 0 <= minor_digits <= 3:
            raise PrizeError("minor digits must be 0 to 3")
        if state.prizes and minor_digits != state.prize_policy.minor_digits:
            raise PrizeError("prizes are already set in the current minor unit: remove them before changing it")
    if currency is not None and not re.fullmatch(r"[A-Za-z$€£¥]{0,5}", currency):
        raise PrizeError(f"currency {currency!r}: give a short code such as EUR")
    if all(x is None for x in (rule, split, currency, minor_digits)):
        raise PrizeError("nothing to change: give --better, --ties, --currency or --minor-digits")
    return [ev.PrizePolicySet(better=rule, ties=split, currency=currency, minor_digits=minor_digits)]
