#!/usr/bin/env python3
"""Reads an XLSX workbook with openpyxl (Debian python3-openpyxl), a general-purpose reader
independent of the writer (libxlsxwriter), and prints what it finds as JSON: per sheet its name,
frozen pane, whether each header cell is bold, column widths, and every cell as
[row, column, openpyxl data_type, python type name, value]. data_type "n" is a number, "s" a
string, "f" a formula (openpyxl keeps formulas as text starting with "=" and type "f").

Usage: read_xlsx.py FILE.xlsx
"""
import json
import sys

import openpyxl
from openpyxl.utils import get_column_letter


def main() -> int:
    if len(sys.argv) != 2:
        print(__doc__, file=sys.stderr)
        return 2
    book = openpyxl.load_workbook(sys.argv[1])  # data_only=False: formulas stay visible
    out = {"sheets": []}
    for ws in book.worksheets:
        cells = []
        for row in ws.iter_rows():
            for c in row:
                if c.value is None:
                    continue
                cells.append([c.row, c.column, c.data_type, type(c.value).__name__, c.value])
        header_bold = [bool(c.font and c.font.b) for c in next(ws.iter_rows(max_row=1), [])]
        widths = [ws.column_dimensions[get_column_letter(i)].width
                  for i in range(1, ws.max_column + 1)]
        out["sheets"].append({
            "name": ws.title,
            "freeze": ws.freeze_panes,
            "header_bold": header_bold,
            "widths": widths,
            "cells": cells,
        })
    json.dump(out, sys.stdout, ensure_ascii=False, default=str)
    print()
    return 0


if __name__ == "__main__":
    sys.exit(main())
