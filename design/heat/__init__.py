"""Heat transfer in column sections exposed to fire, and their resistance in fire.

``thermal``: the standard fire curve, the thermal properties of normal-weight concrete
(EN 1992-1-2, 3.3) and a 2-D transient finite-volume solver of a rectangular section.
``isotherm``: the 500 C isotherm method of EN 1992-1-2, Annex B.1 (reduced section, each bar at
the strength of its own temperature) and the reduction factor eta_fi of 2.4.2.
Import from the modules themselves.
"""
