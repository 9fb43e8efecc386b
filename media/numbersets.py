"""Sets of rule numbers for surveys: lists, ranges, ``"all"`` and seeded samples.

Shared by the media whose instances are numbered (totalistic codes, rule
tables). Rule spaces can be far larger than int64 (a radius-3 binary rule
table has ``2^128`` rules), so numbers stay Python ints throughout.

Seeded samples follow the project's seed convention without importing
``probe``: the generator for purpose ``name`` under run seed ``seed`` is
``numpy.random.default_rng(numpy.random.SeedSequence([seed & (2**64 - 1),
zlib.crc32(name.encode())]))``, the same generator as
``probe.seeding.rng_for(seed, name)``.
"""

from __future__ import annotations

import math
import zlib

import numpy as np

from media.errors import MediumInputError, require

ENUMERATION_LIMIT = 2**16  # most instances a survey may list, by "all", ranges or a sample
_CHOICE_LIMIT = 2**62  # spaces up to this size are sampled with Generator.choice


def as_whole_number(value):
    """``value`` as a Python int if it is a whole number >= 0 (int, numpy int or digit string), else ``None``.

    >>> as_whole_number("12"), as_whole_number(np.uint8(3)), as_whole_number(True), as_whole_number(2.0)
    (12, 3, None, None)
    >>> as_whole_number("²") is None
    True
    """
    if isinstance(value, (bool, np.bool_)):
        return None
    if isinstance(value, (int, np.integer)):
        return int(value) if value >= 0 else None
    if isinstance(value, str) and is_digits(value.strip()):
        return int(value.strip())
    return None


def is_digits(text: str) -> bool:
    """True for a non-empty run of ASCII digits (``str.isdigit`` alone also accepts ``"²"``)."""
    return text.isascii() and text.isdigit()


def check_whole_number(value, field: str, low: int, high: int, note: str = "", base: int = 2) -> int:
    """``value`` as an int in ``low..high``, or a one-line error naming ``field``, the value and the range."""
    number = as_whole_number(value)
    if number is None or not low <= number <= high:
        raise MediumInputError(f"{field} must be an integer {range_text(low, high, base)}{note}, got {value!r}")
    return number


def range_text(low: int, high: int, base: int = 2) -> str:
    """``"0..2186"``; a bound past 10^12 that is one less than a power of ``base`` is written ``base^n-1``.

    >>> range_text(0, 2186), range_text(0, 2**128 - 1), range_text(0, 8**50 - 1, base=8)
    ('0..2186', '0..2^128-1', '0..8^50-1')
    """
    text = str(high)
    if high >= 10**12:
        exponent = round(math.log(high + 1, base))
        if base**exponent == high + 1:
            text = f"{base}^{exponent}-1"
    return f"{low}..{text}"


def parse_number_set(spec, *, field: str, space: int, noun: str, hint: str = "", base: int = 2) -> list:
    """Expand ``"all"``, a list, one number, or ranges like ``"0-15,30"`` over ``0..space-1``.

    Repeats are dropped (first occurrence kept). More than ``ENUMERATION_LIMIT``
    numbers is refused with the size and a pointer to ``sample``.

    >>> parse_number_set("0-3, 9,2", field="codes", space=16, noun="codes")
    [0, 1, 2, 3, 9]
    >>> parse_number_set("all", field="codes", space=4, noun="codes")
    [0, 1, 2, 3]
    """
    usage = f"use 'all', a list, or ranges like '0-15,30'{hint}"
    top = space - 1

    def one(value):
        number = as_whole_number(value)
        if number is None or number > top:
            raise MediumInputError(f"{field}: {value!r} is not one of the {noun} {range_text(0, top, base)}{hint}")
        return number

    def refuse_if_large(count):
        require(count <= ENUMERATION_LIMIT,
                f"{field}: {count} {noun} is more than the {ENUMERATION_LIMIT} a survey may list; "
                f"set sample = N for a seeded sample of N {noun} instead")

    if isinstance(spec, str):
        text = spec.strip().lower()
        if text == "all":
            refuse_if_large(space)
            return list(range(space))
        numbers = []
        for part in text.split(","):
            part = part.strip()
            require(part != "", f"{field}: empty item in {spec!r}; {usage}")
            if "-" in part:
                low, _, high = (piece.strip() for piece in part.partition("-"))
                require(is_digits(low) and is_digits(high), f"{field}: cannot read {part!r}; {usage}")
                low, high = one(int(low)), one(int(high))
                require(low <= high, f"{field}: range {part!r} runs backwards")
                refuse_if_large(len(numbers) + high - low + 1)
                numbers.extend(range(low, high + 1))
            else:
                require(is_digits(part), f"{field}: cannot read {part!r}; {usage}")
                numbers.append(one(int(part)))
    elif as_whole_number(spec) is not None:
        numbers = [one(spec)]
    else:
        require(isinstance(spec, (list, tuple)), f"{field} must be 'all', a list or a range string, got {spec!r}")
        refuse_if_large(len(spec))
        numbers = [one(value) for value in spec]
    seen = set()
    return [number for number in numbers if not (number in seen or seen.add(number))]


def purpose_rng(seed: int, purpose: str) -> np.random.Generator:
    """The generator for ``purpose`` under run seed ``seed`` (equal to ``probe.seeding.rng_for(seed, purpose)``)."""
    words = [int(seed) & 0xFFFFFFFFFFFFFFFF, zlib.crc32(purpose.encode())]
    return np.random.default_rng(np.random.SeedSequence(words))


def sample_number_set(count, *, field: str, space: int, noun: str, seed: int, purpose: str) -> list:
    """``count`` distinct numbers from ``0..space-1``, drawn uniformly and returned sorted.

    The generator is ``purpose_rng(seed, purpose)``. Spaces up to ``2^62``
    are sampled with ``rng.choice(space, size=count, replace=False)``.
    Larger spaces draw each number by rejection: ``space - 1``'s bit length
    of random bits, from 32-bit words ``rng.integers(0, 2**32, size=w,
    dtype=numpy.uint64)`` put together least significant word first and
    shifted right to that bit length, kept when below ``space`` and not
    drawn already.

    >>> sample_number_set(3, field="sample", space=16, noun="codes", seed=0, purpose="codes")
    [6, 13, 14]
    """
    number = as_whole_number(count)
    top = min(space, ENUMERATION_LIMIT)
    if number is None or not 1 <= number <= top:
        why = (f"there are only {space} {noun}" if space <= ENUMERATION_LIMIT
               else f"a survey lists at most {ENUMERATION_LIMIT} instances")
        raise MediumInputError(f"{field} must be a count 1..{top} ({why}), got {count!r}")
    rng = purpose_rng(seed, purpose)
    if space <= _CHOICE_LIMIT:
        chosen = rng.choice(space, size=number, replace=False)
        return sorted(int(value) for value in chosen)
    bits = (space - 1).bit_length()
    n_words = (bits + 31) // 32
    excess = n_words * 32 - bits
    chosen = set()
    while len(chosen) < number:
        words = rng.integers(0, 2**32, size=n_words, dtype=np.uint64)
        value = sum(int(word) << (32 * index) for index, word in enumerate(words)) >> excess
        if value < space:
            chosen.add(value)
    return sorted(chosen)
