"""Constants of nature and of practice that the physics owns, in SI.

Everything that computes or presents takes them from here, so that no layer reaches
into another for a number: the units module uses the atmosphere and gravity to convert,
the physics uses them to compute, the presenters quote the limits of practice.
"""

#: Standard gravity [m/s²] (CGPM 1901; ISO 80000-3).
GRAVITY = 9.80665
#: Standard atmosphere at sea level [Pa] (ISO 2533).
STANDARD_ATMOSPHERE = 101_325.0
#: Standard air density used for air volume flows [kg/m³]: dry air at 20 °C, 101.325 kPa
#: (the unit-file conventions).
STANDARD_AIR_DENSITY = 1.204
#: Velocity in a return line carrying flash steam above which condensate is torn into
#: slugs [m/s] (about 50 ft/s; common practice, from memory: lines carrying flash are
#: sized for 15 m/s or less).
VELOCITY_LIMIT = 15.0
#: Freezing point of water at atmospheric pressure [K]: 0 °C (273.15 K; ITS-90 puts the
#: ice point 0.01 K below the triple point). Air below it freezes condensate held in a coil.
FREEZING = 273.15
