"""The demo scenario: the Harrowgate Chess Circle's Winter Weekend Open (invented club, invented names).

``pairings/scenario/winter-open.events.json`` holds the scenario as a list of our
own events (three rounds played, round 4 published with some results in, an
announced bye and a withdrawal). It is package data, so an installed wheel carries
it; the checkout's ``events/`` folder keeps an identical copy where the project
layout puts the demo data (tests/test_demo.py checks they match). :func:`make_demo`
copies the scenario into a fresh event file; the data file itself is never
modified. :func:`build_scenario` rebuilt both files with this version's engine
(``python -m pairings.demo --rebuild``).
"""

from __future__ import annotations

import json
import random
import sys
import tempfile
from datetime import datetime
from pathlib import Path
from typing import Any

from pairings import actions
from pairings import events as ev
from pairings.errors import InputError
from pairings.fold import fold
from pairings.state import ByeKind, EventState, Result
from pairings.store import EventStore

SCENARIO = Path(__file__).resolve().parent / "scenario" / "winter-open.events.json"
LAYOUT_COPY = Path(__file__).resolve().parent.parent / "events" / SCENARIO.name
"""The copy in the checkout's ``events/`` folder (absent from an installed package)."""

# Invented given names and surnames, combined by a fixed rule: nobody real is meant.
_GIVEN = (
    "Ansel Brisa Corvin Delphine Eamon Fenna Gideon Halla Ivo Jorunn Kasimir Lioba Matthis Nerys Oskar "
    "Perpetua Quill Rosalind Soren Tamsin Ulric Verity Wendel Xenia Yorick Zinnia Aurel Bettany Casimir "
    "Dorotea Emrys Faye Gawain Hester Isidor Juno Leander Mireille Nicanor Odalys"
).split()
_FAMILY = (
    "Ashgrove Brackenridge Coldharbour Dunmore Eskdale Fernhollow Glimmerby Hollowell Inchcape Juniperhill "
    "Kestrelmoor Larkspur Marchbank Nettlefold Oakenshaw Pennywhistle Quarrendon Rookwood Saltmarsh "
    "Thistlewood Underhill Vantwick Wrenfield Yarrowby Zeller-Moss Amberlight Birchwick Cobbledick Dawlmere "
    "Elderstow Foxcombe Greyhollow Heronsgate Ivybridge Jessamine Kittering Loamshire Mossbury Nimblewood Orchardleigh"
).split()
_CLUBS = ("Harrowgate CC", "Riverside Knights", "Old Mill Chess", "Lantern Street Club", None)


def _players(rng: random.Random) -> list[ev.Event]:
    out: list[ev.Event] = []
    for i, (given, family) in enumerate(zip(_GIVEN, _FAMILY)):
        rating = None if i % 13 == 12 else int(min(2450, max(1100, rng.gauss(1750, 280))))
        club = _CLUBS[i % len(_CLUBS)]
        out.append(ev.PlayerRegistered(id=f"p{i + 1}", name=f"{given} {family}", rating=rating, club=club))
    return out


def _result(rng: random.Random, first: int, second: int) -> Result:
    """A plausible result from the Elo expected score (Elo; expected = 1 / (1 + 10^(-d/400)))."""
    expected = 1 / (1 + 10 ** (-(first - second) / 400))
    roll = rng.random()
    if roll < 0.02:
        return Result.FIRST_WINS_BY_FORFEIT if rng.random() < 0.5 else Result.SECOND_WINS_BY_FORFEIT
    draw = 0.28
    if roll < draw:
        return Result.DRAW
    return Result.FIRST_WINS if rng.random() < expected else Result.SECOND_WINS


def build_scenario(seed: int = 20261204) -> list[ev.Event]:
    """The scenario's events, drafted round by round by this version's engine."""
    rng = random.Random(seed)
    # The scenario was made before new events stored the C.07 default list: it keeps the list it had.
    created = actions.new_event("Winter Weekend Open 2026", 7, seed=seed).model_copy(update={"tiebreaks": None})
    log: list[ev.Event] = [created]
    log += _players(rng)

    def state() -> EventState:
        return fold(enumerate(log, 1))

    for number in range(1, 5):
        if number == 3:
            log += actions.announce_bye(state(), "p17", ByeKind.REQUESTED, 3)
            log += actions.withdraw(state(), "p29", 3, "left for a family matter")
        log += actions.pair(state())
        log += actions.publish(state())
        s = state()
        rnd = s.rounds[number - 1]
        for game in rnd.games:
            if number == 4 and game.board > 6:
                break
            a, b = (s.players[p].rating or s.settings.default_rating for p in (game.first, game.second))
            log += actions.record_result(s, game.board, _result(rng, a, b))
    return log


def make_demo(path: Path | None = None) -> Path:
    """A fresh event file holding the scenario; the scenario file is only read."""
    try:
        raw = json.loads(SCENARIO.read_text(encoding="utf-8"))
    except OSError as exc:
        raise InputError(f"demo scenario missing ({SCENARIO}: {exc.strerror})") from None
    events = [ev.EVENT_ADAPTER.validate_python(item) for item in raw]
    if path is None:
        stamp = datetime.now().strftime("%Y%m%d-%H%M%S")
        path = Path(tempfile.mkdtemp(prefix="pairings-demo-")) / f"winter-open-{stamp}.pairings"
    EventStore.create_from(path, events).close()
    return path


def _write_scenario() -> None:
    data: list[Any] = [ev.dump_event(e) for e in build_scenario()]
    text = json.dumps(data, indent=1, ensure_ascii=False) + "\n"
    for target in (SCENARIO, LAYOUT_COPY) if LAYOUT_COPY.parent.is_dir() else (SCENARIO,):
        target.write_text(text, encoding="utf-8")
        print(f"wrote {target} ({len(data)} events)")


if __name__ == "__main__":
    if sys.argv[1:] == ["--rebuild"]:
        _write_scenario()
    else:
        print("usage: python -m pairings.demo --rebuild", file=sys.stderr)
        sys.exit(2)
