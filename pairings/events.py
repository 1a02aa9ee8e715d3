"""Typed events: the only things ever written to an event file.

One pydantic discriminated union (:data:`Event`) on the field ``type``. Type
names are stable strings, never module paths; :data:`SCHEMA_VERSION` is written
with the file and bumped when a stored shape changes.

Every command reads a log, so importing this module is on every command's way:
each model builds its validator only when it first validates (pydantic's
``defer_build``), a stored row is validated by the model its type column names
(:func:`parse_event`), so only the models a log holds are ever built, and the
annotations are plain objects, not strings pydantic would have to evaluate.
"""

from functools import cache
from typing import Annotated, Any, Literal, Union, cast, get_args

from pydantic import BaseModel, ConfigDict, Field, PlainSerializer, PlainValidator, SerializationInfo, TypeAdapter

from pairings.points import ZERO, Points, exact
from pairings.state import Acceleration, BetterPrize, ByeKind, PrizeTies, Result, System, Unplayed

SCHEMA_VERSION = 4


def _stored(value: Points, info: SerializationInfo) -> Points | float:
    """A JSON number in the file, as files have always held (``1.0``, ``0.5``); exact in Python."""
    return float(value) if info.mode_is_json() else value


StoredPoints = Annotated[Points, PlainValidator(exact), PlainSerializer(_stored, return_type=Any)]
"""Points in an event: exact (:mod:`pairings.points`), written as a JSON number. Configured points
have at most three decimals (:data:`pairings.points.PLACES`), so the stored float reads back as the
same decimal."""


class _Event(BaseModel):
    model_config = ConfigDict(frozen=True, extra="forbid", defer_build=True)


class ScoringModel(_Event):
    win: StoredPoints = Points(1)
    draw: StoredPoints = Points(1, 2)
    loss: StoredPoints = ZERO


class EventCreated(_Event):
    type: Literal["event-created"] = "event-created"
    name: str
    rounds: int = Field(ge=1)
    scoring: ScoringModel = ScoringModel()
    sides: tuple[str, str] | None = ("White", "Black")
    bye_points: StoredPoints = Points(1)
    requested_bye_points: StoredPoints = Points(1, 2)
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
    city: str = ""
    federation: str = ""
    start_date: str = ""
    end_date: str = ""
    chief_arbiter: str = ""
    deputy_arbiters: tuple[str, ...] = ()
    time_control: str = ""
    round_dates: tuple[str, ...] = ()
    late_entry_points: StoredPoints = ZERO
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
    bye_points: StoredPoints | None = None
    requested_bye_points: StoredPoints | None = None
    scoring: ScoringModel | None = None
    system: System | None = None
    acceleration: Acceleration | None = None
    forfeit_is_meeting: bool | None = None
    max_meetings: int | None = Field(default=None, ge=1)
    final_round_side_exception: bool | None = None
    city: str | None = None
    """The report file's header fields (pairings.eventinfo); an empty text clears one."""
    federation: str | None = None
    start_date: str | None = None
    end_date: str | None = None
    chief_arbiter: str | None = None
    deputy_arbiters: tuple[str, ...] | None = None
    time_control: str | None = None
    round_dates: tuple[str, ...] | None = None
    double_round: bool | None = None
    late_entry_points: StoredPoints | None = None
    requested_bye_limit: int | None = Field(default=None, ge=0)
    requested_bye_last_round: int | None = Field(default=None, ge=1)
    cleared: tuple[ClearableSetting, ...] = ()
    after_round: int = 0
    """The last round published when the change was made (0: before round 1); the sheets name it."""

    def given(self) -> dict[str, Any]:
        """The settings this event changes to a value (not None), by field name, as typed values
        (``model_dump`` would write the exact points as text)."""
        skip = {"type", "cleared", "after_round"}
        return {k: v for k in type(self).model_fields if k not in skip and (v := getattr(self, k)) is not None}


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
    reason: str = ""
    """Why, when the change is made after round 1 was published (a forced rating update)."""


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
    points: StoredPoints


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


class ResultCorrected(_Event):
    """A result changed after later rounds were paired on it (C.04.2, from memory: the correction
    counts from now on and changes no pairing already made); ``reason`` goes into the log."""

    type: Literal["result-corrected"] = "result-corrected"
    round: int = Field(ge=1)
    board: int = Field(ge=1)
    result: Result
    reason: str
    paired_rounds: tuple[int, ...] = ()
    """The later rounds already drafted or published on the old result (for the log line)."""


class BreachAccepted(_Event):
    """The organiser publishes their changed draft although it breaks hard rules (written just before
    the round's :class:`RoundPublished`); ``breaches`` as the check named them."""

    type: Literal["breach-accepted"] = "breach-accepted"
    round: int = Field(ge=1)
    reason: str
    breaches: tuple[str, ...] = ()


class NoShowKept(_Event):
    """The organiser keeps a player in the event after a double forfeit (no-show) in ``round``."""

    type: Literal["no-show-kept"] = "no-show-kept"
    player: str
    round: int = Field(ge=1)


class Undone(_Event):
    """Compensates an earlier event: the fold skips event ``target`` from now on."""

    type: Literal["undone"] = "undone"
    target: int = Field(ge=1)
    summary: str = ""


class CategoryRuleModel(_Event):
    """Stored form of :class:`pairings.state.CategoryRule`."""

    age_under: int | None = Field(default=None, ge=1)
    age_from: int | None = Field(default=None, ge=1)
    age_on: str | None = None
    sex: Literal["m", "f"] | None = None
    rating_from: int | None = None
    rating_below: int | None = None
    rating_list: str | None = None
    unrated: bool = False
    label: str | None = None
    club: str | None = None


class CategoryDefined(_Event):
    """Defines a prize category, or redefines one of the same name (its hand-given members stay)."""

    type: Literal["category-defined"] = "category-defined"
    name: str
    rule: CategoryRuleModel | None = None
    """None: every member is given by hand."""


class CategoryRemoved(_Event):
    type: Literal["category-removed"] = "category-removed"
    name: str


class CategoryMember(_Event):
    """Puts a player in a category by hand (``member``), or leaves them out of it."""

    type: Literal["category-member"] = "category-member"
    category: str
    player: str
    member: bool = True


class PrizeSet(_Event):
    """Sets the prize for a place of a category (None: the overall standings); amount None removes it."""

    type: Literal["prize-set"] = "prize-set"
    category: str | None = None
    place: int = Field(ge=1)
    amount: int | None = Field(default=None, ge=0)
    """Integer minor units."""


class PrizePolicySet(_Event):
    type: Literal["prize-policy-set"] = "prize-policy-set"
    better: BetterPrize | None = None
    ties: PrizeTies | None = None
    currency: str | None = None
    minor_digits: int | None = Field(default=None, ge=0, le=3)


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
        ResultCorrected,
        BreachAccepted,
        NoShowKept,
        Undone,
        CategoryDefined,
        CategoryRemoved,
        CategoryMember,
        PrizeSet,
        PrizePolicySet,
    ],
    Field(discriminator="type"),
]

EVENT_ADAPTER: TypeAdapter[Event] = TypeAdapter(Event, config=ConfigDict(defer_build=True))
"""Validates an event of any type (new input: restore, the demo scenario)."""


@cache
def _models() -> dict[str, type[_Event]]:
    """Each event type's name and model."""
    members: tuple[type[_Event], ...] = get_args(get_args(Event)[0])
    return {model.model_fields["type"].default: model for model in members}


def parse_event(data: str | bytes, stored_type: str | None = None) -> Event:
    """Parse one stored event from its JSON text.

    ``stored_type`` (the row's type column) picks the one model to validate with: the
    same result as the whole union's, which picks its member by the payload's own
    ``type``. A payload that does not fit that model is parsed by the union, so a
    caller comparing ``event.type`` with the column can tell a mismatch from an
    unreadable event.
    """
    model = _models().get(stored_type) if stored_type is not None else None
    if model is not None:
        try:
            return cast(Event, model.model_validate_json(data))
        except ValueError:
            pass
    return EVENT_ADAPTER.validate_json(data)


def dump_event(event: Event) -> dict[str, object]:
    return event.model_dump(mode="json")
