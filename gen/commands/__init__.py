"""Subcommands of the ``pitchline`` command line, one module each (``register`` + ``run``)."""
