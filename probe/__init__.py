"""The contingency probe: layouts, evaluation, tallies, surveys, figures and the CLI.

It knows nothing of any particular medium; it talks to :mod:`media.interface`.
The public API lives in :mod:`probe.api` and is re-exported here.
"""

from probe.api import *  # noqa: F401,F403
from probe.api import __all__  # noqa: F401
