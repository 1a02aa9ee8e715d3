"""Injection: hostile player and event names in every sheet and format, the terminal and the desk.

HTML must escape them (same element structure as with harmless names), CSV
must neutralise formula starters, text must carry no control or escape
character, JSON must keep them exactly, PDF must show them as extractable text,
and no layout may break (same rows and columns as the harmless twin event).
"""

from __future__ import annotations

import csv
import io
import json
import re
from datetime import datetime, timezone
from html.parser import HTMLParser
from typing import Any, Callable

import pytest

from .injection_names import EVENT_NAME, HOSTILE, VISIBLE, harmless_state, hostile_state

reports = pytest.importorskip("pairings.reports")
if not hasattr(reports, "render"):
    pytest.skip("pairings.reports.render is not written yet", allow_module_level=True)
render: Callable[..., str | bytes] = reports.render

KINDS = ("pairings", "names", "slips", "standings", "crosstable")
NOW = datetime(2025, 3, 1, 18, 0, tzinfo=timezone.utc)
# Everything a terminal acts on: C0 controls (but the newline), DEL, C1 controls, bidi overrides and isolates.
UNSAFE_ON_TERMINAL = re.compile("[\x00-\x09\x0b-\x1f\x7f-\x9f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]")
FORMULA_START = ("=", "+", "-", "@", "\t", "\r")  # OWASP note on CSV injection
NUMBER = re.compile(r"[-+]?\d+(?:[.,]\d+)?")


@pytest.fixture(scope="module")
def hostile() -> Any:
    return hostile_state()


@pytest.fixture(scope="module")
def harmless() -> Any:
    return harmless_state()


class _Tags(HTMLParser):
    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.tags: list[str] = []
        self.attrs: list[tuple[str, str | None]] = []
        self.text: list[str] = []

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        self.tags.append(tag)
        self.attrs.extend(attrs)

    def handle_endtag(self, tag: str) -> None:
        self.tags.append("/" + tag)

    def handle_data(self, data: str) -> None:
        self.text.append(data)


def _parse_html(page: str) -> _Tags:
    parser = _Tags()
    parser.feed(page)
    parser.close()
    return parser


@pytest.mark.parametrize("kind", KINDS)
def test_html_escapes_and_keeps_its_structure(kind: str, hostile: Any, harmless: Any) -> None:
    page, twin = (_parse_html(str(render(s, kind, "html", None, NOW))) for s in (hostile, harmless))
    assert page.tags == twin.tags, "a name added or removed an element"
    assert not any(name.startswith("on") for name, _ in page.attrs), "an event-handler attribute got in"
    text = "".join(page.text)
    assert "<script>alert(1)</script>" in text and '"><img src=x onerror=alert(2)>' in text  # shown, as text


@pytest.mark.parametrize("kind", KINDS)
def test_csv_neutralises_formulas_and_keeps_its_shape(kind: str, hostile: Any, harmless: Any) -> None:
    rows, twin = (list(csv.reader(io.StringIO(str(render(s, kind, "csv", None, NOW))))) for s in (hostile, harmless))
    assert [len(r) for r in rows] == [len(r) for r in twin], "a name broke the rows or columns"
    for row in rows:
        for value in row:
            assert not (value.startswith(FORMULA_START) and not NUMBER.fullmatch(value)), value
    flat = "\n".join(",".join(r) for r in rows)
    for fragment in ("HYPERLINK", "SUM(1,2)", "IMPORT(evil)", "alert(1)"):
        assert fragment in flat


@pytest.mark.parametrize("kind", KINDS)
def test_text_strips_control_and_escape_sequences(kind: str, hostile: Any, harmless: Any) -> None:
    out, twin = (str(render(s, kind, "text", None, NOW)) for s in (hostile, harmless))
    bad = UNSAFE_ON_TERMINAL.findall(out)
    assert not bad, f"{sorted(set(bad))!r} reach the terminal"
    assert "title-hijack" not in out  # the whole OSC sequence went, not just its escape byte
    assert out.count("\n") == twin.count("\n"), "a name changed the number of lines"
    for fragment in ("alert(1)", "Tess Mara", "Kiri", "Nurit"):
        assert fragment in out


def _strings(data: Any) -> set[str]:
    if isinstance(data, str):
        return {data}
    if isinstance(data, dict):
        return set().union(*(_strings(v) for v in data.values())) if data else set()
    if isinstance(data, list):
        return set().union(*(_strings(v) for v in data)) if data else set()
    return set()


@pytest.mark.parametrize("kind", KINDS)
def test_json_keeps_names_exactly(kind: str, hostile: Any) -> None:
    found = _strings(json.loads(str(render(hostile, kind, "json", None, NOW))))
    shown = {n for n in HOSTILE if n in found}
    if kind in ("names", "standings", "crosstable"):  # sheets listing every player
        assert shown == set(HOSTILE)
    else:
        assert shown, "no hostile name kept as it is"


@pytest.mark.parametrize("kind", KINDS)
def test_pdf_renders_names_as_text(kind: str, hostile: Any, harmless: Any) -> None:
    pypdf = pytest.importorskip("pypdf")
    data, twin = (render(s, kind, "pdf", None, NOW) for s in (hostile, harmless))
    assert isinstance(data, bytes) and data.startswith(b"%PDF")
    doc, base = (pypdf.PdfReader(io.BytesIO(d)) for d in (data, twin) if isinstance(d, bytes))
    assert len(doc.pages) == len(base.pages), "a name pushed the sheet onto more pages"
    text = " ".join(" ".join((p.extract_text() or "").split()) for p in doc.pages)
    wanted = [f for f in VISIBLE if f != "Long ooo"] if kind in ("names", "standings", "crosstable") else ["alert"]
    for fragment in wanted:
        assert fragment in text, fragment
    assert "\x1b" not in text


def test_event_name_is_cleaned_in_headings(hostile: Any) -> None:
    out = str(render(hostile, "standings", "text", None, NOW))
    assert UNSAFE_ON_TERMINAL.search(out.split("\n", 1)[0]) is None
    assert "<b>Open</b>" in out  # text output shows markup as it is: nothing interprets it
    page = str(render(hostile, "standings", "html", None, NOW))
    assert "<b>Open</b>" not in page and EVENT_NAME not in page
