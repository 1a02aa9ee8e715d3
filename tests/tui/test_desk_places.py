"""The places' smaller promises: the Roster filter, the Log's newest entry, names in the swap dialog."""

from __future__ import annotations

import asyncio
from pathlib import Path

from textual.widgets import Input, Label
from textual.widgets._toast import Toast

from pairings import actions
from pairings.printouts import KINDS
from pairings.state import ByeKind, PlayerId
from pairings.store import EventStore
from pairings.tui.app import DeskApp
from pairings.tui.base import KeyLine
from pairings.tui.dialogs import Choice, ConfirmDialog, FormDialog, ReadDialog
from pairings.tui.grid import Grid
from tests.tui.desk_support import Notes, burst, press_keys, settle, type_text

# Invented names and clubs.
ROSTER = [("Zoë Quillfeather", "Tarnside"), ("Anders Ångström", "Nordvik"), ("Brisa Bray", "Old Mill"),
          ("Corvin Cole", "Tarnside")]


def roster_event(path: Path) -> EventStore:
    store = EventStore.create(path, actions.new_event("Test Open", 3, seed=7))
    for name, club in ROSTER:
        store.append(actions.add_player(store.state, name, None, club))
    return store


def test_roster_filter_ignores_accents_and_matches_ids_and_clubs(tmp_path: Path) -> None:
    store = roster_event(tmp_path / "e.pairings")

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="roster")
        async with app.run_test(size=(80, 24)) as pilot:
            grid = app.screen.query_one("#players", Grid)

            async def shown(text: str) -> list[str]:
                await pilot.press("slash", "ctrl+a", "ctrl+k")
                await type_text(pilot, text)
                await settle(app, pilot)
                return [grid.cell(grid._keys[i], "name") for i in range(grid.row_count)]

            assert await shown("Zoe") == ["Zoë Quillfeather"]
            assert await shown("angstrom") == ["Anders Ångström"]
            assert await shown("tarnside") == ["Zoë Quillfeather", "Corvin Cole"]
            assert await shown("p3") == ["Brisa Bray"]
            assert await shown("OLD MILL") == ["Brisa Bray"]

    asyncio.run(run())


def test_log_opens_at_the_newest_entry_in_names_and_reads_whole(tmp_path: Path) -> None:
    store = roster_event(tmp_path / "e.pairings")
    for i in range(40):
        store.append(actions.add_player(store.state, f"Filler Player {i}", None, None))
    zoe = PlayerId("p1")
    store.append(actions.announce_bye(store.state, zoe, ByeKind.REQUESTED))
    reason = "travelling to the regional youth final with the whole junior squad, back on Sunday"
    store.append(actions.withdraw(store.state, PlayerId("p2"), None, reason))

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="round")
        async with app.run_test(size=(80, 24)) as pilot:
            await pilot.press("f6")
            await settle(app, pilot)
            grid = app.screen.query_one("#events", Grid)
            count = len(store.log)
            assert grid.cursor_key == str(count)
            # The newest row is on screen: nothing hides it (a horizontal scrollbar did), it is not scrolled off.
            assert grid.scrollbar_size_horizontal == 0
            top = int(grid.scroll_offset.y)
            assert top <= count - 1 < top + grid.size.height - 1
            assert grid.cell(str(count - 1), "what") == "Zoë Quillfeather (p1) asked for a bye in round 1"
            assert grid.render_line(count - top).text.rstrip().endswith("…")  # cut at 80 columns ...
            await pilot.press("enter")  # ... and read whole
            assert isinstance(app.screen, ReadDialog)
            text = str(app.screen.query_one("#read-text", Label).content)
            assert text == f"Anders Ångström (p2) withdrawn from round 1 on ({reason})"
            await pilot.press("escape")
            assert not isinstance(app.screen, ReadDialog)

    asyncio.run(run())


def test_swap_dialog_starts_with_the_players_name(tmp_path: Path) -> None:
    store = roster_event(tmp_path / "e.pairings")

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="round")
        async with app.run_test(size=(80, 24)) as pilot:
            await pilot.press("n")
            await settle(app, pilot)
            rnd = app.state.last_round
            assert rnd is not None
            await pilot.press("s")
            assert isinstance(app.screen, FormDialog)
            assert app.screen.values()["p0"] == app.state.players[rnd.games[0].first].name

    asyncio.run(run())


def test_flagged_count_is_the_same_in_the_header_and_the_publish_check(tmp_path: Path) -> None:
    store = roster_event(tmp_path / "e.pairings")

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="round")
        async with app.run_test(size=(80, 24)) as pilot:
            await pilot.press("n")
            await settle(app, pilot)
            await pilot.press("k")  # pin board 1: "pinned" is the organiser's own flag, not one still open
            await settle(app, pilot)
            await type_text(pilot, "arbiter")
            await pilot.press("enter")
            await settle(app, pilot)
            rnd = app.state.last_round
            assert rnd is not None and any("pinned" in g.flags for g in rnd.games)
            header = str(app.screen.query_one("#topline-state", Label).content)
            await pilot.press("p")
            assert isinstance(app.screen, ConfirmDialog)
            facts = str(app.screen.query_one("#facts", Label).content)
            listed = int(facts.split("Flags still open: ")[1].split()[0]) if "still open" in facts else 0
            assert f"{listed} flagged" in header, (header, facts)

    asyncio.run(run())


def test_print_dialog_offers_choices_and_the_file_name_follows_the_format(tmp_path: Path) -> None:
    store = roster_event(tmp_path / "e.pairings")

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="round")
        async with app.run_test(size=(80, 24)) as pilot:
            await pilot.press("n")
            await settle(app, pilot)
            await pilot.press("p", "y", "f7")
            await pilot.pause()
            dialog = app.screen
            assert isinstance(dialog, FormDialog)
            kind, fmt = dialog.query_one("#field-0", Choice), dialog.query_one("#field-1", Choice)
            assert kind.choices == KINDS and kind.choices[:2] == ("pairings", "names")
            file = dialog.query_one("#field-3", Input)
            assert file.placeholder.endswith("e-pairings-round1.txt")
            notes = Notes(app)
            await pilot.press("right", "right", "right", "left", "left", "enter")  # names
            await press_keys(pilot, "pd")  # pdf: the choice follows the letters typed
            await pilot.pause()
            assert (kind.value, fmt.value) == ("names", "pdf")
            assert file.placeholder.endswith("e-names-round1.pdf"), file.placeholder
            await pilot.press("left")  # html
            await pilot.pause()
            assert file.placeholder.endswith("e-names-round1.html")
            burst(app, "enter", "enter", "enter")  # the latest round, the file shown
            await settle(app, pilot)
            assert app.last_output == tmp_path / "e-names-round1.html", notes.messages
            assert app.last_output.read_text(encoding="utf-8").lstrip().startswith("<")

    asyncio.run(run())


def test_notices_during_result_entry_take_one_line_replaced_not_stacked(tmp_path: Path) -> None:
    store = roster_event(tmp_path / "e.pairings")

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="round")
        async with app.run_test(size=(80, 24)) as pilot:
            await pilot.press("n")
            await settle(app, pilot)
            await pilot.press("p", "y", "f4")
            burst(app, "1", "f", "2", "d", "9", "f")
            await settle(app, pilot)
            assert not app.screen.query(Toast)  # nothing drawn over the boards or the header
            line = app.screen.query_one(KeyLine)
            assert line.notice == "problem: round 1 has no board 9 (boards 1-2)"
            assert line.region.y == 23  # the bottom line, below the data

    asyncio.run(run())


LONG_NAMES = ["Perpetua Pennywhistle", "Kasimir Kestrelmoor", "Odalys Orchardleigh", "Bettany Cobbledick",
              "Nicanor Nimblewood", "Rosalind Rookwood"]  # invented


def test_80_by_24_names_take_the_free_width_and_the_why_panel_is_one_key_away(tmp_path: Path) -> None:
    store = EventStore.create(tmp_path / "e.pairings", actions.new_event("Test Open", 3, seed=7))
    for i, player in enumerate(LONG_NAMES):
        store.append(actions.add_player(store.state, player, 2000 - 10 * i, None))

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="round")
        async with app.run_test(size=(80, 24)) as pilot:
            await pilot.press("n")
            await settle(app, pilot)
            grid = app.screen.query_one("#boards", Grid)
            widest = max(len(n) for n in LONG_NAMES)

            def name_widths() -> list[int]:
                return [w for c, w in zip(grid.columns, grid._widths) if c.key in ("first", "second")]

            assert min(name_widths()) >= widest - 2, name_widths()  # the longest names of each side, about
            rnd = app.state.last_round
            assert rnd is not None
            await pilot.press("s", "ctrl+a", "ctrl+k")
            await type_text(pilot, rnd.games[0].first)
            await pilot.press("enter")
            await type_text(pilot, rnd.games[1].second)
            await pilot.press("enter")
            await settle(app, pilot)
            await type_text(pilot, "club mates")
            await pilot.press("enter")
            await settle(app, pilot)
            assert app.state.last_round is not None and app.state.last_round.source == "override"
            assert any("changed" in g.flags for g in app.state.last_round.games)
            assert min(name_widths()) >= widest - 2, name_widths()  # a swap's flags do not squeeze the names

            # The Why panel: closed at 80 columns, one key opens it with the focus, the same key goes back.
            why = app.screen.query_one("#why")
            assert not why.display
            await pilot.press("w")
            assert why.display and why.has_focus and why.region.width > 60
            assert why.styles.border_top[0] != ""  # framed while it has the focus
            await pilot.press("w")
            assert not why.display and grid.has_focus

            await pilot.press("p", "y", "f4")
            await settle(app, pilot)
            games = app.screen.query_one("#games", Grid)
            result = [w for c, w in zip(games.columns, games._widths) if c.key in ("first", "second")]
            assert min(result) >= widest - 2, result
            state = app.screen.query_one("#topline-state", Label)
            assert state.region.width >= len(str(state.content)), str(state.content)

    asyncio.run(run())


def test_results_key_line_shows_every_result_key_at_80_and_120_columns(tmp_path: Path) -> None:
    """The arbiter's results (z, h, j) had no short words, so the line dropped h and j even at 120 columns."""
    from pairings.tui.base import KeyList

    store = roster_event(tmp_path / "e.pairings")

    async def run(size: tuple[int, int]) -> None:
        app = DeskApp(store, poll_seconds=3600, start="results")
        async with app.run_test(size=size) as pilot:
            await settle(app, pilot)
            keys = str(app.screen.query_one(KeyLine).query_one(".keys", KeyList).render())
            for entry in (" f 1-0", " d ½-½", " x --", " z 0-0", " h ½-0", " j 0-½", " f1 Help"):
                assert entry in keys, (size, keys)

    for size in ((80, 24), (120, 40)):
        asyncio.run(run(size))


def test_print_dialog_shows_every_kind_at_80_columns(tmp_path: Path) -> None:
    """The kinds were one line, so "prizes" fell off the dialog's edge at 80 columns, even when chosen."""
    store = roster_event(tmp_path / "e.pairings")

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="round")
        async with app.run_test(size=(80, 24)) as pilot:
            await pilot.press("f7")
            await pilot.pause()
            kind = app.screen.query_one("#field-0", Choice)
            shown = " ".join(f" {k} " for k in KINDS)
            assert kind.region.height * kind.region.width >= len(shown) and kind.region.height >= 2, kind.region

    asyncio.run(run())


def test_a_long_dialog_intro_wraps_at_80_columns(tmp_path: Path) -> None:
    """The swap dialog's "Against the optimum: +1 rematch, +1 floater, +1 side preference missed, ..." was cut."""
    from pairings.tui.dialogs import Field, open_dialog

    store = roster_event(tmp_path / "e.pairings")
    cost = ("Against the optimum: +1 rematch, +1 floater, +1 side preference missed, +3 steps from rank order, "
            "+2 score gap")

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="round")
        async with app.run_test(size=(80, 24)) as pilot:
            open_dialog(app, FormDialog("Override", [Field("reason", "Reason")], intro=["swap A and B", cost]))
            await pilot.pause()
            intro = app.screen.query_one("#intro-1", Label)
            assert intro.region.height >= 2 and intro.region.height * intro.region.width >= len(cost), intro.region

    asyncio.run(run())
