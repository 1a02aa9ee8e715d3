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
``fallback``: the compiled solver on every pruned edge), and asserts that the
two cost vectors are equal. ``--fold N`` also times folding a whole
``--rounds``-round log of ``N`` players (:func:`pairings.fold.fold`). ``--dutch
1000,10000`` also drafts the same states by the FIDE (Dutch) System and prints
its time against the whole-round system's in the same run.
"""

from __future__ import annotations

import argparse
import time
import tracemalloc
from dataclasses import replace
from typing import Callable, TypeVar

from pairings.engine import draft_round
from pairings.engine import candidates, implicit
from pairings.engine.criteria import Field
from pairings.engine.solver import fast_available
from pairings.fold import fold
from pairings.simulate import simulate_events
from pairings.state import EventState, System

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
    _, route, _ = candidates.engine_matching(fld, list(fld.order), ())
    how = "full graph" if route is None else "fallback" if not route.certified else \
        f"certified in {route.rounds}, {route.sparse_edges:,} of {route.pruned:,} edges, " \
        f"{'implicit' if implicit.available() else 'listed'}"
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
    parser.add_argument("--dutch", default="", help="comma-separated field sizes also drafted by the Dutch system")
    args = parser.parse_args(argv)
    engine = "compiled blossom and pair scan (implicit pruned pairs)" if implicit.available() else \
        f"{'rustworkx (compiled)' if fast_available() else 'networkx'} on the listed pruned pairs"
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


if __name__ == "__main__":
    main()
