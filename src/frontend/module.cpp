// module.cpp — reading the module through the slang reader (kerf/io/reader.h); signal helpers.
// The description itself is parsed in description.cpp.
#include "kerf/frontend/module.h"

#include "kerf/io/files.h"
#include "kerf/io/reader.h"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cctype>
#include <cstdint>
#include <set>
#include <string_view>

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
    if (!opts.readBackTexts.empty()) { args.push_back("--read-back"); args.push_back(opts.readBackTexts); }
    for (const auto& f : opts.files) {
        auto it = opts.substitute.find(f);
        args.push_back(it == opts.substitute.end() ? f : it->second);
    }
    return args;
}

namespace {

/// CRC-32 (IEEE 802.3, reflected polynomial 0xEDB88320; the value zlib's crc32 gives).
std::uint32_t crc32(std::string_view bytes) {
    static const auto table = [] {
        std::array<std::uint32_t, 256> t{};
        for (std::uint32_t i = 0; i < 256; ++i) {
            std::uint32_t c = i;
            for (int k = 0; k < 8; ++k) c = (c & 1) ? 0xEDB88320u ^ (c >> 1) : c >> 1;
            t[i] = c;
        }
        return t;
    }();
    std::uint32_t c = 0xFFFFFFFFu;
    for (unsigned char b : bytes) c = table[(c ^ b) & 0xFFu] ^ (c >> 8);
    return c ^ 0xFFFFFFFFu;
}

} // namespace

std::optional<std::string> memberTextList(const ModuleDesc& d) {
    std::map<std::string, std::string> files;
    std::set<std::pair<std::size_t, std::uint32_t>> seen;
    std::string out;
    for (const auto& m : d.members) {
        if (m.src.file.empty() || m.src.end < m.src.start) continue;
        auto it = files.find(m.src.file);
        if (it == files.end()) {
            try {
                it = files.emplace(m.src.file, io::readFile(m.src.file)).first;
            } catch (const Error&) {
                return std::nullopt;
            }
        }
        if (m.src.end > it->second.size()) return std::nullopt;
        std::string_view text(it->second.data() + m.src.start, m.src.end - m.src.start);
        std::pair<std::size_t, std::uint32_t> k{text.size(), crc32(text)};
        if (seen.insert(k).second) out += fmt::format("{} {}\n", k.first, k.second);
    }
    return out;
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
