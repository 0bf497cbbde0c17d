"""The decorator for the project's data classes: a :func:`dataclasses.dataclass` that
starts faster.

On CPython 3.11 and 3.12 the dataclass decorator compiles each generated method from
source: six for a frozen class (``__init__``, ``__repr__``, ``__eq__``, ``__hash__``,
``__setattr__``, ``__delattr__``), about 0.2 ms each here. With some forty classes
between the inputs, the result and the presenters that was 40-50 ms of every command's
start, a fifth of a check. :func:`record` compiles only ``__init__`` (the one method
whose speed matters, as a survey makes a million objects) and gives every class the same
plain functions for the rest, which read the fields at call time. The classes behave as
the dataclass decorator makes them: same constructor, repr, equality and hash (from the
fields that compare, in order), a frozen one refuses assignment with
:class:`dataclasses.FrozenInstanceError`, and :func:`dataclasses.fields`,
:func:`dataclasses.replace` and :func:`dataclasses.asdict` work on them as before.
``tests/test_record.py`` holds them to the standard library's.
"""

from __future__ import annotations

from dataclasses import MISSING, FrozenInstanceError, dataclass, fields


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
    # the fields the dataclass decorator hashes: those that compare, unless told
    return hash(tuple(getattr(self, f.name) for f in fields(self) if (f.compare if f.hash is None else f.hash)))


def _refuse_set(self, name, value):
    raise FrozenInstanceError(f"cannot assign to field {name!r}")


def _refuse_delete(self, name):
    raise FrozenInstanceError(f"cannot delete field {name!r}")


class _Factory:
    """Stands for "not given" where a field's default comes from a factory."""

    def __repr__(self) -> str:
        return "<factory>"


_FACTORY = _Factory()


def _init(cls, frozen: bool):
    """``cls.__init__`` as the dataclass decorator writes it, compiled once."""
    names = {"__object_setattr": object.__setattr__, "_FACTORY": _FACTORY}
    params, body = [], []
    for f in fields(cls):
        default, factory = f"_default_{f.name}", f"_factory_{f.name}"
        if f.default is not MISSING:
            names[default] = f.default
            value = f.name if f.init else default
            if f.init:
                params.append(f"{f.name}={default}")
        elif f.default_factory is not MISSING:
            names[factory] = f.default_factory
            value = f"{factory}() if {f.name} is _FACTORY else {f.name}" if f.init else f"{factory}()"
            if f.init:
                params.append(f"{f.name}=_FACTORY")
        elif f.init:
            params.append(f.name)
            value = f.name
        else:
            continue
        body.append(f"    __object_setattr(self, {f.name!r}, {value})" if frozen else f"    self.{f.name} = {value}")
    if hasattr(cls, "__post_init__"):
        body.append("    self.__post_init__()")
    source = f"def __init__(self, {', '.join(params)}):\n" + ("\n".join(body) or "    pass") + "\n"
    exec(source, names)
    init = names["__init__"]
    init.__qualname__ = f"{cls.__qualname__}.__init__"
    init.__module__ = cls.__module__
    init.__annotations__ = {**{f.name: f.type for f in fields(cls) if f.init}, "return": None}
    return init


def record(cls=None, /, *, frozen: bool = True):
    """Make ``cls`` a dataclass (frozen unless ``frozen=False``) with value equality, a
    field repr and, when frozen, a hash from its fields: as ``@dataclass(frozen=True)``
    makes it, compiling one method instead of six. Keyword-only fields and ``InitVar``
    pseudo-fields are not taken (none of the project's classes has them)."""

    def wrap(c):
        made = dataclass(c, init=False, repr=False, eq=False)
        if any(f.kw_only is True for f in fields(made)):
            raise TypeError(f"{c.__qualname__}: record takes no keyword-only fields; use dataclasses.dataclass")
        made.__init__ = _init(made, frozen)
        if frozen:
            made.__setattr__ = _refuse_set
            made.__delattr__ = _refuse_delete
        made.__repr__ = _repr
        made.__eq__ = _eq
        # As the dataclass decorator does: a frozen class hashes its fields; a mutable
        # one with value equality is unhashable.
        made.__hash__ = _hash if frozen else None
        return made

    return wrap if cls is None else wrap(cls)
