"""qseries.cli.streams and the entry point: a reader that goes away (``qseries verify |
head``) ends the command with exit code 141, as SIGPIPE ends a shell tool, never with 1
(which means "the sides differ") and never with a traceback."""

import os
import subprocess
import sys

import pytest

from qseries.cli.streams import EXIT_PIPE_CLOSED, stdout_console


@pytest.mark.parametrize("args", [
    ["list"],                                            # a rich table
    ["verify", "--only", "euler-pentagonal", "-n", "20"],  # rich, line by line
    ["expand", "1/(1-q)", "-n", "5"],                    # plain text (typer's echo)
    ["check", "1", "1", "-n", "5"],                      # would be 0
    ["check", "1", "2", "-n", "5"],                      # would be 1
])
def test_a_closed_pipe_gives_its_own_exit_code(args):
    read, write = os.pipe()
    os.close(read)                  # the reader is gone before the first line is written
    try:
        done = subprocess.run([sys.executable, "-m", "qseries", *args], stdout=write,
                              stderr=subprocess.PIPE, timeout=120)
    finally:
        os.close(write)
    assert done.returncode == EXIT_PIPE_CLOSED == 141
    assert b"Traceback" not in done.stderr


def test_the_console_writes_normally(capsys):
    stdout_console(width=30).print("AGREES")
    assert capsys.readouterr().out.strip() == "AGREES"
