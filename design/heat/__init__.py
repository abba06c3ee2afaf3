"""Heat transfer in column sections exposed to fire, EN 1991-1-2 and EN 1992-1-2.

``thermal``: the standard fire curve, the thermal properties of normal-weight concrete
(EN 1992-1-2, 3.3) and a 2-D transient finite-volume solver of a rectangular section.
Import from the modules themselves.
"""
