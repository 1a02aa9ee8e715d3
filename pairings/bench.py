"""Benchmark the pairing engine: ``python -m pairings.bench [--sizes 64,1000] [--reference-limit 512]``.

For each field size it simulates a realistic event log
(:func:`pairings.simulate.simulate_events`: Elo-based results, withdrawals,
requested byes; the history rounds are made by the simulator's fast pairer),
folds it, drafts the next round with the engine and, up to
``--reference-limit`` players, with the reference solver (networkx on the full
candidate graph) on the same weights. It prints one Markdown table row per
size: draft time, peak resident memory of the process during the draft, the ratio
reference/engine, how the engine's matching was found (``certified in k``:
sparse solves until the dual certificate held on every pruned edge, with
the sparse graph's size and the number of pruned edges covered; ``listed``
or ``implicit``: whether the pruned edges were held in arrays or walked by
the compiled scan;
``fallback``: the blossom on every pruned edge), and asserts that the
two cost vectors are equal. ``--fold N`` also times folding a whole
``--rounds``-round log of ``N`` players (:func:`pairings.fold.fold`).
``--verify N`` (default 10,000; 0: skip) times ``pairings verify``'s check of
one engine round of ``N`` players (:func:`pairings.engine.verify_round`: the
dual certificate, no networkx re-solve; target at most 30 s at 10,000).
``--startup N`` (default 1,000; 0: skip) times, on one simulated event of
``N`` players: the whole process ``python -m pairings pair EVENT`` (best of
three, interpreter start and imports included, with bytecode caches as an
installed program has them; target at most 0.25 s and at most a quarter of
the next figure) and where that time goes (the command's steps timed one by
one in another fresh interpreter: start and exit, imports, opening and folding
the log, engine, writing and printing), a rustworkx maximum-weight matching of the
same round's full candidate graph (best of three; every allowed pair and bye; its exact
weights need more than rustworkx's 128-bit integers, so it solves the same
graph with each weight cut to its top 62 bits: the solver's work, not an exact
optimum), and the text standings (target at most 0.3 s) with the reports' own
table layout and with rich laying the tables out. ``--rating-list N`` times one streamed read of a
generated N-line FIDE rating list (default two million lines) for a 500-player event.
``--dutch 1000,10000`` also drafts the same states by the FIDE (Dutch) System and prints
its time against the whole-round system's in the same run.
"""

from __future__ import annotations

import argparse
import os
import shutil
import subprocess
import sys
import tempfile
import time
import tracemalloc
from dataclasses import replace
from pathlib import Path
from typing import Callable, TypeVar

import numpy as np

from pairings import actions
from pairings.engine import draft_round, verify_round
from pairings.engine import blossom, candidates, implicit, route, weights
from pairings.engine.criteria import Field
from pairings.engine.vector import Arrays
from pairings.fold import fold
from pairings.reports import render, text
from pairings.simulate import simulate_events
from pairings.state import EventState, System
from pairings.store import EventStore

T = TypeVar("T")


def _timed(fn: Callable[[], T]) -> tuple[T, float]:
    start = time.perf_counter()
    out = fn()
    return out, time.perf_counter() - start


def _peak_mb(fn: Callable[[], T]) -> tuple[T, float, float]:
    """``fn()``, its time, and the process's peak resident memory in MB while it ran.

    Linux: the high-water mark is reset first (``/proc/self/clear_refs``, value 5)
    and read from ``VmHWM``; it counts everything the process holds (the folded
    state too), compiled kernels' memory included. Elsewhere: tracemalloc's peak
    (Python and numpy allocations only).
    """
    try:
        with open("/proc/self/clear_refs", "w") as f:
            f.write("5")
    except OSError:
        tracemalloc.start()
        out, seconds = _timed(fn)
        _, peak = tracemalloc.get_traced_memory()
        tracemalloc.stop()
        return out, seconds, peak / 2**20
    out, seconds = _timed(fn)
    with open("/proc/self/status") as f:
        hwm = next(line for line in f if line.startswith("VmHWM:"))
    return out, seconds, int(hwm.split()[1]) / 1024


def bench_one(n: int, rounds: int, played: int, seed: int, reference_limit: int) -> str:
    """One table row for a field of ``n`` players drafting round ``played + 1`` of ``rounds``."""
    log = simulate_events(n, rounds, played, seed)
    state: EventState
    state, fold_s = _timed(lambda: fold(enumerate(log, 1)))
    del log  # the draft's peak memory should not count the simulator's events
    draft, engine_s, peak = _peak_mb(lambda: draft_round(state))
    rnd = state.next_round_number
    fld = Field(state, rnd, state.available(rnd))  # the same field, again, for the route taken
    _, taken, _ = route.engine_matching(fld, list(fld.order), ())
    how = "full graph" if taken is None else f"fallback, {taken.path}" if not taken.certified else \
        f"certified in {taken.rounds}, {taken.sparse_edges:,} of {taken.pruned:,} edges, {taken.path}"
    ref_cell, ratio_cell = "-", "-"
    if n <= reference_limit:
        ref, ref_s = _timed(lambda: draft_round(state, reference=True))
        assert ref.key() == draft.key(), f"{n} players: engine and reference cost vectors differ"
        ref_cell, ratio_cell = f"{ref_s:.2f}", f"{ref_s / engine_s:.1f}"
    cost = ", ".join(f"{k} {v}" for k, v in draft.cost.items() if v)
    return (f"| {n:,} | {played + 1} of {rounds} | {fold_s:.2f} | {engine_s:.2f} | {peak:.0f} | "
            f"{ref_cell} | {ratio_cell} | {how} | {cost} |")


def bench_dutch(n: int, rounds: int, played: int, seed: int) -> str:
    """One row: the FIDE (Dutch) System against the whole-round system on the same simulated state."""
    state = fold(enumerate(simulate_events(n, rounds, played, seed), 1))
    _, whole_s = _timed(lambda: draft_round(state))
    dutch = replace(state, settings=replace(state.settings, system=System.DUTCH))
    draft, dutch_s = _timed(lambda: draft_round(dutch))
    floats = sum(1 for b in draft.boards if any(f.startswith("gap") for f in b.flags))
    return (f"| {n:,} | {played + 1} of {rounds} | {whole_s:.2f} | {dutch_s:.2f} | {dutch_s / whole_s:.1f} | "
            f"{len(draft.boards):,} | {floats} |")


def bench_fold(n: int, rounds: int, seed: int) -> str:
    """Time folding a log of ``n`` players and ``rounds`` complete rounds."""
    log = simulate_events(n, rounds, rounds, seed)
    _, fold_s = _timed(lambda: fold(enumerate(log, 1)))
    return f"fold: {n:,} players, {rounds} rounds, {len(log):,} events: {fold_s:.2f} s"


def bench_verify(n: int, rounds: int, played: int, seed: int) -> str:
    """Time the check of one stored engine round of ``n`` players, as ``pairings verify`` makes it."""
    log = simulate_events(n, rounds, played, seed)
    state = fold(enumerate(log, 1))
    draft = draft_round(state)
    stored = fold(enumerate([*log, actions.draft_event(draft)], 1))
    del log, state
    check, seconds = _timed(lambda: verify_round(stored, draft.round))
    assert check.ok and check.optimal is True, check.lines()
    how = next((line.strip() for line in check.lines() if "dual certificate" in line), "no certificate")
    return f"verify: {n:,} players, round {draft.round}: {seconds:.2f} s ({how})"


_PHASES = """
import gc, os, time
start = time.perf_counter()
os.environ.setdefault("OPENBLAS_NUM_THREADS", "1")
gc.disable()
import contextlib, io, sys
from pairings import actions, cli, engine
from pairings.store import EventStore
gc.freeze()
gc.enable()
imported = time.perf_counter()
store = EventStore.open(sys.argv[1])
opened = time.perf_counter()
events = actions.pair(store.state)
drafted = time.perf_counter()
state = store.append(events)
with contextlib.redirect_stdout(io.StringIO()):
    cli.print_round(state, state.rounds[-1].number)
store.close()
written = time.perf_counter()
print(imported - start, opened - imported, drafted - opened, written - drafted)
gc.freeze()
"""
"""The steps of ``pairings pair`` (cli.cmd_pair) one by one, each timed, in a fresh interpreter
set up as the command's process is (pairings.__main__.run: the cycle collector, numpy's threads)."""


def _installed_env(folder: Path) -> dict[str, str]:
    """The environment of a child run as an installed program runs: with bytecode caches.

    The caches go to a private folder (``PYTHONPYCACHEPREFIX``); without them (as under
    ``PYTHONDONTWRITEBYTECODE``) every run compiles the package's sources again.
    """
    env = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
    env["PYTHONPYCACHEPREFIX"] = str(folder / "pycache")
    return env


def _fresh(path: Path, k: int) -> Path:
    work = path.with_name(f"pair-{k}.pairings")
    shutil.copyfile(path, work)
    return work


def _children_cpu() -> float:
    """Processor seconds (user and system) of the finished child processes so far (Unix; 0 elsewhere)."""
    try:
        import resource
    except ImportError:
        return 0.0
    usage = resource.getrusage(resource.RUSAGE_CHILDREN)
    return usage.ru_utime + usage.ru_stime


def _whole_pair(path: Path, tries: int = 3) -> tuple[float, float, list[float]]:
    """Best wall time of ``python -m pairings pair`` on fresh copies of ``path`` (output discarded),
    its least processor time (less moved by a busy machine than the wall time), and the best of as
    many phase-timed runs: interpreter start and exit, imports, opening and folding the log, the
    engine, writing the draft and printing it.

    An untimed run first writes the bytecode caches (see :func:`_installed_env`).
    """
    env = _installed_env(path.parent)
    command = [sys.executable, "-m", "pairings", "pair"]
    subprocess.run([*command, str(_fresh(path, 0))], check=True, stdout=subprocess.DEVNULL, env=env)
    best = cpu = float("inf")
    split: list[float] = []
    for k in range(1, tries + 1):
        work = _fresh(path, k)
        start, used = time.perf_counter(), _children_cpu()
        subprocess.run([*command, str(work)], check=True, stdout=subprocess.DEVNULL, env=env)
        best = min(best, time.perf_counter() - start)
        cpu = min(cpu, _children_cpu() - used)
        work = _fresh(path, k)
        start = time.perf_counter()
        out = subprocess.run([sys.executable, "-c", _PHASES, str(work)], check=True, capture_output=True,
                             text=True, env=env).stdout
        whole = time.perf_counter() - start
        phases = [float(x) for x in out.split()]
        run = [whole - sum(phases), *phases]
        if not split or sum(run) < sum(split):
            split = run
    return best, cpu, split


def _rustworkx_full(state: EventState, tries: int = 3) -> tuple[float, int, int] | None:
    """Seconds of a rustworkx solve of the next round's full graph (the best of ``tries``, as the
    whole-process figure it is set against), its edges, and its exact weights' bits."""
    try:
        import rustworkx as rx
    except ImportError:
        return None
    rnd = state.next_round_number
    fld = Field(state, rnd, state.available(rnd))
    players = list(fld.order)
    n = len(players)
    arrays = Arrays(fld, players)
    i, j = candidates.index_pairs(arrays.units, None, range(n))
    keep = arrays.allowed(i, j)
    u, v, rows = i[keep], j[keep], arrays.costs(i[keep], j[keep])
    if n % 2:
        u = np.concatenate([u, np.arange(n, dtype=np.int64)])
        v = np.concatenate([v, np.full(n, n, dtype=np.int64)])
        rows = np.concatenate([rows, np.array([fld.bye(p) for p in players], dtype=np.int64)])
    w = weights.weight_array(rows, n + n % 2).tolist()
    bits = max(int(x).bit_length() for x in w)
    cut = max(0, bits - 62)
    edges = list(zip(u.tolist(), v.tolist(), (int(x) >> cut for x in w)))
    best = float("inf")
    for _ in range(tries):
        start = time.perf_counter()
        graph = rx.PyGraph()
        graph.add_nodes_from(range(n + n % 2))
        graph.add_edges_from(edges)
        rx.max_weight_matching(graph, max_cardinality=True, weight_fn=lambda x: x)
        best = min(best, time.perf_counter() - start)
    return best, len(edges), bits


def _standings_text(state: EventState) -> tuple[float, float]:
    """Seconds to render the text standings with the reports' own layout, and with rich's."""
    _, own = _timed(lambda: render(state, "standings", "text"))
    text.OWN_LAYOUT = False
    try:
        _, by_rich = _timed(lambda: render(state, "standings", "text"))
    finally:
        text.OWN_LAYOUT = True
    return own, by_rich


def bench_startup(n: int, rounds: int, played: int, seed: int) -> list[str]:
    """Lines for the whole-process ``pair``, the full-graph rustworkx yardstick and the text standings."""
    log = simulate_events(n, rounds, played, seed)
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "bench.pairings"
        with EventStore.create(path, log[0]) as store:  # type: ignore[arg-type]
            state = store.append(log[1:])
        pair_s, cpu_s, split = _whole_pair(path)
    names = ("interpreter start and exit", "imports", "opening and folding", "engine", "writing and printing")
    parts = ", ".join(f"{name} {seconds:.2f}" for name, seconds in zip(names, split))
    out = [f"pair (whole process): {n:,} players, round {state.next_round_number}: {pair_s:.2f} s "
           f"(processor {cpu_s:.2f} s); the same steps timed one by one (s): {parts}; sum {sum(split):.2f}"]
    full = _rustworkx_full(state)
    if full is not None:
        rx_s, edges, bits = full
        out.append(f"rustworkx on the full graph ({edges:,} edges; weights of {bits} bits cut to 62): "
                   f"{rx_s:.2f} s; pair / rustworkx = {pair_s / rx_s:.2f}")
    own, by_rich = _standings_text(state)
    out.append(f"standings as text: {n:,} players: {own:.2f} s (rich laying the tables out: {by_rich:.2f} s, "
               f"{by_rich / own:.1f} times as long)")
    return out


def bench_rating_list(lines: int, players: int, seed: int) -> str:
    """Time one streamed pass over a generated FIDE-layout list of ``lines`` lines (a temp file) for an
    event of ``players`` players: half with a FIDE ID somewhere in the list, a tenth looked for by name."""
    import random
    import tempfile
    from pathlib import Path

    from pairings import events as ev
    from pairings.ratinglist import FIDE_COLUMNS, FIDE_HEADINGS, plan_update, read_list_file

    rng = random.Random(seed)
    widths = [b - a for a, b in zip(FIDE_COLUMNS, FIDE_COLUMNS[1:])] + [4]
    chosen = set(rng.sample(range(lines), players))
    log: list[ev.Event] = [ev.EventCreated(name="List bench", rounds=9, seed=seed)]
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "players_list.txt"
        with open(path, "w", encoding="utf-8") as f:
            f.write("".join(h.ljust(w) for h, w in zip(FIDE_HEADINGS, widths)).rstrip() + "\n")
            for i in range(lines):
                fide_id, name = str(10_000_000 + i), f"Surname{i}, Given{i % 977}"
                values = (fide_id, name, "ENG", "M", "", "", "", "", str(1400 + i % 1400), "0", "20", "", "", "",
                          "", "", "", str(1950 + i % 60), "")
                f.write("".join(v.ljust(w) for v, w in zip(values, widths)).rstrip() + "\n")
                if i in chosen:
                    by_name = len(log) % 10 == 0
                    log.append(ev.PlayerRegistered(id=f"p{len(log)}", name=f"Given{i % 977} Surname{i}",
                                                   details=ev.PlayerDetailsModel(fide_id=None if by_name else fide_id)))
        state = fold(enumerate(log, 1))
        size = path.stat().st_size
        found, seconds, peak = _peak_mb(lambda: read_list_file(path, state))
    plan = plan_update(state, found, accept_names=True)
    return (f"rating list: {lines:,} lines ({size / 2**20:.0f} MB), {players:,} players: {seconds:.2f} s, "
            f"{len(plan.changes):,} matched, peak memory {peak:.0f} MB (streamed line by line)")


def main(argv: list[str] | None = None) -> None:
    parser = argparse.ArgumentParser(prog="python -m pairings.bench", description=__doc__.splitlines()[0])
    parser.add_argument("--sizes", default="64,256,512,1000,2000",
                        help="comma-separated field sizes (default: %(default)s)")
    parser.add_argument("--rounds", type=int, default=9)
    parser.add_argument("--played", type=int, default=4, help="rounds already played (default 4: draft round 5)")
    parser.add_argument("--seed", type=int, default=1)
    parser.add_argument("--reference-limit", type=int, default=512,
                        help="largest field also solved by networkx on the full graph (default %(default)s)")
    parser.add_argument("--fold", type=int, default=0, help="also time folding a whole log of this many players")
    parser.add_argument("--startup", type=int, default=1000,
                        help="also time whole-process pair and text standings at this size (default %(default)s; 0: skip)")
    parser.add_argument("--verify", type=int, default=10000,
                        help="also time verifying one round of this many players (default %(default)s; 0: skip)")
    parser.add_argument("--rating-list", type=int, default=2_000_000, metavar="LINES",
                        help="lines of the generated FIDE rating list read once (default %(default)s; 0 skips it)")
    parser.add_argument("--dutch", default="", help="comma-separated field sizes also drafted by the Dutch system")
    args = parser.parse_args(argv)
    engine = "compiled blossom and pair scan (implicit pruned pairs)" if implicit.available() else \
        f"{'compiled' if blossom.compiled() else 'pure-Python'} blossom on the listed pruned pairs"
    print(f"engine: {engine}; reference: networkx on the full graph")
    print("| players | round | fold s | engine s | peak MB | reference s | ratio | route | round cost |")
    print("| ---: | :---: | ---: | ---: | ---: | ---: | ---: | :--- | :--- |")
    for n in (int(x) for x in args.sizes.split(",")):
        print(bench_one(n, args.rounds, args.played, args.seed, args.reference_limit), flush=True)
    if args.dutch:
        print("\nFIDE (Dutch) System against the whole-round system, same state:")
        print("| players | round | whole-round s | Dutch s | ratio | boards | floating boards |")
        print("| ---: | :---: | ---: | ---: | ---: | ---: | ---: |")
        for n in (int(x) for x in args.dutch.split(",")):
            print(bench_dutch(n, args.rounds, args.played, args.seed), flush=True)
    if args.fold:
        print(bench_fold(args.fold, args.rounds, args.seed))
    if args.startup:
        for line in bench_startup(args.startup, args.rounds, args.played, args.seed):
            print(line, flush=True)
    if args.verify:
        print(bench_verify(args.verify, args.rounds, args.played, args.seed), flush=True)
    if args.rating_list:
        print(bench_rating_list(args.rating_list, 500, args.seed), flush=True)


if __name__ == "__main__":
    main()
