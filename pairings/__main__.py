"""``python -m pairings`` runs the command line."""

import sys

from pairings.cli import main

sys.exit(main())
