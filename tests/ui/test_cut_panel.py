"""Cut panel: each mode shows exactly what its CLI command prints for the same
inputs, plus values worked by hand from the SI definition of c0."""

from __future__ import annotations

from textual.widgets import Static
from uihelp import cli_text, started, type_into

from calc.constants import C0_M_PER_S
from tui.app import create_app
from tui.widgets.result_view import ResultView


async def run_mode(mode_key: str, form: str, inputs: dict[str, str]) -> tuple[str, object]:
    app = create_app(start_panel="cut")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await pilot.press("escape", mode_key)
        await pilot.pause()
        for field_id, text in inputs.items():
            await type_into(pilot, field_id, text)
        view = app.query_one(f"{form} ResultView", ResultView)
        return str(view.render()), view


async def test_cut_length_is_the_cli_output(capsys):
    expected = cli_text(capsys, "cut", "--frequency", "146 MHz", "--degrees", "90",
                        "--cable", "rg58", "--allowance", "15 mm")
    shown, _ = await run_mode("1", "CutLengthForm", {
        "cut-len-frequency": "146 MHz", "cut-len-degrees": "90", "cut-len-cable": "rg58",
        "cut-len-allowance": "15 mm"})
    assert shown == expected
    # a quarter wave at 146 MHz in VF 0.66 line: 0.25 x 0.66 c0 / f = 338.8 mm (c0 exact)
    assert round(0.25 * 0.66 * C0_M_PER_S / 146e6 * 1000) == 339
    assert "339 mm" in shown and "309 mm" in shown  # less two 15 mm connector allowances


async def test_piece_length_gives_its_electrical_length(capsys):
    expected = cli_text(capsys, "cut", "--frequency", "146 MHz", "--length", "339 mm",
                        "--vf", "0.66")
    shown, _ = await run_mode("1", "CutLengthForm", {
        "cut-len-frequency": "146 MHz", "cut-len-degrees": "339 mm", "cut-len-cable": "0.66"})
    assert shown.splitlines()[0] == expected.splitlines()[0]  # "... is 90.xx deg"


async def test_transformer_is_the_cli_output(capsys):
    expected = cli_text(capsys, "match", "--from", "50 ohm", "--to", "100 ohm",
                        "--frequency", "146 MHz")
    shown, _ = await run_mode("2", "TransformerForm", {
        "cut-match-from": "50 ohm", "cut-match-to": "100 ohm", "cut-match-frequency": "146 MHz"})
    assert shown == expected
    # Z_T = sqrt(Z_in Z_load) = sqrt(50 x 100) = 70.71 ohm (quarter-wave transformer relation)
    assert "ideal line impedance 70.71 ohm" in shown


async def test_trim_is_the_cli_output(capsys):
    expected = cli_text(capsys, "trim", "--frequency", "146 MHz", "--degrees", "90",
                        "--length", "360 mm", "--measured-delay", "3.62 ns")
    shown, _ = await run_mode("4", "TrimForm", {
        "cut-trim-frequency": "146 MHz", "cut-trim-degrees": "90", "cut-trim-length": "360 mm",
        "cut-trim-measured": "3.62 ns"})
    assert shown == expected


async def test_stub_is_the_cli_output(capsys):
    expected = cli_text(capsys, "stub", "--frequency", "146 MHz", "--cable", "rg213",
                        "--end", "short", "--present", "open")
    shown, _ = await run_mode("5", "StubForm", {
        "cut-stub-frequency": "146 MHz", "cut-stub-cable": "rg213", "cut-stub-end": "short",
        "cut-stub-present": "open"})
    assert shown == expected


async def test_harness_is_the_cli_output(capsys):
    expected = cli_text(capsys, "harness", "--antennas", "2", "--antenna-z", "50 ohm",
                        "--feed-z", "50 ohm", "--frequency", "146 MHz", "--span", "2.1 m")
    shown, _ = await run_mode("3", "HarnessForm", {
        "cut-harness-antennas": "2", "cut-harness-antenna-z": "50 ohm",
        "cut-harness-feed-z": "50 ohm", "cut-harness-frequency": "146 MHz",
        "cut-harness-span": "2.1 m"})
    assert shown == expected


async def test_option_refused_by_the_command_shows_beside_its_field():
    app = create_app(start_panel="cut")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await type_into(pilot, "cut-len-frequency", "146 MHz")
        await type_into(pilot, "cut-len-degrees", "90")
        await type_into(pilot, "cut-len-cable", "rg58")
        view = app.query_one("CutLengthForm ResultView", ResultView)
        assert not view.is_stale
        await type_into(pilot, "cut-len-span", "2.5 m")  # --span needs --kind
        field = app.query_one("#cut-len-kind").parent
        assert "transformer" in str(field.query_one(".field-error", Static).render())
        assert view.is_stale


async def test_units_switch_reruns_the_command_in_feet_and_inches(capsys):
    expected = cli_text(capsys, "cut", "--frequency", "146 MHz", "--degrees", "90",
                        "--cable", "rg58", "--units", "imperial")
    app = create_app(start_panel="cut")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        for field_id, text in {"cut-len-frequency": "146 MHz", "cut-len-degrees": "90",
                               "cut-len-cable": "rg58"}.items():
            await type_into(pilot, field_id, text)
        await pilot.press("f9")
        await pilot.pause()
        assert str(app.query_one("CutLengthForm ResultView").render()) == expected
