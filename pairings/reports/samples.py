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

from pairings.events import EVENT_ADAPTER
from pairings.fold import fold
from pairings.reports import FORMATS, KINDS, publish_web, render
from pairings.state import EventState

ROOT = Path(__file__).resolve().parents[2]
SCENARIO = ROOT / "events" / "winter-open.events.json"
SAMPLE_TIME = datetime(2026, 12, 5, 18, 30, tzinfo=timezone.utc)
EXTENSIONS = {"text": "txt", "csv": "csv", "json": "json", "html": "html", "pdf": "pdf"}


def demo_state(path: Path = SCENARIO) -> EventState:
    """The demo event's state, folded from its data file."""
    records = json.loads(path.read_text(encoding="utf-8"))
    return fold(enumerate((EVENT_ADAPTER.validate_python(r) for r in records), 1))


def write_samples(directory: Path, state: EventState) -> list[Path]:
    """Every kind in every format, and the publish folder; returns the files written."""
    directory.mkdir(parents=True, exist_ok=True)
    written = []
    for kind in KINDS:
        for fmt in FORMATS:
            out = render(state, kind, fmt, now=SAMPLE_TIME)
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
