"""The shift report of a logbook: what it gathers, its figures and its page."""
