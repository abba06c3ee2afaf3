"""The main job, from a scenario to checked designs.

Run settings, the feasibility matrix turned into a scheduling problem, the run and the exact
re-check of every chosen design. Imports ``building``, ``candidates`` and ``schedule``.
"""
