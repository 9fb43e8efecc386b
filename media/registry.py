"""The registry of medium families: built-ins plus the ``cprobe.media`` entry-point group.

An installed package adds a family by declaring, in its pyproject.toml::

    [project.entry-points."cprobe.media"]
    myname = "mypackage.module:MyFamily"
"""

from __future__ import annotations

from importlib.metadata import entry_points

from media.errors import MediumInputError
from media.family import unknown_key_message
from media.interface import INTERFACE_VERSION

ENTRY_POINT_GROUP = "cprobe.media"
BROKEN = {}  # plugin name -> why it failed to load; asked for by name, it is refused with that reason


def _builtin():
    from media.boolnet import NetworkFileFamily, RandomNetworkFamily
    from media.eca import ElementaryFamily
    from media.reactions import RandomReactionFamily, ReactionFileFamily
    from media.ruletable import RuleTableFamily
    from media.totalistic import TotalisticFamily

    families = [ElementaryFamily(), NetworkFileFamily(), RandomNetworkFamily(), TotalisticFamily(),
                RuleTableFamily(), ReactionFileFamily(), RandomReactionFamily()]
    return {family.name: family for family in families}


def available() -> dict:
    """All families by name: built-ins first, then installed plugins."""
    families = _builtin()
    for point in entry_points(group=ENTRY_POINT_GROUP):
        if point.name in families:
            continue
        try:
            families[point.name] = point.load()()
        except Exception as error:  # a broken plugin must not take the other media down with it
            BROKEN[point.name] = (f"medium plugin {point.name!r} ({point.value}) failed to load: "
                                  f"{type(error).__name__}: {error}; fix or uninstall that package")
    return families


def family(name: str):
    """The family registered as ``name``, or a one-line error listing what is available."""
    families = available()
    if name in BROKEN and name not in families:
        raise MediumInputError(BROKEN[name])
    if name not in families:
        raise MediumInputError(unknown_key_message("medium", name, families).replace("unknown key", "unknown medium"))
    return families[name]


def build(name: str, **params):
    """Build one medium instance of family ``name`` and check its interface version."""
    medium = family(name).build(**params)
    version = getattr(medium, "interface_version", None)
    if version != INTERFACE_VERSION:
        raise MediumInputError(
            f"medium {name!r} was written for interface version {version}, this probe speaks version {INTERFACE_VERSION}")
    return medium
