"""Exceptions for bad input to a medium.

``MediumInputError`` is a ``ValueError`` so plain callers can catch it as
one; the CLI turns it into a one-line message and exit status 2.
"""


class MediumInputError(ValueError):
    """A medium was given a parameter outside what it allows."""


def require(condition, message):
    """Raise :class:`MediumInputError` with ``message`` unless ``condition`` holds."""
    if not condition:
        raise MediumInputError(message)
