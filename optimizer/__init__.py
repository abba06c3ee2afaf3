"""The building layer: scenarios, stack graph, takedown, optimisation, reports, CLI."""

__version__ = "0.1.0"
