"""Shared test settings: hypothesis profiles (more examples in CI).

The profile "ci" (200 examples per property) is loaded when the environment variable CI is set
to anything non-empty, "dev" (60) otherwise; tests/test_differential.py follows the same
variable (300 evaluations and 200 checks, or 100 and 66).  `.ci/run` does not set CI itself:
the CI service must (most set CI=true), or run `CI=1 .ci/run`.
"""

import os

import typer.testing
from hypothesis import HealthCheck, settings

settings.register_profile("dev", max_examples=60, deadline=None)
settings.register_profile("ci", max_examples=200, deadline=None,
                          suppress_health_check=[HealthCheck.too_slow])
settings.load_profile("ci" if os.environ.get("CI") else "dev")


# typer's CliRunner rebuilds the click command from the app's type hints at every invoke
# (about 9 ms, some 500 times in this suite): build it once per app.  The command is stateless
# (each invoke makes a new click context, and the command functions read the module globals
# that tests monkeypatch at call time).
# (typer.testing holds typer.main.get_command as _get_command, as in typer 0.28; a typer
# without that name keeps its own runner)
_built_commands: dict[int, tuple] = {}
_build_command = getattr(typer.testing, "_get_command", None)


def _cached_command(app):
    key = id(app)
    if key not in _built_commands:
        _built_commands[key] = (app, _build_command(app))    # keep app alive: ids stay unique
    return _built_commands[key][1]


if _build_command is not None:
    typer.testing._get_command = _cached_command
