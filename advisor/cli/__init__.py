"""Command line: parsing here, running in the engine; one module per command (``cmd_*.py``)."""
