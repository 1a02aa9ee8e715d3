"""The Why panel's reasons for a board of a Dutch round, in the Dutch system's own terms (C.04.3).

For the round being drafted the round's plan is rebuilt (the same brackets
the draft came from): the board's bracket, who moved down into it, which
criterion left a player unpaired above (C.5: an odd or partly unpairable
bracket; C.1/C.3: rematches and colours; C.4 in the PPB), whether the board
is in the PPB or the CLB, the colour rule that decided the
sides, repeated floats (C.12-C.19) and, on the boards of the last bracket,
why the PAB went where it went. Virtual points (Baku acceleration) are named
where they make up the pairing score.
"""

from __future__ import annotations

from pairings.engine.dutch.colours import allocate
from pairings.engine.dutch.entrants import Entrants
from pairings.engine.dutch.rounds import Paired, Plan, plan
from pairings.engine.types import Draft, DraftBoard
from pairings.errors import NoPairingError
from pairings.state import EventState, Float, PlayerId

_RULES = {
    1: "rule 1: both colour preferences granted",
    2: "rule 2: the stronger colour preference is granted",
    3: "rule 3: colours alternate from the latest round the two had different colours",
    4: "rule 4: the higher-ranked player's preference is granted",
    5: "rule 5: the initial colour by the higher-ranked player's pairing number",
}
_STRENGTH = {3: "absolute", 2: "strong", 1: "mild"}


def _score(ent: Entrants, p: PlayerId) -> str:
    vp = ent.virtual.get(p, 0)
    text = ent.points(ent.score[p])
    return f"{text}, of which {float(vp):g} virtual (Baku)" if vp else text


def _why_float(ent: Entrants, origin: Paired, p: PlayerId) -> str:
    size, pairs = len(origin.bracket.members), len(origin.pairs)
    where = f"the {ent.points(origin.bracket.score)}-point bracket"
    if 2 * pairs + 1 == size:
        chose = "C.4 (the rest had to stay pairable), C.6-C.19" if origin.bracket.ppb else "C.6-C.19"
        return (f"{p} was left unpaired in {where} ({size} players: one must float, C.5); {chose} and the "
                f"Handbook's order of candidates picked {p}")
    return (f"{p} was left unpaired in {where}: only {pairs} of its {size} players could be paired "
            "(C.1 rematches, C.3 colours, or the rest of the round had to stay pairable, C.4)")


def reasons(state: EventState, draft: Draft, board: DraftBoard) -> tuple[str, ...]:
    """Readable reasons for ``board`` (the round being drafted; otherwise only the board's facts)."""
    try:
        shown: Plan | None = plan(state) if draft.round == state.next_round_number else None
    except NoPairingError:
        shown = None
    if shown is None or draft.round != shown.entrants.round:
        return ()
    ent = shown.entrants
    key = frozenset((board.first, board.second))
    home = next((b for b in shown.brackets if key in {frozenset(x) for x in b.pairs}), None)
    if home is None:
        return ("pinned or changed by hand: outside the Dutch system's brackets",)
    out = [f"bracket of {ent.points(home.bracket.score)} points ({len(home.bracket.members)} players, "
           f"{len(home.bracket.mdps)} moved down)"]
    if home.bracket.ppb:
        out.append("the penultimate pairing bracket (PPB): paired again so that the rest of the round can be "
                   "paired (C.4), C.7 not applied")
    elif home.bracket.last and any(b.bracket.ppb for b in shown.brackets):
        out.append("the collapsed last bracket (CLB): every player below the PPB, with its floaters")
    for p in (board.first, board.second):
        out.append(f"{p}: pairing score {_score(ent, p)}, pairing number {ent.tpn[p]}")
    for p in (board.first, board.second):
        if p in home.bracket.mdps:
            origin = next(b for b in reversed(shown.brackets[:shown.brackets.index(home)]) if p in b.floaters)
            out.append(_why_float(ent, origin, p))
    c = allocate(ent, board.first, board.second)
    if c.rule:
        out.append(f"colours: {_RULES[c.rule]}")
        for p in (board.first, board.second):
            pref = ent.pref[p]
            if pref.side is not None:
                out.append(f"{p} prefers {pref.side.value} ({_STRENGTH[pref.strength]}, CD {pref.sd:+d})")
    hi, lo = (board.first, board.second) if ent.score[board.first] >= ent.score[board.second] \
        else (board.second, board.first)
    if ent.score[hi] != ent.score[lo]:
        if ent.floats[hi][0] is Float.DOWN:
            out.append(f"{hi} downfloats again after last round (counted by C.12/C.16, not avoidable here)")
        if ent.floats[lo][0] is Float.UP:
            out.append(f"{lo} upfloats again after last round (counted by C.13/C.17, not avoidable here)")
    if home.bracket.last and shown.bye is not None:
        out.append(f"PAB: {shown.bye}, left over by the last bracket: eligible (C.2: no PAB before, never a "
                   "win's points without playing); C.5-C.19 and the Handbook's order chose who")
    return tuple(out)
