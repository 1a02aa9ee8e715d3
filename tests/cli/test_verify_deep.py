"""``pairings verify`` proves engine rounds by their dual certificate; ``--deep`` re-solves them too."""

from __future__ import annotations

from pathlib import Path

from pairings.engine import verify as engine_verify
from tests.cli.conftest import play_round, six_players


def test_verify_names_the_certificate_and_deep_adds_the_reference(tmp_path: Path, cli, monkeypatch) -> None:  # type: ignore[no-untyped-def]
    event = six_players(cli, tmp_path / "six.pairings")
    play_round(cli, event, "1-0", "0-1", "1/2-1/2")
    play_round(cli, event, "0-1", "1-0", "1-0")
    monkeypatch.setattr(engine_verify, "DEEP_BELOW", 0)  # as a large field: the certificate alone
    ran = cli("verify", event)
    assert ran.code == 0, ran
    assert "complementary slackness holds on every board: optimal" in ran.out
    assert "reference solver" not in ran.out
    deep = cli("verify", event, "--deep")
    assert deep.code == 0, deep
    assert "dual certificate" in deep.out and "reference solver (networkx, full graph) confirms" in deep.out
