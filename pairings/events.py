"""Typed events: the only things ever written to an event file.

One pydantic discriminated union (:data:`Event`) on the field ``type``. Type
names are stable strings, never module paths; :data:`SCHEMA_VERSION` is written
with the file and bumped when a stored shape changes.
"""

from __future__ import annotations

from typing import Annotated, Literal, Union

from pydantic import BaseModel, ConfigDict, Field, TypeAdapter

from pairings.state import Acceleration, ByeKind, Result, System, Unplayed

SCHEMA_VERSION = 2


class _Event(BaseModel):
    model_config = ConfigDict(frozen=True, extra="forbid")


class ScoringModel(_Event):
    win: float = 1.0
    draw: float = 0.5
    loss: float = 0.0


class EventCreated(_Event):
    type: Literal["event-created"] = "event-created"
    name: str
    rounds: int = Field(ge=1)
    scoring: ScoringModel = ScoringModel()
    sides: tuple[str, str] | None = ("White", "Black")
    bye_points: float = 1.0
    requested_bye_points: float = 0.5
    tiebreaks: tuple[str, ...] | None = None
    unplayed: Unplayed = Unplayed.VIRTUAL_OPPONENT
    default_rating: int = 1000
    max_meetings: int = Field(default=1, ge=1)
    final_round_side_exception: bool = False
    system: System = System.SWISS
    double_round: bool = False
    seed: int = 0
    acceleration: Acceleration = Acceleration.NONE
    forfeit_is_meeting: bool = True
    late_entry_points: float = 0.0
    requested_bye_limit: int | None = Field(default=None, ge=0)
    requested_bye_last_round: int | None = Field(default=None, ge=1)


ClearableSetting = Literal["requested_bye_limit", "requested_bye_last_round"]


class SettingsChanged(_Event):
    """Changes some settings; only the fields given (not None) change, and those in ``cleared`` become None."""

    type: Literal["settings-changed"] = "settings-changed"
    name: str | None = None
    rounds: int | None = Field(default=None, ge=1)
    tiebreaks: tuple[str, ...] | None = None
    unplayed: Unplayed | None = None
    bye_points: float | None = None
    requested_bye_points: float | None = None
    scoring: ScoringModel | None = None
    system: System | None = None
    acceleration: Acceleration | None = None
    forfeit_is_meeting: bool | None = None
    max_meetings: int | None = Field(default=None, ge=1)
    final_round_side_exception: bool | None = None
    double_round: bool | None = None
    late_entry_points: float | None = None
    requested_bye_limit: int | None = Field(default=None, ge=0)
    requested_bye_last_round: int | None = Field(default=None, ge=1)
    cleared: tuple[ClearableSetting, ...] = ()
    after_round: int = 0
    """The last round published when the change was made (0: before round 1); the sheets name it."""


class PlayerDetailsModel(_Event):
    """Stored form of :class:`pairings.state.PlayerDetails`."""

    title: str | None = None
    federation: str | None = None
    fide_id: str | None = None
    national_id: str | None = None
    birth: str | None = None
    sex: Literal["m", "f"] | None = None
    ratings: dict[str, int] = Field(default_factory=dict)
    categories: tuple[str, ...] = ()


class PlayerRegistered(_Event):
    type: Literal["player-registered"] = "player-registered"
    id: str
    name: str
    rating: int | None = None
    club: str | None = None
    entry_round: int = Field(default=1, ge=1)
    details: PlayerDetailsModel | None = None


class PlayerEdited(_Event):
    type: Literal["player-edited"] = "player-edited"
    id: str
    name: str
    rating: int | None = None
    club: str | None = None
    details: PlayerDetailsModel | None = None
    """None keeps the player's details as they are; a value replaces them whole."""


class PlayerWithdrawn(_Event):
    type: Literal["player-withdrawn"] = "player-withdrawn"
    player: str
    from_round: int = Field(ge=1)
    reason: str = ""


class PlayerReinstated(_Event):
    type: Literal["player-reinstated"] = "player-reinstated"
    player: str
    from_round: int = Field(ge=1)


class ByeRequested(_Event):
    """An announced bye (``requested``) or an absence for one future round."""

    type: Literal["bye-requested"] = "bye-requested"
    player: str
    round: int = Field(ge=1)
    kind: Literal[ByeKind.REQUESTED, ByeKind.ABSENCE]


class ByeCancelled(_Event):
    type: Literal["bye-cancelled"] = "bye-cancelled"
    player: str
    round: int = Field(ge=1)


class PairForbidden(_Event):
    type: Literal["pair-forbidden"] = "pair-forbidden"
    a: str
    b: str
    until_round: int | None = None
    reason: str = ""


class BoardModel(_Event):
    board: int = Field(ge=1)
    first: str
    second: str
    result: Result | None = None
    flags: tuple[str, ...] = ()
    cost: dict[str, int] = {}


class ByeModel(_Event):
    player: str
    kind: ByeKind
    points: float


class RoundDrafted(_Event):
    """A full draft of a round: the engine's, an override's replacement, or a restored round."""

    type: Literal["round-drafted"] = "round-drafted"
    round: int = Field(ge=1)
    boards: tuple[BoardModel, ...]
    byes: tuple[ByeModel, ...] = ()
    cost: dict[str, int] = {}
    engine_version: str | None = None
    source: Literal["engine", "override", "restored"] = "engine"
    reason: str = ""


class DraftDiscarded(_Event):
    type: Literal["draft-discarded"] = "draft-discarded"
    round: int = Field(ge=1)
    reason: str = ""


class RoundPublished(_Event):
    type: Literal["round-published"] = "round-published"
    round: int = Field(ge=1)


class RoundUnpublished(_Event):
    type: Literal["round-unpublished"] = "round-unpublished"
    round: int = Field(ge=1)
    reason: str


class ResultRecorded(_Event):
    type: Literal["result-recorded"] = "result-recorded"
    round: int = Field(ge=1)
    board: int = Field(ge=1)
    result: Result | None
    """None clears a result."""


class Undone(_Event):
    """Compensates an earlier event: the fold skips event ``target`` from now on."""

    type: Literal["undone"] = "undone"
    target: int = Field(ge=1)
    summary: str = ""


Event = Annotated[
    Union[
        EventCreated,
        SettingsChanged,
        PlayerRegistered,
        PlayerEdited,
        PlayerWithdrawn,
        PlayerReinstated,
        ByeRequested,
        ByeCancelled,
        PairForbidden,
        RoundDrafted,
        DraftDiscarded,
        RoundPublished,
        RoundUnpublished,
        ResultRecorded,
        Undone,
    ],
    Field(discriminator="type"),
]

EVENT_ADAPTER: TypeAdapter[Event] = TypeAdapter(Event)


def parse_event(data: str | bytes) -> Event:
    """Parse one stored event from its JSON text."""
    return EVENT_ADAPTER.validate_json(data)


def dump_event(event: Event) -> dict[str, object]:
    return event.model_dump(mode="json")
