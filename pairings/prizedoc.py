"""Categories, prizes and prize rules in the interchange document (its optional ``awards`` part).

:func:`awards_document` writes the part (None when the event has none, so
documents of events without prizes stay as they were); :func:`awards_events`
checks a part completely against the document's players and turns it into the
events that rebuild it, or raises :class:`~pairings.errors.InputError`.
"""

from __future__ import annotations

from typing import Any

from pydantic import BaseModel, ConfigDict, Field, ValidationError

from pairings import events as ev
from pairings.categories import OVERALL, check_rule
from pairings.errors import InputError
from pairings.state import BetterPrize, CategoryRule, EventState, PrizeTies


def awards_document(state: EventState) -> dict[str, Any] | None:
    if not state.categories and not state.prizes:
        return None
    p = state.prize_policy
    return {
        "categories": [
            {"name": c.name,
             "rule": ev.CategoryRuleModel(**{k: getattr(c.rule, k) for k in ev.CategoryRuleModel.model_fields})
             .model_dump(mode="json", exclude_defaults=True) if c.rule is not None else None,
             "added": sorted(c.added), "excluded": sorted(c.excluded)}
            for c in state.categories.values()
        ],
        "prizes": [{"category": z.category, "place": z.place, "amount": z.amount} for z in state.prizes],
        "prize_rules": {"better": p.better.value, "ties": p.ties.value, "currency": p.currency,
                        "minor_digits": p.minor_digits},
    }


class _Strict(BaseModel):
    model_config = ConfigDict(extra="forbid")


class _Category(_Strict):
    name: str = Field(min_length=1, max_length=40)
    rule: ev.CategoryRuleModel | None = None
    added: list[str] = []
    excluded: list[str] = []


class _Prize(_Strict):
    category: str | None
    place: int = Field(ge=1)
    amount: int = Field(ge=0)


class _Rules(_Strict):
    better: BetterPrize = BetterPrize.AMOUNT
    ties: PrizeTies = PrizeTies.TIEBREAKS
    currency: str = Field(default="", max_length=5)
    minor_digits: int = Field(default=2, ge=0, le=3)


class _Awards(_Strict):
    categories: list[_Category] = []
    prizes: list[_Prize] = []
    prize_rules: _Rules = _Rules()


def awards_events(data: object, players: set[str]) -> list[ev.Event]:
    """The events that rebuild an ``awards`` part; ``players`` are the document's player ids."""
    try:
        doc = _Awards.model_validate(data)
    except ValidationError as exc:
        err = exc.errors()[0]
        where = ".".join(str(x) for x in err["loc"]) or "awards"
        raise InputError(f"not a pairings-event document: awards.{where}: {err['msg']}") from None
    names = [c.name for c in doc.categories]
    twice = next((n for n in names if names.count(n) > 1), None)
    if twice is not None:
        raise InputError(f"awards: category {twice!r} appears twice")
    for c in doc.categories:
        if c.name.casefold() == OVERALL:
            raise InputError(f"awards: {OVERALL!r} names the whole field, not a category")
        if c.rule is not None:
            try:
                check_rule(CategoryRule(**c.rule.model_dump()))
            except InputError as exc:
                raise InputError(f"awards: category {c.name!r}: {exc}") from None
        stray = next((p for p in c.added + c.excluded if p not in players), None)
        if stray is not None:
            raise InputError(f"awards: category {c.name!r} names unknown player {stray!r}")
    places = [(z.category, z.place) for z in doc.prizes]
    for z in doc.prizes:
        if z.category is not None and z.category not in names:
            raise InputError(f"awards: a prize names unknown category {z.category!r}")
        if places.count((z.category, z.place)) > 1:
            raise InputError(f"awards: place {z.place} of {z.category or 'overall'} has two prizes")
    r = doc.prize_rules
    out: list[ev.Event] = [ev.PrizePolicySet(better=r.better, ties=r.ties, currency=r.currency,
                                             minor_digits=r.minor_digits)]
    for c in doc.categories:
        out.append(ev.CategoryDefined(name=c.name, rule=c.rule))
        out += [ev.CategoryMember(category=c.name, player=p, member=True) for p in c.added]
        out += [ev.CategoryMember(category=c.name, player=p, member=False) for p in c.excluded]
    out += [ev.PrizeSet(category=z.category, place=z.place, amount=z.amount) for z in doc.prizes]
    return out
