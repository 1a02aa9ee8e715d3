"""The desk's exception classes.

Every error a user can cause is an :class:`InputError` (a ``ValueError``) with a
one-line message they can act on; the command line prints it and exits with
status 2. Nothing is written when one is raised.
"""

from __future__ import annotations


class PairingsError(Exception):
    """Base of every error the desk raises on purpose."""


class InputError(PairingsError, ValueError):
    """A request the event's data or rules do not allow (exit status 2)."""


class UnknownPlayerError(InputError):
    """No player has this id or name."""


class AmbiguousPlayerError(InputError):
    """More than one player matches this name."""


class ResultCodeError(InputError):
    """A result code outside 1-0, 0-1, 1/2-1/2, +-, -+, --, 0-0, 1/2-0, 0-1/2."""


class RoundStateError(InputError):
    """The round is not in the state this action needs (draft, published, complete)."""


class RosterError(InputError):
    """A roster file with bad rows; ``problems`` lists every one with its line."""

    def __init__(self, problems: list[str]) -> None:
        self.problems = problems
        count = f"{len(problems)} bad row{'s' if len(problems) != 1 else ''}"
        super().__init__(f"roster not imported, {count}: {'; '.join(problems)}")


class DuplicatePlayerError(InputError):
    """A registration that looks like a player already registered (same folded name, or same id)."""


class HardRuleError(RoundStateError):
    """A draft changed by the organiser breaks a hard rule (H1-H5) the engine's optimum keeps."""


class NoShowError(RoundStateError):
    """Players lost the last round by double forfeit and nobody has said whether they stay in."""


class PrizeError(InputError):
    """A prize category or prize defined wrongly, or one that does not exist."""


class NoPairingError(InputError):
    """The engine cannot pair this field (too few players, bad pins, ...)."""


class OutputError(InputError):
    """A printout or web page could not be written (full disk, refused folder); the old file is kept."""


class StoreError(PairingsError):
    """Problems with the event file itself."""


class ReadOnlyError(StoreError, InputError):
    """The event file could only be opened for reading (a read-only medium or folder, a full disk)."""


class NotAnEventFileError(StoreError, InputError):
    """The file is missing, not SQLite, or not one of our event files."""


class NewerSchemaError(StoreError, InputError):
    """The file was written by a newer version of the desk."""


class ChainBrokenError(StoreError, InputError):
    """The hash chain does not verify: the file was altered outside the desk."""

    def __init__(self, seq: int, reason: str) -> None:
        self.seq = seq
        super().__init__(f"event file altered: hash chain breaks at event {seq} ({reason})")


class ConflictError(StoreError, InputError):
    """Another window or process wrote to the event meanwhile; nothing was written."""

    def __init__(self, expected: int, found: int) -> None:
        self.expected = expected
        self.found = found
        super().__init__(
            f"the event changed elsewhere (expected event {expected}, found {found}); "
            "reload and try again — nothing was written"
        )


class ReportFileError(InputError):
    """A tournament report file (TRF) that cannot be read; the message names the line and column."""


class RatingListError(InputError):
    """A rating list that cannot be read, or a rating update the event's state refuses."""
