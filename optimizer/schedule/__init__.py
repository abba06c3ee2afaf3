"""The scheduling problem and its solvers, on plain data.

Imports no other stage: it works on ``problem.ScheduleProblem`` alone. The modules, each importing
only those before it:

* ``problem`` - the vocabulary (problem, schedule, rules, types, objective, step rule, status);
* ``prepared`` - stack chains, the pair table of the continuity rules, scheduling units;
* ``stackpaths`` and ``stackdp`` - each stack alone as a shortest path (networkx, numpy, compiled);
* ``heuristic`` - the unconstrained optimum, the greedy warm start, the lower bound, the baseline, figures;
* ``builder`` and ``backends`` - a model as named columns and rows, and the HiGHS and CBC back-ends;
* ``compact`` - the compact formulation (its safe reductions are in ``builder``);
* ``pathmodel``, ``master`` and ``paths`` - the path formulation (column generation);
* ``solve`` - the entry points: ``solve``, ``solve_paths``, ``pareto``, ``lower_bound_premium``;
* ``check`` and ``diagnose`` - the independent rule checker and the reasons for infeasibility;
* ``synthetic`` - invented problems for tests and benchmarks.

Nothing is re-exported here: ``optimizer.schedule.problem`` is imported by every command of the command
line, and a package face importing the solvers would load numba and PuLP for each of them.
"""
