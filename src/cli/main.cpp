// main.cpp — the kerf command line: restructure (one module or --all-modules), stats, equiv, draw, algebra.
#include "kerf/algebra/algebra_command.h"
#include "kerf/diagnostics.h"
#include "kerf/flow/flows.h"
#include "kerf/passes/engine.h"
#include "kerf/io/cleanup.h"
#include "kerf/io/files.h"
#include "kerf/io/progress.h"

#include <CLI/CLI.hpp>
#include <fmt/format.h>
#include <fmt/ranges.h>
#include <nlohmann/json.hpp>

#include <iostream>
#include <new>

namespace {

constexpr const char* kExitCodes =
    "Exit codes: 0 success; 1 designs differ (equiv) or the file would change (--check); "
    "2 bad input (syntax, loop, multiple drivers, latch, unknown module, usage); "
    "3 proof undecided (budget; for equiv also kept statements without a counterpart); "
    "4 Python or pyslang missing; "
    "5 internal error (e.g. a rewrite that failed its proof: nothing is written); "
    "6 out of memory or disk space.";

void addReadOptions(CLI::App* cmd, kerf::frontend::ReadOptions& r, bool files = true) {
    if (files) cmd->add_option("files", r.files, "Verilog/SystemVerilog source files")->required();
    cmd->add_option("--top", r.top, "module to read (default: the only top-level module)");
    cmd->add_option("-I,--include", r.includeDirs, "include directory")->take_all();
    cmd->add_option("-D,--define", r.defines, "preprocessor macro NAME or NAME=VALUE (a `define, not a parameter)")
        ->take_all();
    cmd->add_option("--param", r.params,
                    "set a parameter of the top module, NAME=VALUE, as an instance would (repeatable); logic "
                    "depending on it is then restructured for that value and the file stops other values")
        ->take_all();
}

} // namespace

int main(int argc, char** argv) {
    // Temporary files and the reader process go away however kerf ends.
    kerf::io::installCleanupHandlers();
    // `kerf algebra ...` has its own small argument syntax.
    if (argc >= 2 && std::string(argv[1]) == "algebra") {
        std::vector<std::string> args(argv + 2, argv + argc);
        return kerf::algebra::runAlgebraCommand(args, std::cout, std::cerr);
    }

    CLI::App app{"kerf — restructure combinational RTL logic with the algebraic model, prove it, write it back"};
    app.footer(kExitCodes);
    app.set_version_flag("--version", std::string("kerf ") + KERF_VERSION);
    app.require_subcommand(1);

    kerf::flow::RestructureOptions ro;
    auto* rs = app.add_subcommand("restructure", "rewrite a module's combinational logic smaller, proved equivalent");
    addReadOptions(rs, ro.read);
    rs->add_option("-o,--output", ro.output, "output file (default, or '-': standard output)");
    rs->add_flag("--in-place", ro.inPlace,
                 "overwrite the file holding the module (atomically; a symbolic link's target is rewritten, "
                 "its permissions kept)");
    rs->add_option("--backup", ro.backupSuffix,
                   "with --in-place or -o: keep the file's previous text in FILE+SUFFIX (e.g. --backup .orig)");
    rs->add_flag("-q,--quiet", ro.quiet, "no progress line and no summary on standard error");
    rs->add_flag("--check", ro.check, "write nothing; exit 1 when kerf would make the module smaller");
    rs->add_option("--effort", ro.effort, "how much work the engine may spend: fast, default or thorough")
        ->check(CLI::IsMember({"fast", "default", "thorough"}));
    rs->add_option("--goal", ro.goal,
                   "size: fewest gates without getting deeper (default); depth: least depth without more gates")
        ->check(CLI::IsMember({"size", "depth"}));
    rs->add_option("--max-depth", ro.maxDepth, "logic depth bound, 1 to 100000 (default: the input's depth)");
    rs->add_option("--limit", ro.limits, "set one engine work limit, NAME=N (repeatable; listed below)")
        ->allow_extra_args(false);
    rs->add_flag("-v,--verbose", ro.verbose,
                 "print the moves kept and a table per technique (repeat for every trial)");
    rs->add_option("--report", ro.reportPath, "write the before/after figures as JSON to this file");
    rs->add_flag("--skip-proof", ro.skipProof, "do not prove the rewrite (the output says so)");
    rs->add_option("--proof-budget", ro.proofBudget, "SAT conflicts the proof may spend before giving up");
    rs->add_option("--wire-prefix", ro.prefix, "prefix of new wire names (default: none, names say what the wire computes)");
    rs->add_option("--min-gain", ro.minGain,
                   "rewrite a group of statements only when it saves at least this many two-input gates, "
                   "or this percentage with a % sign (default 2)");
    rs->add_option("--text-per-gate", ro.textPerGate,
                   "with a positive --min-gain, keep as written a group whose rewrite is over twice its text and "
                   "adds more than this many characters per gate saved, or that chooses among bitwise "
                   "word operations (default 40; 0: both off)");
    rs->add_flag("--diff", ro.diff, "print a unified diff of the file against the rewrite instead of writing");
    rs->add_flag("--all-modules", ro.allModules,
                 "every module declared in the files, each proved on its own, one summary line each "
                 "(with --check or --in-place)");
    rs->add_flag("--dissolve-internal", ro.dissolveInternal,
                 "let internal signals dissolve into the logic (their declarations go); for flat netlists");
    rs->add_flag("--keep-x", ro.keepX,
                 "keep statements whose value can be x as written, instead of using x as a don't-care");
    rs->add_option("--keep", ro.keep, "a signal never restructured through, like (* keep *) on its declaration "
                                      "(repeatable)")
        ->expected(1)
        ->take_all();
    rs->footer(std::string(kExitCodes) +
               "\n\nEngine work limits (--limit NAME=N; values shown are those of --effort default):\n" +
               kerf::passes::describeLimits());

    kerf::frontend::ReadOptions so;
    bool statsJson = false;
    auto* st = app.add_subcommand("stats", "print size and depth of a module as read");
    addReadOptions(st, so);
    st->add_flag("--json", statsJson, "print JSON");
    bool statsDissolve = false;
    st->add_flag("--dissolve-internal", statsDissolve, "count as restructure --dissolve-internal does");
    st->footer(kExitCodes);

    kerf::flow::EquivOptions eq;
    std::vector<std::string> eqFiles;
    auto* ev = app.add_subcommand("equiv", "prove two versions of a module equivalent, or show a difference");
    std::vector<std::string> eqCommon;
    ev->add_option("files", eqFiles, "the two files: A B")->required()->expected(2);
    ev->add_option("--common", eqCommon, "source read with both A and B, before them (packages, shared definitions)")
        ->take_all();
    addReadOptions(ev, eq.a, false);
    ev->add_flag("--json", eq.json, "print JSON");
    ev->add_option("--proof-budget", eq.proofBudget, "SAT conflicts the proof may spend before giving up");
    ev->add_flag("-v,--verbose", eq.verbose, "print proof statistics");
    ev->footer(kExitCodes);

    kerf::flow::DrawOptions dr;
    auto* dw = app.add_subcommand("draw", "draw a module's restructured, proved logic as a graph of its named signals "
                                          "(Graphviz DOT; SVG beside it when 'dot' is installed)");
    addReadOptions(dw, dr.how.read);
    dw->add_option("-o,--output", dr.output, "FILE.dot to write (default: DOT on standard output); FILE.svg too "
                                             "when Graphviz's 'dot' is installed");
    dw->add_flag("-q,--quiet", dr.how.quiet, "no progress line and no summary on standard error");
    dw->add_option("--effort", dr.how.effort, "as for restructure")
        ->check(CLI::IsMember({"fast", "default", "thorough"}));
    dw->add_option("--min-gain", dr.how.minGain, "as for restructure (default 2)");
    dw->add_option("--wire-prefix", dr.how.prefix, "as for restructure");
    dw->add_flag("--dissolve-internal", dr.how.dissolveInternal, "as for restructure");
    dw->footer(kExitCodes);

    app.add_subcommand("algebra", "explore the algebraic model on one expression: divide, kernels, factor "
                                  "(see `kerf algebra --help`)");

    try {
        app.parse(argc, argv);
    } catch (const CLI::ParseError& e) {
        int rc = app.exit(e);
        return rc == 0 ? 0 : static_cast<int>(kerf::ExitCode::InputError);
    }

    try {
        // `-o -` is standard output (common trade practice), never a file named '-'.
        if (ro.output == "-") ro.output.clear();
        if (dr.output == "-") dr.output.clear();
        // Work directories of kerf runs killed by a signal nothing can catch (SIGKILL, the
        // out-of-memory killer) hold whole rewrites: remove those whose process is gone.
        const kerf::io::SweepResult swept = kerf::io::sweepStaleWorkDirs();
        if (*rs && ro.verbose > 0 && !swept.removed.empty())
            std::cerr << fmt::format("removed {} work director{} ({:.1f} MB) left by kerf runs that were killed: {}\n",
                                     swept.removed.size(), swept.removed.size() == 1 ? "y" : "ies",
                                     static_cast<double>(swept.bytes) / 1e6, fmt::join(swept.removed, ", "));
        if (*rs) {
            if (ro.inPlace && !ro.output.empty()) throw kerf::Error("--in-place and --output exclude each other");
            if (ro.check && (!ro.output.empty() || ro.inPlace || ro.diff))
                throw kerf::Error("--check writes nothing: it cannot be combined with -o, --in-place or --diff");
            if (ro.diff && (!ro.output.empty() || ro.inPlace))
                throw kerf::Error("--diff prints the change instead of writing: it cannot be combined with -o or --in-place");
            if (rs->count("--max-depth") > 0 && (ro.maxDepth < 1 || ro.maxDepth > 100000))
                throw kerf::Error(fmt::format("--max-depth {} is out of range (1 to 100000)", ro.maxDepth));
            if (ro.textPerGate < 0 || ro.textPerGate > 100000)
                throw kerf::Error(fmt::format("--text-per-gate {} is out of range (0 to 100000)", ro.textPerGate));
            if (!ro.backupSuffix.empty() && !ro.inPlace && ro.output.empty())
                throw kerf::Error("--backup needs --in-place or --output: standard output has nothing to back up");
            if (ro.backupSuffix.find('/') != std::string::npos)
                throw kerf::Error("--backup takes a suffix for the file name, without '/'");
            if (ro.allModules) {
                if (!ro.check && !ro.inPlace)
                    throw kerf::Error("--all-modules writes each file in place or checks it: give --in-place "
                                      "or --check");
                if (!ro.read.top.empty() || !ro.read.params.empty() || !ro.reportPath.empty() ||
                    !ro.backupSuffix.empty())
                    throw kerf::Error("--all-modules takes every module: it cannot be combined with --top, "
                                      "--param, --report or --backup");
                return kerf::flow::restructureAll(ro);
            }
            kerf::io::Progress::global().start(!ro.quiet);
            return kerf::flow::restructure(ro);
        }
        if (*dw) return kerf::flow::draw(dr);
        if (*st) {
            auto r = kerf::flow::stats(so, statsDissolve);
            if (statsJson) {
                nlohmann::json j = {{"module", r.module}, {"inputs", r.metrics.inputs},
                                    {"outputs", r.metrics.outputs}, {"nodes", r.metrics.nodes},
                                    {"literals", r.metrics.literals}, {"gates", r.metrics.gates},
                                    {"depth", r.metrics.depth}, {"restructurable", r.restructurable},
                                    {"kept", r.kept},
                                    {"word_operators", {{"unit", "operators kept as written, each counted once; not in gates"},
                                                        {"adders", r.words.adders}, {"multipliers", r.words.multipliers},
                                                        {"comparators", r.words.comparators},
                                                        {"shifters", r.words.shifters}, {"other", r.words.other}}}};
                std::cout << j.dump(2) << "\n";
            } else {
                std::cout << fmt::format("module     {}\ninputs     {}\noutputs    {}\nnodes      {}\n"
                                         "literals   {}\ngates      {}   (two-input AND/OR, inverters free)\n"
                                         "depth      {}\nword ops   {}   (operators kept as written, each counted "
                                         "once; not in gates)\nstatements {} restructurable, {} kept as written\n",
                                         r.module, r.metrics.inputs, r.metrics.outputs, r.metrics.nodes,
                                         r.metrics.literals, r.metrics.gates, r.metrics.depth, r.words.str(),
                                         r.restructurable, r.kept);
            }
            return 0;
        }
        if (*ev) {
            eq.b = eq.a;
            eq.a.files = eqCommon;
            eq.a.files.push_back(eqFiles[0]);
            eq.b.files = eqCommon;
            eq.b.files.push_back(eqFiles[1]);
            return kerf::flow::equiv(eq);
        }
    } catch (const kerf::Error& e) {
        kerf::io::Progress::global().stop();
        std::cerr << e.render() << "\n";
        return static_cast<int>(e.code());
    } catch (const std::bad_alloc&) {
        kerf::io::Progress::global().stop();
        std::cerr << "error: kerf ran out of memory; nothing was written\n";
        return static_cast<int>(kerf::ExitCode::Resources);
    } catch (const std::exception& e) {
        kerf::io::Progress::global().stop();
        std::cerr << "kerf: internal error: " << e.what() << "\n";
        return static_cast<int>(kerf::ExitCode::Internal);
    }
    return 0;
}
