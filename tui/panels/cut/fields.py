"""Fields the Cut panel's modes share, and how they become CLI options."""

from __future__ import annotations

from tui.widgets.field import Field
from tui.widgets.readers import angle_or_length, velocity_reader


def velocity_options(form, text: str) -> list[str]:
    """A "cable or velocity" field as the CLI's --cable / --vf."""
    read = velocity_reader(lambda: form.catalog)(text, "cable or velocity")
    if read.cable is not None:
        form.app.remember_cable(read.cable.id)
        return [f"--cable={read.cable.id}"]
    return [f"--vf={read.velocity.vf!r}"]


def electrical_options(text: str) -> list[str]:
    """An "electrical length (or piece length)" field as --degrees or --length."""
    kind, _value = angle_or_length(text, "electrical length")
    return [f"--degrees={text}" if kind == "angle" else f"--length={text}"]


def cable_field(form, name: str) -> Field:
    return Field(name, "cable or velocity", reader=velocity_reader(lambda: form.catalog),
                 value=form.app.prefs.last_cable, placeholder="rg213, 0.66, 66 %...")


def frequency_field(name: str) -> Field:
    return Field(name, "frequency", kind="frequency")
