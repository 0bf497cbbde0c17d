"""stallcheck: will a modulating steam coil drain its condensate at every load?

Importing the package is light on purpose: no CoolProp, scipy or pint until a
command needs them. The pipeline is

    unitfile (TOML -> inputs, SI) -> analysis (properties, coil, valve, drainage)
    -> result (dataclasses) -> render (terminal, chart, json)

The Python interface (:mod:`stallcheck.api`) is re-exported here and loaded on first use:
``stallcheck.read_unit``, ``analyse``, ``analyse_many``, ``to_dict``, ``survey_rows`` and
``survey_frame``.
"""

from __future__ import annotations

__version__ = "0.1.0"
__all__ = ["read_unit", "analyse", "analyse_many", "to_dict", "survey_rows", "survey_frame", "InputError",
           "StallcheckError", "__version__"]


def __getattr__(name: str):
    """The public interface, imported only when first used (keeps ``--help`` fast)."""
    if name in __all__ and name != "__version__":
        from stallcheck import api

        return getattr(api, name)
    raise AttributeError(f"module 'stallcheck' has no attribute {name!r}")


def __dir__() -> list[str]:
    """The public names, listed though they load on first use."""
    return sorted(set(__all__) | {name for name in globals() if name.startswith("__")})
