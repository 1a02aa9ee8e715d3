"""pairings: a terminal desk for Swiss-system and round-robin events.

The event's regulations and the chief arbiter's decision prevail over this tool.
"""

__version__ = "0.1.0"
