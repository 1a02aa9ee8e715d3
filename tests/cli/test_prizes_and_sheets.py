"""Categories, prizes and the posted sheets from the command line, as the README shows them."""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from pairings.reports.paper import default_paper
from tests.cli.conftest import file_bytes


@pytest.fixture
def event(tmp_path: Path, cli) -> Path:  # type: ignore[no-untyped-def]
    path = tmp_path / "club.pairings"
    assert cli("new", path, "--name", "Thursday Rapid", "--rounds", "3", "--seed", "1").code == 0
    for name, rating in (("Ada Quince", 1800), ("Bo Rill", 1700), ("Cy Marsh", 1650), ("Dee Marsh", 1500)):
        assert cli("player", "add", path, "--name", name, "--rating", str(rating)).code == 0
    return path


def refused(cli, path: Path, *args: object, says: str) -> None:  # type: ignore[no-untyped-def]
    before = file_bytes(path)
    ran = cli(*args)
    assert ran.code == 2, ran
    lines = ran.err.strip().splitlines()
    assert len(lines) == 1 and says in lines[0], ran.err
    assert file_bytes(path) == before


def play_round(cli, path: Path) -> None:  # type: ignore[no-untyped-def]
    assert cli("pair", path).code == 0 and cli("publish", path).code == 0
    assert cli("result", path, "1", "1-0").code == 0 and cli("result", path, "2", "1/2-1/2").code == 0


def test_start_list_before_round_one(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    ran = cli("print", event, "start-list")
    assert ran.code == 0 and "Starting rank list — Before round 1" in ran.out
    lines = [line.split() for line in ran.out.splitlines() if line.strip()[:1].isdigit() and "Marsh" in line]
    assert [(row[0], row[-1]) for row in lines] == [("3", "1650"), ("4", "1500")]   # by rating


def test_categories_prizes_and_the_prize_list(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    assert cli("category", "add", event, "Under 1700", "--rating-below", "1700").code == 0
    assert cli("category", "add", event, "Marsh family", "--by-hand").code == 0
    assert cli("category", "include", event, "marsh family", "Cy").out == "Cy Marsh put in Marsh family by hand\n"
    listed = cli("category", "list", event, "--members").out
    assert "Under 1700: rated below 1700; 2 players" in listed and "Marsh family: members given by hand; 1 player\n" in listed
    assert cli("category", "add", event, "under 1700", "--unrated").out == "category under 1700 redefined\n"
    log = cli("log", event).out
    assert "Cy Marsh (p3) put in category 'Marsh family' by hand" in log, log
    assert "category 'Under 1700' defined: unrated\n" in log, log
    assert cli("category", "add", event, "Under 1700", "--rating-below", "1700").code == 0
    assert cli("prize", "rules", event, "--currency", "EUR").code == 0
    for args in (("overall", "1", "100"), ("overall", "2", "60"), ("Under 1700", "1", "25.50")):
        assert cli("prize", "add", event, *args).code == 0
    play_round(cli, event)
    out = json.loads(cli("prizes", event, "--format", "json").out)
    won = {(t["caption"].split(" (")[0], r["place"], r["amount_minor"]) for t in out["tables"] for r in t["rows"]}
    assert won == {("Overall", "1", 10000), ("Overall", "2", 6000), ("Under 1700", "1", 2550)}
    text = cli("prizes", event).out
    assert "25.50 EUR" in text and "One prize per player" in text
    cat = cli("standings", event, "--category", "under 1700").out
    assert "Standings — Under 1700" in cat and "Ada" not in cat
    assert cli("prize", "remove", event, "overall", "2").code == 0
    assert "60.00" not in cli("prizes", event).out


def test_refusals_leave_the_file_alone(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    refused(cli, event, "category", "add", event, "U18", "--under", "18", says="needs the date")
    refused(cli, event, "category", "add", event, "Kids", "--by-hand", "--sex", "f", says="--by-hand takes no rule")
    refused(cli, event, "category", "include", event, "Nope", "Ada", says="no category 'Nope'")
    refused(cli, event, "prize", "add", event, "overall", "1", "12.345", says="at most 2 decimals")
    refused(cli, event, "prize", "add", event, "Seniors", "1", "10", says="no category 'Seniors'")
    refused(cli, event, "prize", "remove", event, "overall", "3", says="no prize for place 3")
    refused(cli, event, "prize", "rules", event, says="nothing to change")
    refused(cli, event, "prizes", event, says="no prizes defined yet")
    refused(cli, event, "print", event, "grid", says="the grid is for round-robin events")
    refused(cli, event, "standings", event, "--tiebreaks", "BH,XX", says="unknown tiebreak 'XX'")


def test_tiebreaks_for_one_printout_and_the_acronym_headings(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    play_round(cli, event)
    default = cli("standings", event).out
    assert "BH-C1" in default and "BPG = Number of games played with Black" in default   # new-event defaults
    rows = json.loads(cli("standings", event, "--tiebreaks", "sb,ks,bh-m1", "--format", "json").out)
    assert list(rows[0]["tiebreaks"]) == ["sonneborn_berger", "koya", "median_buchholz"]


def test_round_robin_grid(tmp_path: Path, cli) -> None:  # type: ignore[no-untyped-def]
    path = tmp_path / "rr.pairings"
    assert cli("new", path, "--name", "Club RR", "--rounds", "3", "--round-robin", "--seed", "2").code == 0
    for name, rating in (("Ada Quince", 1800), ("Bo Rill", 1700), ("Cy Marsh", 1650), ("Dee Marsh", 1500)):
        assert cli("player", "add", path, "--name", name, "--rating", str(rating)).code == 0
    play_round(cli, path)
    grid = json.loads(cli("print", path, "grid", "--format", "json").out)["tables"][0]["rows"]
    # Berger round 1 for 4 seats (C.05): 1-4, 2-3. Board 1 won by its first side, board 2 drawn.
    cells = {r["no"]: (r["v1"], r["v2"], r["v3"], r["v4"]) for r in grid}
    assert all(cells[n][n - 1] == "×" for n in cells)
    results = {(a, b): cells[a][b - 1] for a in cells for b in cells if cells[a][b - 1] not in ("", "×")}
    assert sorted(results.values()) == ["0", "1", "½", "½"] and len(results) == 4
    assert {frozenset(k) for k in results} == {frozenset((1, 4)), frozenset((2, 3))}


@pytest.mark.parametrize(("env", "paper"), [
    ({"LANG": "en_US.UTF-8"}, "letter"), ({"LANG": "fr_CA.UTF-8"}, "letter"), ({"LANG": "en_GB.UTF-8"}, "a4"),
    ({"LC_PAPER": "en_US.UTF-8", "LANG": "de_DE.UTF-8"}, "letter"), ({"LC_ALL": "de_DE", "LC_PAPER": "en_US"}, "a4"),
    ({}, "a4"), ({"LANG": "C.UTF-8"}, "a4"),
])
def test_paper_from_the_locale(env: dict[str, str], paper: str) -> None:
    assert default_paper(env) == paper


def test_letter_and_a4_pdf(event: Path, cli, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    from pypdf import PdfReader

    sizes = {}
    for paper in ("a4", "letter"):
        out = tmp_path / f"{paper}.pdf"
        assert cli("print", event, "start-list", "--format", "pdf", "--paper", paper, "-o", out).code == 0
        box = PdfReader(out).pages[0].mediabox
        sizes[paper] = (round(float(box.width)), round(float(box.height)))
    # pypdf reads the page size back: A4 is 595 × 842 points, Letter 612 × 792.
    assert sizes == {"a4": (595, 842), "letter": (612, 792)}
    html = cli("print", event, "start-list", "--format", "html", "--paper", "letter").out
    assert "@page { size: letter; }" in html
