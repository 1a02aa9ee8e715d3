"""Roster import: header names in any case, BOM, semicolons, ids; all bad rows reported at once."""

from __future__ import annotations

import pytest

from pairings import events as ev
from pairings.errors import InputError, RosterError
from pairings.fold import fold
from pairings.roster import decode, import_roster


def _empty():  # type: ignore[no-untyped-def]
    return fold([(1, ev.EventCreated(name="Club night", rounds=5))])


def test_semicolons_bom_and_any_case() -> None:
    text = decode("\ufeffNAME;Rating;club;Id\nZoë Ødegård;1820;Fjord Club;z1\nŁucja Nowak;;;\n".encode("utf-8"))
    regs = import_roster(_empty(), text)
    assert [(r.id, r.name, r.rating, r.club) for r in regs] == [  # type: ignore[union-attr]
        ("z1", "Zoë Ødegård", 1820, "Fjord Club"),
        ("p1", "Łucja Nowak", None, None),
    ]


def test_generated_ids_skip_ids_given_in_the_file() -> None:
    regs = import_roster(_empty(), "name,id\nAda,\nBo,p1\n")
    assert [r.id for r in regs] == ["p2", "p1"]  # type: ignore[union-attr]


def test_all_bad_rows_are_listed() -> None:
    with pytest.raises(RosterError) as info:
        import_roster(_empty(), "name,rating,id\n,1500,\nBo,x,\nCy,1500,a\nDi,1400,a\nEd,99999,\n")
    assert info.value.problems == [
        "line 2: name is missing",
        "line 3: rating 'x' is not a number",
        "line 5: id 'a' repeats line 4",
        "line 6: rating 99999 is outside 0-4000",
    ]


@pytest.mark.parametrize(
    ("text", "says"),
    [("", "empty"), ("rating,club\n1500,X\n", "no 'name' column"), ("name\n", "no players"), ("name\nA\x00\n", "NUL")],
)
def test_unusable_files(text: str, says: str) -> None:
    with pytest.raises(InputError, match=says):
        import_roster(_empty(), text)


def test_not_utf8() -> None:
    with pytest.raises(InputError, match="not UTF-8"):
        decode("name\nZo\xeb\n".encode("latin-1"))
