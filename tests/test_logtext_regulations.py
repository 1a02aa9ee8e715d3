"""The log's lines for a settings change and for player details: readable words, not field dumps."""

from __future__ import annotations

from pairings import events as ev
from pairings.logtext import describe
from pairings.state import System, Unplayed


def test_a_settings_change_reads_in_the_settings_words() -> None:
    line = describe(ev.SettingsChanged(
        system=System.ROUND_ROBIN, double_round=True, tiebreaks=("buchholz", "wins"),
        scoring=ev.ScoringModel(win=3, draw=1, loss=0), final_round_side_exception=True,
        unplayed=Unplayed.AS_THEY_STAND, cleared=("requested_bye_limit",), after_round=2,
    ))
    assert line == (
        "settings changed after round 2: tiebreaks buchholz,wins; unplayed games in tiebreaks as-they-stand; "
        "scoring 3/1/0; system double-round-robin; final-round side exception yes; requested byes per player none"
    )
    assert describe(ev.SettingsChanged(name="Spring Open")) == "settings changed: name Spring Open"


def test_player_lines_name_title_federation_and_ratings() -> None:
    d = ev.PlayerDetailsModel(title="FM", federation="ENG", ratings={"fide": 2010, "national": 1990})
    assert describe(ev.PlayerRegistered(id="p1", name="Ada Quince", rating=2000, details=d)) == (
        "Ada Quince (p1) registered: rating 2000, FM, ENG, fide 2010, national 1990")
    assert describe(ev.PlayerEdited(id="p1", name="Ada Quince", rating=2000, details=d)).endswith(
        "club -, FM, ENG, fide 2010, national 1990")
