"""Player details (title, federation, ids, birth, sex, ratings per list, category labels): read and check.

The command line, the desk's player form, the roster import and the
interchange document all read details through :func:`read_details`, so one
field has one rule and one error message. An empty text clears a field.
"""

from __future__ import annotations

import re
from dataclasses import replace
from datetime import date
from typing import Mapping

from pairings import events as ev
from pairings.errors import InputError
from pairings.state import TITLES, PlayerDetails
SEXES = {"m": "m", "f": "f", "male": "m", "female": "f", "w": "f"}
DETAIL_KEYS = ("title", "federation", "fide_id", "national_id", "birth", "sex", "ratings", "categories")
_LIST_NAME = re.compile(r"[a-z][a-z0-9_-]{0,19}")


class DetailsError(InputError):
    """A player detail that cannot be read."""


def _title(text: str) -> str:
    word = text.strip().upper()
    if word not in TITLES:
        raise DetailsError(f"title {text!r}: use one of {', '.join(TITLES)} (or leave it empty)")
    return word


def _federation(text: str) -> str:
    code = text.strip().upper()
    if not re.fullmatch(r"[A-Z]{3}", code):
        raise DetailsError(f"federation {text!r} must be a three-letter code such as ENG or FRA")
    return code


def _fide_id(text: str) -> str:
    digits = text.strip()
    if not re.fullmatch(r"[0-9]{1,12}", digits):
        raise DetailsError(f"FIDE ID {text!r} must be digits only (up to 12)")
    return digits


def _national_id(text: str) -> str:
    from pairings.actions import clean_text

    return clean_text(text, "national ID", limit=40)


def _birth(text: str) -> str:
    value = text.strip()
    try:
        if re.fullmatch(r"[0-9]{4}", value):
            year = int(value)
        elif re.fullmatch(r"[0-9]{4}-[0-9]{2}-[0-9]{2}", value):
            year = date.fromisoformat(value).year
        else:
            raise ValueError
    except ValueError:
        raise DetailsError(f"birth {text!r} must be a year (1987) or a date (1987-04-23)") from None
    if not 1900 <= year <= date.today().year:
        raise DetailsError(f"birth {text!r} is not a plausible year of birth")
    return value


def _sex(text: str) -> str:
    word = text.strip().lower()
    if word not in SEXES:
        raise DetailsError(f"sex {text!r}: use m or f (or leave it empty)")
    return SEXES[word]


Ratings = tuple[tuple[str, int], ...]


def read_ratings(items: list[str] | tuple[str, ...], start: Ratings = ()) -> Ratings:
    """``LIST=N`` items over ``start``; ``LIST=`` removes a list's rating."""
    ratings = dict(start)
    for item in items:
        name, sep, value = item.partition("=")
        name = name.strip().lower()
        if not sep or not _LIST_NAME.fullmatch(name):
            raise DetailsError(f"rating {item!r} must be LIST=N, e.g. fide=2010 (a list name of letters and digits)")
        if not value.strip():
            ratings.pop(name, None)
            continue
        number = read_rating(value, f"{name} rating")
        if number is not None:
            ratings[name] = number
    return tuple(sorted(ratings.items()))


def read_rating(text: str, what: str = "rating") -> int | None:
    """A rating from text: empty is unrated, "1600.0" reads as 1600 (spreadsheets write that)."""
    value = text.strip()
    if not value:
        return None
    try:
        number = float(value)
    except ValueError:
        raise DetailsError(f"{what} {text!r} is not a number") from None
    if not number.is_integer():
        raise DetailsError(f"{what} {text!r} is not a whole number")
    if not 0 <= number <= 4000:
        raise DetailsError(f"{what} {int(number)} is outside 0-4000")
    return int(number)


def read_categories(text: str) -> tuple[str, ...]:
    from pairings.actions import clean_text

    out: list[str] = []
    for raw in text.split(","):
        if raw.strip():
            label = clean_text(raw, "category label", limit=40)
            if label not in out:
                out.append(label)
    return tuple(out)


_READERS = {
    "title": _title, "federation": _federation, "fide_id": _fide_id, "national_id": _national_id,
    "birth": _birth, "sex": _sex,
}


def read_details(texts: Mapping[str, str], base: PlayerDetails = PlayerDetails()) -> PlayerDetails:
    """``base`` with the fields given as text (``ratings`` as ``LIST=N,LIST=N``; empty clears a field)."""
    changes: dict[str, object] = {}
    for key, text in texts.items():
        if key == "ratings":
            changes["ratings"] = read_ratings([x for x in text.split(",") if x.strip()])
        elif key == "categories":
            changes["categories"] = read_categories(text)
        elif key in _READERS:
            changes[key] = _READERS[key](text) if text.strip() else None
        else:
            raise KeyError(key)
    return replace(base, **changes)  # type: ignore[arg-type]


def detail_texts(d: PlayerDetails) -> dict[str, str]:
    """Each detail as the text :func:`read_details` reads back."""
    return {
        "title": d.title or "", "federation": d.federation or "", "fide_id": d.fide_id or "",
        "national_id": d.national_id or "", "birth": d.birth or "", "sex": d.sex or "",
        "ratings": ",".join(f"{k}={v}" for k, v in d.ratings), "categories": ",".join(d.categories),
    }


def details_model(d: PlayerDetails) -> ev.PlayerDetailsModel | None:
    """The stored form (None when the player has no details at all)."""
    if d == PlayerDetails():
        return None
    return ev.PlayerDetailsModel(
        title=d.title, federation=d.federation, fide_id=d.fide_id, national_id=d.national_id, birth=d.birth,
        sex=d.sex, ratings=dict(d.ratings), categories=d.categories,  # type: ignore[arg-type]
    )


def check_details(d: PlayerDetails) -> PlayerDetails:
    """Check details that arrive already typed (the interchange document) by the same rules."""
    return read_details(detail_texts(d))
