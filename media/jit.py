"""The one place where numba flags are set, for media and probe alike.

Kernels are compiled with ``cache=True`` so the second process to use a
kernel loads it from ``NUMBA_CACHE_DIR`` (the Makefile points that at
``.numba-cache``) instead of compiling it again. ``parallel_kernel`` adds
``parallel=True`` for kernels that split independent runs over threads with
``numba.prange``; ``set_threads`` chooses how many threads they use.
"""

import numba
from numba import njit

JIT_FLAGS = {"cache": True, "nogil": True, "fastmath": False, "error_model": "numpy"}
PARALLEL_FLAGS = {**JIT_FLAGS, "parallel": True}


def kernel(function):
    """Compile ``function`` as a private numba kernel with the project's flags."""
    return njit(**JIT_FLAGS)(function)


def parallel_kernel(function):
    """Compile ``function`` as a kernel whose ``prange`` loops run on all threads."""
    return njit(**PARALLEL_FLAGS)(function)


def set_threads(count: int | None = None) -> int:
    """Use ``count`` threads in parallel kernels (default: all cores); return the number in use."""
    numba.set_num_threads(numba.config.NUMBA_NUM_THREADS if count is None else int(count))
    return numba.get_num_threads()
