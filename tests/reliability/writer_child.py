"""A writer process for the crash and concurrency tests (run as a script, not collected).

``writer_child.py crash FILE SEED``: append batches of 1-3 registrations for ever,
printing the sequence number of the batch's last event after each append returns (so the parent knows what was
acknowledged). The parent kills it with SIGKILL at a random moment.

``writer_child.py race FILE TAG COUNT SEED``: make COUNT append attempts, each
with the head read just before (plus a little random delay so the two writers
interleave); print ``ok <id> <seq>`` or ``conflict <id>`` for each.
"""

from __future__ import annotations

import random
import sys
import time
from pathlib import Path

from pairings import events as ev
from pairings.errors import ConflictError
from pairings.store import EventStore


def crash(path: Path, seed: int) -> None:
    rng = random.Random(seed)
    with EventStore.open(path) as store:
        while True:
            head = store.state.head
            size = rng.randint(1, 3)
            batch = [
                ev.PlayerRegistered(id=f"b{head + 1}-{i}", name=f"batch {head + 1} part {i} of {size}", rating=i)
                for i in range(1, size + 1)
            ]
            store.append(batch)
            print(head + size, flush=True)


def race(path: Path, tag: str, count: int, seed: int) -> None:
    rng = random.Random(seed)
    with EventStore.open(path) as store:
        for n in range(count):
            store.reload()
            base = store.state.head
            time.sleep(rng.random() * 0.002)
            name = f"{tag}{n}"
            try:
                store.append([ev.PlayerRegistered(id=name, name=f"attempt {name}")], expected=base)
            except ConflictError:
                print(f"conflict {name}", flush=True)
            else:
                print(f"ok {name} {base + 1}", flush=True)


if __name__ == "__main__":
    mode, file = sys.argv[1], Path(sys.argv[2])
    if mode == "crash":
        crash(file, int(sys.argv[3]))
    else:
        race(file, sys.argv[3], int(sys.argv[4]), int(sys.argv[5]))
