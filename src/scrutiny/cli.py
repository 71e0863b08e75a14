"""The command line: a thin shell over `scrutiny.api`.

    scrutiny check PATH... [--format text|json|csv|sarif|html] [--output FILE]
                           [--alpha A] [--fail-on SEVERITY] [--sesoi MEASURE=VALUE]...
    scrutiny screen PATH... --store FILE [--workers N] [--dask ADDRESS] [--restart]
                           [--format text|json|csv] [--output FILE]
    scrutiny summary FILE [--format text|json|csv] [--output FILE]
                           the corpus view of a screening store (csv: its results, a row each)
    scrutiny checks        list every check with the statistics behind it

Exit codes: 0 no flag at or above --fail-on; 1 flags at or above it; 2 bad usage, or an input
that could not be read (the other inputs are still checked and reported).
"""

from __future__ import annotations

import argparse
import io
import os
import sys
from typing import Sequence, TextIO

from . import __version__
from .api import annotate, check_paths
from .check import REGISTRY
from .errors import ScrutinyError, UsageError
from .files import replace_atomically
from .model import Run, Settings, Severity
from .report import FORMATS, SUMMARY_FORMATS, render
from .report.csv import write_rows
from .report.summary import render_summary
from .screen import screen, stored_documents, summarise

EXIT_OK, EXIT_FLAGS, EXIT_USAGE = 0, 1, 2
_SESOI_KEYS = {"d": "sesoi_d", "r": "sesoi_r", "eta2": "sesoi_eta2", "w": "sesoi_w"}


class _Parser(argparse.ArgumentParser):
    """argparse that reports bad usage in one line and raises instead of exiting."""

    def error(self, message: str) -> None:  # type: ignore[override]
        raise UsageError(f"{message} (see '{self.prog} --help')")


def _probability(text: str) -> float:
    try:
        value = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"not a number: {text!r}") from None
    if not 0.0 < value < 1.0:
        raise argparse.ArgumentTypeError(f"must lie strictly between 0 and 1, got {text}")
    return value


def _positive(text: str) -> float:
    try:
        value = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"not a number: {text!r}") from None
    if not value > 0:
        raise argparse.ArgumentTypeError(f"must be positive, got {text}")
    return value


def _positive_int(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"not a whole number: {text!r}") from None
    if value < 1:
        raise argparse.ArgumentTypeError(f"must be at least 1, got {text}")
    return value


def _sesoi(text: str) -> tuple[str, float]:
    key, _, value = text.partition("=")
    key = key.strip().lower()
    if key not in _SESOI_KEYS or not value:
        raise argparse.ArgumentTypeError(
            f"expected MEASURE=VALUE with MEASURE one of {', '.join(_SESOI_KEYS)}, got {text!r}")
    try:
        number = float(value)
    except ValueError:
        raise argparse.ArgumentTypeError(f"not a number: {value!r}") from None
    if number <= 0:
        raise argparse.ArgumentTypeError(f"must be positive, got {value}")
    return key, number


def build_parser() -> tuple[argparse.ArgumentParser, dict[str, argparse.ArgumentParser]]:
    """The top-level parser and one parser per command."""
    parser = _Parser(prog="scrutiny", description="Check the statistics reported in "
                     "scientific manuscripts.")
    parser.add_argument("--version", action="version", version=f"scrutiny {__version__}")
    commands = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    check = commands.add_parser(
        "check", help="find, recompute and check every reported test result",
        description="Find every reported test result in the manuscripts, recompute its "
                    "p-value and flag what does not add up.")
    check.add_argument("paths", nargs="+", metavar="PATH",
                       help="manuscript files, folders (searched recursively) or - for "
                            "standard input")
    check.add_argument("--format", choices=FORMATS, default="text",
                       help="report format: a terminal table, JSON (the machine contract), CSV "
                            "(a row per result), SARIF 2.1.0 or a self-contained HTML page "
                            "(default: text)")
    _output_option(check)
    check.add_argument("--annotate", metavar="FOLDER", default=None,
                       help="also write a copy of every PDF and Word document with flags "
                            "into FOLDER, each flagged result highlighted (PDF) or commented "
                            "(Word) with its messages (NAME.scrutiny.pdf, NAME.scrutiny.docx); "
                            "FOLDER may not lie in an input folder")
    check.add_argument("--fail-on", choices=[s.label for s in Severity] + ["never"],
                       default="error",
                       help="exit with 1 when a flag of this severity or higher is raised "
                            "(default: error)")
    _settings_options(check)
    screen = commands.add_parser(
        "screen", help="check a journal issue or corpus in parallel into a resumable store",
        description="Check every manuscript under the paths in parallel, store each result in "
                    "an SQLite file as soon as it is done (run again to resume), and summarise "
                    "the corpus: flags per check, p-curve and caliper tests.")
    screen.add_argument("paths", nargs="+", metavar="PATH", help="manuscript files or folders")
    screen.add_argument("--store", required=True, metavar="FILE",
                        help="the SQLite file of the screening (created if missing)")
    screen.add_argument("--workers", type=_positive_int, default=None, metavar="N",
                        help="worker processes (default: one per core)")
    screen.add_argument("--dask", metavar="ADDRESS", default=None,
                        help="run on the Dask cluster at ADDRESS (tcp://host:8786), or 'local' "
                             "for a Dask cluster on this machine")
    screen.add_argument("--restart", action="store_true",
                        help="check every document again, also those already stored")
    screen.add_argument("--format", choices=SUMMARY_FORMATS, default="text",
                        help="summary format; csv gives the screening's results, a row each "
                             "(default: text)")
    _output_option(screen)
    _settings_options(screen)
    summary = commands.add_parser(
        "summary", help="summarise a screening store (flags, p-curve, caliper)",
        description="Summarise the documents of a screening store.")
    summary.add_argument("store", metavar="FILE", help="the SQLite file of a screening")
    summary.add_argument("--format", choices=SUMMARY_FORMATS, default="text",
                         help="summary format; csv gives the screening's results, a row each "
                              "(default: text)")
    _output_option(summary)
    checks = commands.add_parser("checks", help="list every check and the statistics behind it",
                                 description="List every check scrutiny runs.")
    return parser, {"check": check, "checks": checks, "screen": screen, "summary": summary}


def _output_option(command: argparse.ArgumentParser) -> None:
    command.add_argument("-o", "--output", metavar="FILE", default=None,
                         help="write the report to FILE (UTF-8) instead of standard output; "
                              "FILE is replaced only once the report is complete, and may not "
                              "be an input or lie in an input folder")


def _settings_options(command: argparse.ArgumentParser) -> None:
    """The options that set `Settings`, shared by check and screen."""
    command.add_argument("--alpha", type=_probability, default=0.05,
                         help="significance level for decision flips and effects (default: .05)")
    command.add_argument("--sesoi", type=_sesoi, action="append", default=[],
                         metavar="MEASURE=VALUE",
                         help="smallest effect size of interest, e.g. d=0.3, r=0.1, eta2=0.01, "
                              "w=0.1 (defaults: Cohen's small effects); may be repeated")
    command.add_argument("--integer-scales", action="store_true",
                         help="treat every mean as a mean of integer responses (GRIM, GRIMMER), "
                              "also where the text does not say the measure is integer-valued")
    command.add_argument("--prior-scale", type=_positive, default=0.7071067811865476,
                         metavar="R",
                         help="scale of the Cauchy prior on the standardised effect for the JZS "
                              "Bayes factor (default: sqrt(2)/2 = 0.707)")
    command.add_argument("--prior-null", type=_probability, default=0.5, metavar="PI0",
                         help="prior probability of the null hypothesis for the posterior "
                              "probabilities (default: 0.5)")
    command.add_argument("--time-limit", type=_positive, default=120.0, metavar="SECONDS",
                         help="give up on a PDF, Word or markup file after this long "
                              "(default: 120)")
    command.add_argument("--memory-limit", type=_positive, default=2048.0, metavar="MB",
                         help="give up on a PDF, Word or markup file that needs more memory "
                              "than this (default: 2048)")


def parse_arguments(argv: Sequence[str]) -> argparse.Namespace:
    """Parse a command line; options and paths may come in any order after the command."""
    parser, commands = build_parser()
    if argv and argv[0] in commands:
        args = commands[argv[0]].parse_intermixed_args(argv[1:])
        args.command = argv[0]
        return args
    return parser.parse_args(argv)


def exit_code(run: Run, fail_on: str) -> int:
    """2 when an input could not be read, else 1 when a flag reaches `fail_on`, else 0."""
    if any(document.errors for document in run.documents):
        return EXIT_USAGE
    if fail_on == "never":
        return EXIT_OK
    threshold = Severity.from_label(fail_on)
    flagged = any(flag.severity >= threshold
                  for document in run.documents for claim in document.claims
                  for flag in claim.flags)
    return EXIT_FLAGS if flagged else EXIT_OK


def _refuse_output_among_inputs(output: str, inputs: Sequence[str],
                                option: str = "--output") -> None:
    """A report must never overwrite a manuscript, nor land where the next run would read it."""
    target = os.path.realpath(output)
    for given in inputs:
        if given == "-":
            continue
        source = os.path.realpath(given)
        if target == source:
            raise UsageError(f"{option} {output} is one of the inputs; choose another")
        if os.path.isdir(source) and os.path.commonpath([source, target]) == source:
            raise UsageError(f"{option} {output} lies in the input folder {given}; a later run "
                             f"would read what scrutiny writes there as a manuscript")
    if option == "--output" and os.path.isdir(target):
        raise UsageError(f"--output {output} is a folder; give a file name")
    if option == "--annotate" and os.path.exists(target) and not os.path.isdir(target):
        raise UsageError(f"--annotate {output} is a file; give a folder")


def _annotate(run: Run, folder: str, settings: Settings, stderr: TextIO) -> bool:
    """Annotated copies of the flagged PDF and Word documents, each reported in one line;
    False when one could not be written."""
    try:
        copies = annotate(run, folder, settings)
    except OSError as exc:
        raise UsageError(f"--annotate {folder}: cannot be created ({exc.strerror})") from None
    for copy in copies:
        if copy.error is not None:
            stderr.write(f"scrutiny: {copy.error}\n")
            continue
        verb = "highlighted" if copy.target.endswith(".pdf") else "commented"
        stderr.write(f"scrutiny: {copy.target}: {copy.marked} flagged result"
                     f"{'s' if copy.marked != 1 else ''} {verb}"
                     + (f", {copy.missed} could not be placed in the text" if copy.missed else "")
                     + "\n")
    return all(copy.error is None for copy in copies)


def _deliver(text: str, output: str | None, stdout: TextIO) -> None:
    """Write a finished report to `output` in UTF-8, or to standard output.

    A regular file (or a new one) is replaced atomically: a temporary file beside it is put in
    its place once complete, so an interrupted run leaves the old report. Anything else that
    already exists (/dev/null, /dev/stdout, a named pipe) is written to as it is, never
    replaced. A symbolic link is followed."""
    if output is None:
        stdout.write(text)
        stdout.flush()
        return
    target = os.path.realpath(output)

    def write(path: str) -> None:
        with open(path, "w", encoding="utf-8", newline="") as stream:
            stream.write(text)

    try:
        if os.path.exists(target) and not os.path.isfile(target):
            write(target)  # a device or a pipe: written to, never replaced
        else:
            replace_atomically(target, write)
    except OSError as exc:
        raise UsageError(f"--output {output}: cannot be written ({exc.strerror})") from None


def _render_summary(args: argparse.Namespace, store: str, settings: Settings | None,
                    screening=None) -> str:
    buffer = io.StringIO()
    if args.format == "csv":
        write_rows((document.result for document in stored_documents(store, settings)), buffer)
    else:
        render_summary(summarise(store, settings), args.format, buffer, screening,
                       width=None if args.output is None else 120)
    return buffer.getvalue()


def _list_checks(stream: TextIO) -> None:
    for registered in REGISTRY.values():
        stream.write(f"{registered.id} ({registered.severity.label}): {registered.title}\n")
        for line in registered.explanation.splitlines():
            stream.write(f"    {line}\n")
        stream.write("\n")


def _screen(args: argparse.Namespace, settings: Settings, stdout: TextIO,
            stderr: TextIO) -> int:
    def progress(done: int, total: int, path: str, result: dict) -> None:
        if result.get("errors"):
            stderr.write(f"scrutiny: {path}: {result['errors'][0]}\n")
        elif getattr(stderr, "isatty", lambda: False)():
            stderr.write(f"\r[{done}/{total}] {len(result['claims'])} results: {path}"[:200])
            stderr.write("\033[K" if done < total else "\n")

    screening = screen(args.paths, args.store, settings, workers=args.workers,
                       scheduler=args.dask, resume=not args.restart, progress=progress)
    _deliver(_render_summary(args, args.store, settings, screening), args.output, stdout)
    return EXIT_OK


def main(argv: Sequence[str] | None = None, stdout: TextIO | None = None,
         stderr: TextIO | None = None) -> int:
    stdout = stdout or sys.stdout
    stderr = stderr or sys.stderr
    try:
        args = parse_arguments(list(sys.argv[1:] if argv is None else argv))
        if args.command is None:
            raise UsageError("a command is needed: 'scrutiny check PATH...' or 'scrutiny checks'"
                             " (see 'scrutiny --help')")
        if args.command == "checks":
            _list_checks(stdout)
            return EXIT_OK
        if args.command == "summary":
            if args.output is not None:
                _refuse_output_among_inputs(args.output, [args.store])
            _deliver(_render_summary(args, args.store, None), args.output, stdout)
            return EXIT_OK
        settings = Settings(alpha=args.alpha, integer_scales=args.integer_scales,
                            prior_scale=args.prior_scale,
                            prior_null=args.prior_null, time_limit=args.time_limit,
                            memory_limit_mb=int(args.memory_limit),
                            **{_SESOI_KEYS[key]: value for key, value in args.sesoi})
        if args.output is not None:
            _refuse_output_among_inputs(args.output, [*args.paths, *(
                [args.store] if args.command == "screen" else [])])
        if getattr(args, "annotate", None) is not None:
            _refuse_output_among_inputs(args.annotate, args.paths, "--annotate")
        if args.command == "screen":
            return _screen(args, settings, stdout, stderr)
        run = check_paths(args.paths, settings=settings)
        for document in run.documents:
            for error in document.errors:
                stderr.write(f"scrutiny: {document.path}: {error}\n")
        if args.output is None:
            render(run, args.format, stdout)
            stdout.flush()
        else:
            buffer = io.StringIO()
            render(run, args.format, buffer, width=120)
            _deliver(buffer.getvalue(), args.output, stdout)
        if args.annotate is not None and not _annotate(run, args.annotate, settings, stderr):
            return EXIT_USAGE
        return exit_code(run, args.fail_on)
    except ScrutinyError as exc:  # bad usage, an unusable store: one line, exit 2
        stderr.write(f"scrutiny: error: {exc}\n")
        return EXIT_USAGE
    except KeyboardInterrupt:
        stderr.write("scrutiny: interrupted\n")
        return 130
    except BrokenPipeError:
        # The reader of our output went away (e.g. `| head`); nothing more to say.
        try:
            sys.stdout = None  # type: ignore[assignment]
        finally:
            return EXIT_OK


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
