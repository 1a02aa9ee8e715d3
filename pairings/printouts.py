"""The printable sheets and formats, named once: the command line, the desk and the renderers read these.

Kept outside :mod:`pairings.reports` so the desk can list them without loading the renderers.
"""

KINDS = ("pairings", "names", "slips", "standings", "crosstable", "start-list", "grid", "prizes", "rating-report")
"""Every sheet :func:`pairings.reports.render` makes."""
ROUND_KINDS = ("pairings", "names", "slips")
"""The sheets of one round (the desk names their files after it)."""
FORMATS = ("text", "csv", "json", "html", "pdf")
PAPERS = ("a4", "letter")
