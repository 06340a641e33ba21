"""The chosen cable in full: values, where they come from, hazards, notes."""

from __future__ import annotations

from textual.widgets import Static

from tui import fmt

HAZARD_WORDS = {
    "power": "mains or utility power",
    "telephone": "telephone pair (ringing voltage)",
    "plant-power": "powered coax plant",
    "poe": "Power over Ethernet",
    "rf-transmitter": "a transmitter may be connected",
    "stored-charge": "long cable may hold charge",
}


def describe(cable, catalog) -> str:
    """The detail lines for one cable (shared wording with ``halftrip cables show``)."""
    lines = [f"{cable.id}: {cable.description}"]
    dielectric = catalog.dielectrics.get(cable.dielectric) if cable.dielectric else None
    diel = f"   dielectric {dielectric.name}" if dielectric else ""
    lines.append(f"Z0 {fmt.impedance(cable.z0_ohm)}   VF {cable.vf:.3f} "
                 f"+/- {cable.vf_tolerance * 100:.0f} %   NVP {cable.vf * 100:.1f} %{diel}")
    if cable.has_loss_model:
        at = cable.loss_db_per_m(100e6) * 100
        lines.append(f"loss about {at:.1f} dB per 100 m at 100 MHz (k1 {cable.atten_k1 or 0:g}, "
                     f"k2 {cable.atten_k2 or 0:g})")
    lines.append(f"source: {cable.source}")
    if cable.hazards:
        lines.append("hazards: " + "; ".join(HAZARD_WORDS.get(h, h) for h in cable.hazards))
    if cable.notes:
        lines.append(f"notes: {cable.notes}")
    lines.append("from your cable file" if cable.origin == "user" else "built-in entry")
    return "\n".join(lines)


class CableDetail(Static):
    """Shows one cable (or a hint when none is chosen)."""

    def show(self, cable, catalog) -> None:
        self.update(describe(cable, catalog) if cable is not None else "no cable matches")
