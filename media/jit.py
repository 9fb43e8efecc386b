"""The one place where numba flags are set, for media and probe alike.

Kernels are compiled with ``cache=True`` so the second process to use a
kernel loads it from ``NUMBA_CACHE_DIR`` (the Makefile points that at
``.numba-cache``) instead of compiling it again.
"""

from numba import njit

JIT_FLAGS = {"cache": True, "nogil": True, "fastmath": False, "error_model": "numpy"}


def kernel(function):
    """Compile ``function`` as a private numba kernel with the project's flags."""
    return njit(**JIT_FLAGS)(function)
