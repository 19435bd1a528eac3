"""Subcommands of the pitchline command line, one module each with register() and run()."""
