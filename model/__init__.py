"""The breakdown and forecast model: pure functions of SI numbers and numpy arrays.

Nothing here imports Textual, pyserial or plotext, touches a file, or reads a clock;
``tests/test_layers.py`` keeps it so.
"""
