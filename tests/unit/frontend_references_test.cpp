// frontend_references_test.cpp — Verilog text naming bits of declared types.
//
// References: IEEE 1800-2017 (recalled from memory) 7.4.5 (the leftmost packed
// dimension varies most slowly: bit 13 of `logic [7:0][3:0] mem` is mem[3][1]),
// 7.2.1 (the first member of a packed struct is the most significant), 6.19.3
// (no implicit conversion into an enum); Icarus Verilog (simulator) and
// Verilator (linter) as outside references: a module whose every bit is read
// and written through these names must lint clean and must move each bit to
// where Verilog's own packing puts it.
#include "kerf/frontend/references.h"

#include <fmt/format.h>
#include <gtest/gtest.h>

#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <random>
#include <sstream>

using kerf::frontend::ModuleDesc;
using kerf::frontend::readModule;
using kerf::frontend::ReadOptions;
using kerf::frontend::referenceText;
using kerf::frontend::targetPieces;

namespace {

const char* kTypes = R"(
// Invented scenario: a request port of a small interconnect.
typedef enum logic [1:0] {IDLE, RUN, DONE} st_t;
typedef enum logic {OFF, ON} onoff_t;
typedef struct packed { logic valid; logic [3:0] tag; } hdr_t;
typedef struct packed { hdr_t hdr; st_t st; onoff_t pw; logic [7:0] addr; } req_t;
typedef union packed { logic [5:0] raw; logic [1:0][2:0] pair; } word_u;
typedef struct packed { logic a; logic [1:0] b; } small_t;
)";

struct TempDir {
    std::filesystem::path path;
    TempDir() {
        char tmpl[] = "/tmp/kerf-refs-XXXXXX";
        path = mkdtemp(tmpl);
    }
    ~TempDir() { std::filesystem::remove_all(path); }
};

void writeText(const std::filesystem::path& p, const std::string& s) { std::ofstream(p) << s; }

int run(const std::string& cmd, std::string* out = nullptr) {
    std::string full = cmd + " 2>&1";
    FILE* f = popen(full.c_str(), "r");
    if (!f) return -1;
    std::string text;
    char buf[4096];
    while (std::size_t n = fread(buf, 1, sizeof buf, f)) text.append(buf, n);
    int rc = pclose(f);
    if (out) *out = text;
    return rc;
}

bool have(const char* tool) { return run(fmt::format("command -v {} >/dev/null", tool)) == 0; }

ModuleDesc readText(const TempDir& dir, const std::string& name, const std::string& text) {
    auto p = dir.path / name;
    writeText(p, text);
    ReadOptions o;
    o.files = {p.string()};
    return readModule(o);
}

} // namespace

TEST(FrontendReferences, NamesFollowTheDeclaredType) {
    TempDir dir;
    ModuleDesc m = readText(dir, "refs_names.sv", std::string(kTypes) + R"(
module refs_names (input logic [7:0][3:0] mem, input req_t req, input logic [0:3] asc, input logic s,
                   input onoff_t o_in, input st_t st_in, input word_u w, output logic y);
  assign y = ^mem ^ ^req ^ ^asc ^ s ^ o_in ^ ^st_in ^ ^w;
endmodule
)");
    // 7.4.5: element 3, bit 1; whole elements as one part select; a range across elements in pieces.
    EXPECT_EQ(referenceText(m, "mem", 13), "mem[3][1]");
    EXPECT_EQ(referenceText(m, "mem", 8, 8), "mem[3:2]");
    EXPECT_EQ(referenceText(m, "mem", 6, 4), "{mem[2][1:0], mem[1][3:2]}");
    EXPECT_EQ(referenceText(m, "mem", 0, 32), "mem");
    // 7.2.1: addr at 7:0, pw at 8, st at 10:9, hdr at 15:11 (tag 14:11, valid 15).
    EXPECT_EQ(referenceText(m, "req", 15), "req.hdr.valid");
    EXPECT_EQ(referenceText(m, "req", 11, 4), "req.hdr.tag");
    EXPECT_EQ(referenceText(m, "req", 12), "req.hdr.tag[1]");
    EXPECT_EQ(referenceText(m, "req", 8), "req.pw");
    EXPECT_EQ(referenceText(m, "req", 9, 2), "req.st");
    // Part of an enum field: through the struct as a vector (7.2.1), a form every simulator
    // at hand resolves correctly (Icarus Verilog 11 does not for `req.st[0]`).
    EXPECT_EQ(referenceText(m, "req", 9), "req[9]");
    EXPECT_EQ(referenceText(m, "req", 7, 3), "{req[9], req.pw, req.addr[7]}");
    // Declared coordinates of an ascending range: offset 0 is asc[3].
    EXPECT_EQ(referenceText(m, "asc", 0), "asc[3]");
    EXPECT_EQ(referenceText(m, "asc", 0, 2), "asc[2:3]");
    EXPECT_EQ(referenceText(m, "asc", 0, 4), "asc");
    // One-bit values are never indexed.
    EXPECT_EQ(referenceText(m, "s", 0), "s");
    EXPECT_EQ(referenceText(m, "o_in", 0), "o_in");
    EXPECT_EQ(referenceText(m, "st_in", 1), "st_in[1]");
    // A packed union is named through its first member.
    EXPECT_EQ(referenceText(m, "w", 4), "w.raw[4]");
    // Names kerf generates are indexed flat.
    EXPECT_EQ(referenceText(m, "kf_w0_a", 3), "kf_w0_a[3]");

    // Targets: an enum field as a part select of the struct (no cast needed), a one-bit enum
    // through its values.
    auto st = targetPieces(m, "req", 9, 2);
    ASSERT_EQ(st.size(), 1u);
    EXPECT_EQ(st[0].lhs, "req[10:9]");
    EXPECT_EQ(st[0].valuePrefix + "v" + st[0].valueSuffix, "v");
    auto pw = targetPieces(m, "req", 8);
    ASSERT_EQ(pw.size(), 1u);
    EXPECT_EQ(pw[0].lhs, "req.pw");
    EXPECT_EQ(pw[0].valuePrefix + "v" + pw[0].valueSuffix, "(v) ? ON : OFF");
    auto across = targetPieces(m, "req", 7, 3);   // addr[7], the one-bit enum, st[0]
    ASSERT_EQ(across.size(), 3u);
    EXPECT_EQ(across[0].lhs, "req.addr[7]");
    EXPECT_EQ(across[1].lhs, "req.pw");
    EXPECT_EQ(across[2].lhs, "req[9]");
    EXPECT_EQ(across[2].lo, 9);
    auto whole = targetPieces(m, "st_in", 0, 2);
    ASSERT_EQ(whole.size(), 1u);
    EXPECT_EQ(whole[0].lhs, "st_in[1:0]");
}

TEST(FrontendReferences, EveryBitLandsWhereVerilogPacksIt) {
    if (!have("iverilog") || !have("vvp") || !have("verilator")) GTEST_SKIP() << "Icarus Verilog or Verilator missing";
    TempDir dir;
    // Skeleton: the declarations only, read to learn their types.
    const char* decls = R"(
  logic [7:0][3:0] v_mem, b_mem;
  req_t            v_req, b_req;
  logic [0:3]      v_asc, b_asc;
  word_u           v_w, b_w;
  small_t [2:0]    v_arr, b_arr;
)";
    std::string ports = "input logic [95:0] flat, output logic [95:0] back_read, output logic [95:0] back_written";
    std::string skeleton = std::string(kTypes) + "module refs_check (" + ports + ");\n" + decls +
                           "  assign back_read = flat;\n  assign back_written = flat;\nendmodule\n";
    ModuleDesc m = readText(dir, "refs_check.sv", skeleton);
    struct Sig {
        std::string v, b;
        int width;
    };
    std::vector<Sig> sigs{{"v_mem", "b_mem", 32}, {"v_req", "b_req", 16}, {"v_asc", "b_asc", 4},
                          {"v_w", "b_w", 6}, {"v_arr", "b_arr", 9}};
    int total = 0;
    for (auto& s : sigs) total += s.width;
    ASSERT_EQ(total, 67);
    std::ostringstream body;
    body << decls;
    // Whole assignment packs `flat` by Verilog's rules; reading bit by bit through our names must
    // give the same bits back. Writing bit by bit through our target names must too.
    int pos = 0;
    body << "  always_comb begin\n";
    for (auto& s : sigs) {
        body << fmt::format("    {} = flat[{}:{}];\n", s.v, pos + s.width - 1, pos);
        for (int i = 0; i < s.width; ++i)
            for (const auto& p : targetPieces(m, s.b, i, 1))
                body << fmt::format("    {} = {}flat[{}]{};\n", p.lhs, p.valuePrefix, pos + i, p.valueSuffix);
        pos += s.width;
    }
    body << "  end\n";
    pos = 0;
    for (auto& s : sigs) {
        for (int i = 0; i < s.width; ++i)
            body << fmt::format("  assign back_read[{}] = {};\n", pos + i, referenceText(m, s.v, i, 1));
        body << fmt::format("  assign back_written[{}:{}] = {};\n", pos + s.width - 1, pos, s.b);
        pos += s.width;
    }
    body << "  assign back_read[95:67] = flat[95:67];\n  assign back_written[95:67] = flat[95:67];\n";
    std::string module = std::string(kTypes) + "module refs_check (" + ports + ");\n" + body.str() + "endmodule\n";
    auto file = dir.path / "refs_check.sv";
    writeText(file, module);
    std::string lint;
    // -Wno-LITENDIAN: the ascending range [0:3] is declared on purpose (Verilator's style warning about it).
    EXPECT_EQ(run(fmt::format("verilator --lint-only -Wall -Wno-LITENDIAN {}", file.string()), &lint), 0)
        << lint << module;
    // Icarus: random vectors, every bit must come back unchanged.
    std::mt19937_64 rng(1364);
    std::ostringstream tb;
    tb << "module tb;\n  logic [95:0] flat; wire [95:0] r, w;\n  integer errors = 0;\n"
       << "  refs_check dut(.flat(flat), .back_read(r), .back_written(w));\n  initial begin\n";
    for (int k = 0; k < 64; ++k) {
        tb << fmt::format("    flat = 96'h{:08x}{:016x}; #1;\n", rng() & 0xffffffffu, rng());
        tb << "    if (r !== flat || w !== flat) begin errors = errors + 1; $display(\"%h %h %h\", flat, r, w); end\n";
    }
    tb << "    $display(\"errors=%0d\", errors);\n  end\nendmodule\n";
    auto tbFile = dir.path / "tb.sv";
    writeText(tbFile, tb.str());
    auto sim = dir.path / "sim.vvp";
    std::string out;
    ASSERT_EQ(run(fmt::format("iverilog -g2012 -o {} {} {}", sim.string(), file.string(), tbFile.string()), &out), 0)
        << out;
    ASSERT_EQ(run(fmt::format("vvp -n {}", sim.string()), &out), 0) << out;
    EXPECT_NE(out.find("errors=0"), std::string::npos) << out << module;
}
