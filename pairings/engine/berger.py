"""Round-robin schedules from the Berger tables (FIDE Handbook C.05, Annex 1).

The published tables for 3-24 players are all produced by one rotation rule,
implemented here instead of being copied as data.

Notes
-----
For an even field of ``n`` seats, let ``m = n - 1`` and, in round ``r``
(1-based), arrange the seats ``1..m`` in the cyclic list

    ``L_r[i] = ((r - 1) * n/2 + i) mod m + 1``  for ``i = 0..m-1``

(each round starts ``n/2`` places further round the circle of ``m`` seats;
seat ``n`` stays fixed). The round's boards are then

- board 1: ``L_r[0]`` against seat ``n``; seat ``n`` takes the second side in
  odd rounds and the first side in even rounds;
- board ``k`` (``k = 2..n/2``): ``L_r[k-1]`` (first side) against ``L_r[n-k]``.

Round 1 of the 8-seat table thus reads 1-8, 2-7, 3-6, 4-5 and round 2 reads
8-5, 6-4, 7-3, 1-2, as in the published table.

An odd field uses the table of the next even size; the extra seat is a dummy
and the player drawn against it has the bye (C.05). A double round robin plays
the table twice, the second cycle with every pair's sides reversed, and its
first cycle plays the table's last two rounds in swapped order (the usual
practice with the Berger tables, from memory): otherwise seat 1 would play
the second side in the table's last round and in the first two rounds of the
reversed cycle, and seat ``n/2 + 1`` the first side three times. With the swap
no player has the same side three rounds running anywhere in the event (the
tests check every size).

References
----------
FIDE Handbook C.05 "General regulations for competitions", Annex 1
("Berger tables for round-robin tournaments").
"""

from __future__ import annotations

from pairings.errors import InputError

MIN_PLAYERS = 3
MAX_PLAYERS = 24


def _check_size(n_players: int) -> None:
    if not MIN_PLAYERS <= n_players <= MAX_PLAYERS:
        raise InputError(
            f"a round robin from the Berger tables needs {MIN_PLAYERS} to {MAX_PLAYERS} "
            f"players, not {n_players}"
        )


def berger_rounds(n_players: int, double: bool = False) -> int:
    """Number of rounds of a (double) round robin for ``n_players``.

    ``n - 1`` rounds for an even field, ``n`` for an odd one (every player has
    one bye); twice that for a double round robin.

    Raises
    ------
    InputError
        When ``n_players`` is outside 3..24.
    """
    _check_size(n_players)
    single = n_players - 1 if n_players % 2 == 0 else n_players
    return 2 * single if double else single


def berger_pairs(n_players: int, round: int, double: bool = False) -> list[tuple[int, int | None]]:
    """The pairs of one round from the Berger tables (C.05 Annex 1).

    Parameters
    ----------
    n_players
        Field size, 3..24; seats are numbered 1..n_players.
    round
        Round number, 1..``berger_rounds(n_players, double)``.
    double
        A double round robin: the first cycle plays the table's last two
        rounds in swapped order; the second cycle repeats the table (in its
        own order) with the sides reversed.

    Returns
    -------
    list of (first, second)
        1-based seats, first side first, in the table's board order. For an
        odd field the player drawn against the dummy seat appears as
        ``(seat, None)`` at the position the table gives that board (board 1).

    Raises
    ------
    InputError
        When ``n_players`` is outside 3..24 or ``round`` is out of range.
    """
    total = berger_rounds(n_players, double)
    if not 1 <= round <= total:
        raise InputError(f"round {round} is outside 1..{total} for {n_players} players")
    seats = n_players + n_players % 2
    cycle_length = seats - 1
    reverse = round > cycle_length
    r = round - cycle_length if reverse else round
    if double and not reverse and r >= cycle_length - 1:
        r = 2 * cycle_length - 1 - r  # the first cycle's last two rounds swapped (module Notes)

    half = seats // 2
    start = (r - 1) * half
    circle = [(start + i) % cycle_length + 1 for i in range(cycle_length)]
    pairs: list[tuple[int, int]] = [(circle[0], seats) if r % 2 == 1 else (seats, circle[0])]
    pairs += [(circle[k - 1], circle[seats - k]) for k in range(2, half + 1)]
    if reverse:
        pairs = [(b, a) for a, b in pairs]

    dummy = seats if seats != n_players else None
    out: list[tuple[int, int | None]] = []
    for a, b in pairs:
        if dummy in (a, b):
            out.append((b if a == dummy else a, None))
        else:
            out.append((a, b))
    return out
