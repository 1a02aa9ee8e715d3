"""Hostile names for the injection tests, and an event built from them the way restore or import can.

The state is folded from events directly: that is how text arrives when it
bypasses the desk's entry check (an interchange restore, an older or edited
file). A twin event with harmless names of the same visible words and widths is the layout
baseline.
"""

from __future__ import annotations

import re
import unicodedata

from pairings import events as ev
from pairings.fold import fold
from pairings.state import EventState, Result

# Attacks by category (common practice, no source; the formula starters follow the OWASP note on CSV injection).
HOSTILE = (
    "<script>alert(1)</script>",
    '"><img src=x onerror=alert(2)>',
    '=HYPERLINK("http://example.invalid","x")',
    "+SUM(1,2)",
    "-3+4*cmd",
    "@IMPORT(evil)",
    "\x1b[31mRed\x1b[0m Rook",
    "\x1b]0;title-hijack\x07Tess Mara",
    "Bell\x07Tab\tCR\rNL\nEnd",
    "C1\x9b2J Nurit",
    "\u202eLeft Right\u202c Ivo",
    "Ya\u200fel \u2067Oz\u2069",
    "Emoji 😀♟ Kiri",
    "Long " + "o" * 290 + " Name",
)
EVENT_NAME = "<b>Open</b> =1+1 \x1b[2J\u202e Night"
VISIBLE = ("alert(1)", "onerror=alert(2)", "HYPERLINK", "SUM(1,2)", "3+4*cmd", "IMPORT(evil)", "Red", "Tess Mara",
           "Nurit", "Kiri", "Long ooo")
"""Fragments of the names every readable output must still show."""


_SEQUENCE = re.compile(r"\x1b\[[0-?]*[ -/]*[@-~]|\x1b\][^\x07]*\x07|\x9b[0-?]*[ -/]*[@-~]")  # ECMA-48 CSI and OSC


def _twin(text: str) -> str:
    """Harmless letters where the visible characters of ``text`` are: the same words and widths."""
    shown = _SEQUENCE.sub("", text)
    out = []
    for c in shown:
        if c in "\t\r\n ":
            out.append(" ")
        elif unicodedata.category(c) not in ("Cc", "Cf"):
            out.append("NN" if unicodedata.east_asian_width(c) == "W" else "N")
    return " ".join("".join(out).split())


def build_events(names: tuple[str, ...], event_name: str) -> list[ev.Event]:
    """Round 1 complete, round 2 published with one result: every sheet has rows."""
    count = len(names)
    events: list[ev.Event] = [ev.EventCreated(name=event_name, rounds=3, seed=5)]
    events += [ev.PlayerRegistered(id=f"p{i}", name=n, rating=2000 - 10 * i, club=n[:40]) for i, n in enumerate(names, 1)]
    ids = [f"p{i}" for i in range(1, count + 1)]
    for rnd, order in ((1, ids), (2, ids[1:] + ids[:1])):
        boards = tuple(ev.BoardModel(board=b, first=order[2 * b - 2], second=order[2 * b - 1]) for b in range(1, count // 2 + 1))
        events += [ev.RoundDrafted(round=rnd, boards=boards), ev.RoundPublished(round=rnd)]
        results = [Result.FIRST_WINS, Result.DRAW, Result.SECOND_WINS]
        last = len(boards) if rnd == 1 else 1
        events += [ev.ResultRecorded(round=rnd, board=b, result=results[b % 3]) for b in range(1, last + 1)]
    return events


def hostile_events() -> list[ev.Event]:
    return build_events(HOSTILE, EVENT_NAME)


def hostile_state() -> EventState:
    return fold(enumerate(hostile_events(), 1))


def harmless_state() -> EventState:
    return fold(enumerate(build_events(tuple(_twin(n) for n in HOSTILE), _twin(EVENT_NAME)), 1))
