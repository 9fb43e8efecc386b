"""Reading site lists and readout windows from text.

Sites: comma lists and inclusive ranges, ``"4-9,12-17"``; names are kept as
strings for media that name their sites. Windows: ``"t0:t1"`` or ``"t"``.
"""

from probe.errors import LayoutError


def parse_sites(spec, field: str = "sites") -> list:
    """``"4-9,12"`` -> ``[4, 5, 6, 7, 8, 9, 12]``; lists pass through; names stay strings."""
    if spec is None:
        return []
    if isinstance(spec, int) and not isinstance(spec, bool):
        return [spec]
    if isinstance(spec, (list, tuple)):
        items = []
        for item in spec:
            items.extend(parse_sites(item, field) if isinstance(item, str) else [item])
        return items
    if not isinstance(spec, str):
        raise LayoutError(f"{field}: expected a list like '4-9,12' or [4, 5], got {spec!r}")
    items = []
    for part in spec.split(","):
        part = part.strip()
        if not part:
            raise LayoutError(f"{field}: empty item in {spec!r}; write sites like '4-9,12'")
        low, dash, high = part.partition("-")
        if dash and low.strip().isdigit() and high.strip().isdigit():
            low, high = int(low), int(high)
            if high < low:
                raise LayoutError(f"{field}: range {part!r} runs backwards; write low-high")
            items.extend(range(low, high + 1))
        elif part.isdigit():
            items.append(int(part))
        elif part.lstrip("-").isdigit():
            raise LayoutError(f"{field}: site {part} is negative; sites are numbered from 0")
        else:
            items.append(part)
    return items


ATTRACTOR = "attractor"


def parse_window(spec, field: str = "window"):
    """``"4:8"`` -> ``(4, 8)``; ``"5"`` or ``5`` -> ``(5, 5)``; ``[4, 8]`` -> ``(4, 8)``; ``"attractor"`` stays."""
    if isinstance(spec, str) and spec.strip().lower() == ATTRACTOR:
        return ATTRACTOR
    if isinstance(spec, int) and not isinstance(spec, bool):
        bounds = (spec, spec)
    elif isinstance(spec, (list, tuple)) and len(spec) == 2:
        bounds = tuple(spec)
    elif isinstance(spec, str):
        text = spec.strip()
        low, colon, high = text.partition(":")
        parts = (low, high) if colon else (low, low)
        try:
            bounds = tuple(int(part) for part in parts)
        except ValueError:
            raise LayoutError(f"{field}: cannot read {spec!r}; write t0:t1 with whole numbers, e.g. 4:8, or 'attractor'") from None
    else:
        raise LayoutError(f"{field}: cannot read {spec!r}; write t0:t1 with whole numbers, e.g. 4:8")
    if not all(isinstance(value, int) and not isinstance(value, bool) for value in bounds):
        raise LayoutError(f"{field}: cannot read {spec!r}; write t0:t1 with whole numbers, e.g. 4:8")
    t0, t1 = bounds
    if t0 < 0:
        raise LayoutError(f"{field}: t0 = {t0} lies before the start of the run; allowed t0 >= 0")
    if t1 < t0:
        raise LayoutError(f"{field}: t1 = {t1} is before t0 = {t0}; allowed t0 <= t1")
    return t0, t1
