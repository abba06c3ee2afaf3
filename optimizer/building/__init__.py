"""The building: what stands where and what it carries.

Scenario model and reading, stack graph, loads, takedown and actions CSV, plausibility of the
actions, synthetic tower scenarios. Imports only ``optimizer.errors`` and ``design``.
"""
