"""The session: what wires the instruments and the typed values to the model, and logs them."""
