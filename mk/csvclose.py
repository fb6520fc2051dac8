"""Compare a committed reference table with the one its script just wrote.

Usage: python3 mk/csvclose.py COMMITTED FRESH

Comment lines (#) are not compared (they name the versions that wrote the
table); every other cell must match as text or, where both are numbers, to
1e-6 relative. Iterative solvers (least_squares' trust region in particular)
land on the same minimum only to about 1e-8 relative on different CPUs; the
fit's tests compare with its table at 1e-4 relative.
Exits 1 naming the first row and cell that differ.
"""

import math
import sys

REL = 1e-6


def number(s):
    try:
        v = float(s)
    except ValueError:
        return None
    return v if math.isfinite(v) else None


def main(committed, fresh):
    with open(committed) as f:
        a = f.read().splitlines()
    with open(fresh) as f:
        b = f.read().splitlines()
    if len(a) != len(b):
        print("%s: %d lines, the script wrote %d" % (committed, len(a), len(b)))
        return 1
    for n, (la, lb) in enumerate(zip(a, b), 1):
        if la.startswith("#") and lb.startswith("#"):
            continue
        ca, cb = la.split(","), lb.split(",")
        if len(ca) != len(cb):
            print("%s line %d: %d cells, the script wrote %d" % (committed, n, len(ca), len(cb)))
            return 1
        for i, (x, y) in enumerate(zip(ca, cb)):
            if x == y:
                continue
            vx, vy = number(x), number(y)
            if vx is None or vy is None or abs(vx - vy) > REL * max(abs(vx), abs(vy)):
                print("%s line %d cell %d: %s, the script wrote %s" % (committed, n, i + 1, x, y))
                return 1
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1], sys.argv[2]))
