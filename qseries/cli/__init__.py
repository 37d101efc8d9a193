"""The command-line interface (nothing imports it)."""
