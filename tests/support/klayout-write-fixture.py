# Writes a test layout with KLayout (-rd out=...): rotations by 90, 180, 270 and 37 degrees, mirrored
# and magnified placements, nesting three levels deep, arrays, labels, paths and boxes on several layers.
import pya

ly = pya.Layout()
ly.dbu = 0.001
leaf = ly.create_cell("kx_leaf")
leaf.shapes(ly.layer(1, 0)).insert(pya.Box(0, 0, 2000, 1000))
leaf.shapes(ly.layer(2, 3)).insert(pya.Polygon([pya.Point(0, 0), pya.Point(500, 1500), pya.Point(-300, 700)]))
wire = ly.create_cell("kx_wire")
wire.shapes(ly.layer(11, 0)).insert(pya.Path([pya.Point(0, 0), pya.Point(3000, 0), pya.Point(3000, 2000)], 400, 200, 200))
wire.shapes(ly.layer(11, 0)).insert(pya.Path([pya.Point(0, 5000), pya.Point(1000, 5000)], 300))
mid = ly.create_cell("kx_mid")
for angle, x in ((0, 0), (90, 10000), (180, 20000), (270, 30000)):
    mid.insert(pya.DCellInstArray(leaf.cell_index(), pya.DCplxTrans(1.0, angle, False, pya.DVector(x / 1000.0, 0))))
mid.insert(pya.DCellInstArray(leaf.cell_index(), pya.DCplxTrans(1.0, 37, False, pya.DVector(40, 5))))
mid.insert(pya.DCellInstArray(leaf.cell_index(), pya.DCplxTrans(2.5, 0, True, pya.DVector(50, 5))))
mid.insert(pya.DCellInstArray(wire.cell_index(), pya.DCplxTrans(1.0, 90, True, pya.DVector(60, 0))))
block = ly.create_cell("kx_block")
block.insert(pya.CellInstArray(mid.cell_index(), pya.Trans(pya.Vector(0, 0)), pya.Vector(80000, 0), pya.Vector(0, 30000), 3, 2))
block.insert(pya.CellInstArray(leaf.cell_index(), pya.Trans(1, True, pya.Vector(-5000, -5000)), pya.Vector(3000, 0), pya.Vector(0, 2500), 4, 5))
top = ly.create_cell("kx_top")
top.insert(pya.DCellInstArray(block.cell_index(), pya.DCplxTrans(1.0, 0, False, pya.DVector(0, 0))))
top.insert(pya.DCellInstArray(block.cell_index(), pya.DCplxTrans(0.5, 180, False, pya.DVector(400, 200))))
top.insert(pya.DCellInstArray(mid.cell_index(), pya.DCplxTrans(1.0, 123.5, True, pya.DVector(-50, 300))))
top.shapes(ly.layer(70, 0)).insert(pya.Text("clk", pya.Trans(pya.Vector(-20000, 1000))))
top.shapes(ly.layer(70, 0)).insert(pya.Text("vga_r[1]", pya.Trans(pya.Vector(12345, -6789))))
top.shapes(ly.layer(71, 5)).insert(pya.Text("note", pya.Trans(pya.Vector(0, 0))))
top.shapes(ly.layer(3, 0)).insert(pya.Box(-1000, -1000, 1000, 1000))
ly.write(out)
