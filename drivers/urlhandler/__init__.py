"""pyserial URL handlers of our own (``serial.protocol_handler_packages``)."""
