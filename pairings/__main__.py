"""``python -m pairings`` and the ``pairings`` command: the command line in a process of its own.

A command is one short process: it imports the package and its libraries (a few
hundred thousand objects, almost none of them in reference cycles), reads the
event, acts and exits. The cycle collector would walk those objects again and
again while the imports make them and once more at exit, finding nothing to free;
so the imports run without it, what they made is set aside for good
(:func:`gc.freeze`: never walked again), and so is everything alive when the
command ends. The command itself, the desk included, runs with the collector on.
numpy's linear-algebra library starts a thread per processor when it is imported;
nothing in the package does linear algebra, so one is asked for (unless the
environment already says how many). In-process callers of
:func:`pairings.cli.main` (the tests) keep Python's and numpy's defaults.
"""

import gc
import os
import sys
from typing import NoReturn


def run() -> NoReturn:
    os.environ.setdefault("OPENBLAS_NUM_THREADS", "1")
    gc.disable()
    from pairings.cli import main

    gc.freeze()
    gc.enable()
    status = main()
    gc.freeze()
    sys.exit(status)


if __name__ == "__main__":
    run()
