"""Give any command a converter spec: ``[SPEC.toml]`` plus one ``--<key>`` option per spec key.

Every key of :data:`partpick.design.spec.SPEC_KEYS` becomes an option that overrides the file
(``--vin-min 6``, ``--fsw "400 kHz"``, ``--ripple-ratio 0.2,0.4``); the file itself is an
optional argument, so a spec may also be given entirely on the command line. The options are
listed under their own "Spec" heading in ``--help``.

A command takes a spec with one decorator and one parameter, ``spec: Spec``::

    from partpick.cli.common import friendly_errors
    from partpick.cli.spec_options import with_spec_options
    from partpick.design.spec import Spec

    def register(app: typer.Typer) -> None:
        app.command("pick")(pick_command)

    @friendly_errors
    @with_spec_options
    def pick_command(spec: Spec, role: str, db: DbOption = None) -> None:
        result = pick(db, spec, role, ...)

The decorator replaces ``spec`` by an optional ``SPEC.toml`` argument at that position and
appends the spec options; it loads and validates the spec (a bad one prints one line and
exits 2) before the command body runs. Commands that build their parameters by hand can call
:func:`spec_from_options` instead.
"""

from __future__ import annotations

import functools
import inspect
from collections.abc import Callable, Mapping
from pathlib import Path
from typing import Annotated, Any, TypeVar

import typer

from partpick.cli.common import AllowUnusualOption, friendly_errors
from partpick.design.spec import REQUIRED, SPEC_KEYS, Spec, SpecKey, load_spec
from partpick.errors import SpecError
from partpick.ranges import unusual_spec_values
from partpick.units import dimension_name

F = TypeVar("F", bound=Callable[..., Any])

SPEC_PANEL = "Spec (each overrides SPEC.toml)"
SPEC_FILE_PARAMETER = "spec_file"
ALLOW_UNUSUAL_PARAMETER = "allow_unusual"
_OPTION_PREFIX = "spec_option_"

SpecFileArgument = Annotated[
    Path | None,
    typer.Argument(
        metavar="SPEC.toml",
        help="Converter spec file (TOML). Optional when every required key is given as an option.",
        show_default=False,
        dir_okay=False,
    ),
]


def option_flag(key: str) -> str:
    """Return the command-line flag of a spec key, e.g. ``vin_min`` -> ``--vin-min``."""
    return "--" + key.replace("_", "-")


def _parameter_name(key: str) -> str:
    return _OPTION_PREFIX + key


def _option_help(key: str, entry: SpecKey) -> str:
    if entry.unit is None:
        kind = "text"
    elif key == "ripple_ratio":
        kind = "two numbers lo,hi"
    else:
        kind = f"{dimension_name(entry.unit)}, a number or text with a unit"
    if entry.default is REQUIRED:
        default = "required"
    elif entry.default is None or entry.default == "":
        default = "optional"
    elif isinstance(entry.default, tuple):
        default = "default " + ",".join(f"{v:g}" for v in entry.default)
    else:
        default = f"default {entry.default}"
    return f"{entry.help[0].upper()}{entry.help[1:]}: {kind} ({default})."


def _spec_option_parameters() -> list[inspect.Parameter]:
    parameters = []
    for key, entry in SPEC_KEYS.items():
        option = typer.Option(
            option_flag(key),
            help=_option_help(key, entry),
            rich_help_panel=SPEC_PANEL,
            show_default=False,
        )
        parameters.append(
            inspect.Parameter(
                _parameter_name(key),
                inspect.Parameter.KEYWORD_ONLY,
                default=None,
                annotation=Annotated[str | None, option],
            )
        )
    return parameters


def spec_from_options(spec_file: str | Path | None, options: Mapping[str, object]) -> Spec:
    """Return the validated spec of ``spec_file`` with ``options`` (spec keys -> text) on top.

    Options whose value is None were not given. Raises SpecError naming the key at fault.
    """
    return load_spec(spec_file, {key: value for key, value in options.items() if value is not None})


def checked_spec(
    spec_file: str | Path | None, options: Mapping[str, object], allow_unusual: bool
) -> Spec:
    """Return the spec, refusing values outside the plausibility ranges unless allowed.

    Allowed unusual values are named on stderr as warnings.
    """
    spec = spec_from_options(spec_file, options)
    for unusual in unusual_spec_values(spec_values(spec)):
        if not allow_unusual:
            raise SpecError(
                key=unusual.name,
                reason=f"{unusual.sentence()}; check the unit, or pass --allow-unusual",
                file=spec.source,
            )
        typer.echo(f"warning: spec key {unusual.name!r}: {unusual.sentence()}", err=True)
    return spec


def spec_values(spec: Spec) -> dict[str, float | None]:
    """Return the spec's numbers by spec key; the pair ``ripple_ratio`` as ``_lo``/``_hi``."""
    values = {
        key: getattr(spec, entry.attribute)
        for key, entry in SPEC_KEYS.items()
        if entry.unit is not None and isinstance(entry.attribute, str)
    }
    values.update(ripple_ratio_lo=spec.ripple_ratio_lo, ripple_ratio_hi=spec.ripple_ratio_hi)
    return values


def with_spec_options(command: F) -> F:
    """Replace the ``spec: Spec`` parameter of a typer command by SPEC.toml plus spec options."""
    signature = inspect.signature(command, eval_str=True)
    if "spec" not in signature.parameters:
        raise TypeError(f"{command.__name__} needs a parameter 'spec: Spec'")
    parameters: list[inspect.Parameter] = []
    for parameter in signature.parameters.values():
        if parameter.name == "spec":
            parameters.append(
                inspect.Parameter(
                    SPEC_FILE_PARAMETER,
                    inspect.Parameter.KEYWORD_ONLY,
                    default=None,
                    annotation=SpecFileArgument,
                )
            )
        else:
            # typer calls with keywords only, so keyword-only keeps any order of defaults legal.
            parameters.append(parameter.replace(kind=inspect.Parameter.KEYWORD_ONLY))
    parameters.extend(_spec_option_parameters())
    parameters.append(
        inspect.Parameter(
            ALLOW_UNUSUAL_PARAMETER,
            inspect.Parameter.KEYWORD_ONLY,
            default=False,
            annotation=AllowUnusualOption,
        )
    )

    @functools.wraps(command)
    def wrapper(**kwargs: Any) -> Any:
        spec_file = kwargs.pop(SPEC_FILE_PARAMETER, None)
        options = {key: kwargs.pop(_parameter_name(key), None) for key in SPEC_KEYS}
        allow = kwargs.pop(ALLOW_UNUSUAL_PARAMETER, False)
        kwargs["spec"] = friendly_errors(checked_spec)(spec_file, options, allow)
        return command(**kwargs)

    new_signature = signature.replace(parameters=parameters)
    wrapper.__signature__ = new_signature  # type: ignore[attr-defined]
    wrapper.__annotations__ = {p.name: p.annotation for p in parameters}
    if signature.return_annotation is not inspect.Signature.empty:
        wrapper.__annotations__["return"] = signature.return_annotation
    return wrapper  # type: ignore[return-value]
