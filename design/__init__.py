"""Pure Eurocode 2 checks of reinforced-concrete column sections and members.

No file I/O and no knowledge of buildings: units are N, mm and MPa throughout,
compression positive. The building layer lives in :mod:`optimizer`.
"""
