"""The interchange document: export → restore → export is the identity; inconsistent documents are refused."""

from __future__ import annotations

import copy
import json
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


# -- every setting, detail and announcement (issue: export/restore lost them silently) -----------

from pairings import actions  # noqa: E402
from pairings.interchange import export_log, restore  # noqa: E402
from pairings.regulations import change_settings, created_settings  # noqa: E402
from pairings.state import ByeKind, PlayerDetails, PlayerId, RoundState, System  # noqa: E402
from pairings.store import EventStore  # noqa: E402

SETTINGS = {
    "system": "dutch", "acceleration": "baku", "tiebreaks": "sonneborn_berger,buchholz", "unplayed": "dummy-opponent",
    "requested_bye_points": "0", "requested_bye_limit": "2", "requested_bye_last_round": "5",
    "late_entry_points": "0.5", "max_meetings": "2", "final_round_side_exception": "yes", "forfeit_is_meeting": "no",
}


def _rich_event(path: Any) -> EventStore:
    """An event using every setting, every player detail, announcements, a do-not-pair entry and a late entrant."""
    first = created_settings(actions.new_event("Moorland Open", 6, "1,0.5,0", bye_points=0.5, seed=42), SETTINGS)
    store = EventStore.create(path, first)
    names = ["Ada Quince", "Bo Rill", "Cy Marsh", "Dee Fenn", "Eli Stowe", "Fay Orrin"]
    for i, name in enumerate(names):
        d = PlayerDetails(title="FM" if i == 0 else None, federation="ENG" if i % 2 else "WLS",
                          fide_id=str(4400100 + i), national_id=f"N{i}", birth="1990" if i else "1975-03-04",
                          sex="f" if i % 2 else "m", ratings=(("fide", 1900 - 50 * i), ("national", 1950 - 50 * i)),
                          categories=("senior",) if i == 0 else ())
        store.append(actions.add_player(store.state, name, 1900 - 50 * i, "Tor Club", details=d))
    store.apply(lambda s: actions.forbid_pair(s, "Ada", "Bo", reason="siblings"))
    store.apply(lambda s: actions.forbid_pair(s, "Cy", "Dee", until_round=3))
    store.apply(lambda s: actions.announce_bye(s, "Eli", ByeKind.REQUESTED, 2))
    store.apply(lambda s: actions.announce_bye(s, "Fay", ByeKind.ABSENCE, 3))
    store.apply(actions.pair)
    store.apply(actions.publish)
    state = store.state
    for g in state.rounds[0].games:
        store.append(actions.record_result(store.state, g.board, "1-0"))
    store.apply(lambda s: change_settings(s, {"tiebreaks": "buchholz,wins", "rounds": "7"}))
    store.apply(lambda s: actions.add_player(s, "Gus Penn", 1500))
    store.apply(lambda s: actions.withdraw(s, "Dee", reason="ill"))
    store.apply(lambda s: actions.withdraw(s, "Cy"))
    store.apply(lambda s: actions.reinstate(s, "Cy"))
    return store


def test_every_setting_and_detail_survive_export_restore_export(tmp_path: Any) -> None:
    store = _rich_event(tmp_path / "a.pairings")
    doc = export_event(store.state)
    store.close()
    assert doc["event"]["system"] == "dutch" and doc["event"]["seed"] == 42
    assert doc["event"]["changed_after"] == [[1, "rounds"], [1, "tiebreaks"]]
    assert doc["event"]["forbidden"] == [["p1", "p2", {"until_round": None, "reason": "siblings"}],
                                         ["p3", "p4", {"until_round": 3, "reason": ""}]]
    assert doc["players"][4]["announced"] == [{"round": 2, "kind": "requested"}]
    assert doc["players"][6]["entry_round"] == 2 and doc["players"][3]["withdrawn_from"] == 2
    assert doc["players"][2]["reinstated_from"] == 2
    restored = restore(copy.deepcopy(doc))
    again = export_event(fold(enumerate(restored.events, 1)))
    assert again == doc
    assert any("--log" in line for line in restored.lost)


def test_a_restored_event_keeps_the_do_not_pair_list_and_the_announced_byes(tmp_path: Any) -> None:
    events: list[ev.Event] = [
        ev.EventCreated(name="Club night", rounds=3, seed=5),
        *(ev.PlayerRegistered(id=f"p{i}", name=f"Player {i}", rating=2000 - 10 * i) for i in range(1, 7)),
        ev.PairForbidden(a="p1", b="p4"),
        ev.ByeRequested(player="p2", round=1, kind=ByeKind.REQUESTED),
        ev.ByeRequested(player="p6", round=1, kind=ByeKind.ABSENCE),
    ]
    doc = export_event(fold(enumerate(events, 1)))
    store = EventStore.create_from(tmp_path / "r.pairings", restore_events(doc))
    state = store.apply(actions.pair)
    store.close()
    paired = {frozenset((g.first, g.second)) for g in state.rounds[0].games}
    on_boards = {p for pair in paired for p in pair}
    assert frozenset(("p1", "p4")) not in paired
    assert "p2" not in on_boards and "p6" not in on_boards
    # Without the announcements the same four players pair p1-p4 (so the check above can fail).
    bare = [e for e in events if not isinstance(e, (ev.PairForbidden, ev.ByeRequested))]
    bare_state = fold(enumerate(bare + [ev.ByeRequested(player="p2", round=1, kind=ByeKind.REQUESTED),
                                        ev.ByeRequested(player="p6", round=1, kind=ByeKind.ABSENCE)], 1))
    first = actions.pair(bare_state)[0]
    assert isinstance(first, ev.RoundDrafted)
    assert frozenset(("p1", "p4")) in {frozenset((b.first, b.second)) for b in first.boards}


def test_a_round_robin_comes_back_as_a_round_robin() -> None:
    doc = export_event(fold([(1, ev.EventCreated(name="All play all", rounds=10, system=System.ROUND_ROBIN,
                                                   double_round=True))]))
    assert doc["event"]["system"] == "double-round-robin"
    state = fold(enumerate(restore_events(doc), 1))
    assert state.settings.system.value == "round_robin" and state.settings.double_round


def test_a_version_1_document_without_the_new_keys_still_restores() -> None:
    doc = export_event(fold(enumerate(_played(), 1)))
    for key in list(doc["event"]):
        if key not in ("name", "rounds", "scoring", "sides", "bye_points"):
            del doc["event"][key]
    for p in doc["players"]:
        for key in list(p):
            if key not in ("id", "name", "rating", "club", "status"):
                del p[key]
    state = fold(enumerate(restore_events(doc), 1))
    assert state.settings.tiebreaks == fold([(1, ev.EventCreated(name="x", rounds=1))]).settings.tiebreaks
    assert state.players[PlayerId("p4")].withdrawn_from == 3  # after the rounds given, as before
    assert state.rounds[1].state is RoundState.PUBLISHED


@pytest.mark.parametrize(
    ("change", "says"),
    [
        (lambda d: d["event"].update(system="swiss-ish"), "use whole-round"),
        (lambda d: d["event"].update(tiebreaks=["nonsense"]), "unknown tiebreak"),
        (lambda d: d["event"].update(forbidden=[["p1", "p99"]]), "forbidden pair"),
        (lambda d: d["players"][0].update(federation="England"), "player 'p1': federation"),
        (lambda d: d["players"][0].update(announced=[{"round": 9, "kind": "requested"}]), "round 9 of 4"),
        (lambda d: d["event"].update(bye_points=3), "between 0 and a win"),
        (lambda d: d["event"].update(bye_points=0.0001), "bye points 0.0001 has more than 3 decimals"),
        (lambda d: d["event"].update(bye_points=None), "bye_points"),
        (lambda d: d["event"].update(changed_after=[[1, "colour"]]), "changed_after"),
        (lambda d: d["players"][0].update(withdrawn_from=2), "withdrawn_from is given"),
        (lambda d: d["players"][0].update(birth="yesterday"), "player 'p1': birth"),
    ],
)
def test_bad_new_keys_are_refused(change: Any, says: str) -> None:
    with pytest.raises(InputError, match=says):
        restore_events(_broken(change))


def test_export_with_the_log_replays_the_whole_history(tmp_path: Any) -> None:
    store = _rich_event(tmp_path / "a.pairings")
    doc = export_event(store.state) | {"log": export_log(store.log)}
    original = [s.event for s in store.log]
    store.close()
    restored = restore(json.loads(json.dumps(doc)))
    assert restored.events == original
    assert restored.lost == [
        "the times of the logged entries: each is dated at restore (the document keeps the original times)"]
    tampered = json.loads(json.dumps(doc))
    tampered["players"][0]["name"] = "Someone Else"
    with pytest.raises(InputError, match="log does not give the document's 'players'"):
        restore(tampered)
    broken = json.loads(json.dumps(doc))
    broken["log"][3]["seq"] = 9
    with pytest.raises(InputError, match="log entry 4 cannot be read"):
        restore(broken)
