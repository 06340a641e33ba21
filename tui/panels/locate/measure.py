"""Measure a cable's velocity factor: a known length (or a reel) and the delay
of its far end, or a cut stub and its low-impedance resonance; keep the result
as a cable of your own."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding

from tui.widgets.field import Field
from tui.widgets.form import LiveForm
from tui.widgets.readers import choice, delay_or_resonance, whole_number
from tui.widgets.result_view import ResultView


def _length_tolerance(text: str, label: str):
    """``"1 cm"`` or ``"0.5 %"``; kept as text until the length is known."""
    return text.strip()


class MeasureForm(LiveForm):
    """Length, the reading (delay or resonance), how the length was read."""

    LOG_KIND = "calibrate"
    BINDINGS = [Binding("ctrl+n", "keep", "Keep as cable", id="locate.keep_vf")]

    def compose(self) -> ComposeResult:
        yield Field("locate-vf-length", "length", kind="length",
                    placeholder="e.g. 10 m or 32 ft 9 in")
        yield Field("locate-vf-reading", "delay or resonance", reader=delay_or_resonance,
                    placeholder="far end e.g. 101 ns, or stub e.g. 24.7 MHz")
        yield Field("locate-vf-length-from", "length read from", reader=choice("tape", "reel"),
                    value="tape", tooltip="tape: measured, 0.5 % by default; "
                                         "reel: printed on the reel, 2 % by default")
        yield Field("locate-vf-end", "stub end", reader=choice("open", "short"), value="open",
                    tooltip="for a resonance: the stub's far end")
        yield Field("locate-vf-order", "resonance order", reader=whole_number(1, 50, "1"),
                    value="1", tooltip="for a resonance: 1 for the lowest dip")
        yield Field("locate-vf-length-tolerance", "length tolerance", reader=_length_tolerance,
                    optional=True, placeholder="default; or e.g. 1 cm, 0.5 %")
        yield ResultView()

    def compute(self, values):
        from calc import calibrate as core
        from tui.commands.calibrate import _length_tolerance_m

        length_m = values["locate-vf-length"]
        tol_text = values["locate-vf-length-tolerance"]
        tol_m = _length_tolerance_m(tol_text, length_m) if tol_text else None
        kind, reading = values["locate-vf-reading"]
        if kind == "delay":
            method = core.vf_from_reel if values["locate-vf-length-from"] == "reel" \
                else core.vf_from_delay
            return method(length_m, reading, tol_m)
        return core.vf_from_stub(length_m, reading, values["locate-vf-end"],
                                 values["locate-vf-order"], tol_m)

    def describe(self, result):
        from tui.commands.calibrate import describe_calibration

        lines = describe_calibration(result, self.units, self.fraction)
        return "\n".join(lines + ["Ctrl+N keeps this VF as a cable of your own."])

    def action_keep(self) -> None:
        """Open the new-cable dialog with this measurement filled in."""
        if self.last_result is None or self.result_view().is_stale:
            self.app.notify("Nothing to keep: the result is missing or out of date.",
                            severity="warning")
            return
        from tui.panels.cables.editor import CableEditor, measured_values

        def saved(cable_id: str | None) -> None:
            if cable_id:
                self.app.reload_catalog()
                self.app.notify(f"Saved {cable_id} to your cable file")

        self.app.push_screen(CableEditor(self.catalog, values=measured_values(self.last_result)),
                             saved)
