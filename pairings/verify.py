"""`pairings verify`: the hash chain, then every stored round against the pairing rules."""

from __future__ import annotations

from pathlib import Path
from typing import Sequence

from pairings.events import RoundDrafted, Undone
from pairings.fold import fold
from pairings.state import EventState
from pairings.store import EventStore, StoredEvent
from pairings.store.recorder import Recorder


def verify_file(path: Path, deep: bool = False) -> tuple[bool, list[str]]:
    """Check an event file; returns (all good, readable report lines).

    ``deep`` re-solves every engine round with networkx on the full graph besides its dual
    certificate (:func:`pairings.engine.verify.verify_round`); smaller fields always are.
    """
    recorder = Recorder.open(path)
    try:
        chain = recorder.check_chain()
    finally:
        recorder.close()
    if not chain.ok:
        return False, [f"hash chain: BROKEN at event {chain.broken_at}: {chain.reason}"]
    lines = [f"hash chain: ok ({chain.events} events, each linked to the one before by SHA-256)"]
    from pairings.engine import verify_round

    with EventStore.open(path) as store:
        state, log = store.state, store.log
    ok = True
    for rnd in state.rounds:
        if rnd.paired_before:
            check = verify_round(as_paired(log, rnd.number), rnd.number, deep)
            lines.extend(check.lines())
            lines.append(f"  paired on scores since corrected: checked against the results as they stood "
                         f"when round {rnd.number} was paired ({'; '.join(rnd.paired_before)})")
        else:
            check = verify_round(state, rnd.number, deep)
            lines.extend(check.lines())
        if rnd.accepted and check.breaches:
            lines.append(f"  the organiser accepted the breaches when publishing: {rnd.accepted}")
        ok = ok and (check.ok or (bool(rnd.accepted) and check.optimal is not False))
    return ok, lines


def as_paired(log: Sequence[StoredEvent], round_number: int) -> EventState:
    """The event's state just after round ``round_number`` was last drafted.

    The rounds paired before a result of an earlier round was corrected are checked on the
    results they were paired on (C.04.2, from memory: a correction changes no pairing already made).
    """
    undone = {s.event.target for s in log if isinstance(s.event, Undone)}
    live = [s for s in log if s.seq not in undone and not isinstance(s.event, Undone)]
    marks = [i for i, s in enumerate(live)
             if isinstance(s.event, RoundDrafted) and s.event.round == round_number]
    return fold((s.seq, s.event) for s in live[:marks[-1] + 1])
