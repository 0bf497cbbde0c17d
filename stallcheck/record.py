"""The decorator for the project's data classes: a :func:`dataclasses.dataclass` that
starts faster.

On CPython 3.11 and 3.12 the dataclass decorator compiles each generated method from
source: six for a frozen class (``__init__``, ``__repr__``, ``__eq__``, ``__hash__``,
``__setattr__``, ``__delattr__``), about 0.2 ms each here. With some forty classes
between the inputs, the result and the presenters that was 40-50 ms of every command's
start, a fifth of a check. :func:`record` lets dataclasses compile only what depends on
the class (``__init__`` and, when frozen, the two guards) and gives every class the same
three plain functions for the rest, which read the fields at call time. The classes
behave as the dataclass decorator makes them: same repr, equality and hash (from the
fields that compare, in order), and :func:`dataclasses.fields`,
:func:`dataclasses.replace` and :func:`dataclasses.asdict` work on them as before.
"""

from __future__ import annotations

from dataclasses import dataclass, fields


def _compared(self) -> tuple:
    return tuple(getattr(self, f.name) for f in fields(self) if f.compare)


def _repr(self) -> str:
    shown = ", ".join(f"{f.name}={getattr(self, f.name)!r}" for f in fields(self) if f.repr)
    return f"{type(self).__qualname__}({shown})"


def _eq(self, other) -> bool:
    if other.__class__ is not self.__class__:
        return NotImplemented
    return _compared(self) == _compared(other)


def _hash(self) -> int:
    return hash(_compared(self))


def record(cls=None, /, *, frozen: bool = True):
    """Make ``cls`` a dataclass (frozen unless ``frozen=False``) with value equality, a
    field repr and, when frozen, a hash from its fields: as ``@dataclass(frozen=True)``
    makes it, at half the start-up cost."""

    def wrap(c):
        made = dataclass(c, frozen=frozen, repr=False, eq=False)
        made.__repr__ = _repr
        made.__eq__ = _eq
        # As the dataclass decorator does: a frozen class hashes its fields; a mutable
        # one with value equality is unhashable.
        made.__hash__ = _hash if frozen else None
        return made

    return wrap if cls is None else wrap(cls)
