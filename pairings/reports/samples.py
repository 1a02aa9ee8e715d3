"""Write the sample sheets of the demo event into ``docs/samples/``.

``python -m pairings.reports.samples [DIR]`` folds ``events/winter-open.events.json``
and writes every sheet of its latest round in every format, plus the publish
folder under ``web/``. The printing time is fixed (:data:`SAMPLE_TIME`) so
regenerating changes the files only when the event or the sheets change.
"""

from __future__ import annotations

import json
import sys
from datetime import datetime, timezone
from pathlib import Path

from pairings import events as ev
from pairings.events import EVENT_ADAPTER
from pairings.fold import fold
from pairings.reports import FORMATS, KINDS, publish_web, render
from pairings.state import EventState, PrizeTies, System

ROOT = Path(__file__).resolve().parents[2]
SCENARIO = ROOT / "events" / "winter-open.events.json"
SAMPLE_TIME = datetime(2026, 12, 5, 18, 30, tzinfo=timezone.utc)
EXTENSIONS = {"text": "txt", "csv": "csv", "json": "json", "html": "html", "pdf": "pdf"}


SAMPLE_PRIZES: tuple[ev.Event, ...] = (
    ev.CategoryDefined(name="Under 1800", rule=ev.CategoryRuleModel(rating_below=1800)),
    ev.CategoryDefined(name="Unrated", rule=ev.CategoryRuleModel(unrated=True)),
    ev.CategoryDefined(name="Lantern Street", rule=ev.CategoryRuleModel(club="Lantern Street Club")),
    ev.PrizePolicySet(currency="EUR", ties=PrizeTies.SHARED),
    *(ev.PrizeSet(place=n, amount=a) for n, a in ((1, 30000), (2, 20000), (3, 10000))),
    ev.PrizeSet(category="Under 1800", place=1, amount=7500), ev.PrizeSet(category="Under 1800", place=2, amount=5000),
    ev.PrizeSet(category="Unrated", place=1, amount=5000),
    ev.PrizeSet(category="Lantern Street", place=1, amount=5000),
)
"""Prize categories and prizes the samples add to the demo event, to show the prize list
(the scenario file itself holds none)."""


def demo_state(path: Path = SCENARIO, prizes: bool = True) -> EventState:
    """The demo event's state, folded from its data file (with :data:`SAMPLE_PRIZES` unless ``prizes`` is False)."""
    records = json.loads(path.read_text(encoding="utf-8"))
    events = [EVENT_ADAPTER.validate_python(r) for r in records] + (list(SAMPLE_PRIZES) if prizes else [])
    return fold(enumerate(events, 1))


def write_samples(directory: Path, state: EventState) -> list[Path]:
    """Every kind the event can print, in every format, and the publish folder; returns the files written.

    The demo is a Swiss event, so it has no round-robin grid.
    """
    directory.mkdir(parents=True, exist_ok=True)
    written = []
    for kind in KINDS:
        if kind == "grid" and state.settings.system is not System.ROUND_ROBIN:
            continue
        for fmt in FORMATS:
            out = render(state, kind, fmt, now=SAMPLE_TIME, paper="a4")
            path = directory / f"{kind}.{EXTENSIONS[fmt]}"
            if isinstance(out, bytes):
                path.write_bytes(out)
            else:
                path.write_text(out, encoding="utf-8")
            written.append(path)
    return written + publish_web(state, directory / "web", now=SAMPLE_TIME)


def main(argv: list[str]) -> int:
    target = Path(argv[0]) if argv else ROOT / "docs" / "samples"
    for path in write_samples(target, demo_state()):
        print(path)
    return 0


if __name__ == "__main__":
    raise SystemExit(main(sys.argv[1:]))
