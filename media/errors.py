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


def read_toml_file(path, what: str = "network file"):
    """``(data, where)`` for a TOML file, with one-line errors naming the file: missing, a folder,
    not UTF-8, or malformed TOML. ``where`` is the prefix for the caller's own messages."""
    import sys
    from pathlib import Path

    if sys.version_info >= (3, 11):
        import tomllib
    else:  # pragma: no cover
        import tomli as tomllib
    path = Path(path)
    where = f"{what} {str(path)!r}"
    try:
        return tomllib.loads(path.read_text(encoding="utf-8")), where
    except FileNotFoundError:
        raise MediumInputError(f"{where}: no such file") from None
    except IsADirectoryError:
        raise MediumInputError(f"{where}: is a folder, not a {what}") from None
    except UnicodeDecodeError:
        raise MediumInputError(f"{where}: malformed TOML: not UTF-8 text") from None
    except tomllib.TOMLDecodeError as error:
        raise MediumInputError(f"{where}: malformed TOML: {error}") from None
