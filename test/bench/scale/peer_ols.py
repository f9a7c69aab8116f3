"""The peer of issue 16's side-by-side benchmark: the usual route a scientist
takes in Python to fit the benchmark data, pandas to read the CSV and
statsmodels' formula interface for the ten-predictor least-squares fit and
its printed summary.

    python3 peer_ols.py fit   DATA.csv   read, fit y on x1..x10, print the summary
    python3 peer_ols.py read  DATA.csv   read only, print the table's shape
    python3 peer_ols.py start            import pandas only (the start-up that `read` pays)

`read` minus `start` is the peer's ingest time, as a table-only document
minus an empty one is Plumb's (test/bench/scale/scale.ts).
"""
import sys


def main() -> int:
    mode = sys.argv[1] if len(sys.argv) > 1 else "fit"
    import pandas as pd

    if mode == "start":
        print("pandas", pd.__version__)
        return 0
    if len(sys.argv) < 3:
        print("Usage: peer_ols.py fit|read|start DATA.csv", file=sys.stderr)
        return 2
    if mode == "read":
        data = pd.read_csv(sys.argv[2])
        print("rows", data.shape[0], "columns", data.shape[1])
        return 0
    import statsmodels.formula.api as smf

    data = pd.read_csv(sys.argv[2])
    predictors = " + ".join(f"x{k}" for k in range(1, 11))
    fit = smf.ols(f"y ~ {predictors}", data=data).fit()
    print(fit.summary())
    return 0


if __name__ == "__main__":
    sys.exit(main())
