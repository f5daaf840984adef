"""Baseline for the benchmark: a plain Python dict lookup over the release-history TSV.

Reads the history TSV (code, valid_from, valid_to, description) into a dict,
then, for every code of a CSV list (code in the column named on the command
line), prints whether it was billable on the given date. This is the simplest
check a team might script by hand; rollcall does much more per code.

usage: python3 python_lookup.py HISTORY.tsv LIST.csv COLUMN YYYYMMDD
"""
import csv
import sys


def main():
    history, listfile, column, day = sys.argv[1:5]
    valid = {}
    with open(history, encoding="utf-8") as f:
        next(f)
        for line in f:
            code, start, end, desc = line.rstrip("\n").split("\t", 3)
            valid[code] = (start, end, desc)
    out = []
    with open(listfile, encoding="utf-8", newline="") as f:
        for row in csv.DictReader(f):
            code = row[column].replace(".", "").strip().upper()
            hit = valid.get(code)
            if hit is None:
                out.append(f"{code}\tunknown")
            elif hit[0] <= day <= hit[1]:
                out.append(f"{code}\tbillable\t{hit[2]}")
            else:
                out.append(f"{code}\tnot billable on {day}")
    sys.stdout.write("\n".join(out) + "\n")


if __name__ == "__main__":
    main()
