// algebra_command.cpp — `kerf algebra`: explore the algebraic model by hand.
//
// Three small commands over expressions in Verilog operator syntax: weak
// division (f = d & q | r), kernels with their co-kernels, and factoring.
// The operations are those of R. K. Brayton and C. McMullen, "The
// decomposition and factorization of Boolean expressions", Proc. ISCAS 1982,
// as presented in G. De Micheli, "Synthesis and Optimization of Digital
// Circuits", McGraw-Hill 1994, ch. 8; the implementations live in
// src/algebra/. Options are parsed by hand: the command is small and wants
// its own messages and exit codes (0 success, 2 bad input or usage).
//
// Names get ids in order of first appearance (over F, then D), and results
// print literals in that order, so output is deterministic.

#include "kerf/algebra/algebra_command.h"

#include "kerf/algebra/cover.h"
#include "kerf/algebra/expr.h"

#include <nlohmann/json.hpp>

#include <algorithm>
#include <cctype>
#include <optional>

namespace kerf::algebra {

namespace {

constexpr int kOk = 0;
constexpr int kBadInput = 2;

const char* kUsage = R"(usage: kerf algebra divide F D [--json]
       kerf algebra kernels F [--level0] [--json]
       kerf algebra factor F [--method best|quick] [--json]

Explore the algebraic model on expressions written with Verilog operators:
& (and), | (or), ~ (not, on a name or a constant), parentheses, names such
as req or a[3], and the constants 0, 1, 1'b0, 1'b1. Products of sums are
multiplied out; x and ~x are unrelated literals, and no Boolean
simplification is done beyond dropping x & ~x.

commands:
  divide F D    weak division: the largest Q with D & Q inside F (as cubes),
                and the remainder R, so that F = D & Q | R
  kernels F     every kernel of F (a cube-free quotient of F by a cube) with
                its co-kernel (that cube; 1 for F itself when cube-free)
  factor F      a factored form of F and its literal count

options:
  --json            print one JSON object instead of text
  --level0          kernels: only level-0 kernels (those with no kernel but
                    themselves)
  --method M        factor: 'best' divides by the kernel that saves the most
                    literals (default); 'quick' by the first level-0 kernel
                    found
  -h, --help        show this help

exit status: 0 success, 2 bad input or usage
)";

struct Options {
    std::string command;
    std::vector<std::string> operands;
    bool json = false;
    bool level0 = false;
    std::string method;   // empty: not given
    bool help = false;
};

int usageError(std::ostream& err, const std::string& msg) {
    err << "error: " << msg << "\n"
        << "run 'kerf algebra --help' for usage\n";
    return kBadInput;
}

// Parses the words after `algebra`. Returns an error message, or nullopt.
std::optional<std::string> parseArgs(const std::vector<std::string>& args, Options& o) {
    bool endOfOptions = false;
    for (std::size_t i = 0; i < args.size(); ++i) {
        const std::string& a = args[i];
        if (!endOfOptions && a == "--") {
            endOfOptions = true;
        } else if (!endOfOptions && (a == "-h" || a == "--help")) {
            o.help = true;
        } else if (!endOfOptions && a == "--json") {
            o.json = true;
        } else if (!endOfOptions && a == "--level0") {
            o.level0 = true;
        } else if (!endOfOptions && (a == "--method" || a.rfind("--method=", 0) == 0)) {
            if (a == "--method") {
                if (i + 1 >= args.size()) return "--method needs a value: best or quick";
                o.method = args[++i];
            } else {
                o.method = a.substr(9);
            }
            if (o.method != "best" && o.method != "quick")
                return "unknown --method '" + o.method + "': use best or quick";
        } else if (!endOfOptions && a.size() > 1 && a[0] == '-' && a[1] == '-') {
            return "unknown option '" + a + "'";
        } else if (!endOfOptions && a.size() > 1 && a[0] == '-' && !std::isdigit(static_cast<unsigned char>(a[1]))) {
            return "unknown option '" + a + "'";
        } else if (o.command.empty()) {
            o.command = a;
        } else {
            o.operands.push_back(a);
        }
    }
    return std::nullopt;
}

// Parses one operand; prints a caret message and returns nullopt on error.
std::optional<Cover> parseOperand(const std::string& text, const char* label, VarTable& vars, std::ostream& err) {
    try {
        return parseExpression(text, vars);
    } catch (const ExprError& e) {
        err << describeExprError(text, e, label);
        return std::nullopt;
    }
}

std::string cubeString(const Cube& c, const std::vector<std::string>& names) {
    return toString(Cover{{c}}, names);
}

int runDivide(const Options& o, std::ostream& out, std::ostream& err) {
    if (o.operands.size() != 2) return usageError(err, "divide takes two expressions: F and D");
    VarTable vars;
    auto f = parseOperand(o.operands[0], "F", vars, err);
    if (!f) return kBadInput;
    auto d = parseOperand(o.operands[1], "D", vars, err);
    if (!d) return kBadInput;
    if (d->isZero()) {
        err << "error: D: division by 0\n";
        return kBadInput;
    }
    Division div = divide(*f, *d);
    const std::string q = toString(div.quotient, vars.names());
    const std::string r = toString(div.remainder, vars.names());
    if (o.json) {
        out << nlohmann::ordered_json{{"quotient", q}, {"remainder", r}}.dump(2) << "\n";
    } else {
        out << "quotient:  " << q << "\n"
            << "remainder: " << r << "\n";
    }
    return kOk;
}

int runKernels(const Options& o, std::ostream& out, std::ostream& err) {
    if (o.operands.size() != 1) return usageError(err, "kernels takes one expression: F");
    VarTable vars;
    auto f = parseOperand(o.operands[0], "F", vars, err);
    if (!f) return kBadInput;
    KernelOptions opts;
    opts.levelZeroOnly = o.level0;
    KernelStats stats;
    std::vector<KernelPair> ks = kernels(*f, opts, &stats);
    std::sort(ks.begin(), ks.end(), [](const KernelPair& a, const KernelPair& b) {
        if (a.cokernel.size() != b.cokernel.size()) return a.cokernel.size() < b.cokernel.size();
        if (a.cokernel != b.cokernel) return a.cokernel < b.cokernel;
        return a.kernel.cubes < b.kernel.cubes;
    });
    const auto& names = vars.names();
    if (o.json) {
        nlohmann::ordered_json list = nlohmann::ordered_json::array();
        for (const KernelPair& k : ks)
            list.push_back({{"kernel", toString(k.kernel, names)},
                            {"cokernel", cubeString(k.cokernel, names)},
                            {"level", k.level}});
        nlohmann::ordered_json j{{"kernels", list}};
        if (stats.truncated) j["truncated"] = true;
        out << j.dump(2) << "\n";
        return kOk;
    }
    if (ks.empty()) {
        out << "no kernels (a kernel needs two or more cubes after taking out the common cube)\n";
        return kOk;
    }
    std::vector<std::string> cks;
    std::size_t width = std::string("co-kernel").size();
    for (const KernelPair& k : ks) {
        cks.push_back(cubeString(k.cokernel, names));
        width = std::max(width, cks.back().size());
    }
    auto pad = [&](const std::string& s) { return s + std::string(width - s.size() + 2, ' '); };
    out << pad("co-kernel") << "level  kernel\n";
    for (std::size_t i = 0; i < ks.size(); ++i)
        out << pad(cks[i]) << ks[i].level << "      " << toString(ks[i].kernel, names) << "\n";
    if (stats.truncated) out << "(stopped at the enumeration bound: more kernels exist)\n";
    return kOk;
}

int runFactor(const Options& o, std::ostream& out, std::ostream& err) {
    if (o.operands.size() != 1) return usageError(err, "factor takes one expression: F");
    VarTable vars;
    auto f = parseOperand(o.operands[0], "F", vars, err);
    if (!f) return kBadInput;
    const FactorMethod m = o.method == "quick" ? FactorMethod::Quick : FactorMethod::Best;
    Factored g = factor(*f, m);
    const std::string text = toString(g, vars.names());
    if (o.json) {
        out << nlohmann::ordered_json{{"factored", text}, {"literals", g.literalCount()}}.dump(2) << "\n";
    } else {
        out << text << "\n"
            << "literals: " << g.literalCount() << " (sum of products: " << f->literalCount() << ")\n";
    }
    return kOk;
}

} // namespace

int runAlgebraCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
    Options o;
    if (auto msg = parseArgs(args, o)) return usageError(err, *msg);
    if (o.help) {
        out << kUsage;
        return kOk;
    }
    if (o.command.empty()) {
        err << kUsage;
        return kBadInput;
    }
    if (o.level0 && o.command != "kernels") return usageError(err, "--level0 applies only to kernels");
    if (!o.method.empty() && o.command != "factor") return usageError(err, "--method applies only to factor");
    if (o.command == "divide") return runDivide(o, out, err);
    if (o.command == "kernels") return runKernels(o, out, err);
    if (o.command == "factor") return runFactor(o, out, err);
    return usageError(err, "unknown command '" + o.command + "': use divide, kernels or factor");
}

} // namespace kerf::algebra
