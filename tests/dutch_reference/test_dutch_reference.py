"""The product's Dutch drafts against the independent reference in this package.

The reference (``tests/dutch_reference``) shares no code with
``pairings.engine.dutch``: it reads the event's facts from the state model and
pairs by the spec's Dutch rules procedurally (C.04.3, edition effective 1 July
2025, with the 2026 float rule; the 2017 mechanics from memory, as marked).

Every round must agree (or both refuse it). Where a bracket's floaters would
leave the rest unpairable, both follow the Handbook's route: the bracket is
the penultimate pairing bracket (PPB), paired again so that the rest can be
completed (C.4), without C.7 ("just at the following bracket"), and the rest
is paired as one collapsed last bracket (CLB). The reference's ``EVERYWHERE``
route (completion kept in every bracket, the product's earlier reading)
stays only to show, on the two minimal cases below, that the
readings really differ.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import pytest

from pairings.engine import draft_round
from pairings.state import EventState
from tests.dutch_reference.events import RoundCheck, hand_event, play_event
from tests.dutch_reference.generation import exchanges
from tests.dutch_reference.rounds import EVERYWHERE, Unpairable, reference_round

Answer = tuple[tuple[tuple[str, str], ...], str | None] | None


@dataclass
class Tally:
    events: int = 0
    rounds: int = 0
    agree: int = 0
    refused_by_both: int = 0
    disagree: list[tuple[int, int, Answer, Answer]] = field(default_factory=list)
    events_all_agree: int = 0


def _reference(rc: RoundCheck) -> Answer:
    try:
        ref = reference_round(rc.state)
    except Unpairable:
        return None
    return ref.boards, ref.pab


def compare(seeds: range, players: tuple[int, int] = (4, 14), most_rounds: int = 8) -> Tally:
    """Play every event of ``seeds`` along the product's drafts, comparing each round with the reference."""
    tally = Tally()
    for seed in seeds:
        before = tally.rounds - tally.agree - tally.refused_by_both

        def check(rc: RoundCheck) -> None:
            tally.rounds += 1
            product: Answer = None if rc.draft is None else (
                tuple((b.first, b.second) for b in rc.draft.boards), rc.draft.pairing_bye)
            mine = _reference(rc)
            if product == mine:
                if product is None:
                    tally.refused_by_both += 1
                else:
                    tally.agree += 1
            else:
                tally.disagree.append((rc.seed, rc.round, product, mine))

        play_event(seed, check, players, most_rounds)
        tally.events += 1
        if tally.rounds - tally.agree - tally.refused_by_both == before:
            tally.events_all_agree += 1
    return tally


def _check(tally: Tally, events: int) -> None:
    assert tally.events == events
    assert tally.rounds >= 4 * events  # the events really ran (about 4.5 rounds each)
    assert tally.agree * 10 >= tally.rounds * 9  # most rounds are paired by both, identically
    assert not tally.disagree, f"rounds the reference pairs otherwise: {tally.disagree[:5]}"


def test_product_agrees_with_reference_on_300_events() -> None:
    _check(compare(range(300)), 300)


def test_product_agrees_with_reference_on_small_long_events() -> None:
    # 5-9 players over up to 8 rounds: late rounds often need the PPB/CLB route
    _check(compare(range(10_000, 10_150), (5, 9), 8), 150)


@pytest.mark.full
def test_product_agrees_with_reference_on_2000_events() -> None:
    _check(compare(range(2000)), 2000)


# --- round 1 check values (Handbook rules: S1 = top half against S2, colours by rule 5) ----------

def _round1(n: int) -> tuple[list[tuple[str, str]], str | None]:
    # seed 1: random.Random(1).random() < 0.5, the lot gives player 1 White
    state = hand_event(5, n, [], seed=1)
    ref = reference_round(state)
    return [tuple(b) for b in ref.boards], ref.pab  # type: ignore[misc]


def test_round1_eight_players() -> None:
    # C.04.3 round 1 (from memory): S1 = 1-4, S2 = 5-8, 1-5, 2-6, 3-7, 4-8; colour rule 5: the
    # higher player on odd boards gets the initial colour (White here), on even boards the other
    boards, pab = _round1(8)
    assert boards == [("p1", "p5"), ("p6", "p2"), ("p3", "p7"), ("p8", "p4")]
    assert pab is None
    draft = draft_round(hand_event(5, 8, [], seed=1))
    assert [(b.first, b.second) for b in draft.boards] == boards


def test_round1_nine_players_bye_to_the_lowest() -> None:
    # nine players: S1 = 1-4, S2 = 5-9; the first candidate leaves no. 9 over: the PAB (C.04.1 rule 3)
    boards, pab = _round1(9)
    assert boards == [("p1", "p5"), ("p6", "p2"), ("p3", "p7"), ("p8", "p4")]
    assert pab == "p9"
    draft = draft_round(hand_event(5, 9, [], seed=1))
    assert [(b.first, b.second) for b in draft.boards] == boards
    assert draft.pairing_bye == "p9"


def test_generation_order_worked_sequences() -> None:
    # the spec's worked sequences (C.04.3 D.2 as remembered): six and eight players
    six = [(o, i) for o, i in exchanges([1, 2, 3], [4, 5, 6])][1:10]
    assert six == [((3,), (4,)), ((3,), (5,)), ((2,), (4,)), ((3,), (6,)), ((2,), (5,)), ((1,), (4,)),
                   ((2,), (6,)), ((1,), (5,)), ((1,), (6,))]
    eight = exchanges([1, 2, 3, 4], [5, 6, 7, 8])
    doubles = [x for x in eight if len(x[0]) == 2][:8]
    assert doubles == [((3, 4), (5, 6)), ((3, 4), (5, 7)), ((2, 4), (5, 6)), ((3, 4), (5, 8)),
                       ((3, 4), (6, 7)), ((2, 4), (5, 7)), ((1, 4), (5, 6)), ((2, 3), (5, 6))]


# --- the known class, minimal case ----------------------------------------------------------------

def _completion_case() -> EventState:
    # Six players p1..p6 (pairing numbers 1..6), round 4 of 5 after:
    # R1 p1-p4 0-1, p5-p2 0-1, p3-p6 1-0; R2 p2-p3 0-1, p4-p5 1-0, p6-p1 1-0; R3 p3-p4 1-0,
    # p6-p2 1/2, p1-p5 1-0 (white first).
    return hand_event(5, 6, [
        [(1, 4, "0-1"), (5, 2, "0-1"), (3, 6, "1-0")],
        [(2, 3, "0-1"), (4, 5, "1-0"), (6, 1, "1-0")],
        [(3, 4, "1-0"), (6, 2, "1/2-1/2"), (1, 5, "1-0")],
    ])


# Derivation by the Handbook's route (C.04.3 A.9, C.4, C.7 as the spec states them, from memory).
# Scores: p3 3, p4 2, p2 1.5, p6 1.5, p1 1, p5 0. Met: p3 {2,4,6}, p4 {1,3,5}, p2 {3,5,6},
# p6 {1,2,3}, p1 {4,5,6}, p5 {1,2,4}. Colours: p3 WBW (B strong), p4 BWB (W strong), p2 BWB
# (W strong), p6 BWW (B absolute), p1 WBW (B strong), p5 WBB (W absolute).
# - 3 {p3}: floats. 2 {p3 MDP, p4}: met, both float.
# - 1.5 {MDPs p3, p4; residents p2, p6}: p3 met both residents, so M1 = 1 (p4). Candidates:
#   p4-p2 (first generated) and p4-p6; same PSD. C.7, "just in the following bracket" {p1} plus
#   the floaters: {p3, p6} gives p3-p1 and p6 over, {p3, p2} gives p3-p1 and p2 over: the same
#   pairs and PSD. C.10: p4-p2 both want White (one misses), p4-p6 none: p4-p6 (p4 White).
# - 1 {MDPs p3, p2; resident p1}: best PSD p3-p1, p2 floats; but p2 and p5 have met, so the
#   round cannot be completed: this bracket is the PPB, re-paired by C.4: p2-p1 (p2 White, strong
#   against strong, higher-ranked), p3 floats; CLB {p3, p5}: p5-p3 (p5 White, absolute).
# Boards (higher score, sum, rank): p5-p3, p4-p6, p2-p1.
# Completion kept in every bracket, inside C.7's look-ahead too (the EVERYWHERE route): {p3, p2}
# must then pair p2-p1 and float p3 (PSD [3, 0.5] against [2, 1.5]), so it takes p4-p2 with
# C.10 = 1 and ends p1-p3, p4-p2, p5-p6.
HANDBOOK_ANSWER = [("p5", "p3"), ("p4", "p6"), ("p2", "p1")]


def test_reference_follows_the_handbook_route_on_the_minimal_case() -> None:
    state = _completion_case()
    ref = reference_round(state)
    assert list(ref.boards) == HANDBOOK_ANSWER and ref.pab is None
    # the completion-everywhere reading really differs here (the class is not an artefact)
    assert list(reference_round(state, EVERYWHERE).boards) == [("p1", "p3"), ("p4", "p2"), ("p5", "p6")]


def test_product_follows_the_handbook_route_on_the_minimal_case() -> None:
    draft = draft_round(_completion_case())
    assert [(b.first, b.second) for b in draft.boards] == HANDBOOK_ANSWER


def _ppb_case() -> EventState:
    # Eight players p1..p8 (pairing numbers 1..8), round 4 of 7, p5 and p7 absent. White first:
    # R1 p4-p1 0-1, p2-p5 0-1, p6-p3 +- (forfeit), PAB p7; R2 p1-p6 1-0, p5-p7 0-1, p3-p4 0-1,
    # PAB p8, p2 half-point bye; R3 p7-p1 1-0, p4-p8 1/2, p6-p5 1/2, p3-p2 1/2.
    return hand_event(7, 8, [
        [(4, 1, "0-1"), (2, 5, "0-1"), (6, 3, "+-")],
        [(1, 6, "1-0"), (5, 7, "0-1"), (3, 4, "0-1")],
        [(7, 1, "1-0"), (4, 8, "1/2-1/2"), (6, 5, "1/2-1/2"), (3, 2, "1/2-1/2")],
    ], pab={1: 7, 2: 8}, requested={2: [2]}, absent={4: [5, 7]})


# Facts before round 4 (pairing score, colours of played games, opponents met; forfeits count):
#   p1 2   BWB met p4 p6 p7        p4 1.5 WBW met p1 p3 p8       p6 1.5 BW met p1 p3 p5 (forfeit win)
#   p8 1.5 B   met p4 (had the PAB) p2 1 WB met p3 p5             p3 0.5 WW met p2 p4 p6
# Handbook route: {p1} floats. Bracket 1.5 {MDP p1; p4, p6, p8}: p1-p8 and p4-p6 pair everyone,
# but p2-p3 have met: the round cannot be completed, so this is the PPB, re-paired by C.4 with
# its floaters chosen to complete the CLB {floaters, p2, p3}: p1-p8 fails (p4 and p6 would both
# need p2); p4-p6 (p1, p8 float) and p6-p8 (p1, p4 float) both complete; same pairs and PSD;
# C.7 does not apply to the PPB; C.10: p4-p6 both want Black (p6 misses, mild), p6-p8 none:
# p8-p6 (p8 White, strong). CLB {MDPs p1, p4; p2, p3}: p1-p3 (p3 absolute Black), p2-p4.
# C.7 applied in the PPB too (the EVERYWHERE route): p4-p6 gives the next bracket p1-p2 with
# PSD [1.5, 1] against [2, 0.5]; it pairs p1-p2, p6-p4, p8-p3.
PPB_ANSWER = [("p1", "p3"), ("p8", "p6"), ("p2", "p4")]


def test_reference_exempts_the_ppb_from_c7() -> None:
    assert list(reference_round(_ppb_case()).boards) == PPB_ANSWER
    assert list(reference_round(_ppb_case(), EVERYWHERE).boards) != PPB_ANSWER


def test_product_exempts_the_ppb_from_c7() -> None:
    draft = draft_round(_ppb_case())
    assert [(b.first, b.second) for b in draft.boards] == PPB_ANSWER


def test_why_panel_names_the_ppb_and_the_clb() -> None:
    from pairings.engine import explain

    state = _ppb_case()
    draft = draft_round(state)
    ppb = "\n".join(explain(state, draft, 2).lines())  # p8-p6, in the 1.5-point bracket
    assert "bracket of 1.5 points" in ppb and "the penultimate pairing bracket (PPB)" in ppb
    clb = "\n".join(explain(state, draft, 1).lines())  # p1-p3: p1 floated from the PPB into the CLB
    assert "the collapsed last bracket (CLB)" in clb and "PPB" not in clb.replace("below the PPB", "")
    assert "p1 was left unpaired in the 1.5-point bracket" in clb
