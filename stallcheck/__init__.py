"""stallcheck: will a modulating steam coil drain its condensate at every load?

Importing the package is light on purpose: no CoolProp, scipy or pint until a
command needs them. The pipeline is

    unitfile (TOML -> inputs, SI) -> analysis (properties, coil, valve, drainage)
    -> result (dataclasses) -> render (terminal, chart, json)
"""

__version__ = "0.1.0"
