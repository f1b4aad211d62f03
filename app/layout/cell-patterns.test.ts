import { describe, expect, it } from "vitest";
import { compileCellPattern, DEMO_RULESET } from "~/rules/ruleset";

/**
 * The default cell-name patterns against standard-cell names of an invented library ("gc_" and "vx_" prefixes;
 * the suffix letters follow the usual trade habit of naming reset, set, scan and enable inputs — common practice,
 * no source). Both ways: what must match and what must not.
 */
const flipFlop = compileCellPattern(DEMO_RULESET.flipFlopPattern);
const forbidden = DEMO_RULESET.forbiddenCellPatterns.map(compileCellPattern);
const isForbidden = (name: string) => forbidden.some((re) => re.test(name));

const FLIP_FLOPS = [
  "gc_dff", "gc_dffr", "gc_dff_x1", "gc_dffr_x2", "gc_dfrtp_1", "gc_dfstp_4", "gc_dfxtp_2", "gc_dfbbn_1", "gc_dfbbp_1",
  "gc_sdff", "gc_sdffq_x1", "gc_sdfrtp_2", "gc_sdfxbp_1", "gc_edff", "gc_edffn_2", "gc_edfxtp_1", "gc_sedfxtp_1",
  "vx_dfrbp_1", "VX_SDFRTN_4", "DFFX1", "vx__dfxtp_1",
];
const NOT_FLIP_FLOPS = [
  "my_dfault", "gc_dfault_1", "gc_pdf_buf", "gc_udf_inv", "gc_dlxtp_1", "gc_dlatch_1", "gc_sdlclkp_1", "gc_buf_2",
  "gc_nand2_1", "gc_mux2_1", "gc_fill_4", "gc_decap_8", "gc_tapvpwr", "gc_dfmux_2", "program1", "gc_undefined_1",
];
const FORBIDDEN = ["gc_sram_64x8", "gc_ram16x4", "gc_dpram_32x8", "gc_sram", "SRAM64X8", "gc_bram_1k", "gc_rom8_256", "gc_rom_1kx8", "ip_macro_mem_2k"];
const ALLOWED = ["program1", "gc_program1", "gc_framer_2", "gc_romeo_1", "gc_tram1", "gc_param_buf", "gc_dff", "gc_nand2_1", "gc_fill_4", "gc_memo_x1"];

describe("the default flip-flop cell pattern", () => {
  it.each(FLIP_FLOPS)("counts %s as a flip-flop", (name) => expect(flipFlop.test(name)).toBe(true));
  it.each(NOT_FLIP_FLOPS)("does not count %s", (name) => expect(flipFlop.test(name)).toBe(false));
});

describe("the default forbidden-cell patterns", () => {
  it.each(FORBIDDEN)("forbid %s", (name) => expect(isForbidden(name)).toBe(true));
  it.each(ALLOWED)("allow %s", (name) => expect(isForbidden(name)).toBe(false));
});
