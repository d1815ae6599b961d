"""The live tuning screen (Textual): the app, its panels, keys and dialogs."""
