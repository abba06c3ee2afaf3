"""Candidate column types and where each one works.

The catalogue, the feasibility matrix (every type in every cell), the quantities of each feasible
pair and its cost and carbon. Imports ``building``.
"""
