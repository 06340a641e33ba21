"""Cut panel: lines of a given electrical length as a tape measure shows them:
cut length, quarter-wave transformer, phasing harness, trimming a piece cut
long, and stubs. Each mode is the matching CLI command's options as fields
(see :mod:`tui.widgets.command_form`), so it shows what the command prints."""

from __future__ import annotations

KEY = "x"
ORDER = 2
TITLE = "Cut"
DESCRIPTION = "cut lists: electrical length to tape length, transformer, harness, trim, stubs"
LOG_KINDS = ("cut", "match", "harness", "trim", "stub")
#: An invented job: a two-antenna 2 m band array at the (invented) Marsh Lane relay site.
DEMO = {
    "cut-len-frequency": "146 MHz",
    "cut-len-degrees": "90",
    "cut-len-cable": "rg213",
    "cut-len-allowance": "15 mm",
    "cut-match-from": "50 ohm",
    "cut-match-to": "100 ohm",
    "cut-match-frequency": "146 MHz",
    "cut-match-band": "144-148 MHz",
    "cut-harness-antennas": "2",
    "cut-harness-antenna-z": "50 ohm",
    "cut-harness-feed-z": "50 ohm",
    "cut-harness-frequency": "146 MHz",
    "cut-harness-span": "2.1 m",
    "cut-trim-frequency": "146 MHz",
    "cut-trim-degrees": "90",
    "cut-trim-length": "360 mm",
    "cut-trim-measured": "3.62 ns",
    "cut-stub-frequency": "146 MHz",
    "cut-stub-cable": "rg213",
    "cut-stub-end": "short",
    "cut-stub-present": "open",
}

MODES = [
    ("len", "Cut length", "tui.panels.cut.length:CutLengthForm"),
    ("match", "Transformer", "tui.panels.cut.transformer:TransformerForm"),
    ("harness", "Harness", "tui.panels.cut.harness:HarnessForm"),
    ("trim", "Trim", "tui.panels.cut.trim:TrimForm"),
    ("stub", "Stub", "tui.panels.cut.stub:StubForm"),
]


#: The widget, imported when the panel is first mounted (after the first frame).
PANEL = "tui.panels.cut.panel:Panel"
