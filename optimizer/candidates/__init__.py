"""Candidate column types and where each one works.

Imports ``building`` (its public face), ``optimizer.errors`` and ``design``. The modules:

* ``catalogue``: the candidate types from the scenario's ``[catalogue]`` (sizes, bars, links, cover);
* ``feasibility``: every type checked in every cell (the feasibility matrix) with the quantities of each
  feasible pair;
* ``costs``: cost and embodied carbon of each feasible pair from its quantities.

The names below are what the later stages use.
"""

from optimizer.candidates.catalogue import (
    STEEL_DENSITY,
    Catalogue,
    CatalogueSpec,
    ColumnType,
    Shape,
    build_catalogue,
    read_catalogue_spec,
    reject_unknown,
    type_arrays,
)
from optimizer.candidates.costs import DEFAULT_CARBON_CONCRETE, DEFAULT_CARBON_STEEL, CostFactors, candidate_cost_carbon
from optimizer.candidates.feasibility import (
    RECHECK_BAND,
    CellTable,
    Feasibility,
    cell_table,
    check_pairs,
    check_settings_for,
    feasibility,
    quantities,
    undesignable_frame,
    undesignable_lines,
)

__all__ = [
    "STEEL_DENSITY",
    "Catalogue",
    "CatalogueSpec",
    "ColumnType",
    "Shape",
    "build_catalogue",
    "read_catalogue_spec",
    "reject_unknown",
    "type_arrays",
    "DEFAULT_CARBON_CONCRETE",
    "DEFAULT_CARBON_STEEL",
    "CostFactors",
    "candidate_cost_carbon",
    "RECHECK_BAND",
    "CellTable",
    "Feasibility",
    "cell_table",
    "check_pairs",
    "check_settings_for",
    "feasibility",
    "quantities",
    "undesignable_frame",
    "undesignable_lines",
]
