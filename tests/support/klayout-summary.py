# Reference figures from KLayout (Debian's klayout, run with -b) for a GDSII file given as -rd gds=... ;
# writes JSON to -rd out=... . The hierarchy is walked here, top-down, because KLayout 0.28.5's
# RecursiveInstanceIterator under-counts inside arrays.
import json, time
import pya

t0 = time.time()
ly = pya.Layout()
ly.read(gds)
load_ms = (time.time() - t0) * 1000.0

tops = [c for c in ly.top_cells()]
top = max(tops, key=lambda c: c.dbbox().area()) if tops else None
counts = {}
mult = {top.cell_index(): 1}
for ci in ly.each_cell_top_down():
    m = mult.get(ci, 0)
    if m == 0:
        continue
    for inst in ly.cell(ci).each_inst():
        n = inst.cell_inst.size()
        child = inst.cell_index
        mult[child] = mult.get(child, 0) + m * n
for ci, m in mult.items():
    if ci != top.cell_index():
        counts[ly.cell(ci).name] = m

labels = []
for li in ly.layer_indexes():
    info = ly.get_info(li)
    for s in top.shapes(li).each():
        if s.is_text():
            t = s.dtext
            labels.append({"text": t.string, "layer": info.layer, "texttype": info.datatype, "xUm": t.x, "yUm": t.y})

b = top.dbbox()
cells = {}
for c in ly.each_cell():
    cb = c.dbbox()
    cells[c.name] = None if cb.empty() else [cb.left, cb.bottom, cb.right, cb.top]
result = {
    "topCells": sorted(c.name for c in tops),
    "topCell": top.name,
    "bboxUm": [b.left, b.bottom, b.right, b.top],
    "instances": counts,
    "labels": labels,
    "layers": sorted([ly.get_info(li).layer, ly.get_info(li).datatype] for li in ly.layer_indexes()),
    "cells": cells,
    "dbu": ly.dbu,
    "loadMs": load_ms,
}
with open(out, "w") as f:
    json.dump(result, f)
