"""`arrows draw FILE -o OUT.{svg,pdf,png}`: the mechanism as a publication scheme."""
from __future__ import annotations

import sys
from pathlib import Path

import click

from ._args import FiniteFloatRange, LocatedPath, plain_text
from ..api import DPI_RANGE, FONT_SIZE_RANGE, LINE_WIDTH_RANGE, check_file, figure_style
from ..diagnostics import ERROR, NOTE
from .output import cannot_write, refuse, refuse_unsafe_outputs

FORMATS = ("svg", "pdf", "png")
STYLE_NAMES = ("one-column", "two-column", "slide")   # arrows.draw.STYLES, named here to keep --help light


def _format_of(output: Path, fmt: str | None) -> str:
    suffix = output.suffix.lower().lstrip(".")
    if str(output) == "-":
        if not fmt:
            raise click.BadParameter("writing to standard output (-o -) needs --format svg, pdf or png",
                                     param_hint="-o/--output")
        return fmt
    if fmt and suffix and suffix != fmt:
        # (x.jpeg --format png wrote PNG bytes under a JPEG's name, which viewers refuse or misread)
        leave = ", or leave --format out" if suffix in FORMATS else ""
        refuse(f"-o {output} ends in .{suffix} but --format says {fmt}: the file would hold "
               f"{fmt.upper()} under another format's name",
               f"name it {output.with_suffix('.' + fmt)}{leave}")
    if fmt:
        return fmt
    if suffix not in FORMATS:
        raise click.BadParameter(f"cannot tell the format from {output.name!r}; end the name with .svg, .pdf or "
                                 ".png, or give --format", param_hint="-o/--output")
    return suffix


@click.command("draw")
@click.argument("file", type=LocatedPath(dir_okay=False))
@click.option("-o", "--output", required=True, type=LocatedPath(dir_okay=False, allow_dash=True),
              help="Where to write the figure; the format follows the extension (.svg, .pdf, .png). "
                   "`-` writes it to standard output (give --format).")
@click.option("--format", "fmt", type=click.Choice(FORMATS), help="Output format, when the name does not say it.")
@click.option("--style", type=click.Choice(STYLE_NAMES), default="two-column", show_default=True,
              help="Page preset: one journal column (8.3 cm), two columns (17.1 cm) or a 16:9 slide.")
@click.option("--color", "color", is_flag=True, help="Colour the bonds each step makes (blue) and breaks (vermillion); where only a pi bond changes, its second line (Okabe-Ito colours).")
@click.option("--numbers", is_flag=True, help="Show atom map numbers beside atoms, in green (for drafting).")
@click.option("--cip", is_flag=True, help="Show CIP labels (R/S) of stereocentres.")
@click.option("--step-labels", is_flag=True, help="Write each step's label under its reaction arrow.")
@click.option("--ph-labels/--every-atom", default=True, show_default=True,
              help="Write each phenyl on phosphorus that no step touches as Ph (Ph3P, Ph3P=O), or draw every atom.")
@click.option("--no-title", is_flag=True, help="Leave the title out of the figure (it stays in the SVG <title>).")
@click.option("--font", "font_family", callback=plain_text, help="Font family for all text (default DejaVu Sans).")
@click.option("--font-size", type=FiniteFloatRange(*FONT_SIZE_RANGE), help="Label font size in points.")
@click.option("--line-width", type=FiniteFloatRange(*LINE_WIDTH_RANGE), help="Bond and arrow line width in points.")
@click.option("--dpi", type=click.IntRange(*DPI_RANGE), default=300, show_default=True, help="Resolution of PNG output.")
@click.option("--force", is_flag=True, help="Draw even with errors; they are marked on the figure.")
@click.option("--watch", is_flag=True, help="Keep running: redraw each time FILE is saved, printing the diagnostics.")
def draw_command(file, output, fmt, style, color, numbers, cip, step_labels, ph_labels, no_title, font_family,
                 font_size, line_width, dpi, force, watch):
    """Draw FILE as one scheme: the starting state and the state after each step, joined by
    reaction arrows, with each step's curved arrows on the panel it leaves.

    A mechanism with errors is not drawn unless --force. Exit status: 0 drawn, 1 errors (drawn only
    with --force), 2 unreadable input or bad usage.
    """
    refuse_unsafe_outputs({"-o": output}, [file])
    output = Path(output)
    fmt = _format_of(output, fmt)
    if watch and str(output) == "-":
        raise click.BadParameter("--watch redraws a file: give -o a file name", param_hint="-o/--output")
    if watch:
        _watch(file, output, fmt, _style(style, color, numbers, cip, step_labels, ph_labels, no_title, font_family,
                                         font_size, line_width), force, dpi)
        sys.exit(0)
    trace, diags = check_file(file)
    for d in diags:
        if d.severity != NOTE:
            click.echo(d.to_text(), err=True)
    if trace is None or trace.initial is None:
        click.echo(f"{file}: nothing to draw: the mechanism could not be read", err=True)
        sys.exit(2 if any(d.code == "AR100" for d in diags) else 1)
    errors = [d for d in diags if d.severity == ERROR]
    if errors and not force:
        click.echo(f"{file}: not drawn: {len(errors)} error{'s' if len(errors) != 1 else ''} "
                   "(fix them, or use --force to draw with the errors marked)", err=True)
        sys.exit(1)
    to_stdout = str(output) == "-"
    if not to_stdout and not output.parent.is_dir():
        cannot_write(output, FileNotFoundError(2, "no such folder"))   # (cannot_write names the folder at fault)

    from ..draw import DrawError, build_scene
    from ..atomic import write_bytes as write_atomic
    from ..draw.export import convert
    from ..draw.svg import scene_to_svg
    chosen = _style(style, color, numbers, cip, step_labels, ph_labels, no_title, font_family, font_size, line_width)
    from ..draw.export import png_size_problem
    try:
        scene = build_scene(trace, chosen, diags)
        too_large = png_size_problem(scene.width, scene.height, dpi) if fmt == "png" else None
        if too_large:   # found before drawing: a 576-million-pixel PNG drew for 72 s, then failed
            message, hint = too_large
            refuse(f"cannot write {'standard output' if to_stdout else output}: {message}", hint)
        data = convert(scene_to_svg(scene), fmt, dpi)
        if to_stdout:
            sys.stdout.buffer.write(data)   # whole, once drawn: nothing half-written reaches the pipe
            sys.stdout.buffer.flush()
        else:
            write_atomic(output, data)
    except DrawError as exc:
        click.echo(f"{file}: not drawn: {exc}", err=True)
        sys.exit(1)
    except OSError as exc:
        cannot_write(output, exc)
    except Exception as exc:  # a renderer failure is reported, never shown as a traceback
        click.echo(f"{file}: not drawn: the renderer failed ({type(exc).__name__}: {exc}); nothing was written",
                   err=True)
        sys.exit(1)
    for note in scene.notes:
        click.echo(f"{file}: note: {note}", err=True)
    if scene.enlarged > 1.0:
        click.echo(f"{file}: note: --font-size {chosen.font_size:g} draws it at the {chosen.name} size", err=True)
    click.echo(f"wrote {'the figure to standard output' if to_stdout else output}", err=True)
    sys.exit(1 if errors else 0)


def _style(style, color, numbers, cip, step_labels, ph_labels, no_title, font_family, font_size, line_width):
    return figure_style(style, color=color, numbers=numbers, cip=cip, step_labels=step_labels, ph_labels=ph_labels,
                        title=not no_title, font=font_family, font_size=font_size, line_width=line_width)


def _watch(file, output: Path, fmt: str, chosen, force: bool, dpi: int) -> None:
    """Redraw on every save until Ctrl-C; a broken file keeps the last good figure and says why."""
    from ..watch import render_figure, rerun_on_save

    def report(diags) -> None:
        for d in diags:
            if d.severity != NOTE:
                click.echo(d.to_text(), err=True)
        errors = sum(d.severity == ERROR for d in diags)
        if errors and not force:
            click.echo(f"not redrawn: {errors} error{'s' if errors != 1 else ''}; waiting for the next save", err=True)
        else:
            click.echo(f"redrawn {output}; waiting for the next save (Ctrl-C stops)", err=True)

    def redraw(path):
        from ..draw.export import ImageTooLarge
        try:
            return render_figure(path, output, fmt, chosen, force=force, dpi=dpi)
        except OSError as exc:
            cannot_write(output, exc)
        except ImageTooLarge as exc:
            refuse(f"cannot write {output}: {exc.message}", exc.hint)

    click.echo(f"watching {file}", err=True)
    rerun_on_save(file, redraw, report)
