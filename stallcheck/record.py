"""The decorator for the project's data classes: a :func:`dataclasses.dataclass` that
starts faster.

On CPython 3.11 and 3.12 the dataclass decorator compiles each generated method from
source: six for a frozen class (``__init__``, ``__repr__``, ``__eq__``, ``__hash__``,
``__setattr__``, ``__delattr__``), about 0.2 ms each here. With some forty classes
between the inputs, the result and the presenters that was 40-50 ms of every command's
start, a fifth of a check. :func:`record` compiles only ``__init__`` (the one method
whose speed matters, as a survey makes a million objects), and that only once a class has
made :data:`COMPILE_AFTER` objects through a shared constructor (a check makes a few of
each, a survey many); every class has the same plain functions for the rest, which read
the fields at call time. The classes behave as
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


#: Objects a class makes through the shared constructor before its own is compiled.
COMPILE_AFTER = 32


class _Signature:
    """A class's ``__signature__``, asked for by :func:`inspect.signature`: it compiles
    the class's own constructor, whose signature inspect then reads (it reads this
    attribute first, and goes on to ``__init__`` where it is None)."""

    def __get__(self, instance, owner):
        if owner is not None and "__record_frozen__" in vars(owner):
            _compile(owner)
        return None


def _compile(cls):
    """Give ``cls`` its own compiled constructor (once) and return it."""
    if vars(cls).get("__init__") is vars(cls).get("__record_shared__"):
        cls.__init__ = _init(cls, cls.__record_frozen__)
    return cls.__init__


def _shared_init(cls, frozen: bool):
    """A constructor for ``cls`` that compiles nothing: it binds the arguments from the
    fields' list, and after :data:`COMPILE_AFTER` objects (a survey makes a million)
    gives the class the compiled one. Any call it does not bind plainly (a missing,
    extra or repeated argument) goes to the compiled constructor, which raises exactly
    as the dataclass decorator's does."""
    plan = [(f.name, f.init, f.default, f.default_factory) for f in fields(cls)]
    names = [name for name, init, _, _ in plan if init]
    known = frozenset(names)
    set_field = object.__setattr__
    post_init = hasattr(cls, "__post_init__")
    made = 0

    def __init__(self, *args, **kwargs):
        nonlocal made
        made += 1
        if made > COMPILE_AFTER or len(args) > len(names) or not known.issuperset(kwargs):
            return _compile(cls)(self, *args, **kwargs)
        given = dict(zip(names, args))
        for name in kwargs:
            if name in given:
                return _compile(cls)(self, *args, **kwargs)
        given.update(kwargs)
        for name, init, default, factory in plan:
            if init and name in given:
                value = given[name]
            elif default is not MISSING:
                value = default
            elif factory is not MISSING:
                value = factory()
            elif init:  # a required argument not given
                return _compile(cls)(self, *args, **kwargs)
            else:
                continue
            set_field(self, name, value)
        if post_init:
            self.__post_init__()

    __init__.__qualname__ = f"{cls.__qualname__}.__init__"
    __init__.__module__ = cls.__module__
    return __init__


def record(cls=None, /, *, frozen: bool = True):
    """Make ``cls`` a dataclass (frozen unless ``frozen=False``) with value equality, a
    field repr and, when frozen, a hash from its fields: as ``@dataclass(frozen=True)``
    makes it, compiling one method instead of six, and that only when the class is much
    used (see :func:`_shared_init`). Keyword-only fields and ``InitVar``
    pseudo-fields are not taken (none of the project's classes has them)."""

    def wrap(c):
        made = dataclass(c, init=False, repr=False, eq=False)
        if any(f.kw_only is True for f in fields(made)):
            raise TypeError(f"{c.__qualname__}: record takes no keyword-only fields; use dataclasses.dataclass")
        made.__record_frozen__ = frozen
        made.__record_shared__ = made.__init__ = _shared_init(made, frozen)
        made.__signature__ = _Signature()
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
