"""The ``strikeline`` verbs, one module per group; ``add_<verb>(sub)`` adds a verb and its arguments.

- :mod:`.parser`: the top-level parser, one-line usage errors, quantity arguments, the cautions
- :mod:`.forecast`: ``strike``, ``curve``, ``gases``
- :mod:`.instruments`: ``live``, ``gauge``, ``record``
- :mod:`.ports`: ``ports``
- :mod:`.logbook`: ``log``, ``fit``
"""
