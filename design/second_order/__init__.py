"""Isolated columns under axial load: imperfections and second-order effects.

EN 1992-1-1, 5.2 and 5.8, one module per clause group: ``imperfections`` (5.2 and the minimum
eccentricity of 6.1(4)), ``slenderness`` (5.8.3), ``nominal_stiffness`` (5.8.7),
``nominal_curvature`` (5.8.8) and ``biaxial`` (5.8.9). Import from the modules themselves.
"""
