"""The FIDE tournament report file (TRF16, column positions from memory): write and read.

:func:`write_trf` turns an event's state into the file a rating body receives;
:func:`read_trf` turns such a file back into the events of a new event. Both are
pure. See :mod:`pairings.trf.layout` for the columns and the edition followed.
"""

from pairings.trf.layout import EDITION
from pairings.trf.read import read_trf
from pairings.trf.write import write_trf

__all__ = ["EDITION", "read_trf", "write_trf"]
