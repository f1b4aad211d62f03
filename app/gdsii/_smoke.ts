import { readLayout } from "~/gdsii/reader";
import { generateDemoLayout } from "~/gdsii/demo-layout";
import { writeFileSync } from "node:fs";
const big = generateDemoLayout({ shape: "9x9", logicCells: 190000, flipFlops: 10000, wiresPerCell: 1 });
writeFileSync("/tmp/big.gds", big.bytes);
for (let i = 0; i < 4; i++) { const t = performance.now(); readLayout(big.bytes); console.log("read", performance.now() - t); }
