"""Reading a stored row by its type column gives exactly what the whole union's validation gives.

The recorder validates each payload with the one model its row's type column names
(pairings.events.parse_event), so a command builds only the models its log holds;
the reference here is the discriminated union itself (pydantic picks the member by
the payload's ``type``). Checked on one event of every type, on every row of the
checked-in files (the schema-version-1 fixture, the demo scenario) and on a
simulated log; and a row whose type column does not match its payload is still
named as such.
"""

from __future__ import annotations

import json
import sqlite3
from pathlib import Path

import pytest

from pairings import events as ev
from pairings.demo import SCENARIO
from pairings.errors import ChainBrokenError
from pairings.points import Points
from pairings.simulate import simulate_events
from pairings.store import EventStore
from pairings.store.recorder import canonical_json, row_hash

FIXTURES = Path(__file__).parents[1] / "fixtures"

ONE_OF_EACH: list[ev.Event] = [
    ev.EventCreated(name="Quayside Rapid", rounds=5, scoring=ev.ScoringModel(win=3, draw=1, loss=0), sides=None,
                    tiebreaks=("BH-C1", "SB"), unplayed="dummy_opponent", system="round_robin", acceleration="baku",
                    deputy_arbiters=("Rin Sorrel",), round_dates=("2026-05-01",), requested_bye_limit=2),
    ev.SettingsChanged(rounds=6, scoring=ev.ScoringModel(), unplayed="as_they_stand", cleared=("requested_bye_limit",),
                       round_dates=(), after_round=2, late_entry_points=0.5),
    ev.PlayerRegistered(id="p1", name="Ada Quince", rating=1840, club="Lantern Street", entry_round=2,
                        details=ev.PlayerDetailsModel(title="FM", sex="f", ratings={"fide": 1850},
                                                      categories=("U18",))),
    ev.PlayerEdited(id="p1", name="Ada Quince-Rill", details=ev.PlayerDetailsModel(), reason="forced update"),
    ev.PlayerWithdrawn(player="p1", from_round=3, reason="ill"),
    ev.PlayerReinstated(player="p1", from_round=4),
    ev.ByeRequested(player="p1", round=2, kind="absence"),
    ev.ByeCancelled(player="p1", round=2),
    ev.PairForbidden(a="p1", b="p2", until_round=3, reason="same household"),
    ev.RoundDrafted(round=1, boards=(ev.BoardModel(board=1, first="p1", second="p2", result="1/2-1/2",
                                                   flags=("gap 0.5",), cost={"score_gap": 1}),),
                    byes=(ev.ByeModel(player="p3", kind="pairing", points=1),), cost={"score_gap": 1},
                    engine_version="1.3", source="override", reason="swap"),
    ev.DraftDiscarded(round=1, reason="late entry"),
    ev.RoundPublished(round=1),
    ev.RoundUnpublished(round=1, reason="wrong board"),
    ev.ResultRecorded(round=1, board=1, result=None),
    ev.ResultCorrected(round=1, board=1, result="0-1", reason="scoresheet", paired_rounds=(2,)),
    ev.BreachAccepted(round=2, reason="organiser's call", breaches=("p1 and p2 met before",)),
    ev.NoShowKept(player="p2", round=1),
    ev.Undone(target=4, summary="withdrawal"),
    ev.CategoryDefined(name="U18", rule=ev.CategoryRuleModel(age_under=18, age_on="2027-01-01", sex="f")),
    ev.CategoryRemoved(name="U18"),
    ev.CategoryMember(category="Club", player="p1", member=False),
    ev.PrizeSet(category=None, place=1, amount=15000),
    ev.PrizePolicySet(better="order", ties="shared", currency="EUR", minor_digits=2),
]


def _payloads_of_files() -> list[tuple[str, str]]:
    rows: list[tuple[str, str]] = []
    for path in sorted(FIXTURES.glob("*.pairings")):
        conn = sqlite3.connect(f"file:{path.as_posix()}?immutable=1", uri=True)  # reads leave no -wal/-shm beside it
        try:
            rows += conn.execute("SELECT type, payload FROM events ORDER BY seq").fetchall()
        finally:
            conn.close()
    for item in json.loads(SCENARIO.read_text(encoding="utf-8")):
        rows.append((item["type"], canonical_json(item)))
    return rows


def _same(payload: str, stored_type: str) -> None:
    by_union = ev.EVENT_ADAPTER.validate_json(payload)
    by_type = ev.parse_event(payload, stored_type)
    assert type(by_type) is type(by_union)
    assert by_type == by_union
    assert ev.dump_event(by_type) == ev.dump_event(by_union)


def test_every_event_type_is_covered() -> None:
    assert sorted(e.type for e in ONE_OF_EACH) == sorted(ev._models())


@pytest.mark.parametrize("event", ONE_OF_EACH, ids=lambda e: e.type)
def test_one_event_of_each_type(event: ev.Event) -> None:
    _same(canonical_json(ev.dump_event(event)), event.type)


def test_every_row_of_the_checked_in_files() -> None:
    rows = _payloads_of_files()
    assert {t for t, _ in rows} >= {"event-created", "round-drafted", "undone"}
    for stored_type, payload in rows:
        _same(payload, stored_type)


def test_a_simulated_log() -> None:
    for event in simulate_events(40, 5, 3, 7):
        _same(canonical_json(ev.dump_event(event)), event.type)


def test_numbers_and_lists_as_an_old_writer_may_have_stored_them() -> None:
    """An integer for points and lists where tuples are declared: read the same way (points exact)."""
    payload = '{"type":"round-drafted","round":1,"boards":[{"board":1,"first":"p1","second":"p2"}],' \
              '"byes":[{"player":"p3","kind":"pairing","points":1}]}'
    _same(payload, "round-drafted")
    assert ev.parse_event(payload, "round-drafted").byes[0].points == Points(1)  # type: ignore[union-attr]


def test_a_payload_the_column_does_not_name_is_read_as_what_it_is() -> None:
    assert ev.parse_event('{"type":"round-published","round":2}', "undone") == ev.RoundPublished(round=2)
    with pytest.raises(ValueError):
        ev.parse_event('{"type":"round-published","round":0}', "round-published")


def test_a_row_whose_type_column_was_rewritten_with_its_hash_is_named(tmp_path: Path) -> None:
    """The hash chain vouches only for rows written by this program; a rewritten row whose hashes were
    recomputed must still be refused by what it says, not read as another type."""
    path = tmp_path / "e.pairings"
    with EventStore.create(path, ev.EventCreated(name="Test", rounds=3)) as store:
        store.append([ev.PlayerRegistered(id="p1", name="Ada Quince")])
    conn = sqlite3.connect(path)
    seq, type_, version, at, payload, prev = conn.execute(
        "SELECT seq, type, schema_version, recorded_at, payload, prev_hash FROM events WHERE seq = 2").fetchone()
    assert type_ == "player-registered"
    conn.execute("UPDATE events SET type = ?, hash = ? WHERE seq = 2",
                 ("player-edited", row_hash(seq, "player-edited", version, at, payload, prev)))
    conn.commit()
    conn.close()
    with pytest.raises(ChainBrokenError, match="type column"):
        EventStore.open(path)
