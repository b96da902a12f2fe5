"""Subcommands of the ``plait`` command line, one module each (discovered by plait.cli)."""
