"""The organiser's overrides of a draft, as plans the Round place previews and applies.

Each plan pairs the action that records the override (through
:mod:`pairings.actions`, which writes the reason into the log) with the draft
that action would produce, so the desk can show the cost difference against
the engine's optimum before anything is written. No pairing rule lives here:
the candidate drafts come from the engine, the checks from the actions.
"""

from __future__ import annotations

import threading
from dataclasses import dataclass
from typing import TYPE_CHECKING, Callable, Hashable, Sequence

from pairings import actions
from pairings.events import Event
from pairings.state import ByeKind, EventState, PlayerId, Round

if TYPE_CHECKING:
    from pairings.engine import Draft, Overrides

Pair = tuple[PlayerId, PlayerId]


@dataclass(frozen=True)
class Plan:
    """One override: what it is, the draft it gives, and the action recording it with a reason."""

    title: str
    candidate: Callable[[EventState], "Draft"]
    record: Callable[[EventState, str], Sequence[Event]]


def pins(rnd: Round) -> tuple[Pair, ...]:
    """The boards of the draft the organiser pinned earlier (kept through a re-pair)."""
    return tuple((g.first, g.second) for g in rnd.games if "pinned" in g.flags)


def _names(state: EventState, pair: Pair) -> str:
    return f"{state.players[pair[0]].name} – {state.players[pair[1]].name}"


def _repair(title: str, overrides: "Overrides", reason_head: str) -> Plan:
    return Plan(
        title=title,
        candidate=lambda s: actions.draft_next(s, overrides),
        record=lambda s, why: actions.pair(s, overrides, reason=f"{reason_head}: {why.strip()}" if why.strip() else "",
                                           replace=True),
    )


def swap_plan(state: EventState, a: PlayerId, b: PlayerId) -> Plan:
    from pairings import engine

    return Plan(
        title=f"swap {state.players[a].name} and {state.players[b].name}",
        candidate=lambda s: engine.swap(s, actions.draft_of(s), a, b),
        record=lambda s, why: actions.swap(s, a, b, why),
    )


def pin_plan(state: EventState, rnd: Round, board: int) -> Plan:
    from pairings.engine import Overrides

    game = rnd.game_on(board)
    assert game is not None
    pair = (game.first, game.second)
    kept = tuple(p for p in pins(rnd) if set(p) != set(pair)) + (pair,)
    head = f"pin board {board} ({_names(state, pair)}), re-pair the rest"
    return _repair(head, Overrides(pinned=kept), head)


def forbid_plan(state: EventState, rnd: Round, board: int) -> Plan:
    from pairings.engine import Overrides

    game = rnd.game_on(board)
    assert game is not None
    pair = (game.first, game.second)
    head = f"forbid {_names(state, pair)} in this draft"
    return _repair(head, Overrides(pinned=pins(rnd), forbidden=(pair,)), head)


def bye_plan(state: EventState, rnd: Round, player: PlayerId) -> Plan:
    """Move ``player`` onto the pairing bye, or off it when they hold it."""
    from pairings.engine import Overrides

    name = state.players[player].name
    on_bye = any(y.player == player and y.kind is ByeKind.PAIRING for y in rnd.byes)
    kept = tuple(p for p in pins(rnd) if player not in p)
    if on_bye:
        head = f"move {name} off the bye"
        return _repair(head, Overrides(pinned=kept, no_bye=frozenset({player})), head)
    head = f"move {name} to the bye"
    return _repair(head, Overrides(pinned=kept, bye=player), head)


PlanSpec = tuple[str, tuple[str, ...]]
"""An override as plain data, to send to another process: ``("pin", (board,))``, ``("forbid", (board,))``,
``("bye", (player,))`` or ``("swap", (player, player))``; board numbers as text."""


def make_plan(state: EventState, spec: PlanSpec) -> Plan:
    """The plan ``spec`` describes, on the open draft of ``state``."""
    kind, args = spec
    if kind == "swap":
        return swap_plan(state, PlayerId(args[0]), PlayerId(args[1]))
    rnd = actions.open_draft(state)
    if kind == "bye":
        return bye_plan(state, rnd, PlayerId(args[0]))
    make = {"pin": pin_plan, "forbid": forbid_plan}[kind]
    return make(state, rnd, int(args[0]))


def optimum_basis(state: EventState) -> Hashable:
    """Everything the engine's optimum for the next round depends on (not the draft itself)."""
    number = state.next_round_number
    done = tuple(
        (r.number, r.state, tuple((g.first, g.second, g.result) for g in r.games), r.byes)
        for r in state.rounds if r.number < number
    )
    players = tuple(
        (p.id, p.rating, p.name, p.status, p.entry_round, p.withdrawn_from) for p in state.players.values()
    )
    asked = tuple(sorted(state.requests.get(number, {}).items()))
    return (number, done, players, asked, state.forbidden, state.settings)


class OptimumCache:
    """The engine's optimum per basis, so several previews of one draft pair the field once."""

    def __init__(self) -> None:
        self._basis: Hashable = None
        self._draft: "Draft | None" = None
        self._lock = threading.Lock()
        """Previews run in worker threads; a superseded one may still be running."""

    def get(self, state: EventState) -> "Draft":
        basis = optimum_basis(state)
        with self._lock:
            if self._draft is None or basis != self._basis:
                self._draft = actions.draft_next(state)
                self._basis = basis
            return self._draft


def preview(state: EventState, plan: Plan, cache: OptimumCache) -> tuple["Draft", str]:
    """The plan's draft and its cost difference against the optimum, in words (engine.compare)."""
    from pairings import engine

    candidate = plan.candidate(state)
    return candidate, engine.compare(cache.get(state), candidate).describe()
