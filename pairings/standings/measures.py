"""Tiebreaks from the player's own results and from the opponents' results (FIDE Handbook C.07).

Definitions follow the C.07 Tie-Break Regulations, the 2023 text as remembered
(the definitions were not read from the document: "from memory" throughout).
Each function takes a :class:`~pairings.standings.context.Context` and a
modifier and returns every player's value at once, so values that depend on
other players' values (AOB, Koya) are worked out once.

Modifiers (C.07, from memory): cut ``("C", n)`` drops the ``n`` least
significant contributions, median ``("M", n)`` drops the ``n`` lowest and the
``n`` highest. Under the dummy-opponent treatment a voluntary unplayed round's
contribution is cut first (C.07 2023, as remembered, low confidence).
"""

from __future__ import annotations

from typing import Callable, Iterable, TypeVar

from pairings.points import ZERO, Points, total
from pairings.standings.context import Context, Slot, SlotKind
from pairings.state import PlayerId, Side, Unplayed

Modifier = tuple[str, int] | None
"""``None``, ``("C", n)`` (cut n) or ``("M", n)`` (median n)."""
Values = dict[PlayerId, Points]
"""Every player's value of one tiebreak, exact (counts and ratings are whole fractions)."""
Measure = Callable[[Context, Modifier], Values]
Amount = TypeVar("Amount", Points, int)


def trim(items: Iterable[tuple[tuple[Points | int, ...], Amount]], modifier: Modifier) -> list[Amount]:
    """The amounts left after the modifier, each item given as ``(significance, amount)``.

    Items sort by significance, least significant first; cut drops from the low
    end, median from both ends. Fewer items than the modifier drops leave nothing.
    Without a modifier every amount is left, in the order given (nothing to sort).
    """
    if modifier is None:
        return [amount for _, amount in items]
    ordered = [amount for _, amount in sorted(items, key=lambda item: item[0])]
    kind, n = modifier
    if kind == "C":
        return ordered[n:]
    return ordered[n: max(n, len(ordered) - n)]


def _cut_first(ctx: Context, slot: Slot) -> int:
    """0 for a contribution that a cut must drop before any other (a VUR under the 2023 treatment)."""
    return 0 if ctx.unplayed is Unplayed.DUMMY_OPPONENT and slot.voluntary else 1


def buchholz(ctx: Context, modifier: Modifier) -> Values:
    """BH: the sum of the opponents' scores (C.07, Buchholz), cut or median as asked.

    Opponents count with :attr:`Context.for_others`; an unplayed round adds a
    virtual or dummy opponent, or nothing, as the context's treatment says.
    """
    return {
        pid: total(trim((((_cut_first(ctx, slot), value), value) for slot, value in ctx.opponent_values(pid)),
                        modifier))
        for pid in ctx.slots
    }


def sonneborn_berger(ctx: Context, modifier: Modifier) -> Values:
    """SB: each opponent's score times the player's result against them (1, ½, 0), summed (C.07).

    An unplayed round weighs its virtual or dummy opponent by the points the
    round gave, as a share of a win (a half-point bye weighs ½). A cut drops the
    opponents with the lowest scores (the smaller contribution first between equal
    scores): our reading of "least significant", from memory.
    """
    return {
        pid: total(trim((((_cut_first(ctx, slot), value, product), product)
                         for slot, value, product in ((s, v, s.fraction * v) for s, v in ctx.opponent_values(pid))),
                        modifier))
        for pid in ctx.slots
    }


def fore_buchholz(ctx: Context, modifier: Modifier) -> Values:
    """FB: Buchholz with every game of the last round counted as a draw, for everyone (C.07).

    It can be fixed before the last round's results are in. Byes and forfeits
    of the last round keep their points (our decision: only games count as drawn).
    """
    from pairings.standings.context import build_context

    return buchholz(build_context(ctx.state, ctx.last, ctx.unplayed, last_drawn=True), modifier)


def average_opponents_buchholz(ctx: Context, modifier: Modifier) -> Values:
    """AOB: the mean Buchholz of the opponents met (C.07); 0 without an opponent.

    Virtual and dummy opponents have no Buchholz, so only real opponents count.
    """
    bh = buchholz(ctx, None)
    out: Values = {}
    for pid, slots in ctx.slots.items():
        values = [bh[s.opponent] for s in slots if s.opponent is not None]
        out[pid] = total(values) / len(values) if values else ZERO
    return out


def wins(ctx: Context, modifier: Modifier) -> Values:
    """WIN: rounds in which the player scored a win's points, with or without play (C.07 2023, from memory)."""
    return {pid: Points(sum(1 for s in slots if s.won)) for pid, slots in ctx.slots.items()}


def _played(slots: tuple[Slot, ...]) -> list[Slot]:
    return [s for s in slots if s.kind is SlotKind.PLAYED]


def games_won(ctx: Context, modifier: Modifier) -> Values:
    """WON: games won over the board (forfeit wins and byes do not count) (C.07, from memory)."""
    return {pid: Points(sum(1 for s in _played(slots) if s.fraction == 1)) for pid, slots in ctx.slots.items()}


def games_second(ctx: Context, modifier: Modifier) -> Values:
    """BPG: games played over the board with Black, the second side (C.07, from memory).

    In an event without sides it counts games as the second-listed player, which
    carries no meaning; such events should not use it (the defaults do not).
    """
    return {pid: Points(sum(1 for s in _played(slots) if s.side is Side.SECOND)) for pid, slots in ctx.slots.items()}


def wins_second(ctx: Context, modifier: Modifier) -> Values:
    """BWG: games won over the board with Black, the second side (C.07, from memory)."""
    return {
        pid: Points(sum(1 for s in _played(slots) if s.side is Side.SECOND and s.fraction == 1))
        for pid, slots in ctx.slots.items()
    }


def progressive(ctx: Context, modifier: Modifier) -> Values:
    """PS: the sum of the running scores after each round (C.07, progressive score).

    Cut ``n`` drops the ``n`` earliest running scores (C.07, from memory, low
    confidence). Points won without play count like any other points here.
    """
    drop = modifier[1] if modifier is not None else 0
    out: Values = {}
    for pid, slots in ctx.slots.items():
        running, progress = ZERO, ZERO
        for n, slot in enumerate(slots):
            running += slot.points
            if n >= drop:
                progress += running
        out[pid] = progress
    return out


def koya(ctx: Context, modifier: Modifier) -> Values:
    """KS: points scored in games played against opponents who finished with at least half
    the maximum possible score (C.07, Koya system, the usual 50 % limit; from memory).

    The maximum is a win's points times the rounds counted; opponents count with
    their actual final scores.
    """
    limit = ctx.scoring.win * ctx.last / 2
    return {
        pid: total(s.points for s in _played(slots) if s.opponent is not None and ctx.points[s.opponent] >= limit)
        for pid, slots in ctx.slots.items()
    }
