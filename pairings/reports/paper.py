"""The paper a printout is laid out for: A4 or Letter, by default from the locale."""

from __future__ import annotations

import os
from typing import Mapping

LETTER_REGIONS = ("US", "CA")
"""Locales whose paper is Letter (common practice, no source: the US and Canada use it; others A4)."""


def default_paper(environ: Mapping[str, str] | None = None) -> str:
    """``letter`` when the locale's paper setting names the US or Canada, else ``a4``.

    Reads the first set of LC_ALL, LC_PAPER and LANG (the POSIX order of precedence),
    e.g. ``en_US.UTF-8`` → letter, ``fr_CA`` → letter, ``en_GB.UTF-8`` → a4, unset → a4.
    """
    env = os.environ if environ is None else environ
    value = next((env[k] for k in ("LC_ALL", "LC_PAPER", "LANG") if env.get(k)), "")
    region = value.split(".", 1)[0].split("@", 1)[0].partition("_")[2].upper()
    return "letter" if region in LETTER_REGIONS else "a4"
