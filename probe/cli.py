"""The ``cprobe`` command line. It only calls the public API in :mod:`probe.api`.

Bad input prints one line, ``error: ...``, and exits with status 2.
"""

from __future__ import annotations

import json
import sys
from pathlib import Path

import click

from probe import api
from probe.errors import INPUT_ERRORS
from probe.runfolder import number_or_text as _value


class ProbeGroup(click.Group):
    """Turns the project's input errors into one line on stderr and exit status 2."""

    def invoke(self, ctx):
        try:
            return super().invoke(ctx)
        except INPUT_ERRORS as error:
            click.echo(f"error: {error}", err=True)
            ctx.exit(2)
        except click.UsageError as error:
            where = error.ctx.command_path if error.ctx is not None else ctx.command_path
            click.echo(f"error: {error.format_message()} (see `{where} --help`)", err=True)
            ctx.exit(2)


@click.group(cls=ProbeGroup, context_settings={"help_option_names": ["-h", "--help"], "max_content_width": 100})
@click.version_option(package_name="cprobe")
def cli():
    """Count the context-dependent sign-to-meaning codes a medium carries (semantic capacity).

    \b
    Start with:
      cprobe media                                   what can be probed
      cprobe tally --rule 110 --signs 10,11 --contexts 4-9,12-17 --readout 10,11 --window 4:8
      cprobe survey configs/eca-survey.toml          a whole rule space into a run folder
    """


def medium_options(command):
    options = [
        click.option("--medium", "medium_kind", default="eca", show_default=True,
                     help="Medium kind; `cprobe media` lists them."),
        click.option("--rule", type=str, default=None, help="Rule number (eca: Wolfram 0-255)."),
        click.option("--width", type=str, default=None, help="Number of sites of a lattice (eca default 21)."),
        click.option("--boundary", type=str, default=None, help="periodic (default) or fixed (zeros beyond the ends)."),
        click.option("--network", type=str, default=None, help="Network file (boolnet)."),
        click.option("--param", "extra_params", multiple=True, metavar="KEY=VALUE",
                     help="Any other medium parameter; repeatable."),
    ]
    for option in reversed(options):
        command = option(command)
    return command


def layout_options(command):
    options = [
        click.option("--signs", required=True, help="Sign sites, e.g. 10,11 or 3-5."),
        click.option("--contexts", required=True, help="Context sites, e.g. 4-9,12-17."),
        click.option("--readout", required=True, help="Readout (meaning) sites, e.g. 10,11."),
        click.option("--window", default="1:1", show_default=True,
                     help="Readout window t0:t1 (the meaning must hold at every step in it), or 'attractor'."),
        click.option("--sign-patterns", default=None,
                     help="Only these sign patterns, e.g. 10,01 (digits in sign-site order); default all."),
        click.option("--steps", type=int, default=None,
                     help="Run length; with --window attractor, the most updates spent finding the attractor."),
        click.option("--background", default="zeros", show_default=True,
                     help="zeros, random (seeded), or a pattern of digits over all sites."),
        click.option("--density", "background_density", type=float, default=0.5, show_default=True,
                     help="Share of ones in a random background."),
        click.option("--clamp-signs", is_flag=True, help="Hold sign sites at their pattern at every step."),
        click.option("--clamp-contexts", is_flag=True, help="Hold context sites at their pattern at every step."),
        click.option("--meanings", type=click.Choice(["pattern", "one-hot"]), default="pattern", show_default=True,
                     help="Every readout pattern is a meaning, or only patterns with one site on."),
        click.option("--distinct-contexts", is_flag=True,
                     help="Count contexts with the same closure once (closure media, --window attractor)."),
        click.option("--sample", "context_sample", type=int, default=None,
                     help="Evaluate a seeded sample of this many contexts instead of all."),
        click.option("--seed", type=int, default=0, show_default=True, help="Run seed (background, sampling)."),
        click.option("--max-runs", type=int, default=api.DEFAULT_MAX_RUNS, show_default=True,
                     help="Refuse enumerations over this many runs."),
    ]
    for option in reversed(options):
        command = option(command)
    return command


def _build(medium_kind, rule, width, boundary, network, extra_params):
    named = (("rule", rule), ("width", width), ("boundary", boundary), ("network", network))
    params = {key: value for key, value in named if value is not None}
    for item in extra_params:
        key, equals, value = item.partition("=")
        if not equals or not key:
            raise click.BadParameter(f"{item!r} is not KEY=VALUE", param_hint="--param")
        params[key.strip()] = value.strip()
    return api.build_medium(medium_kind, **{key: _value(value) for key, value in params.items()})


def _layout(signs, contexts, readout, window, sign_patterns, steps, background, background_density, clamp_signs,
            clamp_contexts, meanings, context_sample, distinct_contexts=False, name="cli"):
    patterns = None if sign_patterns is None else [item.strip() for item in sign_patterns.split(",")]
    return api.Layout(signs=signs, contexts=contexts, readout=readout, window=window, sign_patterns=patterns,
                      steps=steps, background=background, background_density=background_density,
                      clamp_signs=clamp_signs, clamp_contexts=clamp_contexts, meanings=meanings,
                      context_sample=context_sample, distinct_contexts=distinct_contexts or None, name=name)


@cli.command()
@medium_options
@layout_options
@click.option("--json", "as_json", is_flag=True, help="Print one JSON object with the tally columns.")
def tally(medium_kind, rule, width, boundary, network, extra_params, signs, contexts, readout, window, sign_patterns,
          steps, background, background_density, clamp_signs, clamp_contexts, meanings, distinct_contexts,
          context_sample, seed, max_runs, as_json):
    """Tally one medium under one layout and print the columns.

    \b
    Example:
      cprobe tally --medium eca --rule 110 --width 21 --signs 10,11 \\
          --contexts 4-9,12-17 --readout 10,11 --window 4:8 --json
    """
    medium = _build(medium_kind, rule, width, boundary, network, extra_params)
    layout = _layout(signs, contexts, readout, window, sign_patterns, steps, background, background_density,
                     clamp_signs, clamp_contexts, meanings, context_sample, distinct_contexts)
    resolved = layout.resolve(medium, seed)
    for warning in api.light_cone_report(medium, resolved):
        click.echo(f"warning: {warning}", err=True)
    result = api.tally(medium, resolved, seed=seed, max_runs=max_runs)
    record = {"medium": medium_kind, **medium.describe(), "seed": seed, **result.as_dict()}
    if as_json:
        click.echo(json.dumps(record))
        return
    click.echo(f"{medium!r}  signs {signs}  contexts {contexts}  readout {readout}  window {window}  seed {seed}")
    for key, value in result.as_dict().items():
        shown = f"{value:.6g}" if isinstance(value, float) else f"{value:,}"
        click.echo(f"  {key:<22} {shown}")


@cli.command()
@click.argument("config", type=click.Path(dir_okay=False, path_type=Path))
@click.option("--out", type=click.Path(file_okay=False, path_type=Path), default=None,
              help="Run folder (default outputs/<survey name>).")
@click.option("--quiet", is_flag=True, help="No progress bar and no status lines.")
@click.option("--executor", type=click.Choice(["serial", "processes", "dask"]), default="serial", show_default=True,
              help="Where tasks run: here, in local worker processes, or on a Dask cluster.")
@click.option("--workers", type=click.IntRange(min=1), default=None,
              help="Worker processes (processes, or a local Dask cluster); default: all cores.")
@click.option("--scheduler", default=None, help="Address of a running Dask scheduler, e.g. tcp://10.0.0.5:8786.")
def survey(config, out, quiet, executor, workers, scheduler):
    """Run a survey config into a run folder: results.csv, manifest.json, config.toml, capacity.png.

    Rerunning the same config into the same folder resumes it: finished tasks
    are kept in runs.sqlite and skipped.

    \b
    Examples:
      cprobe survey configs/eca-survey.toml --out outputs/my-eca-run
      cprobe survey configs/eca-survey.toml --executor processes --workers 2
      cprobe survey configs/rbn-ensemble.toml --executor dask --scheduler tcp://127.0.0.1:8786
    """
    if scheduler is not None and executor != "dask":
        raise click.UsageError("--scheduler needs --executor dask")
    echo = (lambda line: None) if quiet else (lambda line: click.echo(line, err=True))
    result = api.run_survey(config, out, progress=not quiet, echo=echo, executor=executor, workers=workers,
                            address=scheduler)
    if not quiet:
        click.echo(f"results: {result.folder / 'results.csv'}")
        if result.figure:
            click.echo(f"figure:  {result.figure}")


@cli.command()
@medium_options
@layout_options
@click.option("--out", type=click.Path(dir_okay=False, path_type=Path), default=Path("witness.png"),
              show_default=True, help="PNG file to write.")
def witness(medium_kind, rule, width, boundary, network, extra_params, signs, contexts, readout, window,
            sign_patterns, steps, background, background_density, clamp_signs, clamp_contexts, meanings,
            distinct_contexts, context_sample, seed, max_runs, out):
    """Find one code instance and draw its four runs (two signs x two contexts) as a PNG.

    \b
    Examples:
      cprobe witness --rule 110 --signs 10,11 --contexts 4-9,12-17 \\
          --readout 10,11 --window 6:6 --out witness-110.png
      cprobe witness --medium boolnet --network configs/networks/tidepool-alga.toml \\
          --signs lumA,salB --sign-patterns 10,01 --contexts ebbR,floC --clamp-contexts \\
          --readout spoK,matZ --meanings one-hot --window attractor --out tidepool.png
    """
    medium = _build(medium_kind, rule, width, boundary, network, extra_params)
    layout = _layout(signs, contexts, readout, window, sign_patterns, steps, background, background_density,
                     clamp_signs, clamp_contexts, meanings, context_sample, distinct_contexts)
    found, path = api.draw_witness(medium, layout, out, seed=seed, max_runs=max_runs)
    if found is None:
        click.echo("no code instance under this layout, so nothing was drawn; try another window, "
                   "more context sites, or `cprobe tally` to see the counts", err=True)
        sys.exit(1)
    click.echo(f"signs {found.sign_pair}, contexts {found.context_pair}, meanings {found.meaning_pair} -> {path}")


@cli.command()
@click.argument("network_file", required=False, type=click.Path(dir_okay=False))
@click.option("--nodes", type=int, default=None, help="Random N-K network: N.")
@click.option("--inputs", type=int, default=2, show_default=True, help="Random N-K network: K.")
@click.option("--bias", type=float, default=0.5, show_default=True, help="Random N-K network: p.")
@click.option("--network-seed", type=int, default=0, show_default=True, help="Random N-K network: its seed.")
@click.option("--json", "as_json", is_flag=True, help="Print the attractors as JSON.")
def attractors(network_file, nodes, inputs, bias, network_seed, as_json):
    """List every attractor of a small Boolean network with its basin size (exhaustive).

    \b
    Examples:
      cprobe attractors configs/networks/tidepool-alga.toml
      cprobe attractors --nodes 10 --inputs 2 --bias 0.5 --network-seed 7
    """
    if (network_file is None) == (nodes is None):
        raise click.UsageError("give either a NETWORK_FILE or --nodes for a random network")
    if network_file is not None:
        medium = api.build_medium("boolnet", network=network_file)
    else:
        medium = api.build_medium("rbn", nodes=nodes, inputs=inputs, bias=bias, network_seed=network_seed)
    found = api.attractors(medium)
    names = medium.site_names()
    if as_json:
        click.echo(json.dumps({"nodes": names, "attractors": [
            {"states": [api.state_text(state, len(names)) for state in item.states], "length": item.length,
             "basin": item.basin} for item in found]}))
        return
    total = sum(item.basin for item in found)
    click.echo(f"{len(found)} attractors over {total:,} states; states list nodes in this order: {' '.join(names)}")
    for number, item in enumerate(found, start=1):
        kind = "fixed point" if item.length == 1 else f"cycle of {item.length}"
        shown = " -> ".join(api.state_text(state, len(names)) for state in item.states[:8])
        more = " -> ..." if item.length > 8 else ""
        click.echo(f"  {number:>3}. {kind:<13} basin {item.basin:>8,} ({item.basin / total:6.1%})  {shown}{more}")


@cli.command()
@click.argument("run", type=click.Path(file_okay=False, path_type=Path))
@click.option("--all-rows", is_flag=True, help="Correlate over every row instead of one per equivalence class.")
@click.option("--resamples", type=click.IntRange(99, 99999), default=api.DEFAULT_RESAMPLES, show_default=True,
              help="Bootstrap and permutation resamples.")
def report(run, all_rows, resamples):
    """Write report.md for a run folder: tables, figures and what the numbers show.

    \b
    Example:
      cprobe report outputs/eca-survey
    """
    path = api.write_report(run, n_resamples=resamples, use_all_rows=all_rows)
    click.echo(f"report: {path}")


@cli.command()
@click.argument("run", type=click.Path(file_okay=False, path_type=Path))
@click.option("--add", "names", required=True, help="Measures to add, comma separated (`cprobe measures` lists them).")
@click.option("--set", "overrides", multiple=True, metavar="KEY=VALUE",
              help="Medium parameter for these measures, e.g. width=128; repeatable.")
def measure(run, names, overrides):
    """Add measure columns (m_...) to an existing run folder, then rewrite its report with `cprobe report`.

    \b
    Example:
      cprobe measure outputs/eca-survey --add langton_lambda,lz76_complexity --set width=128
    """
    medium = {}
    for item in overrides:
        key, equals, value = item.partition("=")
        if not equals or not key:
            raise click.BadParameter(f"{item!r} is not KEY=VALUE", param_hint="--set")
        medium[key.strip()] = _value(value.strip())
    chosen = [name.strip() for name in names.split(",") if name.strip()]
    api.add_measures(run, chosen, medium=medium, echo=lambda line: click.echo(line))


@cli.command(name="measures")
def list_measures():
    """List the complexity measures, their result columns and what they need.

    \b
    Example:
      cprobe measures
    """
    for name, spec in api.available_measures().items():
        needs = f" (needs {', '.join(spec.requires)})" if spec.requires else ""
        click.echo(f"{name:<22} {spec.column:<26} {spec.summary}{needs}")


@cli.command()
def media():
    """List the media that can be probed, with their parameters.

    \b
    Example:
      cprobe media
    """
    for name, family in api.available_media().items():
        click.echo(f"{name}: {family.summary}")
        for key, spec in family.parameters.items():
            default = "required" if spec.default is api.REQUIRED else f"default {spec.default!r}"
            click.echo(f"    {key:<10} {spec.help} ({default})")


def main():
    cli(prog_name="cprobe")


if __name__ == "__main__":
    main()
