#!/usr/bin/env python3
"""refresh_corpus.py — write the description harness's seed corpus in the current format.

The seeds in tests/fuzz/corpus/description are descriptions the reader
(src/reader/kerf_read.py) writes for the designs listed in SEEDS, so the fuzzer
starts from inputs the C++ side accepts. Regression seeds (`regression-*.json`)
are a fresh description damaged the way that once crashed the C++ reader
(REGRESSIONS). The format changes with kerf: run this from the source tree after
any change to it (a unit test fails when a seed's version is not the one kerf
reads):

    python3 tests/fuzz/refresh_corpus.py
"""

import json
import pathlib
import subprocess
import sys

ROOT = pathlib.Path(__file__).resolve().parents[2]
CORPUS = ROOT / "tests/fuzz/corpus/description"
READER = ROOT / "src/reader/kerf_read.py"

# seed name -> (source files, in reading order; module)
SEEDS = {
    "byte_ranges": (["tests/e2e/reader_inputs/byte_ranges.sv"], "status_regs"),
    "case_wild": (["tests/e2e/reader_inputs/case_wild.sv"], "decode"),
    "comb_loop": (["tests/e2e/bad/comb_loop.v"], "comb_loop"),
    "dma_fsm": (["samples/dma_fsm.sv"], "dma_fsm"),
    "gpio_mux": (["samples/gpio_mux.v"], "gpio_mux"),
    "irq_router": (["samples/irq_pkg.sv", "samples/irq_router.sv"], "irq_router"),
    "kept": (["tests/e2e/reader_inputs/kept.sv"], "timer"),
    "latch": (["tests/e2e/bad/latch.v"], "latch_infer"),
    "loops": (["tests/e2e/reader_inputs/loops.sv"], "loops"),
    "nothing_to_do": (["tests/e2e/bad/nothing_to_do.sv"], "capture_reg"),
    "pkg_struct": (["tests/e2e/reader_inputs/pkg_struct.sv"], "router"),
    "rtl_alu_slice": (["tests/rtl/alu_slice.sv"], "alu_slice"),
    "rtl_arb_rr": (["tests/rtl/arb_rr.sv"], "arb_rr"),
    "rtl_casex_priority": (["tests/rtl/casex_priority.sv"], "casex_priority"),
    "rtl_casez_wildcards": (["tests/rtl/casez_wildcards.sv"], "casez_wildcards"),
    "rtl_cmp_kept_1bit": (["tests/rtl/cmp_kept_1bit.sv"], "cmp_kept_1bit"),
    "rtl_divmod_const": (["tests/rtl/divmod_const.sv"], "divmod_const"),
    "rtl_ecc_secded": (["tests/rtl/ecc_secded.v"], "ecc_secded"),
    "rtl_eq_xz_const": (["tests/rtl/eq_xz_const.sv"], "eq_xz_const"),
    "rtl_eq_z_const": (["tests/rtl/eq_z_const.sv"], "eq_z_const"),
    "rtl_equiv_kept_block": (["tests/rtl/equiv_kept_block.sv"], "equiv_kept_block"),
    "rtl_equiv_same_kept": (["tests/rtl/equiv_same_kept.sv"], "equiv_same_kept"),
    "rtl_fifo_flags": (["tests/rtl/fifo_flags.sv"], "fifo_flags"),
    "rtl_func_loops": (["tests/rtl/func_loops.sv"], "func_loops"),
    "rtl_gen_lanes": (["tests/rtl/gen_lanes.sv"], "gen_lanes"),
    "rtl_generate_inactive": (["tests/rtl/generate_inactive.sv"], "generate_inactive"),
    "rtl_ifdef_variants": (["tests/rtl/ifdef_variants.sv"], "ifdef_variants"),
    "rtl_legacy_v2001": (["tests/rtl/legacy_v2001.v"], "legacy_v2001"),
    "rtl_min_case_eq_x": (["tests/rtl/min_case_eq_x.sv"], "min_case_eq_x"),
    "rtl_min_ifdef_const": (["tests/rtl/min_ifdef_const.sv"], "min_ifdef_const"),
    "rtl_min_kept_cmp_1bit": (["tests/rtl/min_kept_cmp_1bit.sv"], "min_kept_cmp_1bit"),
    "rtl_min_localparam_fold": (["tests/rtl/min_localparam_fold.sv"], "min_localparam_fold"),
    "rtl_min_loop_const_div": (["tests/rtl/min_loop_const_div.sv"], "min_loop_const_div"),
    "rtl_min_packed2d_bit": (["tests/rtl/min_packed2d_bit.sv"], "min_packed2d_bit"),
    "rtl_min_param_width": (["tests/rtl/min_param_width.sv"], "min_param_width"),
    "rtl_min_tristate_enable": (["tests/rtl/min_tristate_enable.sv"], "min_tristate_enable"),
    "rtl_min_unused_word_wire": (["tests/rtl/min_unused_word_wire.sv"], "min_unused_word_wire"),
    "rtl_min_varindex_1bit": (["tests/rtl/min_varindex_1bit.sv"], "min_varindex_1bit"),
    "rtl_net_init": (["tests/rtl/net_init.sv"], "net_init"),
    "rtl_packed_2d": (["tests/rtl/packed_2d.sv"], "packed_2d"),
    "rtl_param_override": (["tests/rtl/param_override.sv"], "param_override"),
    "rtl_partsel_var_write": (["tests/rtl/partsel_var_write.sv"], "partsel_var_write"),
    "rtl_rom_table_decoder": (["tests/rtl/rom_table_decoder.sv"], "rom_table_decoder"),
    "rtl_shift_select": (["tests/rtl/shift_select.sv"], "shift_select"),
    "rtl_signed_cmp": (["tests/rtl/signed_cmp.sv"], "signed_cmp"),
    "rtl_tristate_pads": (["tests/rtl/tristate_pads.sv"], "tristate_pads"),
    "rtl_uart_ctrl_fsm": (["tests/rtl/uart_ctrl_fsm.sv"], "uart_ctrl_fsm"),
    "rtl_varindex_narrow": (["tests/rtl/varindex_narrow.sv"], "varindex_narrow"),
    "rtl_x_default_case": (["tests/rtl/x_default_case.sv"], "x_default_case"),
    "rtl_x_full_case": (["tests/rtl/x_full_case.v"], "x_full_case"),
    "rtl_x_unique_case": (["tests/rtl/x_unique_case.sv"], "x_unique_case"),
    "rv_decoder": (["samples/rv_decoder.sv"], "rv_decoder"),
    "semantics": (["tests/e2e/reader_inputs/semantics.sv"], "semantics"),
    "two_drivers": (["tests/e2e/bad/two_drivers.sv"], "two_drivers"),
    "uart_regsel": (["samples/uart_regsel.v"], "uart_regsel"),
    "unlowerable": (["tests/e2e/bad/unlowerable.sv"], "clkdiv_status"),
    "widths": (["tests/e2e/reader_inputs/widths.sv"], "widths"),
    "rtl_min_x_from_kept_out": (["tests/rtl/min_x_from_kept_out.sv"], "min_x_from_kept_out"),
    "rtl_assign_pattern": (["tests/rtl/include/csr_pkg.sv", "tests/rtl/assign_pattern.sv"], "assign_pattern"),
    "rtl_struct_array": (["tests/rtl/include/periph_pkg.sv", "tests/rtl/struct_array.sv"], "struct_array"),
    "rtl_enum_compare_names": (["tests/rtl/enum_compare_names.sv"], "enum_compare_names"),
    "rtl_struct_two_blocks": (["tests/rtl/include/periph_pkg.sv", "tests/rtl/struct_two_blocks.sv"], "struct_two_blocks"),
    "rtl_bus_decoder": (["tests/rtl/include/periph_pkg.sv", "tests/rtl/bus_decoder.sv"], "bus_decoder"),
}


def _drop_ref_signal(desc):
    """The first `ref` row loses its signal index (a reference without its name)."""
    for row in desc["exprs"]:
        if row[0] == "ref":
            row.pop()
            return desc
    raise SystemExit("refresh_corpus: no reference to damage")


def _narrow_loop_step(desc):
    """The loop's `i + 1` gets the 2-bit type of `pair`: the index wraps and the loop never
    ends (rejected at the iteration limit; it once took minutes to get there)."""
    narrow = next(s["type"] for s in desc["signals"] if s["name"] == "pair")
    for row in desc["exprs"]:
        if row[0] == "binary" and row[4] == "+":
            row[1] = narrow
            return desc
    raise SystemExit("refresh_corpus: no loop step to damage")


# regression seed -> (source files, module, damage)
REGRESSIONS = {
    "regression-missing-name": (["tests/e2e/bad/two_drivers.sv"], "two_drivers", _drop_ref_signal),
    "regression-endless-loop": (["tests/rtl/min_loop_const_div.sv"], "min_loop_const_div", _narrow_loop_step),
}


def describe(sources, module):
    out = subprocess.run([sys.executable, str(READER), "--top", module, *sources], cwd=ROOT,
                         capture_output=True, text=True)
    if out.returncode != 0:
        raise SystemExit("refresh_corpus: the reader failed on %s (%s): %s" % (sources, module, out.stderr))
    return json.loads(out.stdout)


def main():
    wanted = set()
    for name, (sources, module) in SEEDS.items():
        (CORPUS / (name + ".json")).write_text(json.dumps(describe(sources, module), separators=(",", ":")) + "\n")
        wanted.add(name + ".json")
    for name, (sources, module, damage) in REGRESSIONS.items():
        desc = damage(describe(sources, module))
        (CORPUS / (name + ".json")).write_text(json.dumps(desc, separators=(",", ":")) + "\n")
        wanted.add(name + ".json")
    stale = sorted(p.name for p in CORPUS.glob("*.json") if p.name not in wanted)
    for name in stale:
        print("refresh_corpus: %s is not listed here; add it to SEEDS or remove it" % name)
    print("refresh_corpus: %d seeds written" % len(wanted))
    return 1 if stale else 0


if __name__ == "__main__":
    sys.exit(main())
