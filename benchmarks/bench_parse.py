"""How fast mechanism text is parsed into the model, against lark's own parse measured in the same run.

Baseline: lark's bare LALR parse of the same text into a plain tree, with the same grammar and lark's
default options (no positions, no transformer): the floor that any use of lark pays. The ratio
`parse / baseline` is what positions and building the model objects add on top of it. Also shown:
our parser's tree alone (`_parser().parse`, the options parse() uses, no model built).

CPU time (process_time), the runs of the three interleaved, best of N: the machine is shared.
Usage: python benchmarks/bench_parse.py [--repeat N] [--steps N]
The texts are the generated proton and enolate shuttles of bench_check.py (demo data).
"""
from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from bench_check import enolate_shuttle, proton_shuttle  # noqa: E402


def cpu_time(work) -> float:
    start = time.process_time()
    work()
    return time.process_time() - start


def per_step(label: str, text: str, steps: int, repeat: int) -> float:
    from lark import Lark

    from arrows.language import _parser, grammar_text, parse

    bare = Lark(grammar_text(), parser="lalr")
    runs = {"parse": lambda: parse(text), "our tree": lambda: _parser().parse(text),
            "baseline": lambda: bare.parse(text)}
    best = dict.fromkeys(runs, float("inf"))
    for _ in range(repeat):   # interleaved, so that each sees the same load
        for name, work in runs.items():
            best[name] = min(best[name], cpu_time(work))
    ratio = best["parse"] / best["baseline"]
    print(f"  {label}: parse {1e3 * best['parse'] / steps:.3f} ms/step, our tree alone "
          f"{1e3 * best['our tree'] / steps:.3f}, lark's bare tree (baseline) "
          f"{1e3 * best['baseline'] / steps:.3f}; ratio parse/baseline {ratio:.2f}")
    return ratio


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeat", type=int, default=9, help="runs per measurement; the best is kept")
    parser.add_argument("--steps", type=int, default=1000, help="steps in each generated mechanism")
    args = parser.parse_args()
    print("parse cost per step, against lark's bare parse of the same text into a tree")
    per_step(f"proton shuttle, {args.steps} steps of 2 moves", proton_shuttle(args.steps), args.steps, args.repeat)
    per_step(f"enolate shuttle, {args.steps} steps of 3 moves", enolate_shuttle(args.steps), args.steps, args.repeat)


if __name__ == "__main__":
    main()
