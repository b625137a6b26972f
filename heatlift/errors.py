"""Domain errors raised by the engine.

Each carries the offending values in SI base units together with their kind (the names used by
the unit layer: ``temperature``, ``pressure`` ...), so that the web layer can render the message
in the caller's units. The engine never formats a number with a unit itself.
"""

from __future__ import annotations

from dataclasses import dataclass, field


@dataclass(frozen=True)
class SIValue:
    """A number in SI base units and the kind of quantity it is."""

    value: float
    kind: str


class HeatliftError(Exception):
    """Base of all engine errors.

    ``message`` is a template with ``{name}`` placeholders, filled from ``values`` (each an
    :class:`SIValue`) after the web layer has converted them to the caller's units. ``field`` is
    the request field the error belongs to, when the engine knows it.
    """

    status = 422
    title = "Not computable"

    def __init__(
        self,
        message: str,
        values: dict[str, SIValue] | None = None,
        field: str | None = None,
    ) -> None:
        self.message = message
        self.values = values or {}
        self.field = field
        super().__init__(self.render_si())

    def render(self, fmt) -> str:  # type: ignore[no-untyped-def]
        """Fill the template with each value passed through ``fmt(SIValue) -> str``."""
        return self.message.format(**{k: fmt(v) for k, v in self.values.items()})

    def render_si(self) -> str:
        return self.render(lambda v: f"{v.value:.6g} (SI {v.kind})")


class UnknownRefrigerant(HeatliftError):
    """A designation that is not in the catalogue; ``suggestions`` lists close matches."""

    status = 404
    title = "Unknown refrigerant"

    def __init__(self, designation: str, suggestions: list[str]) -> None:
        self.designation = designation
        self.suggestions = suggestions
        hint = f" Close matches: {', '.join(suggestions)}." if suggestions else ""
        # the designation is caller text: escape its braces before it enters the format()
        # template (``R{x}`` must not be read as a placeholder)
        quoted = designation.replace("{", "{{").replace("}", "}}")
        super().__init__(
            f"'{quoted}' is not in the refrigerant catalogue.{hint} "
            "GET /v1/refrigerants lists every designation.",
            field="refrigerant",
        )


class OutOfRange(HeatliftError):
    """A value outside the range where the physics (or the property model) is defined."""

    title = "Outside the valid range"


class InvalidInput(HeatliftError):
    """Inputs that are each valid but do not fit together (e.g. evaporating above condensing)."""

    title = "Inputs do not fit together"


class NotConverged(HeatliftError):
    """A solver that did not reach its tolerance within its iteration budget."""

    title = "Solver did not converge"


class PropertyFailure(HeatliftError):
    """The property library could not evaluate a state; its own message is never shown raw."""

    title = "Property evaluation failed"


@dataclass(frozen=True)
class Remark:
    """A reviewer's remark on a result that is still returned (it lands in ``meta.warnings``).

    ``message`` is a template like the errors' one, filled from ``values`` in the caller's units.
    """

    code: str
    message: str
    values: dict[str, SIValue] = field(default_factory=dict)

    def render(self, fmt) -> str:  # type: ignore[no-untyped-def]
        return self.message.format(**{k: fmt(v) for k, v in self.values.items()})
