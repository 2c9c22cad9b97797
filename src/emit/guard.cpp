// guard.cpp — text of the guard that stops builds overriding a pinned parameter.
#include "kerf/emit/guard.h"

#include <fmt/format.h>

#include <set>

namespace kerf::emit {

std::vector<PinnedValue> pinnedValues(const frontend::ModuleDesc& m, const std::set<int>& replaced) {
    std::set<std::string> used;
    for (const auto& mem : m.members)
        if (replaced.count(mem.id))
            for (const auto& p : mem.params) used.insert(p);
    std::vector<PinnedValue> out;
    for (const auto& p : m.parameters) {
        if (!p.pinned || !used.count(p.name)) continue;
        if (p.literal.empty())
            throw Error(fmt::format("internal error: the rewrite depends on parameter '{}', pinned with --param, "
                                    "but its value has no literal for the guard",
                                    p.name),
                        p.src.loc(), ExitCode::Internal);
        out.push_back({p.name, p.value, p.literal, p.implicitType});
    }
    return out;
}

std::string pinnedList(const std::vector<PinnedValue>& pins) {
    std::string s;
    for (std::size_t i = 0; i < pins.size(); ++i) s += fmt::format("{}{} = {}", i ? ", " : "", pins[i].name, pins[i].value);
    return s;
}

std::string doubleQuoted(const std::string& text) {
    std::string q = "\"";
    for (char c : text) {
        if (c == '"' || c == '\\') q += '\\';
        q += c;
    }
    return q + "\"";
}

std::string parameterGuard(const std::vector<PinnedValue>& pins, bool systemVerilog, const std::string& indent) {
    if (pins.empty()) return {};
    std::string cond, names;
    for (const auto& p : pins) {
        if (!cond.empty()) cond += " || ";
        cond += fmt::format("{} !== {}", frontend::verilogName(p.name), p.literal);
        if (systemVerilog && p.implicitType) {
            // An untyped parameter takes the width of the value an instance gives.
            std::size_t q = p.literal.find('\'');
            cond += fmt::format(" || $bits({}) != {}", frontend::verilogName(p.name), p.literal.substr(0, q));
        }
        std::string n;
        for (char c : p.name) n += (std::isalnum(static_cast<unsigned char>(c)) ? c : '_');
        names += (names.empty() ? "" : "_") + n;
    }
    std::string list = pinnedList(pins);
    std::string t;
    t += fmt::format("{}// kerf: this logic is restructured for {} (--param); a build that sets other\n", indent, list);
    t += fmt::format("{}// values stops here: run kerf restructure again for them.\n", indent);
    t += fmt::format("{}generate\n", indent);
    t += fmt::format("{}  if ({}) begin : kerf_parameter_guard\n", indent, cond);
    // The branch is elaborated only under another value. SystemVerilog stops it with an
    // elaboration-time $error (IEEE 1800 20.11); Verilog-2005 has none, and Icarus Verilog 11
    // does not read one here (it defines __ICARUS__), so there a declaration that cannot be
    // elaborated (a negative replication count) stops the build instead.
    std::string wire = fmt::format("{}    wire kerf_restructured_for_other_{}_values = {{(0 - 1){{1'b0}}}};  // stops elaboration\n",
                                   indent, names);
    if (systemVerilog) {
        t += "`ifdef __ICARUS__\n" + wire + "`else\n";
        // The values go in as an argument on a line of their own, so the line stays within 100 columns.
        t += fmt::format("{}    $error(\"kerf: restructured for %s only (--param); run kerf restructure again for others\",\n"
                         "{}           {});\n", indent, indent, doubleQuoted(list));
        t += "`endif\n";
    } else {
        t += wire;
    }
    t += fmt::format("{}  end\n", indent);
    t += fmt::format("{}endgenerate\n", indent);
    return t;
}

} // namespace kerf::emit
