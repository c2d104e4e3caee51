#!/usr/bin/env python3
"""make-manpage.py CLI OUTPUT VERSION: writes starledger-cli(1) in roff from
the program's own --help and each command's --help, so the manual and the
program cannot disagree.  Run by meson at build time (src/cli/meson.build)."""

import datetime
import os
import re
import subprocess
import sys


def run_help(cli, *args):
    env = dict(os.environ, LC_ALL="C.UTF-8", LANGUAGE="", LANG="C.UTF-8")
    done = subprocess.run([cli, *args, "--help"], capture_output=True, text=True, env=env, check=True)
    return done.stdout


def roff_escape(text):
    text = text.replace("\\", "\\e").replace("-", "\\-")
    text = "".join(c if ord(c) < 128 else "\\[u%04X]" % ord(c) for c in text)
    # A line that begins with . or ' would be a roff request.
    return re.sub(r"^([.'])", r"\\&\1", text, flags=re.M)


def commands_of(top_help):
    commands, inside = [], False
    for line in top_help.splitlines():
        if line.startswith("Commands:"):
            inside = True
            continue
        if inside:
            match = re.match(r"^  (\S+)\s+(.*)$", line)
            if not match:
                break
            commands.append((match.group(1), match.group(2)))
    return commands


def option_lines(block):
    """'  -m, --map=X   Text' lines -> (flags, text) pairs."""
    for line in block:
        match = re.match(r"^  (-\S.*?)\s{2,}(.*)$", line)
        if match:
            yield match.group(1), match.group(2)


def command_section(cli, name, summary):
    text = run_help(cli, name)
    lines = text.splitlines()
    usage = next((l.strip() for l in lines if l.strip().startswith("starledger-cli")), "")
    out = [".SS " + roff_escape(name), ".B " + roff_escape(usage), ".PP", roff_escape(summary)]
    # Options: everything under "Application Options:"; other blocks after
    # it (fields, units, notes) are kept as text.
    blocks, current = [], None
    for line in lines:
        if re.match(r"^\S.*:$", line):
            current = [line[:-1], []]
            blocks.append(current)
        elif current is not None:
            current[1].append(line)
    for title, body in blocks:
        if title == "Application Options":
            options = dict(option_lines(body))
            notes = [l.strip() for l in body
                     if l.strip() and not re.match(r"^  -\S", l)]
            for flags, help_text in options.items():
                out += [".TP", ".B " + roff_escape(flags), roff_escape(help_text)]
            if notes:
                out += [".PP"] + [roff_escape(l) for l in notes]
        elif title not in ("Usage", "Help Options"):
            # A table (fields and their units) keeps its lines.
            out += [".PP", roff_escape(title) + ":", ".nf"]
            out += [roff_escape(l.strip()) for l in body if l.strip()]
            out += [".fi"]
    return out


def main():
    cli, output, version = sys.argv[1:4]
    top = run_help(cli)
    description = top.split("\n\n")[1].strip()
    # Reproducible: the date only when the build gives one.
    epoch = os.environ.get("SOURCE_DATE_EPOCH")
    date = datetime.datetime.utcfromtimestamp(int(epoch)).strftime("%Y-%m-%d") if epoch else ""
    page = [
        '.TH STARLEDGER\\-CLI 1 "%s" "Starledger %s" "User Commands"' % (date, version),
        ".SH NAME",
        "starledger\\-cli \\- " + roff_escape(description[0].lower() + description[1:].rstrip(".")),
        ".SH SYNOPSIS",
        ".B starledger\\-cli",
        ".I COMMAND",
        "[\\fIOPTION\\fR...]",
        ".SH DESCRIPTION",
        roff_escape(description),
        "A project is one SQLite file (by convention named *.starledger) holding the measurements, "
        "where each came from, the derived values with their uncertainties, the derivation runs "
        "and an audit log.  The window, \\fBstarledger\\fR(1), works on the same files.",
        ".SH COMMANDS",
    ]
    for name, summary in commands_of(top):
        page += command_section(cli, name, summary)
    page += [
        ".SH EXIT STATUS",
        "0 on success; 1 when the command could not do its work (a one-line message on standard "
        "error names the file, line and column or the value at fault); 2 on bad usage.",
        ".SH ENVIRONMENT",
        ".TP",
        ".B LANGUAGE, LC_MESSAGES",
        "The language of messages.  Numbers in files are always written with a decimal point.",
        ".SH SEE ALSO",
        "\\fBstarledger\\fR(1), \\fBsqlite3\\fR(1).  The README describes the methods, their "
        "citations and validity ranges.",
    ]
    with open(output, "w", encoding="utf-8") as f:
        f.write("\n".join(page) + "\n")


main()
