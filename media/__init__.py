"""Media: systems that evolve batches of states. They know nothing of signs.

See :mod:`media.interface` for the contract, :mod:`media.conformance` for the
suite that checks it, and :mod:`media.registry` for how media are found.
"""

from media.errors import MediumInputError
from media.interface import INTERFACE_VERSION, Medium

__all__ = ["INTERFACE_VERSION", "Medium", "MediumInputError"]
