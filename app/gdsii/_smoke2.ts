import { readLayout } from "~/gdsii/reader";
import { readFileSync } from "node:fs";
const b = readFileSync("/tmp/big.gds");
for (let i = 0; i < 4; i++) { const t = performance.now(); readLayout(b); console.log("read", performance.now() - t); }
