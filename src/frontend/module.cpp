// module.cpp — reading the module through the slang reader (kerf/io/reader.h); signal helpers.
// The description itself is parsed in description.cpp.
#include "kerf/frontend/module.h"

#include "kerf/io/files.h"
#include "kerf/io/reader.h"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>

namespace kerf::frontend {

int Signal::offsetOf(int index) const {
    int off = msb >= lsb ? index - lsb : lsb - index;
    return off >= 0 && off < width ? off : -1;
}

bool Signal::hasAttribute(std::string_view a) const {
    return std::find(attributes.begin(), attributes.end(), a) != attributes.end();
}

std::string verilogName(const std::string& name) {
    bool simple = !name.empty() && (std::isalpha(static_cast<unsigned char>(name[0])) || name[0] == '_');
    for (char c : name)
        if (!(std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '$')) simple = false;
    return simple ? name : "\\" + name + " ";
}

std::vector<std::string> readerArguments(const ReadOptions& opts) {
    std::vector<std::string> args;
    if (!opts.top.empty()) { args.push_back("--top"); args.push_back(opts.top); }
    for (const auto& d : opts.includeDirs) { args.push_back("-I"); args.push_back(d); }
    for (const auto& d : opts.defines) { args.push_back("-D"); args.push_back(d); }
    for (const auto& p : opts.params) { args.push_back("--param"); args.push_back(p); }
    if (opts.asBuilt) args.push_back("--as-built");
    for (const auto& f : opts.files) {
        auto it = opts.substitute.find(f);
        args.push_back(it == opts.substitute.end() ? f : it->second);
    }
    return args;
}

ModuleDesc readModule(const ReadOptions& opts) {
    for (const auto& f : opts.files) {
        auto it = opts.substitute.find(f);
        io::checkSourceFile(it == opts.substitute.end() ? f : it->second);
    }
    io::ReaderOutput out = io::runReader(readerArguments(opts));
    try {
        return parseDescription(out.text);
    } catch (const std::exception& e) {
        // The reader is ours: whatever it printed that we cannot read is kerf's bug.
        std::string saved = io::saveBugReport({{"reader-output.json", out.text}});
        std::string where = saved.empty() ? "" : fmt::format("; its output is saved in {}/ for a bug report", saved);
        std::string why = dynamic_cast<const Error*>(&e) ? e.what() : fmt::format("malformed description: {}", e.what());
        throw Error(fmt::format("the Verilog reader's output cannot be read ({}){}; nothing was written. "
                                "This is a kerf bug: please report it", why, where), {}, ExitCode::Internal);
    }
}

} // namespace kerf::frontend
