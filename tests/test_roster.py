"""Roster import: header names in any case, BOM, semicolons, ids; all bad rows reported at once."""

from __future__ import annotations

import pytest

from pairings import events as ev
from pairings.errors import InputError, RosterError
from pairings.fold import fold
from pairings.roster import decode, import_roster, read_roster
from pairings.state import EventState


def _empty() -> EventState:
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


def test_common_header_spellings_tabs_and_details() -> None:
    text = ("Name\tRtg\tFed\tFIDE ID\tBirthday\tGender\tTitle\tFIDE rating\tRating national\tCategory\tClub\n"
            "Orla Penhallow\t1600.0\teng\t4400123\t1990-01-02\tF\twfm\t1650\t1700\tjunior,local\tTor Club\n")
    read = read_roster(_empty(), text)
    assert read.warnings == []
    (reg,) = read.events
    assert isinstance(reg, ev.PlayerRegistered) and reg.details is not None
    assert (reg.name, reg.rating, reg.club) == ("Orla Penhallow", 1600, "Tor Club")
    d = reg.details
    assert (d.title, d.federation, d.fide_id, d.birth, d.sex, d.ratings, d.categories) == (
        "WFM", "ENG", "4400123", "1990-01-02", "f", {"fide": 1650, "national": 1700}, ("junior", "local"))


@pytest.mark.parametrize("header", ["name,elo", "Player Name;Rating", "NAME,RTG", "full_name,rating"])
def test_name_and_rating_spellings(header: str) -> None:
    sep = ";" if ";" in header else ","
    (reg,) = import_roster(_empty(), f"{header}\nAda Quince{sep}1500\n")
    assert (reg.name, reg.rating) == ("Ada Quince", 1500)  # type: ignore[union-attr]


def test_unknown_columns_are_named_not_dropped_silently() -> None:
    read = read_roster(_empty(), "name,rating,Notes,\nAda,1500,brings a clock,\n")
    assert read.warnings == ["column 3 ('Notes') is not read: its values are not imported"]
    assert len(read.events) == 1


def test_rows_with_the_wrong_number_of_cells_are_refused_with_line_numbers() -> None:
    with pytest.raises(RosterError) as info:
        import_roster(_empty(), "name,rating\nA,1,2,3,4\nBo,1500\nCy\n")
    assert info.value.problems == ["line 2: 5 cells where the header has 2", "line 4: 1 cell where the header has 2"]


def test_an_unterminated_quote_is_refused() -> None:
    with pytest.raises(RosterError) as info:
        import_roster(_empty(), 'name,rating\nBo,1500\n"unterminated,5\nCy,1400\n')
    assert info.value.problems == ["line 3: a quote is opened and never closed"]
    with pytest.raises(RosterError, match="line 2: a quoted cell runs over 2 lines"):
        import_roster(_empty(), 'name,rating\n"Bo\nRill",1500\n')


@pytest.mark.parametrize(("cell", "says"), [("1600.5", "not a whole number"), ("16OO", "not a number")])
def test_ratings_that_are_not_whole_numbers(cell: str, says: str) -> None:
    with pytest.raises(RosterError, match=f"line 2: rating '{cell}' is {says}"):
        import_roster(_empty(), f"name,rating\nAda,{cell}\n")


def test_bad_details_are_listed_by_line() -> None:
    with pytest.raises(RosterError) as info:
        import_roster(_empty(), "name,fed,sex\nAda,ENG,f\nBo,England,m\nCy,FRA,q\n")
    assert [p.split(":")[0] for p in info.value.problems] == ["line 3", "line 4"]


def test_an_unterminated_quote_does_not_hide_the_bad_rows_before_it() -> None:
    """Every bad row is listed (docs/guide.md): a short row above the open quote was not."""
    with pytest.raises(RosterError) as info:
        import_roster(_empty(), 'name,rating\nA,1,2,3,4\nBo,1500\n"unterminated,5\n')
    assert info.value.problems == ["line 2: 5 cells where the header has 2",
                                   "line 4: a quote is opened and never closed"]
    with pytest.raises(RosterError) as info:
        import_roster(_empty(), '"name,rating\nBo,1500\n')
    assert info.value.problems == ["line 1: a quote is opened and never closed"]
