"""Berger tables (FIDE Handbook C.05, Annex 1): published rows and brute-checked properties."""

from __future__ import annotations

from collections import Counter
from itertools import combinations

import pytest

from pairings.engine.berger import berger_pairs, berger_rounds
from pairings.errors import InputError

SIZES = range(3, 25)


def _cycle(n: int, double: bool = False) -> list[list[tuple[int, int | None]]]:
    return [berger_pairs(n, r, double) for r in range(1, berger_rounds(n, double) + 1)]


def _sides(n: int, double: bool = False) -> dict[int, str]:
    """Each seat's sides round by round: F (first), S (second), - (bye)."""
    out: dict[int, list[str]] = {seat: [] for seat in range(1, n + 1)}
    for pairs in _cycle(n, double):
        for a, b in pairs:
            out[a].append("F" if b is not None else "-")
            if b is not None:
                out[b].append("S")
    return {seat: "".join(s) for seat, s in out.items()}


def _breaks(sides: str) -> int:
    """Consecutive games on the same side (a bye neither breaks nor separates)."""
    played = sides.replace("-", "")
    return sum(1 for x, y in zip(played, played[1:]) if x == y)


# FIDE Handbook C.05 Annex 1, Berger tables for 4, 6 and 8 players (from memory).
PUBLISHED = {
    4: [
        [(1, 4), (2, 3)],
        [(4, 3), (1, 2)],
        [(2, 4), (3, 1)],
    ],
    6: [
        [(1, 6), (2, 5), (3, 4)],
        [(6, 4), (5, 3), (1, 2)],
        [(2, 6), (3, 1), (4, 5)],
        [(6, 5), (1, 4), (2, 3)],
        [(3, 6), (4, 2), (5, 1)],
    ],
    8: [
        [(1, 8), (2, 7), (3, 6), (4, 5)],
        [(8, 5), (6, 4), (7, 3), (1, 2)],
        [(2, 8), (3, 1), (4, 7), (5, 6)],
        [(8, 6), (7, 5), (1, 4), (2, 3)],
        [(3, 8), (4, 2), (5, 1), (6, 7)],
        [(8, 7), (1, 6), (2, 5), (3, 4)],
        [(4, 8), (5, 3), (6, 2), (7, 1)],
    ],
}


@pytest.mark.parametrize("n", sorted(PUBLISHED))
def test_published_tables(n: int) -> None:
    assert _cycle(n) == PUBLISHED[n]


def test_published_first_rows_of_larger_tables() -> None:
    # FIDE Handbook C.05 Annex 1, rounds 1 and 2 of the 10- and 14-player tables (from memory).
    assert berger_pairs(10, 1) == [(1, 10), (2, 9), (3, 8), (4, 7), (5, 6)]
    assert berger_pairs(10, 2) == [(10, 6), (7, 5), (8, 4), (9, 3), (1, 2)]
    assert berger_pairs(14, 1) == [(1, 14), (2, 13), (3, 12), (4, 11), (5, 10), (6, 9), (7, 8)]
    assert berger_pairs(14, 2) == [(14, 8), (9, 7), (10, 6), (11, 5), (12, 4), (13, 3), (1, 2)]


def test_odd_field_uses_next_table_with_a_dummy() -> None:
    # FIDE Handbook C.05: for an odd number of players the one drawn against the extra
    # (highest) number has the bye; compared with our own 6-player table (checked above).
    for r in range(1, 6):
        expected: list[tuple[int, int | None]] = [
            (a if b == 6 else b, None) if 6 in (a, b) else (a, b) for a, b in PUBLISHED[6][r - 1]
        ]
        assert berger_pairs(5, r) == expected


@pytest.mark.parametrize("n", SIZES)
def test_rounds_count(n: int) -> None:
    single = n - 1 if n % 2 == 0 else n
    assert berger_rounds(n) == single
    assert berger_rounds(n, double=True) == 2 * single


@pytest.mark.parametrize("n", SIZES)
def test_every_pair_meets_once_per_cycle(n: int) -> None:
    # brute force: count every meeting over the cycle
    meetings = Counter(
        frozenset((a, b)) for pairs in _cycle(n) for a, b in pairs if b is not None
    )
    assert set(meetings) == {frozenset(p) for p in combinations(range(1, n + 1), 2)}
    assert set(meetings.values()) == {1}


@pytest.mark.parametrize("n", SIZES)
def test_each_round_seats_everyone_once(n: int) -> None:
    for pairs in _cycle(n, double=True):
        seats = [s for pair in pairs for s in pair if s is not None]
        assert sorted(seats) == list(range(1, n + 1))
        assert len(pairs) == (n + 1) // 2
        assert sum(1 for _, b in pairs if b is None) == n % 2


@pytest.mark.parametrize("n", SIZES)
def test_odd_field_every_player_has_one_bye(n: int) -> None:
    byes = Counter(a for pairs in _cycle(n) for a, b in pairs if b is None)
    if n % 2:
        assert byes == Counter(range(1, n + 1))
    else:
        assert not byes


@pytest.mark.parametrize("n", [n for n in SIZES if n % 2 == 0])
def test_sides_alternate_as_the_tables_do(n: int) -> None:
    # Properties of the published tables (brute-checked here, stated from memory): the fixed
    # seat n and seat n/2 alternate throughout, every other seat repeats a side exactly once,
    # so the table has n - 2 breaks, the least any round robin can have (de Werra 1981, from
    # memory). Seat n has the second side in round 1; seats 1..n/2 start on the first side.
    sides = _sides(n)
    for seat, s in sides.items():
        assert _breaks(s) == (0 if seat in (n, n // 2) else 1), (seat, s)
        assert abs(s.count("F") - s.count("S")) == 1
        assert s[0] == ("F" if seat <= n // 2 else "S")
    assert sum(_breaks(s) for s in sides.values()) == n - 2


@pytest.mark.parametrize("n", [n for n in SIZES if n % 2 == 1])
def test_odd_field_sides_balanced(n: int) -> None:
    # n - 1 games each: an even number, split evenly between the sides (brute force).
    for s in _sides(n).values():
        assert s.count("-") == 1
        assert s.count("F") == s.count("S") == (n - 1) // 2


@pytest.mark.parametrize("n", SIZES)
def test_double_round_repeats_with_sides_reversed(n: int) -> None:
    single = berger_rounds(n)
    for r in range(1, single + 1):
        second = berger_pairs(n, r + single, double=True)
        assert second == [(a, None) if b is None else (b, a) for a, b in berger_pairs(n, r)]
    # The first cycle plays the same table rounds (its last two swapped, tested below).
    assert sorted(map(str, _cycle(n, double=True)[:single])) == sorted(map(str, _cycle(n)))
    meetings = Counter(
        frozenset((a, b)) for pairs in _cycle(n, double=True) for a, b in pairs if b is not None
    )
    assert set(meetings.values()) == {2}
    firsts = Counter((a, b) for pairs in _cycle(n, double=True) for a, b in pairs if b is not None)
    assert set(firsts.values()) == {1}  # each player has the first side once against each other


@pytest.mark.parametrize("n", [2, 1, 0, -3, 25, 40])
def test_field_size_out_of_range(n: int) -> None:
    with pytest.raises(InputError):
        berger_rounds(n)
    with pytest.raises(InputError):
        berger_pairs(n, 1)


@pytest.mark.parametrize(("n", "double", "r"), [(4, False, 0), (4, False, 4), (5, False, 6), (6, True, 11), (6, True, -1)])
def test_round_out_of_range(n: int, double: bool, r: int) -> None:
    with pytest.raises(InputError):
        berger_pairs(n, r, double)


def test_last_round_in_range_is_accepted() -> None:
    assert len(berger_pairs(6, 10, double=True)) == 3
    assert len(berger_pairs(7, 7)) == 4


def _played_runs(sides: str) -> int:
    """The longest run of one side over the games played (a bye neither breaks nor separates)."""
    played = sides.replace("-", "")
    longest = run = 0
    for k, s in enumerate(played):
        run = run + 1 if k and s == played[k - 1] else 1
        longest = max(longest, run)
    return longest


@pytest.mark.parametrize("n", SIZES)
def test_double_round_robin_never_gives_a_side_three_times_running(n: int) -> None:
    # Brute force over the whole double event: the first cycle's last two table rounds are swapped
    # (the Berger-table practice, from memory), so no seat plays one side three rounds in a row,
    # also across the two cycles.
    for seat, s in _sides(n, double=True).items():
        assert _played_runs(s) <= 2, (n, seat, s)


def test_double_round_robin_of_six_rounds_five_to_seven() -> None:
    # Unswapped, seat 1 had S, S, S and seat 4 F, F, F in rounds 5-7 (table round 5, then the
    # reversed rounds 1 and 2).
    sides = _sides(6, double=True)
    assert sides[1][4:7] != "SSS" and sides[4][4:7] != "FFF"
    assert sides[1] == "FFSSFSSFSF" and sides[4] == "SSFFSFFSFS"


@pytest.mark.parametrize("n", sorted(PUBLISHED))
def test_double_cycles_are_the_published_table(n: int) -> None:
    # FIDE Handbook C.05 Annex 1 (from memory, as above): the first cycle is the table with its last
    # two rounds swapped, the second cycle the table in its own order with every side reversed.
    table = PUBLISHED[n]
    cycle = len(table)
    double = _cycle(n, double=True)
    assert double[:cycle] == table[:-2] + [table[-1], table[-2]]
    assert double[cycle:] == [[(b, a) for a, b in pairs] for pairs in table]
    assert _cycle(n) == table  # a single round robin keeps the table's order
