"""The building layer: scenarios, stack graph, takedown, optimisation, reports, CLI."""

__version__ = "0.1.0"

CAUTION = (
    "Caution: results are for concept design and must be verified by a qualified engineer "
    "under the local code and national annex."
)
