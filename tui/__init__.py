"""The terminal side: the ``strikeline`` command line and the live Textual screen."""
