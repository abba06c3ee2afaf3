"""The scheduling problem and its solvers, on plain data.

The problem vocabulary, stack paths and the compiled DP, heuristics and bounds, the compact and
path formulations, the independent checker and the diagnosis. Imports no other stage: it works
on ``problem.ScheduleProblem`` alone.
"""
