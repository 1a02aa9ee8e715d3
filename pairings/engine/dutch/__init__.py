"""The FIDE (Dutch) System (FIDE Handbook C.04.3), built on maximum-weight matching.

Not endorsed by FIDE. Editions followed, rule by rule, are listed in
docs/engine.md ("The FIDE (Dutch) System"). Modules:

- :mod:`.entrants`  the players of a round as the system sees them (pairing numbers, scores, colours, floats)
- :mod:`.colours`   colour allocation
- :mod:`.generation` the Handbook's order of transpositions and exchanges
- :mod:`.criteria`  the quality criteria C.5-C.19 as additive costs
- :mod:`.bracket`   one bracket's choice by the blossom, and the completion check
- :mod:`.rounds`    the whole round: brackets top down, boards
- :mod:`.verify`    re-check of a stored Dutch round
- :mod:`.explain`   the Why panel's reasons for a Dutch board
"""

from pairings.engine.dutch.rounds import draft_dutch, plan

__all__ = ["draft_dutch", "plan"]
