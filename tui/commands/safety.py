"""``halftrip safety``: the cautions for work on lines that may be energized."""

from __future__ import annotations

from tui.commands.common import emit

NAME = "safety"
HELP = "show the safety cautions: all of them, or those for a hazard tag or topic"


def add_arguments(parser) -> None:
    from tui.safety import load_text  # a small TOML file, read once

    parser.add_argument("--tag", action="append", default=[], metavar="TAG",
                        choices=list(load_text().sections),
                        help="a hazard tag or a topic, repeat for several: "
                             + ", ".join(load_text().sections))
    parser.add_argument("--json", action="store_true", help="print one JSON object on stdout")


def run(args) -> int:
    from tui import safety

    text = safety.load_text()
    sections = safety.cautions_for(args.tag) if args.tag else list(text.sections.values())
    data = {
        "text_version": text.version,
        "tags": list(args.tag),
        "sections": [safety.section_record(s) for s in sections],
        "precedence": text.precedence,
    }
    lines = [line for _kind, line in safety.text_lines(sections)]
    lines.append(f"(caution text version {text.version})")
    return emit(args, data, lines)
