"""Exceptions for bad input to the probe.

Every one is a ``ValueError`` whose message is one line naming the field,
the value and what is allowed. The CLI prints it and exits with status 2.
"""

from media.errors import MediumInputError


class ProbeInputError(ValueError):
    """Base class: input the probe cannot use."""


class LayoutError(ProbeInputError):
    """A layout that does not fit the medium (overlap, range, window, sign count)."""


class ConfigError(ProbeInputError):
    """A survey configuration that cannot be read or has unknown or bad fields."""


class EnumerationTooLarge(ProbeInputError):
    """An enumeration of signs times contexts above the size limit."""


class RunFolderConflict(ProbeInputError):
    """A run folder that holds a different run."""


INPUT_ERRORS = (ProbeInputError, MediumInputError)
