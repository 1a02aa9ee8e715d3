"""Key-latency benchmark of the desk on a big event: ``python -m pairings.tui.bench [--players 2000]``.

The event is simulated (:func:`pairings.simulate.simulate_events`): five
rounds played and a sixth published with half of its results in. The desk
runs headless; each key is posted to the app as the terminal driver would,
and its *answer time* runs until every message it caused has been handled
and the screen has been redrawn once after that (``call_after_refresh``).
Work that runs in workers (drafting, standings, explanations, printouts) is
not waited for: the point is that the keys keep answering meanwhile, which the
last rows measure while the engine drafts the next round, while the Why panel
is worked out and while a PDF is written. Each row also gives the main
thread's own CPU time, which other processes on the machine do not inflate;
``--profile`` prints the profile of each row's slowest key.
"""

from __future__ import annotations

import argparse
import asyncio
import cProfile
import io
import pstats
import statistics
import tempfile
from pathlib import Path
from time import perf_counter, thread_time
from typing import Any, Sequence

from textual import events

from pairings import actions
from pairings import events as ev
from pairings.simulate import simulate_events
from pairings.state import Result
from pairings.store import EventStore
from pairings.tui.app import DeskApp

TARGET_MS = 100.0

_CHARS = {"slash": "/", "space": " ", "comma": ",", "full_stop": ".", "plus": "+", "minus": "-"}


def big_event(players: int, seed: int) -> list[ev.Event]:
    """Five rounds complete, round 6 published with every second board still open."""
    log = simulate_events(players, 9, 6, seed=seed)
    last = max(e.round for e in log if isinstance(e, ev.ResultRecorded))
    return [e for e in log if not (isinstance(e, ev.ResultRecorded) and e.round == last and e.board % 2 == 0)]


async def drained(app: DeskApp) -> None:
    """Wait until the app and every widget on screen have handled what is queued, then one redraw."""
    for _ in range(2):
        nodes = [app, *app.screen.walk_children(with_self=True)]
        done = asyncio.Event()
        left = 0

        def one() -> None:
            nonlocal left
            left -= 1
            if left == 0:
                done.set()

        for node in nodes:
            if node.call_later(one):
                left += 1
        if left:
            await done.wait()
    redrawn = asyncio.Event()
    app.screen.call_after_refresh(redrawn.set)
    await redrawn.wait()


async def finished(app: DeskApp) -> None:
    """Wait for the workers still meant to finish (superseded ones are cancelled)."""
    await app.workers.wait_for_complete([w for w in app.workers if not w.is_cancelled])
    await drained(app)


PROFILES: dict[str, tuple[float, str]] = {}
"""With ``--profile``: per row, the slowest key's time and its profile (main thread only)."""


Timing = tuple[float, float]
"""(wall, cpu) milliseconds: the answer time, and the main thread's own CPU time in it.

The CPU figure does not grow when other processes share the cores, so it
tells the desk's work apart from a busy machine's noise.
"""


class Clock:
    """Wall and main-thread CPU time since it was made."""

    def __init__(self) -> None:
        self.wall, self.cpu = perf_counter(), thread_time()

    def read(self) -> Timing:
        return (perf_counter() - self.wall) * 1000, (thread_time() - self.cpu) * 1000


async def answer(app: DeskApp, key: str, label: str | None = None) -> Timing:
    """Milliseconds from the key to its answer on screen; profiled under ``label`` when asked."""
    char = _CHARS.get(key, key if len(key) == 1 else None)
    profiler = cProfile.Profile() if label is not None else None
    clock = Clock()
    if profiler is not None:
        profiler.enable()
    app.post_message(events.Key(key, char))
    await drained(app)
    if profiler is not None:
        profiler.disable()
    timing = clock.read()
    took = timing[0]
    if profiler is not None and label is not None and took > PROFILES.get(label, (-1.0, ""))[0]:
        out = io.StringIO()
        stats = pstats.Stats(profiler, stream=out)
        stats.sort_stats("tottime").print_stats(12)
        stats.sort_stats("cumulative").print_stats("pairings/", 10)
        PROFILES[label] = (took, f"{label}: slowest key {key!r}, {took:.1f} ms (profiled)\n{out.getvalue()}")
    return timing


Row = tuple[str, list[Timing]]


async def measure(path: Path, repeat: int, profile: bool = False, draft: bool = True) -> tuple[list[Row], float]:
    clock = Clock()
    store = EventStore.open(path)
    app = DeskApp(store, poll_seconds=1.0, start="round")
    rows: list[Row] = []
    async with app.run_test(size=(120, 40)) as pilot:
        await pilot.pause()
        await drained(app)
        rows.append(("Start-up: file read, every place built (not a key)", [clock.read()]))

        async def keys(label: str, sequence: Sequence[str], times: int = 1, settle: bool = False) -> None:
            found: list[Timing] = []
            for _ in range(times):
                for key in sequence:
                    found.append(await answer(app, key, label if profile else None))
                if settle:
                    await finished(app)
            rows.append((label, found))

        await keys("Round: cursor down (Why panel refresh)", ["down"], repeat)
        await keys("Round: earlier / later round", ["comma", "full_stop"], 2)
        await keys("Roster: open (2,000 rows)", ["f2"], 1)
        await keys("Roster: cursor down", ["down"], repeat)
        await keys("Roster: filter, per typed letter", ["slash", "k", "a", "escape"], 1)
        await keys("Results: open (1,000 boards)", ["f4"], 1)
        await keys("Results: type a board number", ["1", "2"], 2)
        await keys("Results: enter a result (writes the file)", ["f", "d", "s"], max(1, repeat // 3))
        await keys("Results: correct (confirm dialog)", ["up", "f", "n"], 1)
        await keys("Standings: open (computed in a worker)", ["f5"], 1, settle=True)
        await keys("Log: open (≈7,500 events)", ["f6"], 1)
        await keys("Help: open and close", ["f1", "escape"], 2)
        await keys("Print dialog: open and close", ["f7", "escape"], 2)
        poll = []
        for _ in range(repeat):
            clock = Clock()
            app.poll()
            poll.append(clock.read())
        rows.append(("Change check (1 s timer), nothing changed", poll))

        # Another process finishes round 6; the desk reloads, then drafts round 7 while keys are pressed.
        with EventStore.open(path) as other:
            rnd = other.state.last_round
            assert rnd is not None
            other.append([ev.ResultRecorded(round=rnd.number, board=b, result=Result.FIRST_WINS)
                          for b in rnd.open_boards])
            # Simulated double forfeits would stop the timed draft at the no-show question: keep them in.
            other.append([ev.NoShowKept(player=p, round=rnd.number) for p in actions.no_shows(other.state)])
        clock = Clock()
        app.poll()
        await drained(app)
        rows.append(("Reload after a write elsewhere (timer, not a key)", [clock.read()]))
        await keys("Round: open", ["f3"], 1)
        if not draft:
            store.close()
            return rows, 0.0
        start = perf_counter()
        during: list[Timing] = []
        landed: list[Timing] = []
        apply = app.apply

        def timed_apply(*args: Any, **kwargs: Any) -> bool:
            clock = Clock()
            written = apply(*args, **kwargs)
            landed.append(clock.read())
            return written

        app.apply = timed_apply  # type: ignore[method-assign]
        await answer(app, "n")
        label = "Round: cursor keys while the engine drafts"
        while app.workers and any(w.group == "engine" and w.is_running for w in app.workers):
            during.append(await answer(app, "down" if len(during) % 4 < 2 else "up", label if profile else None))
            await asyncio.sleep(0.05)
        await finished(app)
        drafting = perf_counter() - start
        app.apply = apply  # type: ignore[method-assign]
        rows.append((label, during))
        rows.append(("Draft lands: written, shown (not a key)", landed))

        # On the draft, each rest of the cursor asks the engine why (in the background); keys meanwhile.
        resting: list[Timing] = []
        label = "Round (draft): cursor, Why worked out meanwhile"
        for step in range(repeat // 2):
            resting.append(await answer(app, "down" if step % 4 < 2 else "up", label if profile else None))
            await asyncio.sleep(0.4)
        rows.append((label, resting))
        await keys("Roster: mark absent, cancel (writes the file)", ["f2", "m", "c"], 1)
        rows[-1] = (rows[-1][0], rows[-1][1][1:])  # the place switch is measured above

        # The standings as PDF (seconds of work on this field), cursor keys while it is written.
        for key in ["f7", "ctrl+a", "ctrl+k", *"standings", "enter", "ctrl+a", "ctrl+k", *"pdf", "enter", "enter",
                    "enter"]:
            await answer(app, key)
        printing: list[Timing] = []
        label = "Roster: cursor keys while a PDF is written"
        while any(w.group == "output" and w.is_running for w in app.workers):
            printing.append(await answer(app, "down" if len(printing) % 4 < 2 else "up", label if profile else None))
            await asyncio.sleep(0.05)
        await finished(app)
        assert app.last_output is not None and app.last_output.suffix == ".pdf", "the PDF was not written"
        rows.append((label, printing))
    store.close()
    return rows, drafting


def verdict(label: str, worst: float) -> str:
    """yes / NO against the target; what no key causes (start-up, a draft landing) has none."""
    if "(not a key)" in label:
        return "-"
    return "yes" if worst < TARGET_MS else "NO"


def report(rows: list[Row], drafting: float, players: int) -> str:
    out = [f"Desk key latency, {players} players (answer time in ms; target < {TARGET_MS:g} ms;",
           "cpu: the main thread's own CPU time in the answer, unaffected by other processes)", ""]
    out.append(f"| {'key action':<50} | {'n':>4} | {'median':>7} | {'max':>7} | {'cpu med':>7} | {'cpu max':>7} "
               f"| {'ok':<3} |")
    out.append(f"| {'-' * 50} | {'-' * 3}:| {'-' * 6}:| {'-' * 6}:| {'-' * 6}:| {'-' * 6}:| {'-' * 3} |")
    for label, values in rows:
        if not values:
            continue
        wall, cpu = [w for w, _ in values], [c for _, c in values]
        out.append(f"| {label:<50} | {len(values):>4} | {statistics.median(wall):>7.1f} | {max(wall):>7.1f} "
                   f"| {statistics.median(cpu):>7.1f} | {max(cpu):>7.1f} | {verdict(label, max(wall)):<3} |")
    if drafting:
        out.append("")
        out.append(f"Drafting the next round took {drafting:.1f} s; the keys above kept answering.")
    return "\n".join(out)


def main(argv: Sequence[str] | None = None) -> None:
    parser = argparse.ArgumentParser(prog="python -m pairings.tui.bench", description=__doc__.splitlines()[0])
    parser.add_argument("--players", type=int, default=2000)
    parser.add_argument("--repeat", type=int, default=20)
    parser.add_argument("--seed", type=int, default=1)
    parser.add_argument("--profile", action="store_true",
                        help="profile each row's slowest key (slower answers; prints the top calls)")
    parser.add_argument("--no-draft", action="store_true", help="leave out the last rows (drafting a round)")
    a = parser.parse_args(argv)
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "bench.pairings"
        EventStore.create_from(path, big_event(a.players, a.seed)).close()
        rows, drafting = asyncio.run(measure(path, a.repeat, a.profile, not a.no_draft))
    print(report(rows, drafting, a.players))
    for _, text in PROFILES.values():
        print("\n" + text)


if __name__ == "__main__":
    main()
