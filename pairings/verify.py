"""`pairings verify`: the hash chain, then every stored round against the pairing rules."""

from __future__ import annotations

from pathlib import Path

from pairings.store import EventStore
from pairings.store.recorder import Recorder


def verify_file(path: Path) -> tuple[bool, list[str]]:
    """Check an event file; returns (all good, readable report lines)."""
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
        state = store.state
    ok = True
    for rnd in state.rounds:
        check = verify_round(state, rnd.number)
        ok = ok and check.ok
        lines.extend(check.lines())
    return ok, lines
