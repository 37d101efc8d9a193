"""Benchmark of nested sums: ``qseries check`` on Andrews-Gordon and Capparelli multi-sums,
each a fresh process, with several source trees side by side, beside a PARI/GP script of
nested loops over truncated series (when ``gp`` is installed; otherwise that column says
so).

    python benchmarks/bench_multisum.py [--trees before=/old/checkout,after=.]
        [--only ag4,ag5,capparelli] [--timeout 300]

Prints per identity and order: wall seconds (with start-up) / the ``seconds`` qseries
reports for each tree, the ratio of the first tree's reported time to each other one's,
and GP's wall time / CPU milliseconds (``gettime``, both sides of the identity included).
"""

from __future__ import annotations

import argparse
import json
import os
import shutil
import subprocess
import sys
import tempfile
import time


def ag_free(k: int, i: int) -> str:
    """The Andrews-Gordon sum as the catalogue writes it (free n_j, partial sums N_j)."""
    n = [f"n{j}" for j in range(1, k)]
    big = ["(" + " + ".join(n[j:]) + ")" for j in range(k - 1)]
    expo = " + ".join(f"{b}^2" for b in big) + "".join(f" + {b}" for b in big[i - 1:])
    sums = " ".join(f"sum_{{{x}>=0}}" for x in n)
    return f"{sums} q^({expo}) / ({' '.join(f'(q;q)_{x}' for x in n)})"


def ag_product(k: int, i: int) -> str:
    m = 2 * k + 1
    return f"(q^{i},q^{m - i},q^{m};q^{m})_inf/(q;q)_inf"


def gp_ag(k: int, i: int, order: int) -> str:
    """Nested loops, the inner sums multiplied by 1/(q;q)_n once per outer index."""
    names = [f"n{j}" for j in range(1, k)]
    lines = [f"N={order}; M=ceil(sqrt(N))+2;",
             "P=vector(M,n,1/prod(k=1,n-1,1-q^k+O(q^N)));"]
    # the exponent with the later indices 0 (a lower bound for the rest of the loop)

    def expo(upto: int) -> str:
        used = names[:upto] + ["0"] * (k - 1 - upto)
        big = ["(" + "+".join(used[j:]) + ")" for j in range(k - 1)]
        return "+".join(f"{b}^2" for b in big) + "".join(f"+{b}" for b in big[i - 1:])

    body = ""
    for depth in range(k - 1, 0, -1):
        x = names[depth - 1]
        inner = f"A{depth}+=q^e*P[{x}+1]" if depth == k - 1 else \
            f"A{depth}+=A{depth + 1}*P[{x}+1]"
        pre = f"A{depth + 1}=O(q^N); " if depth < k - 1 else ""
        cond = f"e={expo(depth)}; if(e>=N,break); " if depth == k - 1 else \
            f"if({expo(depth)}>=N,break); "
        body = f"for({x}=0,M-1, {cond}{pre}{body}{';' if body else ''} {inner})"
    m = 2 * k + 1
    lines += ["A1=O(q^N);", body + ";",
              f"R=prod(k=0,N\\{m},(1-q^({m}*k+{i})+O(q^N))*(1-q^({m}*k+{m - i})+O(q^N))"
              f"*(1-q^({m}*k+{m})+O(q^N)))/prod(k=1,N,1-q^k+O(q^N));",
              "print(A1==R); print(gettime());"]
    return "\n".join(lines)


CAPPARELLI = "sum_{i>=0} sum_{j>=0} q^(2i^2+6i j+6j^2)/((q;q)_i (q^3;q^3)_j)"
CAPPARELLI_PRODUCT = "(-q^2,-q^3,-q^4,-q^6;q^6)_inf"


def gp_capparelli(order: int) -> str:
    return "\n".join([
        f"N={order}; M=ceil(sqrt(N/2))+2;",
        "P=vector(M,n,1/prod(k=1,n-1,1-q^k+O(q^N)));",
        "P3=vector(M,n,1/prod(k=1,n-1,1-q^(3*k)+O(q^N)));",
        "S=O(q^N);",
        "for(i=0,M-1, if(2*i^2>=N,break); B=O(q^N); for(j=0,M-1, e=2*i^2+6*i*j+6*j^2; "
        "if(e>=N,break); B+=q^e*P3[j+1]); S+=B*P[i+1]);",
        "R=prod(k=0,N\\6,(1+q^(6*k+2)+O(q^N))*(1+q^(6*k+3)+O(q^N))*(1+q^(6*k+4)+O(q^N))"
        "*(1+q^(6*k+6)+O(q^N)));",
        "print(S==R); print(gettime());"])


#: (name, label, left, right, order, GP script)
CASES = [
    ("ag4", "Andrews-Gordon k=4 i=1", ag_free(4, 1), ag_product(4, 1), 1000,
     gp_ag(4, 1, 1000)),
    ("ag5", "Andrews-Gordon k=5 i=1", ag_free(5, 1), ag_product(5, 1), 1000,
     gp_ag(5, 1, 1000)),
    ("capparelli", "Capparelli double sum", CAPPARELLI, CAPPARELLI_PRODUCT, 10000,
     gp_capparelli(10000)),
]


def run(tree: str, left: str, right: str, order: int, timeout: float
        ) -> tuple[float, float] | None:
    env = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
    env["PYTHONPATH"] = os.path.abspath(tree)
    cmd = [sys.executable, "-m", "qseries", "check", left, right, "-n", str(order), "--json"]
    t0 = time.perf_counter()
    try:
        out = subprocess.run(cmd, capture_output=True, text=True, timeout=timeout,
                             check=False, env=env, cwd=os.path.abspath(tree))
    except subprocess.TimeoutExpired:
        return None
    wall = time.perf_counter() - t0
    if out.returncode != 0:
        raise SystemExit(f"{tree}: check failed: {out.stderr[-400:] or out.stdout[-400:]}")
    return wall, float(json.loads(out.stdout)["seconds"])


def run_gp(script: str, timeout: float) -> str:
    gp = shutil.which("gp")
    if gp is None:
        return "gp not installed"
    with tempfile.NamedTemporaryFile("w", suffix=".gp", delete=False) as f:
        f.write("default(parisizemax, 2^31);\n" + script + "\n")
        path = f.name
    try:
        t0 = time.perf_counter()
        out = subprocess.run([gp, "-q", "-f", path], capture_output=True, text=True,
                             timeout=timeout, check=False, stdin=subprocess.DEVNULL)
        wall = time.perf_counter() - t0
    except subprocess.TimeoutExpired:
        return f">{timeout:.0f}"
    finally:
        os.unlink(path)
    lines = out.stdout.split()
    if len(lines) < 2 or lines[0] != "1":
        return f"gp failed: {(out.stderr or out.stdout)[-200:]}"
    return f"{wall:.2f} wall / {int(lines[1])} ms"


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--trees", default=".", help="name=path,... (default: this checkout)")
    ap.add_argument("--only", default="", help="comma-separated case names (default: all)")
    ap.add_argument("--timeout", type=float, default=300.0)
    args = ap.parse_args()
    only = {x for x in args.only.split(",") if x}
    trees = []
    for item in args.trees.split(","):
        name, _, path = item.rpartition("=")
        trees.append((name or path, path))
    for _, path in trees:
        run(path, "q", "q", 10, args.timeout)             # warm-up: bytecode caches
    print(f"load average {os.getloadavg()[0]:.2f}; seconds as wall (with start-up) / "
          f"reported by qseries; {'; '.join(f'{n} = {p}' for n, p in trees)}")
    for name, label, left, right, order, script in CASES:
        if only and name not in only:
            continue
        cells = [run(path, left, right, order, args.timeout) for _, path in trees]
        text = "  ".join(f"{n}: {c[0]:.2f}/{c[1]:.2f}" if c else f"{n}: >{args.timeout:.0f}"
                         for (n, _), c in zip(trees, cells, strict=True))
        ratios = "  ".join(f"{cells[0][1] / c[1]:.1f}x" for c in cells[1:]
                           if c and cells[0] and c[1] > 0)
        print(f"{label:<24} {order:>6}  {text}  {ratios}  GP: {run_gp(script, args.timeout)}",
              flush=True)
    print(f"load average {os.getloadavg()[0]:.2f}")


if __name__ == "__main__":
    main()
