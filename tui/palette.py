"""Command palette entries (Ctrl+P): every panel, the unit system, the theme,
the keys. Titles carry a prefix ("Panel:", "Units:") so related commands sort
together and a typed word finds them."""

from __future__ import annotations

from functools import partial

from textual.command import DiscoveryHit, Hit, Hits, Provider


class HalftripCommands(Provider):
    """The palette's halftrip commands (panels first)."""

    def _commands(self) -> list[tuple[str, object, str]]:
        app = self.app
        out = []
        for spec in app.PANELS:
            out.append((f"Panel: {spec.title}", partial(app.run_action, f"open_panel('{spec.name}')"),
                        f"{spec.description} ({spec.function_key.upper()}, or {spec.key} "
                        "outside a field)"))
        other = "feet and inches" if app.prefs.units == "metric" else "metres"
        out.append((f"Units: show lengths in {other}", app.action_switch_units,
                    "applies to every panel at once and is remembered (u)"))
        for fraction in (8, 16, 32):
            out.append((f"Units: feet and inches to 1/{fraction} in",
                        partial(app.set_units, "imperial", fraction),
                        "the tape fraction imperial lengths are rounded to"))
        out.append(("Units: metres", partial(app.set_units, "metric"), "lengths in m and mm"))
        out.append(("Safety: mark the shown line possibly live", app.action_mark_possibly_live,
                    "keeps the warning line on for this panel's line; again to unmark (!)"))
        out.append(("Theme: switch dark / light", app.action_switch_theme, "(d)"))
        out.append(("Help: every key", app.action_help, "(F1)"))
        return out

    async def discover(self) -> Hits:
        for title, callback, help_text in self._commands():
            yield DiscoveryHit(title, callback, help=help_text)

    async def search(self, query: str) -> Hits:
        matcher = self.matcher(query)
        for title, callback, help_text in self._commands():
            score = matcher.match(title)
            if score > 0:
                yield Hit(score, matcher.highlight(title), callback, help=help_text)
