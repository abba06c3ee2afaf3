"""Variants of a building and their comparison.

Scenario variants, the comparison of concrete grades and parametric studies (local or Dask).
Imports ``pipeline`` and the earlier stages.
"""
