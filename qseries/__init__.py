"""qseries."""
