"""``halftrip velocity``: one propagation speed in every convention."""

from __future__ import annotations

from tui.commands.common import add_output_options, add_velocity_options, emit, resolve_velocity

NAME = "velocity"
HELP = "convert a propagation speed between VF, NVP, eps_r, delay per length, velocity and V/2"


def add_arguments(parser) -> None:
    add_velocity_options(parser, required=True)
    add_output_options(parser)


def describe(v) -> list[str]:
    """The human lines for a :class:`calc.velocity.Velocity` (shared with the TUI)."""
    from calc.constants import FOOT_M
    from tui import fmt

    return [
        f"velocity factor      {fmt.vf(v.vf, 4)}",
        f"NVP                  {v.nvp_percent:.2f} %",
        f"eps_r (effective)    {v.eps_r:.4f}",
        f"delay per length     {v.delay_per_length_s_per_m * 1e9:.4f} ns/m"
        f"   {v.delay_per_length_s_per_m * FOOT_M * 1e9:.4f} ns/ft",
        f"velocity             {v.velocity_m_per_s / 1e6:.3f} m/us"
        f"   {v.velocity_m_per_s / FOOT_M / 1e9:.4f} ft/ns",
        f"half velocity V/2    {v.half_velocity_m_per_s / 1e6:.3f} m/us",
    ]


def run(args) -> int:
    resolved = resolve_velocity(args)
    v = resolved.velocity
    data = {
        "vf": v.vf,
        "nvp_percent": v.nvp_percent,
        "eps_r": v.eps_r,
        "delay_per_length_s_per_m": v.delay_per_length_s_per_m,
        "velocity_m_per_s": v.velocity_m_per_s,
        "half_velocity_m_per_s": v.half_velocity_m_per_s,
        "source": resolved.source,
    }
    return emit(args, data, [f"from {resolved.source}"] + describe(v))
