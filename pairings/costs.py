"""The criteria of the whole-round system's pair cost, declared once (docs/engine.md "The order of the rules").

A pair's cost (and the pairing bye's) is a tuple of non-negative integers, one
per :class:`Criterion`, in :data:`CRITERIA` order: strict priority, highest
first, hard-rule relaxations before every soft criterion. Everything that reads
a cost by position reads it from :data:`LAYOUT`: the Python cost
(:meth:`pairings.engine.criteria.Field.pair`), the numpy cost
(:mod:`pairings.engine.vector`), the compiled scan (:mod:`pairings.engine.scan`
hands ``_scan_c`` each criterion's column at run time), the weights, the
pruning bound, the board flags, the explanations and the desk's flag words.
Reordering two soft criteria is one edit of :data:`CRITERIA`.

This module imports nothing heavy: the desk reads its flag words without
loading the engine.

References
----------
FIDE Handbook C.04.1 "Basic rules for Swiss systems" (b, c, d, f, g), restated
in docs/engine.md (H1-H3, S2-S6), whose table lists the same keys in the same order.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence


@dataclass(frozen=True, slots=True)
class Criterion:
    """One line of the cost tuple."""

    key: str
    """The cost map's key (``pairings pair --json`` → ``"cost"``) and the name the code reads it by."""
    rule: str
    """Its rule in docs/engine.md (H1-H3 hard, S2-S6 soft)."""
    hard: bool
    """A hard rule's relaxation: the engine breaks it only when no pairing of everyone keeps it."""
    bye_only: bool
    """Non-zero only on the pairing bye's edge (every pair has 0 here)."""
    words: tuple[str, str] | None
    """How an explanation counts a change (one, many); None for ``score_gap``, told level by level."""
    flag: str | None
    """The board flag (:data:`FLAGS`) it raises when non-zero, if any."""


CRITERIA: tuple[Criterion, ...] = (
    # H1 relaxed: the pair has met max_meetings times already.
    Criterion("rematch", "H1", True, False, ("rematch", "rematches"), "rematch"),
    # H3 relaxed: players ending with |SD| > 2 or a third same side in a row.
    Criterion("side_rule", "H3", True, False, ("side rule relaxed", "side rules relaxed"), "side"),
    # H2 relaxed: a pairing bye for a player who already scored without playing.
    Criterion("repeat_bye", "H2", True, True, ("repeated bye", "repeated byes"), None),
    # S2: score difference of the pair, in scoring units.
    Criterion("score_gap", "S2", False, False, None, "gap"),
    # S3: players ranked below the one given the pairing bye.
    Criterion("bye_rank", "S3", False, True, ("place higher for the bye", "places higher for the bye"), None),
    # S4: absolute, strong, mild side preferences missed.
    Criterion("pref_absolute", "S4", False, False,
              ("absolute side preference missed", "absolute side preferences missed"), "pref"),
    Criterion("pref_strong", "S4", False, False, ("side preference missed", "side preferences missed"), "pref"),
    Criterion("pref_mild", "S4", False, False,
              ("mild side preference missed", "mild side preferences missed"), None),
    # S5: players floating in the same direction as last round, then as two rounds before.
    Criterion("float_repeat", "S5", False, False, ("repeated float", "repeated floats"), "float"),
    Criterion("float_repeat_2", "S5", False, False,
              ("float repeated from two rounds before", "floats repeated from two rounds before"), None),
    # S6: distance from the top-half/bottom-half ideal.
    Criterion("rank_order", "S6", False, False, ("step from rank order", "steps from rank order"), None),
)
"""The criteria in strict priority order (highest first)."""


@dataclass(frozen=True, slots=True)
class Flag:
    word: str
    meaning: str


FLAGS: tuple[Flag, ...] = (
    Flag("rematch", "the two have met before"),
    Flag("side", "a side rule could not be kept"),
    Flag("gap", "score difference of the pair"),
    Flag("float", "floats in the same direction as last round"),
    Flag("pref", "a side preference was missed"),
    Flag("pinned", "kept as the organiser pinned it"),
    Flag("changed", "the organiser overrode the engine here"),
)
"""Board flags in the order a board lists them, with what each means (the words of docs/naming.md). The first five
are raised by the criteria naming them; ``pinned`` and ``changed`` record the organiser's own decisions."""


class Layout:
    """Positions in a cost tuple for one priority order of the criteria.

    Raises ``ValueError`` on an order the engine cannot weigh: keys repeated or
    missing, a hard criterion after a soft one (a hard rule outranks every soft
    one: docs/engine.md), no ``score_gap``, or a flag word not in :data:`FLAGS`.
    """

    def __init__(self, criteria: Sequence[Criterion]) -> None:
        keys = tuple(c.key for c in criteria)
        if len(set(keys)) != len(keys) or "score_gap" not in keys:
            raise ValueError(f"the criteria must be distinct and include score_gap: {keys}")
        hard = sum(c.hard for c in criteria)
        if any(not c.hard for c in criteria[:hard]):
            raise ValueError("every hard-rule criterion must come before every soft one")
        words = {f.word for f in FLAGS}
        if any(c.flag is not None and c.flag not in words for c in criteria):
            raise ValueError("a criterion raises a flag that FLAGS does not name")
        self.criteria = tuple(criteria)
        self.keys = keys
        self.width = len(keys)
        self.hard = hard
        """The hard-rule relaxations are positions ``0 .. hard - 1``."""
        self._column = {k: i for i, k in enumerate(keys)}
        self.gap = self._column["score_gap"]
        """Position of ``score_gap`` (expanded into one component per gap level by the weights)."""
        self.bye_only = tuple(i for i, c in enumerate(criteria) if c.bye_only)
        self.flags = tuple((f.word, tuple(i for i, c in enumerate(criteria) if c.flag == f.word))
                           for f in FLAGS)
        """Each flag word with the positions that raise it (none for the organiser's flags)."""

    def column(self, key: str) -> int:
        """Position of criterion ``key`` in a cost tuple."""
        return self._column[key]


LAYOUT = Layout(CRITERIA)
"""The layout every reader of a cost tuple uses."""

FLAG_MEANINGS: dict[str, str] = {f.word: f.meaning for f in FLAGS}
"""What each board flag means, for the desk's Why panel and publish check."""
