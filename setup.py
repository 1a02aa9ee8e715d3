"""Compiled kernels of the pairing engine (optional: the engine falls back to pure Python without them).

Everything else about the package is in pyproject.toml; this file only declares the C extensions,
because setuptools reads extension modules from here. A machine without a C compiler still installs
the package (``optional=True``); ``pairings.engine.implicit.available()`` then says False and the
engine runs its pure-Python paths (same results, slower).
"""

from setuptools import Extension, setup

FLAGS = ["-O2", "-std=c11"]

setup(
    ext_modules=[
        Extension("pairings.engine._blossom_c", ["pairings/engine/_blossom_c.c"],
                  extra_compile_args=FLAGS, optional=True),
        Extension("pairings.engine._scan_c", ["pairings/engine/_scan_c.c"],
                  extra_compile_args=FLAGS, optional=True),
    ],
)
