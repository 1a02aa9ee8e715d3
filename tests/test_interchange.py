"""The interchange document: export → restore → export is the identity; inconsistent documents are refused."""

from __future__ import annotations

import copy
from typing import Any

import pytest

from pairings import events as ev
from pairings.errors import InputError
from pairings.fold import fold
from pairings.interchange import export_event, restore_events


def _played() -> list[ev.Event]:
    b = ev.BoardModel
    return [
        ev.EventCreated(name="Riverside Rapid", rounds=4),
        *(ev.PlayerRegistered(id=f"p{i}", name=n, rating=r) for i, (n, r) in enumerate(
            [("Ada Quince", 1900), ("Bo Rill", 1800), ("Cy Marsh", 1700), ("Dee Fenn", None), ("Eli Stowe", 1500)], 1)),
        ev.RoundDrafted(round=1, boards=(b(board=1, first="p1", second="p3"), b(board=2, first="p4", second="p2")),
                        byes=(ev.ByeModel(player="p5", kind="pairing", points=1),)),
        ev.RoundPublished(round=1),
        ev.ResultRecorded(round=1, board=1, result="1-0"),
        ev.ResultRecorded(round=1, board=2, result="-+"),
        ev.PlayerWithdrawn(player="p4", from_round=2),
        ev.RoundDrafted(round=2, boards=(b(board=1, first="p5", second="p1"), b(board=2, first="p2", second="p3"))),
        ev.RoundPublished(round=2),
        ev.ResultRecorded(round=2, board=2, result="1/2-1/2"),
    ]


def test_round_trip() -> None:
    doc = export_event(fold(enumerate(_played(), 1)))
    assert doc["rounds"][0]["state"] == "complete" and doc["rounds"][1]["state"] == "published"
    assert doc["players"][3]["status"] == "withdrawn"
    again = export_event(fold(enumerate(restore_events(copy.deepcopy(doc)), 1)))
    assert again == doc


def _broken(change: Any) -> dict[str, Any]:
    doc = export_event(fold(enumerate(_played(), 1)))
    change(doc)
    return doc


@pytest.mark.parametrize(
    ("change", "says"),
    [
        (lambda d: d.update(format="other"), "format"),
        (lambda d: d["players"].append(dict(d["players"][0])), "appears twice"),
        (lambda d: d["rounds"][0]["games"][0].update(first="p99"), "unknown player"),
        (lambda d: d["rounds"][0]["games"][0].update(second="p1"), "appears twice"),
        (lambda d: d["rounds"][0].update(state="published"), "later rounds"),
        (lambda d: d["rounds"][0]["games"][0].update(result=None), "no result"),
        (lambda d: d["rounds"][0]["games"][0].update(board=5), "boards must be numbered"),
        (lambda d: d["rounds"][1].update(number=3), "numbered 1, 2"),
        (lambda d: d["event"].update(rounds=1), "rounds given"),
        (lambda d: d["rounds"][0]["games"][0].update(result="2-0"), "result"),
        (lambda d: d["rounds"][1].update(state="draft"), "draft but has results"),
    ],
)
def test_inconsistent_documents_are_refused(change: Any, says: str) -> None:
    with pytest.raises(InputError, match=says):
        restore_events(_broken(change))


def test_not_a_document() -> None:
    for data in (None, [], "x", {"format": "pairings-event"}):
        with pytest.raises(InputError):
            restore_events(data)
