"""``stallcheck.record.record`` against the standard library's ``dataclasses.dataclass``
(the reference): the same class body decorated by each must behave the same."""

from __future__ import annotations

import dataclasses

import pytest

from stallcheck import inputs, result
from stallcheck.record import record


def _body():
    class Point:
        name: str
        x: float
        y: float = 0.0
        note: str = dataclasses.field(default="", compare=False)
        weight: float = dataclasses.field(default=1.0, hash=False)
        secret: int = dataclasses.field(default=0, repr=False)
        tags: tuple = dataclasses.field(default_factory=tuple)

    return Point


def _pair(**options):
    ours = record(_body(), **options)
    theirs = dataclasses.dataclass(_body(), frozen=options.get("frozen", True))
    return ours, theirs


@pytest.mark.parametrize("frozen", [True, False])
def test_repr_equality_and_hash_as_the_standard_library_makes_them(frozen):
    ours, theirs = _pair(frozen=frozen)
    cases = [("a", 1.0), ("a", 1.0, 2.0, "n"), ("b", 1.0, 0.0, "m", 2.5, 7, ("t",))]
    for args in cases:
        a, b = ours(*args), theirs(*args)
        assert repr(a) == repr(b)
        assert ours(*args) == a and theirs(*args) == b
        if frozen:
            assert hash(a) == hash(b) == hash(ours(*args))
        else:
            with pytest.raises(TypeError):
                hash(a)
            with pytest.raises(TypeError):
                hash(b)
    # a field left out of the comparison, and one that takes part
    assert ours("a", 1.0, note="x") == ours("a", 1.0, note="y")
    assert theirs("a", 1.0, note="x") == theirs("a", 1.0, note="y")
    assert ours("a", 1.0) != ours("a", 2.0)
    # another class with the same fields is not equal (as the standard library has it)
    assert ours("a", 1.0) != theirs("a", 1.0)
    assert ours("a", 1.0).__eq__(theirs("a", 1.0)) is NotImplemented


def test_frozen_instances_refuse_changes_and_the_dataclass_functions_work():
    ours, _ = _pair()
    a = ours("a", 1.0)
    with pytest.raises(dataclasses.FrozenInstanceError):
        a.x = 2.0
    with pytest.raises(dataclasses.FrozenInstanceError):
        del a.x
    assert dataclasses.is_dataclass(a)
    assert [f.name for f in dataclasses.fields(a)] == ["name", "x", "y", "note", "weight", "secret", "tags"]
    assert dataclasses.replace(a, y=3.0) == ours("a", 1.0, 3.0)
    assert dataclasses.asdict(a) == {"name": "a", "x": 1.0, "y": 0.0, "note": "", "weight": 1.0, "secret": 0,
                                     "tags": ()}
    mutable, _ = _pair(frozen=False)
    m = mutable("a", 1.0)
    m.x = 2.0
    assert m == mutable("a", 2.0)


def test_the_constructor_is_the_standard_library_s():
    import inspect

    ours, theirs = _pair()
    assert str(inspect.signature(ours)) == str(inspect.signature(theirs))
    for bad in [(), ("a",), ("a", 1.0, 2.0, "n", 1.0, 0, (), "extra")]:
        with pytest.raises(TypeError):
            theirs(*bad)
        with pytest.raises(TypeError):
            ours(*bad)
    with pytest.raises(TypeError):
        ours("a", 1.0, colour="red")
    # a factory default is made anew for each object
    assert ours("a", 1.0, tags=[]).tags is not ours("a", 1.0, tags=[]).tags

    def body():
        class Later:
            a: float
            b: list = dataclasses.field(init=False, default_factory=list)
            c: int = dataclasses.field(init=False, default=3)

            def __post_init__(self):
                object.__setattr__(self, "c", self.c + 1)

        return Later

    mine, std = record(body()), dataclasses.dataclass(body(), frozen=True)
    assert repr(mine(1.0)) == repr(std(1.0))
    assert repr(mine(1.0)).endswith("Later(a=1.0, b=[], c=4)")
    assert str(inspect.signature(mine)) == str(inspect.signature(std))


def test_keyword_only_fields_are_refused():
    class Keyed:
        a: float = dataclasses.field(kw_only=True)

    with pytest.raises(TypeError, match="keyword-only"):
        record(Keyed)


def test_the_project_classes_are_records():
    # The inputs and the result compare and print by value as before.
    site = inputs.Site(atmospheric_pressure=101325.0, basis="standard")
    assert site == inputs.Site(atmospheric_pressure=101325.0, basis="standard")
    assert site != inputs.Site(atmospheric_pressure=100000.0, basis="standard")
    assert hash(site) == hash(inputs.Site(atmospheric_pressure=101325.0, basis="standard"))
    assert repr(site).startswith("Site(atmospheric_pressure=101325.0, basis='standard'")
    finding = result.Finding("x", "info", ("what",), {"y": 1.0})
    assert finding == result.Finding("x", "info", ("what",), {"y": 1.0})
    assert finding != result.Finding("x", "warning", ("what",), {"y": 1.0})


def test_objects_made_before_and_after_the_constructor_is_compiled_are_the_same():
    # The first objects of a class are made by a shared constructor (nothing compiled at
    # import); from COMPILE_AFTER on by the class's own. Both must make what the
    # standard library's makes, and refuse what it refuses with its very words.
    from stallcheck import record as module

    ours, theirs = _pair()
    calls = [("a", 1.0), ("a", 1.0, 2.0), (), ("b",)]
    kwargs = [{}, {"tags": ("t",)}, {"name": "c", "x": 3.0, "weight": 2.0}, {"colour": "red"}, {"name": "d"}]
    assert vars(ours)["__init__"] is ours.__record_shared__
    for k in range(module.COMPILE_AFTER + 8):
        args, kw = calls[k % len(calls)], kwargs[k % len(kwargs)]
        try:
            expected = theirs(*args, **kw)
        except TypeError as exc:
            with pytest.raises(TypeError) as got:
                ours(*args, **kw)
            assert str(got.value).replace(ours.__qualname__, "") == str(exc).replace(theirs.__qualname__, "")
        else:
            assert repr(ours(*args, **kw)) == repr(expected)
    assert vars(ours)["__init__"] is not ours.__record_shared__  # compiled by now
    assert repr(ours("a", 1.0)) == repr(theirs("a", 1.0))
    # a factory default is made anew for each object, in both phases
    fresh, _ = _pair()
    assert fresh("a", 1.0).tags == () and fresh("a", 1.0, tags=[]).tags is not fresh("a", 1.0, tags=[]).tags
