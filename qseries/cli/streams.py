"""Standard output for the commands: a rich console that reports a closed pipe
(``qseries verify | head``) with its own exit code instead of rich's 1, which means
"differs" here.

>>> stdout_console().file is not None
True
"""

from __future__ import annotations

from typing import Any

#: exit code when the reader of standard output went away, as for a program that the signal
#: SIGPIPE ends: 128 + 13
EXIT_PIPE_CLOSED = 141


def stdout_console(**options: Any) -> Any:
    """A ``rich.console.Console`` on standard output whose broken pipe ends the command with
    exit code ``EXIT_PIPE_CLOSED`` (rich imported here, as the rest of the CLI does).

    >>> stdout_console(width=40).width
    40
    """
    from rich.console import Console

    class _Console(Console):
        def on_broken_pipe(self) -> None:
            try:
                super().on_broken_pipe()      # quiet from now on, stdout to /dev/null
            except SystemExit:
                raise SystemExit(EXIT_PIPE_CLOSED) from None

    return _Console(**options)
